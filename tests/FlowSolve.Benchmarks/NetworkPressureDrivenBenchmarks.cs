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

/// <summary>The scale of issue 17's part 4: the same heavily loaded grid at about 300 000 pipes and 150 000 junctions,
/// demand-driven against pressure-driven; a solve that does not converge throws, so a result row is a converged solve.
/// Run it by hand with a one-shot job (<c>--job dry --inProcess</c>): each solve takes seconds.</summary>
[MemoryDiagnoser]
public class NetworkPressureDrivenScaleBenchmarks
{
    private NetworkModel _demandDriven = null!, _pressureDriven = null!;

    [GlobalSetup]
    public void Setup()
    {
        var grid = GridNetwork.Create(300_000);
        Console.WriteLine($"// grid: {grid.Junctions.Count} junctions, {grid.Pipes.Count} pipes");
        _demandDriven = grid with
        {
            Reservoirs = grid.Reservoirs.Select(r => r with { Head = r.Head - 80 }).ToArray(),
            Junctions = grid.Junctions.Select(j => j with { Demand = 60 * j.Demand }).ToArray(),
        };
        _pressureDriven = _demandDriven with { DemandModel = new PressureDrivenDemand(0, 20, 0.5) };
    }

    private static int Converged(NetworkResult r, string which)
    {
        Console.WriteLine($"// {which}: {r.Status}, {r.Iterations} Newton iterations, converged {r.Converged}");
        return r.Converged ? r.Iterations : throw new InvalidOperationException($"{which} did not converge: {r.Status}");
    }

    [Benchmark(Baseline = true)]
    public int DemandDriven() => Converged(NetworkSolver.Solve(_demandDriven), "demand-driven");

    [Benchmark]
    public int PressureDriven() => Converged(NetworkSolver.Solve(_pressureDriven), "pressure-driven");
}
