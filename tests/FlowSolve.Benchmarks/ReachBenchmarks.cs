using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Channels;

namespace FlowSolve.Benchmarks;

/// <summary>
/// The standard step over a surveyed reach, per reach: 100 sections of an invented natural channel 20 m apart (a main
/// channel with rough overbanks) at two survey densities, 12 and 200 points a section, so the cost of the per-section
/// critical-depth scan (which grows with the points) shows beside the steps themselves.
/// </summary>
[MemoryDiagnoser]
public class ReachBenchmarks
{
    private ReachSection[] _coarse = null!;
    private ReachSection[] _dense = null!;

    [GlobalSetup]
    public void Setup()
    {
        _coarse = Reach(12);
        _dense = Reach(200);
    }

    private static ReachSection[] Reach(int points)
    {
        var random = new Random(20261204);
        var sections = new ReachSection[100];
        for (int k = 0; k < sections.Length; k++)
        {
            double x = 20.0 * k, bed = 100 + 0.0008 * x;
            var stations = new double[points];
            var elevations = new double[points];
            for (int i = 0; i < points; i++)
            {
                double s = 40.0 * i / (points - 1);
                double u = Math.Abs(s - 20) / 20;
                // A 10 m main channel 1.5 m deep, then overbanks rising to 3.5 m at the survey's ends.
                elevations[i] = bed + (u < 0.25 ? 1.5 * Math.Pow(u / 0.25, 2) : 1.5 + 2.0 * (u - 0.25) / 0.75) + 0.05 * random.NextDouble();
                stations[i] = s;
            }
            sections[k] = new ReachSection(x, new SurveyedSection(stations, elevations), 0.035);
        }
        return sections;
    }

    [Benchmark]
    public double Subcritical12Points() => StandardStep.Solve(_coarse, 30, _coarse[0].Section.InvertElevation + 2.2, ReachStart.Downstream).Residual;

    [Benchmark]
    public double Subcritical200Points() => StandardStep.Solve(_dense, 30, _dense[0].Section.InvertElevation + 2.2, ReachStart.Downstream).Residual;
}
