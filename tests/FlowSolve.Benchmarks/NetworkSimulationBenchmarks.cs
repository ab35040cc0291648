using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Networks;

namespace FlowSolve.Benchmarks;

/// <summary>
/// A day of an extended-period run on the generated grids (<see cref="GridNetwork"/>, a fictional layout): four tanks
/// (bottom 115 m, 25 m across, level 0.5 to 9 m, starting at 5 m) joined by 100 m of 300 mm pipe to junctions a
/// quarter of the way in from each corner, every junction's demand following one invented hourly pattern (night 0.4,
/// evening peak 1.5), reports hourly. The returned value is the run's network solves.
/// </summary>
[MemoryDiagnoser]
public class NetworkSimulationBenchmarks
{
    /// <summary>The invented day of the Vandrel Vale grid: 24 hourly multipliers of every demand.</summary>
    public static readonly double[] Day =
        [0.5, 0.45, 0.4, 0.4, 0.45, 0.6, 0.9, 1.3, 1.4, 1.3, 1.2, 1.1, 1.1, 1.0, 1.0, 1.0, 1.1, 1.3, 1.5, 1.4, 1.2, 1.0, 0.8, 0.6];

    private SimulationModel _model = null!;

    /// <summary>Approximate pipe count (the 100 000-pipe day is <see cref="NetworkSimulationScaleBenchmarks"/>).</summary>
    [Params(10_000)]
    public int Pipes { get; set; }

    /// <summary>The grid with its tanks and pattern.</summary>
    public static SimulationModel Create(int pipes)
    {
        var grid = GridNetwork.Create(pipes);
        int n = (int)Math.Round(Math.Sqrt(grid.Junctions.Count));
        var tanks = new List<Tank>();
        var links = new List<NetworkPipe>(grid.Pipes);
        (int R, int C)[] spots = [(n / 4, n / 4), (n / 4, 3 * n / 4), (3 * n / 4, n / 4), (3 * n / 4, 3 * n / 4)];
        for (int k = 0; k < spots.Length; k++)
        {
            tanks.Add(new Tank($"t{k}", 115, 5, 0.5, 9, 25));
            links.Add(new NetworkPipe($"tank{k}", $"t{k}", $"j{spots[k].R}_{spots[k].C}", 100, 0.3, 0.1e-3));
        }
        var patterns = grid.Junctions.ToDictionary(j => j.Id, _ => "day");
        return new SimulationModel(grid with { Pipes = links }, tanks, [new DemandPattern("day", Day)], patterns, [], 86_400, 3600);
    }

    [GlobalSetup]
    public void Setup()
    {
        _model = Create(Pipes);
        Console.WriteLine("// " + Describe(NetworkSimulator.Run(_model)));
    }

    /// <summary>The counts of a run, for the log.</summary>
    internal static string Describe(SimulationResult r) =>
        $"{r.Status}: {r.Steps.Count} steps ({r.Steps.Sum(s => s.Rejected)} rejected), {r.NetworkSolves} network solves, " +
        $"{r.Steps.Sum(s => s.NetworkIterations)} Newton iterations in the steps, {r.Events.Count} events";

    /// <summary>The day, one solver warm started from solve to solve.</summary>
    [Benchmark]
    public int Day24Hours() => Check(NetworkSimulator.Run(_model)).NetworkSolves;

    internal static SimulationResult Check(SimulationResult result) =>
        result.Completed ? result : throw new InvalidOperationException($"the run stopped: {result.Status} at {result.ReachedTime} s");
}

/// <summary>What the warm start saves on the 10 000-pipe day of <see cref="NetworkSimulationBenchmarks"/>: the same run
/// with every network solve from the default start; and what one analysis for the whole run saves: the set-up of a
/// solver for the run's network (validation, indexes, ordering and symbolic analysis), which a run building a solver
/// per solve would pay at every solve; and what the stages' looser stopping rule saves (every solve to the network's own
/// tolerances instead).</summary>
[MemoryDiagnoser]
public class NetworkSimulationWarmStartBenchmarks
{
    private SimulationModel _model = null!;
    private NetworkModel _network = null!;

    [GlobalSetup]
    public void Setup()
    {
        _model = NetworkSimulationBenchmarks.Create(10_000);
        _network = NetworkSimulator.WithTanks(_model);
        Console.WriteLine("// warm: " + NetworkSimulationBenchmarks.Describe(NetworkSimulator.Run(_model)));
        Console.WriteLine("// cold: " + NetworkSimulationBenchmarks.Describe(NetworkSimulator.Run(_model, new SimulationOptions { ColdStarts = true })));
        Console.WriteLine("// strict stages: " + NetworkSimulationBenchmarks.Describe(NetworkSimulator.Run(_model, new SimulationOptions { StrictStages = true })));
    }

    /// <summary>Warm starts (the default).</summary>
    [Benchmark(Baseline = true)]
    public int Warm() => NetworkSimulationBenchmarks.Check(NetworkSimulator.Run(_model)).NetworkSolves;

    /// <summary>Every solve from the default start.</summary>
    [Benchmark]
    public int Cold() => NetworkSimulationBenchmarks.Check(NetworkSimulator.Run(_model, new SimulationOptions { ColdStarts = true })).NetworkSolves;

    /// <summary>Every stage's network solve to the network's own tolerances (what the stages' looser stopping rule,
    /// derived from the level tolerance, saves).</summary>
    [Benchmark]
    public int StrictStages() => NetworkSimulationBenchmarks.Check(NetworkSimulator.Run(_model, new SimulationOptions { StrictStages = true })).NetworkSolves;

    /// <summary>One solver's set-up for the run's network.</summary>
    [Benchmark]
    public NetworkSolver SetUp() => new(_network);
}

/// <summary>The day of <see cref="NetworkSimulationBenchmarks"/> on the 99 912-pipe grid. Each run takes tens of seconds
/// on the shared machine: run it by hand with a one-shot job (<c>--job dry --inProcess</c>).</summary>
[MemoryDiagnoser]
public class NetworkSimulationScaleBenchmarks
{
    private SimulationModel _model = null!;

    [GlobalSetup]
    public void Setup()
    {
        _model = NetworkSimulationBenchmarks.Create(100_000);
        Console.WriteLine($"// grid: {_model.Network.Junctions.Count} junctions, {_model.Network.Pipes.Count} pipes");
    }

    /// <summary>The day, one solver warm started from solve to solve; the counts go to the log.</summary>
    [Benchmark]
    public int Day24Hours()
    {
        var result = NetworkSimulationBenchmarks.Check(NetworkSimulator.Run(_model));
        Console.WriteLine("// " + NetworkSimulationBenchmarks.Describe(result));
        return result.NetworkSolves;
    }
}
