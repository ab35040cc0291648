using FlowSolve.Core.Fluids;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Fluids;

public class WaterTests
{
    [Fact]
    public void DynamicViscosity_At20Celsius_MatchesIsoTr3666()
    {
        // ISO/TR 3666: viscosity of water at 20 degrees C and 1 atm, 1.0016 mPa s (from memory).
        RelativeAssert.Equal(1.0016e-3, Water.DynamicViscosity(20.0), 5e-4);
    }

    // Density of air-free water at 1 atm (common practice tables), kg/m3.
    public static TheoryData<double, double> TabulatedDensities => new()
    {
        { 4.0, 999.97 },
        { 20.0, 998.2 },
    };

    [Theory]
    [MemberData(nameof(TabulatedDensities))]
    public void Density_CommonTemperature_MatchesTables(double celsius, double expected)
    {
        RelativeAssert.Equal(expected, Water.Density(celsius), 1e-4);
    }

    [Fact]
    public void VapourPressure_At20Celsius_MatchesTables()
    {
        // Common practice: the vapour pressure of water at 20 degrees C is about 2.339 kPa.
        RelativeAssert.Equal(2339.0, Water.VapourPressure(20.0), 1e-3);
    }

    [Fact]
    public void Density_Maximum_LiesNear4Celsius()
    {
        // Common practice: liquid water is densest at about 3.98 degrees C. The maximum is located independently of
        // the code, as the zero of a central-difference derivative found by MathNet.Numerics' Brent root finder.
        const double h = 1e-3;
        double Slope(double t) => (Water.Density(t + h) - Water.Density(t - h)) / (2 * h);

        double peak = Brent.FindRoot(Slope, 1.0, 8.0, 1e-9, 100);

        Assert.InRange(peak, 3.93, 4.03);
        Assert.True(Slope(1.0) > 0.0 && Slope(8.0) < 0.0, "the density should rise before the peak and fall after it");
        for (double t = 0.0; t <= 100.0; t += 0.5)
            Assert.True(Water.Density(t) <= Water.Density(peak), $"density at {t} C exceeds the density at the peak {peak} C");
    }

    [Fact]
    public void DynamicViscosity_OverFullRange_StrictlyDecreases()
    {
        // Stated property: liquid water at 1 atm becomes less viscous as it warms, everywhere in 0..100 degrees C.
        double previous = double.PositiveInfinity;
        for (int step = 0; step <= 1000; step++)
        {
            double t = step * 0.1;
            double viscosity = Water.DynamicViscosity(t);
            Assert.True(viscosity < previous, $"viscosity {viscosity} at {t} C is not below {previous}");
            previous = viscosity;
        }
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(15.0)]
    [InlineData(60.0)]
    [InlineData(100.0)]
    public void KinematicViscosity_AnyTemperature_IsDynamicOverDensity(double celsius)
    {
        RelativeAssert.Equal(Water.DynamicViscosity(celsius) / Water.Density(celsius), Water.KinematicViscosity(celsius), 1e-15);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(37.5)]
    [InlineData(99.97)]
    [InlineData(99.99)]
    [InlineData(100.0)]
    public void At_AnyTemperature_MatchesTheSingleMethods(double celsius)
    {
        WaterProperties properties = Water.At(celsius);

        Assert.Equal(celsius, properties.Temperature);
        Assert.Equal(Water.Density(celsius), properties.Density);
        Assert.Equal(Water.DynamicViscosity(celsius), properties.DynamicViscosity);
        RelativeAssert.Equal(Water.KinematicViscosity(celsius), properties.KinematicViscosity, 1e-15);
        Assert.Equal(Water.VapourPressure(celsius), properties.VapourPressure);
    }

    [Fact]
    public void SaturationTemperatureAtmospheric_OneAtmosphere_About99_97Celsius()
    {
        // Common practice: on ITS-90 water boils at 99.974 degrees C under 101325 Pa. Independently, MathNet's Brent
        // inverts the forward saturation-pressure equation at 101325 Pa.
        Assert.InRange(Water.SaturationTemperatureAtmospheric, 99.97, 99.98);
        double brentKelvin = Brent.FindRoot(t => Iapws97Region4.SaturationPressure(t) / Water.AtmosphericPressure - 1.0,
            273.15, 647.096, 1e-12, 200);
        Assert.Equal(brentKelvin - 273.15, Water.SaturationTemperatureAtmospheric, 1e-8);
    }

    [Theory]
    [InlineData(0.0, false)]
    [InlineData(99.9, false)]
    [InlineData(99.97, false)]
    [InlineData(99.98, true)]
    [InlineData(100.0, true)]
    public void IsAboveAtmosphericBoiling_NearTopOfRange_SwitchesAtBoilingPoint(double celsius, bool expected)
    {
        Assert.Equal(expected, Water.IsAboveAtmosphericBoiling(celsius));
    }

    [Fact]
    public void Density_AboveAtmosphericBoiling_IsSaturatedLiquidAtTemperature()
    {
        // Documented behaviour: above the boiling point, region 1 is evaluated on the saturation line, p = p_s(T).
        double saturated = Iapws97Region1.Density(373.15, Iapws97Region4.SaturationPressure(373.15));
        Assert.Equal(saturated, Water.Density(100.0));
        // ...which differs from the value at 101325 Pa by far less than the formulation's uncertainty.
        RelativeAssert.Equal(Iapws97Region1.Density(373.15, Water.AtmosphericPressure), Water.Density(100.0), 1e-7);
    }

    [Fact]
    public void Density_AcrossAtmosphericBoilingPoint_IsContinuous()
    {
        double boiling = Water.SaturationTemperatureAtmospheric;
        double below = Water.Density(boiling - 1e-9);
        double above = Water.Density(boiling + 1e-9);
        RelativeAssert.Equal(below, above, 1e-10);
    }

    public static TheoryData<double> OutOfRange => new()
    {
        -0.001, -273.15, 100.001, 150.0, double.NaN, double.PositiveInfinity, double.NegativeInfinity,
    };

    [Theory]
    [MemberData(nameof(OutOfRange))]
    public void Density_OutOfRange_Throws(double celsius) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => Water.Density(celsius));

    [Theory]
    [MemberData(nameof(OutOfRange))]
    public void DynamicViscosity_OutOfRange_Throws(double celsius) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => Water.DynamicViscosity(celsius));

    [Theory]
    [MemberData(nameof(OutOfRange))]
    public void KinematicViscosity_OutOfRange_Throws(double celsius) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => Water.KinematicViscosity(celsius));

    [Theory]
    [MemberData(nameof(OutOfRange))]
    public void VapourPressure_OutOfRange_Throws(double celsius) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => Water.VapourPressure(celsius));

    [Theory]
    [MemberData(nameof(OutOfRange))]
    public void At_OutOfRange_Throws(double celsius) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => Water.At(celsius));

    [Theory]
    [InlineData(20.0, true)]
    [InlineData(99.9, true)]
    [InlineData(99.99, false)] // above the boiling point at 1 atm, 99.974 degrees C (IAPWS-IF97 region 4 at 101325 Pa)
    public void Validity_Region1EndsAtTheAtmosphericBoilingPoint(double celsius, bool liquid)
    {
        var v = Water.Validity(celsius);
        var region1 = Assert.Single(v, c => c.Method == "iapws-if97-region-1");
        Assert.Equal(Water.SaturationTemperatureAtmospheric, region1.Maximum);
        Assert.Equal(liquid, region1.InRange);
        Assert.True(Assert.Single(v, c => c.Method == "iapws-2008-viscosity").InRange);
    }
}
