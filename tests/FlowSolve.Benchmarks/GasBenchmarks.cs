using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Gas;

namespace FlowSolve.Benchmarks;

/// <summary>
/// The isothermal gas line: the outlet pressure of a mass flow, the mass flow between two pressures, and the largest mass
/// flow alone, over 16 cases from 10 to 85 percent of the line's largest flow (a 50 km, 300 mm line at 5 MPa) so that
/// the solver does not meet one case only. Each of the first two solves includes the limit's own solve, as every answer
/// reports it. Invented data for timing only.
/// </summary>
[MemoryDiagnoser]
public class GasBenchmarks
{
    private const int Cases = 16;
    private static readonly GasLine Line = new(50_000, 0.3, 4.5e-5);
    private static readonly GasProperties Gas = new(0.6 * GasConstants.MolarMassOfAir, 15, 0.9, 1.1e-5, 1.3);
    private readonly double[] _flows = new double[Cases], _outlets = new double[Cases];

    [GlobalSetup]
    public void Setup()
    {
        double largest = GasPipeFlow.LargestMassFlux(Line, Gas, 5e6).MassFlux * Line.Area;
        for (int i = 0; i < Cases; i++)
        {
            _flows[i] = largest * (0.1 + 0.75 * i / (Cases - 1));
            _outlets[i] = GasPipeFlow.SolveOutletPressure(Line, Gas, 5e6, _flows[i]).OutletPressure;
        }
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Cases)]
    public double LargestMassFlow()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += GasPipeFlow.LargestMassFlux(Line, Gas, 5e6 - i).MassFlux;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double OutletPressure()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += GasPipeFlow.SolveOutletPressure(Line, Gas, 5e6, _flows[i]).OutletPressure;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double MassFlow()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += GasPipeFlow.SolveMassFlow(Line, Gas, 5e6, _outlets[i]).MassFlux;
        return sum;
    }
}
