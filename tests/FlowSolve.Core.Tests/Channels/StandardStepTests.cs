using FlowSolve.Core.Channels;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>
/// The standard step method against independent references: the exact prismatic profile (GraduallyVariedFlow, itself
/// checked against MathNet quadrature and Brent in WaterSurfaceProfileTests) for the convergence order, and the energy
/// equation between two rectangular sections written out here and solved by MathNet's Brent for one step with
/// transition losses.
/// </summary>
public class StandardStepTests
{
    private const double G = 9.80665;

    /// <summary>A trapezoid b = 3 m, sides 2 : 1, banks 6 m high, drawn as a survey with its lowest point at <paramref name="bed"/>.</summary>
    private static SurveyedSection Trapezoid(double bed) => new([0.0, 12.0, 15.0, 27.0], [bed + 6, bed, bed, bed + 6]);

    /// <summary>A rectangle of width <paramref name="width"/>, walls <paramref name="height"/> high, lowest point at <paramref name="bed"/>.</summary>
    private static SurveyedSection Rectangle(double width, double bed, double height = 4) =>
        new([0.0, 0.0, width, width], [bed + height, bed, bed, bed + height]);

    /// <summary>N + 1 equally spaced copies of one prism along a bed falling at <paramref name="slope"/> in the flow direction.</summary>
    private static ReachSection[] Prism(Func<double, SurveyedSection> shape, double slope, double length, int n, double manningN) =>
        Enumerable.Range(0, n + 1).Select(k => k * length / n).Select(x => new ReachSection(x, shape(100 + slope * x), manningN)).ToArray();

    /// <summary>The largest difference of water-surface elevation from the exact profile at the reference stations.</summary>
    private static double Error(ReachProfile p, WaterSurfaceProfile exact, double slope, double length, int coarse)
    {
        double worst = 0;
        foreach (var e in exact.Stations)
        {
            var s = p.Stations.Single(t => Math.Abs(t.Distance - e.Distance) < 1e-9 * length);
            worst = Math.Max(worst, Math.Abs(s.Elevation - (100 + slope * e.Distance + e.Depth)));
        }
        Assert.Equal(coarse + 1, exact.Stations.Count);
        return worst;
    }

    [Fact]
    public void Solve_PrismaticM1_ConvergesToTheExactProfileAtSecondOrder()
    {
        // M1 backwater above a weir: Q = 10 m3/s, n = 0.025, S0 = 0.001, 2.5 m deep at the downstream end, 2 km.
        const double q = 10, n = 0.025, s0 = 0.001, length = 2000, y0 = 2.5;
        var exact = GraduallyVariedFlow.Profile(new TrapezoidalSection(3, 2), q, s0, n, length, y0, controlDownstream: true, 11);
        var errors = new List<double>();
        foreach (int cells in new[] { 10, 20, 40, 80 })
        {
            // Without transition losses: the gradually-varied-flow equation has none, and a loss C |d(V^2/2g)| would
            // add C times the velocity-head change along the reach whatever the spacing.
            var p = StandardStep.Solve(Prism(Trapezoid, s0, length, cells, n), q, 100 + y0, ReachStart.Downstream, 0, 0);
            Assert.True(p.Converged);
            Assert.Empty(p.Warnings);
            Assert.All(p.Stations.Skip(1), s => Assert.InRange(s.Iterations, 1, 12));
            errors.Add(Error(p, exact, s0, length, 10));
        }
        // Observed order over successive halvings: near 2 for the trapezoidal rule on the friction slope (measured 2.002,
        // 2.0005, 2.0001: errors 1.26e-3, 3.1e-4, 7.9e-5, 2.0e-5 m at 200, 100, 50, 25 m spacing).
        for (int k = 1; k < errors.Count; k++)
            Assert.InRange(Math.Log2(errors[k - 1] / errors[k]), 1.9, 2.1);
        Assert.True(errors[^1] < 1e-3, $"error at 25 m spacing {errors[^1]} m");
    }

    [Fact]
    public void Solve_SteepS3BelowAGate_ConvergesToTheExactProfileAtSecondOrder()
    {
        // Rectangular 4 m, n = 0.015, S0 = 0.01 (steep: normal depth about 0.70 m, critical 0.97 m), Q = 12 m3/s,
        // 0.4 m deep below a gate at the upstream end of 200 m: an S3 profile rising towards normal depth.
        const double q = 12, n = 0.015, s0 = 0.01, length = 200, y0 = 0.4;
        var exact = GraduallyVariedFlow.Profile(new RectangularSection(4), q, s0, n, length, y0, controlDownstream: false, 11);
        Assert.Equal("S3", exact.ProfileType);
        var errors = new List<double>();
        foreach (int cells in new[] { 10, 20, 40, 80 })
        {
            var sections = Prism(bed => Rectangle(4, bed), s0, length, cells, n);
            var p = StandardStep.Solve(sections, q, sections[^1].Section.InvertElevation + y0, ReachStart.Upstream, 0, 0);
            Assert.True(p.Converged);
            Assert.Empty(p.Warnings);
            Assert.All(p.Stations, s => Assert.True(s.FroudeNumber > 1));
            errors.Add(Error(p, exact, s0, length, 10));
        }
        // Measured 2.05, 2.01, 2.003 (errors 3.9e-3 to 5.9e-5 m).
        for (int k = 1; k < errors.Count; k++)
            Assert.InRange(Math.Log2(errors[k - 1] / errors[k]), 1.9, 2.1);
    }

    [Fact]
    public void Solve_OneStepIntoAContraction_MatchesBrentOnTheEnergyEquationWrittenOut()
    {
        // A 6 m rectangle downstream, a 4 m one 150 m upstream with its bed 0.3 m higher; n = 0.02, Q = 15 m3/s, the
        // water 102.0 m downstream. Flow runs from the narrow section into the wide one: velocity head falls along the
        // flow, so the expansion coefficient (0.3) applies.
        const double q = 15, n = 0.02, ce = 0.3, cc = 0.1;
        var sections = new[] { new ReachSection(0, Rectangle(6, 100), n), new ReachSection(150, Rectangle(4, 100.3), n) };
        var p = StandardStep.Solve(sections, q, 102.0, ReachStart.Downstream, ce, cc);

        static double Hv(double b, double y) => q * q / (2 * G * b * b * y * y);
        static double Sf(double b, double y) { double a = b * y, r = a / (b + 2 * y); return q * q * n * n / (a * a * Math.Pow(r, 4.0 / 3)); }
        double yd = 2.0, hd = 102.0 + Hv(6, yd), sfd = Sf(6, yd);
        double Residual(double yu)
        {
            double change = Hv(6, yd) - Hv(4, yu);
            return 100.3 + yu + Hv(4, yu) - hd - 150 * (Sf(4, yu) + sfd) / 2 - (change > 0 ? cc : ce) * Math.Abs(change);
        }
        double yc = Math.Cbrt(q * q / (16 * G));
        double expected = Brent.FindRoot(Residual, yc, 4, 1e-14, 200);
        var up = p.Stations[1];
        Assert.Equal(100.3 + expected, up.Elevation, 1e-9);
        Assert.True(up.Residual <= 1e-9);
        Assert.Equal(ce * (Hv(4, expected) - Hv(6, yd)), up.TransitionLoss, 1e-9);
        Assert.Equal(150 * (Sf(4, expected) + sfd) / 2, up.FrictionLoss, 1e-9);
        Assert.Equal(q / (4 * expected), up.Velocity, 1e-9);
        Assert.Equal(up.Elevation + up.Velocity * up.Velocity / (2 * G), up.EnergyElevation, 1e-12);
        Assert.Equal(100.3 + yc, up.CriticalElevation, 1e-9);
        Assert.InRange(up.Iterations, 1, 10);
    }

    [Fact]
    public void Solve_StepUpOverAHighBed_TakesCriticalDepthWithAWarning()
    {
        // The upstream section's bed is 1.5 m above the downstream water surface's energy: no subcritical root, so the
        // section takes critical depth, yc = (q^2/g)^(1/3) for a rectangle with q = Q/b (a closed form).
        const double q = 8, n = 0.015;
        var sections = new[] { new ReachSection(0, Rectangle(4, 100), n), new ReachSection(20, Rectangle(4, 102.5), n) };
        var p = StandardStep.Solve(sections, q, 101.2, ReachStart.Downstream);
        var up = p.Stations[1];
        double yc = Math.Cbrt(4.0 / G);
        Assert.True(up.AtCriticalDepth);
        Assert.Equal(102.5 + yc, up.Elevation, 1e-9);
        Assert.Equal(1.0, up.FroudeNumber, 1e-9);
        Assert.Equal(0, up.Iterations);
        Assert.Contains(p.Warnings, w => w.Code == "no-subcritical-solution" && w.Message.Contains("sections[1]"));
    }

    [Fact]
    public void Solve_SupercriticalIntoARaisedBed_TakesCriticalDepthWithAWarning()
    {
        // Supercritical flow 0.5 m deep at the upstream end (Q = 12 m3/s, 4 m rectangle) meets a section 20 m
        // downstream whose bed stands 1.2 m higher: the energy (about 0.5 + 1.84 m above the upstream bed) is short of
        // that bed's critical energy (1.5 yc = 1.46 m above 101.2 m), so no supercritical root; critical depth
        // (q^2/g)^(1/3), q = 3 m2/s, is taken there.
        const double q = 12, n = 0.015;
        var sections = new[] { new ReachSection(0, Rectangle(4, 101.2), n), new ReachSection(20, Rectangle(4, 100), n) };
        var p = StandardStep.Solve(sections, q, 100.5, ReachStart.Upstream);
        var down = p.Stations[0];
        Assert.True(down.AtCriticalDepth);
        Assert.Equal(101.2 + Math.Cbrt(9 / G), down.Elevation, 1e-9);
        Assert.Contains(p.Warnings, w => w.Code == "no-supercritical-solution" && w.Message.Contains("sections[0]"));
        Assert.Equal(100.5, p.Stations[1].Elevation);
    }

    [Fact]
    public void Solve_WaterAboveTheUpstreamSurvey_StopsAtThatSection()
    {
        // 3.5 m of water downstream cannot pass into an upstream section whose walls stand 1 m high.
        var sections = new[]
        {
            new ReachSection(0, Rectangle(4, 100), 0.03), new ReachSection(100, Rectangle(4, 100.1), 0.03),
            new ReachSection(200, Rectangle(4, 100.2, height: 1), 0.03),
        };
        var p = StandardStep.Solve(sections, 5, 103.5, ReachStart.Downstream);
        Assert.Equal(2, p.OvertopsSection);
        Assert.Equal(2, p.Stations.Count);
        Assert.False(p.Converged);
    }

    [Theory]
    [InlineData(99.9, ReachStart.Downstream, ReachStartProblem.BelowBed)]
    [InlineData(100.0, ReachStart.Downstream, ReachStartProblem.BelowBed)]
    [InlineData(104.5, ReachStart.Downstream, ReachStartProblem.AboveSection)]
    [InlineData(100.5, ReachStart.Downstream, ReachStartProblem.DownstreamStartSupercritical)]
    [InlineData(102.0, ReachStart.Upstream, ReachStartProblem.UpstreamStartSubcritical)]
    [InlineData(102.0, ReachStart.Downstream, ReachStartProblem.None)]
    [InlineData(100.5, ReachStart.Upstream, ReachStartProblem.None)]
    public void CheckStart_AgainstCriticalDepth(double elevation, ReachStart start, ReachStartProblem expected)
    {
        // Rectangle 4 m, Q = 12 m3/s: yc = (9/g)^(1/3) = 0.972 m, so 0.5 m is supercritical and 2 m subcritical.
        var (problem, critical) = StandardStep.CheckStart(new ReachSection(0, Rectangle(4, 100), 0.015), 12, elevation, start);
        Assert.Equal(expected, problem);
        Assert.Equal(100 + Math.Cbrt(9 / G), critical, 1e-9);
    }
}
