using FlowSolve.Core.Friction;
using FlowSolve.Core.Networks;
using static FlowSolve.Core.Tests.Networks.NetworkChecks;

namespace FlowSolve.Core.Tests.Networks;

public sealed partial class NetworkSolverTests
{
    /// <summary>Every reported number of two solves, bit for bit: heads, flows, head losses, friction factors,
    /// iterations and each iteration's record.</summary>
    private static void AssertIdentical(NetworkModel model, NetworkResult a, NetworkResult b)
    {
        Assert.Equal(a.Status, b.Status);
        Assert.Equal(a.Iterations, b.Iterations);
        Assert.Equal(a.Record, b.Record);
        foreach (var p in model.Pipes) Assert.Equal(a.Pipe(p.Id), b.Pipe(p.Id));
        foreach (var j in model.Junctions) Assert.Equal(a.Junction(j.Id), b.Junction(j.Id));
    }

    public static TheoryData<double, double, double> FrictionPassCases => new()
    {
        // demand per junction (m3/s), regime limits: turbulent pipes throughout; a mix of laminar, transitional and
        // turbulent pipes (small demands); limits lowered so that Colebrook-White is solved below Re 2000, where the
        // span solve hands elements to the scalar solve's checked bracket.
        { 1e-4, 2000, 4000 },
        { 2e-7, 2000, 4000 },
        { 2e-7, 1200, 1800 },
    };

    [Theory]
    [MemberData(nameof(FrictionPassCases))]
    public void Solve_SpanFrictionPass_EqualsOnePipeAtATimeBitForBit(double demand, double laminar, double turbulent)
    {
        // The friction pass solves the turbulent pipes' Colebrook-White as one span and recomputes the head loss and its
        // slope in PipeHeadLoss's operations: the whole Newton iteration must be the one the pipe-by-pipe pass takes,
        // and with the default limits the answer must balance (an independent check of continuity and energy).
        var grid = LargeGrid();
        var model = grid with { Junctions = grid.Junctions.Select(j => j with { Demand = demand * (1 + j.Elevation / 10) }).ToArray() };
        var options = NetworkOptions.Default with { Friction = new FrictionOptions(laminar, turbulent) };
        var span = NetworkSolver.Solve(model, options);
        var scalar = NetworkSolver.Solve(model, options with { ScalarFrictionPass = true });
        AssertIdentical(model, span, scalar);
        Assert.Equal(NetworkStatus.Solved, span.Status);
        // (The balance check recomputes head losses with the default regime limits.)
        if (options.Friction == FrictionOptions.Default) AssertBalanced(model, span);
        if (demand < 1e-6)
        {
            // The case does mix the regimes (else it would not test the hand-over between the passes).
            double nu = model.KinematicViscosity;
            var reynolds = model.Pipes.Select(p => Math.Abs(span.Pipe(p.Id).Velocity) * p.Diameter / nu).ToArray();
            Assert.Contains(reynolds, re => re < laminar);
            Assert.Contains(reynolds, re => re >= turbulent);
            if (turbulent < 2000) Assert.Contains(reynolds, re => re >= turbulent && re < 2000);
        }
    }

    [Fact]
    public void SolveLoadCases_SpanFrictionPass_EqualsOnePipeAtATimeBitForBit()
    {
        // Warm-started load cases run the same pass: every case identical to the pipe-by-pipe pass's.
        var model = Grid();
        double[] multipliers = [0.5, 1.0, 1.3];
        var span = NetworkSolver.SolveLoadCases(model, multipliers);
        var scalar = NetworkSolver.SolveLoadCases(model, multipliers, NetworkOptions.Default with { ScalarFrictionPass = true });
        for (int i = 0; i < multipliers.Length; i++) AssertIdentical(model, span[i], scalar[i]);
    }

    [Theory]
    [MemberData(nameof(FrictionPassCases))]
    public void Solve_FrictionPassAcrossCores_EqualsOneCoreBitForBit(double demand, double laminar, double turbulent)
    {
        // A network of at least NetworkSolver.ParallelLinks links splits its friction pass into parts run side by side,
        // each gathering its own turbulent pipes: every iterate, and so the answer, must be the one-core solve's. Four
        // cores asked, so the pass is split even on a machine with one.
        var grid = LargeGrid(101);
        Assert.True(grid.Pipes.Count >= NetworkSolver.ParallelLinks);
        var model = grid with { Junctions = grid.Junctions.Select(j => j with { Demand = demand * (1 + j.Elevation / 10) }).ToArray() };
        var options = NetworkOptions.Default with { Friction = new FrictionOptions(laminar, turbulent) };
        var parts = NetworkSolver.Solve(model, options with { MaxParallelism = 4 });
        var one = NetworkSolver.Solve(model, options with { MaxParallelism = 1 });
        AssertIdentical(model, parts, one);
        // (With the limits lowered a grid this size meets the iteration cap; the two must still agree on every iterate.)
        if (options.Friction == FrictionOptions.Default) Assert.Equal(NetworkStatus.Solved, parts.Status);
        // Warm-started load cases on the same solver as well.
        var partsSolver = new NetworkSolver(model, options with { MaxParallelism = 4 });
        var oneSolver = new NetworkSolver(model, options with { MaxParallelism = 1 });
        foreach (double m in new[] { 1.0, 1.4, 0.6 })
            AssertIdentical(model, partsSolver.SolveCase(m), oneSolver.SolveCase(m));
    }
}
