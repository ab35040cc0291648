using FlowSolve.Core.Pumps;
using MathNet.Numerics;

namespace FlowSolve.Core.Tests.Pumps;

public sealed class NpshCurveTests
{
    [Theory]
    [InlineData(0.01, 1.75)]
    [InlineData(0.05, 3.25)] // 2.5 + 0.01 x (3.0 / 0.04)
    [InlineData(0.09, 6.25)] // beyond the data: the last segment extended
    public void Required_Interpolated_IsPiecewiseLinear(double flow, double expected)
    {
        // Linear interpolation (definition) between (0, 1.5), (0.04, 2.5), (0.08, 5.5), given out of order.
        var curve = NpshCurve.Interpolate([0.08, 0.0, 0.04], [5.5, 1.5, 2.5]);
        Assert.Equal(NpshCurveKind.Interpolated, curve.Kind);
        Assert.Equal(expected, curve.Required(flow), 1e-12);
        Assert.Equal(0.0, curve.DataMinimumFlow);
        Assert.Equal(0.08, curve.DataMaximumFlow);
    }

    [Fact]
    public void Required_Fitted_AgreesWithMathNetFitPolynomial()
    {
        double[] flows = [0.02, 0.04, 0.06, 0.08, 0.1];
        double[] npsh = [1.9, 2.3, 3.1, 4.4, 6.2];
        var curve = NpshCurve.Fit(flows, npsh);
        double[] reference = Fit.Polynomial(flows, npsh, 2);
        foreach (double q in new[] { 0.03, 0.07, 0.1 })
            Assert.Equal(MathNet.Numerics.Polynomial.Evaluate(q, reference), curve.Required(q), 1e-10);
        Assert.True(curve.RmsDeviation > 0);
    }

    [Fact]
    public void Interpolate_TwoPoints_Throws()
    {
        Assert.Equal("flows", Assert.ThrowsAny<ArgumentException>(() => NpshCurve.Interpolate([0.0, 0.1], [1, 2])).ParamName);
        Assert.Equal("npshRequired", Assert.ThrowsAny<ArgumentException>(() => NpshCurve.Interpolate([0.0, 0.1, 0.2], [1, -2, 3])).ParamName);
    }
}
