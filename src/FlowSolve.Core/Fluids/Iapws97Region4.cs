using System.Diagnostics.CodeAnalysis;

namespace FlowSolve.Core.Fluids;

/// <summary>
/// IAPWS-IF97 region 4: the saturation line between liquid water and steam, as saturation pressure versus
/// temperature and its inverse.
/// </summary>
/// <remarks>
/// <para>Source: IAPWS, Revised Release on the IAPWS Industrial Formulation 1997 for the Thermodynamic Properties
/// of Water and Steam (2007), region 4: the implicit saturation equation, Eq. (28), in beta = (p_s/p*)^(1/4) and
/// theta = T_s/T* + n9 / (T_s/T* - n10) (Eqs. (29a), (29b)), with the ten coefficients of Table 34 and
/// p* = 1 MPa, T* = 1 K. Eq. (28) is quadratic in both beta and theta, so its two explicit solutions, the
/// saturation-pressure equation, Eq. (30), and the saturation-temperature (backward) equation, Eq. (31), are exact
/// inverses of each other up to rounding. Equation and table numbers are given from memory of the release.</para>
/// <para>Valid from 273.15 K (extrapolated the 0.01 K below the triple point, as the release allows) to the
/// critical temperature 647.096 K, that is from 611.213 Pa (rounded) to 22.064 MPa.</para>
/// <para>Allocation-free and thread-safe.</para>
/// </remarks>
public static class Iapws97Region4
{
    /// <summary>Lowest temperature of the saturation equations, 273.15 K (IAPWS-IF97, 2007).</summary>
    public const double MinimumTemperature = 273.15;

    /// <summary>Critical temperature, 647.096 K: the highest temperature of the saturation line (IAPWS-IF97, 2007).</summary>
    public const double CriticalTemperature = 647.096;

    /// <summary>
    /// The lowest pressure of the saturation equations, in Pa: p_s(273.15 K) from Eq. (30), 611.2127 Pa, which the
    /// release states rounded as 611.213 Pa (IAPWS-IF97, 2007). Computed rather than typed in, so that
    /// <see cref="SaturationTemperature"/> accepts every pressure <see cref="SaturationPressure"/> returns.
    /// </summary>
    public static double MinimumPressure { get; } = SaturationPressure(MinimumTemperature);

    /// <summary>Critical pressure, 22.064 MPa, in Pa: the highest pressure of the saturation line (IAPWS-IF97, 2007).</summary>
    public const double CriticalPressure = 22.064e6;

    // IAPWS-IF97 (2007), Table 34: n1..n10 of Eq. (28).
    internal const double N1 = 0.11670521452767e4;
    internal const double N2 = -0.72421316703206e6;
    internal const double N3 = -0.17073846940092e2;
    internal const double N4 = 0.12020824702470e5;
    internal const double N5 = -0.32325550322333e7;
    internal const double N6 = 0.14915108613530e2;
    internal const double N7 = -0.48232657361591e4;
    internal const double N8 = 0.40511340542057e6;
    internal const double N9 = -0.23855557567849;
    internal const double N10 = 0.65017534844798e3;

    /// <summary>Saturation (vapour) pressure of water at a temperature, IAPWS-IF97 Eq. (30).</summary>
    /// <param name="temperatureKelvin">Temperature T in K, 273.15 to 647.096.</param>
    /// <returns>Saturation pressure p_s in Pa, 611.2127 to 22.064e6.</returns>
    /// <exception cref="ArgumentOutOfRangeException">A temperature that is NaN or outside 273.15..647.096 K.</exception>
    public static double SaturationPressure(double temperatureKelvin)
    {
        if (!(temperatureKelvin >= MinimumTemperature && temperatureKelvin <= CriticalTemperature))
            ThrowTemperature(temperatureKelvin);

        // Eq. (29b) with T* = 1 K, then the coefficients of Eq. (28) as a quadratic in beta^2.
        double theta = temperatureKelvin + N9 / (temperatureKelvin - N10);
        double a = theta * theta + N1 * theta + N2;
        double b = N3 * theta * theta + N4 * theta + N5;
        double c = N6 * theta * theta + N7 * theta + N8;
        // Eq. (30): p_s / p* = [2C / (-B + sqrt(B^2 - 4AC))]^4, with p* = 1 MPa.
        double ratio = 2.0 * c / (-b + Math.Sqrt(b * b - 4.0 * a * c));
        double squared = ratio * ratio;
        return squared * squared * 1e6;
    }

    /// <summary>Saturation temperature of water at a pressure, IAPWS-IF97 backward Eq. (31).</summary>
    /// <param name="pressurePa">Pressure p in Pa, <see cref="MinimumPressure"/> (611.2127) to 22.064e6.</param>
    /// <returns>Saturation temperature T_s in K, 273.15 to 647.096.</returns>
    /// <exception cref="ArgumentOutOfRangeException">A pressure that is NaN or outside <see cref="MinimumPressure"/>..22.064 MPa.</exception>
    public static double SaturationTemperature(double pressurePa)
    {
        if (!(pressurePa >= MinimumPressure && pressurePa <= CriticalPressure))
            ThrowPressure(pressurePa);

        // Eq. (29a) with p* = 1 MPa, then the coefficients of Eq. (28) as a quadratic in theta.
        double beta = Math.Sqrt(Math.Sqrt(pressurePa * 1e-6));
        double e = beta * beta + N3 * beta + N6;
        double f = N1 * beta * beta + N4 * beta + N7;
        double g = N2 * beta * beta + N5 * beta + N8;
        double d = 2.0 * g / (-f - Math.Sqrt(f * f - 4.0 * e * g));
        // Eq. (31), with T* = 1 K.
        double s = N10 + d;
        return 0.5 * (s - Math.Sqrt(s * s - 4.0 * (N9 + N10 * d)));
    }

    [DoesNotReturn]
    private static void ThrowTemperature(double temperatureKelvin) =>
        throw new ArgumentOutOfRangeException(nameof(temperatureKelvin), temperatureKelvin,
            $"IAPWS-IF97 region 4 needs {MinimumTemperature} K <= T <= {CriticalTemperature} K");

    [DoesNotReturn]
    private static void ThrowPressure(double pressurePa) =>
        throw new ArgumentOutOfRangeException(nameof(pressurePa), pressurePa,
            $"IAPWS-IF97 region 4 needs {MinimumPressure} Pa <= p <= {CriticalPressure} Pa");
}
