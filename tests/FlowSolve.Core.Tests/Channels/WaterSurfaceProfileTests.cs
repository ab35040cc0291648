using FlowSolve.Core.Channels;
using MathNet.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>
/// Profiles against an independent solution of the same equation written out here for a trapezoid: the distance to a
/// depth is MathNet's double-exponential quadrature of dx/dy = (1 - Fr^2)/(S0 - Sf) (Chow 1959, Open-Channel Hydraulics,
/// chapter 9, from memory), and the depth at a station is MathNet's Brent root of that distance. Each station's depth
/// must agree to 1e-9 relative.
/// </summary>
public class WaterSurfaceProfileTests
{
    private const double G = 9.80665;

    /// <summary>Each station against the independent solution: its depth is the root of the independent distance
    /// function at its distance (Brent between the control depth and, just short of, the depth the profile tends to).</summary>
    private static void AssertStations(WaterSurfaceProfile p, Func<double, double> distanceOf, double y0, double towards, double length)
    {
        double shortOf = towards + (y0 - towards) * 1e-9;
        foreach (var st in p.Stations)
        {
            if (st.Distance == distanceOf(y0)) // the control itself
            {
                Assert.Equal(y0, st.Depth);
                continue;
            }
            double expected = Brent.FindRoot(y => distanceOf(y) - st.Distance, Math.Min(y0, shortOf), Math.Max(y0, shortOf), 1e-15, 500);
            Assert.Equal(expected, st.Depth, 1e-9 * expected);
            Assert.Equal(st.Distance, distanceOf(st.Depth), 1e-9 * length);
        }
    }

    [Fact]
    public void M1_BackwaterFromAWeir_MatchesTheIndependentSolution()
    {
        var t = new GvfTrapezoid(3, 2, 0.025, 10, 0.001);
        var section = new TrapezoidalSection(3, 2);
        double yn = ManningSolver.NormalDepth(section, 10, 0.001, 0.025).NormalDepth;
        double y0 = 2.5; // held by a weir at the downstream end, above normal depth
        var p = GraduallyVariedFlow.Profile(section, 10, 0.001, 0.025, 2000, y0, controlDownstream: true, 21);
        Assert.Equal("M1", p.ProfileType);
        Assert.Equal(SlopeClass.Mild, p.SlopeClass);
        Assert.True(p.Converged);
        Assert.Equal(21, p.Stations.Count);
        Assert.Equal(0, p.Stations[0].Distance);
        Assert.Equal(y0, p.Stations[0].Depth);
        AssertStations(p, y => t.Upstream(y0, y), y0, yn, 2000);
        // Going upstream the surface falls toward normal depth.
        for (int k = 1; k < p.Stations.Count; k++) Assert.True(p.Stations[k].Depth < p.Stations[k - 1].Depth && p.Stations[k].Depth > yn);
    }

    [Fact]
    public void M2_Drawdown_MatchesTheIndependentSolution()
    {
        var t = new GvfTrapezoid(3, 2, 0.025, 10, 0.001);
        var section = new TrapezoidalSection(3, 2);
        double yn = ManningSolver.NormalDepth(section, 10, 0.001, 0.025).NormalDepth;
        double yc = CriticalFlow.CriticalDepth(section, 10).CriticalDepth;
        double y0 = 0.5 * (yn + yc);
        var p = GraduallyVariedFlow.Profile(section, 10, 0.001, 0.025, 1500, y0, controlDownstream: true, 11);
        Assert.Equal("M2", p.ProfileType);
        AssertStations(p, y => t.Upstream(y0, y), y0, yn, 1500);
    }

    [Fact]
    public void M3_BelowAGate_ReachesCriticalDepthInsideTheReach_AndSaysWhere()
    {
        var t = new GvfTrapezoid(3, 2, 0.025, 10, 0.001);
        var section = new TrapezoidalSection(3, 2);
        double yc = CriticalFlow.CriticalDepth(section, 10).CriticalDepth;
        double y0 = 0.3; // below a sluice gate at the upstream end
        double reach = 400;
        var p = GraduallyVariedFlow.Profile(section, 10, 0.001, 0.025, reach, y0, controlDownstream: false, 41);
        Assert.Equal("M3", p.ProfileType);
        // Independent: the distance downstream from the gate to critical depth.
        double toCritical = -t.Upstream(y0, yc);
        Assert.True(toCritical < reach);
        Assert.NotNull(p.CriticalDepthDistance);
        Assert.Equal(reach - toCritical, p.CriticalDepthDistance!.Value, 1e-9 * reach);
        Assert.Contains(p.Warnings, w => w.Code == "reaches-critical-depth");
        // Every station given lies between the gate and the critical point, downstream end first.
        Assert.All(p.Stations, s => Assert.InRange(s.Distance, reach - toCritical - 1e-9, reach));
        foreach (var st in p.Stations.Where(s => s.Depth < yc * (1 - 1e-6)))
        {
            double expected = Brent.FindRoot(y => -t.Upstream(y0, y) - (reach - st.Distance), y0 * (1 - 1e-12), yc, 1e-15, 500);
            Assert.Equal(expected, st.Depth, 1e-9 * expected);
        }
    }

    [Fact]
    public void S2_BelowAChangeOfSlope_MatchesTheIndependentSolution()
    {
        var t = new GvfTrapezoid(3, 2, 0.015, 10, 0.02);
        var section = new TrapezoidalSection(3, 2);
        double yc = CriticalFlow.CriticalDepth(section, 10).CriticalDepth;
        double yn = ManningSolver.NormalDepth(section, 10, 0.02, 0.015).NormalDepth;
        double y0 = 0.95 * yc, reach = 300;
        var p = GraduallyVariedFlow.Profile(section, 10, 0.02, 0.015, reach, y0, controlDownstream: false, 21);
        Assert.Equal("S2", p.ProfileType);
        Assert.Equal(SlopeClass.Steep, p.SlopeClass);
        Assert.Equal(reach, p.Stations[^1].Distance);
        Assert.Equal(y0, p.Stations[^1].Depth);
        // Measured downstream from the control, the distance is the integral of (1 - Fr^2)/(S0 - Sf).
        AssertStations(p, y => reach - (-t.Upstream(y0, y)), y0, yn, reach);
    }

    [Fact]
    public void Steep_And_Horizontal_Classes()
    {
        var section = new TrapezoidalSection(3, 2);
        double yc = CriticalFlow.CriticalDepth(section, 10).CriticalDepth;
        var s2 = GraduallyVariedFlow.Profile(section, 10, 0.02, 0.015, 300, 0.95 * yc, controlDownstream: false, 11);
        Assert.Equal(SlopeClass.Steep, s2.SlopeClass);
        Assert.Equal("S2", s2.ProfileType);
        var h2 = GraduallyVariedFlow.Profile(section, 10, 0.0, 0.025, 300, 1.5 * yc, controlDownstream: true, 11);
        Assert.Equal("H2", h2.ProfileType);
        Assert.True(h2.Stations[^1].Depth > h2.Stations[0].Depth); // rises upstream
        Assert.Equal(ProfileProblem.DownstreamControlSupercritical, GraduallyVariedFlow.Check(section, 10, 0.5 * yc, controlDownstream: true));
        Assert.Equal(ProfileProblem.UpstreamControlSubcritical, GraduallyVariedFlow.Check(section, 10, 2 * yc, controlDownstream: false));
    }
}
