using FlowSolve.Core.Fluids;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Fluids;

public class Iapws97Region4Tests
{
    // IAPWS-IF97 (IAPWS, 2007), Table 35: check values of the saturation-pressure equation, Eq. (30).
    // From memory, reproduced by an independent implementation; the 600 K row is from memory only.
    // (T in K, p_s in MPa.)
    public static TheoryData<double, double> Table35SaturationPressures => new()
    {
        { 300.0, 0.353658941e-2 },
        { 500.0, 0.263889776e1 },
        { 600.0, 0.123443146e2 },
    };

    [Theory]
    [MemberData(nameof(Table35SaturationPressures))]
    public void SaturationPressure_ReleaseCheckPoint_MatchesTable35(double kelvin, double expectedMegapascal)
    {
        RelativeAssert.Equal(expectedMegapascal * 1e6, Iapws97Region4.SaturationPressure(kelvin), 1e-8);
    }

    // IAPWS-IF97 (IAPWS, 2007), Table 36: check values of the saturation-temperature equation, Eq. (31).
    // From memory. (p in MPa, T_s in K.)
    public static TheoryData<double, double> Table36SaturationTemperatures => new()
    {
        { 0.1, 0.372755919e3 },
        { 1.0, 0.453035632e3 },
        { 10.0, 0.584149488e3 },
    };

    [Theory]
    [MemberData(nameof(Table36SaturationTemperatures))]
    public void SaturationTemperature_ReleaseCheckPoint_MatchesTable36(double megapascal, double expectedKelvin)
    {
        RelativeAssert.Equal(expectedKelvin, Iapws97Region4.SaturationTemperature(megapascal * 1e6), 1e-8);
    }

    [Fact]
    public void SaturationPressure_At100Celsius_SlightlyAboveOneAtmosphere()
    {
        // Common practice: water at 100 degrees C has a vapour pressure of about 101.418 kPa, a little above
        // 1 atm (the ITS-90 boiling point at 101325 Pa is about 99.97 degrees C).
        double pressure = Iapws97Region4.SaturationPressure(373.15);
        Assert.InRange(pressure, 101417.0, 101419.0);
    }

    public static TheoryData<double> Pressures => new() { 650.0, 1e3, 101325.0, 1e6, 1e7, 22e6 };

    [Theory]
    [MemberData(nameof(Pressures))]
    public void SaturationTemperature_AnyPressure_AgreesWithBrentInversionOfSaturationPressure(double pressurePa)
    {
        // Independent inversion of the forward equation, Eq. (30), by MathNet.Numerics' Brent root finder.
        // Eqs. (30) and (31) solve the same quadratic, Eq. (28), so they agree to rounding.
        double brent = Brent.FindRoot(t => Iapws97Region4.SaturationPressure(t) / pressurePa - 1.0,
            Iapws97Region4.MinimumTemperature, Iapws97Region4.CriticalTemperature,
            1e-12, 200);
        RelativeAssert.Equal(brent, Iapws97Region4.SaturationTemperature(pressurePa), 1e-10);
    }

    [Theory]
    [InlineData(273.15)]
    [InlineData(300.0)]
    [InlineData(373.15)]
    [InlineData(450.0)]
    [InlineData(640.0)]
    public void SaturationTemperature_OfSaturationPressure_RoundTrips(double kelvin)
    {
        double pressure = Iapws97Region4.SaturationPressure(kelvin);
        RelativeAssert.Equal(kelvin, Iapws97Region4.SaturationTemperature(pressure), 1e-12);
    }

    [Fact]
    public void SaturationPressure_At273_15K_IsStatedMinimumPressure()
    {
        // IAPWS-IF97 (2007) gives p_s(273.15 K) = 611.213 Pa as the low end of region 4 (from memory).
        RelativeAssert.Equal(611.213, Iapws97Region4.SaturationPressure(273.15), 1e-6);
    }

    [Theory]
    [InlineData(273.14)]
    [InlineData(647.1)]
    [InlineData(double.NaN)]
    [InlineData(double.NegativeInfinity)]
    public void SaturationPressure_OutsideSaturationLine_Throws(double kelvin)
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => Iapws97Region4.SaturationPressure(kelvin));
    }

    [Theory]
    [InlineData(611.0)]
    [InlineData(22.1e6)]
    [InlineData(double.NaN)]
    [InlineData(0.0)]
    public void SaturationTemperature_OutsideSaturationLine_Throws(double pressurePa)
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => Iapws97Region4.SaturationTemperature(pressurePa));
    }
}
