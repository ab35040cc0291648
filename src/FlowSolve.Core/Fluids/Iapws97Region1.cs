using System.Diagnostics.CodeAnalysis;

namespace FlowSolve.Core.Fluids;

/// <summary>
/// IAPWS-IF97 region 1 (liquid water): specific volume and density from the dimensionless Gibbs free energy.
/// </summary>
/// <remarks>
/// <para>Source: IAPWS, Revised Release on the IAPWS Industrial Formulation 1997 for the Thermodynamic Properties
/// of Water and Steam (2007), region 1: the basic equation, Eq. (7), with the 34 coefficients of Table 2, the
/// specific volume v = pi * gamma_pi * R * T / p from Table 3, and the derivative gamma_pi from Table 4.
/// Reducing values p* = 16.53 MPa, T* = 1386 K; specific gas constant R = 0.461526 kJ/(kg K) (Eq. (1)).
/// Equation and table numbers are given from memory of the release.</para>
/// <para>Region 1 covers 273.15 K &lt;= T &lt;= 623.15 K for p_s(T) &lt;= p &lt;= 100 MPa, where p_s is the
/// region 4 saturation pressure (<see cref="Iapws97Region4.SaturationPressure"/>): it is the stable liquid,
/// bounded at low pressure by the saturation line. This class checks the temperature and pressure bounds of that
/// rectangle only; keeping p at or above p_s(T) is the caller's job (below it the equation describes superheated,
/// metastable liquid).</para>
/// <para>Allocation-free and thread-safe: the coefficients are constant data and each call is a single pass
/// over the 34 terms.</para>
/// </remarks>
public static class Iapws97Region1
{
    /// <summary>Lowest temperature of region 1, 273.15 K (IAPWS-IF97, 2007).</summary>
    public const double MinimumTemperature = 273.15;

    /// <summary>Highest temperature of region 1, 623.15 K (IAPWS-IF97, 2007).</summary>
    public const double MaximumTemperature = 623.15;

    /// <summary>Highest pressure of region 1, 100 MPa, in Pa (IAPWS-IF97, 2007).</summary>
    public const double MaximumPressure = 100e6;

    /// <summary>Specific gas constant of water used by IAPWS-IF97, 461.526 J/(kg K) (Eq. (1)).</summary>
    public const double SpecificGasConstant = 461.526;

    /// <summary>Reducing pressure p* of region 1, 16.53 MPa, in Pa.</summary>
    public const double ReducingPressure = 16.53e6;

    /// <summary>Reducing temperature T* of region 1, 1386 K.</summary>
    public const double ReducingTemperature = 1386.0;

    // IAPWS-IF97 (2007), Table 2: exponents I_i, J_i and coefficients n_i of Eq. (7), i = 1..34.
    // Collection expressions over ReadOnlySpan of primitives compile to references into the assembly's data
    // section, so reading them allocates nothing.
    internal static ReadOnlySpan<int> I =>
    [
        0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2,
        2, 2, 3, 3, 3, 4, 4, 4, 5, 8, 8, 21, 23, 29, 30, 31, 32,
    ];

    internal static ReadOnlySpan<int> J =>
    [
        -2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1,
        3, 17, -4, 0, 6, -5, -2, 10, -8, -11, -6, -29, -31, -38, -39, -40, -41,
    ];

    internal static ReadOnlySpan<double> N =>
    [
        0.14632971213167, -0.84548187169114, -0.37563603672040e1, 0.33855169168385e1,
        -0.95791963387872, 0.15772038513228, -0.16616417199501e-1, 0.81214629983568e-3,
        0.28319080123804e-3, -0.60706301565874e-3, -0.18990068218419e-1, -0.32529748770505e-1,
        -0.21841717175414e-1, -0.52838357969930e-4, -0.47184321073267e-3, -0.30001780793026e-3,
        0.47661393906987e-4, -0.44141845330846e-5, -0.72694996297594e-15, -0.31679644845054e-4,
        -0.28270797985312e-5, -0.85205128120103e-9, -0.22425281908000e-5, -0.65171222895601e-6,
        -0.14341729937924e-12, -0.40516996860117e-6, -0.12734301741641e-8, -0.17424871230634e-9,
        -0.68762131295531e-18, 0.14478307828521e-19, 0.26335781662795e-22, -0.11947622640071e-22,
        0.18228094581404e-23, -0.93537087292458e-25,
    ];

    /// <summary>Specific volume of liquid water, IAPWS-IF97 region 1.</summary>
    /// <param name="temperatureKelvin">Temperature T in K, 273.15 to 623.15.</param>
    /// <param name="pressurePa">Pressure p in Pa, above 0 and at most 100e6; for the stable liquid p must also be at
    /// least the saturation pressure p_s(T) (not checked here).</param>
    /// <returns>Specific volume v in m3/kg: v = R T gamma_pi(pi, tau) / p* with pi = p/p*, tau = T*/T
    /// (IAPWS-IF97, 2007, Table 3 and Table 4).</returns>
    /// <exception cref="ArgumentOutOfRangeException">A temperature or pressure that is NaN or outside the bounds above.</exception>
    public static double SpecificVolume(double temperatureKelvin, double pressurePa)
    {
        if (!(temperatureKelvin >= MinimumTemperature && temperatureKelvin <= MaximumTemperature))
            ThrowTemperature(temperatureKelvin);
        if (!(pressurePa > 0.0 && pressurePa <= MaximumPressure))
            ThrowPressure(pressurePa);

        double pi = pressurePa / ReducingPressure;
        double tau = ReducingTemperature / temperatureKelvin;
        return SpecificGasConstant * temperatureKelvin * GammaPi(pi, tau) / ReducingPressure;
    }

    /// <summary>Density of liquid water, IAPWS-IF97 region 1: the reciprocal of <see cref="SpecificVolume"/>.</summary>
    /// <param name="temperatureKelvin">Temperature T in K, 273.15 to 623.15.</param>
    /// <param name="pressurePa">Pressure p in Pa, above 0 and at most 100e6 (and at least p_s(T) for the stable liquid).</param>
    /// <returns>Density in kg/m3.</returns>
    /// <exception cref="ArgumentOutOfRangeException">A temperature or pressure that is NaN or outside the bounds above.</exception>
    public static double Density(double temperatureKelvin, double pressurePa) =>
        1.0 / SpecificVolume(temperatureKelvin, pressurePa);

    /// <summary>
    /// gamma_pi = d gamma / d pi = sum over i of -n_i I_i (7.1 - pi)^(I_i - 1) (tau - 1.222)^J_i (Table 4).
    /// Terms with I_i = 0 vanish and are skipped.
    /// </summary>
    private static double GammaPi(double pi, double tau)
    {
        ReadOnlySpan<int> exponentI = I, exponentJ = J;
        ReadOnlySpan<double> n = N;
        double a = 7.1 - pi;
        double b = tau - 1.222;
        double sum = 0.0;
        // The first eight terms of Table 2 have I_i = 0.
        for (int i = 8; i < n.Length; i++)
            sum -= n[i] * exponentI[i] * IntegerPower(a, exponentI[i] - 1) * IntegerPower(b, exponentJ[i]);
        return sum;
    }

    /// <summary>x^k for a small integer k by repeated squaring (exact sign, fewer roundings than Math.Pow's log/exp).</summary>
    internal static double IntegerPower(double x, int k)
    {
        if (k < 0)
        {
            x = 1.0 / x;
            k = -k;
        }
        double result = 1.0;
        while (k != 0)
        {
            if ((k & 1) != 0) result *= x;
            x *= x;
            k >>= 1;
        }
        return result;
    }

    [DoesNotReturn]
    private static void ThrowTemperature(double temperatureKelvin) =>
        throw new ArgumentOutOfRangeException(nameof(temperatureKelvin), temperatureKelvin,
            $"IAPWS-IF97 region 1 needs {MinimumTemperature} K <= T <= {MaximumTemperature} K");

    [DoesNotReturn]
    private static void ThrowPressure(double pressurePa) =>
        throw new ArgumentOutOfRangeException(nameof(pressurePa), pressurePa,
            $"IAPWS-IF97 region 1 needs 0 < p <= {MaximumPressure} Pa");
}
