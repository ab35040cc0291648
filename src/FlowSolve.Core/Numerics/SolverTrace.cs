namespace FlowSolve.Core.Numerics;

/// <summary>How one iteration moved the iterate.</summary>
public enum StepKind
{
    /// <summary>A Newton step x - f/f'.</summary>
    Newton,

    /// <summary>A bisection of the current bracket, taken because the Newton step was unsafe.</summary>
    Bisection,
}

/// <summary>Why a bisection replaced a Newton step.</summary>
public enum BisectionReason
{
    /// <summary>No bisection: the Newton step was taken.</summary>
    None,

    /// <summary>The Newton step would have left the bracket.</summary>
    LeftBracket,

    /// <summary>The Newton step was not shrinking fast enough (more than half the step before it).</summary>
    Stalled,

    /// <summary>The derivative was zero or non-finite.</summary>
    BadDerivative,
}

/// <summary>One row of a solver trace: the point evaluated and the step taken from it.</summary>
/// <param name="Iteration">1-based iteration number.</param>
/// <param name="X">The iterate at which the function was evaluated.</param>
/// <param name="Value">f(x).</param>
/// <param name="Derivative">f'(x).</param>
/// <param name="Step">The step taken from <paramref name="X"/> to the next iterate.</param>
/// <param name="Kind">Newton or bisection.</param>
/// <param name="Why">Why a bisection was taken, or <see cref="BisectionReason.None"/>.</param>
/// <param name="Lower">Lower end of the bracket after this evaluation.</param>
/// <param name="Upper">Upper end of the bracket after this evaluation.</param>
public readonly record struct TraceStep(
    int Iteration, double X, double Value, double Derivative, double Step,
    StepKind Kind, BisectionReason Why, double Lower, double Upper);

/// <summary>
/// A per-iteration record of a solve, filled only when the caller passes one in
/// (the solve without a trace allocates nothing).
/// </summary>
public sealed class SolverTrace
{
    private readonly List<TraceStep> _steps = new();

    /// <summary>The iterations in order.</summary>
    public IReadOnlyList<TraceStep> Steps => _steps;

    internal void Add(in TraceStep step) => _steps.Add(step);

    /// <summary>Removes every recorded step so the trace can be reused.</summary>
    public void Clear() => _steps.Clear();
}
