using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Tests.Pumps;

/// <summary>A rising pump curve whose shut-off head is below the static head but which climbs above the system curve:
/// the intersections in closed form (the quadratic formula) are the reference.</summary>
public sealed class RisingCurveDutyPointTests
{
    /// <summary>Roots of c0 - hs + c1 Q + (c2 - k) Q^2 = 0, ascending.</summary>
    private static (double Low, double High) Intersections(double c0, double c1, double c2, double hs, double k)
    {
        double a = c2 - k, b = c1, c = c0 - hs, disc = Math.Sqrt(b * b - 4 * a * c);
        double r1 = (-b + disc) / (2 * a), r2 = (-b - disc) / (2 * a);
        return (Math.Min(r1, r2), Math.Max(r1, r2));
    }

    [Theory]
    [InlineData(40, 400, -20000, 41, 0)]
    [InlineData(40, 400, -20000, 41.5, 1000)]
    [InlineData(30, 900, -30000, 30, 2000)]
    public void Solve_RisingCurveAboveTheSystemCurve_ReturnsTheStableIntersection(double c0, double c1, double c2, double hs, double k)
    {
        var (low, high) = Intersections(c0, c1, c2, hs, k);
        var r = DutyPoint.Solve(PumpCurve.FromCoefficients(c0, c1, c2), SystemCurve.Quadratic(hs, k));
        Assert.Equal(DutyStatus.Solved, r.Status);
        // Stable: the pump curve falls through the system curve there (its slope is below the system's).
        Assert.Equal(high, r.Flow, high * 1e-10);
        Assert.True(c1 + 2 * c2 * r.Flow < 2 * k * r.Flow);
        if (c0 < hs) Assert.Equal(low, r.UnstableFlow!.Value, Math.Max(low, 1e-12) * 1e-8);
        else Assert.Equal(0.0, r.UnstableFlow!.Value);
        Assert.True(r.Warnings.HasFlag(PumpWarnings.RisingCurve));
        var warning = Assert.Single(r.DescribeWarnings(), w => w.Code == "rising-pump-curve");
        Assert.Contains("stable intersection", warning.Message);
    }

    [Fact]
    public void Solve_RisingCurveThatNeverReachesTheSystem_IsStillShutOffBelowStaticHead()
    {
        // H peaks at 40 + 400^2 / 80000 = 42 m (at 0.01 m3/s); a static head of 43 m is out of reach.
        var r = DutyPoint.Solve(PumpCurve.FromCoefficients(40, 400, -20000), SystemCurve.Quadratic(43, 0));
        Assert.Equal(DutyStatus.ShutOffBelowStaticHead, r.Status);
        Assert.Equal(42 - 43, r.ClosestApproach, 1e-9);
        Assert.Equal(0.01, r.ClosestApproachFlow, 1e-7);
        Assert.Null(r.UnstableFlow);
    }
}
