using FlowSolve.Api.Problems;

namespace FlowSolve.Api.Hosting;

/// <summary>Conversion factors, exact by definition (NIST SP 811, 2008, appendix B).</summary>
public static class Units
{
    /// <summary>1 ft = 0.3048 m exactly.</summary>
    public const double Foot = 0.3048;

    /// <summary>1 lb = 0.45359237 kg exactly.</summary>
    public const double Pound = 0.45359237;

    /// <summary>Standard gravity 9.80665 m/s2 (exact; defines the pound-force).</summary>
    public const double StandardGravity = 9.80665;

    /// <summary>1 lbf = 0.45359237 kg x 9.80665 m/s2 = 4.4482216152605 N exactly.</summary>
    public const double PoundForce = Pound * StandardGravity;

    /// <summary>1 psi = 1 lbf/in2 = 6894.757293168361 Pa.</summary>
    public const double Psi = PoundForce / (0.0254 * 0.0254);

    /// <summary>1 US gallon = 231 in3 = 3.785411784e-3 m3 exactly.</summary>
    public const double UsGallon = 231 * 0.0254 * 0.0254 * 0.0254;

    public static double FahrenheitToCelsius(double f) => (f - 32) * 5.0 / 9.0;

    public static double CelsiusToFahrenheit(double c) => c * 9.0 / 5.0 + 32;
}

/// <summary>
/// The unit system of one request and its response: SI by default, US customary with <c>units=us</c>.
/// Converts response values out of SI; requests are converted into SI with the inverse methods.
/// </summary>
public readonly record struct UnitSystem(bool IsUs)
{
    public static UnitSystem Si => new(false);

    public string Code => IsUs ? "us" : "si";

    /// <summary>Parses <c>si</c> or <c>us</c> (case-insensitive); absent means SI.</summary>
    public static UnitSystem Parse(string? text, FieldErrors errors)
    {
        if (text is null || text.Equals("si", StringComparison.OrdinalIgnoreCase)) return Si;
        if (text.Equals("us", StringComparison.OrdinalIgnoreCase)) return new(true);
        errors.Add("units", "must be si or us");
        return Si;
    }

    /// <summary>Degrees C to the response unit (degrees F for US).</summary>
    public double Temperature(double celsius) => IsUs ? Units.CelsiusToFahrenheit(celsius) : celsius;

    /// <summary>kg/m3 to lb/ft3 for US.</summary>
    public double Density(double si) => IsUs ? si * (Units.Foot * Units.Foot * Units.Foot) / Units.Pound : si;

    /// <summary>Pa s to lbf s/ft2 for US.</summary>
    public double DynamicViscosity(double si) => IsUs ? si * (Units.Foot * Units.Foot) / Units.PoundForce : si;

    /// <summary>m2/s to ft2/s for US.</summary>
    public double KinematicViscosity(double si) => IsUs ? si / (Units.Foot * Units.Foot) : si;

    /// <summary>Pa to psi for US.</summary>
    public double Pressure(double si) => IsUs ? si / Units.Psi : si;

    /// <summary>m to ft for US.</summary>
    public double Length(double si) => IsUs ? si / Units.Foot : si;
}
