using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>
/// Fire flow against independent references: a closed form for one reservoir, one pipe and one junction (Colebrook and
/// White 1939 solved exactly for the velocity at a given slope; the Hazen-Williams velocity form), MathNet's Brent on
/// the draw-off with each evaluation a full solve by the tests' own dense Newton (<see cref="DenseNetworkReference"/>)
/// on branched and looped networks under both demand models, and stated properties: the derivative from the
/// network's Jacobian against central differences of full solves, and pressure heads that fall as the draw-off grows.
/// </summary>
public sealed class FireFlowTests
{
    private const double Water = 1.004e-6; // m2/s, water at 20 degrees C (from memory)

    private static NetworkModel Model(Junction[] junctions, Reservoir[] reservoirs, NetworkPipe[] pipes) =>
        new(junctions, reservoirs, pipes, [], Water);

    /// <summary>A looped network (invented test data): a reservoir, five junctions on two loops (j3 on a hill), Darcy
    /// pipes and one Hazen-Williams pipe.</summary>
    private static NetworkModel Looped(PressureDrivenDemand? law = null) =>
        Model(
            [new("j1", 5, 0.03), new("j2", 30, 0.03), new("j3", 52, 0.01), new("j4", 20, 0.02), new("j5", 12, 0.005)],
            [new("r", 80)],
            [
                new("p1", "r", "j1", 1000, 0.3, 1e-4, MinorLossCoefficient: 2), new("p2", "j1", "j2", 800, 0.15, 1e-4),
                new("p3", "j2", "j4", 600, 0.15, 1e-4), new("p4", "j4", "j1", 700, 0.2, 1e-4), new("p5", "j2", "j3", 500, 0.1, 1e-4),
                new("p6", "j3", "j4", 500, 0.1, HazenWilliamsC: 110), new("p7", "j4", "j5", 400, 0.15, 1e-4),
            ]) with { DemandModel = law };

    /// <summary>A branched network (invented test data): a trunk from the reservoir and two branches.</summary>
    private static NetworkModel Branched(PressureDrivenDemand? law = null) =>
        Model(
            [new("a", 10, 0.01), new("b", 15, 0.008), new("c", 25, 0.006), new("d", 12, 0.004)],
            [new("r", 75)],
            [
                new("t", "r", "a", 1500, 0.3, 1e-4), new("ab", "a", "b", 600, 0.2, 1e-4),
                new("bc", "b", "c", 500, 0.15, 1e-4), new("ad", "a", "d", 800, 0.15, 5e-5),
            ]) with { DemandModel = law };

    /// <summary>Pressure heads of the dense reference with a draw-off at junction k.</summary>
    private static (double[] Pressure, double[] Flows) Reference(NetworkModel model, int k, double q)
    {
        var law = model.DemandModel;
        var (flows, heads, _, residual) = law is null
            ? DenseNetworkReference.Solve(model, DenseNetworkReference.DemandDrivenMinimum, DenseNetworkReference.DemandDrivenRequired, 1, 1, (k, q))
            : DenseNetworkReference.Solve(model, law.MinimumPressureHead, law.RequiredPressureHead, law.Exponent, 1, (k, q));
        Assert.True(residual < 1e-11, $"the reference converged to {residual}");
        return (heads.Select((h, j) => h - model.Junctions[j].Elevation).ToArray(), flows);
    }

    /// <summary>The reference fire flow: Brent on g(Q) = min over the constraints of p_c(Q) - limit_c, each g a dense
    /// solve; the limiting junction is the constraint that is smallest at the root.</summary>
    private static (double Flow, int Limiting) ReferenceFireFlow(NetworkModel model, int k, double residual, double? minimum)
    {
        (double G, int C) Margin(double q)
        {
            var (p, _) = Reference(model, k, q);
            double g = p[k] - residual;
            int c = k;
            if (minimum is double m)
                for (int j = 0; j < p.Length; j++)
                    if (j != k && p[j] - m < g) { g = p[j] - m; c = j; }
            return (g, c);
        }
        double hi = 0.01;
        while (Margin(hi).G > 0) hi *= 2;
        double q = Brent.FindRoot(x => Margin(x).G, 0, hi, 1e-13, 200);
        return (q, Margin(q).C);
    }

    private static void AssertTurbulent(NetworkModel model, double[] flows)
    {
        for (int l = 0; l < flows.Length; l++)
        {
            var p = model.Pipes[l];
            if (p.HazenWilliamsC is null)
                Assert.True(Math.Abs(flows[l]) / (Math.PI * p.Diameter * p.Diameter / 4) * p.Diameter / Water > 4200,
                    $"pipe {p.Id} clear of the transition zone, where the reference joins the relations differently");
        }
    }

    [Theory]
    [InlineData(0.1e-3, 0.2, 0.01)]
    [InlineData(0.0, 0.15, 0.0)]
    [InlineData(1e-3, 0.3, 0.05)]
    public void Solve_OneReservoirOnePipeOneJunction_MatchesTheClosedFormOfColebrookWhite(double roughness, double diameter, double demand)
    {
        // Colebrook and White (1939): 1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f))). With the slope S = hf/L known,
        // f = 2 g D S / V^2 and Re sqrt(f) = D sqrt(2 g D S)/nu, so V = -2 sqrt(2 g D S) log10(e/(3.7 D) + 2.51 nu/(D sqrt(2 g D S)))
        // exactly (no iteration). At the fire flow the junction stands at the residual head: hf = H - z - 14.
        const double head = 60, z = 5, length = 1000, residual = 14;
        var model = Model([new("j", z, demand)], [new("r", head)], [new("p", "r", "j", length, diameter, roughness)]);
        double g = Physical.StandardGravity, s = (head - z - residual) / length, root = Math.Sqrt(2 * g * diameter * s);
        double v = -2 * root * Math.Log10(roughness / (3.7 * diameter) + 2.51 * Water / (diameter * root));
        double expected = Math.PI * diameter * diameter / 4 * v - demand;

        var report = FireFlow.Solve(model, ["j"], cancellation: TestContext.Current.CancellationToken);
        var r = Assert.Single(report.Junctions);
        Assert.True(r.Converged, r.Status.Reason());
        Assert.Equal(expected, r.AvailableFlow, 1e-7 * expected);
        Assert.Equal(residual, r.PressureHead, 1e-6);
        Assert.Equal("j", r.LimitingJunction);
        Assert.InRange(r.Iterations, 1, 8);
    }

    [Fact]
    public void Solve_OneHazenWilliamsPipe_MatchesTheVelocityForm()
    {
        // V = 0.849 C R^0.63 S^0.54 (SI form of Hazen-Williams, common practice), R = D/4, explicit in the slope.
        const double head = 70, z = 10, length = 800, diameter = 0.25, c = 120, demand = 0.02, residual = 20;
        var model = Model([new("j", z, demand)], [new("r", head)], [new("p", "r", "j", length, diameter, HazenWilliamsC: c)]);
        double s = (head - z - residual) / length;
        double v = 0.849 * c * Math.Pow(diameter / 4, 0.63) * Math.Pow(s, 0.54);
        double expected = Math.PI * diameter * diameter / 4 * v - demand;

        var r = Assert.Single(FireFlow.Solve(model, ["j"], new FireFlowOptions(residual), cancellation: TestContext.Current.CancellationToken).Junctions);
        Assert.True(r.Converged);
        Assert.Equal(expected, r.AvailableFlow, 1e-7 * expected);
    }

    public static TheoryData<string, string, bool, double?> ReferenceCases => new()
    {
        // network, fire-flow junction, pressure-driven (law 0 to 20 m, e = 0.5), minimum pressure head of the others.
        { "looped", "j4", false, null },
        { "looped", "j2", false, null },
        { "looped", "j5", false, 10.0 },
        { "looped", "j4", true, null },
        { "looped", "j5", true, 10.0 },
        { "branched", "b", false, null },
        { "branched", "d", false, 30.0 },
        { "branched", "c", true, null },
        { "branched", "d", true, 20.0 },
    };

    [Theory]
    [MemberData(nameof(ReferenceCases))]
    public void Solve_MatchesBrentOnTheDrawOffWithDenseNewtonSolves(string network, string junction, bool pressureDriven, double? minimum)
    {
        var law = pressureDriven ? new PressureDrivenDemand(0, 20, 0.5) : null;
        var model = network == "looped" ? Looped(law) : Branched(law);
        int k = model.Junctions.Select((j, i) => (j, i)).Single(x => x.j.Id == junction).i;
        var (expected, limiting) = ReferenceFireFlow(model, k, 14, minimum);
        var (pressure, flows) = Reference(model, k, expected);
        AssertTurbulent(model, flows);

        var report = FireFlow.Solve(model, [junction], new FireFlowOptions(14, minimum), cancellation: TestContext.Current.CancellationToken);
        Assert.True(report.Background.Converged);
        var r = Assert.Single(report.Junctions);
        Assert.True(r.Converged, r.Status.Reason());
        // The search stops when the limiting pressure head is within 1e-6 m of its limit; a junction far from the draw-off
        // moves little with it, so the flow is compared at 1e-5 relative and, exactly, the reference's pressure head at
        // the flow found.
        Assert.Equal(expected, r.AvailableFlow, 1e-5 * expected);
        Assert.Equal(model.Junctions[limiting].Id, r.LimitingJunction);
        double limit = limiting == k ? 14 : minimum!.Value;
        var (atAnswer, _) = Reference(model, k, r.AvailableFlow);
        Assert.Equal(limit, atAnswer[limiting], 2e-6);
        Assert.Equal(atAnswer[k], r.PressureHead, 1e-8);
        Assert.Equal(limit, r.LimitingPressureHead, 2e-6);
        Assert.Equal(pressure[k], r.PressureHead, 1e-3);
        Assert.InRange(r.Iterations, 1, 12);
    }

    [Fact]
    public void Solve_WithAMinimumAboveAHillJunction_TheHillJunctionLimits()
    {
        // j3 stands 32 m above j4 (about 12 m of pressure with no draw-off): with 10 m required everywhere else it falls
        // to its limit while j4 still has more than 14 m, so j3 sets the flow, below the flow the residual alone allows.
        var model = Looped();
        var alone = Assert.Single(FireFlow.Solve(model, ["j4"], cancellation: TestContext.Current.CancellationToken).Junctions);
        var bound = Assert.Single(FireFlow.Solve(model, ["j4"], new FireFlowOptions(14, 10), cancellation: TestContext.Current.CancellationToken).Junctions);
        Assert.Equal("j4", alone.LimitingJunction);
        Assert.Equal("j3", bound.LimitingJunction);
        Assert.True(bound.AvailableFlow < alone.AvailableFlow);
        Assert.True(bound.PressureHead > 14);
        Assert.Equal(10, bound.LimitingPressureHead, 1e-6);
    }

    [Theory]
    [InlineData("j4")]
    [InlineData("j2")]
    public void Solve_PressureDrivenWhereTheBackgroundDeliversEverything_GivesAtLeastTheDemandDrivenFlow(string junction)
    {
        // With the law from 0 to 5 m every background demand is delivered (j3, the lowest, has about 12 m); as the fire
        // draws the pressures down the deliveries shrink, which leaves more water for the fire: a stated property.
        var law = new PressureDrivenDemand(0, 5, 0.5);
        var ct = TestContext.Current.CancellationToken;
        var pdd = FireFlow.Solve(Looped(law), [junction], cancellation: ct);
        Assert.Equal(0, pdd.Background.DemandShortfall, 1e-12);
        var demandDriven = Assert.Single(FireFlow.Solve(Looped(), [junction], cancellation: ct).Junctions);
        var pressureDriven = Assert.Single(pdd.Junctions);
        Assert.True(pressureDriven.Converged && demandDriven.Converged);
        Assert.True(pressureDriven.AvailableFlow >= demandDriven.AvailableFlow * (1 - 1e-9),
            $"{pressureDriven.AvailableFlow} against {demandDriven.AvailableFlow}");
    }

    [Fact]
    public void Solve_JunctionBelowTheResidualWithNoDrawOff_IsAStatusNotAnException()
    {
        // The reservoir at 60 m and j3 at 52 m: less than 8 m of pressure with no draw-off, below 14 m.
        var model = Looped() with { Reservoirs = [new("r", 60)] };
        var report = FireFlow.Solve(model, ["j3", "j1"], new FireFlowOptions(14), cancellation: TestContext.Current.CancellationToken);
        var hill = report.Junctions[0];
        Assert.Equal(FireFlowStatus.ResidualNotMetAtZeroDrawOff, hill.Status);
        Assert.False(hill.Converged);
        Assert.Equal(0, hill.AvailableFlow);
        Assert.Equal(report.Background.Junction("j3").PressureHead, hill.PressureHead, 1e-12);
        Assert.True(report.Junctions[1].Converged);

        var others = FireFlow.Solve(model, ["j1"], new FireFlowOptions(14, 10), cancellation: TestContext.Current.CancellationToken).Junctions[0];
        Assert.Equal(FireFlowStatus.MinimumNotMetAtZeroDrawOff, others.Status);
        Assert.Equal("j3", others.LimitingJunction);
    }

    [Fact]
    public void Solve_DefaultJunctions_AreThoseWithAPositiveDemand()
    {
        var model = Branched() with { Junctions = [new("a", 10, 0.01), new("b", 15, 0), new("c", 25, 0.006), new("d", 12, -0.001)] };
        Assert.Equal(["a", "c"], FireFlow.DefaultJunctions(model));
        Assert.Equal(["a", "c"], FireFlow.Solve(model, cancellation: TestContext.Current.CancellationToken).Junctions.Select(r => r.Id));
        Assert.Throws<ArgumentException>(() => FireFlow.Solve(model, ["nowhere"], cancellation: TestContext.Current.CancellationToken));
        Assert.Throws<ArgumentException>(() => FireFlow.Solve(model, ["a", "a"], cancellation: TestContext.Current.CancellationToken));
        Assert.Throws<ArgumentOutOfRangeException>(() => FireFlow.Solve(model, ["a"], new FireFlowOptions(double.NaN), cancellation: TestContext.Current.CancellationToken));
    }

    [Fact]
    public void Solve_Cancelled_StopsWithOperationCanceled()
    {
        // The service's time budget: a cancelled token stops the analysis before its next network solve.
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        Assert.ThrowsAny<OperationCanceledException>(() => FireFlow.Solve(Looped(), ["j4"], cancellation: cancelled.Token));
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void DrawOffSensitivity_MatchesCentralDifferencesOfFullSolves(bool pressureDriven)
    {
        // dH/dQ from one solve with the factor the network solve holds, against (p(Q + h) - p(Q - h)) / 2h of two full
        // solves; every junction's derivative is negative (the heads fall as the draw-off grows).
        var model = Looped(pressureDriven ? new PressureDrivenDemand(0, 20, 0.5) : null);
        var solver = new NetworkSolver(model);
        Assert.True(solver.SolveCase(1).Converged);
        const int k = 3;
        const double q = 0.05, h = 1e-5;
        Assert.True(solver.SolveDrawOff(1, k, q).Converged);
        var slope = new double[solver.JunctionCount];
        Assert.True(solver.DrawOffSensitivity(k, slope));
        var up = new double[slope.Length];
        var down = new double[slope.Length];
        Assert.True(solver.SolveDrawOff(1, k, q + h).Converged);
        for (int j = 0; j < up.Length; j++) up[j] = solver.PressureHead(j);
        Assert.True(solver.SolveDrawOff(1, k, q - h).Converged);
        for (int j = 0; j < down.Length; j++) down[j] = solver.PressureHead(j);
        for (int j = 0; j < slope.Length; j++)
        {
            double central = (up[j] - down[j]) / (2 * h);
            Assert.True(slope[j] < 0, $"junction {j}");
            // The factor is the last Newton step's, one step before the converged state: exact to rounding demand-driven;
            // under pressure-driven demand the law's tangent there differs from the converged point's by about 1e-4.
            Assert.Equal(central, slope[j], (pressureDriven ? 1e-3 : 1e-5) * Math.Abs(central));
        }
    }

    [Fact]
    public void PressureHeads_FallAsTheDrawOffGrows()
    {
        // The property the search rests on: every junction's pressure head decreases with the draw-off (dense reference).
        var model = Looped(new PressureDrivenDemand(0, 20, 0.5));
        double[]? before = null;
        for (double q = 0; q <= 0.2; q += 0.04)
        {
            var (p, _) = Reference(model, 3, q);
            if (before is not null)
                for (int j = 0; j < p.Length; j++) Assert.True(p[j] < before[j], $"junction {j} at {q}");
            before = p;
        }
    }
    /// <summary>The reference fire flow by plain bisection on full network solves: the draw-off added to the junction's
    /// demand, each trial a cold <see cref="NetworkSolver.Solve"/> of the whole network (no fire-flow code), halved
    /// until the bracket's ends are neighbouring doubles; the largest flow at which every limit still holds.</summary>
    private static double BisectedFireFlow(NetworkModel model, string junction, double residual, double? minimum)
    {
        bool Holds(double q)
        {
            var loaded = model with { Junctions = model.Junctions.Select(j => j.Id == junction ? j with { Demand = j.Demand + q } : j).ToArray() };
            var result = NetworkSolver.Solve(loaded);
            Assert.True(result.Converged, result.Status.Reason());
            foreach (var j in result.Junctions)
                if (j.Id == junction ? j.PressureHead < residual : minimum is double m && j.PressureHead < m) return false;
            return true;
        }
        double lo = 0, hi = 0.01;
        while (Holds(hi)) { lo = hi; hi *= 2; }
        for (int i = 0; i < 200; i++)
        {
            double mid = 0.5 * (lo + hi);
            if (mid <= lo || mid >= hi) break;
            if (Holds(mid)) lo = mid; else hi = mid;
        }
        return lo;
    }

    [Theory]
    [InlineData("j4", null)]
    [InlineData("j2", null)]
    [InlineData("j5", null)]
    [InlineData("j4", 10.0)]
    [InlineData("j5", 10.0)]
    [InlineData("j1", 10.0)]
    public void Solve_BorderedSolve_MatchesBisectionOnFullNetworkSolves(string junction, double? minimum)
    {
        // A demand-driven network with the direct head solver takes the bordered solve (the draw-off and the network in
        // one Newton iteration, the limiting junction's pressure head held): one held solve when the junction's own
        // residual limits, one more for each other junction found below its minimum.
        var model = Looped();
        double expected = BisectedFireFlow(model, junction, 14, minimum);
        var r = Assert.Single(FireFlow.Solve(model, [junction], new FireFlowOptions(14, minimum) { MaxParallelism = 1 },
            cancellation: TestContext.Current.CancellationToken).Junctions);
        Assert.True(r.Converged, r.Status.Reason());
        Assert.Equal(expected, r.AvailableFlow, 1e-6 * expected);
        Assert.InRange(r.Iterations, 1, minimum is null ? 1 : 4);
        double limit = r.LimitingJunction == junction ? 14 : minimum!.Value;
        Assert.Equal(limit, r.LimitingPressureHead, 1e-6);
        // The scalar search (each trial a network solve) agrees with the same reference.
        var scalar = Assert.Single(FireFlow.Solve(model, [junction], new FireFlowOptions(14, minimum) { MaxParallelism = 1, ScalarSearchOnly = true },
            cancellation: TestContext.Current.CancellationToken).Junctions);
        Assert.True(scalar.Converged, scalar.Status.Reason());
        Assert.Equal(expected, scalar.AvailableFlow, 1e-6 * expected);
        Assert.Equal(scalar.LimitingJunction, r.LimitingJunction);
    }

    /// <summary>A square grid of 6 x 6 junctions (invented test data), Darcy pipes of three sizes, fed from two
    /// reservoirs at opposite corners, the lower one through a check valve.</summary>
    private static NetworkModel Grid()
    {
        const int n = 6;
        var junctions = new List<Junction>();
        var pipes = new List<NetworkPipe>();
        double[] sizes = [0.1, 0.15, 0.2];
        for (int r = 0; r < n; r++)
            for (int c = 0; c < n; c++)
            {
                junctions.Add(new($"g{r}_{c}", 2 * ((r * 7 + c * 3) % 5), 0.002 + 0.001 * ((r + c) % 3)));
                if (c + 1 < n) pipes.Add(new($"h{r}_{c}", $"g{r}_{c}", $"g{r}_{c + 1}", 150 + 10 * r, sizes[(r + c) % 3], 1e-4));
                if (r + 1 < n) pipes.Add(new($"v{r}_{c}", $"g{r}_{c}", $"g{r + 1}_{c}", 120 + 10 * c, sizes[(r * c) % 3], 1e-4));
            }
        pipes.Add(new("feed-a", "ra", "g0_0", 50, 0.3, 1e-4));
        pipes.Add(new("feed-b", "rb", "g5_5", 50, 0.3, 1e-4, CheckValve: true));
        return new NetworkModel(junctions, [new("ra", 70), new("rb", 66)], pipes, [], Water);
    }

    [Theory]
    [InlineData(null, false)]
    [InlineData(25.0, false)]
    [InlineData(null, true)]
    [InlineData(25.0, true)]
    public void Solve_InParallel_GivesTheAnswersOfOneSearchAfterAnother(double? minimum, bool pressureDriven)
    {
        // Each worker has its own solver started from the same background state: every figure equals the sequential
        // run's bit for bit, in the order asked; under pressure-driven demand every junction takes the scalar search.
        var model = Grid() with { DemandModel = pressureDriven ? new PressureDrivenDemand(0, 20, 0.5) : null };
        string[] asked = model.Junctions.Select(j => j.Id).Reverse().ToArray();
        var ct = TestContext.Current.CancellationToken;
        var one = FireFlow.Solve(model, asked, new FireFlowOptions(14, minimum) { MaxParallelism = 1 }, cancellation: ct).Junctions;
        var many = FireFlow.Solve(model, asked, new FireFlowOptions(14, minimum) { MaxParallelism = 3 }, cancellation: ct).Junctions;
        Assert.Equal(asked, many.Select(r => r.Id));
        Assert.Equal(one, many);
        Assert.All(one, r => Assert.True(r.Converged, r.Status.Reason()));
    }

    [Fact]
    public void Solve_OnAGridWithACheckValve_MatchesBisectionOnFullNetworkSolves()
    {
        // The bordered solve updates the check valve's status between passes as a network solve does.
        var model = Grid();
        AssertBorderedMatchesBisection(model, ("g5_4", null), ("g2_3", 25.0));
    }

    [Fact]
    public void Solve_WithAPumpedSupply_MatchesBisectionOnFullNetworkSolves()
    {
        // The looped network fed from a low reservoir through a pump (curve 45 m - 800 Q^2, invented test data): the
        // pump's duty moves along its curve as the fire draws; the bordered solve holds the pump open between passes
        // as a network solve does.
        var looped = Looped();
        var model = looped with
        {
            Reservoirs = [new("r", 40)],
            Pipes = [new("suction", "r", "s", 20, 0.3, 1e-4), .. looped.Pipes.Select(p => p.Id == "p1" ? p with { From = "d" } : p)],
            Junctions = [new("s", 0, 0), new("d", 0, 0), .. looped.Junctions],
            Pumps = [new NetworkPump("pump", "s", "d", FlowSolve.Core.Pumps.PumpCurve.FromCoefficients(45, 0, -800))],
        };
        AssertBorderedMatchesBisection(model, ("j4", null), ("j5", 10.0));
    }

    /// <summary>Each junction's fire flow (residual 14 m, with or without a minimum elsewhere) equals bisection on full
    /// network solves to 1e-6 relative, found by the bordered solve (one held solve, or a few with a minimum), not the
    /// scalar search.</summary>
    private static void AssertBorderedMatchesBisection(NetworkModel model, params (string Junction, double? Minimum)[] cases)
    {
        foreach (var (junction, minimum) in cases)
        {
            double expected = BisectedFireFlow(model, junction, 14, minimum);
            var r = Assert.Single(FireFlow.Solve(model, [junction], new FireFlowOptions(14, minimum) { MaxParallelism = 1 },
                cancellation: TestContext.Current.CancellationToken).Junctions);
            Assert.True(r.Converged, r.Status.Reason());
            Assert.Equal(expected, r.AvailableFlow, 1e-6 * expected);
            Assert.InRange(r.Iterations, 1, minimum is null ? 1 : 4); // the bordered solve, not the scalar search
        }
    }

    [Fact]
    public void Solve_FlowBeyondTheSearchLimit_IsReportedAtTheLimitByTheScalarSearch()
    {
        // 1 000 m of head over 10 m of 100 mm pipe: the junction keeps its residual at far more than 30 m/s, so the bordered
        // solve's draw-off lies beyond the search limit and the scalar search reports the limit itself, the flow that runs
        // the one pipe at 30 m/s (a stated property of the search), with every limit still met there.
        var model = Model([new("j", 0, 0.01)], [new("r", 1000)], [new("p", "r", "j", 10, 0.1, 1e-4)]);
        var r = Assert.Single(FireFlow.Solve(model, ["j"], cancellation: TestContext.Current.CancellationToken).Junctions);
        double cap = FireFlowOptions.SearchVelocity * Math.PI * 0.1 * 0.1 / 4;
        Assert.Equal(FireFlowStatus.AboveSearchLimit, r.Status);
        Assert.False(r.Converged);
        Assert.Equal(cap, r.AvailableFlow, 1e-6 * cap);
        Assert.True(r.PressureHead > 14);
    }
}
