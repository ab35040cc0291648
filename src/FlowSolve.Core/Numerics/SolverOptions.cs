namespace FlowSolve.Core.Numerics;

/// <summary>Tolerances and limits for <see cref="SafeguardedNewton"/>.</summary>
/// <param name="StepAbsoluteTolerance">A step of at most <c>StepAbsoluteTolerance + StepRelativeTolerance * |x|</c> ends the solve as converged.</param>
/// <param name="StepRelativeTolerance">Relative part of the step tolerance.</param>
/// <param name="ResidualTolerance">A function value of at most this magnitude ends the solve as converged; 0 disables the test.</param>
/// <param name="MaxIterations">The iteration cap; the solve never throws when it is reached.</param>
/// <param name="PredictQuadraticConvergence">
/// When true, a Newton step may end the solve before it is evaluated: if the last two steps were Newton steps, the
/// latest is under a tenth of the one before (convergence is clearly superlinear), and the quadratic model
/// e(k+1) = C e(k)^2, with C estimated from those two steps, puts the error after the step below the step tolerance.
/// This saves the one evaluation that would only confirm convergence. Use it only for relations whose quadratic
/// convergence is established (the relation's remarks must say why); the status is then
/// <see cref="SolveStatus.ConvergedOnPredictedStep"/>.
/// </param>
public readonly record struct SolverOptions(
    double StepAbsoluteTolerance,
    double StepRelativeTolerance,
    double ResidualTolerance,
    int MaxIterations,
    bool PredictQuadraticConvergence = false)
{
    /// <summary>
    /// Defaults for a well-scaled problem: a relative step of 4 machine epsilons (about 9e-16) and 100 iterations,
    /// enough for 60 bisections of any double bracket plus Newton steps.
    /// </summary>
    public static SolverOptions Default { get; } = new(0.0, 4 * MachineEpsilon, 0.0, 100);

    /// <summary>Machine epsilon for double, 2^-52: the gap between 1 and the next larger double.</summary>
    public const double MachineEpsilon = 2.220446049250313e-16;

    /// <summary>Throws when a tolerance is negative or NaN, or the cap is not positive.</summary>
    internal void Validate()
    {
        if (!(StepAbsoluteTolerance >= 0) || double.IsInfinity(StepAbsoluteTolerance))
            throw new ArgumentOutOfRangeException(nameof(StepAbsoluteTolerance), StepAbsoluteTolerance, "must be finite and non-negative");
        if (!(StepRelativeTolerance >= 0) || double.IsInfinity(StepRelativeTolerance))
            throw new ArgumentOutOfRangeException(nameof(StepRelativeTolerance), StepRelativeTolerance, "must be finite and non-negative");
        if (!(ResidualTolerance >= 0) || double.IsInfinity(ResidualTolerance))
            throw new ArgumentOutOfRangeException(nameof(ResidualTolerance), ResidualTolerance, "must be finite and non-negative");
        if (StepAbsoluteTolerance == 0 && StepRelativeTolerance == 0 && ResidualTolerance == 0)
            throw new ArgumentOutOfRangeException(nameof(StepRelativeTolerance), "at least one tolerance must be positive");
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(MaxIterations);
    }
}

