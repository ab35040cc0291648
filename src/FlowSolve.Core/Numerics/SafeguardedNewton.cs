namespace FlowSolve.Core.Numerics;

/// <summary>
/// Newton's method kept safe by a bracket: the one root finder behind every implicit relation in FlowSolve.
/// </summary>
/// <remarks>
/// <para>Each iteration takes the Newton step x - f/f' unless that step would leave the current bracket,
/// is more than half the size of the step before last (it is not shrinking fast enough, the sign of a cycle
/// or a stall), or meets a zero or non-finite derivative; then it bisects the bracket instead. The bracket
/// shrinks around the root after every evaluation, so the solve ends even where plain Newton cycles or runs
/// away, and Newton's quadratic convergence is kept wherever it is safe. The rule is the classic
/// bracketed Newton-bisection hybrid (Press et al., Numerical Recipes, routine rtsafe).</para>
/// <para>The solve never throws for non-convergence: the status says why it stopped. Exceptions are for misuse
/// only (an empty or non-finite interval, invalid options). Without a trace the solve allocates nothing.</para>
/// </remarks>
public static class SafeguardedNewton
{
    /// <summary>Finds a root of <paramref name="function"/> in <paramref name="bracket"/>, starting from <paramref name="guess"/>.</summary>
    /// <typeparam name="TFunction">A struct implementing <see cref="IDifferentiableFunction"/> (specialised by the JIT; no boxing).</typeparam>
    /// <param name="function">The function, returning value and derivative together.</param>
    /// <param name="bracket">The interval and what is known about the signs at its ends.</param>
    /// <param name="guess">Start point; a point outside the open interval (or NaN) is replaced by the midpoint.</param>
    /// <param name="options">Tolerances and the iteration cap.</param>
    /// <param name="trace">When not null, receives one row per iteration.</param>
    /// <returns>The root with its iterations, evaluations, residual, final bracket and status.</returns>
    /// <exception cref="ArgumentOutOfRangeException">The interval is not finite and non-empty, or the options are invalid.</exception>
    public static RootResult Solve<TFunction>(
        in TFunction function, Bracket bracket, double guess, in SolverOptions options, SolverTrace? trace = null)
        where TFunction : struct, IDifferentiableFunction
    {
        double lo = bracket.Lower, hi = bracket.Upper;
        if (!double.IsFinite(lo) || !double.IsFinite(hi) || !(lo < hi))
            ThrowBadInterval(lo, hi);
        options.Validate();

        int evaluations = 0;
        // The sign of f at the lower end; the bracket update keeps f(lo) on this side of zero.
        double lowerSign;
        switch (bracket.Kind)
        {
            case BracketKind.KnownIncreasing:
                lowerSign = -1.0;
                break;
            case BracketKind.KnownDecreasing:
                lowerSign = 1.0;
                break;
            case BracketKind.BoundsOnly:
                lowerSign = 0.0;
                break;
            default:
            {
                double fLo = function.Evaluate(lo).Value;
                double fHi = function.Evaluate(hi).Value;
                evaluations = 2;
                if (!double.IsFinite(fLo))
                    return new RootResult(lo, 0, evaluations, fLo, lo, hi, 0.0, SolveStatus.NonFiniteValue);
                if (!double.IsFinite(fHi))
                    return new RootResult(hi, 0, evaluations, fHi, lo, hi, 0.0, SolveStatus.NonFiniteValue);
                if (fLo == 0.0)
                    return new RootResult(lo, 0, evaluations, 0.0, lo, lo, 0.0, SolveStatus.ConvergedOnResidual);
                if (fHi == 0.0)
                    return new RootResult(hi, 0, evaluations, 0.0, hi, hi, 0.0, SolveStatus.ConvergedOnResidual);
                if (Math.Sign(fLo) == Math.Sign(fHi))
                {
                    // Report the end nearer to zero; nothing inside is known to be a root.
                    return Math.Abs(fLo) <= Math.Abs(fHi)
                        ? new RootResult(lo, 0, evaluations, fLo, lo, hi, 0.0, SolveStatus.NoSignChange)
                        : new RootResult(hi, 0, evaluations, fHi, lo, hi, 0.0, SolveStatus.NoSignChange);
                }
                lowerSign = Math.Sign(fLo);
                break;
            }
        }

        bool bracketed = lowerSign != 0.0;
        double x = guess > lo && guess < hi ? guess : lo + 0.5 * (hi - lo);
        var (fx, dfx) = function.Evaluate(x);
        evaluations++;

        // Sizes of the last two steps; initialised to the interval width so the first Newton step is not
        // mistaken for a stall (the same start as rtsafe).
        double previousStep = hi - lo, stepBeforeLast = hi - lo;
        bool previousWasNewton = false;

        for (int iteration = 1; ; iteration++)
        {
            if (!double.IsFinite(fx))
                return new RootResult(x, iteration - 1, evaluations, fx, lo, hi, Math.Abs(previousStep), SolveStatus.NonFiniteValue);
            if (fx == 0.0 || Math.Abs(fx) <= options.ResidualTolerance)
                return new RootResult(x, iteration - 1, evaluations, fx, lo, hi, Math.Abs(previousStep), SolveStatus.ConvergedOnResidual);
            if (iteration > options.MaxIterations)
                return new RootResult(x, iteration - 1, evaluations, fx, lo, hi, Math.Abs(previousStep), SolveStatus.IterationCapReached);

            if (bracketed)
            {
                if ((fx < 0.0) == (lowerSign < 0.0)) lo = x;
                else hi = x;
            }

            double tolerance = options.StepAbsoluteTolerance + options.StepRelativeTolerance * Math.Abs(x);
            if (bracketed && hi - lo <= 2.0 * tolerance)
            {
                // The root is pinned between lo and hi and x is one of them: done whatever the next step would be.
                trace?.Add(new TraceStep(iteration, x, fx, dfx, 0.0, StepKind.Bisection, BisectionReason.None, lo, hi));
                return new RootResult(x, iteration, evaluations, fx, lo, hi, hi - lo, SolveStatus.ConvergedOnStep);
            }

            StepKind kind = StepKind.Newton;
            BisectionReason why = BisectionReason.None;
            double next;
            if (dfx == 0.0 || !double.IsFinite(dfx))
            {
                why = BisectionReason.BadDerivative;
                next = double.NaN;
            }
            else
            {
                double newtonStep = fx / dfx;
                next = x - newtonStep;
                if (Math.Abs(newtonStep) <= tolerance)
                {
                    // Converged: test this before the bracket, because a step below the spacing of doubles can
                    // round onto the bracket end that x itself is, which would look like leaving the bracket.
                    trace?.Add(new TraceStep(iteration, x, fx, dfx, -newtonStep, StepKind.Newton, BisectionReason.None, lo, hi));
                    return new RootResult(x, iteration, evaluations, fx, lo, hi, Math.Abs(newtonStep), SolveStatus.ConvergedOnStep);
                }
                if (!(next > lo && next < hi))
                    why = BisectionReason.LeftBracket;
                else if (bracketed && Math.Abs(newtonStep) > 0.5 * Math.Abs(stepBeforeLast))
                    why = BisectionReason.Stalled;
            }

            if (why != BisectionReason.None)
            {
                kind = StepKind.Bisection;
                if (bracketed)
                {
                    next = lo + 0.5 * (hi - lo);
                }
                else
                {
                    // Bounds only: cut the step back to halfway between x and the bound it was heading for.
                    double bound = double.IsNaN(next) || next >= hi ? hi : lo;
                    if (why == BisectionReason.BadDerivative) bound = x - lo > hi - x ? lo : hi;
                    next = x + 0.5 * (bound - x);
                }
            }

            double step = next - x;
            trace?.Add(new TraceStep(iteration, x, fx, dfx, step, kind, why, lo, hi));

            if (options.PredictQuadraticConvergence && kind == StepKind.Newton && previousWasNewton
                && Math.Abs(step) <= 0.1 * Math.Abs(previousStep))
            {
                // e(k+1) ~ C e(k)^2 with C ~ |step| / previousStep^2; the error left after this step is C step^2, and
                // C step^2 <= tolerance is tested as |step|^3 <= tolerance previousStep^2 to keep a division off the path.
                double a = Math.Abs(step);
                if (a * a * a <= tolerance * previousStep * previousStep)
                    return new RootResult(next, iteration, evaluations, fx, lo, hi, Math.Abs(step), SolveStatus.ConvergedOnPredictedStep);
            }
            previousWasNewton = kind == StepKind.Newton;
            stepBeforeLast = previousStep;
            previousStep = step;

            if (Math.Abs(step) <= tolerance)
            {
                // For a Newton step, |step| estimates the error of x to first order; x is returned with its own
                // residual rather than an unevaluated x + step.
                return new RootResult(x, iteration, evaluations, fx, lo, hi, Math.Abs(step), SolveStatus.ConvergedOnStep);
            }

            x = next;
            (fx, dfx) = function.Evaluate(x);
            evaluations++;
        }
    }

    private static void ThrowBadInterval(double lower, double upper) =>
        throw new ArgumentOutOfRangeException(nameof(Bracket),
            $"the interval [{lower}, {upper}] must be finite with lower < upper");
}
