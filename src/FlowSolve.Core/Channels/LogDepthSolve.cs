using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>
/// The solve in u = ln y for the open prismatic shapes, where the residual f(u) is increasing with a slope known to lie
/// between two bounds. From the start u0 the root then lies between |f(u0)|/maxSlope and |f(u0)|/minSlope away, on the
/// side the sign of f(u0) says: a bracket that is proved rather than searched for, at no extra evaluation.
/// </summary>
internal static class LogDepthSolve
{
    /// <summary>Tolerances in ln y: 1e-13 is a relative depth error of 1e-13; the residual is a relative error in Q (or in A^3/T).</summary>
    public static readonly SolverOptions Options = new(1e-13, 0.0, 1e-13, 100);

    /// <summary>Tolerances in y for the circle and the surveyed section.</summary>
    public static readonly SolverOptions DepthOptions = new(0.0, 1e-13, 1e-13, 100);

    /// <summary>Solves in u = ln y from <paramref name="start"/>, bracketing the root by the residual's slope bounds.</summary>
    /// <param name="function">The residual in u = ln y.</param>
    /// <param name="start">The starting u.</param>
    /// <param name="minSlope">A lower bound of the residual's slope in u.</param>
    /// <param name="maxSlope">An upper bound of the residual's slope in u.</param>
    /// <param name="trace">Optional per-iteration record: the first Newton step (taken here, from the start) and then
    /// the safeguarded solve's, numbered on from it.</param>
    public static RootResult Solve<T>(in T function, double start, double minSlope, double maxSlope, SolverTrace? trace = null)
        where T : struct, IDifferentiableFunction
    {
        var (f0, d0) = function.Evaluate(start);
        if (!double.IsFinite(f0) || Math.Abs(f0) <= Options.ResidualTolerance)
        {
            trace?.Add(new TraceStep(1, start, f0, d0, 0.0, StepKind.Newton, BisectionReason.None, start, start));
            return new RootResult(start, 0, 1, f0, start, start, 0.0, double.IsFinite(f0) ? SolveStatus.ConvergedOnResidual : SolveStatus.NonFiniteValue);
        }

        // Margins: 3 % inside the near bound and 1e-6 beyond the far one, plus 1e-10 absolute, so rounding in f cannot
        // put the root outside the bracket.
        double magnitude = Math.Abs(f0);
        double near = Math.Max(0.0, 0.97 * magnitude / maxSlope - 1e-10);
        double far = magnitude / minSlope * (1.0 + 1e-6) + 1e-10;
        var bracket = f0 < 0.0
            ? Bracket.KnownIncreasing(start + near, start + far)
            : Bracket.KnownIncreasing(start - far, start - near);
        // The first Newton step from the start lies inside the bracket by the same slope bounds.
        var inner = trace is null ? null : new SolverTrace();
        var result = SafeguardedNewton.Solve(function, bracket, start - f0 / d0, Options, inner);
        if (trace is not null)
        {
            trace.Add(new TraceStep(1, start, f0, d0, -f0 / d0, StepKind.Newton, BisectionReason.None, bracket.Lower, bracket.Upper));
            foreach (var step in inner!.Steps) trace.Add(step with { Iteration = step.Iteration + 1 });
        }
        return result with { Iterations = result.Iterations + 1, Evaluations = result.Evaluations + 1 };
    }
}
