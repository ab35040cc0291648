using System.Diagnostics.CodeAnalysis;

namespace FlowSolve.Core.Fluids;

/// <summary>
/// Dynamic viscosity of water from temperature and density: the IAPWS 2008 formulation in its industrial form,
/// without the critical enhancement.
/// </summary>
/// <remarks>
/// <para>Source: IAPWS R12-08, Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water Substance
/// (2008); also Huber et al., J. Phys. Chem. Ref. Data 38 (2009) 101-125. The viscosity is
/// mu = mu* mu0(Tbar) mu1(Tbar, rhobar) mu2(Tbar, rhobar), Eq. (10), with the dilute-gas term mu0, Eq. (11) and
/// Table 1, and the residual term mu1, Eq. (12) and Table 2. The critical enhancement mu2 differs from 1 only in a
/// small region around the critical point; the release's recommendation for industrial use sets mu2 = 1 and takes
/// the density from IAPWS-IF97, which is what <see cref="Water"/> does. Reducing values T* = 647.096 K,
/// rho* = 322 kg/m3, mu* = 1e-6 Pa s. Equation and table numbers are given from memory of the release.</para>
/// <para>The release states its range as 273.16 K (or the melting temperature, at pressures above the triple-point
/// pressure) to 1173.15 K and pressures up to 300 MPa, with a wider range at larger uncertainty (from memory). This
/// method checks only that its arguments are finite and positive: it is a correlation in (T, rho), and it is the
/// caller's job to pass a state inside that range.</para>
/// <para>Allocation-free and thread-safe.</para>
/// </remarks>
public static class Iapws2008Viscosity
{
    /// <summary>Reducing temperature T*, 647.096 K (the critical temperature).</summary>
    public const double ReducingTemperature = 647.096;

    /// <summary>Reducing density rho*, 322 kg/m3 (the critical density).</summary>
    public const double ReducingDensity = 322.0;

    /// <summary>Reducing viscosity mu*, 1e-6 Pa s.</summary>
    public const double ReducingViscosity = 1e-6;

    // IAPWS R12-08 (2008), Table 1: H_0..H_3 of Eq. (11).
    internal const double H0 = 1.67752;
    internal const double H1 = 2.20462;
    internal const double H2 = 0.6366564;
    internal const double H3 = -0.241605;

    internal const int DensityTerms = 7;

    // IAPWS R12-08 (2008), Table 2: H_ij of Eq. (12), i = 0..5 (powers of 1/Tbar - 1) by rows,
    // j = 0..6 (powers of rhobar - 1) along each row; the table's empty cells are zeros.
    internal static ReadOnlySpan<double> Hij =>
    [
        5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0.0, 0.0,
        8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0.0, 0.0, 0.0,
        -1.08374, 1.88797, -7.72479e-1, 0.0, 0.0, 0.0, 0.0,
        -2.89555e-1, 1.26613, -4.89837e-1, 0.0, 6.98452e-2, 0.0, -4.35673e-3,
        0.0, 0.0, -2.57040e-1, 0.0, 0.0, 8.72102e-3, 0.0,
        0.0, 1.20573e-1, 0.0, 0.0, 0.0, 0.0, -5.93264e-4,
    ];

    /// <summary>Dynamic viscosity of water, IAPWS R12-08 (2008) Eq. (10) with mu2 = 1.</summary>
    /// <param name="temperatureKelvin">Temperature T in K; finite and positive (the release's range is 273.16 to 1173.15 K).</param>
    /// <param name="densityKgPerM3">Density rho in kg/m3; finite and positive (for industrial use, from IAPWS-IF97).</param>
    /// <returns>Dynamic viscosity in Pa s.</returns>
    /// <exception cref="ArgumentOutOfRangeException">A temperature or density that is NaN, infinite, zero or negative.</exception>
    public static double Viscosity(double temperatureKelvin, double densityKgPerM3)
    {
        if (!(temperatureKelvin > 0.0 && double.IsFinite(temperatureKelvin)))
            ThrowNotPositive(temperatureKelvin, nameof(temperatureKelvin));
        if (!(densityKgPerM3 > 0.0 && double.IsFinite(densityKgPerM3)))
            ThrowNotPositive(densityKgPerM3, nameof(densityKgPerM3));

        double tBar = temperatureKelvin / ReducingTemperature;
        double rhoBar = densityKgPerM3 / ReducingDensity;
        return ReducingViscosity * DiluteGas(tBar) * Residual(tBar, rhoBar);
    }

    /// <summary>mu0 = 100 sqrt(Tbar) / sum_i H_i / Tbar^i, Eq. (11); the sum by Horner's rule in 1/Tbar.</summary>
    private static double DiluteGas(double tBar)
    {
        double inverse = 1.0 / tBar;
        double sum = H0 + inverse * (H1 + inverse * (H2 + inverse * H3));
        return 100.0 * Math.Sqrt(tBar) / sum;
    }

    /// <summary>
    /// mu1 = exp(rhobar * sum_i (1/Tbar - 1)^i * sum_j H_ij (rhobar - 1)^j), Eq. (12);
    /// both sums by Horner's rule, from the highest power down.
    /// </summary>
    private static double Residual(double tBar, double rhoBar)
    {
        ReadOnlySpan<double> h = Hij;
        double x = 1.0 / tBar - 1.0;
        double y = rhoBar - 1.0;
        double outer = 0.0;
        for (int i = h.Length / DensityTerms - 1; i >= 0; i--)
        {
            ReadOnlySpan<double> row = h.Slice(i * DensityTerms, DensityTerms);
            double inner = 0.0;
            for (int j = DensityTerms - 1; j >= 0; j--)
                inner = inner * y + row[j];
            outer = outer * x + inner;
        }
        return Math.Exp(rhoBar * outer);
    }

    [DoesNotReturn]
    private static void ThrowNotPositive(double value, string name) =>
        throw new ArgumentOutOfRangeException(name, value, "must be finite and positive");
}
