using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Benchmarks;

/// <summary>
/// The duty-point solve for a coefficient pump curve (H = 40 - 5000 Q^2) on a lumped K Q^2 system and on a two-pipe
/// system (Darcy-Weisbach, exact Colebrook-White in each evaluation), over 16 static heads from 5 to 35 m so that the
/// solver does not meet one case only. Invented data for timing only.
/// </summary>
[MemoryDiagnoser]
public class PumpBenchmarks
{
    private const int Cases = 16;
    private readonly SystemCurve[] _quadratic = new SystemCurve[Cases];
    private readonly SystemCurve[] _pipes = new SystemCurve[Cases];
    private PumpCurve _pump;

    [GlobalSetup]
    public void Setup()
    {
        _pump = PumpCurve.FromCoefficients(40, 0, -5000);
        var fluid = new FluidProperties(1.004e-6, 998.2);
        PipeGeometry[] pipes = [new(300, 0.2, 5e-5, 4.0), new(50, 0.15, 5e-5, 1.0)];
        for (int i = 0; i < Cases; i++)
        {
            double hs = 5 + 30.0 * i / (Cases - 1);
            _quadratic[i] = SystemCurve.Quadratic(hs, 3000);
            _pipes[i] = SystemCurve.FromPipes(hs, pipes, fluid);
        }
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Cases)]
    public double CoefficientCurveOnQuadraticSystem()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += DutyPoint.Solve(_pump, _quadratic[i]).Flow;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double CoefficientCurveOnTwoPipeSystem()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += DutyPoint.Solve(_pump, _pipes[i]).Flow;
        return sum;
    }
}
