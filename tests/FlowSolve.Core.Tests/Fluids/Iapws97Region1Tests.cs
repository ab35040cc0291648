using FlowSolve.Core.Fluids;

namespace FlowSolve.Core.Tests.Fluids;

public class Iapws97Region1Tests
{
    // IAPWS-IF97 (IAPWS, 2007), Table 5: check values of specific volume computed from the region 1 equation.
    // From memory, reproduced by an independent implementation. (T in K, p in MPa, v in m3/kg.)
    public static TheoryData<double, double, double> Table5SpecificVolumes => new()
    {
        { 300.0, 3.0, 0.100215168e-2 },
        { 300.0, 80.0, 0.971180894e-3 },
        { 500.0, 3.0, 0.120241800e-2 },
    };

    [Theory]
    [MemberData(nameof(Table5SpecificVolumes))]
    public void SpecificVolume_ReleaseCheckPoint_MatchesTable5(double kelvin, double megapascal, double expected)
    {
        // The table gives nine significant figures; 1e-8 allows for the rounding of the last one.
        RelativeAssert.Equal(expected, Iapws97Region1.SpecificVolume(kelvin, megapascal * 1e6), 1e-8);
    }

    [Theory]
    [MemberData(nameof(Table5SpecificVolumes))]
    public void Density_ReleaseCheckPoint_IsReciprocalOfTable5Volume(double kelvin, double megapascal, double expected)
    {
        RelativeAssert.Equal(1.0 / expected, Iapws97Region1.Density(kelvin, megapascal * 1e6), 1e-8);
    }

    [Fact]
    public void Density_RisingPressureAtFixedTemperature_Increases()
    {
        // Stated property: the liquid is compressible with a positive compressibility, so density rises with pressure.
        double previous = 0.0;
        for (double pressure = 1e5; pressure <= 100e6; pressure += 1e6)
        {
            double density = Iapws97Region1.Density(320.0, pressure);
            Assert.True(density > previous, $"density {density} at {pressure} Pa does not exceed {previous}");
            previous = density;
        }
    }

    public static TheoryData<double, double> OutsideRegion => new()
    {
        { 273.14, 1e5 },
        { 623.16, 20e6 },
        { double.NaN, 1e5 },
        { double.PositiveInfinity, 1e5 },
        { 300.0, 0.0 },
        { 300.0, -1.0 },
        { 300.0, 100.001e6 },
        { 300.0, double.NaN },
    };

    [Theory]
    [MemberData(nameof(OutsideRegion))]
    public void SpecificVolume_OutsideRegion1Bounds_Throws(double kelvin, double pressurePa)
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => Iapws97Region1.SpecificVolume(kelvin, pressurePa));
    }
}
