using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Friction;

namespace FlowSolve.Benchmarks;

/// <summary>
/// The exact Colebrook-White solve against evaluating Swamee-Jain, per call, over a spread of 64 inputs
/// (Reynolds 4e3 to 1e8 log-spaced, relative roughness 0 and 1e-6 to 0.05), so branch prediction cannot learn one case.
/// </summary>
[MemoryDiagnoser]
public class FrictionBenchmarks
{
    private const int Cases = 64;
    private readonly double[] _reynolds = new double[Cases];
    private readonly double[] _roughness = new double[Cases];

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20261201);
        for (int i = 0; i < Cases; i++)
        {
            _reynolds[i] = 4e3 * Math.Pow(1e8 / 4e3, random.NextDouble());
            _roughness[i] = i % 8 == 0 ? 0.0 : 1e-6 * Math.Pow(0.05 / 1e-6, random.NextDouble());
        }
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Cases)]
    public double SwameeJain()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ExplicitFriction.SwameeJain(_reynolds[i], _roughness[i]);
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double ColebrookWhiteExact()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ColebrookWhite.Solve(_reynolds[i], _roughness[i]).FrictionFactor;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double DarcyFrictionWithRegimes()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += DarcyFriction.Compute(_reynolds[i], _roughness[i]).FrictionFactor;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double Haaland()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ExplicitFriction.Haaland(_reynolds[i], _roughness[i]);
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double Serghides()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ExplicitFriction.Serghides(_reynolds[i], _roughness[i]);
        return sum;
    }
}

/// <summary>
/// Friction for many pipes at once: 4096 pipes (Reynolds 4e3 to 1e8 log-uniform, relative roughness 0 and 1e-6 to 0.05,
/// as above), the exact Colebrook-White span solve against the scalar exact solve and the scalar Swamee-Jain in a loop,
/// per pipe.
/// </summary>
[MemoryDiagnoser]
public class FrictionSpanBenchmarks
{
    private const int Pipes = 4096;
    private readonly double[] _reynolds = new double[Pipes];
    private readonly double[] _roughness = new double[Pipes];
    private readonly double[] _factor = new double[Pipes];

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20261204);
        for (int i = 0; i < Pipes; i++)
        {
            _reynolds[i] = 4e3 * Math.Pow(1e8 / 4e3, random.NextDouble());
            _roughness[i] = i % 8 == 0 ? 0.0 : 1e-6 * Math.Pow(0.05 / 1e-6, random.NextDouble());
        }
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Pipes)]
    public double SwameeJainLoop()
    {
        for (int i = 0; i < Pipes; i++) _factor[i] = ExplicitFriction.SwameeJain(_reynolds[i], _roughness[i]);
        return _factor[Pipes - 1];
    }

    [Benchmark(OperationsPerInvoke = Pipes)]
    public double ColebrookWhiteExactLoop()
    {
        for (int i = 0; i < Pipes; i++) _factor[i] = ColebrookWhite.Solve(_reynolds[i], _roughness[i]).FrictionFactor;
        return _factor[Pipes - 1];
    }

    [Benchmark(OperationsPerInvoke = Pipes)]
    public double ColebrookWhiteExactSpan() =>
        ColebrookWhite.Solve(_reynolds, _roughness, _factor).WorstIterations;
}
