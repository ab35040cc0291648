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
    public const double StandardGravity = Core.Physical.StandardGravity;

    /// <summary>1 lbf = 0.45359237 kg x 9.80665 m/s2 = 4.4482216152605 N exactly.</summary>
    public const double PoundForce = Pound * StandardGravity;

    /// <summary>1 psi = 1 lbf/in2 = 6894.757293168361 Pa.</summary>
    public const double Psi = PoundForce / (0.0254 * 0.0254);

    /// <summary>1 US gallon = 231 in3 = 3.785411784e-3 m3 exactly.</summary>
    public const double UsGallon = 231 * 0.0254 * 0.0254 * 0.0254;

    /// <summary>1 ft3 = 0.3048^3 m3 = 0.028316846592 m3 exactly.</summary>
    public const double CubicFoot = Foot * Foot * Foot;

    /// <summary>1 US gal/min = 3.785411784e-3 / 60 m3/s = 6.30901964e-5 m3/s exactly.</summary>
    public const double UsGallonPerMinute = UsGallon / 60;

    /// <summary>1 lb/ft3 = 0.45359237 / 0.3048^3 kg/m3 = 16.01846337... kg/m3.</summary>
    public const double PoundPerCubicFoot = Pound / CubicFoot;

    /// <summary>1 hp (mechanical) = 550 ft lbf/s = 745.69987158227022 W exactly.</summary>
    public const double Horsepower = 550 * Foot * PoundForce;

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

    /// <summary>m2 to ft2 for US.</summary>
    public double Area(double si) => IsUs ? si / (Units.Foot * Units.Foot) : si;

    /// <summary>m/s to ft/s for US.</summary>
    public double Velocity(double si) => IsUs ? si / Units.Foot : si;

    /// <summary>A length in the request's unit (ft for US) to m.</summary>
    public double LengthToSi(double value) => IsUs ? value * Units.Foot : value;

    /// <summary>A kinematic viscosity in the request's unit (ft2/s for US) to m2/s.</summary>
    public double KinematicViscosityToSi(double value) => IsUs ? value * (Units.Foot * Units.Foot) : value;

    /// <summary>A density in the request's unit (lb/ft3 for US) to kg/m3.</summary>
    public double DensityToSi(double value) => IsUs ? value * Units.PoundPerCubicFoot : value;

    /// <summary>A temperature in the request's unit (degrees F for US) to degrees C.</summary>
    public double TemperatureToCelsius(double value) => IsUs ? Units.FahrenheitToCelsius(value) : value;

    /// <summary>The length unit's symbol: m, or ft for US.</summary>
    public string LengthUnit => IsUs ? "ft" : "m";

    /// <summary>The velocity unit's symbol: m/s, or ft/s for US.</summary>
    public string VelocityUnit => IsUs ? "ft/s" : "m/s";

    /// <summary>The kinematic viscosity unit's symbol: m2/s, or ft2/s for US.</summary>
    public string KinematicViscosityUnit => IsUs ? "ft2/s" : "m2/s";

    /// <summary>The density unit's symbol: kg/m3, or lb/ft3 for US.</summary>
    public string DensityUnit => IsUs ? "lb/ft3" : "kg/m3";

    /// <summary>The pressure unit's symbol: Pa, or psi for US.</summary>
    public string PressureUnit => IsUs ? "psi" : "Pa";

    /// <summary>The temperature unit's name: degrees C, or degrees F for US.</summary>
    public string TemperatureUnit => IsUs ? "degrees F" : "degrees C";
}

/// <summary>
/// The unit a volumetric flow is given and reported in: m3/s (default), litres per second (<c>l/s</c>) or cubic metres
/// per hour (<c>m3/h</c>) with SI; ft3/s (default) or US gallons per minute (<c>gpm</c>) with US customary units. Exact
/// factors (NIST SP 811, 2008, appendix B; 1 L = 1e-3 m3 exactly).
/// </summary>
/// <param name="Code">The wire code: <c>m3/s</c>, <c>l/s</c>, <c>m3/h</c>, <c>ft3/s</c> or <c>gpm</c>.</param>
/// <param name="CubicMetresPerUnit">One of this unit in m3/s.</param>
public readonly record struct FlowUnit(string Code, double CubicMetresPerUnit)
{
    public static FlowUnit CubicMetrePerSecond => new("m3/s", 1.0);

    public static FlowUnit LitrePerSecond => new("l/s", 1e-3);

    public static FlowUnit CubicMetrePerHour => new("m3/h", 1.0 / 3600);

    public static FlowUnit CubicFootPerSecond => new("ft3/s", Units.CubicFoot);

    public static FlowUnit UsGallonPerMinute => new("gpm", Units.UsGallonPerMinute);

    /// <summary>The codes each unit system takes, its default first.</summary>
    public static string Codes(UnitSystem units) => units.IsUs ? "ft3/s (default) or gpm" : "m3/s (default), l/s or m3/h";

    /// <summary>The text every flowUnit field's description uses.</summary>
    public const string Description =
        "Unit of every flow in the request and response: m3/s (default), l/s or m3/h with units=si; ft3/s (default) or gpm " +
        "(US gallons per minute, 231 in3) with units=us.";

    /// <summary>The default flow unit of a unit system.</summary>
    public static FlowUnit DefaultFor(UnitSystem units) => units.IsUs ? CubicFootPerSecond : CubicMetrePerSecond;

    /// <summary>Parses a flow unit of the request's unit system, case-insensitive; absent means the unit system's
    /// default. An error is recorded under <c>flowUnit</c> for anything else.</summary>
    public static FlowUnit Parse(string? text, UnitSystem units, FieldErrors errors) => Parse(text, units, errors.Add);

    /// <summary>As <see cref="Parse(string?, UnitSystem, FieldErrors)"/>, recording the error through <paramref name="error"/>.</summary>
    public static FlowUnit Parse(string? text, UnitSystem units, Action<string, string> error)
    {
        var unit = DefaultFor(units);
        if (text is null) return unit;
        FlowUnit[] allowed = units.IsUs ? [CubicFootPerSecond, UsGallonPerMinute] : [CubicMetrePerSecond, LitrePerSecond, CubicMetrePerHour];
        foreach (var a in allowed)
            if (text.Equals(a.Code, StringComparison.OrdinalIgnoreCase)) return a;
        error("flowUnit", units.IsUs
            ? "must be ft3/s or gpm with units=us (m3/s, l/s and m3/h need units=si)"
            : "must be m3/s, l/s or m3/h with units=si (ft3/s and gpm need units=us)");
        return unit;
    }

    /// <summary>A flow in this unit to m3/s.</summary>
    public double ToSi(double value) => value * CubicMetresPerUnit;

    /// <summary>A flow in m3/s to this unit.</summary>
    public double FromSi(double si) => si / CubicMetresPerUnit;
}
