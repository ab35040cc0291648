using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Api.Pipes;

/// <summary>The head loss of a pipe at a flow: <c>GET</c> and <c>POST /v1/pipes/head-loss</c>.</summary>
public sealed class PipeHeadLossCalculation : Calculation<PipeHeadLossRequest, PipeHeadLossResponse>
{
    public override CalculationInfo Info { get; } = new("pipes/head-loss", "Pipes", "PipeHeadLoss", "headLoss",
        "Head loss of a pipe at a flow", PipeDocs.HeadLoss);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("flow", "0.2"), ("diameter", "0.2"), ("length", "500"), ("material", "cast-iron"),
         ("kinematicViscosity", "1e-5"), ("density", "900"), ("fittings", "elbow-90-flanged-regular:3,gate-valve-open:1")];

    public override PipeHeadLossRequest BodyExample { get; } = new(Flow: 0.05, Diameter: 0.2, Length: 1200, Material: "cast-iron",
        Fittings: [new("elbow-90-flanged-regular", 4), new("gate-valve-open", 2)], ElevationChange: 8, Temperature: 15);

    public override Sheet Sheet(PipeHeadLossRequest request, PipeHeadLossResponse answer) => PipeHeadLossSheet.Build(request, answer);

    public override Outcome<PipeHeadLossResponse> Solve(PipeHeadLossRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var input = PipeProblem.Read(request, errors);
        double flow = input.ReadFlow(errors, request.Flow);
        double diameter = input.ReadDiameter(errors, request.Diameter);
        if (errors.Any) return ProblemResults.BadInput(errors);

        var pipe = new PipeGeometry(input.Length, diameter, input.Roughness, input.MinorLossCoefficient);
        // The friction relations take Reynolds numbers up to 1e15: a pipe beyond it is well formed but has no answer.
        double velocity = flow / pipe.Area;
        double reynolds = velocity * diameter / input.Fluid.KinematicViscosity;
        if (!(reynolds <= DarcyFriction.MaximumReynolds)) return PipeOutcomes.OutsideRange(reynolds);
        // Below the smallest Reynolds number they accept, f = 64/Re overflows (5e-324 m3/s, say): a 422 that says so.
        if (!(reynolds >= DarcyFriction.MinimumReynolds)) return PipeOutcomes.BelowRange(reynolds, input, pipe, flow);

        try
        {
            SolverTrace? trace = context.Trace && !input.HazenWilliams ? new SolverTrace() : null;
            var result = PipeHeadLoss.Compute(pipe, input.Fluid, flow, input.ElevationRise, trace: trace);
            var s = result.State;
            var u = input.Units;
            var validity = input.Validity(s.Validity());

            if (!input.HazenWilliams)
            {
                var dw = new PipeHeadLossResponse(
                    u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss), u.Length(s.MinorHeadLoss), input.Pressure(result.PressureDrop),
                    u.Length(result.ElevationRise), u.Length(result.TotalHead), input.Pressure(result.TotalPressureDifference),
                    input.FlowUnit.FromSi(s.Flow), u.Length(s.Diameter), u.Velocity(s.Velocity), u.Length(s.VelocityHead),
                    s.Reynolds, s.RelativeRoughness, s.FrictionFactor, PipeProblem.RegimeCode(s.Regime), s.Relation,
                    u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                    u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                    result.Iterations, result.Converged, s.FrictionResidualAtAnswer, result.Status.Code(), input.MethodCode, u.Code, input.FlowUnit.Code,
                    validity, PipeProblem.Warnings(result.DescribeWarnings()), input.Assumptions, null) { Trace = TraceStepDto.From(trace) };
                if (context.Sensitivities && result.Converged)
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
                return dw;
            }

            var hw = HazenWilliams.HeadLoss(pipe, input.Fluid, flow, input.HazenWilliamsC);
            double? rhoG = input.Fluid.Density * Physical.StandardGravity;
            double total = hw.HeadLoss + input.ElevationRise;
            validity.InsertRange(0, hw.Validity().Select(input.Validity));
            var comparison = new DarcyWeisbachComparisonDto("headLoss", u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss),
                input.FlowUnit.FromSi(s.Flow), u.Velocity(s.Velocity), s.Reynolds, s.FrictionFactor, PipeProblem.RegimeCode(s.Regime),
                result.Status.Code(), result.Iterations, u.Length(hw.Difference), hw.RelativeDifference * 100);
            var hwResponse = new PipeHeadLossResponse(
                u.Length(hw.HeadLoss), u.Length(hw.FrictionHeadLoss), u.Length(hw.MinorHeadLoss), input.Pressure(rhoG * hw.HeadLoss),
                u.Length(input.ElevationRise), u.Length(total), input.Pressure(rhoG * total),
                input.FlowUnit.FromSi(hw.Flow), u.Length(hw.Diameter), u.Velocity(hw.Velocity), u.Length(s.VelocityHead),
                s.Reynolds, s.RelativeRoughness, PipeOutcomes.EquivalentDarcyFactor(hw.FrictionHeadLoss, s, input.Length),
                PipeProblem.RegimeCode(s.Regime), "hazen-williams",
                u.Length(input.Length), u.Length(input.Roughness), input.MinorLossCoefficient,
                u.KinematicViscosity(input.Fluid.KinematicViscosity), input.DensityOut,
                0, true, 0.0, PipeStatus.Solved.Code(), input.MethodCode, u.Code, input.FlowUnit.Code,
                validity, PipeProblem.Warnings(hw.DescribeWarnings()), input.Assumptions, comparison);
            if (context.Sensitivities) hwResponse = hwResponse with { Warnings = PipeSensitivityTables.With(hwResponse.Warnings, PipeSensitivityTables.HazenWilliams) };
            return hwResponse;
        }
        catch (ArgumentException ex)
        {
            return PipeOutcomes.DefectGuard(ex, context.Services);
        }
    }
}
