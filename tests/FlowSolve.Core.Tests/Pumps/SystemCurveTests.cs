using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Tests.Pumps;

public sealed class SystemCurveTests
{
    [Fact]
    public void HeadAndSlope_Quadratic_IsStaticPlusKQSquared()
    {
        // Definition: H = Hs + K Q^2, dH/dQ = 2 K Q.
        var curve = SystemCurve.Quadratic(12.5, 2400);
        var (h, dh) = curve.HeadAndSlope(0.05);
        Assert.Equal(12.5 + 2400 * 0.0025, h, 1e-12);
        Assert.Equal(2 * 2400 * 0.05, dh, 1e-12);
        Assert.False(curve.HasPipes);
    }

    [Fact]
    public void HeadAndSlope_Pipes_SumsPipeHeadLossesAndMatchesCentralDifference()
    {
        // Pipes in series carry the same flow; their Darcy-Weisbach losses add (continuity and energy).
        var fluid = new FluidProperties(1.004e-6, 998.2);
        var pipes = new[] { new PipeGeometry(40, 0.2, 0.05e-3, 1.5), new PipeGeometry(600, 0.15, 0.1e-3, 6.0) };
        var curve = SystemCurve.FromPipes(18, pipes, fluid, coefficient: 500);
        const double q = 0.045;
        double expected = 18 + 500 * q * q + PipeHeadLoss.Compute(pipes[0], fluid, q).HeadLoss + PipeHeadLoss.Compute(pipes[1], fluid, q).HeadLoss;
        var (h, dh) = curve.HeadAndSlope(q);
        Assert.Equal(expected, h, 1e-12 * expected);
        const double step = 1e-6;
        double central = (curve.Head(q + step) - curve.Head(q - step)) / (2 * step);
        Assert.Equal(central, dh, 1e-6 * central);
        Assert.Equal(2, curve.Pipes.Count);
    }

    [Fact]
    public void FromPipes_BadPipe_ThrowsNamingPipeAndField()
    {
        var pipes = new[] { new PipeGeometry(40, 0.2, 0), new PipeGeometry(600, -0.15, 0) };
        var e = Assert.ThrowsAny<ArgumentException>(() => SystemCurve.FromPipes(10, pipes, new FluidProperties(1e-6)));
        Assert.Equal("pipes[1].diameter", e.ParamName);
        Assert.Equal("pipes", Assert.ThrowsAny<ArgumentException>(() => SystemCurve.FromPipes(10, [], new FluidProperties(1e-6))).ParamName);
        Assert.Equal("coefficient", Assert.ThrowsAny<ArgumentException>(() => SystemCurve.Quadratic(10, -1)).ParamName);
        Assert.Equal("staticHead", Assert.ThrowsAny<ArgumentException>(() => SystemCurve.Quadratic(double.NaN, 1)).ParamName);
    }
}
