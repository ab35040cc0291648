using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Channels;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Benchmarks;

/// <summary>
/// What the analytic sensitivities cost beside the solve they follow, and that they allocate nothing: the pipe flow
/// problem (64 cases as in <see cref="PipeBenchmarks"/>), water at a temperature, a trapezoid's normal depth.
/// </summary>
[MemoryDiagnoser]
public class SensitivityBenchmarks
{
    private const int Cases = 64;
    private readonly PipeGeometry[] _pipes = new PipeGeometry[Cases];
    private readonly double[] _heads = new double[Cases];
    private readonly PipeState[] _states = new PipeState[Cases];
    private static readonly FluidProperties Water15 = new(1.14e-6, 999.1);
    private static readonly TrapezoidalSection Canal = new(1.2, 1.5);
    private double _canalDepth;

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
            _heads[i] = PipeHeadLoss.Compute(_pipes[i], Water15, v * Math.PI * d * d / 4).HeadLoss;
            _states[i] = PipeFlow.Solve(_pipes[i], Water15, _heads[i]).State;
        }
        _canalDepth = ManningSolver.NormalDepth(Canal, 1.8, 0.0005, 0.015).NormalDepth;
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Cases)]
    public double PipeFlowSolve()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += PipeFlow.Solve(_pipes[i], Water15, _heads[i]).Flow;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double PipeFlowSensitivitiesAlone()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += PipeSensitivity.Flow(_states[i], _pipes[i].Length, Water15.KinematicViscosity).Answer.Roughness;
        return sum;
    }

    [Benchmark]
    public double WaterProperties() => Water.At(12.0).KinematicViscosity;

    [Benchmark]
    public double WaterDerivatives() => WaterSensitivity.At(12.0).KinematicViscosityDerivative;

    [Benchmark]
    public double NormalDepthSolve() => ManningSolver.NormalDepth(Canal, 1.8, 0.0005, 0.015).NormalDepth;

    [Benchmark]
    public double NormalDepthSensitivitiesAlone() => ChannelSensitivity.NormalDepth(Canal, _canalDepth, 1.8, 0.0005, 0.015).Flow.Depth;
}
