using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Channels;

namespace FlowSolve.Benchmarks;

/// <summary>
/// Manning normal depth per call for three sections, each over 16 flows spread log-uniformly so that branch
/// prediction cannot learn one case: a trapezoid (b = 3 m, z = 2), a part-full circle (D = 1.2 m, flows from 5 to 95
/// percent of full-pipe flow, so one depth each) and a 7-point surveyed compound section (flows below bank-full).
/// </summary>
[MemoryDiagnoser]
public class ChannelBenchmarks
{
    private const int Cases = 16;
    private const double Slope = 0.001, N = 0.015;
    private readonly double[] _trapezoidFlows = new double[Cases];
    private readonly double[] _circleFlows = new double[Cases];
    private readonly double[] _surveyFlows = new double[Cases];
    private TrapezoidalSection _trapezoid = null!;
    private CircularSection _circle = null!;
    private SurveyedSection _survey = null!;

    [GlobalSetup]
    public void Setup()
    {
        _trapezoid = new TrapezoidalSection(3.0, 2.0);
        _circle = new CircularSection(1.2);
        // A fictional compound section: left overbank, main channel, right overbank (m).
        _survey = new SurveyedSection([0, 8, 10, 13, 16, 18, 30], [3.5, 2.2, 0.3, 0.0, 0.4, 2.0, 3.2]);
        double full = ManningSolver.Discharge(_circle, _circle.Diameter, Slope, N);
        double bankFull = ManningSolver.Capacity(_survey, Slope, N)!.Value.FullFlow;
        var random = new Random(20261201);
        for (int i = 0; i < Cases; i++)
        {
            _trapezoidFlows[i] = 0.1 * Math.Pow(1000, random.NextDouble());          // 0.1 to 100 m3/s
            _circleFlows[i] = full * (0.05 + 0.9 * random.NextDouble());
            _surveyFlows[i] = bankFull * (0.02 + 0.9 * random.NextDouble());
        }
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double Trapezoid()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ManningSolver.NormalDepth(_trapezoid, _trapezoidFlows[i], Slope, N).NormalDepth;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double PartFullCircle()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ManningSolver.NormalDepth(_circle, _circleFlows[i], Slope, N).NormalDepth;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Cases)]
    public double SurveyedSevenPoints()
    {
        double sum = 0;
        for (int i = 0; i < Cases; i++) sum += ManningSolver.NormalDepth(_survey, _surveyFlows[i], Slope, N).NormalDepth;
        return sum;
    }
}
