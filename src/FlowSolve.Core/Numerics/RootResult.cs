namespace FlowSolve.Core.Numerics;

/// <summary>
/// The outcome of a root solve: the root, how it was reached, and whether to trust it.
/// </summary>
/// <param name="Root">The best estimate of the root: the last point at which the function was evaluated, or, for
/// <see cref="SolveStatus.ConvergedOnPredictedStep"/>, one Newton step past it.</param>
/// <param name="Iterations">Number of steps taken (Newton or bisection).</param>
/// <param name="Evaluations">Number of function evaluations, bracket ends included when they were checked.</param>
/// <param name="Residual">The function value at the last evaluated point (at <paramref name="Root"/> except after a predicted step).</param>
/// <param name="Lower">Lower end of the final bracket.</param>
/// <param name="Upper">Upper end of the final bracket.</param>
/// <param name="LastStep">The size of the last step taken; for a converged Newton solve, a bound on the error of the root.</param>
/// <param name="Status">Why the solve stopped.</param>
public readonly record struct RootResult(
    double Root,
    int Iterations,
    int Evaluations,
    double Residual,
    double Lower,
    double Upper,
    double LastStep,
    SolveStatus Status)
{
    /// <summary>True when the solve met its step or residual tolerance.</summary>
    public bool Converged => Status.IsConverged();

    /// <summary>A sentence that says why the solve stopped.</summary>
    public string Reason => Status.Reason();
}
