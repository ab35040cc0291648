using FlowSolve.Core.Channels;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>
/// The per-iteration record of a channel solve (what a calculation sheet shows) is the record of the solve that gave the
/// answer: asking for it changes no digit of the answer, its last iterate is the reported depth in the solve's own
/// variable, and it has one row per iteration (plus the start, when that already met the tolerance).
/// </summary>
public class ChannelTraceTests
{
    public static TheoryData<string> Shapes() => ["trapezoidal", "circular", "surveyed"];

    private static ChannelSection Section(string shape) => shape switch
    {
        "trapezoidal" => new TrapezoidalSection(3, 2),
        "circular" => new CircularSection(1.2),
        _ => new SurveyedSection([0, 4, 7, 11], [2, 0, 0, 2]),
    };

    /// <summary>The depth in the variable each shape is solved in (see ManningSolver and CriticalFlow).</summary>
    private static double InSolveVariable(ChannelSection section, double depth, bool critical) => section switch
    {
        CircularSection c when critical => Math.Log(depth / (c.Diameter - depth)),
        CircularSection or SurveyedSection => depth,
        _ => Math.Log(depth),
    };

    [Theory]
    [MemberData(nameof(Shapes))]
    public void NormalDepth_TraceIsTheAnswersOwnSolve(string shape)
    {
        var section = Section(shape);
        double flow = 1.1, slope = 0.002, n = 0.014;
        var plain = ManningSolver.NormalDepth(section, flow, slope, n);
        var trace = new SolverTrace();
        var traced = ManningSolver.NormalDepth(section, flow, slope, n, trace);

        Assert.True(plain.Converged);
        Assert.Equal(plain.NormalDepth, traced.NormalDepth); // bitwise: the trace only records
        Assert.Equal(plain.Iterations, traced.Iterations);
        Assert.InRange(trace.Steps.Count, 1, traced.Iterations + 1);
        double expected = InSolveVariable(section, traced.NormalDepth, critical: false);
        Assert.Equal(expected, trace.Steps[^1].X + trace.Steps[^1].Step, Math.Abs(expected) * 1e-9 + 1e-12);
    }

    [Theory]
    [MemberData(nameof(Shapes))]
    public void CriticalDepth_TraceIsTheAnswersOwnSolve(string shape)
    {
        var section = Section(shape);
        double flow = 1.1;
        var plain = CriticalFlow.CriticalDepth(section, flow);
        var trace = new SolverTrace();
        var traced = CriticalFlow.CriticalDepth(section, flow, trace);

        Assert.True(plain.Converged);
        Assert.Equal(plain.CriticalDepth, traced.CriticalDepth);
        Assert.Equal(plain.Iterations, traced.Iterations);
        Assert.InRange(trace.Steps.Count, 1, traced.Iterations + 1);
        double expected = InSolveVariable(section, traced.CriticalDepth, critical: true);
        Assert.Equal(expected, trace.Steps[^1].X + trace.Steps[^1].Step, Math.Abs(expected) * 1e-9 + 1e-12);
    }
}
