using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Configs;
using BenchmarkDotNet.Jobs;
using BenchmarkDotNet.Toolchains.InProcess.Emit;
using FlowSolve.Core.Networks;

namespace FlowSolve.Benchmarks;

/// <summary>Fire flow at 1 000 junctions of the generated 10 000-pipe grid (<see cref="GridNetwork"/>, 5 041 junctions):
/// every fifth junction, residual pressure head 14 m. The reservoirs stand 80 m lower than in the plain grid, so that
/// the junctions start at 30 to 45 m of pressure and the fire flows are of the order of a main's capacity rather than
/// of the whole grid's. Three ways in one run: the scalar search alone, one junction after another (the baseline: a few
/// warm-started network solves a junction, one factorisation each); the bordered solve (the draw-off and the network in
/// one Newton iteration) one junction after another; and the bordered solve with the junctions spread over every core
/// (the default).</summary>
[MemoryDiagnoser]
[Config(typeof(LongRunConfig))]
public class NetworkFireFlowBenchmarks
{
    /// <summary>One cold run of each, in process, with a 30-minute limit: the baseline takes about a minute and a half of
    /// CPU time, beyond the in-process toolchain's default limit on a shared machine, and the out-of-process build of the
    /// generated project timed out there. Run with <c>--filter '*NetworkFireFlowBenchmarks*'</c> alone (no --job: a short
    /// job would run the baseline six times).</summary>
    private sealed class LongRunConfig : ManualConfig
    {
        public LongRunConfig() =>
            AddJob(Job.Dry.WithToolchain(new InProcessEmitToolchain(TimeSpan.FromMinutes(30), logOutput: false)));
    }

    private NetworkModel _model = null!;
    private string[] _junctions = null!;

    /// <summary>Junctions asked.</summary>
    [Params(1000)]
    public int Junctions { get; set; }

    /// <summary>With a minimum pressure head of 10 m at every other junction (each evaluation then scans all of them);
    /// add true to the list to measure it (one run of the analysis takes about a minute of CPU time).</summary>
    [Params(false)]
    public bool Minimum { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var grid = GridNetwork.Create(10_000);
        _model = grid with { Reservoirs = grid.Reservoirs.Select(r => r with { Head = r.Head - 80 }).ToArray() };
        _junctions = _model.Junctions.Where((_, i) => i % 5 == 0).Take(Junctions).Select(j => j.Id).ToArray();
    }

    /// <summary>The scalar search at every junction, one after another (the method before the bordered solve).</summary>
    [Benchmark(Baseline = true)]
    public int ScalarSearchSequential() => Run(new FireFlowOptions(14, Minimum ? 10 : null) { ScalarSearchOnly = true, MaxParallelism = 1 });

    /// <summary>The bordered solve at every junction, one after another.</summary>
    [Benchmark]
    public int BorderedSequential() => Run(new FireFlowOptions(14, Minimum ? 10 : null) { MaxParallelism = 1 });

    /// <summary>The bordered solve, junctions spread over every core (one solver each): the default.</summary>
    [Benchmark]
    public int BorderedParallel() => Run(new FireFlowOptions(14, Minimum ? 10 : null));

    /// <summary>The whole analysis: validation, the background solve, and the search at every junction asked.</summary>
    private int Run(FireFlowOptions options)
    {
        var report = FireFlow.Solve(_model, _junctions, options);
        int solves = 0;
        foreach (var r in report.Junctions) solves += r.Converged ? r.Iterations : 1_000_000;
        return solves;
    }
}
