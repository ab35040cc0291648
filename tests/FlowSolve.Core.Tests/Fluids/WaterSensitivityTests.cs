using FlowSolve.Core.Fluids;

namespace FlowSolve.Core.Tests.Fluids;

/// <summary>Each temperature derivative against a central difference of <see cref="Water.At"/> (a stated property).</summary>
public sealed class WaterSensitivityTests
{
    // 4 degrees C is avoided for the density (its derivative crosses zero there, so a relative check is meaningless);
    // 99.99 and 99.995 lie above the atmospheric boiling point, where region 1 is evaluated on the saturation line.
    [Theory]
    [InlineData(0.5)]
    [InlineData(10)]
    [InlineData(20)]
    [InlineData(37.5)]
    [InlineData(60)]
    [InlineData(85)]
    [InlineData(99.9)]
    [InlineData(99.99)]
    [InlineData(99.995)]
    public void At_DerivativesMatchCentralDifferences(double celsius)
    {
        var d = WaterSensitivity.At(celsius);
        const double h = 1e-3; // kelvin: small enough to stay on one side of the boiling switch at 99.974 degrees C
        CentralDifference.Check("drho/dT", d.DensityDerivative, t => Water.At(t).Density, celsius, h);
        CentralDifference.Check("dmu/dT", d.DynamicViscosityDerivative, t => Water.At(t).DynamicViscosity, celsius, h);
        CentralDifference.Check("dnu/dT", d.KinematicViscosityDerivative, t => Water.At(t).KinematicViscosity, celsius, h);
        CentralDifference.Check("dps/dT", d.VapourPressureDerivative, t => Water.At(t).VapourPressure, celsius, h);
        Assert.Equal(Water.At(celsius), d.Properties);
    }

    [Fact]
    public void At_DensityPeaksNearFourDegrees()
    {
        // Liquid water is densest at about 3.98 degrees C at 1 atm (Kell 1975, J. Chem. Eng. Data 20, from memory):
        // the derivative changes sign between 3.9 and 4.1 degrees C.
        Assert.True(WaterSensitivity.At(3.9).DensityDerivative > 0);
        Assert.True(WaterSensitivity.At(4.1).DensityDerivative < 0);
    }
}
