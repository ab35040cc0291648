using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Api.Pipes;

/// <summary>The flow an available head drives through a pipe: <c>GET</c> and <c>POST /v1/pipes/flow</c>.</summary>
public sealed class PipeFlowCalculation : Calculation<PipeFlowRequest, PipeFlowResponse>
{
    public override CalculationInfo Info { get; } = new("pipes/flow", "Pipes", "PipeFlow", "flow",
        "Flow through a pipe from the available head", PipeDocs.Flow);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("headLoss", "20"), ("diameter", "0.15"), ("length", "800"), ("roughness", "0.000045"),
         ("elevationChange", "5"), ("temperature", "10")];

    public override PipeFlowRequest BodyExample { get; } = new(HeadLoss: 30, Diameter: 0.5, Length: 3000, Roughness: 0.0003,
        MinorLossCoefficient: 2.5, Method: "hazen-williams", HazenWilliamsC: 120, Temperature: 15);

    public override Sheet Sheet(PipeFlowRequest request, PipeFlowResponse answer) => PipeFlowSheet.Build(request, answer);

    public override Outcome<PipeFlowResponse> Solve(PipeFlowRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var input = PipeProblem.Read(request, errors);
        double diameter = input.ReadDiameter(errors, request.Diameter);
        double head = input.ReadHead(errors, request.HeadLoss, positive: false);
        if (errors.Any) return ProblemResults.BadInput(errors);

        var pipe = new PipeGeometry(input.Length, diameter, input.Roughness, input.MinorLossCoefficient);
        var u = input.Units;
        try
        {
            SolverTrace? trace = context.Trace ? new SolverTrace() : null;
            if (!input.HazenWilliams)
            {
                var r = PipeFlow.Solve(pipe, input.Fluid, head, input.ElevationRise, null, trace);
                if (PipeOutcomes.NoAnswer(r.Status, r.DrivingHead, input) is { } problem) return problem;
                var s = r.State;
                var dwResponse = new PipeFlowResponse(
                    input.FlowUnit.FromSi(s.Flow), u.Velocity(s.Velocity), s.Reynolds, s.RelativeRoughness, s.FrictionFactor,
                    PipeProblem.RegimeCode(s.Regime), s.Relation,
                    u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss), u.Length(s.MinorHeadLoss), input.Pressure(r.PressureDrop),
                    u.Length(r.AvailableHead), u.Length(r.ElevationRise), u.Length(r.DrivingHead),
                    u.Length(diameter), u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                    u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                    r.Iterations, r.FrictionIterations, r.Converged, r.Residual, r.Status.Code(), r.SolverStatus.Code(), "ln(Q)",
                    input.MethodCode, u.Code, input.FlowUnit.Code,
                    s.Validity().Select(input.Validity).ToArray(), PipeProblem.Warnings(r.DescribeWarnings()), input.Assumptions,
                    null, TraceStepDto.From(trace)) { AlternateFlow = r.AlternateFlow is double alt ? input.FlowUnit.FromSi(alt) : null };
                if (context.Sensitivities && r.Status == PipeStatus.Solved)
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
                else if (context.Sensitivities)
                {
                    dwResponse = dwResponse with { Warnings = PipeSensitivityTables.With(dwResponse.Warnings, PipeSensitivityTables.AtRegimeLimit) };
                }
                return dwResponse;
            }

            var hwFlow = HazenWilliams.Flow(pipe, input.Fluid, head, input.HazenWilliamsC, input.ElevationRise);
            if (PipeOutcomes.NoAnswer(hwFlow.Status, hwFlow.DrivingHead, input) is { } noFlow) return noFlow;
            if (trace is not null) PipeFlow.Solve(pipe, input.Fluid, head, input.ElevationRise, null, trace);
            var hw = hwFlow.HeadLoss;
            var dw = hwFlow.DarcyWeisbach;
            var at = hw.DarcyWeisbach; // Darcy-Weisbach state at the Hazen-Williams flow: Reynolds number, regime
            DarcyWeisbachComparisonDto? comparison = dw.Status.HasAnswer()
                ? new("flow", u.Length(dw.State.HeadLoss), u.Length(dw.State.FrictionHeadLoss), input.FlowUnit.FromSi(dw.Flow),
                    u.Velocity(dw.State.Velocity), dw.State.Reynolds, dw.State.FrictionFactor, PipeProblem.RegimeCode(dw.State.Regime),
                    dw.Status.Code(), dw.Iterations, input.FlowUnit.FromSi(hwFlow.FlowDifference), hwFlow.RelativeFlowDifference * 100)
                : null;
            var warnings = PipeProblem.Warnings(hw.DescribeWarnings());
            if (comparison is null)
                warnings.Add(new("darcy-weisbach-unavailable", "The Darcy-Weisbach flow from the same head has no answer: " + dw.Status.Reason() + "."));
            var validity = hw.Validity().Select(input.Validity).Concat(at.Validity().Select(input.Validity)).ToArray();
            double? rhoG = input.Fluid.Density * Physical.StandardGravity;
            var hwResponse = new PipeFlowResponse(
                input.FlowUnit.FromSi(hw.Flow), u.Velocity(hw.Velocity), at.Reynolds, at.RelativeRoughness,
                PipeOutcomes.EquivalentDarcyFactor(hw.FrictionHeadLoss, at, input.Length), PipeProblem.RegimeCode(at.Regime), "hazen-williams",
                u.Length(hw.HeadLoss), u.Length(hw.FrictionHeadLoss), u.Length(hw.MinorHeadLoss), input.Pressure(rhoG * hw.HeadLoss),
                u.Length(head), u.Length(input.ElevationRise), u.Length(hwFlow.DrivingHead),
                u.Length(diameter), u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                hwFlow.Iterations, 0, hwFlow.Converged, Math.Log(hw.HeadLoss) - Math.Log(hwFlow.DrivingHead), hwFlow.Status.Code(),
                hwFlow.Iterations == 0 ? "explicit" : hwFlow.Converged ? "converged" : "not-converged", "ln(Q)",
                input.MethodCode, u.Code, input.FlowUnit.Code, validity, warnings, input.Assumptions,
                comparison, TraceStepDto.From(trace));
            if (context.Sensitivities) hwResponse = hwResponse with { Warnings = PipeSensitivityTables.With(hwResponse.Warnings, PipeSensitivityTables.HazenWilliams) };
            return hwResponse;
        }
        catch (ArgumentException ex)
        {
            return PipeOutcomes.DefectGuard(ex, context.Services);
        }
    }
}
