using UnitsNet;
using UnitSystem = FlowSolve.Api.Hosting.UnitSystem;
using Units = FlowSolve.Api.Hosting.Units;
using FlowUnit = FlowSolve.Api.Hosting.FlowUnit;

namespace FlowSolve.Api.Tests.Pipes;

/// <summary>Every factor in Hosting/UnitSystem.cs against UnitsNet 5.75.1 (an independent, widely used units library).
/// FlowSolve's factors are the exact definitions of NIST SP 811 (2008), appendix B. UnitsNet agrees to 1e-10
/// relative (it stores some factors to 11 figures, for example ft3/s as 35.314666721 per m3/s) except where it rounds
/// harder: lb/ft3 as 1/0.062427961 kg/m3 (8 figures) and ft2/s as 10.7639 per m2/s (6 figures); there the tolerance is that rounding, and <see cref="Factors_AreTheNistDefinitions"/> checks the exact
/// values directly.</summary>
/// <remarks>Kept in the Pipes folder because the pipe endpoints are the first to convert requests into SI.</remarks>
public sealed class UnitSystemTests
{
    private const double Tolerance = 1e-10;
    private const double UnitsNetDensityRounding = 1e-8;   // 1/0.062427961
    private const double UnitsNetViscosityRounding = 2e-6; // 10.7639 against 10.76391041671...

    private static void Close(double expected, double actual, double tolerance = Tolerance) =>
        Assert.True(Math.Abs(actual - expected) <= tolerance * Math.Abs(expected), $"expected {expected:R} within {tolerance:G2}, got {actual:R}");

    [Fact]
    public void Factors_AreTheNistDefinitions()
    {
        // NIST SP 811 (2008), appendix B: 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 lb = 0.45359237 kg, g = 9.80665 m/s2,
        // 1 US gal = 231 in3 (all exact); the products below are exact decimal expansions worked by hand.
        Assert.Equal(0.09290304, Units.Foot * Units.Foot, 1e-17);
        Assert.Equal(0.028316846592, Units.CubicFoot, 1e-17);
        Assert.Equal(3.785411784e-3, Units.UsGallon, 1e-18);
        Assert.Equal(6.30901964e-5, Units.UsGallonPerMinute, 1e-19);
        Assert.Equal(4.4482216152605, Units.PoundForce, 1e-13);
        Assert.Equal(16.018463373960138, Units.PoundPerCubicFoot, 1e-13);
        Assert.Equal(6894.757293168361, Units.Psi, 1e-9);
    }

    private static readonly UnitSystem Us = new(true);

    [Fact]
    public void Constants_MatchUnitsNet()
    {
        Close(Length.FromFeet(1).Meters, Units.Foot);
        Close(Mass.FromPounds(1).Kilograms, Units.Pound);
        Close(Acceleration.FromStandardGravity(1).MetersPerSecondSquared, Units.StandardGravity);
        Close(Force.FromPoundsForce(1).Newtons, Units.PoundForce);
        Close(Pressure.FromPoundsForcePerSquareInch(1).Pascals, Units.Psi);
        Close(Volume.FromUsGallons(1).CubicMeters, Units.UsGallon);
        Close(Volume.FromCubicFeet(1).CubicMeters, Units.CubicFoot);
        Close(VolumeFlow.FromUsGallonsPerMinute(1).CubicMetersPerSecond, Units.UsGallonPerMinute);
        Close(Density.FromPoundsPerCubicFoot(1).KilogramsPerCubicMeter, Units.PoundPerCubicFoot, UnitsNetDensityRounding);
    }

    [Theory]
    [InlineData(0.2)]
    [InlineData(123.456)]
    public void Conversions_MatchUnitsNet(double si)
    {
        Close(Length.FromMeters(si).Feet, Us.Length(si));
        Close(Speed.FromMetersPerSecond(si).FeetPerSecond, Us.Velocity(si));
        Close(KinematicViscosity.FromSquareMetersPerSecond(si).SquareFeetPerSecond, Us.KinematicViscosity(si), UnitsNetViscosityRounding);
        Close(Density.FromKilogramsPerCubicMeter(si).PoundsPerCubicFoot, Us.Density(si), UnitsNetDensityRounding);
        Close(Pressure.FromPascals(si).PoundsForcePerSquareInch, Us.Pressure(si));
        Close(DynamicViscosity.FromNewtonSecondsPerMeterSquared(si).PoundsForceSecondPerSquareFoot, Us.DynamicViscosity(si));
        Close(VolumeFlow.FromCubicMetersPerSecond(si).CubicFeetPerSecond, FlowUnit.CubicFootPerSecond.FromSi(si));
        Close(VolumeFlow.FromCubicMetersPerSecond(si).UsGallonsPerMinute, FlowUnit.UsGallonPerMinute.FromSi(si));

        Close(Length.FromFeet(si).Meters, Us.LengthToSi(si));
        Close(KinematicViscosity.FromSquareFeetPerSecond(si).SquareMetersPerSecond, Us.KinematicViscosityToSi(si), UnitsNetViscosityRounding);
        Close(Density.FromPoundsPerCubicFoot(si).KilogramsPerCubicMeter, Us.DensityToSi(si), UnitsNetDensityRounding);
        Close(VolumeFlow.FromCubicFeetPerSecond(si).CubicMetersPerSecond, FlowUnit.CubicFootPerSecond.ToSi(si));
        Close(VolumeFlow.FromUsGallonsPerMinute(si).CubicMetersPerSecond, FlowUnit.UsGallonPerMinute.ToSi(si));
    }

    [Theory]
    [InlineData(32.0)]
    [InlineData(68.0)]
    [InlineData(212.0)]
    public void Temperature_MatchesUnitsNet(double fahrenheit)
    {
        double celsius = Temperature.FromDegreesFahrenheit(fahrenheit).DegreesCelsius;
        Assert.Equal(celsius, Us.TemperatureToCelsius(fahrenheit), 1e-12);
        Assert.Equal(fahrenheit, Us.Temperature(celsius), 1e-12);
    }

    [Fact]
    public void Si_IsIdentity()
    {
        var si = UnitSystem.Si;
        Assert.Equal(0.37, si.LengthToSi(0.37));
        Assert.Equal(0.37, si.DensityToSi(0.37));
        Assert.Equal(0.37, FlowUnit.CubicMetrePerSecond.ToSi(0.37));
    }
}
