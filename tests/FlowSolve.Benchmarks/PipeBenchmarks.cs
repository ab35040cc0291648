using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Benchmarks;

/// <summary>
/// The three pipe problems per call over 64 cases (diameters 50 mm to 1.2 m, flows for velocities of 0.3 to 3 m/s,
/// roughness 0.0015 to 1 mm, half with minor losses), water at about 15 degrees C.
/// </summary>
[MemoryDiagnoser]
public class PipeBenchmarks
{
    private const int Cases = 64;
    private readonly PipeGeometry[] _pipes = new PipeGeometry[Cases];
    private readonly double[] _flows = new double[Cases];
    private readonly double[] _heads = new double[Cases];
    private static readonly FluidProperties Water = new(1.14e-6, 999.1);

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20261201);
        for (int i = 0; i < Cases; i++)
        {
            double d = 0.05 * Math.Pow(24, random.NextDouble());
            double v = 0.3 * Math.Pow(10, random.NextDouble());
            double e = 1.5e-6 * Math.Pow(1e-3 / 1.5e-6, random.NextDouble());
            _pipes[i] = new PipeGeometry(200 + 4800 * random.NextDouble(), d, e, i % 2 == 0 ? 0 : 5 * random.NextDouble());
            _flows[i] = v * Math.PI * d * d / 4;
            _heads[i] = PipeHeadLoss.Compute(_pipes[i], Water, _flows[i]).HeadLoss;
        }
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Cases)]
    public double HeadLoss()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += PipeHeadLoss.Compute(_pipes[i], Water, _flows[i]).HeadLoss;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double HeadLossWithDerivative()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += PipeHeadLoss.WithDerivative(_pipes[i], Water.KinematicViscosity, _flows[i]).DHeadLossDFlow;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double FlowFromHead()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += PipeFlow.Solve(_pipes[i], Water, _heads[i]).Flow;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double DiameterFromHead()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++)
        {
            var p = _pipes[i];
            sum += PipeDiameter.Solve(p.Length, p.Roughness, p.MinorLossCoefficient, Water, _flows[i], _heads[i]).Diameter;
        }
        return sum;
    }
}
