using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;
using System.ComponentModel;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Pipes;

/// <summary>Pipe sizing: <c>GET|POST /v1/pipes/head-loss</c>, <c>/flow</c>, <c>/diameter</c>, and the tables
/// (<c>GET /v1/pipes/sizes</c>, <c>/materials</c>, <c>/fittings</c>).</summary>
public static class PipeEndpoints
{
    private const string LoggerName = "FlowSolve.Api.Pipes";
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public static IEndpointRouteBuilder MapPipeEndpoints(this IEndpointRouteBuilder routes)
    {
        var group = routes.MapGroup("/v1/pipes").WithTags("Pipes");
        // The calculations answer 422 for a well-formed problem without an answer; ProblemHttpResult does not say so itself.
        var calculations = group.MapGroup("").ProducesProblem(StatusCodes.Status422UnprocessableEntity);

        calculations.MapGet("/head-loss", ([AsParameters] PipeHeadLossRequest request, ILoggerFactory log,
                [FromQuery(Name = "sensitivities"), Description(SensitivityDocs.Parameter)] bool? sensitivities) => HeadLoss(request, log, sensitivities == true))
            .WithName("GetPipeHeadLoss")
            .WithSummary("Head loss of a pipe at a flow (query parameters)")
            .WithDescription(PipeDocs.HeadLoss)
            .WithQueryExample(("flow", "0.2"), ("diameter", "0.2"), ("length", "500"), ("material", "cast-iron"),
                ("kinematicViscosity", "1e-5"), ("density", "900"), ("fittings", "elbow-90-flanged-regular:3,gate-valve-open:1"))
            .AsCalculation("pipes/head-loss", "headLoss");
        calculations.MapPost("/head-loss", (PipeHeadLossRequest request, ILoggerFactory log,
                [FromQuery(Name = "sensitivities"), Description(SensitivityDocs.Parameter)] bool? sensitivities) => HeadLoss(request, log, sensitivities == true))
            .WithName("PostPipeHeadLoss")
            .WithSummary("Head loss of a pipe at a flow (JSON body)")
            .WithDescription(PipeDocs.HeadLoss)
            .WithBodyExample(new PipeHeadLossRequest(Flow: 0.05, Diameter: 0.2, Length: 1200, Material: "cast-iron",
                Fittings: [new("elbow-90-flanged-regular", 4), new("gate-valve-open", 2)], ElevationChange: 8, Temperature: 15))
            .AsCalculation("pipes/head-loss", "headLoss");

        calculations.MapGet("/flow", ([AsParameters] PipeFlowRequest request, ILoggerFactory log,
                [FromQuery(Name = "sensitivities"), Description(SensitivityDocs.Parameter)] bool? sensitivities) => Flow(request, log, sensitivities == true))
            .WithName("GetPipeFlow")
            .WithSummary("Flow through a pipe from the available head (query parameters)")
            .WithDescription(PipeDocs.Flow)
            .WithQueryExample(("headLoss", "20"), ("diameter", "0.15"), ("length", "800"), ("roughness", "0.000045"),
                ("elevationChange", "5"), ("temperature", "10"))
            .AsCalculation("pipes/flow", "flow");
        calculations.MapPost("/flow", (PipeFlowRequest request, ILoggerFactory log,
                [FromQuery(Name = "sensitivities"), Description(SensitivityDocs.Parameter)] bool? sensitivities) => Flow(request, log, sensitivities == true))
            .WithName("PostPipeFlow")
            .WithSummary("Flow through a pipe from the available head (JSON body)")
            .WithDescription(PipeDocs.Flow)
            .WithBodyExample(new PipeFlowRequest(HeadLoss: 30, Diameter: 0.5, Length: 3000, Roughness: 0.0003,
                MinorLossCoefficient: 2.5, Method: "hazen-williams", HazenWilliamsC: 120, Temperature: 15))
            .AsCalculation("pipes/flow", "flow");

        calculations.MapGet("/diameter", ([AsParameters] PipeDiameterRequest request, ILoggerFactory log,
                [FromQuery(Name = "sensitivities"), Description(SensitivityDocs.Parameter)] bool? sensitivities) => Diameter(request, log, sensitivities == true))
            .WithName("GetPipeDiameter")
            .WithSummary("Minimum diameter, and the smallest listed size, for a flow within an allowed head loss (query parameters)")
            .WithDescription(PipeDocs.Diameter)
            .WithQueryExample(("flow", "0.03"), ("headLoss", "6"), ("length", "400"), ("material", "commercial-steel"),
                ("sizeTable", "asme-b36.10m-schedule-40"))
            .AsCalculation("pipes/diameter", "diameter");
        calculations.MapPost("/diameter", (PipeDiameterRequest request, ILoggerFactory log,
                [FromQuery(Name = "sensitivities"), Description(SensitivityDocs.Parameter)] bool? sensitivities) => Diameter(request, log, sensitivities == true))
            .WithName("PostPipeDiameter")
            .WithSummary("Minimum diameter, and the smallest listed size, for a flow within an allowed head loss (JSON body)")
            .WithDescription(PipeDocs.Diameter)
            .WithBodyExample(new PipeDiameterRequest(Flow: 250, HeadLoss: 20, Length: 2000, Material: "commercial-steel",
                MinorLossCoefficient: 3, SizeTable: "asme-b36.10m-schedule-40", Units: "us", FlowUnit: "gpm"))
            .AsCalculation("pipes/diameter", "diameter");

        group.MapPipeTableEndpoints();

        var logs = routes.ServiceProvider.GetRequiredService<ILoggerFactory>();
        routes.AddCalculation<PipeHeadLossRequest, PipeHeadLossResponse>("pipes/head-loss", "headLoss", r => HeadLoss(r, logs));
        routes.AddCalculation<PipeFlowRequest, PipeFlowResponse>("pipes/flow", "flow", r => Flow(r, logs));
        routes.AddCalculation<PipeDiameterRequest, PipeDiameterResponse>("pipes/diameter", "diameter", r => Diameter(r, logs));
        return routes;
    }

    public static Results<Ok<PipeHeadLossResponse>, ValidationProblem, ProblemHttpResult> HeadLoss(PipeHeadLossRequest request, ILoggerFactory log,
        bool sensitivities = false)
    {
        var errors = new FieldErrors();
        var input = PipeInput.Read(request, errors);
        double flow = input.ReadFlow(errors, request.Flow);
        double diameter = input.ReadDiameter(errors, request.Diameter);
        if (errors.Any) return ProblemResults.BadInput(errors);

        var pipe = new PipeGeometry(input.Length, diameter, input.Roughness, input.MinorLossCoefficient);
        // The friction relations take Reynolds numbers up to 1e15: a pipe beyond it is well formed but has no answer.
        double velocity = flow / pipe.Area;
        double reynolds = velocity * diameter / input.Fluid.KinematicViscosity;
        if (!(reynolds <= DarcyFriction.MaximumReynolds)) return OutsideRange(reynolds);
        // Below the smallest Reynolds number they accept, f = 64/Re overflows (5e-324 m3/s, say): a 422 that says so.
        if (!(reynolds >= DarcyFriction.MinimumReynolds)) return BelowRange(reynolds, input, pipe, flow);

        try
        {
            var result = PipeHeadLoss.Compute(pipe, input.Fluid, flow, input.ElevationRise);
            var s = result.State;
            var u = input.Units;
            double residual = s.Relation == FrictionMethodInfo.ColebrookWhite.Code
                ? ColebrookWhite.Residual(s.FrictionFactor, s.Reynolds, s.RelativeRoughness) : 0.0; // at the answer itself
            var validity = s.Validity().Select(input.Validity).ToList();

            if (!input.HazenWilliams)
            {
                var dw = new PipeHeadLossResponse(
                    u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss), u.Length(s.MinorHeadLoss), input.Pressure(result.PressureDrop),
                    u.Length(result.ElevationRise), u.Length(result.TotalHead), input.Pressure(result.TotalPressureDifference),
                    input.FlowUnit.FromSi(s.Flow), u.Length(s.Diameter), u.Velocity(s.Velocity), u.Length(s.VelocityHead),
                    s.Reynolds, s.RelativeRoughness, s.FrictionFactor, PipeInput.RegimeCode(s.Regime), s.Relation,
                    u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                    u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                    result.Iterations, result.Converged, residual, result.Status.Code(), input.MethodCode, u.Code, input.FlowUnit.Code,
                    validity, PipeInput.Warnings(result.DescribeWarnings()), input.Assumptions, null);
                if (sensitivities && result.Converged)
                {
                    var spread = PipeSensitivityTables.Spread("headLoss", input, e =>
                        e < diameter ? u.Length(PipeHeadLoss.Compute(pipe with { Roughness = e }, input.Fluid, flow, input.ElevationRise).HeadLoss) : null);
                    dw = dw with
                    {
                        Sensitivities = PipeSensitivityTables.Build(PipeSensitivityTables.Problem.HeadLoss,
                            PipeSensitivity.HeadLoss(s, input.Length, input.Fluid.KinematicViscosity), s, input, 0),
                        RoughnessSpread = spread,
                        Warnings = PipeSensitivityTables.With(dw.Warnings, PipeSensitivityTables.SpreadWarning(input, spread)),
                    };
                }
                return TypedResults.Ok(dw);
            }

            var hw = HazenWilliams.HeadLoss(pipe, input.Fluid, flow, input.HazenWilliamsC);
            double? rhoG = input.Fluid.Density * Physical.StandardGravity;
            double total = hw.HeadLoss + input.ElevationRise;
            validity.InsertRange(0, hw.Validity().Select(input.Validity));
            var comparison = new DarcyWeisbachComparisonDto("headLoss", u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss),
                input.FlowUnit.FromSi(s.Flow), u.Velocity(s.Velocity), s.Reynolds, s.FrictionFactor, PipeInput.RegimeCode(s.Regime),
                result.Status.Code(), result.Iterations, u.Length(hw.Difference), hw.RelativeDifference * 100);
            var hwResponse = new PipeHeadLossResponse(
                u.Length(hw.HeadLoss), u.Length(hw.FrictionHeadLoss), u.Length(hw.MinorHeadLoss), input.Pressure(rhoG * hw.HeadLoss),
                u.Length(input.ElevationRise), u.Length(total), input.Pressure(rhoG * total),
                input.FlowUnit.FromSi(hw.Flow), u.Length(hw.Diameter), u.Velocity(hw.Velocity), u.Length(s.VelocityHead),
                s.Reynolds, s.RelativeRoughness, EquivalentDarcyFactor(hw.FrictionHeadLoss, s, input.Length),
                PipeInput.RegimeCode(s.Regime), "hazen-williams",
                u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                0, true, 0.0, PipeStatus.Solved.Code(), input.MethodCode, u.Code, input.FlowUnit.Code,
                validity, PipeInput.Warnings(hw.DescribeWarnings()), input.Assumptions, comparison);
            if (sensitivities) hwResponse = hwResponse with { Warnings = PipeSensitivityTables.With(hwResponse.Warnings, PipeSensitivityTables.HazenWilliams) };
            return TypedResults.Ok(hwResponse);
        }
        catch (ArgumentException ex)
        {
            return DefectGuard(ex, log);
        }
    }

    public static Results<Ok<PipeFlowResponse>, ValidationProblem, ProblemHttpResult> Flow(PipeFlowRequest request, ILoggerFactory log,
        bool sensitivities = false)
    {
        var errors = new FieldErrors();
        var input = PipeInput.Read(request, errors);
        double diameter = input.ReadDiameter(errors, request.Diameter);
        double head = input.ReadHead(errors, request.HeadLoss, positive: false);
        if (errors.Any) return ProblemResults.BadInput(errors);

        var pipe = new PipeGeometry(input.Length, diameter, input.Roughness, input.MinorLossCoefficient);
        var u = input.Units;
        try
        {
            SolverTrace? trace = request.Trace == true ? new SolverTrace() : null;
            if (!input.HazenWilliams)
            {
                var r = PipeFlow.Solve(pipe, input.Fluid, head, input.ElevationRise, null, trace);
                if (NoAnswer(r.Status, r.DrivingHead, input) is { } problem) return problem;
                var s = r.State;
                var dwResponse = new PipeFlowResponse(
                    input.FlowUnit.FromSi(s.Flow), u.Velocity(s.Velocity), s.Reynolds, s.RelativeRoughness, s.FrictionFactor,
                    PipeInput.RegimeCode(s.Regime), s.Relation,
                    u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss), u.Length(s.MinorHeadLoss), input.Pressure(r.PressureDrop),
                    u.Length(r.AvailableHead), u.Length(r.ElevationRise), u.Length(r.DrivingHead),
                    u.Length(diameter), u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                    u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                    r.Iterations, r.FrictionIterations, r.Converged, r.Residual, r.Status.Code(), r.SolverStatus.Code(), "ln(Q)",
                    input.MethodCode, u.Code, input.FlowUnit.Code,
                    s.Validity().Select(input.Validity).ToArray(), PipeInput.Warnings(r.DescribeWarnings()), input.Assumptions,
                    null, TraceStepDto.From(trace)) { AlternateFlow = r.AlternateFlow is double alt ? input.FlowUnit.FromSi(alt) : null };
                if (sensitivities && r.Status == PipeStatus.Solved)
                {
                    var spread = PipeSensitivityTables.Spread("flow", input, e =>
                        e < diameter && PipeFlow.Solve(pipe with { Roughness = e }, input.Fluid, head, input.ElevationRise) is { Status: PipeStatus.Solved } at
                            ? input.FlowUnit.FromSi(at.Flow) : null);
                    dwResponse = dwResponse with
                    {
                        Sensitivities = PipeSensitivityTables.Build(PipeSensitivityTables.Problem.Flow,
                            PipeSensitivity.Flow(s, input.Length, input.Fluid.KinematicViscosity), s, input, head),
                        RoughnessSpread = spread,
                        Warnings = PipeSensitivityTables.With(dwResponse.Warnings, PipeSensitivityTables.SpreadWarning(input, spread)),
                    };
                }
                else if (sensitivities)
                {
                    dwResponse = dwResponse with { Warnings = PipeSensitivityTables.With(dwResponse.Warnings, PipeSensitivityTables.AtRegimeLimit) };
                }
                return TypedResults.Ok(dwResponse);
            }

            var hwFlow = HazenWilliams.Flow(pipe, input.Fluid, head, input.HazenWilliamsC, input.ElevationRise);
            if (NoAnswer(hwFlow.Status, hwFlow.DrivingHead, input) is { } noFlow) return noFlow;
            if (trace is not null) PipeFlow.Solve(pipe, input.Fluid, head, input.ElevationRise, null, trace);
            var hw = hwFlow.HeadLoss;
            var dw = hwFlow.DarcyWeisbach;
            var at = hw.DarcyWeisbach; // Darcy-Weisbach state at the Hazen-Williams flow: Reynolds number, regime
            DarcyWeisbachComparisonDto? comparison = dw.Status.HasAnswer()
                ? new("flow", u.Length(dw.State.HeadLoss), u.Length(dw.State.FrictionHeadLoss), input.FlowUnit.FromSi(dw.Flow),
                    u.Velocity(dw.State.Velocity), dw.State.Reynolds, dw.State.FrictionFactor, PipeInput.RegimeCode(dw.State.Regime),
                    dw.Status.Code(), dw.Iterations, input.FlowUnit.FromSi(hwFlow.FlowDifference), hwFlow.RelativeFlowDifference * 100)
                : null;
            var warnings = PipeInput.Warnings(hw.DescribeWarnings());
            if (comparison is null)
                warnings.Add(new("darcy-weisbach-unavailable", "The Darcy-Weisbach flow from the same head has no answer: " + dw.Status.Reason() + "."));
            var validity = hw.Validity().Select(input.Validity).Concat(at.Validity().Select(input.Validity)).ToArray();
            double? rhoG = input.Fluid.Density * Physical.StandardGravity;
            var hwResponse = new PipeFlowResponse(
                input.FlowUnit.FromSi(hw.Flow), u.Velocity(hw.Velocity), at.Reynolds, at.RelativeRoughness,
                EquivalentDarcyFactor(hw.FrictionHeadLoss, at, input.Length), PipeInput.RegimeCode(at.Regime), "hazen-williams",
                u.Length(hw.HeadLoss), u.Length(hw.FrictionHeadLoss), u.Length(hw.MinorHeadLoss), input.Pressure(rhoG * hw.HeadLoss),
                u.Length(head), u.Length(input.ElevationRise), u.Length(hwFlow.DrivingHead),
                u.Length(diameter), u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                hwFlow.Iterations, 0, hwFlow.Converged, Math.Log(hw.HeadLoss) - Math.Log(hwFlow.DrivingHead), hwFlow.Status.Code(),
                hwFlow.Iterations == 0 ? "explicit" : hwFlow.Converged ? "converged" : "not-converged", "ln(Q)",
                input.MethodCode, u.Code, input.FlowUnit.Code, validity, warnings, input.Assumptions,
                comparison, TraceStepDto.From(trace));
            if (sensitivities) hwResponse = hwResponse with { Warnings = PipeSensitivityTables.With(hwResponse.Warnings, PipeSensitivityTables.HazenWilliams) };
            return TypedResults.Ok(hwResponse);
        }
        catch (ArgumentException ex)
        {
            return DefectGuard(ex, log);
        }
    }

    public static Results<Ok<PipeDiameterResponse>, ValidationProblem, ProblemHttpResult> Diameter(PipeDiameterRequest request, ILoggerFactory log,
        bool sensitivities = false)
    {
        var errors = new FieldErrors();
        var input = PipeInput.Read(request, errors, allowHazenWilliams: false);
        double flow = input.ReadFlow(errors, request.Flow);
        double head = input.ReadHead(errors, request.HeadLoss, positive: request.ElevationChange is null);
        PipeSizeTable? table = null;
        if (request.SizeTable is not null && !PipeSizeTables.TryGet(request.SizeTable, out table))
            errors.Add("sizeTable", "unknown table; known: " + string.Join(", ", PipeSizeTables.Names));
        if (errors.Any) return ProblemResults.BadInput(errors);

        var u = input.Units;
        double allowed = head - input.ElevationRise;
        if (!(allowed > 0))
            return ProblemResults.NoAnswer("No diameter meets the allowed head loss.", string.Create(C,
                $"headLoss - elevationChange is {u.Length(allowed):G6} {u.LengthUnit}: nothing is left for friction and fittings, so no pipe of any diameter carries the flow. Raise headLoss or lower elevationChange."),
                new Dictionary<string, object?> { ["pipeStatus"] = PipeStatus.NoFlow.Code() });

        try
        {
            SolverTrace? trace = request.Trace == true ? new SolverTrace() : null;
            DiameterResult r;
            SizeSelectionResult? selection = null;
            if (table is null)
            {
                r = PipeDiameter.Solve(input.Length, input.Roughness, input.MinorLossCoefficient, input.Fluid, flow, allowed, null, trace);
            }
            else
            {
                var pick = PipeDiameter.SelectSize(table.Name, input.Length, input.Roughness, input.MinorLossCoefficient, input.Fluid, flow, allowed);
                selection = pick;
                r = pick.Minimum;
                if (trace is not null) PipeDiameter.Solve(input.Length, input.Roughness, input.MinorLossCoefficient, input.Fluid, flow, allowed, null, trace);
                if (pick.Status == PipeStatus.NoListedSize) return NoListedSize(pick, table, allowed, input);
            }
            if (NoAnswer(r.Status, allowed, input) is { } problem) return problem;

            var s = r.State;
            var warnings = PipeInput.Warnings(r.DescribeWarnings());
            IEnumerable<ValidityCheck> validity = s.Validity();
            SelectedSizeDto? selected = null;
            if (selection is { Size: { } size } pick2)
            {
                var at = pick2.AtSize.State;
                selected = new SelectedSizeDto(size.Name, pick2.Table, u.Length(size.InsideDiameter), u.Length(size.OutsideDiameter),
                    u.Length(size.WallThickness), u.Length(at.HeadLoss), u.Length(at.FrictionHeadLoss), u.Length(at.MinorHeadLoss),
                    input.Pressure(pick2.AtSize.PressureDrop), u.Velocity(at.Velocity), at.Reynolds, at.FrictionFactor,
                    PipeInput.RegimeCode(at.Regime));
                validity = at.Validity();
                warnings.AddRange(PipeInput.Warnings(pick2.AtSize.DescribeWarnings())
                    .Select(w => w with { Message = $"At the selected size {size.Name}: {w.Message}" }));
            }
            double? pressureDrop = input.Fluid.Density * Physical.StandardGravity * s.HeadLoss;
            var response = new PipeDiameterResponse(
                u.Length(s.Diameter), input.FlowUnit.FromSi(s.Flow), u.Velocity(s.Velocity), s.Reynolds, s.RelativeRoughness,
                s.FrictionFactor, PipeInput.RegimeCode(s.Regime), s.Relation,
                u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss), u.Length(s.MinorHeadLoss), input.Pressure(pressureDrop),
                u.Length(allowed), u.Length(input.ElevationRise),
                u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut, selected,
                r.Iterations, r.FrictionIterations, r.Converged, r.Residual, r.Status.Code(), r.SolverStatus.Code(), "ln(D)",
                input.MethodCode, u.Code, input.FlowUnit.Code,
                validity.Select(input.Validity).ToArray(), warnings, input.Assumptions, TraceStepDto.From(trace))
                { AlternateDiameter = r.AlternateDiameter is double alt ? u.Length(alt) : null };
            if (sensitivities && r.Status == PipeStatus.Solved)
            {
                var spread = PipeSensitivityTables.Spread("diameter", input, e =>
                    PipeDiameter.Solve(input.Length, e, input.MinorLossCoefficient, input.Fluid, flow, allowed) is { Status: PipeStatus.Solved } at
                        ? u.Length(at.Diameter) : null);
                response = response with
                {
                    Sensitivities = PipeSensitivityTables.Build(PipeSensitivityTables.Problem.Diameter,
                        PipeSensitivity.Diameter(s, input.Length, input.Fluid.KinematicViscosity), s, input, head),
                    RoughnessSpread = spread,
                    Warnings = PipeSensitivityTables.With(response.Warnings, PipeSensitivityTables.SpreadWarning(input, spread)),
                };
            }
            else if (sensitivities)
            {
                response = response with { Warnings = PipeSensitivityTables.With(response.Warnings, PipeSensitivityTables.AtRegimeLimit) };
            }
            return TypedResults.Ok(response);
        }
        catch (ArgumentException ex)
        {
            return DefectGuard(ex, log);
        }
    }

    /// <summary>hf / ((L/D) V^2/(2g)): the Darcy factor that gives the same friction loss (a definition, not a correlation).</summary>
    private static double EquivalentDarcyFactor(double frictionHeadLoss, in PipeState state, double length) =>
        frictionHeadLoss / (length / state.Diameter * state.VelocityHead);

    /// <summary>The 422 for a status without an answer; null when the status holds one (or is not-converged, which is
    /// answered 200 with converged=false and a warning).</summary>
    private static ProblemHttpResult? NoAnswer(PipeStatus status, double drivingHead, PipeInput input)
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

    private static ProblemHttpResult OutsideRange(double reynolds) =>
        ProblemResults.NoAnswer("No answer inside the friction relations' range.", string.Create(C,
            $"The Reynolds number of this flow is {reynolds:G4}, above {DarcyFriction.MaximumReynolds:0e0}, the largest the friction relations accept."),
            new Dictionary<string, object?> { ["pipeStatus"] = PipeStatus.OutsideRange.Code(), ["reynolds"] = double.IsFinite(reynolds) ? reynolds : null });

    private static ProblemHttpResult BelowRange(double reynolds, PipeInput input, in PipeGeometry pipe, double flow)
    {
        var u = input.Units;
        double d = pipe.Diameter, g = Physical.StandardGravity;
        // The laminar law written in the flow, finite where f = 64/Re is not: the loss that is left out.
        double laminar = 128.0 * input.Fluid.KinematicViscosity * pipe.Length * flow / (Math.PI * g * d * d * d * d);
        return ProblemResults.NoAnswer("No answer inside the friction relations' range.", string.Create(C,
            $"The Reynolds number of this flow is {reynolds:G4}, below {DarcyFriction.MinimumReynolds:G3}, the smallest the friction relations accept (creeping flow: the friction factor 64/Re would exceed {64 / DarcyFriction.MinimumReynolds:G3}). The laminar friction loss there, 128 nu L Q/(pi g D^4), is {u.Length(laminar):G4} {u.LengthUnit}: negligible for any practical purpose."),
            new Dictionary<string, object?> { ["pipeStatus"] = PipeStatus.OutsideRange.Code(), ["reynolds"] = reynolds });
    }

    private static ProblemHttpResult NoListedSize(in SizeSelectionResult pick, PipeSizeTable table, double allowed, PipeInput input)
    {
        var u = input.Units;
        var largest = table.Sizes[^1];
        var at = pick.AtSize.State;
        string detail = string.Create(C,
            $"No size in {table.Name} is large enough. The minimum inside diameter is {u.Length(pick.Minimum.Diameter):G6} {u.LengthUnit}; the largest listed, {largest.Name}, has {u.Length(largest.InsideDiameter):G6} {u.LengthUnit}, where the head loss is {u.Length(at.HeadLoss):G6} {u.LengthUnit} against {u.Length(allowed):G6} {u.LengthUnit} allowed");
        if (at.MinorHeadLoss > allowed)
            detail += string.Create(C, $"; the minor losses alone there are {u.Length(at.MinorHeadLoss):G6} {u.LengthUnit}");
        detail += ".";
        return ProblemResults.NoAnswer("No listed size meets the allowed head loss.", detail, new Dictionary<string, object?>
        {
            ["pipeStatus"] = PipeStatus.NoListedSize.Code(),
            ["minimumDiameter"] = u.Length(pick.Minimum.Diameter),
            ["largestSize"] = largest.Name,
        });
    }

    /// <summary>Validation runs before every Core call, so a Core argument exception is a FlowSolve defect: logged,
    /// and answered with a 400 naming the field the Core rejected rather than with a 500.</summary>
    private static ValidationProblem DefectGuard(ArgumentException ex, ILoggerFactory log)
    {
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
