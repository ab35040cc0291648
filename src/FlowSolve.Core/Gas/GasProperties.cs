namespace FlowSolve.Core.Gas;

/// <summary>Constants of the gas-line relations.</summary>
public static class GasConstants
{
    /// <summary>Molar gas constant R = 8.314462618 J/(mol K) (CODATA 2018; exact since the 2019 SI, as N_A k, here
    /// rounded to the ten digits issue #20 fixes).</summary>
    public const double MolarGasConstant = 8.314462618;

    /// <summary>Molar mass of dry air, 0.0289647 kg/mol: the reference of <c>specificGravity</c> (the value issue #20 fixes).</summary>
    public const double MolarMassOfAir = 0.0289647;

    /// <summary>Standard reference temperature of <c>standardVolumeFlow</c>: 15 degrees C.</summary>
    public const double StandardTemperature = 15.0;

    /// <summary>Standard reference pressure of <c>standardVolumeFlow</c>: 101 325 Pa (one standard atmosphere).</summary>
    public const double StandardPressure = 101_325.0;

    /// <summary>0 degrees C in kelvin.</summary>
    public const double ZeroCelsius = 273.15;
}

/// <summary>The gas in a line, taken as isothermal with a constant compressibility factor: p = Z rho R T / M.</summary>
/// <param name="MolarMass">Molar mass M, kg/mol; positive.</param>
/// <param name="Temperature">Temperature of the gas along the line, degrees C; above absolute zero.</param>
/// <param name="CompressibilityFactor">Compressibility factor Z (dimensionless), constant along the line; positive.</param>
/// <param name="DynamicViscosity">Dynamic viscosity mu, Pa s; positive (constant along an isothermal line).</param>
/// <param name="HeatCapacityRatio">Ratio of specific heats k = cp/cv (dimensionless), at least 1: used only for the
/// speed of sound sqrt(k Z R T / M) and the Mach numbers.</param>
public readonly record struct GasProperties(double MolarMass, double Temperature, double CompressibilityFactor,
    double DynamicViscosity, double HeatCapacityRatio)
{
    /// <summary>Absolute temperature T, K.</summary>
    public double AbsoluteTemperature => Temperature + GasConstants.ZeroCelsius;

    /// <summary>C = Z R T / M, m2/s2: p / rho, and the square of the isothermal limit velocity.</summary>
    public double PressurePerDensity => CompressibilityFactor * GasConstants.MolarGasConstant * AbsoluteTemperature / MolarMass;

    /// <summary>The isothermal limit velocity sqrt(Z R T / M), m/s: the outlet velocity at which an isothermal line chokes.</summary>
    public double LimitVelocity => Math.Sqrt(PressurePerDensity);

    /// <summary>The speed of sound sqrt(k Z R T / M), m/s.</summary>
    public double SpeedOfSound => Math.Sqrt(HeatCapacityRatio * PressurePerDensity);

    /// <summary>Density at the standard reference state (15 degrees C, 101 325 Pa) with the gas taken as ideal (Z = 1), kg/m3.</summary>
    public double StandardDensity =>
        GasConstants.StandardPressure * MolarMass / (GasConstants.MolarGasConstant * (GasConstants.StandardTemperature + GasConstants.ZeroCelsius));
}

/// <summary>A straight horizontal pipe of constant section.</summary>
/// <param name="Length">Length L, m; positive.</param>
/// <param name="Diameter">Inside diameter D, m; positive.</param>
/// <param name="Roughness">Absolute roughness e, m; 0 or more and below the diameter.</param>
public readonly record struct GasLine(double Length, double Diameter, double Roughness)
{
    /// <summary>Flow area pi D^2 / 4, m2.</summary>
    public double Area => Math.PI * 0.25 * Diameter * Diameter;

    /// <summary>Relative roughness e/D.</summary>
    public double RelativeRoughness => Roughness / Diameter;
}
