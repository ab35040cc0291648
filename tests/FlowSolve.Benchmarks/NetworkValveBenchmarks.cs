using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Networks;

namespace FlowSolve.Benchmarks;

/// <summary>A generated grid (<see cref="GridNetwork"/>) solved from the default start as it is and with 32 of its
/// pipes replaced by control valves of the same bore, in one run: 16 pressure-reducing valves set to 95 m (most of
/// them active: the grid stands at about 110 m of pressure), 8 flow-control valves and 8 throttles, on pipes that share
/// no node, each facing its pipe's flow in the plain grid. The ratio is the cost of the valves: the status passes (each a Newton solve from where the last stopped)
/// and, per Newton step, one more solve with the Cholesky factor for each active pressure valve.</summary>
[MemoryDiagnoser]
public class NetworkValveBenchmarks
{
    private NetworkModel _plain = null!, _valves = null!;

    /// <summary>Approximate pipe count.</summary>
    [Params(10_000)]
    public int Pipes { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _plain = GridNetwork.Create(Pipes);
        var chosen = new List<NetworkPipe>();
        var used = new HashSet<string>();
        // Horizontal pipes spread over the grid, every fourth row and column, so that no two valves share a node.
        foreach (var p in _plain.Pipes.Where(p => p.Id.StartsWith('h')))
        {
            var rc = p.Id[1..].Split('_');
            int r = int.Parse(rc[0]), c = int.Parse(rc[1]);
            if (r % 4 != 2 || c % 4 != 1 || used.Contains(p.From) || used.Contains(p.To)) continue;
            used.Add(p.From);
            used.Add(p.To);
            chosen.Add(p);
            if (chosen.Count == 32) break;
        }
        // Each valve faces the flow its pipe carries in the plain grid, as it would be installed.
        var plain = NetworkSolver.Solve(_plain);
        var valves = chosen.Select((p, i) => new ControlValve("valve-" + p.Id,
            plain.Pipe(p.Id).Flow >= 0 ? p.From : p.To, plain.Pipe(p.Id).Flow >= 0 ? p.To : p.From, p.Diameter,
            i % 2 == 0 ? ControlValveType.PressureReducing : i % 4 == 1 ? ControlValveType.FlowControl : ControlValveType.Throttle,
            i % 2 == 0 ? 95 : i % 4 == 1 ? 1e-4 : 20, 3)).ToArray();
        var replaced = chosen.Select(p => p.Id).ToHashSet();
        _valves = _plain with { Pipes = _plain.Pipes.Where(p => !replaced.Contains(p.Id)).ToArray(), Valves = valves };
        var check = NetworkSolver.Solve(_valves);
        Console.WriteLine($"// valves: {check.Status}, {check.Iterations} iterations, {check.StatusPasses} passes; states: "
            + string.Join(", ", check.Valves.GroupBy(v => v.State).Select(g => $"{g.Count()} {g.Key}"))
            + $"; plain: {plain.Iterations} iterations");
    }

    /// <summary>Validation, analysis and a solve from the default start, no valves.</summary>
    [Benchmark(Baseline = true)]
    public int WithoutValves() => NetworkSolver.Solve(_plain).Iterations;

    /// <summary>The same grid with 32 control valves.</summary>
    [Benchmark]
    public int WithValves() => NetworkSolver.Solve(_valves).Iterations;
}
