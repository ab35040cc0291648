using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Tests.Pumps;

public sealed class OperatingCurvesTests
{
    private static readonly PumpCurve Pump = PumpCurve.FromCoefficients(40, 0, -5000);
    private static readonly SystemCurve System = SystemCurve.Quadratic(15, 3000);

    [Fact]
    public void Sample_TwoInParallel_FollowsCombinationRuleAndBracketsDuty()
    {
        var arrangement = PumpArrangement.InParallel(2);
        var duty = DutyPoint.Solve(Pump, System, arrangement);
        var curves = OperatingCurves.Sample(Pump, System, arrangement, duty.Flow);
        Assert.Equal(OperatingCurves.DefaultPoints, curves.Flow.Count);
        // Range: 0 to 1.2 x max(duty, set zero-head flow = 2 sqrt(40/5000)).
        Assert.Equal(1.2 * 2 * Math.Sqrt(40.0 / 5000), curves.Flow[^1], 1e-14);
        for (int i = 0; i < curves.Flow.Count; i++)
        {
            double q = curves.Flow[i];
            Assert.Equal(40 - 5000 * q * q, curves.PumpHead[i], 1e-10); // one pump on the same axis
            Assert.Equal(40 - 5000 * (q / 2) * (q / 2), curves.SetHead[i], 1e-10); // parallel: each pump carries Q/2
            Assert.Equal(15 + 3000 * q * q, curves.SystemHead[i], 1e-10);
            Assert.Equal(q <= duty.Flow, curves.SetHead[i] >= curves.SystemHead[i]); // the curves cross at the duty flow
        }
        Assert.Null(curves.Efficiency);
    }

    [Fact]
    public void Sample_SeriesWithEfficiency_ScalesHeadsAndReadsEfficiencyPerPump()
    {
        var eff = EfficiencyCurve.FromCoefficients(0, 32, -320, 0, 0.08);
        var curves = OperatingCurves.Sample(Pump, System, PumpArrangement.InSeries(2, 0.9), points: 5, efficiency: eff);
        Assert.Equal(5, curves.Flow.Count);
        for (int i = 0; i < 5; i++)
        {
            double q = curves.Flow[i], rated = q / 0.9;
            Assert.Equal(2 * curves.PumpHead[i], curves.SetHead[i], 1e-10); // series: heads add
            Assert.Equal(0.81 * (40 - 5000 * rated * rated), curves.PumpHead[i], 1e-10); // affinity: s^2 H(Q/s)
            Assert.Equal(32 * rated - 320 * rated * rated, curves.Efficiency![i], 1e-12);
        }
    }

    [Theory]
    [InlineData(1)]
    [InlineData(10002)]
    public void Sample_BadPointCount_Throws(int points)
    {
        Assert.Equal("points", Assert.ThrowsAny<ArgumentException>(() => OperatingCurves.Sample(Pump, System, points: points)).ParamName);
    }
}
