namespace FlowSolve.Core.Fluids;

/// <summary>
/// Properties of liquid water at one temperature and standard atmospheric pressure (101325 Pa), as returned by
/// <see cref="Water.At"/>.
/// </summary>
/// <param name="Temperature">Temperature in degrees Celsius, 0 to 100.</param>
/// <param name="Density">Density in kg/m3 (IAPWS-IF97 region 1, 2007).</param>
/// <param name="DynamicViscosity">Dynamic viscosity in Pa s (IAPWS R12-08, 2008, industrial form).</param>
/// <param name="KinematicViscosity">Kinematic viscosity in m2/s: dynamic viscosity divided by density.</param>
/// <param name="VapourPressure">Saturation (vapour) pressure at the temperature, in Pa (IAPWS-IF97 region 4, 2007).</param>
/// <remarks>
/// Above <see cref="Water.SaturationTemperatureAtmospheric"/> (about 99.97 degrees C) the values are those of the
/// saturated liquid at the temperature; see <see cref="Water"/>.
/// </remarks>
public readonly record struct WaterProperties(
    double Temperature,
    double Density,
    double DynamicViscosity,
    double KinematicViscosity,
    double VapourPressure);
