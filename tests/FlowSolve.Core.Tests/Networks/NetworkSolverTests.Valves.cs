using FlowSolve.Core.Networks;
using static FlowSolve.Core.Tests.Networks.NetworkChecks;

namespace FlowSolve.Core.Tests.Networks;

// Control valves (issue 17, part 2): every type in every state against the dense reference with the states fixed, the
// states checked for consistency, and the hand-checkable facts (an active pressure valve's pressure head, an active
// flow-control valve's flow).
public sealed partial class NetworkSolverTests
{
    private const double ValveK = 5; // a fully open globe-type valve is of order 5 to 10 (common practice, from memory)

    /// <summary>source (fixed head) - main - up - valve - down - service - town (demand) - outlet - tank (fixed head).</summary>
    private static NetworkModel Chain(ControlValveType type, double setting, double tankHead, double sourceHead = 100,
        double demand = 0.01, PressureDrivenDemand? law = null) =>
        new([new("up", 5, 0), new("down", 2, 0), new("town", 0, demand)], [new("source", sourceHead), new("tank", tankHead)],
            [new NetworkPipe("main", "source", "up", 500, 0.3, 0.05e-3),
             new NetworkPipe("service", "down", "town", 300, 0.2, 0.05e-3),
             new NetworkPipe("outlet", "town", "tank", 200, 0.2, 0.05e-3)], [], Water)
        {
            Valves = [new ControlValve("v", "up", "down", 0.2, type, setting, ValveK)],
            DemandModel = law,
        };

    public static TheoryData<ControlValveType, double, double, ValveState> EveryTypeInEveryState => new()
    {
        // Pressure-reducing at "down" (z = 2 m): held at 40 m toward a low tank; set above what reaches it (open); a
        // tank beyond it at 60 m already exceeds the setting (closed).
        { ControlValveType.PressureReducing, 40, 20, ValveState.Active },
        { ControlValveType.PressureReducing, 95, 20, ValveState.Open },
        { ControlValveType.PressureReducing, 40, 60, ValveState.Closed },
        // Pressure-sustaining at "up" (z = 5 m): held at 90 m (active: the open valve's flow to the tank would pull it lower); 30 m is
        // reached anyway (open); a tank above the source would drive water back (closed).
        { ControlValveType.PressureSustaining, 90, 20, ValveState.Active },
        { ControlValveType.PressureSustaining, 30, 20, ValveState.Open },
        { ControlValveType.PressureSustaining, 30, 120, ValveState.Closed },
        // Flow-control: 0.02 m3/s is less than the open flow (active); 5 m3/s is not reached (open); reverse head (closed).
        { ControlValveType.FlowControl, 0.02, 20, ValveState.Active },
        { ControlValveType.FlowControl, 5, 20, ValveState.Open },
        { ControlValveType.FlowControl, 0.02, 120, ValveState.Closed },
        // A throttle of K 50, either way: forward and reverse.
        { ControlValveType.Throttle, 50, 20, ValveState.Active },
        { ControlValveType.Throttle, 50, 120, ValveState.Active },
    };

    [Theory]
    [MemberData(nameof(EveryTypeInEveryState))]
    public void Solve_ValveOfEveryTypeInEveryState_MatchesDenseReference(ControlValveType type, double setting, double tank, ValveState expected)
    {
        var model = Chain(type, setting, tank);
        var result = NetworkSolver.Solve(model);
        Assert.True(result.Converged, result.Status.Reason());
        var valve = result.Valve("v");
        Assert.Equal(expected, valve.State);
        DenseValveReference.AssertStatesConsistent(model, result);
        AssertMatchesDense(model, result);
        AssertBalancedWithValves(model, result);
        Assert.InRange(result.StatusPasses, 1, 4);
        Assert.InRange(result.Iterations, 1, 40);

        // Hand checks: the held pressure head is the setting (pressure head = head - elevation), the held flow is the
        // setting, a closed valve carries nothing, and headLoss is the head across.
        if (expected == ValveState.Active && type == ControlValveType.PressureReducing) Assert.Equal(2 + setting, result.Junction("down").Head, 10);
        if (expected == ValveState.Active && type == ControlValveType.PressureSustaining) Assert.Equal(5 + setting, result.Junction("up").Head, 10);
        if (expected == ValveState.Active && type == ControlValveType.FlowControl) Assert.Equal(setting, valve.Flow, 14);
        if (expected == ValveState.Closed) Assert.Equal(0.0, valve.Flow);
        Assert.Equal(result.Junction("up").Head - result.Junction("down").Head, valve.HeadLoss, 12);
    }

    [Fact]
    public void Solve_ActivePressureReducingValve_TownHeadFollowsFromHeldHeadAlone()
    {
        // With the valve active, "down" is held at 2 + 40 = 42 m, so the flow on to the tank at 20 m is the flow of the
        // two pipes in series under 22 m less the town's draw: independent of the source. Reference: MathNet's Brent on
        // the two-pipe series (Colebrook-White) written out in NetworkEdgeCaseTests.
        var low = NetworkSolver.Solve(Chain(ControlValveType.PressureReducing, 40, 20, sourceHead: 80));
        var high = NetworkSolver.Solve(Chain(ControlValveType.PressureReducing, 40, 20, sourceHead: 200));
        Assert.Equal(ValveState.Active, low.Valve("v").State);
        Assert.Equal(ValveState.Active, high.Valve("v").State);
        Assert.Equal(low.Valve("v").Flow, high.Valve("v").Flow, 12);
        Assert.Equal(low.Junction("town").Head, high.Junction("town").Head, 9);
        Assert.True(high.Valve("v").HeadLoss > low.Valve("v").HeadLoss + 100);
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Solve_LoopedNetworkWithEveryValveType_MatchesDenseReference(bool pressureDriven)
    {
        // A 3 x 3 grid fed from two reservoirs, one valve of each type on edges that share no node.
        var model = Grid(pressureDriven ? new PressureDrivenDemand(0, 25) : null,
            new ControlValve("prv", "n01", "n02", 0.15, ControlValveType.PressureReducing, 30, 3),
            new ControlValve("psv", "n10", "n20", 0.15, ControlValveType.PressureSustaining, 45, 3),
            new ControlValve("fcv", "n11", "n12", 0.15, ControlValveType.FlowControl, 0.01, 3),
            new ControlValve("tcv", "n21", "n22", 0.15, ControlValveType.Throttle, 20));
        var result = NetworkSolver.Solve(model);
        Assert.True(result.Converged, result.Status.Reason());
        DenseValveReference.AssertStatesConsistent(model, result);
        AssertMatchesDense(model, result);
        AssertBalancedWithValves(model, result);
    }

    [Fact]
    public void SolveCases_ValvesChangeStateWithTheLoad_EachCaseMatchesDenseReference()
    {
        // Warm-started load cases: the states carried from one case must be re-examined in the next.
        var model = Grid(null,
            new ControlValve("prv", "n01", "n02", 0.15, ControlValveType.PressureReducing, 50, 3),
            new ControlValve("fcv", "n11", "n12", 0.15, ControlValveType.FlowControl, 0.02, 3));
        var results = NetworkSolver.SolveLoadCases(model, [0.2, 1, 3, 0.2]);
        var states = new HashSet<string>();
        for (int i = 0; i < results.Count; i++)
        {
            Assert.True(results[i].Converged, results[i].Status.Reason());
            DenseValveReference.AssertStatesConsistent(model, results[i]);
            AssertMatchesDense(model, results[i], results[i].DemandMultiplier);
            states.Add(string.Join(",", results[i].Valves.Select(v => v.State)));
        }
        Assert.True(states.Count >= 2, "the load cases should put the valves in more than one set of states");
    }

    [Fact]
    public void Solve_RandomValveGrids_ConvergedAnswersMatchDenseReferenceAndNeverClaimConvergenceOtherwise()
    {
        var random = new Random(17);
        int converged = 0, total = 60;
        double worstFlow = 0, worstHead = 0;
        var types = Enum.GetValues<ControlValveType>();
        (string, string)[] edges = [("n00", "n01"), ("n01", "n02"), ("n10", "n11"), ("n11", "n12"), ("n20", "n21"), ("n21", "n22"),
            ("n00", "n10"), ("n10", "n20"), ("n01", "n11"), ("n11", "n21"), ("n02", "n12"), ("n12", "n22")];
        for (int trial = 0; trial < total; trial++)
        {
            var used = new HashSet<string>();
            var valves = new List<ControlValve>();
            foreach (var (a, b) in edges.OrderBy(_ => random.Next()))
            {
                if (valves.Count == 3 || used.Contains(a) || used.Contains(b)) continue;
                used.Add(a);
                used.Add(b);
                var type = types[random.Next(types.Length)];
                double setting = type switch
                {
                    ControlValveType.FlowControl => 0.002 + 0.03 * random.NextDouble(),
                    ControlValveType.Throttle => 1 + 100 * random.NextDouble(),
                    _ => 10 + 50 * random.NextDouble(),
                };
                var (from, to) = random.Next(2) == 0 ? (a, b) : (b, a);
                valves.Add(new ControlValve($"v{valves.Count}", from, to, 0.15, type, setting, 3));
            }
            var model = Grid(null, [.. valves]);
            var result = NetworkSolver.Solve(model);
            if (!result.Converged)
            {
                Assert.NotEqual(NetworkStatus.Solved, result.Status);
                continue;
            }
            converged++;
            DenseValveReference.AssertStatesConsistent(model, result);
            var (flow, head) = AssertMatchesDense(model, result);
            worstFlow = Math.Max(worstFlow, flow);
            worstHead = Math.Max(worstHead, head);
        }
        TestContext.Current.TestOutputHelper?.WriteLine($"{converged} of {total} converged; largest difference from the dense reference: {worstFlow:E2} m3/s, {worstHead:E2} m");
        Assert.True(converged >= total * 9 / 10, $"{converged} of {total} converged");
    }

    [Fact]
    public void Solve_ValveStatesThatCycle_EndAsNotConvergedNamingTheValves()
    {
        // Found by a search over random valve grids (seed 26 of the generator in the test above with four valves): the
        // status search comes back to a set of states it has solved before. It must stop there, before the pass cap,
        // report the cycle as not converged and name the valves that changed within it.
        var model = Grid(null,
            new ControlValve("v0", "n11", "n12", 0.15, ControlValveType.PressureSustaining, 69.76893275034098, 3),
            new ControlValve("v1", "n21", "n22", 0.15, ControlValveType.PressureReducing, 57.50235865241958, 3),
            new ControlValve("v2", "n00", "n01", 0.15, ControlValveType.PressureSustaining, 32.91512413086143, 3),
            new ControlValve("v3", "n10", "n20", 0.15, ControlValveType.PressureReducing, 33.16194667628126, 3));
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.StatusCycle, result.Status);
        Assert.False(result.Converged);
        Assert.Equal("status-cycle", result.Status.Code());
        Assert.True(result.StatusPasses < NetworkOptions.Default.MaxStatusPasses, $"{result.StatusPasses} passes: the cycle should end the search before the cap");
        var named = result.Warnings.Where(w => w.Code == NetworkWarningCode.ValveStateCycle).Select(w => w.ElementId).ToArray();
        Assert.NotEmpty(named);
        Assert.All(named, id => Assert.Contains(id, model.Valves.Select(v => v.Id)));
        Assert.Contains("valve-state-cycle", result.Warnings.Select(w => w.Describe().Code));
    }

    [Fact]
    public void Solve_ValvesWithConjugateGradientHeadSolve_MatchesDirectSolve()
    {
        // The rank-one corrections of the active pressure valves use whichever head solver runs: both must agree.
        var model = Grid(null,
            new ControlValve("prv", "n01", "n02", 0.15, ControlValveType.PressureReducing, 30, 3),
            new ControlValve("psv", "n10", "n20", 0.15, ControlValveType.PressureSustaining, 45, 3),
            new ControlValve("fcv", "n11", "n12", 0.15, ControlValveType.FlowControl, 0.01, 3));
        var direct = NetworkSolver.Solve(model);
        var iterative = NetworkSolver.Solve(model, NetworkOptions.Default with { LinearSolver = NetworkLinearSolver.ConjugateGradient });
        Assert.True(iterative.Converged, iterative.Status.Reason());
        Assert.Equal(direct.Valves.Select(v => v.State), iterative.Valves.Select(v => v.State));
        for (int i = 0; i < direct.Valves.Count; i++) Assert.Equal(direct.Valves[i].Flow, iterative.Valves[i].Flow, 10);
        for (int j = 0; j < direct.Junctions.Count; j++) Assert.Equal(direct.Junctions[j].Head, iterative.Junctions[j].Head, 8);
    }

    public static TheoryData<string, string> BadValveModels => new()
    {
        { "self-loop", "n00>n00 throttle 5" },
        { "unknown-node", "n00>nowhere throttle 5" },
        { "shared-valve-node", "n00>n01 throttle 5|n01>n02 throttle 5" },
        { "bad-valve-setting", "n00>n01 flow 0" },
        { "bad-valve-setting", "n00>n01 reducing -1" },
        { "bad-minor-loss", "n00>n01 sustaining 10 k0" },
        { "controlled-node-not-junction", "n00>a reducing 10" },
        { "controlled-node-not-junction", "b>n22 sustaining 10" },
        { "duplicate-id", "n00>n01 throttle 5 id:feed-a" },
    };

    [Theory]
    [MemberData(nameof(BadValveModels))]
    public void Validate_BadValve_NamesTheIssue(string code, string valves)
    {
        var list = valves.Split('|').Select((text, i) =>
        {
            var parts = text.Split(' ');
            var ends = parts[0].Split('>');
            var type = parts[1] switch { "flow" => ControlValveType.FlowControl, "reducing" => ControlValveType.PressureReducing, "sustaining" => ControlValveType.PressureSustaining, _ => ControlValveType.Throttle };
            string id = parts.FirstOrDefault(p => p.StartsWith("id:"))?[3..] ?? $"v{i}";
            double k = parts.Contains("k0") ? 0 : 3;
            return new ControlValve(id, ends[0], ends[1], 0.15, type, double.Parse(parts[2], System.Globalization.CultureInfo.InvariantCulture), k);
        }).ToArray();
        var model = Grid(null) with { Valves = list };
        Assert.Contains(model.Validate(), issue => issue.Code == code);
        Assert.Throws<NetworkValidationException>(() => new NetworkSolver(model));
    }

    /// <summary>A 3 x 3 grid of 200 mm pipes, 400 m each, junctions n{row}{col} at elevations 0 to 8 m with 5 to 13 l/s,
    /// fed from a reservoir at 70 m at n00 and one at 55 m at n22; a valve replaces the pipe of its edge.</summary>
    private static NetworkModel Grid(PressureDrivenDemand? law, params ControlValve[] valves)
    {
        var junctions = new List<Junction>();
        var pipes = new List<NetworkPipe>();
        for (int r = 0; r < 3; r++)
            for (int c = 0; c < 3; c++)
                junctions.Add(new($"n{r}{c}", 2 * r + 2 * c, 0.005 + 0.001 * (r * 3 + c)));
        bool IsValve(string a, string b) => valves.Any(v => (v.From == a && v.To == b) || (v.From == b && v.To == a));
        void Pipe(string a, string b) { if (!IsValve(a, b)) pipes.Add(new NetworkPipe($"{a}-{b}", a, b, 400, 0.2, 0.1e-3)); }
        for (int r = 0; r < 3; r++)
            for (int c = 0; c < 3; c++)
            {
                if (c < 2) Pipe($"n{r}{c}", $"n{r}{c + 1}");
                if (r < 2) Pipe($"n{r}{c}", $"n{r + 1}{c}");
            }
        pipes.Add(new NetworkPipe("feed-a", "a", "n00", 100, 0.3, 0.1e-3));
        pipes.Add(new NetworkPipe("feed-b", "b", "n22", 100, 0.3, 0.1e-3));
        return new NetworkModel(junctions, [new("a", 70), new("b", 55)], pipes, [], Water) { Valves = valves, DemandModel = law };
    }

    /// <summary>The dense reference with the solver's valve states: every flow and head within 1e-8.</summary>
    private static (double Flow, double Head) AssertMatchesDense(NetworkModel model, NetworkResult result, double multiplier = 1)
    {
        var states = model.Valves.Select(v => result.Valve(v.Id).State).ToArray();
        var (flows, heads, residual) = DenseValveReference.Solve(model, states, multiplier);
        Assert.True(residual < 1e-9, $"the dense reference did not converge: {residual}");
        double worstFlow = 0, worstHead = 0;
        foreach (var p in model.Pipes) worstFlow = Math.Max(worstFlow, Math.Abs(result.Pipe(p.Id).Flow - flows[p.Id]));
        foreach (var v in model.Valves) worstFlow = Math.Max(worstFlow, Math.Abs(result.Valve(v.Id).Flow - flows[v.Id]));
        foreach (var j in model.Junctions) worstHead = Math.Max(worstHead, Math.Abs(result.Junction(j.Id).Head - heads[j.Id]));
        TestContext.Current.TestOutputHelper?.WriteLine($"largest difference from the dense reference: {worstFlow:E2} m3/s, {worstHead:E2} m");
        Assert.True(worstFlow < 1e-11, $"flows differ by {worstFlow} m3/s");
        Assert.True(worstHead < 1e-9, $"heads differ by {worstHead} m");
        return (worstFlow, worstHead);
    }

    /// <summary>Continuity at every junction with the valves' flows included, and energy on every open pipe.</summary>
    private static void AssertBalancedWithValves(NetworkModel model, NetworkResult result)
    {
        var net = model.Junctions.ToDictionary(j => j.Id, j => -result.Junction(j.Id).DeliveredDemand);
        void Flow(string from, string to, double q)
        {
            if (net.ContainsKey(from)) net[from] -= q;
            if (net.ContainsKey(to)) net[to] += q;
        }
        foreach (var p in model.Pipes) Flow(p.From, p.To, result.Pipe(p.Id).Flow);
        foreach (var v in model.Valves) Flow(v.From, v.To, result.Valve(v.Id).Flow);
        foreach (var (id, error) in net) Assert.True(Math.Abs(error) <= 1e-9, $"continuity at {id}: {error}");
        foreach (var p in model.Pipes)
        {
            double across = Head(result, p.From) - Head(result, p.To);
            Assert.True(Math.Abs(across - IndependentHeadLoss(p, model.KinematicViscosity, result.Pipe(p.Id).Flow)) <= 1e-9, $"energy on {p.Id}");
        }
    }
}
