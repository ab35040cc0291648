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
        // At 2700 s (multiplier 1) the reservoir behind the check valve carries the whole demand; at 3600 s the
        // pattern's second multiplier, 0, applies ([k patternStep, (k + 1) patternStep)).
        var late = result.Reports.Single(r => r.Time == 2700).Network;
        Assert.Equal(LinkStatus.Closed, late.Pipe("outlet").Status);
        Assert.Equal(DrainDemand, late.Pipe("backup").Flow, 1e-9);
        Assert.Equal(0, result.Reports[^1].Network.Junction("town").Demand);
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

    // Two tanks and a pump (invented, Vandrel Vale's booster): a low tank (bottom 10 m, 20 m across, 5 m of 0.5 to 8 m)
    // feeds pump "lift" (H = 45 - 2000 Q^2 at rated speed) into a 300 m rising main of 250 mm to a high tank (bottom
    // 40 m, 8 m across, 3 m of 0.5 to 7 m), which alone serves the estate (0.02 m3/s) through 200 m of 200 mm pipe.
    private const double LowBottom = 10, LowDiameter = 20, HighBottom = 40, HighDiameter = 8, Estate = 0.02;
    private const double MainLength = 300, MainDiameter = 0.25, MainRoughness = 1e-4;
    private static readonly double LowArea = Math.PI * LowDiameter * LowDiameter / 4, HighArea = Math.PI * HighDiameter * HighDiameter / 4;

    private static SimulationModel BoosterModel(double duration, NetworkControl[] controls) => Run(
        Network([new Junction("rise", 12, 0), new Junction("estate", 20, Estate)], [],
            [new NetworkPipe("main", "rise", "high", MainLength, MainDiameter, MainRoughness),
             new NetworkPipe("estate-main", "high", "estate", 200, 0.2, 1e-4)],
            [new NetworkPump("lift", "low", "rise", PumpCurve.FromCoefficients(45, 0, -2000))]),
        [new Tank("low", LowBottom, 5, 0.5, 8, LowDiameter), new Tank("high", HighBottom, 3, 0.5, 7, HighDiameter)],
        duration, 1800, controls);

    /// <summary>The pump's flow at speed ratio s against the two levels: s^2 45 - 2000 Q^2 = lift + the main's
    /// Colebrook-White loss, by Brent (affinity laws: H_s(Q) = s^2 H(Q/s)).</summary>
    private static double PumpFlow(double low, double high, double speed)
    {
        double lift = HighBottom + high - (LowBottom + low);
        double area = Math.PI * MainDiameter * MainDiameter / 4;
        double Loss(double q)
        {
            double v = q / area;
            return Colebrook(v * MainDiameter / Water, MainRoughness / MainDiameter) * MainLength / MainDiameter * v * v / (2 * G);
        }
        return Brent.FindRoot(q => speed * speed * 45 - 2000 * q * q - lift - Loss(q), 0.01, speed * Math.Sqrt(45 / 2000.0), 1e-14, 300);
    }

    /// <summary>An independent integration of the booster case: classical Runge-Kutta with 1 s steps; a threshold crossing
    /// is placed by linear interpolation within its step and the step taken again to it.</summary>
    private static (List<(double Time, bool On)> Switches, Func<double, (double Low, double High)> Levels) Booster(
        double duration, double? off, double? on, double speed = 1, double speedTime = double.PositiveInfinity, double newSpeed = 1)
    {
        var states = new List<(double T, double L, double H)>();
        var switches = new List<(double, bool)>();
        bool running = true;
        double t = 0, low = 5, high = 3;
        (double, double) Rate(double t, double l, double h, bool run)
        {
            double q = run ? PumpFlow(l, h, t < speedTime ? speed : newSpeed) : 0;
            return (-q / LowArea, (q - Estate) / HighArea);
        }
        (double, double) Step(double t, double l, double h, double dt, bool run)
        {
            var (a1, b1) = Rate(t, l, h, run);
            var (a2, b2) = Rate(t + dt / 2, l + dt / 2 * a1, h + dt / 2 * b1, run);
            var (a3, b3) = Rate(t + dt / 2, l + dt / 2 * a2, h + dt / 2 * b2, run);
            var (a4, b4) = Rate(t + dt, l + dt * a3, h + dt * b3, run);
            return (l + dt / 6 * (a1 + 2 * a2 + 2 * a3 + a4), h + dt / 6 * (b1 + 2 * b2 + 2 * b3 + b4));
        }
        states.Add((0, low, high));
        while (t < duration)
        {
            double dt = Math.Min(1, duration - t);
            if (t < speedTime && t + dt > speedTime) dt = speedTime - t;
            var (l1, h1) = Step(t, low, high, dt, running);
            double? threshold = running ? off : on;
            if (threshold is double th && (running ? h1 >= th : h1 <= th))
            {
                double fraction = (th - high) / (h1 - high);
                dt *= fraction;
                (l1, h1) = Step(t, low, high, dt, running);
                running = !running;
                switches.Add((t + dt, running));
            }
            t += dt;
            (low, high) = (l1, h1);
            states.Add((t, low, high));
        }
        return (switches, time =>
        {
            int k = states.FindLastIndex(s => s.T <= time);
            if (states[k].T == time || k == states.Count - 1) return (states[k].L, states[k].H);
            var (t0, l0, h0) = states[k];
            var (t1, l1, h1) = states[k + 1];
            double w = (time - t0) / (t1 - t0);
            return (l0 + w * (l1 - l0), h0 + w * (h1 - h0));
        });
    }

    [Fact]
    public void Run_PumpSwitchedByTankLevel_EventTimesMatchIndependentIntegration()
    {
        const double duration = 8 * 3600;
        var model = BoosterModel(duration,
        [
            new NetworkControl("lift", new ControlAction(false, null), new ControlCondition("high", null, 6, null)),
            new NetworkControl("lift", new ControlAction(true, null), new ControlCondition("high", 2, null, null)),
        ]);
        var result = Simulate(model);
        Assert.Equal(SimulationStatus.Completed, result.Status);
        var (switches, levels) = Booster(duration, off: 6, on: 2);
        Assert.True(switches.Count >= 3, "the case should switch the pump at least three times");
        Assert.Equal(switches.Count, result.Events.Count);
        double worstTime = 0, worstLevel = 0;
        for (int k = 0; k < switches.Count; k++)
        {
            var e = result.Events[k];
            Assert.Equal(("control", "lift", switches[k].On ? "open" : "closed"), (e.Kind, e.ElementId, e.Change));
            worstTime = Math.Max(worstTime, Math.Abs(e.Time - switches[k].Time));
            Assert.True(Math.Abs(e.TimeResidual) <= 1e-3);
        }
        foreach (var report in result.Reports)
        {
            var (low, high) = levels(report.Time);
            worstLevel = Math.Max(worstLevel, Math.Max(Math.Abs(report.Tanks[0].Level - low), Math.Abs(report.Tanks[1].Level - high)));
        }
        output.WriteLine($"booster: {switches.Count} switches, largest event-time error {worstTime:F4} s, largest level error {worstLevel:E3} m; " +
            $"{result.Steps.Count} steps ({result.Steps.Sum(s => s.Rejected)} rejected), {result.NetworkSolves} network solves, " +
            $"{result.Steps.Sum(s => s.NetworkIterations)} Newton iterations");
        Assert.True(worstTime <= 1, $"event time error {worstTime} s");
        Assert.True(worstLevel <= 1e-3, $"level error {worstLevel} m");
        // While the pump is off it stands in the report as stopped.
        Assert.Contains(result.Reports, r => r.Network.Pump("lift").Status == LinkStatus.PumpOff);
    }

    [Fact]
    public void Run_PumpSpeedSetByTime_FollowsTheAffinityLaws()
    {
        const double duration = 3600;
        var model = BoosterModel(duration,
            [new NetworkControl("lift", new ControlAction(null, 0.9), new ControlCondition(null, null, null, 1000))]);
        var result = Simulate(model);
        Assert.True(result.Completed);
        var control = Assert.Single(result.Events);
        Assert.Equal((1000.0, "speedRatio 0.9"), (control.Time, control.Change));
        var (_, levels) = Booster(duration, null, null, 1, 1000, 0.9);
        foreach (var report in result.Reports)
        {
            var (low, high) = levels(report.Time);
            Assert.Equal(low, report.Tanks[0].Level, 1e-3);
            Assert.Equal(high, report.Tanks[1].Level, 1e-3);
        }
        Assert.Equal(PumpFlow(result.Reports[^1].Tanks[0].Level, result.Reports[^1].Tanks[1].Level, 0.9),
            result.Reports[^1].Network.Pump("lift").Flow, 1e-7);
    }

    /// <summary>The Darcy-Weisbach loss of a pipe at flow q &gt; 0 (turbulent), friction by Colebrook-White.</summary>
    private static double PipeLoss(double q, double length, double diameter, double roughness)
    {
        double v = q / (Math.PI * diameter * diameter / 4);
        return Colebrook(v * diameter / Water, roughness / diameter) * length / diameter * v * v / (2 * G);
    }

    // A full tank passing water on (invented): reservoir (50 m) - 600 m of 200 mm - tank "upper" (bottom 20 m, full at
    // 10 m, 6 m across) - 400 m of 250 mm - tank "lower" (bottom 0, 28 m of 0.5 to 30 m, 10 m across) - 50 m of 300 mm -
    // junction "village" drawing 0.15 m3/s. While "upper" is held full it is a junction of the through line; it is
    // released when the head there falls below its full head, 30 m, as "lower" drains.
    private const double ThroughDemand = 0.15;
    private static readonly double UpperArea = Math.PI * 9, LowerArea = Math.PI * 25;

    [Fact]
    public void Run_HeldTankReleasedAsAnotherDrains_ReleaseTimeMatchesQuadrature()
    {
        const double duration = 7200;
        var model = Run(
            Network([new Junction("village", 0, ThroughDemand)], [new Reservoir("source", 50)],
                [new NetworkPipe("in", "source", "upper", 600, 0.2, 1e-4), new NetworkPipe("through", "upper", "lower", 400, 0.25, 1e-4),
                 new NetworkPipe("out", "lower", "village", 50, 0.3, 1e-4)]),
            [new Tank("upper", 20, 10, 0, 10, 6), new Tank("lower", 0, 28, 0.5, 30, 10)], duration, 600);
        var result = Simulate(model);
        Assert.Equal(SimulationStatus.Completed, result.Status);

        // Held: the through flow Q(H) from 50 - H = loss_in(Q) + loss_through(Q) (Brent); released when the head at the
        // upper tank, 50 - loss_in(Q), reaches 30 m, that is when the lower tank's head reaches 30 - loss_through(Q*),
        // loss_in(Q*) = 20 m; the time by MathNet quadrature of A dh / (Q(h) - d).
        double Through(double lowerHead) => Brent.FindRoot(q => PipeLoss(q, 600, 0.2, 1e-4) + PipeLoss(q, 400, 0.25, 1e-4) - (50 - lowerHead), 0.01, 1, 1e-14, 300);
        double qStar = Brent.FindRoot(q => PipeLoss(q, 600, 0.2, 1e-4) - 20, 0.01, 1, 1e-14, 300);
        double releaseHead = 30 - PipeLoss(qStar, 400, 0.25, 1e-4);
        double releaseTime = Integrate.DoubleExponential(h => LowerArea / (ThroughDemand - Through(h)), releaseHead, 28, 1e-8);

        // After the release: both levels by MathNet's Runge-Kutta (0.25 s steps) from the release state.
        double[] Rate(double upper, double lower)
        {
            double qIn = PipeFlow(50 - (20 + upper), 600, 0.2, 1e-4);
            double qThrough = PipeFlow(20 + upper - lower, 400, 0.25, 1e-4);
            return [(qIn - qThrough) / UpperArea, (qThrough - ThroughDemand) / LowerArea];
        }
        var after = RungeKutta.FourthOrder(Vector(10, releaseHead), releaseTime, duration, (int)((duration - releaseTime) / 0.25) + 1,
            (_, y) => Vector(Rate(y[0], y[1])));
        double spacing = (duration - releaseTime) / (after.Length - 1);

        double worst = 0;
        foreach (var report in result.Reports)
        {
            var (upper, lower) = (report.Tanks[0], report.Tanks[1]);
            if (report.Time < releaseTime)
            {
                Assert.Equal((10.0, "full"), (upper.Level, upper.AtLimit));
                // The lower tank while the upper is held: t(h) by quadrature, inverted with Brent.
                double level = report.Time == 0 ? 28 : Brent.FindRoot(
                    h => Integrate.DoubleExponential(x => LowerArea / (ThroughDemand - Through(x)), h, 28, 1e-9) - report.Time, releaseHead - 1, 28, 1e-10, 200);
                worst = Math.Max(worst, Math.Abs(lower.Level - level));
            }
            else
            {
                Assert.Null(upper.AtLimit);
                int k = (int)Math.Round((report.Time - releaseTime) / spacing);
                var y = after[k];
                // The reference state nearest the report time, moved along its rate to the report time.
                double dt = report.Time - (releaseTime + k * spacing);
                var r = Rate(y[0], y[1]);
                worst = Math.Max(worst, Math.Abs(upper.Level - (y[0] + dt * r[0])));
                worst = Math.Max(worst, Math.Abs(lower.Level - (y[1] + dt * r[1])));
            }
        }
        var held = Assert.Single(result.Events);
        Assert.Equal((0.0, "tank-full", "upper"), (held.Time, held.Kind, held.ElementId));
        // The release is not an announced event; the step that ends there is.
        var release = result.Steps.Select(st => st.End).MinBy(e => Math.Abs(e - releaseTime));
        output.WriteLine($"release at {release:F3} s against {releaseTime:F3} s by quadrature; largest level error {worst:E3} m; {result.Steps.Count} steps, {result.NetworkSolves} solves");
        Assert.True(Math.Abs(release - releaseTime) <= 1, $"released at {release} s, quadrature {releaseTime} s");
        Assert.True(worst <= 1e-3, $"level error {worst} m");
    }

    private static MathNet.Numerics.LinearAlgebra.Vector<double> Vector(params double[] values) =>
        MathNet.Numerics.LinearAlgebra.Vector<double>.Build.DenseOfArray(values);

    [Fact]
    public void Run_TankFedThroughPressureReducingValve_MatchesRungeKutta()
    {
        // A reservoir at 80 m feeds a pressure-reducing valve that holds junction "valve-out" (elevation 0) at 35 m of
        // pressure head; from there the fill case's pipe and tank. The tank then fills at Q(35 - 20 - h) / A.
        var model = FillModel(7200) with
        {
            Network = Network([new Junction("valve-out", 0, 0)], [new Reservoir("source", 80)],
                [new NetworkPipe("feed", "valve-out", "hill", FillLength, FillPipe, FillRoughness)])
                with { Valves = [new ControlValve("prv", "source", "valve-out", 0.3, ControlValveType.PressureReducing, 35)] },
        };
        var result = Simulate(model);
        Assert.Equal(SimulationStatus.Completed, result.Status);
        double Rate(double h) => PipeFlow(35 - FillBottom - h, FillLength, FillPipe, FillRoughness) / FillArea;
        double fillTime = Integrate.DoubleExponential(h => 1 / Rate(h), FillStart, FillTop, 1e-8);
        double end = Math.Min(7200, Math.Floor(fillTime / 600) * 600);
        var reference = RungeKutta.FourthOrder(FillStart, 0, end, (int)(end / 600) * 2400 + 1, (_, y) => Rate(y));
        double worst = 0;
        foreach (var report in result.Reports.Where(r => r.Time <= end))
        {
            Assert.Equal(ValveState.Active, report.Network.Valves[0].State);
            worst = Math.Max(worst, Math.Abs(report.Tanks[0].Level - reference[(int)Math.Round(report.Time / 600) * 2400]));
        }
        output.WriteLine($"valve-fed fill: largest level error {worst:E3} m, fill time {fillTime:F1} s");
        Assert.True(worst <= 1e-3, $"level error {worst} m");
        if (fillTime < 7200)
            Assert.True(Math.Abs(Assert.Single(result.Events).Time - fillTime) <= 1);
    }

    [Fact]
    public void Run_WarmStarts_SaveNewtonIterationsAndGiveTheSameLevels()
    {
        // Property: starting each network solve from the previous state changes nothing beyond the solves' tolerances
        // and takes fewer Newton iterations than starting every solve from the default start.
        var model = BoosterModel(4 * 3600,
            [new NetworkControl("lift", new ControlAction(false, null), new ControlCondition("high", null, 6, null))]);
        // Both to the network's own tolerances at every stage: the stages' looser stopping rule would let the two runs
        // differ by up to a tenth of the level tolerance a step (Run_StageSolvesToTheLevelTolerance_...).
        var warm = Simulate(model, new SimulationOptions { StrictStages = true });
        var cold = Simulate(model, new SimulationOptions { ColdStarts = true, StrictStages = true });
        Assert.True(warm.Completed && cold.Completed);
        Assert.Equal(warm.Reports.Count, cold.Reports.Count);
        for (int k = 0; k < warm.Reports.Count; k++)
            for (int i = 0; i < 2; i++)
                Assert.Equal(cold.Reports[k].Tanks[i].Level, warm.Reports[k].Tanks[i].Level, 1e-7);
        int warmIterations = warm.Steps.Sum(s => s.NetworkIterations), coldIterations = cold.Steps.Sum(s => s.NetworkIterations);
        output.WriteLine($"Newton iterations in the steps: warm {warmIterations} ({warm.NetworkSolves} solves), cold {coldIterations} ({cold.NetworkSolves} solves)");
        Assert.True(warmIterations < coldIterations);
    }

    // Vandrel Vale's lower zone (an invented layout): a 6 x 6 grid of 300 m pipes fed from the works reservoir at 62 m,
    // with two tanks (bottoms 48 m and 47 m, 12 m and 9 m across) on 200 mm links, and every junction on one day's
    // pattern of hourly multipliers.
    private static SimulationModel ZoneModel(double duration)
    {
        var junctions = new List<Junction>();
        var pipes = new List<NetworkPipe>();
        for (int r = 0; r < 6; r++)
            for (int c = 0; c < 6; c++)
            {
                junctions.Add(new($"z{r}{c}", 20 + r, 0.0015 * (1 + (r + 2 * c) % 3)));
                if (c < 5) pipes.Add(new($"e{r}{c}", $"z{r}{c}", $"z{r}{c + 1}", 300, 0.15 + 0.05 * (r % 2), 0.1e-3));
                if (r < 5) pipes.Add(new($"s{r}{c}", $"z{r}{c}", $"z{r + 1}{c}", 300, 0.15, 0.1e-3, MinorLossCoefficient: 0.5));
            }
        pipes.Add(new("works-main", "works", "z00", 200, 0.3, 0.1e-3));
        pipes.Add(new("north-link", "north", "z05", 150, 0.2, 0.1e-3));
        pipes.Add(new("south-link", "south", "z52", 150, 0.2, 0.1e-3));
        double[] day = [0.5, 0.5, 0.4, 0.4, 0.5, 0.7, 1.1, 1.5, 1.4, 1.2, 1.1, 1.0, 1.0, 1.0, 1.0, 1.1, 1.2, 1.4, 1.6, 1.4, 1.1, 0.9, 0.7, 0.6];
        return Run(Network(junctions.ToArray(), [new Reservoir("works", 62)], pipes.ToArray()),
            [new Tank("north", 48, 4, 0.5, 9, 12), new Tank("south", 47, 3, 0.5, 8, 9)], duration, 1800,
            patterns: [new DemandPattern("day", day)], junctionPatterns: junctions.ToDictionary(j => j.Id, _ => "day"));
    }

    [Fact]
    public void Run_StageSolvesToTheLevelTolerance_KeepTheLevelsAndReportBalancedStates()
    {
        // Property: the integration stages' network solves stop on a flow criterion derived from the level tolerance
        // (a tenth of it over the step, at the smallest tank's area), so they move no level by more than a small part of
        // the level tolerance, take fewer Newton iterations than solves to the network's own tolerances, and leave every
        // reported network state to those tolerances: continuity and energy recomputed from the reported flows and heads
        // with FlowSolve.Core.Pipes (NetworkChecks).
        var model = ZoneModel(12 * 3600);
        var options = new SimulationOptions();
        var loose = Simulate(model, options);
        var strict = Simulate(model, options with { StrictStages = true });
        Assert.True(loose.Completed && strict.Completed);
        Assert.Equal(strict.Reports.Count, loose.Reports.Count);
        double worst = 0;
        for (int k = 0; k < loose.Reports.Count; k++)
            for (int i = 0; i < 2; i++)
                worst = Math.Max(worst, Math.Abs(loose.Reports[k].Tanks[i].Level - strict.Reports[k].Tanks[i].Level));
        int looseIterations = loose.Steps.Sum(s => s.NetworkIterations), strictIterations = strict.Steps.Sum(s => s.NetworkIterations);
        output.WriteLine($"zone, 12 h: largest level difference {worst:E3} m; Newton iterations in the steps {looseIterations} " +
            $"against {strictIterations} ({loose.NetworkSolves} and {strict.NetworkSolves} solves, {loose.Steps.Count} and {strict.Steps.Count} steps)");
        Assert.True(worst <= 0.5 * options.LevelTolerance, $"levels moved by {worst} m");
        Assert.True(looseIterations < strictIterations);

        var network = NetworkSimulator.WithTanks(model);
        foreach (var report in loose.Reports)
        {
            var result = report.Network;
            Assert.True(result.Converged);
            var net = network.Junctions.Where(j => j.Id is not ("north" or "south")).ToDictionary(j => j.Id, j => -result.Junction(j.Id).DeliveredDemand);
            foreach (var p in network.Pipes)
            {
                double q = result.Pipe(p.Id).Flow;
                if (net.ContainsKey(p.From)) net[p.From] -= q;
                if (net.ContainsKey(p.To)) net[p.To] += q;
                double across = NetworkChecks.Head(result, p.From) - NetworkChecks.Head(result, p.To);
                Assert.True(Math.Abs(across - NetworkChecks.IndependentHeadLoss(p, network.KinematicViscosity, q)) <= 1e-9,
                    $"energy on {p.Id} at {report.Time} s");
            }
            foreach (var (id, error) in net) Assert.True(Math.Abs(error) <= 1e-9, $"continuity at {id} at {report.Time} s: {error}");
        }
    }

    public static TheoryData<string> ExtremeCases => ["tiny tank", "huge demand", "subnormal levels", "huge elevation", "long run"];

    [Theory]
    [MemberData(nameof(ExtremeCases))]
    public void Run_ExtremeInputs_EndWithAStatusAndLevelsWithinTheLimits(string name)
    {
        var model = name switch
        {
            "tiny tank" => FillModel(3600) with { Tanks = [new Tank("hill", FillBottom, FillStart, 0, FillTop, 1e-150)] },
            "huge demand" => DrainModel(3600) with { Patterns = [new DemandPattern("day", [1e300])] },
            "subnormal levels" => DrainModel(3600) with { Tanks = [new Tank("tower", 30, 4e-320, 0, 5e-320, 10)] },
            "huge elevation" => FillModel(3600) with { Tanks = [new Tank("hill", 1e300, FillStart, 0, FillTop, FillDiameter)] },
            _ => DrainModel(1e300) with { ReportStep = 1e296, PatternStep = 1e-3 },
        };
        Assert.Empty(NetworkSimulator.Validate(model));
        var result = Simulate(model, new SimulationOptions(MaxSteps: 2000));
        output.WriteLine($"{name}: {result.Status} at {result.ReachedTime} s after {result.Steps.Count} steps");
        Assert.True(double.IsFinite(result.ReachedTime));
        Assert.Equal(result.Status == SimulationStatus.Completed, result.ReachedTime == model.Duration);
        Assert.All(result.Reports, r => Assert.All(r.Tanks, (t, i) =>
        {
            Assert.InRange(t.Level, model.Tanks[i].MinimumLevel, model.Tanks[i].MaximumLevel);
            Assert.True(double.IsFinite(t.Inflow) && double.IsFinite(t.Head));
        }));
    }

    [Fact]
    public void Run_ValveClosedThenOpenedByTime_PausesTheFill()
    {
        // The valve-fed fill with the valve shut from 1800 s to 3600 s. Property of the autonomous mass balance: the
        // level stands still while it is shut, and afterwards runs 1800 s behind the run without controls.
        var plain = FillModel(7200) with
        {
            Network = Network([new Junction("valve-out", 0, 0)], [new Reservoir("source", 80)],
                [new NetworkPipe("feed", "valve-out", "hill", FillLength, FillPipe, FillRoughness)])
                with { Valves = [new ControlValve("prv", "source", "valve-out", 0.3, ControlValveType.PressureReducing, 35)] },
        };
        var paused = plain with
        {
            Controls =
            [
                new NetworkControl("prv", new ControlAction(false, null), new ControlCondition(null, null, null, 1800)),
                new NetworkControl("prv", new ControlAction(true, null), new ControlCondition(null, null, null, 3600)),
            ],
        };
        Assert.Empty(NetworkSimulator.Validate(paused));
        var free = Simulate(plain);
        var result = Simulate(paused);
        Assert.True(result.Completed);
        Assert.Equal([(1800.0, "closed"), (3600.0, "open")], result.Events.Select(e => (e.Time, e.Change)));
        double at1800 = result.Reports.Single(r => r.Time == 1800).Tanks[0].Level;
        foreach (var report in result.Reports)
        {
            double level = report.Tanks[0].Level;
            if (report.Time is > 1800 and < 3600)
            {
                Assert.Equal(at1800, level, 1e-9);
                Assert.Equal(ValveState.Closed, report.Network.Valves[0].State);
                Assert.Equal(0, report.Tanks[0].Inflow, 1e-10); // within the network solve's flow tolerance
            }
            else if (report.Time >= 3600)
                Assert.Equal(free.Reports.Single(r => r.Time == report.Time - 1800).Tanks[0].Level, level, 1e-4);
            else
                Assert.Equal(free.Reports.Single(r => r.Time == report.Time).Tanks[0].Level, level, 1e-9);
        }
        Assert.Equal(ValveState.Active, result.Reports[^1].Network.Valves[0].State);
    }

    [Fact]
    public void Run_LevelConditionHoldingAtStart_FiresAtTimeZero()
    {
        // "Pump off while the high tank is below 5 m": it holds at 0 (3 m), so the pump never runs and the high tank
        // drains at the estate's demand alone (closed form), the low tank standing still.
        var model = BoosterModel(3600,
            [new NetworkControl("lift", new ControlAction(false, null), new ControlCondition("high", 5, null, null))]);
        var result = Simulate(model);
        Assert.True(result.Completed);
        var off = Assert.Single(result.Events);
        Assert.Equal((0.0, "closed"), (off.Time, off.Change));
        foreach (var report in result.Reports)
        {
            Assert.Equal(3 - Estate / HighArea * report.Time, report.Tanks[1].Level, 1e-6);
            Assert.Equal(5, report.Tanks[0].Level, 1e-9);
        }
    }

    [Fact]
    public void Run_TwoControlsOnOneLinkAtOneInstant_TheLaterWins()
    {
        // Closed then opened at 600 s: both are announced, in order, and the pump runs on as if neither had fired.
        var plain = Simulate(BoosterModel(1800, []));
        var result = Simulate(BoosterModel(1800,
        [
            new NetworkControl("lift", new ControlAction(false, null), new ControlCondition(null, null, null, 600)),
            new NetworkControl("lift", new ControlAction(true, null), new ControlCondition(null, null, null, 600)),
        ]));
        Assert.Equal([(600.0, "closed"), (600.0, "open")], result.Events.Select(e => (e.Time, e.Change)));
        // The instant at 600 s is a step boundary in one run and not in the other: the two integrations agree to their
        // accuracy (1e-4 m), not bit for bit.
        for (int k = 0; k < plain.Reports.Count; k++)
            Assert.Equal(plain.Reports[k].Tanks[1].Level, result.Reports[k].Tanks[1].Level, 1e-4);
        Assert.Equal(LinkStatus.Open, result.Reports[^1].Network.Pump("lift").Status);
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
    public void Run_TokenCancelledDuringTheRun_StopsAtTheLastStepBoundary()
    {
        // A century of the drain case: a pattern boundary every hour, so at least one step (three network solves) an
        // hour, some 2.6 million solves (seconds on any machine); cancelled after 50 ms.
        var model = DrainModel(100 * 365 * 86_400.0) with { ReportStep = 86_400 };
        using var source = CancellationTokenSource.CreateLinkedTokenSource(TestContext.Current.CancellationToken);
        source.CancelAfter(50);
        var result = NetworkSimulator.Run(model, new SimulationOptions(MaxSteps: 10_000_000), source.Token);
        output.WriteLine($"{result.Status} at {result.ReachedTime} s after {result.Steps.Count} steps");
        Assert.Equal(SimulationStatus.Cancelled, result.Status);
        Assert.InRange(result.ReachedTime, 0, model.Duration - 1);
        Assert.Equal(result.Steps.Count == 0 ? 0 : result.Steps[^1].End, result.ReachedTime);
        Assert.All(result.Reports, r => Assert.True(r.Time <= result.ReachedTime));
        Assert.All(result.Events, e => Assert.True(e.Time <= result.ReachedTime));
    }

    [Fact]
    public void Run_NetworkLeftWithoutFixedHead_StopsWhereItHappens()
    {
        // The booster over a day: the low tank has no inflow and empties; later the high tank, now the only fixed head,
        // empties too, and demand-driven the estate's demand has no answer: the run stops there, never "completed".
        var model = BoosterModel(86_400,
        [
            new NetworkControl("lift", new ControlAction(false, null), new ControlCondition("high", null, 6, null)),
            new NetworkControl("lift", new ControlAction(true, null), new ControlCondition("high", 2, null, null)),
        ]);
        var result = Simulate(model);
        Assert.Equal(SimulationStatus.NetworkNotConverged, result.Status);
        Assert.False(result.Completed);
        var last = result.Events[^1];
        Assert.Equal(("tank-empty", "high"), (last.Kind, last.ElementId));
        Assert.Equal(last.Time, result.ReachedTime);
        Assert.Contains(result.Events, e => e is { Kind: "tank-empty", ElementId: "low" } && e.Time < last.Time);
        Assert.All(result.Reports, r => Assert.True(r.Time <= result.ReachedTime));
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
