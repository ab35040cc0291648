using System.Globalization;
using FlowSolve.Api.Problems;
using FlowSolve.Core;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Pipes;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Logging.Abstractions;

namespace FlowSolve.Api.Pipes;

/// <summary>What the three pipe calculations share besides their input: the problems that stand instead of an answer,
/// the defect guard around the Core calls, and the equivalent Darcy factor of a Hazen-Williams loss.</summary>
internal static class PipeOutcomes
{
    private const string LoggerName = "FlowSolve.Api.Pipes";
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>hf / ((L/D) V^2/(2g)): the Darcy factor that gives the same friction loss (a definition, not a correlation).</summary>
    public static double EquivalentDarcyFactor(double frictionHeadLoss, in PipeState state, double length) =>
        frictionHeadLoss / (length / state.Diameter * state.VelocityHead);

    /// <summary>The 422 for a status without an answer; null when the status holds one (or is not-converged, which is
    /// answered 200 with converged=false and a warning).</summary>
    public static ProblemHttpResult? NoAnswer(PipeStatus status, double drivingHead, PipeProblem input)
    {
        if (status.HasAnswer() || status == PipeStatus.NotConverged) return null;
        var u = input.Units;
        string detail = status switch
        {
            PipeStatus.NoFlow => string.Create(C,
                $"headLoss - elevationChange is {u.Length(drivingHead):G6} {u.LengthUnit}: the available head does not exceed the elevation rise, so it drives no forward flow through this pipe."),
            _ => status.Reason() + string.Create(C, $" (Reynolds number above {DarcyFriction.MaximumReynolds:0e0} or below {DarcyFriction.MinimumReynolds:G3}), or beyond double precision: check the orders of magnitude of the length, flow and head."),
        };
        return ProblemResults.NoAnswer(status == PipeStatus.NoFlow ? "The head drives no flow." : "No answer inside the friction relations' range.",
            detail, new Dictionary<string, object?> { ["pipeStatus"] = status.Code() });
    }

    public static ProblemHttpResult OutsideRange(double reynolds) =>
        ProblemResults.NoAnswer("No answer inside the friction relations' range.", string.Create(C,
            $"The Reynolds number of this flow is {reynolds:G4}, above {DarcyFriction.MaximumReynolds:0e0}, the largest the friction relations accept."),
            new Dictionary<string, object?> { ["pipeStatus"] = PipeStatus.OutsideRange.Code(), ["reynolds"] = double.IsFinite(reynolds) ? reynolds : null });

    public static ProblemHttpResult BelowRange(double reynolds, PipeProblem input, in PipeGeometry pipe, double flow)
    {
        var u = input.Units;
        double d = pipe.Diameter, g = Physical.StandardGravity;
        // The laminar law written in the flow, finite where f = 64/Re is not: the loss that is left out.
        double laminar = 128.0 * input.Fluid.KinematicViscosity * pipe.Length * flow / (Math.PI * g * d * d * d * d);
        return ProblemResults.NoAnswer("No answer inside the friction relations' range.", string.Create(C,
            $"The Reynolds number of this flow is {reynolds:G4}, below {DarcyFriction.MinimumReynolds:G3}, the smallest the friction relations accept (creeping flow: the friction factor 64/Re would exceed {64 / DarcyFriction.MinimumReynolds:G3}). The laminar friction loss there, 128 nu L Q/(pi g D^4), is {u.Length(laminar):G4} {u.LengthUnit}: negligible for any practical purpose."),
            new Dictionary<string, object?> { ["pipeStatus"] = PipeStatus.OutsideRange.Code(), ["reynolds"] = reynolds });
    }

    /// <summary>Validation runs before every Core call, so a Core argument exception is a FlowSolve defect: logged,
    /// and answered with a 400 naming the field the Core rejected rather than with a 500.</summary>
    public static ValidationProblem DefectGuard(ArgumentException ex, IServiceProvider? services)
    {
        var log = services?.GetService<ILoggerFactory>() ?? NullLoggerFactory.Instance;
        log.CreateLogger(LoggerName).LogError(ex, "Pipe input passed validation but the Core rejected {Parameter}", ex.ParamName);
        string field = ex.ParamName switch
        {
            "elevationRise" => "elevationChange",
            "availableHead" or "allowedHeadLoss" => "headLoss",
            "coefficient" => "hazenWilliamsC",
            "reynolds" => "flow",
            "table" => "sizeTable",
            null => "request",
            var name => name,
        };
        return ProblemResults.BadInput(field, "is outside the range this calculation accepts together with the other inputs");
    }
}
