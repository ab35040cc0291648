using System.Runtime.CompilerServices;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Friction;

/// <summary>The exact Colebrook-White friction factor, with its derivatives, solved by <see cref="SafeguardedNewton"/>.</summary>
/// <remarks>The derivatives are computed when read, so a caller that wants only the factor does not pay their three
/// divisions.</remarks>
public readonly struct ColebrookResult
{
    private const double TwoOverLn10 = 0.86858896380650365530;
    private readonly double _reynolds, _relativeRoughness;

    internal ColebrookResult(double frictionFactor, int iterations, int evaluations, double residual, SolveStatus status,
        double reynolds, double relativeRoughness)
    {
        FrictionFactor = frictionFactor;
        Iterations = iterations;
        Evaluations = evaluations;
        Residual = residual;
        Status = status;
        _reynolds = reynolds;
        _relativeRoughness = relativeRoughness;
    }

    /// <summary>Darcy friction factor f (dimensionless).</summary>
    public double FrictionFactor { get; }

    /// <summary>Newton (or bisection) steps taken.</summary>
    public int Iterations { get; }

    /// <summary>Evaluations of the equation.</summary>
    public int Evaluations { get; }

    /// <summary>Residual of the equation in the solve variable x = 1/sqrt(f) at the last evaluated iterate; when the solve
    /// ends on a predicted step (the usual case) the returned factor lies one Newton step further and its own residual is
    /// far smaller: <see cref="ColebrookWhite.Residual"/> evaluates it.</summary>
    public double Residual { get; }

    /// <summary>Why the solve stopped.</summary>
    public SolveStatus Status { get; }

    /// <summary>True when the solve converged.</summary>
    public bool Converged => Status.IsConverged();

    /// <summary>df/dRe at the solution, by implicit differentiation of the equation.</summary>
    public double DerivativeReynolds => Derivatives().Reynolds;

    /// <summary>df/d(e/D) at the solution, by implicit differentiation of the equation.</summary>
    public double DerivativeRelativeRoughness => Derivatives().RelativeRoughness;

    /// <summary>Both derivatives at once: implicit differentiation of g(x, Re, r) = x + 2 log10(r/3.7 + 2.51 x/Re) = 0,
    /// dx/dp = -g_p / g_x, with df/dx = -2/x^3.</summary>
    public (double Reynolds, double RelativeRoughness) Derivatives()
    {
        double f = FrictionFactor;
        double x = 1.0 / Math.Sqrt(f);
        double invReynolds = 1.0 / _reynolds;
        double invA = 1.0 / (_relativeRoughness * (1.0 / 3.7) + 2.51 * x * invReynolds);
        double gx = 1.0 + TwoOverLn10 * 2.51 * invReynolds * invA;
        double scale = 2.0 * f / (x * gx);           // -(df/dx) / g_x
        double gRe = -TwoOverLn10 * 2.51 * x * invReynolds * invReynolds * invA;
        double gR = TwoOverLn10 * (1.0 / 3.7) * invA;
        return (scale * gRe, scale * gR);
    }
}

/// <summary>
/// The Colebrook-White equation 1/sqrt(f) = -2 log10( (e/D)/3.7 + 2.51/(Re sqrt(f)) ), solved exactly.
/// </summary>
/// <remarks>
/// <para>The equation is solved in x = 1/sqrt(f), in which it reads g(x) = x + 2 log10(r/3.7 + 2.51 x/Re) = 0:
/// g rises strictly (g' &gt; 1) and is concave, so Newton converges quadratically from any start below the
/// root and the bracket never has to intervene in practice. The start is x = 8; from there four or five Newton steps reach the
/// rounding floor (about 1e-16 relative) anywhere in the turbulent range.</para>
/// <para>Convergence is quadratic with a small constant: the Newton error obeys e(k+1) = C e(k)^2 with
/// C = |g''| / (2 g') = (2/ln 10)(2.51/Re)^2 / (2 a (a + (2/ln 10) 2.51/Re)), a = r/3.7 + 2.51 x/Re, which is at most
/// 0.87 / (2 x (x + 0.87)) &lt; 0.03 for x &gt; 3.7 (every turbulent case). The solve therefore stops on a predicted step
/// (<see cref="SolverOptions.PredictQuadraticConvergence"/>) and skips the evaluation that would only confirm it.</para>
/// <para>The bracket [0.5, 50] is known to hold the root without evaluating its ends whenever
/// 2000 &lt;= Re &lt;= 1e25 and 0 &lt;= e/D &lt;= 1: g(0.5) &lt;= 0.5 + 2 log10(1/3.7 + 1.255/2000) &lt; 0, and
/// g(50) &gt;= 50 + 2 log10(125.5/Re) &gt; 0. Outside that domain the ends are checked.</para>
/// <para>Validity: 4000 &lt; Re &lt; 1e8 and 0 &lt;= e/D &lt;= 0.05 (Praks and Brkic 2018, Adv. Civ. Eng. 5451034,
/// citing the usual range of the Moody chart). The relation is Colebrook (1939), J. Inst. Civ. Eng. 11(4).</para>
/// </remarks>
public static partial class ColebrookWhite
{
    /// <summary>2/ln(10): converts a natural logarithm to twice a decimal one.</summary>
    private const double TwoOverLn10 = 0.86858896380650365530;

    /// <summary>Relative step tolerance in x = 1/sqrt(f): 2e-15 gives f to better than 1e-14 relative.</summary>
    public const double RelativeTolerance = 2e-15;

    /// <summary>The iteration cap. Inside the stated range the solve needs at most 5 steps.</summary>
    public const int MaxIterations = 60;

    /// <summary>
    /// The start x = 8 (f about 0.016), mid-way through the turbulent range of x (about 3.7 to 13). Newton's first step from
    /// it costs the one logarithm that a fixed-point sweep from 8 would, and lands nearer the root, because the tangent
    /// of the concave g is a better model than g' = 1.
    /// </summary>
    private const double Start = 8.0;

    private static readonly SolverOptions Options = new(0.0, RelativeTolerance, 0.0, MaxIterations, PredictQuadraticConvergence: true);

    /// <summary>Solves Colebrook-White for the Darcy friction factor.</summary>
    /// <param name="reynolds">Reynolds number Re = V D / nu; finite and positive. The equation is meant for Re &gt; 4000.</param>
    /// <param name="relativeRoughness">Relative roughness e/D; finite, 0 (smooth) or more, and below 1.</param>
    /// <param name="trace">Optional per-iteration record (allocates; omit on hot paths).</param>
    /// <returns>The friction factor with iterations, residual, status and derivatives.</returns>
    /// <exception cref="ArgumentOutOfRangeException">An argument is non-finite or outside the stated domain.</exception>
    public static ColebrookResult Solve(double reynolds, double relativeRoughness, SolverTrace? trace = null)
    {
        if (!(reynolds > 0) || !double.IsFinite(reynolds) || !(relativeRoughness >= 0) || !(relativeRoughness < 1))
            ThrowArguments(reynolds, relativeRoughness);

        var equation = new Equation(reynolds, relativeRoughness);
        Bracket bracket = reynolds is >= 2000 and <= 1e25
            ? Bracket.KnownIncreasing(0.5, 50.0)
            : Bracket.Checked(0.01, 1e3);
        RootResult root = SafeguardedNewton.Solve(in equation, bracket, Start, in Options, trace);

        double x = root.Root;
        return new ColebrookResult(1.0 / (x * x), root.Iterations, root.Evaluations, root.Residual, root.Status,
            reynolds, relativeRoughness);
    }

    /// <summary>The residual of Colebrook-White at a given friction factor, in the solve variable 1/sqrt(f).</summary>
    /// <param name="frictionFactor">A candidate Darcy friction factor.</param>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    public static double Residual(double frictionFactor, double reynolds, double relativeRoughness)
    {
        double x = 1.0 / Math.Sqrt(frictionFactor);
        return x + 2.0 * Math.Log10(relativeRoughness / 3.7 + 2.51 * x / reynolds);
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private static void ThrowArguments(double reynolds, double relativeRoughness)
    {
        if (!(reynolds > 0) || !double.IsFinite(reynolds))
            throw new ArgumentOutOfRangeException(nameof(reynolds), reynolds, "must be finite and positive");
        throw new ArgumentOutOfRangeException(nameof(relativeRoughness), relativeRoughness, "must be in [0, 1)");
    }

    /// <summary>g(x) = x + 2 log10(r/3.7 + 2.51 x / Re) and g'(x).</summary>
    private readonly struct Equation(double reynolds, double relativeRoughness) : IDifferentiableFunction
    {
        private readonly double _c = 2.51 / reynolds;
        private readonly double _r = relativeRoughness / 3.7;

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public (double Value, double Derivative) Evaluate(double x)
        {
            double a = _r + _c * x;
            return (x + TwoOverLn10 * Math.Log(a), 1.0 + TwoOverLn10 * _c / a);
        }
    }
}
