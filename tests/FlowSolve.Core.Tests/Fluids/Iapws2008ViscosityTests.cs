using FlowSolve.Core.Fluids;

namespace FlowSolve.Core.Tests.Fluids;

public class Iapws2008ViscosityTests
{
    // IAPWS R12-08 (IAPWS, 2008), Table 4: check values of the correlating equation, Eq. (10), with mu2 = 1.
    // From memory, reproduced exactly by an independent implementation. (T in K, rho in kg/m3, mu in micropascal seconds.)
    public static TheoryData<double, double, double> Table4Viscosities => new()
    {
        { 298.15, 998.0, 889.735100 },
        { 298.15, 1200.0, 1437.649467 },
        { 373.15, 1000.0, 307.883622 },
    };

    [Theory]
    [MemberData(nameof(Table4Viscosities))]
    public void Viscosity_ReleaseCheckPoint_MatchesTable4(double kelvin, double density, double expectedMicropascalSeconds)
    {
        RelativeAssert.Equal(expectedMicropascalSeconds * 1e-6, Iapws2008Viscosity.Viscosity(kelvin, density), 1e-8);
    }

    [Fact]
    public void Viscosity_DenserLiquidAtSameTemperature_IsMoreViscous()
    {
        // Common practice: above about 30 degrees C, where water's low-temperature pressure anomaly of viscosity has
        // gone, compressing the liquid makes it more viscous. 320 K is about 47 degrees C.
        double previous = 0.0;
        for (double density = 1000.0; density <= 1200.0; density += 10.0)
        {
            double viscosity = Iapws2008Viscosity.Viscosity(320.0, density);
            Assert.True(viscosity > previous, $"viscosity {viscosity} at {density} kg/m3 does not exceed {previous}");
            previous = viscosity;
        }
    }

    [Theory]
    [InlineData(0.0, 1000.0)]
    [InlineData(-1.0, 1000.0)]
    [InlineData(double.NaN, 1000.0)]
    [InlineData(double.PositiveInfinity, 1000.0)]
    [InlineData(300.0, 0.0)]
    [InlineData(300.0, -5.0)]
    [InlineData(300.0, double.NaN)]
    [InlineData(300.0, double.PositiveInfinity)]
    public void Viscosity_NonPositiveOrNonFiniteArgument_Throws(double kelvin, double density)
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => Iapws2008Viscosity.Viscosity(kelvin, density));
    }
}
