namespace FlowSolve.Core.Numerics;

/// <summary>Why a root solve stopped.</summary>
public enum SolveStatus
{
    /// <summary>The last step (Newton or bisection) was smaller than the step tolerance.</summary>
    ConvergedOnStep,

    /// <summary>The function value fell to or below the residual tolerance.</summary>
    ConvergedOnResidual,

    /// <summary>
    /// Quadratic convergence predicted that the last Newton step, taken but not evaluated, leaves an error below the
    /// step tolerance (see <see cref="SolverOptions.PredictQuadraticConvergence"/>). The root is one step past the
    /// last evaluated point, so the reported residual (at that point) overstates the root's own.
    /// </summary>
    ConvergedOnPredictedStep,

    /// <summary>The iteration cap was reached before either tolerance was met; the best iterate is returned.</summary>
    IterationCapReached,

    /// <summary>The function has the same sign at both ends of the bracket, so no root is known to lie inside it.</summary>
    NoSignChange,

    /// <summary>The function returned NaN or an infinity at a point inside the bracket.</summary>
    NonFiniteValue,

    /// <summary>No iteration ran: the value comes from a closed-form (explicit) relation, such as the laminar law
    /// f = 64/Re or an explicit friction approximation, and is exact for that relation. Added after the other codes, so
    /// their numeric values and wire codes are unchanged.</summary>
    ClosedForm,
}

/// <summary>Human-readable reasons for <see cref="SolveStatus"/> values (static strings; no allocation).</summary>
public static class SolveStatusExtensions
{
    /// <summary>A sentence that says why the solve stopped.</summary>
    public static string Reason(this SolveStatus status) => status switch
    {
        SolveStatus.ConvergedOnStep => "converged: the last step was below the step tolerance",
        SolveStatus.ConvergedOnResidual => "converged: the residual was below the residual tolerance",
        SolveStatus.ConvergedOnPredictedStep => "converged: quadratic convergence puts the error after the last Newton step below the step tolerance",
        SolveStatus.IterationCapReached => "stopped: the iteration cap was reached before convergence",
        SolveStatus.NoSignChange => "stopped: the function has the same sign at both ends of the bracket",
        SolveStatus.NonFiniteValue => "stopped: the function returned a non-finite value",
        SolveStatus.ClosedForm => "exact: a closed-form relation gave the value; no iteration was needed",
        _ => "unknown",
    };

    /// <summary>A stable kebab-case code for the status, for wire formats.</summary>
    public static string Code(this SolveStatus status) => status switch
    {
        SolveStatus.ConvergedOnStep => "converged-on-step",
        SolveStatus.ConvergedOnResidual => "converged-on-residual",
        SolveStatus.ConvergedOnPredictedStep => "converged-on-predicted-step",
        SolveStatus.IterationCapReached => "iteration-cap-reached",
        SolveStatus.NoSignChange => "no-sign-change",
        SolveStatus.NonFiniteValue => "non-finite-value",
        SolveStatus.ClosedForm => "closed-form",
        _ => "unknown",
    };

    /// <summary>True for the converged statuses and for a closed-form value.</summary>
    public static bool IsConverged(this SolveStatus status) =>
        status is SolveStatus.ConvergedOnStep or SolveStatus.ConvergedOnResidual or SolveStatus.ConvergedOnPredictedStep
            or SolveStatus.ClosedForm;
}
