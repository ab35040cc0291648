using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;
using Microsoft.AspNetCore.Http.HttpResults;

namespace FlowSolve.Api.Pipes;

/// <summary>The minimum diameter, and the smallest listed size, for a flow within an allowed head loss:
/// <c>GET</c> and <c>POST /v1/pipes/diameter</c>.</summary>
public sealed class PipeDiameterCalculation : Calculation<PipeDiameterRequest, PipeDiameterResponse>
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public override CalculationInfo Info { get; } = new("pipes/diameter", "Pipes", "PipeDiameter", "diameter",
        "Minimum diameter, and the smallest listed size, for a flow within an allowed head loss", PipeDocs.Diameter);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("flow", "0.03"), ("headLoss", "6"), ("length", "400"), ("material", "commercial-steel"),
         ("sizeTable", "asme-b36.10m-schedule-40")];

    public override PipeDiameterRequest BodyExample { get; } = new(Flow: 250, HeadLoss: 20, Length: 2000, Material: "commercial-steel",
        MinorLossCoefficient: 3, SizeTable: "asme-b36.10m-schedule-40", Units: "us", FlowUnit: "gpm");

    public override Sheet Sheet(PipeDiameterRequest request, PipeDiameterResponse answer) => PipeDiameterSheet.Build(request, answer);

    public override Outcome<PipeDiameterResponse> Solve(PipeDiameterRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var input = PipeProblem.Read(request, errors, allowHazenWilliams: false);
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
            SolverTrace? trace = context.Trace ? new SolverTrace() : null;
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
            if (r.Status == PipeStatus.OutsideRange && RoughnessExceedsAnswer(input, flow, allowed) is { } rough) return rough;
            if (PipeOutcomes.NoAnswer(r.Status, allowed, input) is { } problem) return problem;

            var s = r.State;
            var warnings = PipeProblem.Warnings(r.DescribeWarnings());
            IEnumerable<ValidityCheck> validity = s.Validity();
            SelectedSizeDto? selected = null;
            if (selection is { Size: { } size } pick2)
            {
                var at = pick2.AtSize.State;
                selected = new SelectedSizeDto(size.Name, pick2.Table, u.Length(size.InsideDiameter), u.Length(size.OutsideDiameter),
                    u.Length(size.WallThickness), u.Length(at.HeadLoss), u.Length(at.FrictionHeadLoss), u.Length(at.MinorHeadLoss),
                    input.Pressure(pick2.AtSize.PressureDrop), u.Velocity(at.Velocity), at.Reynolds, at.FrictionFactor,
                    PipeProblem.RegimeCode(at.Regime));
                validity = at.Validity();
                warnings.AddRange(PipeProblem.Warnings(pick2.AtSize.DescribeWarnings())
                    .Select(w => w with { Message = $"At the selected size {size.Name}: {w.Message}" }));
            }
            double? pressureDrop = input.Fluid.Density * Physical.StandardGravity * s.HeadLoss;
            var response = new PipeDiameterResponse(
                u.Length(s.Diameter), input.FlowUnit.FromSi(s.Flow), u.Velocity(s.Velocity), s.Reynolds, s.RelativeRoughness,
                s.FrictionFactor, PipeProblem.RegimeCode(s.Regime), s.Relation,
                u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss), u.Length(s.MinorHeadLoss), input.Pressure(pressureDrop),
                u.Length(allowed), u.Length(input.ElevationRise),
                u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut, selected,
                r.Iterations, r.FrictionIterations, r.Converged, r.Residual, r.Status.Code(), r.SolverStatus.Code(), "ln(D)",
                input.MethodCode, u.Code, input.FlowUnit.Code,
                validity.Select(input.Validity).ToArray(), warnings, input.Assumptions, TraceStepDto.From(trace))
                { AlternateDiameter = r.AlternateDiameter is double alt ? u.Length(alt) : null };
            if (context.Sensitivities && r.Status == PipeStatus.Solved)
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
            else if (context.Sensitivities)
            {
                response = response with { Warnings = PipeSensitivityTables.With(response.Warnings, PipeSensitivityTables.AtRegimeLimit) };
            }
            return response;
        }
        catch (ArgumentException ex)
        {
            return PipeOutcomes.DefectGuard(ex, context.Services);
        }
    }


    /// <summary>The 422 for a diameter the friction relations cannot reach because it would be smaller than the wall
    /// roughness: a pipe whose inside diameter equals the roughness already loses no more than the allowance at this
    /// flow (its head loss is computed there, at relative roughness just below 1, the largest the relations accept).
    /// Null when that is not why the solve found no answer.</summary>
    private static ProblemHttpResult? RoughnessExceedsAnswer(PipeProblem input, double flow, double allowed)
    {
        double e = input.Roughness;
        if (!(e > 0)) return null;
        double d = e * (1 + 1e-9);
        double loss;
        try
        {
            loss = PipeHeadLoss.Compute(new PipeGeometry(input.Length, d, e, input.MinorLossCoefficient), input.Fluid, flow).HeadLoss;
        }
        catch (ArgumentException)
        {
            return null;
        }
        if (!(loss <= allowed)) return null;
        var u = input.Units;
        return ProblemResults.NoAnswer("No diameter meets the allowed head loss.", string.Create(C,
            $"A pipe whose inside diameter equals the wall roughness ({u.Length(e):G6} {u.LengthUnit}) already loses only {u.Length(loss):G6} {u.LengthUnit} at this flow, less than the {u.Length(allowed):G6} {u.LengthUnit} allowed: the diameter that uses the allowance would be smaller than the roughness, where the friction relations do not apply (relative roughness must be below 1). Check the roughness and its unit, or the allowance."),
            new Dictionary<string, object?> { ["pipeStatus"] = PipeStatus.OutsideRange.Code() });
    }
    private static ProblemHttpResult NoListedSize(in SizeSelectionResult pick, PipeSizeTable table, double allowed, PipeProblem input)
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
}
