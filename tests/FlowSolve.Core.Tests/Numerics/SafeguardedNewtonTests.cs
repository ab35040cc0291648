using FlowSolve.Core.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Numerics;

public sealed class SafeguardedNewtonTests
{
    private static readonly SolverOptions Tight = new(0.0, 1e-15, 0.0, 100);

    /// <summary>cosh(x) = c, root acosh(c): a catenary-sag style equation with a closed-form root.</summary>
    private readonly struct CoshEquals(double c) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double x) => (Math.Cosh(x) - c, Math.Sinh(x));
    }

    /// <summary>y^(5/3) = c: the wide-channel Manning relation in depth, root c^(3/5).</summary>
    private readonly struct PowerLaw(double c) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double y) =>
            (Math.Pow(y, 5.0 / 3.0) - c, 5.0 / 3.0 * Math.Pow(y, 2.0 / 3.0));
    }

    /// <summary>(x - a)(x - b)(x - c) with three known simple roots.</summary>
    private readonly struct Cubic(double a, double b, double c) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double x) =>
            ((x - a) * (x - b) * (x - c), (x - b) * (x - c) + (x - a) * (x - c) + (x - a) * (x - b));
    }

    /// <summary>(x - a)^m: a root of multiplicity m, where Newton converges only linearly (ratio 1 - 1/m).</summary>
    private readonly struct Multiple(double a, int m) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double x) =>
            (Math.Pow(x - a, m), m * Math.Pow(x - a, m - 1));
    }

    /// <summary>A saturating response tanh((x - a)/w): plain Newton cycles or runs off from far enough away.</summary>
    private readonly struct Saturating(double a, double w) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double x)
        {
            double t = Math.Tanh((x - a) / w);
            return (t, (1 - t * t) / w);
        }
    }

    public static TheoryData<double> CoshLevels => new() { 1.05, 1.7, 12.5, 3.3e4 };

    [Theory]
    [MemberData(nameof(CoshLevels))]
    public void Solve_CoshLevel_MatchesClosedFormAcosh(double c)
    {
        var result = SafeguardedNewton.Solve(new CoshEquals(c), Bracket.Checked(0, 20), 1.0, Tight);
        Assert.True(result.Converged, result.Reason);
        Assert.Equal(Math.Acosh(c), result.Root, 1e-13 * Math.Acosh(c));
        Assert.InRange(result.Iterations, 1, 40);
    }

    [Theory]
    [InlineData(0.37)]
    [InlineData(8.2)]
    [InlineData(640.0)]
    public void Solve_PowerLaw_MatchesClosedForm(double c)
    {
        var result = SafeguardedNewton.Solve(new PowerLaw(c), Bracket.Checked(1e-6, 1e3), 1.0, Tight);
        Assert.True(result.Converged, result.Reason);
        double expected = Math.Pow(c, 0.6);
        Assert.Equal(expected, result.Root, 1e-14 * expected);
        Assert.InRange(result.Iterations, 1, 12);
    }

    [Theory]
    [InlineData(-0.7, 0.6, -0.7)]
    [InlineData(0.0, 2.0, 1.2)]
    [InlineData(2.0, 9.0, 3.4)]
    public void Solve_CubicWithBracketAroundOneRoot_FindsThatRoot(double lo, double hi, double expected)
    {
        var result = SafeguardedNewton.Solve(new Cubic(-0.7, 1.2, 3.4), Bracket.Checked(lo - 0.05, hi), 0.5 * (lo + hi), Tight);
        Assert.True(result.Converged, result.Reason);
        Assert.Equal(expected, result.Root, 1e-13);
    }

    [Fact]
    public void Solve_TripleRootInBracket_EndsLinearlyAndReportsIt()
    {
        // A triple root crosses zero, so it can be bracketed; Newton's error shrinks only by 2/3 a step.
        var trace = new SolverTrace();
        var result = SafeguardedNewton.Solve(new Multiple(1.3, 3), Bracket.Checked(0.0, 2.0), 1.9, new SolverOptions(1e-12, 0, 0, 200), trace);
        Assert.True(result.Converged, result.Reason);
        // f is flat near the root: the residual reaches 0 in double long before x does; the bracket shows the uncertainty.
        Assert.InRange(result.Root, 1.3 - 1e-4, 1.3 + 1e-4);
        Assert.True(result.Lower <= 1.3 && 1.3 <= result.Upper);
        // Far more iterations than a simple root needs: the slow convergence is visible in the count.
        Assert.True(result.Iterations > 10, $"iterations {result.Iterations}");
        Assert.Equal(result.Iterations, trace.Steps.Count);
    }

    [Fact]
    public void Solve_DoubleRootWithoutSignChange_CheckedBracketReportsNoSignChange()
    {
        var result = SafeguardedNewton.Solve(new Multiple(0.45, 2), Bracket.Checked(0.0, 1.0), 0.8, Tight);
        Assert.Equal(SolveStatus.NoSignChange, result.Status);
        Assert.False(result.Converged);
    }

    [Fact]
    public void Solve_DoubleRootWithBoundsOnly_ConvergesLinearlyAndEnds()
    {
        // Newton on (x - a)^2 halves the error each step: linear, not quadratic, convergence.
        var trace = new SolverTrace();
        var result = SafeguardedNewton.Solve(new Multiple(0.45, 2), Bracket.BoundsOnly(0.0, 1.0), 0.95,
            new SolverOptions(1e-10, 0, 0, 200), trace);
        Assert.True(result.Converged, result.Reason);
        Assert.Equal(0.45, result.Root, 1e-9);
        // log2(0.5 / 1e-10) is about 32 halvings.
        Assert.InRange(result.Iterations, 25, 40);
        double ratio = trace.Steps[10].Step / trace.Steps[9].Step;
        Assert.Equal(0.5, ratio, 1e-6);
    }

    [Fact]
    public void Solve_StartOnPlainNewtonTwoCycle_SafeguardConverges()
    {
        const double a = 0.75, w = 0.2;
        // For tanh(u), plain Newton maps u to -u when sinh(2u) = 4u; solve that with Brent to sit on the cycle.
        double u = Brent.FindRoot(v => Math.Sinh(2 * v) - 4 * v, 0.5, 2.0, 1e-15);
        double start = a + u * w;

        // Plain Newton, written out: it bounces between a + uw and a - uw and does not approach the root.
        var f = new Saturating(a, w);
        double x = start;
        for (int i = 0; i < 20; i++)
        {
            var (v, d) = f.Evaluate(x);
            x -= v / d;
        }
        Assert.True(Math.Abs(x - a) > 0.9 * u * w, $"plain Newton unexpectedly converged: {x}");

        var result = SafeguardedNewton.Solve(f, Bracket.Checked(0.0, 2.0), start, Tight);
        Assert.True(result.Converged, result.Reason);
        Assert.Equal(a, result.Root, 1e-14);
        Assert.InRange(result.Iterations, 1, 15);
    }

    [Fact]
    public void Solve_StartWherePlainNewtonRunsOff_SafeguardConverges()
    {
        const double a = 0.75, w = 0.2;
        var f = new Saturating(a, w);
        double start = a + 1.5 * w;

        // Plain Newton: each step overshoots further until the value is not finite.
        double x = start;
        for (int i = 0; i < 6 && double.IsFinite(x); i++)
        {
            var (v, d) = f.Evaluate(x);
            x -= v / d;
        }
        Assert.True(!double.IsFinite(x) || Math.Abs(x - a) > 1e3, $"plain Newton stayed near the root: {x}");

        var result = SafeguardedNewton.Solve(f, Bracket.Checked(-5.0, 5.0), start, Tight);
        Assert.True(result.Converged, result.Reason);
        Assert.Equal(a, result.Root, 1e-14);
        Assert.InRange(result.Iterations, 1, 20);
    }

    [Fact]
    public void Solve_NoSignChange_ReportsStatusWithoutThrowing()
    {
        var result = SafeguardedNewton.Solve(new CoshEquals(0.5), Bracket.Checked(-1, 1), 0.3, Tight);
        Assert.Equal(SolveStatus.NoSignChange, result.Status);
        Assert.False(result.Converged);
        Assert.Equal(2, result.Evaluations);
    }

    [Fact]
    public void Solve_IterationCap_ReportsCapWithBestIterate()
    {
        var result = SafeguardedNewton.Solve(new CoshEquals(12.5), Bracket.Checked(0, 20), 19.0, new SolverOptions(0, 1e-15, 0, 2));
        Assert.Equal(SolveStatus.IterationCapReached, result.Status);
        Assert.Equal(2, result.Iterations);
        Assert.True(result.Lower <= Math.Acosh(12.5) && Math.Acosh(12.5) <= result.Upper);
    }

    [Fact]
    public void Solve_NonFiniteInside_ReportsNonFinite()
    {
        var result = SafeguardedNewton.Solve(new PowerLaw(2.0), Bracket.Checked(-1.0, 3.0), -0.5, Tight);
        // (-0.5)^(5/3) is NaN in IEEE arithmetic: the solve stops and says so rather than iterating on garbage.
        Assert.Equal(SolveStatus.NonFiniteValue, result.Status);
    }

    [Fact]
    public void Solve_InvalidInterval_Throws()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => SafeguardedNewton.Solve(new CoshEquals(2), Bracket.Checked(1, 1), 1, Tight));
        Assert.Throws<ArgumentOutOfRangeException>(() => SafeguardedNewton.Solve(new CoshEquals(2), Bracket.Checked(double.NaN, 1), 1, Tight));
        Assert.Throws<ArgumentOutOfRangeException>(() => SafeguardedNewton.Solve(new CoshEquals(2), Bracket.Checked(0, 3), 1, new SolverOptions(0, -1, 0, 10)));
    }

    [Fact]
    public void Solve_TraceRecordsEveryIteration_WithBracketShrinking()
    {
        var trace = new SolverTrace();
        var result = SafeguardedNewton.Solve(new CoshEquals(3.3e4), Bracket.Checked(0, 20), 19.5, Tight, trace);
        Assert.Equal(result.Iterations, trace.Steps.Count);
        for (int i = 1; i < trace.Steps.Count; i++)
            Assert.True(trace.Steps[i].Upper - trace.Steps[i].Lower <= trace.Steps[i - 1].Upper - trace.Steps[i - 1].Lower);
        // From 19.5 cosh is steep and Newton stays inside; it never needs more than a few bisections.
        Assert.Contains(trace.Steps, s => s.Kind == StepKind.Newton);
    }

    public static TheoryData<double, double, double> BrentCases => new()
    {
        // (c, lower, upper) for cosh(x) = c; cross-checked with MathNet.Numerics' Brent on the same equation.
        { 1.3, 0.0, 5.0 },
        { 77.0, 0.0, 10.0 },
        { 2.2e6, 1.0, 30.0 },
    };

    [Theory]
    [MemberData(nameof(BrentCases))]
    public void Solve_AgreesWithMathNetBrent(double c, double lower, double upper)
    {
        double brent = Brent.FindRoot(x => Math.Cosh(x) - c, lower, upper, 1e-15, 200);
        var result = SafeguardedNewton.Solve(new CoshEquals(c), Bracket.Checked(lower, upper), 0.5 * (lower + upper), Tight);
        Assert.True(result.Converged);
        Assert.Equal(brent, result.Root, 1e-13 * Math.Max(1, Math.Abs(brent)));
    }
}
