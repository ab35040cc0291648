using FlowSolve.Core;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Api.Contracts;

/// <summary>A warning: a stable code to switch on and a sentence for the engineer.</summary>
/// <param name="Code">Stable kebab-case identifier, for example <c>transitional-flow</c>.</param>
/// <param name="Message">What it means for this result.</param>
public sealed record WarningDto(string Code, string Message)
{
    public static WarningDto From(CalculationWarning w) => new(w.Code, w.Message);
}

/// <summary>A default that was applied because the request did not give the field.</summary>
/// <param name="Field">The request field that was defaulted.</param>
/// <param name="Value">The value used, as text.</param>
/// <param name="Message">Why, and where the default comes from.</param>
public sealed record AssumptionDto(string Field, string Value, string Message);

/// <summary>One correlation's published range for one input, and whether the input lies inside it.</summary>
/// <param name="Method">Correlation identifier.</param>
/// <param name="Quantity">The input the range applies to.</param>
/// <param name="Minimum">Lower end (inclusive).</param>
/// <param name="Maximum">Upper end (inclusive); null when the range is open above.</param>
/// <param name="Value">The input as used, in the response's units.</param>
/// <param name="InRange">True when the value lies in the range.</param>
/// <param name="Source">The publication that states the range.</param>
public sealed record ValidityDto(string Method, string Quantity, double Minimum, double? Maximum, double Value, bool InRange, string Source)
{
    public static ValidityDto From(ValidityCheck v) =>
        new(v.Method, v.Quantity, v.Minimum, double.IsPositiveInfinity(v.Maximum) ? null : v.Maximum, v.Value, v.InRange, v.Source);
}

/// <summary>One solver iteration, returned when <c>trace=true</c>.</summary>
/// <param name="Iteration">1-based iteration number.</param>
/// <param name="X">The iterate, in the solve variable named by the response's <c>solveVariable</c>.</param>
/// <param name="Residual">The equation's residual at the iterate.</param>
/// <param name="Derivative">The residual's derivative at the iterate.</param>
/// <param name="Step">The step taken from this iterate.</param>
/// <param name="Kind"><c>newton</c> or <c>bisection</c>.</param>
/// <param name="BisectionReason">Why a bisection replaced the Newton step: <c>left-bracket</c>, <c>stalled</c>, <c>bad-derivative</c>, or null.</param>
/// <param name="Lower">Bracket lower end after this evaluation.</param>
/// <param name="Upper">Bracket upper end after this evaluation.</param>
public sealed record TraceStepDto(int Iteration, double X, double Residual, double Derivative, double Step, string Kind,
    string? BisectionReason, double Lower, double Upper)
{
    public static TraceStepDto From(TraceStep s) => new(s.Iteration, s.X, s.Value, s.Derivative, s.Step,
        s.Kind == StepKind.Newton ? "newton" : "bisection",
        s.Why switch
        {
            Core.Numerics.BisectionReason.LeftBracket => "left-bracket",
            Core.Numerics.BisectionReason.Stalled => "stalled",
            Core.Numerics.BisectionReason.BadDerivative => "bad-derivative",
            _ => null,
        }, s.Lower, s.Upper);

    public static IReadOnlyList<TraceStepDto>? From(SolverTrace? trace) =>
        trace is null ? null : trace.Steps.Select(From).ToArray();
}
