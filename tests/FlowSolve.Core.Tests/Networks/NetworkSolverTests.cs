using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;
using MathNet.Numerics.RootFinding;
using static FlowSolve.Core.Tests.Networks.NetworkChecks;

namespace FlowSolve.Core.Tests.Networks;

public sealed partial class NetworkSolverTests
{
    private const double Water = 1.004e-6; // m2/s, water at 20 degrees C (from memory; ISO/TR 3666 gives 1.0016 mPa s)
    private const double Inch = 0.0254;
    private const double CubicMetrePerHour = 1.0 / 3600;

    private static NetworkModel Model(Junction[] junctions, Reservoir[] reservoirs, NetworkPipe[] pipes,
        NetworkPump[]? pumps = null, double nu = Water) => new(junctions, reservoirs, pipes, pumps ?? [], nu);

    [Fact]
    public void Solve_SinglePipeBetweenReservoirs_MatchesPipeFlowSolve()
    {
        // Reference: PipeFlow.Solve on the same pipe and head (itself checked against White, Fluid Mechanics, Example 6.6
        // reversed). 50 m of head over 2 km of 300 mm pipe, e = 0.26 mm, K = 3.
        var model = Model([], [new("high", 150), new("low", 100)],
            [new("main", "high", "low", 2000, 0.3, 0.26e-3, MinorLossCoefficient: 3)]);
        var result = NetworkSolver.Solve(model);
        var reference = PipeFlow.Solve(new PipeGeometry(2000, 0.3, 0.26e-3, 3), new FluidProperties(Water), 50);
        Assert.Equal(NetworkStatus.Solved, result.Status);
        Assert.Equal(reference.Flow, result.Pipe("main").Flow, 1e-10);
        Assert.Equal(reference.State.FrictionFactor, result.Pipe("main").FrictionFactor, 1e-10);
        // Continuity (property): what leaves one reservoir enters the other; the net supply equals the (zero) demand.
        Assert.Equal(result.Pipe("main").Flow, result.Reservoir("high").Outflow);
        Assert.Equal(-result.Pipe("main").Flow, result.Reservoir("low").Outflow);
        Assert.Equal(0.0, result.TotalSupply, 1e-15);
        Assert.InRange(result.Iterations, 1, 12);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_SingleHazenWilliamsPipe_MatchesClosedForm()
    {
        // Hazen-Williams velocity form V = 0.849 C (D/4)^0.63 S^0.54 (SI; common practice), solved for Q in closed form.
        var model = Model([], [new("a", 80), new("b", 60)], [new("p", "a", "b", 1500, 0.25, HazenWilliamsC: 120)]);
        var result = NetworkSolver.Solve(model);
        double expected = 0.25 * Math.PI * 0.25 * 0.25 * 0.849 * 120 * Math.Pow(0.25 / 4, 0.63) * Math.Pow(20.0 / 1500, 0.54);
        Assert.True(result.Converged);
        Assert.Equal(expected, result.Pipe("p").Flow, 1e-11);
        Assert.InRange(result.Iterations, 1, 12);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_LaminarPipe_IsHagenPoiseuille()
    {
        // Hagen-Poiseuille: Q = pi g H D^4 / (128 nu L) (f = 64/Re; found: Praks and Brkic 2018). An oil of 1e-4 m2/s.
        const double nu = 1e-4, d = 0.05, l = 200, head = 2;
        var model = Model([], [new("a", 12), new("b", 10)], [new("p", "a", "b", l, d, 1e-5)], nu: nu);
        var result = NetworkSolver.Solve(model);
        double expected = Math.PI * Physical.StandardGravity * head * Math.Pow(d, 4) / (128 * nu * l);
        Assert.True(result.Converged);
        Assert.Equal(expected, result.Pipe("p").Flow, expected * 1e-10);
        Assert.InRange(result.Iterations, 1, 12);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_PipesInSeries_MatchesBrentOnTheSeriesEquation()
    {
        // Reference: MathNet Brent on h1(Q) + h2(Q) = 40 m with PipeHeadLoss.Compute for each pipe.
        var model = Model([new("j", 95, 0)], [new("up", 140), new("down", 100)],
            [new("p1", "up", "j", 1200, 0.25, 0.1e-3, MinorLossCoefficient: 2), new("p2", "j", "down", 800, 0.2, 0.05e-3)]);
        var result = NetworkSolver.Solve(model);
        var fluid = new FluidProperties(Water);
        var g1 = new PipeGeometry(1200, 0.25, 0.1e-3, 2);
        var g2 = new PipeGeometry(800, 0.2, 0.05e-3);
        double q = Brent.FindRoot(x => PipeHeadLoss.Compute(g1, fluid, x).HeadLoss + PipeHeadLoss.Compute(g2, fluid, x).HeadLoss - 40,
            1e-4, 1, 1e-15, 200);
        Assert.True(result.Converged);
        Assert.Equal(q, result.Pipe("p1").Flow, 1e-10);
        Assert.Equal(q, result.Pipe("p2").Flow, 1e-10);
        Assert.Equal(140 - PipeHeadLoss.Compute(g1, fluid, q).HeadLoss, result.Junction("j").Head, 1e-8);
        Assert.Equal(result.Junction("j").Head - 95, result.Junction("j").PressureHead, 1e-12);
        Assert.InRange(result.Iterations, 1, 15);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_PipesInParallel_MatchesBrentOnTheJunctionHead()
    {
        // Two parallel pipes from a reservoir to a junction, one pipe on to a second reservoir, and a demand: Brent on
        // the junction head H with Q1(H) + Q2(H) = Q3(H) + demand, each flow from PipeFlow.Solve.
        const double demand = 0.03;
        var model = Model([new("j", 20, demand)], [new("r1", 120), new("r2", 70)],
        [
            new("a", "r1", "j", 900, 0.2, 0.1e-3), new("b", "r1", "j", 1100, 0.15, 0.05e-3, MinorLossCoefficient: 5),
            new("c", "j", "r2", 600, 0.25, 0.2e-3),
        ]);
        var result = NetworkSolver.Solve(model);
        var fluid = new FluidProperties(Water);
        double Q(PipeGeometry g, double drive) => drive >= 0 ? PipeFlow.Solve(g, fluid, drive).Flow : -PipeFlow.Solve(g, fluid, -drive).Flow;
        var ga = new PipeGeometry(900, 0.2, 0.1e-3);
        var gb = new PipeGeometry(1100, 0.15, 0.05e-3, 5);
        var gc = new PipeGeometry(600, 0.25, 0.2e-3);
        double h = Brent.FindRoot(x => Q(ga, 120 - x) + Q(gb, 120 - x) - Q(gc, x - 70) - demand, 70.001, 119.999, 1e-13, 200);
        Assert.True(result.Converged);
        Assert.Equal(h, result.Junction("j").Head, 1e-8);
        Assert.Equal(Q(ga, 120 - h), result.Pipe("a").Flow, 1e-10);
        Assert.Equal(Q(gb, 120 - h), result.Pipe("b").Flow, 1e-10);
        Assert.Equal(demand, result.TotalSupply, 1e-10);
        Assert.InRange(result.Iterations, 1, 15);
        AssertBalanced(model, result);
    }

    // Two-loop network of Alperovits and Shamir 1977 (Water Resources Research 13(6)), from memory: see AlperovitsShamirData.
    private static NetworkModel TwoLoop() =>
        Model(AlperovitsShamirData.Junctions.Select(n => new Junction(n.Id, n.Elevation, n.DemandCubicMetresPerHour * CubicMetrePerHour)).ToArray(),
            [new(AlperovitsShamirData.Reservoir, AlperovitsShamirData.ReservoirHead)],
            AlperovitsShamirData.Pipes.Select(p => new NetworkPipe(p.Id, p.From, p.To, AlperovitsShamirData.PipeLength, p.Inches * Inch,
                HazenWilliamsC: AlperovitsShamirData.HazenWilliamsC)).ToArray());

    [Fact]
    public void Solve_AlperovitsShamirTwoLoop_BalancesAndMatchesHardyCross()
    {
        var model = TwoLoop();
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.Solved, result.Status);
        Assert.InRange(result.Iterations, 1, 20);
        AssertBalanced(model, result);
        // The only link from the reservoir carries the whole demand, 1120 m3/h (the data above).
        Assert.Equal(1120 * CubicMetrePerHour, result.Pipe("1").Flow, 1e-10);
        Assert.Equal(1120 * CubicMetrePerHour, result.TotalSupply, 1e-10);
        Assert.Equal(result.TotalDemand, result.TotalSupply, 1e-10);
        // Energy around both loops (sums of independently computed head losses).
        Assert.True(Math.Abs(LoopSum(model, result, ("2", 1), ("7", 1), ("4", -1), ("3", -1))) < 1e-9);
        Assert.True(Math.Abs(LoopSum(model, result, ("4", 1), ("8", -1), ("6", -1), ("5", -1))) < 1e-9);

        // Independent cross-check: Hardy Cross (1936, Univ. Illinois Eng. Exp. Station Bull. 286) loop corrections
        // dQ = -sum(h) / (1.852 sum |h/Q|) from a balanced start, with HazenWilliams.HeadLoss for h.
        var q = new Dictionary<string, double>
        {
            ["1"] = 1120, ["2"] = 300, ["3"] = 720, ["4"] = 20, ["5"] = 580, ["6"] = 250, ["7"] = 200, ["8"] = 50,
        };
        foreach (var k in q.Keys.ToList()) q[k] *= CubicMetrePerHour;
        (string, int)[][] loops = [[("2", 1), ("7", 1), ("4", -1), ("3", -1)], [("4", 1), ("8", -1), ("6", -1), ("5", -1)]];
        var fluid = new FluidProperties(Water);
        double H(string id, double flow)
        {
            var p = model.Pipes.First(x => x.Id == id);
            double h = HazenWilliams.HeadLoss(new PipeGeometry(p.Length, p.Diameter, 0), fluid, Math.Abs(flow), 130).HeadLoss;
            return Math.CopySign(h, flow);
        }
        for (int sweep = 0; sweep < 500; sweep++)
        {
            double largest = 0;
            foreach (var loop in loops)
            {
                double sum = 0, slope = 0;
                foreach (var (id, sign) in loop)
                {
                    double h = H(id, q[id]);
                    sum += sign * h;
                    slope += HazenWilliams.FlowExponent * h / q[id];
                }
                double dq = -sum / slope;
                foreach (var (id, sign) in loop) q[id] += sign * dq;
                largest = Math.Max(largest, Math.Abs(dq));
            }
            if (largest < 1e-15) break;
        }
        foreach (var (id, flow) in q) Assert.Equal(flow, result.Pipe(id).Flow, 1e-10);
    }

    [Fact]
    public void Solve_CheckValveAgainstReverseHead_ClosesAndCarriesNoFlow()
    {
        // The check valve lets water go only from j to r2, but r2 stands higher than anything upstream: it must close,
        // and r1 alone supplies the demand; the junction head then follows from PipeHeadLoss.Compute on p1.
        const double demand = 0.02;
        var model = Model([new("j", 10, demand)], [new("r1", 100), new("r2", 130)],
            [new("p1", "r1", "j", 1000, 0.2, 0.1e-3), new("cv", "j", "r2", 500, 0.2, 0.1e-3, CheckValve: true)]);
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.Solved, result.Status);
        Assert.Equal(LinkStatus.CheckValveClosed, result.Pipe("cv").Status);
        Assert.Equal(0.0, result.Pipe("cv").Flow);
        Assert.Equal(demand, result.Pipe("p1").Flow, 1e-11);
        double loss = PipeHeadLoss.Compute(new PipeGeometry(1000, 0.2, 0.1e-3), new FluidProperties(Water), demand).HeadLoss;
        Assert.Equal(100 - loss, result.Junction("j").Head, 1e-8);
        Assert.True(result.Pipe("cv").HeadLoss < 0); // reverse head held across the closed valve
        Assert.InRange(result.StatusPasses, 2, 3);
        Assert.InRange(result.Iterations, 1, 30);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_CheckValveWithForwardHead_StaysOpen()
    {
        // The same network with r2 below: forward flow, so the valve stays open; flows match Brent on the junction head.
        var model = Model([new("j", 10, 0.02)], [new("r1", 100), new("r2", 60)],
            [new("p1", "r1", "j", 1000, 0.2, 0.1e-3), new("cv", "j", "r2", 500, 0.2, 0.1e-3, CheckValve: true)]);
        var result = NetworkSolver.Solve(model);
        var g = new PipeGeometry(1000, 0.2, 0.1e-3);
        var g2 = new PipeGeometry(500, 0.2, 0.1e-3);
        var fluid = new FluidProperties(Water);
        double h = Brent.FindRoot(x => PipeFlow.Solve(g, fluid, 100 - x).Flow - PipeFlow.Solve(g2, fluid, x - 60).Flow - 0.02, 60.001, 99.999, 1e-13, 200);
        Assert.Equal(LinkStatus.Open, result.Pipe("cv").Status);
        Assert.Equal(h, result.Junction("j").Head, 1e-8);
        Assert.Equal(1, result.StatusPasses);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_DisconnectedJunctions_ReportsThemWithoutSolving()
    {
        var model = Model([new("a", 0, 0.01), new("island1", 0, 0.01), new("island2", 0, 0)], [new("r", 50)],
            [new("p", "r", "a", 100, 0.2), new("q", "island1", "island2", 100, 0.2), new("shut", "a", "island1", 100, 0.2, Closed: true)]);
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.NoPathToFixedHead, result.Status);
        Assert.False(result.Converged);
        Assert.Equal(["island1", "island2"], result.UnsuppliedJunctions);
        Assert.Equal(0, result.Iterations);
    }

    [Fact]
    public void Solve_NoReservoir_ReportsEveryJunction()
    {
        var model = Model([new("a", 0, 0.01), new("b", 0, 0)], [], [new("p", "a", "b", 100, 0.2)]);
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.NoPathToFixedHead, result.Status);
        Assert.Equal(["a", "b"], result.UnsuppliedJunctions);
    }

    // A 4 x 4 grid of Darcy-Weisbach pipes fed from two corners (a fictional test layout): 24 pipes, 9 loops.
    private static NetworkModel Grid(double demand = 0.004)
    {
        var junctions = new List<Junction>();
        var pipes = new List<NetworkPipe>();
        for (int r = 0; r < 4; r++)
            for (int c = 0; c < 4; c++)
            {
                junctions.Add(new($"n{r}{c}", 5 * r, demand * (1 + (r + c) % 3)));
                if (c < 3) pipes.Add(new($"h{r}{c}", $"n{r}{c}", $"n{r}{c + 1}", 300 + 40 * c, 0.15 + 0.05 * (r % 2), 0.1e-3));
                if (r < 3) pipes.Add(new($"v{r}{c}", $"n{r}{c}", $"n{r + 1}{c}", 250 + 30 * r, 0.1 + 0.05 * (c % 3), 0.05e-3, MinorLossCoefficient: 1));
            }
        pipes.Add(new("feedA", "A", "n00", 100, 0.3, 0.1e-3));
        pipes.Add(new("feedB", "B", "n33", 100, 0.25, 0.1e-3));
        return Model(junctions.ToArray(), [new("A", 80), new("B", 75)], pipes.ToArray());
    }

    [Fact]
    public void Solve_DarcyGrid_ConvergesQuadratically()
    {
        // Quadratic convergence (Newton with the exact Jacobian, df/dRe included; Simpson and Elhay 2011): the observed
        // order ln(d_k+1 / d_k) / ln(d_k / d_k-1) of the flow changes d reaches about 2 before rounding takes over.
        var model = Grid();
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.Solved, result.Status);
        Assert.InRange(result.Iterations, 3, 15);
        AssertBalanced(model, result);
        var d = result.Record.Select(r => r.MaxFlowChange).ToArray();
        double best = 0;
        for (int k = 1; k + 1 < d.Length; k++)
        {
            if (d[k + 1] < 1e-13 || d[k] > 1e-2) continue;
            best = Math.Max(best, Math.Log(d[k + 1] / d[k]) / Math.Log(d[k] / d[k - 1]));
        }
        Assert.InRange(best, 1.7, 3.0);
        // The record's last row meets the tolerances the result claims.
        Assert.True(result.Record[^1].MaxHeadImbalance <= NetworkOptions.Default.HeadTolerance);
        Assert.True(result.Record[^1].MaxContinuityError <= NetworkOptions.Default.FlowTolerance);
    }

    [Fact]
    public void SolveLoadCases_Multipliers_WarmStartMatchesColdSolves()
    {
        // Property: a warm-started load case reaches the same state as a cold solve of that case (1e-9), in no more
        // iterations, and the demand total scales with the multiplier.
        var model = Grid();
        double[] multipliers = [0.5, 1.0, 1.3, 0.8];
        var warm = NetworkSolver.SolveLoadCases(model, multipliers);
        var baseDemand = model.Junctions.Sum(j => j.Demand);
        for (int i = 0; i < multipliers.Length; i++)
        {
            var cold = new NetworkSolver(model).SolveCase(multipliers[i]);
            Assert.True(warm[i].Converged);
            Assert.Equal(multipliers[i], warm[i].DemandMultiplier);
            Assert.Equal(multipliers[i] * baseDemand, warm[i].TotalDemand, 1e-12);
            Assert.Equal(warm[i].TotalDemand, warm[i].TotalSupply, 1e-9);
            foreach (var p in model.Pipes) Assert.Equal(cold.Pipe(p.Id).Flow, warm[i].Pipe(p.Id).Flow, 1e-9);
            if (i > 0) Assert.True(warm[i].Iterations <= cold.Iterations, $"case {i}: {warm[i].Iterations} > {cold.Iterations}");
            AssertBalanced(model with { Junctions = model.Junctions.Select(j => j with { Demand = j.Demand * multipliers[i] }).ToArray() }, warm[i]);
        }
    }

    private static readonly PumpCurve Pump40 = PumpCurve.FromCoefficients(40, 0, -5000);

    [Fact]
    public void Solve_PumpLiftingToAReservoir_MatchesDutyPoint()
    {
        // Reference: DutyPoint.Solve with the pipe's system curve (static head 15 m, SystemCurve.FromPipes).
        var model = Model([new("suction", 0, 0), new("delivery", 0, 0)], [new("sump", 5), new("tank", 20)],
            [new("in", "sump", "suction", 10, 0.15, 0.05e-3), new("out", "delivery", "tank", 400, 0.15, 0.05e-3)],
            [new NetworkPump("pump", "suction", "delivery", Pump40, 0.95)]);
        var result = NetworkSolver.Solve(model);
        var system = SystemCurve.FromPipes(15, [new PipeGeometry(10, 0.15, 0.05e-3), new PipeGeometry(400, 0.15, 0.05e-3)], new FluidProperties(Water));
        var duty = DutyPoint.Solve(Pump40, system, PumpArrangement.InSeries(1, 0.95));
        Assert.Equal(NetworkStatus.Solved, result.Status);
        Assert.Equal(duty.Flow, result.Pump("pump").Flow, 1e-9);
        Assert.Equal(duty.Head, result.Pump("pump").Head, 1e-7);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_PumpAgainstTooHighAHead_StopsAndSaysItCannotLift()
    {
        // Shut-off head 40 m (at speed 1) against a static lift of 60 m: no forward flow exists (H(Q) <= 40 < 60).
        var model = Model([new("suction", 0, 0), new("delivery", 0, 0)], [new("sump", 0), new("tank", 60)],
            [new("in", "sump", "suction", 10, 0.15, 0.05e-3), new("out", "delivery", "tank", 400, 0.15, 0.05e-3)],
            [new NetworkPump("pump", "suction", "delivery", Pump40)]);
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.PumpCannotLift, result.Status);
        Assert.True(result.Converged);
        Assert.Equal(LinkStatus.PumpOff, result.Pump("pump").Status);
        Assert.Equal(0.0, result.Pump("pump").Flow);
        Assert.Equal(["pump"], result.PumpsUnableToLift);
        Assert.Contains(result.Warnings, w => w.ElementId == "pump" && w.Code == NetworkWarningCode.PumpCannotLift);
        Assert.Equal(60, result.Pump("pump").Head, 1e-6); // the tank's head stands across the stopped pump
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_Warnings_FlagNegativePressureAndVelocities()
    {
        // Design velocities 0.6 to 3 m/s (common practice); a junction above the reservoir level has negative pressure.
        var model = Model([new("hill", 60, 0.001)], [new("r", 50), new("low", 0)],
            [new("slow", "r", "hill", 100, 0.3), new("fast", "r", "low", 100, 0.1, 0.05e-3)]);
        var result = NetworkSolver.Solve(model);
        Assert.True(result.Converged);
        Assert.Contains(result.Warnings, w => w.ElementId == "hill" && w.Code == NetworkWarningCode.NegativePressure && w.Value < 0);
        Assert.Contains(result.Warnings, w => w.ElementId == "slow" && w.Code == NetworkWarningCode.VelocityBelowDesignRange);
        Assert.Contains(result.Warnings, w => w.ElementId == "fast" && w.Code == NetworkWarningCode.VelocityAboveDesignRange);
        Assert.Equal("negative-pressure", result.Warnings.First(w => w.ElementId == "hill").Describe().Code);
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_ZeroFlowHazenWilliamsPipe_ConvergesThroughTheRegularisedSegment()
    {
        // A Hazen-Williams pipe joining two junctions of equal head by symmetry carries no flow, where the formula's
        // dh/dQ vanishes; the regularised cubic keeps the Newton step defined (Elhay and Simpson 2011). Symmetry gives Q = 0.
        var model = Model([new("a", 0, 0.01), new("b", 0, 0.01)], [new("r", 40)],
        [
            new("ra", "r", "a", 500, 0.15, HazenWilliamsC: 120), new("rb", "r", "b", 500, 0.15, HazenWilliamsC: 120),
            new("ab", "a", "b", 300, 0.1, HazenWilliamsC: 120),
        ]);
        var result = NetworkSolver.Solve(model);
        Assert.True(result.Converged);
        Assert.Equal(0.0, result.Pipe("ab").Flow, 1e-12);
        Assert.Equal(result.Junction("a").Head, result.Junction("b").Head, 1e-10);
        Assert.InRange(result.Iterations, 1, 20);
        AssertBalanced(model, result);
    }

    // A 23 x 23 grid of Darcy-Weisbach pipes, 150 to 400 mm, fed by four reservoirs at the corners (a fictional layout
    // for scale tests): 1,056 pipes (including the feeds), 529 junctions, 484 loops.
    private static NetworkModel LargeGrid(int k = 23)
    {
        var random = new Random(529);
        double[] sizes = [0.15, 0.2, 0.25, 0.3, 0.4];
        var junctions = new List<Junction>();
        var pipes = new List<NetworkPipe>();
        for (int r = 0; r < k; r++)
            for (int c = 0; c < k; c++)
            {
                junctions.Add(new($"n{r}_{c}", 10 * random.NextDouble(), 1e-4 * (0.5 + random.NextDouble())));
                if (c + 1 < k) pipes.Add(new($"h{r}_{c}", $"n{r}_{c}", $"n{r}_{c + 1}", 100 + 100 * random.NextDouble(), sizes[random.Next(5)], 0.1e-3));
                if (r + 1 < k) pipes.Add(new($"v{r}_{c}", $"n{r}_{c}", $"n{r + 1}_{c}", 100 + 100 * random.NextDouble(), sizes[random.Next(5)], 0.1e-3));
            }
        (int R, int C)[] corners = [(0, 0), (0, k - 1), (k - 1, 0), (k - 1, k - 1)];
        var reservoirs = new Reservoir[4];
        for (int i = 0; i < 4; i++)
        {
            reservoirs[i] = new($"r{i}", 100 + 2 * i);
            pipes.Add(new($"feed{i}", $"r{i}", $"n{corners[i].R}_{corners[i].C}", 50, 0.5, 0.1e-3));
        }
        return Model(junctions.ToArray(), reservoirs, pipes.ToArray());
    }

    [Fact]
    public void Solve_LargeGrid_DirectAndConjugateGradientAgree()
    {
        // Two independent linear solvers for the head equations (sparse Cholesky, IC(0) conjugate gradients) must lead
        // the same Newton iteration to the same balanced state: flows and heads agree to 1e-9, and both balance.
        var model = LargeGrid();
        Assert.True(model.Pipes.Count >= 1000);
        var direct = NetworkSolver.Solve(model);
        var iterative = NetworkSolver.Solve(model, NetworkOptions.Default with { LinearSolver = NetworkLinearSolver.ConjugateGradient });
        Assert.Equal(NetworkStatus.Solved, direct.Status);
        Assert.Equal(NetworkStatus.Solved, iterative.Status);
        AssertBalanced(model, direct);
        AssertBalanced(model, iterative);
        foreach (var p in model.Pipes) Assert.Equal(iterative.Pipe(p.Id).Flow, direct.Pipe(p.Id).Flow, 1e-9);
        foreach (var j in model.Junctions) Assert.Equal(iterative.Junction(j.Id).Head, direct.Junction(j.Id).Head, 1e-9);
        Assert.InRange(direct.Iterations, 1, 20);
        // One triangular solve per Newton step, at most four refinement steps more (the direct path's contract).
        Assert.All(direct.Record, r => Assert.InRange(r.LinearIterations, 1, 5));
        Assert.Equal(direct.TotalDemand, direct.TotalSupply, 1e-9);
    }

    [Fact]
    public void Solve_TwoLoopAndCheckValve_ConjugateGradientPathMatchesDirect()
    {
        // The status logic (check valves) and the Hazen-Williams branch run the same with either linear solver.
        var twoLoop = TwoLoop();
        var a = NetworkSolver.Solve(twoLoop);
        var b = NetworkSolver.Solve(twoLoop, NetworkOptions.Default with { LinearSolver = NetworkLinearSolver.ConjugateGradient });
        foreach (var p in twoLoop.Pipes) Assert.Equal(a.Pipe(p.Id).Flow, b.Pipe(p.Id).Flow, 1e-10);
        AssertBalanced(twoLoop, b);
        var valve = Model([new("j", 10, 0.02)], [new("r1", 100), new("r2", 130)],
            [new("p1", "r1", "j", 1000, 0.2, 0.1e-3), new("cv", "j", "r2", 500, 0.2, 0.1e-3, CheckValve: true)]);
        var c = NetworkSolver.Solve(valve, NetworkOptions.Default with { LinearSolver = NetworkLinearSolver.ConjugateGradient });
        Assert.Equal(LinkStatus.CheckValveClosed, c.Pipe("cv").Status);
        Assert.Equal(NetworkSolver.Solve(valve).Junction("j").Head, c.Junction("j").Head, 1e-9);
        AssertBalanced(valve, c);
    }

    [Fact]
    public void Constructor_UnknownLinearSolver_Throws() =>
        Assert.Throws<ArgumentOutOfRangeException>(() =>
            new NetworkSolver(TwoLoop(), NetworkOptions.Default with { LinearSolver = (NetworkLinearSolver)7 }));
}
