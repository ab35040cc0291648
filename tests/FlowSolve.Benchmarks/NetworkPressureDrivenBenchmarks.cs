using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Networks;

namespace FlowSolve.Benchmarks;

/// <summary>A generated grid (<see cref="GridNetwork"/>) under a heavy load, solved demand-driven and pressure-driven
/// from the default start in one run: the reservoirs stand 80 m lower than in the plain grid and the demands are 60
/// times its, so that demand-driven the far junctions run at negative pressure and pressure-driven (0 to 20 m,
/// e = 0.5) almost every junction receives only part of its demand (31 % of the demand in all is not delivered at
/// 10 000 pipes; at 40 000 a third of the junctions get nothing and 75 % is not delivered). The ratio is the cost of the
/// law: more Newton iterations (18 against 9 at 10 000 pipes, 16 against 10 at 40 000), the point on each junction's
/// law graph, and the line search's extra evaluations.</summary>
[MemoryDiagnoser]
public class NetworkPressureDrivenBenchmarks
{
    private NetworkModel _demandDriven = null!, _pressureDriven = null!;

    /// <summary>Approximate pipe count.</summary>
    [Params(10_000, 40_000)]
    public int Pipes { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var grid = GridNetwork.Create(Pipes);
        _demandDriven = grid with
        {
            Reservoirs = grid.Reservoirs.Select(r => r with { Head = r.Head - 80 }).ToArray(),
            Junctions = grid.Junctions.Select(j => j with { Demand = 60 * j.Demand }).ToArray(),
        };
        _pressureDriven = _demandDriven with { DemandModel = new PressureDrivenDemand(0, 20, 0.5) };
    }

    /// <summary>Validation, analysis and a solve from the default start, every demand delivered.</summary>
    [Benchmark(Baseline = true)]
    public int DemandDriven() => NetworkSolver.Solve(_demandDriven).Iterations;

    /// <summary>The same with pressure-driven demand.</summary>
    [Benchmark]
    public int PressureDriven() => NetworkSolver.Solve(_pressureDriven).Iterations;
}
