using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Friction;
using FlowSolve.Core.NonNewtonian;

namespace FlowSolve.Benchmarks;

/// <summary>
/// The non-Newtonian friction solves per call, beside exact Colebrook-White as the baseline, over a spread of 64 inputs
/// each (so branch prediction cannot learn one case): Dodge-Metzner for n from 0.2 to 1.5 and Re_MR from 3e3 to 1e6;
/// Buckingham-Reiner with Darby's combination for Re from 10 to 1e5 and He from 1e2 to 1e7; and the inverse flow of a
/// Bingham paste (an outer Newton in ln Q with a Buckingham-Reiner solve per evaluation), alone and with its
/// sensitivities (implicit differentiation at the solved flow). Zero allocations expected.
/// </summary>
[MemoryDiagnoser]
public class NonNewtonianBenchmarks
{
    private const int Cases = 64;
    private readonly double[] _reynolds = new double[Cases];
    private readonly double[] _index = new double[Cases];
    private readonly double[] _plasticReynolds = new double[Cases];
    private readonly double[] _hedstrom = new double[Cases];
    private readonly double[] _heads = new double[Cases];
    private static readonly NonNewtonianFluid Paste = NonNewtonianFluid.BinghamPlastic(1450, 25, 0.06);

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20261204);
        for (int i = 0; i < Cases; i++)
        {
            _reynolds[i] = 3e3 * Math.Pow(1e6 / 3e3, random.NextDouble());
            _index[i] = 0.2 + 1.3 * random.NextDouble();
            _plasticReynolds[i] = 10 * Math.Pow(1e4, random.NextDouble());
            _hedstrom[i] = 1e2 * Math.Pow(1e5, random.NextDouble());
            _heads[i] = 60 + 200 * random.NextDouble(); // above the paste's yield head of 56.3 m over 1200 m of 150 mm pipe
        }
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Cases)]
    public double ColebrookWhiteSmooth()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ColebrookWhite.Solve(_reynolds[i], 0).FrictionFactor;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double DodgeMetzner()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += PowerLawFriction.DodgeMetzner(_reynolds[i], _index[i]).Fanning;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double BuckinghamReinerWithDarby()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++)
        {
            double re = _plasticReynolds[i], he = _hedstrom[i];
            double fl = BinghamFriction.BuckinghamReiner(re, he).Fanning;
            sum += BinghamFriction.Combine(fl, BinghamFriction.DarbyTurbulent(re, he), BinghamFriction.CombinationExponent(re));
        }
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double BinghamFlowFromHead()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += NonNewtonianPipe.Flow(Paste, 1200, 0.15, 4.5, _heads[i]).State.Flow;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double BinghamFlowFromHeadWithSensitivities()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++)
        {
            var r = NonNewtonianPipe.Flow(Paste, 1200, 0.15, 4.5, _heads[i]);
            sum += NonNewtonianSensitivity.OfFlow(Paste, 1200, 0.15, 4.5, r).Output.YieldStress;
        }
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double DodgeMetznerFrictionSensitivities()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++)
        {
            // A mud at 2 m/s in 0.1 m pipe with K set for the case's Re_MR: the friction factor, then its sensitivities.
            double n = _index[i];
            var mud = NonNewtonianFluid.PowerLaw(1200, 1200 * Math.Pow(2, 2 - n) * Math.Pow(0.1, n) /
                (_reynolds[i] * Math.Pow(8, n - 1) * Math.Pow((3 * n + 1) / (4 * n), n)), n);
            var f = NonNewtonianFriction.Compute(mud, 2, 0.1);
            sum += NonNewtonianSensitivity.OfFriction(mud, 2, 0.1, f).Output.FlowBehaviorIndex;
        }
        return sum;
    }
}
