using FlowSolve.Core.Networks;
using FlowSolve.Core.Pumps;
using MathNet.Numerics;
using MathNet.Numerics.OdeSolvers;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>Extended-period runs against independent integrations of the tanks' mass balance: MathNet.Numerics'
/// fourth-order Runge-Kutta with a fine fixed step, friction by Colebrook-White solved with MathNet's Brent, fill
/// times by MathNet quadrature, and closed forms where the inflow is a patterned demand.</summary>
public sealed class NetworkSimulatorTests(ITestOutputHelper output)
{
    private const double Water = 1.004e-6; // m2/s, water at 20 degrees C (from memory)
    private const double G = 9.80665;      // standard gravity, m/s2 (CGPM 1901)

    // ---- the independent reference: one Darcy-Weisbach pipe with Colebrook-White friction, by MathNet's Brent ----

    /// <summary>Colebrook (1939): 1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f))), solved for x = 1/sqrt(f).</summary>
    private static double Colebrook(double reynolds, double relativeRoughness) =>
        Math.Pow(Brent.FindRoot(x => x + 2 * Math.Log10(relativeRoughness / 3.7 + 2.51 * x / reynolds), 1, 40, 1e-14, 200), -2);

    /// <summary>The flow of a pipe (no fittings) under head difference dh &gt; 0, turbulent: f(V) L/D V^2/(2g) = dh.</summary>
    private static double PipeFlow(double dh, double length, double diameter, double roughness)
    {
        double v = Brent.FindRoot(v => Colebrook(v * diameter / Water, roughness / diameter) * length / diameter * v * v / (2 * G) - dh,
            1e-3, 100, 1e-13, 200);
        return v * Math.PI * diameter * diameter / 4;
    }

    private static SimulationResult Simulate(SimulationModel model, SimulationOptions? options = null) =>
        NetworkSimulator.Run(model, options, TestContext.Current.CancellationToken);

    private static NetworkModel Network(Junction[] junctions, Reservoir[] reservoirs, NetworkPipe[] pipes, NetworkPump[]? pumps = null) =>
        new(junctions, reservoirs, pipes, pumps ?? [], Water);

    private static SimulationModel Run(NetworkModel network, Tank[] tanks, double duration, double reportStep,
        NetworkControl[]? controls = null, DemandPattern[]? patterns = null, Dictionary<string, string>? junctionPatterns = null,
        double patternStep = 3600) =>
        new(network, tanks, patterns ?? [], junctionPatterns ?? [], controls ?? [], duration, reportStep, patternStep);

    // A tank filled from a reservoir through one pipe: reservoir at 50 m, tank bottom at 20 m, level 1 m to 10 m,
    // 10 m across; 500 m of 200 mm pipe, e = 0.1 mm (Vandrel Vale's hill tank, an invented case).
    private const double FillReservoir = 50, FillBottom = 20, FillStart = 1, FillTop = 10, FillDiameter = 10;
    private const double FillLength = 500, FillPipe = 0.2, FillRoughness = 1e-4;
    private static readonly double FillArea = Math.PI * FillDiameter * FillDiameter / 4;

    private static SimulationModel FillModel(double duration = 10_800, PressureDrivenDemand? law = null) => Run(
        Network([new Junction("j", 0, 0)], [new Reservoir("source", FillReservoir)],
            [new NetworkPipe("feed", "source", "hill", FillLength, FillPipe, FillRoughness), new NetworkPipe("stub", "source", "j", 10, 0.1, 1e-4)])
            with { DemandModel = law },
        [new Tank("hill", FillBottom, FillStart, 0, FillTop, FillDiameter)], duration, 600);

    private static double FillRate(double level) =>
        PipeFlow(FillReservoir - FillBottom - level, FillLength, FillPipe, FillRoughness) / FillArea;

    [Fact]
    public void Run_TankFilledThroughOnePipe_LevelsMatchRungeKuttaWithColebrookWhite()
    {
        var result = Simulate(FillModel());
        Assert.Equal(SimulationStatus.Completed, result.Status);
        Assert.True(result.Completed);
        Assert.Equal(10_800, result.ReachedTime);

        // The fill time by MathNet's double-exponential quadrature of t = integral of A dh / Q(h) from 1 m to 10 m.
        double fillTime = Integrate.DoubleExponential(h => 1 / FillRate(h), FillStart, FillTop, 1e-8);
        // The levels by MathNet's classical Runge-Kutta, 0.25 s steps, up to the last report before the fill.
        double end = Math.Floor(fillTime / 600) * 600;
        int perReport = 2400;
        var reference = RungeKutta.FourthOrder(FillStart, 0, end, (int)(end / 600) * perReport + 1, (_, y) => FillRate(y));

        double worst = 0;
        foreach (var report in result.Reports)
        {
            var tank = Assert.Single(report.Tanks);
            if (report.Time <= end)
            {
                double exact = reference[(int)Math.Round(report.Time / 600) * perReport];
                worst = Math.Max(worst, Math.Abs(tank.Level - exact));
                Assert.Null(tank.AtLimit);
                Assert.Equal(FillRate(tank.Level) * FillArea, tank.Inflow, 1e-6 * tank.Inflow); // the inflow at that level
                Assert.Equal(FillBottom + tank.Level, tank.Head, 1e-12);
            }
            else
            {
                // Full: held at the limit with no inflow, and the tank a junction of the reported network.
                Assert.Equal(FillTop, tank.Level);
                Assert.Equal("full", tank.AtLimit);
                Assert.Equal(0, tank.Inflow);
                Assert.Equal(0, report.Network.Pipe("feed").Flow, 1e-9);
            }
        }
        output.WriteLine($"fill: largest level error {worst:E3} m over {result.Steps.Count} steps, {result.NetworkSolves} network solves");
        Assert.True(worst <= 1e-3, $"level error {worst} m");

        var full = Assert.Single(result.Events);
        Assert.Equal("tank-full", full.Kind);
        Assert.Equal("hill", full.ElementId);
        output.WriteLine($"fill time {full.Time:F3} s against {fillTime:F3} s by quadrature ({full.Iterations} Newton iterations, residual {full.TimeResidual:E2} m)");
        Assert.True(Math.Abs(full.Time - fillTime) <= 1, $"fill at {full.Time} s, quadrature {fillTime} s");
        Assert.InRange(full.Iterations, 1, 20);
        Assert.True(Math.Abs(full.TimeResidual) <= 1e-3);

        // Every step ends at or before the next report time (none crosses one) and the times are the multiples of 600 s.
        Assert.Equal(Enumerable.Range(0, 19).Select(k => k * 600.0), result.Reports.Select(r => r.Time));
        for (int k = 1; k < result.Steps.Count; k++) Assert.Equal(result.Steps[k - 1].End, result.Steps[k].Start);
        Assert.Contains(result.Steps, s => s.End == full.Time);
        Assert.All(result.Steps, s => Assert.True(s.ErrorEstimate <= 1e-4));
        // Three solves a step at least (first same as last), every solve of a step counted in the run's total.
        Assert.All(result.Steps, s => Assert.True(s.NetworkSolves >= 3));
        Assert.True(result.NetworkSolves >= result.Steps.Sum(s => s.NetworkSolves));
    }

    [Fact]
    public void Run_TankFilledUnderPressureDrivenDemand_MatchesDemandDriven()
    {
        // The tank's feed has no demand of its own: both demand models answer the same mass balance.
        var driven = Simulate(FillModel(3600));
        var pressure = Simulate(FillModel(3600, new PressureDrivenDemand(0, 10)));
        Assert.True(pressure.Completed);
        for (int k = 0; k < driven.Reports.Count; k++)
            Assert.Equal(driven.Reports[k].Tanks[0].Level, pressure.Reports[k].Tanks[0].Level, 1e-6);
    }

    // A tank drained by a patterned demand (closed form): tank bottom 30 m, 10 m across, from 4 m down to 0.5 m; it
    // alone feeds junction "town" (demand 0.03 m3/s times 1, 0, 2, repeating hourly); a reservoir at 25 m stands behind
    // a check valve and takes over once the tank is empty.
    private const double DrainDemand = 0.03;
    private static readonly double DrainArea = Math.PI * 25;

    private static SimulationModel DrainModel(double duration = 4 * 3600, double[]? multipliers = null) => Run(
        Network([new Junction("town", 0, DrainDemand)], [new Reservoir("low", 25)],
            [new NetworkPipe("outlet", "tower", "town", 100, 0.3, 1e-4), new NetworkPipe("backup", "low", "town", 100, 0.3, 1e-4, CheckValve: true)]),
        [new Tank("tower", 30, 4, 0.5, 6, 10)], duration, 900,
        patterns: [new DemandPattern("day", multipliers ?? [1, 0, 2])], junctionPatterns: new() { ["town"] = "day" });

    [Fact]
    public void Run_TankDrainedByPatternedDemand_MatchesClosedFormAndEmptiesOnTime()
    {
        var result = Simulate(DrainModel());
        Assert.Equal(SimulationStatus.Completed, result.Status);
        double rate = DrainDemand / DrainArea; // m/s at multiplier 1
        // Closed form: the level falls at d m_k / A in hour k; multiplier 0 in the second hour holds it.
        double Level(double t)
        {
            double[] m = [1, 0, 2];
            double level = 4;
            for (int k = 0; k * 3600 < t; k++)
                level -= rate * m[k % 3] * (Math.Min(t, (k + 1) * 3600) - k * 3600);
            return Math.Max(level, 0.5);
        }
        double emptyTime = 2 * 3600 + (4 - rate * 3600 - 0.5) / (2 * rate);
        foreach (var report in result.Reports)
        {
            var tank = report.Tanks[0];
            Assert.Equal(Level(report.Time), tank.Level, 1e-6);
            if (report.Time > emptyTime)
            {
                Assert.Equal("empty", tank.AtLimit);
                Assert.Equal(0, tank.Inflow);
                Assert.True(report.Network.Pipe("backup").Flow > 0); // the reservoir now supplies the town
            }
            else Assert.True(report.Time == 0 || report.Network.Pipe("backup").Status == LinkStatus.CheckValveClosed);
            if (report.Time is > 3600 and < 7200) Assert.Equal(0, tank.Inflow, 1e-9); // multiplier 0
        }
        var empty = Assert.Single(result.Events);
        Assert.Equal("tank-empty", empty.Kind);
        output.WriteLine($"drain: empty at {empty.Time:F4} s, closed form {emptyTime:F4} s; {result.Steps.Count} steps, {result.NetworkSolves} solves");
        Assert.True(Math.Abs(empty.Time - emptyTime) <= 1);
        // No step crosses a pattern boundary.
        Assert.All(result.Steps, s => Assert.Equal(Math.Floor(s.Start / 3600), Math.Ceiling(s.End / 3600) - 1));
    }

    [Fact]
    public void Run_ZeroMultiplierPattern_HoldsTheLevel()
    {
        var result = Simulate(DrainModel(2 * 3600, [0]));
        Assert.True(result.Completed);
        Assert.All(result.Reports, r => Assert.Equal(4, r.Tanks[0].Level, 1e-9));
        Assert.All(result.Reports, r => Assert.Equal(0, r.Network.Junction("town").Demand));
        Assert.Empty(result.Events);
    }

    [Fact]
    public void Run_ControlByTime_ClosesThePipeAtThatInstant()
    {
        // The drain case with the outlet shut at 1234.5 s: the level falls at d/A until then (closed form) and the
        // reservoir behind the check valve supplies the town afterwards.
        var model = DrainModel(3600) with
        {
            Controls = [new NetworkControl("outlet", new ControlAction(false, null), new ControlCondition(null, null, null, 1234.5))],
        };
        var result = Simulate(model);
        Assert.True(result.Completed);
        var control = Assert.Single(result.Events);
        Assert.Equal((1234.5, "control", "outlet", "closed"), (control.Time, control.Kind, control.ElementId, control.Change));
        Assert.Equal(0, control.Iterations);
        Assert.Contains(result.Steps, s => s.End == 1234.5);
        double rate = DrainDemand / DrainArea;
        foreach (var report in result.Reports)
            Assert.Equal(4 - rate * Math.Min(report.Time, 1234.5), report.Tanks[0].Level, 1e-6);
        Assert.Equal(LinkStatus.Closed, result.Reports[^1].Network.Pipe("outlet").Status);
        Assert.Equal(DrainDemand, result.Reports[^1].Network.Pipe("backup").Flow, 1e-9);
    }

    [Fact]
    public void Run_TankStartingFull_IsHeldThenAnnouncedOnce()
    {
        var start = FillModel(3000) with { Tanks = [new Tank("hill", FillBottom, FillTop, 0, FillTop, FillDiameter)] };
        var result = Simulate(start);
        Assert.True(result.Completed);
        Assert.All(result.Reports, r => Assert.Equal((FillTop, "full", 0.0), (r.Tanks[0].Level, r.Tanks[0].AtLimit, r.Tanks[0].Inflow)));
        var full = Assert.Single(result.Events);
        Assert.Equal((0.0, "tank-full"), (full.Time, full.Kind));
        // Held, the tank is a junction of zero demand at the reservoir's head (no flow in its pipe).
        Assert.Equal(FillReservoir, result.Reports[^1].Network.Junction("hill").Head, 1e-6);
    }

    [Fact]
    public void Run_TankStartingFullButDraining_LeavesTheLimitAtOnce()
    {
        // The drain case starting at its maximum level: nothing holds it there, the level falls from t = 0.
        var model = DrainModel(1800) with { Tanks = [new Tank("tower", 30, 6, 0.5, 6, 10)] };
        var result = Simulate(model);
        Assert.True(result.Completed);
        Assert.Empty(result.Events);
        Assert.Equal(6 - DrainDemand / DrainArea * 1800, result.Reports[^1].Tanks[0].Level, 1e-6);
        Assert.Null(result.Reports[0].Tanks[0].AtLimit);
    }

    [Fact]
    public void Validate_ControlOnUnknownLink_NamesIt()
    {
        var model = DrainModel() with
        {
            Controls = [new NetworkControl("nowhere", new ControlAction(false, null), new ControlCondition(null, null, null, 10))],
        };
        var issue = Assert.Single(NetworkSimulator.Validate(model));
        Assert.Equal(("nowhere", "unknown-link"), (issue.ElementId, issue.Code));
        Assert.Contains("'nowhere'", issue.Message);
        var thrown = Assert.Throws<NetworkValidationException>(() => Simulate(model));
        Assert.Equal("unknown-link", Assert.Single(thrown.Issues).Code);
    }

    [Fact]
    public void Validate_BadTanksPatternsAndTimes_NamesEachElement()
    {
        var model = DrainModel() with
        {
            Tanks = [new Tank("tower", 30, 7, 0.5, 6, 10), new Tank("dry", double.NaN, 1, 2, 1, 0)],
            Patterns = [new DemandPattern("day", [1, -1]), new DemandPattern("day", [])],
            JunctionPatterns = new Dictionary<string, string> { ["town"] = "week", ["ghost"] = "day" },
            Controls = [new NetworkControl("outlet", new ControlAction(null, 0.5), new ControlCondition("nope", 1, null, null))],
            Duration = -1, ReportStep = 0, PatternStep = double.PositiveInfinity,
        };
        var codes = NetworkSimulator.Validate(model).Select(i => (i.ElementId, i.Code)).ToHashSet();
        Assert.Contains(("tower", "bad-tank-level"), codes);
        Assert.Contains(("dry", "non-finite-value"), codes);
        Assert.Contains(("dry", "non-positive-diameter"), codes);
        Assert.Contains(("day", "bad-multiplier"), codes);
        Assert.Contains(("day", "duplicate-id"), codes);
        Assert.Contains(("day", "empty-pattern"), codes);
        Assert.Contains(("town", "unknown-pattern"), codes);
        Assert.Contains(("ghost", "unknown-node"), codes);
        Assert.Contains(("outlet", "bad-control-action"), codes);
        Assert.Contains(("nope", "unknown-tank"), codes);
        Assert.Contains(("", "bad-duration"), codes);
        Assert.Contains(("", "bad-report-step"), codes);
        Assert.Contains(("", "bad-pattern-step"), codes);
    }

    [Fact]
    public void Run_ReportTimes_AreTheMultiplesOfTheReportStepAndTheDuration()
    {
        var result = Simulate(DrainModel(1000) with { ReportStep = 300 });
        Assert.Equal([0.0, 300, 600, 900, 1000], result.Reports.Select(r => r.Time));
        var none = Simulate(DrainModel(0));
        Assert.True(none.Completed);
        Assert.Equal([0.0], none.Reports.Select(r => r.Time));
    }

    [Fact]
    public void Run_CancelledToken_StopsAtAStepBoundary()
    {
        using var source = new CancellationTokenSource();
        source.Cancel();
        var result = NetworkSimulator.Run(DrainModel(), cancellationToken: source.Token);
        Assert.Equal(SimulationStatus.Cancelled, result.Status);
        Assert.False(result.Completed);
        Assert.Equal(0, result.ReachedTime);
        Assert.Equal([0.0], result.Reports.Select(r => r.Time));
    }

    [Fact]
    public void Run_StepCap_StopsWithTooManySteps()
    {
        var result = Simulate(FillModel(), new SimulationOptions(MaxSteps: 3));
        Assert.Equal(SimulationStatus.TooManySteps, result.Status);
        Assert.True(result.ReachedTime < 10_800);
        Assert.Equal(result.Steps.Count == 0 ? 0 : result.Steps[^1].End, result.ReachedTime);
    }

    [Fact]
    public void Run_NetworkThatCannotConverge_NeverReportsCompleted()
    {
        // One Newton iteration allowed per solve: the first solve fails, and the run says so.
        var options = new SimulationOptions(Network: NetworkOptions.Default with { MaxIterations = 1 });
        var result = Simulate(FillModel(), options);
        Assert.Equal(SimulationStatus.NetworkNotConverged, result.Status);
        Assert.False(result.Completed);
        Assert.Equal(0, result.ReachedTime);
    }
}
