using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using MathNet.Numerics.RootFinding;
using static FlowSolve.Core.Tests.Networks.NetworkChecks;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>
/// Pressure-driven demand (Wagner, Shamir and Marks 1988, from memory) in the network solver, against independent
/// references: MathNet's Brent on the scalar equation of one reservoir, one pipe and one junction; a dense Newton of
/// the tests' own on the full equations of a looped network (<see cref="DenseNetworkReference"/>); the demand-driven
/// solve where the law delivers everything; and stated properties (the law at every junction of every case, continuity,
/// energy, warm against cold starts, the uniqueness of the answer).
/// </summary>
public sealed partial class NetworkSolverTests
{
    private static double Headloss(double length, double diameter, double roughness, double q) =>
        q == 0 ? 0 : NetworkEdgeCaseTests.ReferenceHeadLoss(length, diameter, roughness, q, Water);

    public static TheoryData<double, double, double, string> SingleJunctionCases => new()
    {
        // junction elevation (m), demand (m3/s), exponent, the band the answer must lie in; reservoir at 50 m, 1000 m
        // of 100 mm pipe (e = 0.1 mm) between, law from 0 to 20 m.
        { 20, 0.03, 0.5, "partial" },
        { 20, 0.03, 1 / 1.85, "partial" },
        { 20, 0.03, 1, "partial" },
        { 20, 0.03, 2, "partial" },
        { 20, 0.03, 0.1, "partial" },
        { 20, 0.03, 3, "partial" },
        { 49.6, 0.05, 0.5, "partial" }, // just above the minimum: a small delivery on the steep part of the law
        { 10, 0.005, 0.5, "full" },
        { 55, 0.01, 0.5, "zero" },      // the reservoir stands below the junction
    };

    [Theory]
    [MemberData(nameof(SingleJunctionCases))]
    public void PressureDriven_OneReservoirOnePipeOneJunction_MatchesBrentOnTheScalarEquation(double z, double demand, double e, string band)
    {
        // Reference: Brent on g(p) = H_res - z - hf(d r(p)) - p = 0 (g decreases in p), hf by Darcy-Weisbach with
        // Brent's Colebrook-White; nothing from the network solver.
        const double reservoir = 50, length = 1000, diameter = 0.1, roughness = 1e-4, min = 0, req = 20;
        var model = Model([new("j", z, demand)], [new("r", reservoir)], [new("p", "r", "j", length, diameter, roughness)])
            with { DemandModel = new PressureDrivenDemand(min, req, e) };
        var result = NetworkSolver.Solve(model);
        double Q(double p) => DenseNetworkReference.Delivered(demand, p, min, req, e);
        double pressure = Brent.FindRoot(p => reservoir - z - Headloss(length, diameter, roughness, Q(p)) - p,
            min - 10, reservoir - z + 1, 1e-14, 500);
        double delivered = Q(pressure);

        Assert.Equal(NetworkStatus.Solved, result.Status);
        var j = result.Junction("j");
        Assert.Equal(pressure, j.PressureHead, 1e-9);
        Assert.Equal(delivered, j.DeliveredDemand, 1e-9 * demand);
        Assert.Equal(delivered, result.Pipe("p").Flow, 1e-9 * demand);
        Assert.Equal(demand, j.Demand);
        switch (band)
        {
            case "zero": Assert.True(pressure <= min && delivered == 0); break;
            case "full": Assert.True(pressure >= req && delivered == demand); break;
            default: Assert.InRange(delivered, 1e-6 * demand, (1 - 1e-6) * demand); break;
        }
        if (delivered > 0)
            Assert.True(Math.Abs(delivered) / (Math.PI * diameter * diameter / 4) * diameter / Water > 4200, "keep the reference clear of the transition zone");
        Assert.Equal(demand - delivered, result.DemandShortfall, 1e-9 * demand);
        Assert.Equal(delivered, result.TotalDeliveredDemand, 1e-9 * demand);
        Assert.InRange(result.Iterations, 1, 40);
        AssertBalanced(model, result);
    }

    /// <summary>A small looped network (invented): a reservoir, five junctions (one of them an inflow) on two loops,
    /// Darcy-Weisbach pipes and one Hazen-Williams pipe; at twice its demands one junction gets everything, one part,
    /// one nothing.</summary>
    private static NetworkModel ThreeBands(double exponent) =>
        Model(
            [new("j1", 5, 0.03), new("j2", 30, 0.03), new("j3", 52, 0.01), new("j4", 20, 0.02), new("j5", 12, -0.005)],
            [new("r", 60)],
            [
                new("p1", "r", "j1", 1000, 0.3, 1e-4, MinorLossCoefficient: 2), new("p2", "j1", "j2", 800, 0.15, 1e-4),
                new("p3", "j2", "j4", 600, 0.15, 1e-4), new("p4", "j4", "j1", 700, 0.2, 1e-4), new("p5", "j2", "j3", 500, 0.1, 1e-4),
                new("p6", "j3", "j4", 500, 0.1, HazenWilliamsC: 110), new("p7", "j4", "j5", 400, 0.1, 1e-4),
            ]) with { DemandModel = new PressureDrivenDemand(0, 20, exponent) };

    [Theory]
    [InlineData(0.5)]
    [InlineData(1.0)]
    [InlineData(2.0)]
    [InlineData(1 / 1.85)]
    public void PressureDriven_LoopedNetworkWithAllThreeBands_MatchesAnIndependentDenseNewton(double exponent)
    {
        var model = ThreeBands(exponent);
        double[] multipliers = [1.0, 2.0, 0.5];
        var results = NetworkSolver.SolveLoadCases(model, multipliers);
        bool zero = false, partial = false, full = false;
        for (int c = 0; c < multipliers.Length; c++)
        {
            var r = results[c];
            AssertBalanced(model, r);
            var (flows, heads, delivered, residual) = DenseNetworkReference.Solve(model, 0, 20, exponent, multipliers[c]);
            Assert.True(residual < 1e-11, $"the reference converged to {residual}");
            for (int j = 0; j < heads.Length; j++)
            {
                var jr = r.Junctions[j];
                Assert.Equal(heads[j], jr.Head, 1e-9);
                Assert.Equal(delivered[j], jr.DeliveredDemand, 1e-9 * Math.Abs(jr.Demand));
                if (jr.Demand > 0 && jr.DeliveredDemand == 0) zero = true;
                else if (jr.Demand > 0 && jr.DeliveredDemand == jr.Demand) full = true;
                else if (jr.Demand > 0) partial = true;
            }
            for (int l = 0; l < flows.Length; l++)
            {
                Assert.Equal(flows[l], r.Pipes[l].Flow, 1e-9 * 0.1);
                var p = model.Pipes[l];
                if (p.HazenWilliamsC is null)
                    Assert.True(Math.Abs(r.Pipes[l].Velocity) * p.Diameter / Water > 4200, $"pipe {p.Id} clear of the transition zone");
            }
            Assert.InRange(r.Iterations, 1, 40);
        }
        Assert.True(zero && partial && full, "the cases cover zero, partial and full delivery");
        // At twice the demands j3 (on the hill) gets nothing, j2 part of its demand, j1 all of it; the inflow at j5 is
        // delivered in full.
        var twice = results[1];
        Assert.Equal(0.0, twice.Junction("j3").DeliveredDemand);
        Assert.InRange(twice.Junction("j2").DeliveredDemand, 1e-3 * 0.06, 0.999 * 0.06);
        Assert.Equal(0.06, twice.Junction("j1").DeliveredDemand);
        Assert.Equal(-0.01, twice.Junction("j5").DeliveredDemand);
    }

    [Fact]
    public void PressureDriven_EveryJunctionOfEveryCase_MeetsTheLawContinuityAndEnergy_AndTotalsAddUp()
    {
        // The two-loop network of Alperovits and Shamir (1977, from memory) under pressure-driven demand (0 to 30 m,
        // e = 0.5), from a light load to four times the design demands; then a generated grid with check valves.
        var model = TwoLoop() with { DemandModel = new PressureDrivenDemand(0, 30) };
        double[] multipliers = [0.5, 1, 1.5, 2, 3, 4, 1];
        var results = NetworkSolver.SolveLoadCases(model, multipliers);
        int shortCases = 0;
        foreach (var r in results)
        {
            AssertBalanced(model, r); // the law at every junction to 1e-9 of its demand, continuity and energy to 1e-9
            AssertTotals(r);
            if (r.DemandShortfall > 0) shortCases++;
        }
        Assert.InRange(shortCases, 2, multipliers.Length - 1);

        var grid = GeneratedGrid(9, 17) with { DemandModel = new PressureDrivenDemand(2, 25, 0.5) };
        foreach (var r in NetworkSolver.SolveLoadCases(grid, [1, 5, 20, 60, 0.2, 0]))
        {
            AssertBalanced(grid, r);
            AssertTotals(r);
        }
    }

    private static void AssertTotals(NetworkResult r)
    {
        Assert.Equal(r.Junctions.Sum(j => j.DeliveredDemand), r.TotalDeliveredDemand, 1e-12);
        Assert.Equal(r.Junctions.Sum(j => j.Demand - j.DeliveredDemand), r.DemandShortfall, 1e-12);
        Assert.True(r.DemandShortfall >= 0);
        Assert.Equal(r.TotalDeliveredDemand, r.TotalSupply, 1e-9);
        int shortJunctions = r.Junctions.Count(j => j.DeliveredDemand < j.Demand);
        var warnings = r.Warnings.Where(w => w.Code == NetworkWarningCode.DemandShortfall).ToList();
        if (shortJunctions == 0) Assert.Empty(warnings);
        else
        {
            var w = Assert.Single(warnings);
            Assert.Equal(shortJunctions, w.Count);
            Assert.Equal(r.DemandShortfall, w.Value, 1e-15);
            Assert.Equal("", w.ElementId);
            Assert.Equal("demand-shortfall", w.Describe().Code);
            Assert.Contains(shortJunctions.ToString(System.Globalization.CultureInfo.InvariantCulture), w.Describe().Message);
        }
    }

    /// <summary>A generated n x n grid (invented): Darcy-Weisbach and some Hazen-Williams pipes, a check valve on every
    /// seventh vertical pipe, ground rising across it, one inflow, fed from two reservoirs at opposite corners.</summary>
    private static NetworkModel GeneratedGrid(int n, int seed)
    {
        var random = new Random(seed);
        var junctions = new List<Junction>();
        var pipes = new List<NetworkPipe>();
        double[] sizes = [0.1, 0.15, 0.2, 0.25];
        string Id(int r, int c) => $"j{r}_{c}";
        for (int r = 0; r < n; r++)
            for (int c = 0; c < n; c++)
            {
                double demand = r == n / 2 && c == n / 2 ? -0.002 : 1e-3 * (0.5 + random.NextDouble());
                junctions.Add(new Junction(Id(r, c), 2 * r + 10 * random.NextDouble(), demand));
                if (c + 1 < n) pipes.Add(new NetworkPipe($"h{r}_{c}", Id(r, c), Id(r, c + 1), 100 + 100 * random.NextDouble(),
                    sizes[random.Next(sizes.Length)], 1e-4, HazenWilliamsC: random.Next(4) == 0 ? 120 : null));
                if (r + 1 < n) pipes.Add(new NetworkPipe($"v{r}_{c}", Id(r, c), Id(r + 1, c), 100 + 100 * random.NextDouble(),
                    sizes[random.Next(sizes.Length)], 1e-4, CheckValve: (r * n + c) % 7 == 3));
            }
        pipes.Add(new NetworkPipe("feed-a", "ra", Id(0, 0), 50, 0.4, 1e-4));
        pipes.Add(new NetworkPipe("feed-b", "rb", Id(n - 1, n - 1), 50, 0.4, 1e-4));
        return Model(junctions.ToArray(), [new("ra", 60), new("rb", 70)], pipes.ToArray());
    }

    [Fact]
    public void PressureDriven_WhereTheLawDeliversEverything_EqualsTheDemandDrivenSolve()
    {
        // Property: with every pressure above the required head, the law delivers every demand, so the answer is the
        // demand-driven one (heads and flows to 1e-9).
        var demandDriven = TwoLoop();
        var pressureDriven = demandDriven with { DemandModel = new PressureDrivenDemand(-60, -50) };
        double[] multipliers = [0.5, 1, 1.3];
        var a = NetworkSolver.SolveLoadCases(demandDriven, multipliers);
        var b = NetworkSolver.SolveLoadCases(pressureDriven, multipliers);
        for (int c = 0; c < multipliers.Length; c++)
        {
            Assert.True(a[c].Converged && b[c].Converged);
            for (int j = 0; j < a[c].Junctions.Count; j++)
            {
                Assert.Equal(a[c].Junctions[j].Head, b[c].Junctions[j].Head, 1e-9);
                Assert.Equal(a[c].Junctions[j].Demand, b[c].Junctions[j].DeliveredDemand);
            }
            for (int l = 0; l < a[c].Pipes.Count; l++) Assert.Equal(a[c].Pipes[l].Flow, b[c].Pipes[l].Flow, 1e-10);
            Assert.Equal(0.0, b[c].DemandShortfall);
            Assert.DoesNotContain(b[c].Warnings, w => w.Code == NetworkWarningCode.DemandShortfall);
        }
    }

    [Fact]
    public void DemandDriven_DeliversEveryDemand_AndItsNegativePressureWarningPointsToThePressureDrivenModel()
    {
        // Without a demand model nothing changes: every junction gets its demand, whatever the pressure (here j3 on the
        // hill runs below atmospheric), totals agree, and no shortfall is reported.
        var model = ThreeBands(0.5) with { DemandModel = null };
        var r = new NetworkSolver(model).SolveCase(2);
        AssertBalanced(model, r);
        Assert.Null(r.DemandModel);
        Assert.Equal(r.TotalDemand, r.TotalDeliveredDemand);
        Assert.Equal(0.0, r.DemandShortfall);
        var negative = r.Warnings.Where(w => w.Code == NetworkWarningCode.NegativePressure).ToList();
        Assert.Contains(negative, w => w.ElementId == "j3");
        Assert.All(negative, w =>
        {
            Assert.True(r.Junction(w.ElementId).PressureHead < 0);
            Assert.False(w.PressureDriven);
            Assert.Contains("pressure-driven", w.Describe().Message);
        });
        Assert.DoesNotContain(r.Warnings, w => w.Code == NetworkWarningCode.DemandShortfall);

        // The same junction under pressure-driven demand: the warning says its delivery is limited.
        var pdd = new NetworkSolver(ThreeBands(0.5)).SolveCase(2);
        var limited = Assert.Single(pdd.Warnings, w => w.Code == NetworkWarningCode.NegativePressure);
        Assert.True(limited.PressureDriven);
        Assert.Contains("only what its pressure allows", limited.Describe().Message);
    }

    [Fact]
    public void PressureDriven_WarmStartedLoadCases_EqualColdSolvesOfEachCase()
    {
        // The answer is unique (Elhay et al. 2016, from memory), so it cannot depend on where the iteration starts.
        var model = ThreeBands(0.5);
        double[] multipliers = [2, 0.5, 3, 1];
        var warm = NetworkSolver.SolveLoadCases(model, multipliers);
        for (int c = 0; c < multipliers.Length; c++)
        {
            var cold = new NetworkSolver(model).SolveCase(multipliers[c]);
            for (int j = 0; j < cold.Junctions.Count; j++)
            {
                Assert.Equal(cold.Junctions[j].Head, warm[c].Junctions[j].Head, 1e-9);
                Assert.Equal(cold.Junctions[j].DeliveredDemand, warm[c].Junctions[j].DeliveredDemand, 1e-11);
            }
        }
    }

    [Fact]
    public void PressureDriven_AnInflowAtNegativePressure_IsDeliveredInFull()
    {
        // An inflow injected on a hill drains to a reservoir 20 m below the junction: delivered in full (the law only
        // limits positive demands); the head at the junction is the reservoir's plus the pipe's loss (Brent's Colebrook).
        const double inflow = -0.004;
        var model = Model([new("hill", 30, inflow)], [new("r", 10)], [new("p", "hill", "r", 800, 0.1, 1e-4)])
            with { DemandModel = new PressureDrivenDemand(0, 20) };
        var r = NetworkSolver.Solve(model);
        AssertBalanced(model, r);
        Assert.Equal(inflow, r.Junction("hill").DeliveredDemand);
        Assert.Equal(-inflow, r.Pipe("p").Flow, 1e-12);
        Assert.Equal(10 + Headloss(800, 0.1, 1e-4, -inflow), r.Junction("hill").Head, 1e-9);
        Assert.True(r.Junction("hill").PressureHead < 0);
        Assert.Equal(0.0, r.DemandShortfall);
    }

    [Fact]
    public void PressureDriven_AJunctionBehindAClosedCheckValve_GetsNothingAndConverges()
    {
        // A junction fed only through a check valve from a reservoir below it: nothing can flow up, so it gets nothing,
        // the valve carries no flow and its pressure is below the minimum; the rest of the network is unaffected.
        var model = Model([new("low", 25, 0.01), new("town", 0, 0.02)], [new("pond", 15), new("tank", 60)],
            [new("cv", "pond", "low", 300, 0.1, 1e-4, CheckValve: true), new("main", "tank", "town", 1000, 0.2, 1e-4)])
            with { DemandModel = new PressureDrivenDemand(0, 20) };
        var r = NetworkSolver.Solve(model);
        AssertBalanced(model, r);
        Assert.Equal(0.0, r.Junction("low").DeliveredDemand);
        Assert.True(r.Junction("low").PressureHead <= 0);
        Assert.True(Math.Abs(r.Pipe("cv").Flow) <= 1e-12, $"flow through the valve {r.Pipe("cv").Flow}");
        Assert.Equal(0.02, r.Junction("town").DeliveredDemand);
        Assert.Equal(0.01, r.DemandShortfall, 1e-15);
    }

    [Fact]
    public void PressureDriven_CutShortByTheIterationCap_NeverReportsConverged()
    {
        var model = ThreeBands(0.5);
        var options = NetworkOptions.Default with { MaxIterations = 2 };
        var r = new NetworkSolver(model, options).SolveCase(2);
        Assert.False(r.Converged);
        Assert.Equal(NetworkStatus.IterationCapReached, r.Status);
        Assert.Equal(2, r.Iterations);
        Assert.All(r.Junctions, j => Assert.True(double.IsFinite(j.Head) && double.IsFinite(j.DeliveredDemand)));
    }

    [Fact]
    public void PressureDriven_ConjugateGradientHeadSolve_GivesTheDirectSolversAnswer()
    {
        // Property: the head equations' linear solver changes the path, not the answer (the same law, tolerances).
        var model = GeneratedGrid(7, 5) with { DemandModel = new PressureDrivenDemand(2, 25, 0.5) };
        double[] multipliers = [1, 20, 60];
        var direct = NetworkSolver.SolveLoadCases(model, multipliers);
        var iterative = NetworkSolver.SolveLoadCases(model, multipliers, NetworkOptions.Default with { LinearSolver = NetworkLinearSolver.ConjugateGradient });
        for (int c = 0; c < multipliers.Length; c++)
        {
            AssertBalanced(model, iterative[c]);
            Assert.True(direct[c].DemandShortfall > 0 || c == 0);
            for (int j = 0; j < direct[c].Junctions.Count; j++)
            {
                Assert.Equal(direct[c].Junctions[j].Head, iterative[c].Junctions[j].Head, 1e-8);
                Assert.Equal(direct[c].Junctions[j].DeliveredDemand, iterative[c].Junctions[j].DeliveredDemand, 1e-10);
            }
        }
    }
}
