using FlowSolve.Core.Channels;
using MathNet.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Channels;

public class HydraulicJumpTests
{
    private const double G = 9.80665;

    // Rectangular channels: the Belanger equation y2/y1 = (sqrt(1 + 8 Fr1^2) - 1)/2 (Belanger 1828; Chow 1959,
    // Open-Channel Hydraulics, eq. 15-3, from memory) and the energy loss (y2 - y1)^3 / (4 y1 y2) (Chow 1959, eq. 15-4,
    // from memory), both closed forms of the momentum and energy equations for the rectangle.
    [Theory]
    [InlineData(3.0, 15.0, 0.6)]
    [InlineData(1.0, 0.5, 0.08)]
    [InlineData(12.0, 400.0, 0.9)]
    [InlineData(2.0, 4.0, 0.55)] // Froude number about 1.6: an undular jump, still a momentum balance
    public void Rectangle_MatchesBelanger(double width, double flow, double y1)
    {
        var r = HydraulicJump.Solve(new RectangularSection(width), flow, y1);
        double fr1 = flow / (width * y1) / Math.Sqrt(G * y1);
        double y2 = y1 * (Math.Sqrt(1 + 8 * fr1 * fr1) - 1) / 2;
        Assert.True(r.Converged);
        Assert.Equal(fr1, r.UpstreamFroudeNumber, 1e-13 * fr1);
        Assert.Equal(y2, r.SequentDepth, 1e-12 * y2);
        Assert.Equal(Math.Pow(y2 - y1, 3) / (4 * y1 * y2), r.EnergyLoss, 1e-9 * r.EnergyLoss + 1e-14);
        Assert.Equal(6.1 * r.SequentDepth, r.JumpLength, 1e-12);
        Assert.InRange(r.Iterations, 1, 20);
    }

    [Theory]
    [InlineData(2.0, 1.5, 1.5, 10.0, 0.3)]  // trapezoid
    [InlineData(0.0, 1.0, 2.0, 2.0, 0.2)]   // triangle (asymmetric)
    [InlineData(4.0, 0.0, 0.0, 30.0, 0.5)]  // rectangle through the trapezoid formula
    public void Trapezoid_And_Triangle_AgreeWithAnIndependentBrentSolve(double b, double zl, double zr, double flow, double y1)
    {
        ChannelSection section = b == 0 ? new TriangularSection(zl, zr) : new TrapezoidalSection(b, zl, zr);
        // Written out here: A = b y + (zl + zr) y^2/2, and A ybar = integral of A = b y^2/2 + (zl + zr) y^3/6.
        double M(double y) => b * y * y / 2 + (zl + zr) * y * y * y / 6 + flow * flow / (G * (b * y + (zl + zr) * y * y / 2));
        double m1 = M(y1);
        double yc = CriticalFlow.CriticalDepth(section, flow).CriticalDepth;
        double hi = yc;
        while (M(hi) < m1) hi *= 2;
        double expected = Brent.FindRoot(y => M(y) - m1, yc, hi, 1e-14, 200);

        var r = HydraulicJump.Solve(section, flow, y1);
        Assert.True(r.Converged);
        Assert.Equal(expected, r.SequentDepth, 1e-11 * expected);
        Assert.True(r.DownstreamFroudeNumber < 1 && r.UpstreamFroudeNumber > 1);
        Assert.True(r.EnergyLoss > 0);
    }

    [Theory]
    [InlineData(1.0, 0.4)]
    [InlineData(1.0, 0.7)]
    [InlineData(2.5, 0.1)]
    public void FirstMoment_Circle_IsTheIntegralOfTheArea(double diameter, double ratio)
    {
        var c = new CircularSection(diameter);
        double y = ratio * diameter;
        // Independent: integrate the area A(eta) = (D^2/8)(theta - sin theta), theta = 2 acos(1 - 2 eta/D), numerically.
        double Area(double eta) { double t = 2 * Math.Acos(1 - 2 * eta / diameter); return diameter * diameter / 8 * (t - Math.Sin(t)); }
        double integral = Integrate.OnClosedInterval(Area, 0, y, 1e-15);
        Assert.Equal(integral, HydraulicJump.FirstMoment(c, y), 1e-12 * integral);
        // A full pipe's centroid is at its centre: A ybar = (pi D^2/4)(D/2).
        Assert.Equal(Math.PI * diameter * diameter / 4 * diameter / 2, HydraulicJump.FirstMoment(c, diameter), 1e-13);
    }

    [Fact]
    public void Circle_SequentDepthMatchesAnIndependentRootOfTheMomentumFunction()
    {
        var c = new CircularSection(1.5);
        double flow = 1.2, y1 = 0.25;
        double Area(double eta) { double t = 2 * Math.Acos(1 - 2 * eta / 1.5); return 1.5 * 1.5 / 8 * (t - Math.Sin(t)); }
        double M(double y) => Integrate.OnClosedInterval(Area, 0, y, 1e-15) + flow * flow / (G * Area(y));
        double m1 = M(y1);
        double yc = CriticalFlow.CriticalDepth(c, flow).CriticalDepth;
        double expected = Brent.FindRoot(y => M(y) - m1, yc, 1.5, 1e-13, 200);
        var r = HydraulicJump.Solve(c, flow, y1);
        Assert.True(r.Converged);
        Assert.Equal(expected, r.SequentDepth, 1e-10 * expected);
    }

    [Fact]
    public void Surveyed_EqualsTheTrapezoidItDescribes_AndItsFirstMomentIsExact()
    {
        // A survey of a trapezoid, bottom 3 m, side slopes 2:1, 4 m deep, and the same trapezoid as a shape.
        var survey = new SurveyedSection([0, 8, 11, 19], [4, 0, 0, 4]);
        var trapezoid = new TrapezoidalSection(3, 2);
        foreach (double y in new[] { 0.3, 1.0, 2.7, 4.0 })
            Assert.Equal(HydraulicJump.FirstMoment(trapezoid, y), HydraulicJump.FirstMoment(survey, y), 1e-12 * HydraulicJump.FirstMoment(trapezoid, y));
        var a = HydraulicJump.Solve(survey, 20, 0.35);
        var b = HydraulicJump.Solve(trapezoid, 20, 0.35);
        Assert.True(a.Converged && b.Converged);
        Assert.Equal(b.SequentDepth, a.SequentDepth, 1e-11 * b.SequentDepth);
    }

    [Fact]
    public void Surveyed_WithABench_FirstMomentMatchesNumericalIntegration()
    {
        // A channel with a flat bench on the left: the area is quadratic in depth only piecewise.
        var survey = new SurveyedSection([0, 2, 6, 7, 10, 12], [3, 1.5, 1.5, 0, 0, 3]);
        double y = 2.4;
        // Numerical integration of the survey's own area, split where the bench floods (1.5 m), where A has a kink.
        double integral = Integrate.OnClosedInterval(eta => survey.At(eta).Area, 0, 1.5, 1e-14)
            + Integrate.OnClosedInterval(eta => survey.At(eta).Area, 1.5, y, 1e-14);
        Assert.Equal(integral, HydraulicJump.FirstMoment(survey, y), 1e-12 * integral);
        // By hand: T = 3 + 4y/3 below the bench and 6 + 2y above it, so the integral of A to 2.4 m is 4.125 + 9.288.
        Assert.Equal(13.413, HydraulicJump.FirstMoment(survey, y), 1e-12);
        var r = HydraulicJump.Solve(survey, 12, 0.3);
        Assert.True(r.Converged);
        Assert.Equal(r.MomentumFunction, HydraulicJump.MomentumFunction(survey, 12, r.SequentDepth), 1e-12 * r.MomentumFunction);
    }

    [Fact]
    public void A_subcritical_upstream_depth_or_a_jump_above_the_crown_has_no_answer()
    {
        var rect = new RectangularSection(3);
        double yc = CriticalFlow.CriticalDepth(rect, 6).CriticalDepth;
        var sub = HydraulicJump.Solve(rect, 6, 1.2 * yc);
        Assert.Equal(JumpStatus.NotSupercritical, sub.Status);
        Assert.False(sub.Converged);
        Assert.True(double.IsNaN(sub.SequentDepth));

        // A small pipe with a shallow fast flow: the sequent depth would be above the crown.
        var pipe = new CircularSection(0.5);
        var full = HydraulicJump.Solve(pipe, 0.4, 0.08);
        Assert.Equal(JumpStatus.AboveSection, full.Status);
        Assert.False(full.Converged);
    }

    [Theory]
    [InlineData("rectangular", 15.0, 0.6)]
    [InlineData("trapezoidal", 10.0, 0.3)]
    [InlineData("circular", 1.2, 0.3)]
    public void Sensitivities_MatchCentralDifferencesOfTheSolve(string shape, double flow, double y1)
    {
        ChannelSection section = shape switch
        {
            "rectangular" => new RectangularSection(3),
            "trapezoidal" => new TrapezoidalSection(2, 1.5),
            _ => new CircularSection(1.5),
        };
        var r = HydraulicJump.Solve(section, flow, y1);
        Assert.True(r.Converged);
        var d = HydraulicJump.Sensitivities(section, flow, y1, r.SequentDepth);
        CentralDifference.Check("dy2/dQ", d.SequentByFlow, q => HydraulicJump.Solve(section, q, y1).SequentDepth, flow);
        CentralDifference.Check("dy2/dy1", d.SequentByUpstreamDepth, y => HydraulicJump.Solve(section, flow, y).SequentDepth, y1);
        CentralDifference.Check("dLoss/dQ", d.LossByFlow, q => HydraulicJump.Solve(section, q, y1).EnergyLoss, flow);
        CentralDifference.Check("dLoss/dy1", d.LossByUpstreamDepth, y => HydraulicJump.Solve(section, flow, y).EnergyLoss, y1);
    }
}
