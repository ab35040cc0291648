namespace FlowSolve.Core.Fluids;

/// <summary>Water's properties at one temperature with their temperature derivatives, as returned by
/// <see cref="WaterSensitivity.At"/>.</summary>
/// <param name="Properties">The properties, exactly as <see cref="Water.At"/> gives them.</param>
/// <param name="DensityDerivative">d rho / dT along the 1 atm isobar (the saturation line above the atmospheric boiling
/// point), kg/(m3 K).</param>
/// <param name="DynamicViscosityDerivative">d mu / dT, Pa s / K, including mu's dependence on the density.</param>
/// <param name="KinematicViscosityDerivative">d nu / dT, m2/(s K).</param>
/// <param name="VapourPressureDerivative">d p_s / dT, Pa/K.</param>
public readonly record struct WaterDerivatives(
    WaterProperties Properties,
    double DensityDerivative,
    double DynamicViscosityDerivative,
    double KinematicViscosityDerivative,
    double VapourPressureDerivative);

/// <summary>
/// Temperature derivatives of <see cref="Water"/>'s properties, by the chain rule through the formulations themselves
/// (no finite differences): the same equations, differentiated term by term.
/// </summary>
/// <remarks>
/// <para>Density (IAPWS-IF97 region 1, IAPWS 2007). With pi = p/p*, tau = T*/T and the specific volume
/// v = R T gamma_pi / p*, the isobaric derivative is dv/dT = (R/p*) (gamma_pi - tau gamma_pi,tau), and the isothermal
/// one dv/dp = R T gamma_pi,pi / p*^2; the second derivatives of the Gibbs function are
/// gamma_pi,pi = sum n_i I_i (I_i - 1) (7.1 - pi)^(I_i - 2) (tau - 1.222)^J_i and
/// gamma_pi,tau = sum -n_i I_i J_i (7.1 - pi)^(I_i - 1) (tau - 1.222)^(J_i - 1) (release, Table 4, from memory).
/// Above the atmospheric boiling point <see cref="Water"/> evaluates region 1 on the saturation line, p = p_s(T), so
/// there the total derivative adds (dv/dp) (dp_s/dT).</para>
/// <para>Vapour pressure (region 4, Eq. (30)): the quotient rule through theta(T) = T + n9/(T - n10) and the
/// quadratic's coefficients A, B, C.</para>
/// <para>Viscosity (IAPWS R12-08, industrial form): ln mu = ln mu* + ln mu0(Tbar) + rhobar S(1/Tbar - 1, rhobar - 1),
/// so d ln mu / dT = [d ln mu0/dTbar - rhobar S_x / Tbar^2] / T* + (S + rhobar S_y) (d rho/dT) / rho*: the density's
/// own temperature dependence enters through the second term. Then nu = mu / rho gives
/// d ln nu / dT = d ln mu / dT - d ln rho / dT.</para>
/// <para>Allocation-free and thread-safe. The tests compare every derivative with a central difference of
/// <see cref="Water.At"/>.</para>
/// </remarks>
public static class WaterSensitivity
{
    /// <summary>The properties and their derivatives with respect to temperature (per kelvin, equal to per degree C).</summary>
    /// <param name="temperatureCelsius">Temperature in degrees C, 0 to 100.</param>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is NaN or outside 0..100 degrees C.</exception>
    public static WaterDerivatives At(double temperatureCelsius)
    {
        var p = Water.At(temperatureCelsius); // validates
        double kelvin = temperatureCelsius + Water.KelvinOffset;

        double dps = VapourPressureDerivative(kelvin);
        bool onSaturation = Water.IsAboveAtmosphericBoiling(temperatureCelsius) && p.VapourPressure > Water.AtmosphericPressure;
        double pressure = onSaturation ? p.VapourPressure : Water.AtmosphericPressure;

        var (dvdT, dvdp) = SpecificVolumeDerivatives(kelvin, pressure);
        double dv = dvdT + (onSaturation ? dvdp * dps : 0.0);
        double rho = p.Density;
        double drho = -rho * rho * dv;

        double dLnMu = LogViscosityDerivative(kelvin, rho, drho);
        double dmu = p.DynamicViscosity * dLnMu;
        double dnu = p.KinematicViscosity * (dLnMu - drho / rho);
        return new WaterDerivatives(p, drho, dmu, dnu, dps);
    }

    /// <summary>(dv/dT at constant p, dv/dp at constant T) of region 1, in m3/(kg K) and m3/(kg Pa).</summary>
    private static (double DvDT, double DvDp) SpecificVolumeDerivatives(double kelvin, double pressure)
    {
        ReadOnlySpan<int> ei = Iapws97Region1.I, ej = Iapws97Region1.J;
        ReadOnlySpan<double> n = Iapws97Region1.N;
        double pi = pressure / Iapws97Region1.ReducingPressure;
        double tau = Iapws97Region1.ReducingTemperature / kelvin;
        double a = 7.1 - pi, b = tau - 1.222;
        double gPi = 0, gPiPi = 0, gPiTau = 0;
        for (int i = 8; i < n.Length; i++) // the first eight terms have I = 0 and drop out of every pi derivative
        {
            int ii = ei[i], jj = ej[i];
            double aPow = Iapws97Region1.IntegerPower(a, ii - 1);
            double bPow = Iapws97Region1.IntegerPower(b, jj);
            gPi -= n[i] * ii * aPow * bPow;
            gPiPi += n[i] * ii * (ii - 1) * Iapws97Region1.IntegerPower(a, ii - 2) * bPow;
            gPiTau -= n[i] * ii * jj * aPow * Iapws97Region1.IntegerPower(b, jj - 1);
        }
        double r = Iapws97Region1.SpecificGasConstant, ps = Iapws97Region1.ReducingPressure;
        return (r / ps * (gPi - tau * gPiTau), r * kelvin * gPiPi / (ps * ps));
    }

    /// <summary>d p_s / dT of IAPWS-IF97 region 4, Eq. (30), in Pa/K.</summary>
    private static double VapourPressureDerivative(double kelvin)
    {
        double t10 = kelvin - Iapws97Region4.N10;
        double theta = kelvin + Iapws97Region4.N9 / t10;
        double dTheta = 1.0 - Iapws97Region4.N9 / (t10 * t10);
        double a = theta * theta + Iapws97Region4.N1 * theta + Iapws97Region4.N2;
        double b = Iapws97Region4.N3 * theta * theta + Iapws97Region4.N4 * theta + Iapws97Region4.N5;
        double c = Iapws97Region4.N6 * theta * theta + Iapws97Region4.N7 * theta + Iapws97Region4.N8;
        double da = (2 * theta + Iapws97Region4.N1) * dTheta;
        double db = (2 * Iapws97Region4.N3 * theta + Iapws97Region4.N4) * dTheta;
        double dc = (2 * Iapws97Region4.N6 * theta + Iapws97Region4.N7) * dTheta;
        double root = Math.Sqrt(b * b - 4.0 * a * c);
        double den = -b + root;
        double dDen = -db + (2 * b * db - 4 * (da * c + a * dc)) / (2 * root);
        double ratio = 2.0 * c / den;
        double dRatio = 2.0 * (dc * den - c * dDen) / (den * den);
        return 4.0 * ratio * ratio * ratio * dRatio * 1e6;
    }

    /// <summary>d ln mu / dT of IAPWS R12-08 with mu2 = 1, the density moving with the temperature at d rho/dT.</summary>
    private static double LogViscosityDerivative(double kelvin, double rho, double drho)
    {
        double tStar = Iapws2008Viscosity.ReducingTemperature, rhoStar = Iapws2008Viscosity.ReducingDensity;
        double tBar = kelvin / tStar, rhoBar = rho / rhoStar;

        // mu0 = 100 sqrt(Tbar) / sum H_i u^i, u = 1/Tbar.
        double u = 1.0 / tBar;
        double sum = Iapws2008Viscosity.H0 + u * (Iapws2008Viscosity.H1 + u * (Iapws2008Viscosity.H2 + u * Iapws2008Viscosity.H3));
        double dSumDu = Iapws2008Viscosity.H1 + u * (2 * Iapws2008Viscosity.H2 + u * 3 * Iapws2008Viscosity.H3);
        double dLnMu0 = 0.5 / tBar + dSumDu * u * u / sum; // d/dTbar; du/dTbar = -u^2

        // ln mu1 = rhobar S(x, y), x = 1/Tbar - 1, y = rhobar - 1.
        ReadOnlySpan<double> h = Iapws2008Viscosity.Hij;
        int m = Iapws2008Viscosity.DensityTerms;
        double x = u - 1.0, y = rhoBar - 1.0;
        double s = 0, sx = 0, sy = 0;
        double xi = 1.0; // x^i
        double xiMinus = 0.0; // i x^(i-1)
        for (int i = 0; i < h.Length / m; i++)
        {
            double inner = 0, innerY = 0, yj = 1.0, jyj = 0.0;
            for (int j = 0; j < m; j++)
            {
                double hij = h[i * m + j];
                inner += hij * yj;
                innerY += hij * jyj;
                jyj = (j + 1) * yj;
                yj *= y;
            }
            s += xi * inner;
            sy += xi * innerY;
            sx += xiMinus * inner;
            xiMinus = (i + 1) * xi;
            xi *= x;
        }
        double dLnMu1DTbar = -rhoBar * sx * u * u; // dx/dTbar = -u^2
        double dLnMu1DRhoBar = s + rhoBar * sy;
        return (dLnMu0 + dLnMu1DTbar) / tStar + dLnMu1DRhoBar * drho / rhoStar;
    }
}
