using FlowSolve.Core.Channels;
using MathNet.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>
/// A hydraulic jump between two controls, against an independent solution (<see cref="GvfTrapezoid"/>): each
/// profile's distance to a depth is MathNet's double-exponential quadrature of dx/dy = (1 - Fr^2)/(S0 - Sf) (Chow 1959,
/// Open-Channel Hydraulics, chapter 9, from memory), a depth at a distance is MathNet's Brent root of that distance, the
/// sequent depth is Brent's root of the momentum function M(y) = b y^2/2 + z y^3/3 + Q^2/(g A) (Chow 1959, chapter 15,
/// from memory; for the rectangle, z = 0, it is checked against Belanger's closed form), and the jump's distance is
/// Brent's root of (sequent depth of the supercritical profile) - (subcritical depth) in distance.
/// </summary>
public class ProfileJumpTests
{
    private const double G = 9.80665;

    /// <summary>The depth of a profile from a control depth y0 at distance d along it (d measured from the control in the
    /// direction the profile runs, positive), the depth lying between y0 and (just short of) the depth it tends to.</summary>
    private static double DepthAt(Func<double, double> distanceOf, double y0, double towards, double d)
    {
        if (d == 0) return y0;
        double shortOf = towards + (y0 - towards) * 1e-10;
        return Brent.FindRoot(y => distanceOf(y) - d, Math.Min(y0, shortOf), Math.Max(y0, shortOf), 1e-15, 500);
    }

    [Theory]
    [InlineData(3.0, 2.0, 10.0, 0.001, 0.025, 400.0, 0.3, 1.6)]   // a gate feeding a mild trapezoid, a weir 400 m downstream
    [InlineData(4.0, 0.0, 12.0, 0.0005, 0.015, 300.0, 0.35, 1.9)] // the same in a rectangle
    [InlineData(3.0, 2.0, 10.0, 0.0, 0.02, 250.0, 0.35, 1.5)]     // a horizontal apron: H3 then H2
    public void JumpBetweenAGateAndAWeir_MatchesTheIndependentSolution(double b, double z, double q, double s0, double n,
        double length, double upstreamDepth, double downstreamDepth)
    {
        var t = new GvfTrapezoid(b, z, n, q, s0);
        ChannelSection section = z == 0 ? new RectangularSection(b) : new TrapezoidalSection(b, z);
        double yc = t.CriticalDepth();
        var p = GraduallyVariedFlow.ProfileBetween(section, q, s0, n, length, upstreamDepth, downstreamDepth, 21);

        Assert.True(p.Converged);
        Assert.NotNull(p.Jump);
        var jump = p.Jump!;
        // The supercritical profile measured downstream from the gate; the subcritical one upstream from the weir.
        double Down(double y) => -t.Upstream(upstreamDepth, y);
        double Up(double y) => t.Upstream(downstreamDepth, y);
        double yn = s0 > 0 ? Brent.FindRoot(y => t.Sf(y) - s0, 1e-6, 100, 1e-15, 500) : double.NaN;
        double upperTowards = yc; // M3 and H3 rise toward critical depth
        double lowerTowards = double.IsNaN(yn) ? 10 * downstreamDepth : yn;
        double F(double x) => t.Sequent(DepthAt(Down, upstreamDepth, upperTowards, length - x), yc)
            - DepthAt(Up, downstreamDepth, lowerTowards, x);
        double reachCritical = length - Down(yc);
        // Just downstream of where the supercritical profile would reach critical depth its sequent depth is close to critical
        // depth, below the subcritical profile: F < 0 there.
        double expected = Brent.FindRoot(F, Math.Max(0, reachCritical + 1e-4 * length), length, 1e-12, 500);

        Assert.Equal(expected, jump.Distance, 1e-8 * length);
        double y1 = DepthAt(Down, upstreamDepth, upperTowards, length - expected);
        Assert.Equal(y1, jump.UpstreamDepth, 1e-8 * y1);
        double y2 = t.Sequent(y1, yc);
        Assert.Equal(y2, jump.SequentDepth, 1e-8 * y2);
        if (z == 0)
        {
            // Belanger (1828): y2 / y1 = (sqrt(1 + 8 Fr1^2) - 1) / 2 in a rectangle.
            double fr1 = q / (b * y1 * Math.Sqrt(G * y1));
            Assert.Equal(y1 * (Math.Sqrt(1 + 8 * fr1 * fr1) - 1) / 2, jump.SequentDepth, 1e-9 * y2);
        }
        double e1 = y1 + q * q / (2 * G * t.A(y1) * t.A(y1)), e2 = y2 + q * q / (2 * G * t.A(y2) * t.A(y2));
        Assert.Equal(e1 - e2, jump.EnergyLoss, 1e-7 * (e1 - e2));

        // Stations: the subcritical profile below the jump, both depths at it, the supercritical profile above it.
        Assert.Equal(23, p.Stations.Count);
        Assert.Equal(0, p.Stations[0].Distance);
        Assert.Equal(downstreamDepth, p.Stations[0].Depth);
        Assert.Equal(length, p.Stations[^1].Distance);
        Assert.Equal(upstreamDepth, p.Stations[^1].Depth);
        for (int k = 1; k < p.Stations.Count; k++) Assert.True(p.Stations[k].Distance >= p.Stations[k - 1].Distance);
        int at = p.Stations.ToList().FindIndex(s => s.Distance == jump.Distance);
        Assert.Equal(jump.SequentDepth, p.Stations[at].Depth, 1e-8 * y2);
        Assert.Equal(jump.UpstreamDepth, p.Stations[at + 1].Depth);
        foreach (var st in p.Stations.Where(s => s.Distance < jump.Distance && s.Distance > 0))
        {
            double e = DepthAt(Up, downstreamDepth, lowerTowards, st.Distance);
            Assert.Equal(e, st.Depth, 1e-9 * e);
            Assert.True(st.FroudeNumber < 1);
        }
        foreach (var st in p.Stations.Where(s => s.Distance > jump.Distance && s.Distance < length))
        {
            double e = DepthAt(Down, upstreamDepth, upperTowards, length - st.Distance);
            Assert.Equal(e, st.Depth, 1e-9 * e);
            Assert.True(st.FroudeNumber > 1);
        }
        // The classes by the usual letters (Chow 1959, chapter 9, from memory): below both yn and yc zone 3, above both zone 1.
        string lowerClass = s0 == 0 ? "H2" : downstreamDepth > yn ? "M1" : "M2";
        Assert.Equal((s0 == 0 ? "H3" : "M3") + "+" + lowerClass, p.ProfileType);
    }

    [Fact]
    public void AHighTailwater_DrownsTheJump_AndTheSubcriticalProfileHoldsAllAlong()
    {
        var t = new GvfTrapezoid(3, 2, 0.025, 10, 0.001);
        var section = new TrapezoidalSection(3, 2);
        double yc = t.CriticalDepth(), upstreamDepth = 0.3, downstreamDepth = 4.0, length = 200;
        double yn = Brent.FindRoot(y => t.Sf(y) - 0.001, 1e-6, 100, 1e-15, 500);
        // Independently: the subcritical depth at the gate exceeds the sequent depth of the gate's depth.
        double atGate = DepthAt(y => t.Upstream(downstreamDepth, y), downstreamDepth, yn, length);
        Assert.True(atGate > t.Sequent(upstreamDepth, yc));

        var p = GraduallyVariedFlow.ProfileBetween(section, 10, 0.001, 0.025, length, upstreamDepth, downstreamDepth, 11);
        Assert.Null(p.Jump);
        Assert.Contains(p.Warnings, w => w.Code == "jump-drowned");
        Assert.Equal(atGate, p.Stations[^1].Depth, 1e-9 * atGate);
        Assert.Equal("M1", p.ProfileType);
    }

    [Fact]
    public void ALowTailwater_OnASteepSlope_SweepsTheJumpOutOfTheReach()
    {
        // S2 below a gate on a steep slope tends to normal depth; a tailwater barely above critical depth has a sequent
        // depth below the supercritical flow's sequent depth everywhere, so the jump forms beyond the reach.
        var t = new GvfTrapezoid(3, 2, 0.015, 10, 0.02);
        var section = new TrapezoidalSection(3, 2);
        double yc = t.CriticalDepth(), yn = Brent.FindRoot(y => t.Sf(y) - 0.02, 1e-6, 100, 1e-15, 500);
        double upstreamDepth = 0.95 * yc, downstreamDepth = 1.02 * yc, length = 100;
        // Independently: at the downstream end the supercritical depth's sequent depth exceeds the tailwater.
        double atEnd = DepthAt(y => -t.Upstream(upstreamDepth, y), upstreamDepth, yn, length);
        Assert.True(t.Sequent(atEnd, yc) > downstreamDepth);

        var p = GraduallyVariedFlow.ProfileBetween(section, 10, 0.02, 0.015, length, upstreamDepth, downstreamDepth, 11);
        Assert.Null(p.Jump);
        Assert.Contains(p.Warnings, w => w.Code == "jump-beyond-reach");
        Assert.Equal(atEnd, p.Stations[0].Depth, 1e-9 * atEnd);
        Assert.Equal("S2", p.ProfileType);
    }

    [Fact]
    public void ControlsOnTheWrongSideOfCriticalDepth_AreRefused()
    {
        var section = new TrapezoidalSection(3, 2);
        double yc = CriticalFlow.CriticalDepth(section, 10).CriticalDepth;
        var up = Assert.Throws<ArgumentOutOfRangeException>(() => GraduallyVariedFlow.ProfileBetween(section, 10, 0.001, 0.025, 100, 1.2 * yc, 2 * yc, 11));
        Assert.Equal("upstreamDepth", up.ParamName);
        var down = Assert.Throws<ArgumentOutOfRangeException>(() => GraduallyVariedFlow.ProfileBetween(section, 10, 0.001, 0.025, 100, 0.5 * yc, 0.8 * yc, 11));
        Assert.Equal("downstreamDepth", down.ParamName);
    }
}
