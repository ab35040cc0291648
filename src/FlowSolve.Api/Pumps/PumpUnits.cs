using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Pumps;

/// <summary>
/// The units of one pump request: SI, or US customary, with flows in any <see cref="Hosting.FlowUnit"/> of that system. Converts request values
/// into SI (ToSi...) and SI results out (From...).
/// </summary>
/// <remarks>The pump-specific quantities (flows in gpm, heads, polynomial coefficients, power) on the shared exact
/// constants of <see cref="Units"/> (NIST SP 811, 2008, appendix B).</remarks>
internal readonly record struct PumpUnits(bool IsUs, FlowUnit Flows)
{
    private const double Foot = Units.Foot;
    private const double Psi = Units.Psi;

    /// <summary>m3/s per flow unit.</summary>
    public double FlowFactor => Flows.CubicMetresPerUnit;

    /// <summary>m per head unit.</summary>
    public double HeadFactor => IsUs ? Foot : 1.0;

    public string Code => IsUs ? "us" : "si";
    public string FlowUnit => Flows.Code;
    public string HeadUnit => IsUs ? "ft" : "m";
    public string PowerUnit => IsUs ? "hp" : "W";

    public double FlowToSi(double q) => q * FlowFactor;
    public double HeadToSi(double h) => h * HeadFactor;
    public double PressureToSi(double p) => IsUs ? p * Psi : p;
    public double DensityToSi(double rho) => IsUs ? rho * Units.PoundPerCubicFoot : rho;
    public double KinematicViscosityToSi(double nu) => IsUs ? nu * Foot * Foot : nu;
    public double TemperatureToCelsius(double t) => IsUs ? Units.FahrenheitToCelsius(t) : t;

    /// <summary>The SI coefficient of Q^k from the request's: H[m] = HeadFactor sum c_k (Q/FlowFactor)^k.</summary>
    public double CoefficientToSi(double c, int power) => c * HeadFactor / Math.Pow(FlowFactor, power);

    public double CoefficientFromSi(double c, int power) => c / HeadFactor * Math.Pow(FlowFactor, power);

    public double Flow(double si) => si / FlowFactor;
    public double Head(double si) => si / HeadFactor;
    public double Power(double si) => IsUs ? si / Units.Horsepower : si;
    public double Pressure(double si) => IsUs ? si / Psi : si;
}
