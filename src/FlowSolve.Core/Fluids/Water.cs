using System.Diagnostics.CodeAnalysis;

namespace FlowSolve.Core.Fluids;

/// <summary>
/// Properties of liquid water from 0 to 100 degrees Celsius at standard atmospheric pressure, 101325 Pa:
/// density, dynamic and kinematic viscosity, and vapour pressure.
/// </summary>
/// <remarks>
/// <para>Methods: density from IAPWS-IF97 region 1 (IAPWS, 2007; <see cref="Iapws97Region1"/>); dynamic viscosity
/// from IAPWS R12-08 (2008) in its industrial form, mu2 = 1 with the IF97 density
/// (<see cref="Iapws2008Viscosity"/>); vapour pressure from IAPWS-IF97 region 4 (<see cref="Iapws97Region4"/>).</para>
/// <para>The top of the range. At 101325 Pa water boils at <see cref="SaturationTemperatureAtmospheric"/>, about
/// 99.974 degrees C, the region 4 backward equation evaluated at that pressure; region 1 is valid for the liquid
/// only up to that saturation line. Between that temperature and 100 degrees C these methods accept the
/// temperature and return the properties of the saturated liquid at it: region 1 evaluated at the saturation
/// pressure p_s(T) (at most 101418 Pa, at 100 degrees C) instead of at 101325 Pa, so that every evaluation stays on
/// region 1's boundary rather than in the superheated liquid beyond it. The difference from evaluating at 101325 Pa
/// is a relative change in density of about 5e-8 (93 Pa times water's compressibility), far below the
/// formulation's own uncertainty, and the values are continuous across the switch. Callers that
/// must say so (the API's warnings) test <see cref="IsAboveAtmosphericBoiling"/>.</para>
/// <para>The bottom of the range. 0 degrees C lies a few millikelvin below the melting point of air-free water at
/// 1 atm and 0.01 K below the triple point (common practice); both formulations are smooth there and the liquid
/// values are returned.</para>
/// <para>Every method validates the temperature first and throws <see cref="ArgumentOutOfRangeException"/> for NaN
/// or a value outside 0..100 degrees C. All methods are allocation-free and thread-safe.</para>
/// <para>The values are engineering estimates; a result used for design is to be checked by a qualified
/// engineer.</para>
/// </remarks>
public static class Water
{
    /// <summary>Lowest accepted temperature, 0 degrees C.</summary>
    public const double MinimumTemperature = 0.0;

    /// <summary>Highest accepted temperature, 100 degrees C (see the class remarks for 99.974 to 100 degrees C).</summary>
    public const double MaximumTemperature = 100.0;

    /// <summary>The pressure at which the properties are given: standard atmosphere, 101325 Pa.</summary>
    public const double AtmosphericPressure = 101325.0;

    /// <summary>Offset between the Celsius and Kelvin scales, 273.15 K (SI definition).</summary>
    public const double KelvinOffset = 273.15;

    /// <summary>
    /// The boiling point at <see cref="AtmosphericPressure"/>, in degrees C: the saturation temperature from the
    /// IAPWS-IF97 region 4 backward equation, Eq. (31) (IAPWS, 2007), about 99.974 degrees C.
    /// </summary>
    public static double SaturationTemperatureAtmospheric => SaturationTemperatureAtmosphericKelvin - KelvinOffset;

    // Computed once, from the release's own backward equation, rather than typed in as a rounded constant.
    private static readonly double SaturationTemperatureAtmosphericKelvin =
        Iapws97Region4.SaturationTemperature(AtmosphericPressure);

    /// <summary>
    /// True when water at <see cref="AtmosphericPressure"/> would boil at this temperature, that is above
    /// <see cref="SaturationTemperatureAtmospheric"/>; the properties returned there are the saturated liquid's.
    /// </summary>
    /// <param name="temperatureCelsius">Temperature in degrees C; any value (NaN gives false; not validated).</param>
    /// <returns>True above about 99.974 degrees C.</returns>
    public static bool IsAboveAtmosphericBoiling(double temperatureCelsius) =>
        temperatureCelsius + KelvinOffset > SaturationTemperatureAtmosphericKelvin;

    /// <summary>Density of liquid water at 101325 Pa, IAPWS-IF97 region 1 (IAPWS, 2007, Eq. (7), Table 3).</summary>
    /// <param name="temperatureCelsius">Temperature in degrees C, 0 to 100.</param>
    /// <returns>Density in kg/m3 (about 999.8 at 0 degrees C, 958.4 at 100 degrees C).</returns>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is NaN or outside 0..100 degrees C.</exception>
    public static double Density(double temperatureCelsius)
    {
        Validate(temperatureCelsius);
        return DensityAt(temperatureCelsius + KelvinOffset);
    }

    /// <summary>
    /// Dynamic viscosity of liquid water at 101325 Pa: IAPWS R12-08 (2008), Eq. (10) with mu2 = 1, using the
    /// IAPWS-IF97 density.
    /// </summary>
    /// <param name="temperatureCelsius">Temperature in degrees C, 0 to 100.</param>
    /// <returns>Dynamic viscosity in Pa s (about 1.792e-3 at 0 degrees C, 2.82e-4 at 100 degrees C).</returns>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is NaN or outside 0..100 degrees C.</exception>
    public static double DynamicViscosity(double temperatureCelsius)
    {
        Validate(temperatureCelsius);
        double kelvin = temperatureCelsius + KelvinOffset;
        return Iapws2008Viscosity.Viscosity(kelvin, DensityAt(kelvin));
    }

    /// <summary>Kinematic viscosity of liquid water at 101325 Pa: <see cref="DynamicViscosity"/> divided by <see cref="Density"/>.</summary>
    /// <param name="temperatureCelsius">Temperature in degrees C, 0 to 100.</param>
    /// <returns>Kinematic viscosity in m2/s (about 1.79e-6 at 0 degrees C, 2.94e-7 at 100 degrees C).</returns>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is NaN or outside 0..100 degrees C.</exception>
    public static double KinematicViscosity(double temperatureCelsius)
    {
        Validate(temperatureCelsius);
        double kelvin = temperatureCelsius + KelvinOffset;
        double density = DensityAt(kelvin);
        return Iapws2008Viscosity.Viscosity(kelvin, density) / density;
    }

    /// <summary>Vapour (saturation) pressure of water, IAPWS-IF97 region 4, Eq. (30) (IAPWS, 2007).</summary>
    /// <param name="temperatureCelsius">Temperature in degrees C, 0 to 100.</param>
    /// <returns>Vapour pressure in Pa (about 611 at 0 degrees C, 101418 at 100 degrees C).</returns>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is NaN or outside 0..100 degrees C.</exception>
    public static double VapourPressure(double temperatureCelsius)
    {
        Validate(temperatureCelsius);
        return Iapws97Region4.SaturationPressure(temperatureCelsius + KelvinOffset);
    }

    /// <summary>The ranges of the formulations behind <see cref="At"/> beside a temperature: IAPWS-IF97 region 1 (liquid,
    /// up to the saturation temperature at 1 atm) and the IAPWS 2008 viscosity correlation's 0 to 100 degrees C here.</summary>
    /// <param name="temperatureCelsius">The temperature the properties are evaluated at, degrees C.</param>
    public static IReadOnlyList<ValidityCheck> Validity(double temperatureCelsius) =>
    [
        new("iapws-if97-region-1", "IAPWS-IF97 (1997), region 1: liquid up to the saturation line", "temperature",
            0, SaturationTemperatureAtmospheric, temperatureCelsius),
        new("iapws-2008-viscosity", "IAPWS R12-08 (2008), industrial form", "temperature", 0, 100, temperatureCelsius),
    ];

    /// <summary>All properties at one temperature, each formulation evaluated once.</summary>
    /// <param name="temperatureCelsius">Temperature in degrees C, 0 to 100.</param>
    /// <returns>Density, dynamic and kinematic viscosity and vapour pressure at 101325 Pa (saturated liquid above
    /// <see cref="SaturationTemperatureAtmospheric"/>).</returns>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is NaN or outside 0..100 degrees C.</exception>
    public static WaterProperties At(double temperatureCelsius)
    {
        Validate(temperatureCelsius);
        double kelvin = temperatureCelsius + KelvinOffset;
        double vapourPressure = Iapws97Region4.SaturationPressure(kelvin);
        double density = DensityAt(kelvin, vapourPressure);
        double viscosity = Iapws2008Viscosity.Viscosity(kelvin, density);
        return new WaterProperties(temperatureCelsius, density, viscosity, viscosity / density, vapourPressure);
    }

    /// <summary>Region 1 at 101325 Pa, or at the saturation pressure above the atmospheric boiling point (class remarks).</summary>
    /// <remarks>
    /// Comparing temperatures rather than pressures saves the region 4 evaluation below the boiling point; the
    /// tests agree because p_s(T) rises with T and the switch temperature is region 4's own inverse at 101325 Pa.
    /// The Max guards against p_s falling a rounding error short of 101325 Pa just above the switch.
    /// </remarks>
    private static double DensityAt(double kelvin) =>
        kelvin > SaturationTemperatureAtmosphericKelvin
            ? DensityAt(kelvin, Iapws97Region4.SaturationPressure(kelvin))
            : Iapws97Region1.Density(kelvin, AtmosphericPressure);

    /// <summary>As <see cref="DensityAt(double)"/>, with the vapour pressure at the temperature already known.</summary>
    private static double DensityAt(double kelvin, double vapourPressure) =>
        Iapws97Region1.Density(kelvin,
            kelvin > SaturationTemperatureAtmosphericKelvin ? Math.Max(AtmosphericPressure, vapourPressure) : AtmosphericPressure);

    private static void Validate(double temperatureCelsius)
    {
        if (!(temperatureCelsius >= MinimumTemperature && temperatureCelsius <= MaximumTemperature))
            ThrowTemperature(temperatureCelsius);
    }

    [DoesNotReturn]
    private static void ThrowTemperature(double temperatureCelsius) =>
        throw new ArgumentOutOfRangeException(nameof(temperatureCelsius), temperatureCelsius,
            $"water properties are given for {MinimumTemperature} to {MaximumTemperature} degrees C at {AtmosphericPressure} Pa");
}
