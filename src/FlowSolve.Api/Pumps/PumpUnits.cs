namespace FlowSolve.Api.Pumps;

/// <summary>
/// The units of one pump request: SI, or US customary with flows in ft3/s or US gal/min. Converts request values
/// into SI (ToSi...) and SI results out (From...).
/// </summary>
/// <remarks>Kept here rather than in Hosting/UnitSystem.cs (another area's file); the constants are the same exact
/// definitions (NIST SP 811, 2008, appendix B).</remarks>
internal readonly record struct PumpUnits(bool IsUs, bool Gpm)
{
    private const double Foot = 0.3048;                       // m, exact
    private const double UsGallon = 3.785411784e-3;           // m3, exact
    private const double Pound = 0.45359237;                  // kg, exact
    private const double Psi = 6894.757293168361;             // Pa
    private const double Horsepower = 745.69987158227022;     // W: 550 ft lbf/s

    /// <summary>m3/s per flow unit.</summary>
    public double FlowFactor => !IsUs ? 1.0 : Gpm ? UsGallon / 60.0 : Foot * Foot * Foot;

    /// <summary>m per head unit.</summary>
    public double HeadFactor => IsUs ? Foot : 1.0;

    public string Code => IsUs ? "us" : "si";
    public string FlowUnit => !IsUs ? "m3/s" : Gpm ? "gpm" : "ft3/s";
    public string HeadUnit => IsUs ? "ft" : "m";
    public string PowerUnit => IsUs ? "hp" : "W";

    public double FlowToSi(double q) => q * FlowFactor;
    public double HeadToSi(double h) => h * HeadFactor;
    public double PressureToSi(double p) => IsUs ? p * Psi : p;
    public double DensityToSi(double rho) => IsUs ? rho * Pound / (Foot * Foot * Foot) : rho;
    public double KinematicViscosityToSi(double nu) => IsUs ? nu * Foot * Foot : nu;
    public double TemperatureToCelsius(double t) => IsUs ? (t - 32) * 5.0 / 9.0 : t;

    /// <summary>The SI coefficient of Q^k from the request's: H[m] = HeadFactor sum c_k (Q/FlowFactor)^k.</summary>
    public double CoefficientToSi(double c, int power) => c * HeadFactor / Math.Pow(FlowFactor, power);

    public double CoefficientFromSi(double c, int power) => c / HeadFactor * Math.Pow(FlowFactor, power);

    public double Flow(double si) => si / FlowFactor;
    public double Head(double si) => si / HeadFactor;
    public double Power(double si) => IsUs ? si / Horsepower : si;
    public double Pressure(double si) => IsUs ? si / Psi : si;
}
