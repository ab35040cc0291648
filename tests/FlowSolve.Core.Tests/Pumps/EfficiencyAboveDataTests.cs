using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Tests.Pumps;

/// <summary>An efficiency fit through the origin can peak above the catalogue's highest point; the reference is the
/// least-squares fit eta = e1 Q + e2 Q^2 from its 2 x 2 normal equations, solved here by Cramer's rule.</summary>
public sealed class EfficiencyAboveDataTests
{
    private static (double E1, double E2) NormalEquations(double[] q, double[] e)
    {
        double s11 = q.Sum(x => x * x), s12 = q.Sum(x => x * x * x), s22 = q.Sum(x => x * x * x * x);
        double b1 = q.Zip(e, (x, y) => x * y).Sum(), b2 = q.Zip(e, (x, y) => x * x * y).Sum();
        double det = s11 * s22 - s12 * s12;
        return ((b1 * s22 - b2 * s12) / det, (s11 * b2 - s12 * b1) / det);
    }

    [Fact]
    public void Fit_OvershootingCatalogue_FlagsThePeakAboveTheData()
    {
        // A fictional catalogue (the pump of samples/scenario/pumps.http): highest efficiency 0.78 at 0.08 m3/s.
        double[] q = [0.0, 0.03, 0.06, 0.08, 0.09], e = [0.0, 0.55, 0.76, 0.78, 0.74];
        var (e1, e2) = NormalEquations(q, e);
        double peak = -e1 * e1 / (4 * e2); // the parabola's vertex value
        var fit = EfficiencyCurve.Fit(q, e);
        Assert.Equal(peak, fit.Curve.BestEfficiency, 1e-12);
        Assert.Equal(0.78, fit.DataMaximumEfficiency);
        Assert.True(peak > 0.78 + EfficiencyCurveFit.AboveDataMargin);
        Assert.True(fit.PeakAboveData);
        double max = q.Zip(e, (x, y) => Math.Abs(e1 * x + e2 * x * x - y)).Max();
        Assert.Equal(max, fit.MaxDeviation, 1e-12);
    }

    [Fact]
    public void Fit_PointsOnAParabolaThroughTheOrigin_IsNotFlagged()
    {
        // eta = 20 Q - 200 Q^2 peaks at 0.5 (Q = 0.05); a point at the peak makes the data maximum the curve's.
        double[] q = [0.01, 0.03, 0.05, 0.07, 0.09];
        double[] e = q.Select(x => 20 * x - 200 * x * x).ToArray();
        var fit = EfficiencyCurve.Fit(q, e);
        Assert.Equal(0.5, fit.Curve.BestEfficiency, 1e-12);
        Assert.False(fit.PeakAboveData);
    }
}
