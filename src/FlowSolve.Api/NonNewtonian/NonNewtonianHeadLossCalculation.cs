using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.NonNewtonian;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Api.NonNewtonian;

/// <summary>The head loss of a non-Newtonian fluid in a pipe: <c>GET</c> and <c>POST /v1/non-newtonian/head-loss</c>.</summary>
public sealed class NonNewtonianHeadLossCalculation : Calculation<NonNewtonianHeadLossRequest, NonNewtonianHeadLossResponse>
{
    public override CalculationInfo Info { get; } = new("non-newtonian/head-loss", "Non-Newtonian fluids", "NonNewtonianHeadLoss",
        "headLoss", "Head loss of a power-law fluid or a Bingham plastic in a pipe", NonNewtonianDocs.HeadLoss);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("model", "bingham-plastic"), ("density", "1450"), ("yieldStress", "25"), ("plasticViscosity", "0.06"),
         ("flow", "0.03"), ("diameter", "0.15"), ("length", "1200"), ("minorLossCoefficient", "4.5")];

    public override NonNewtonianHeadLossRequest BodyExample { get; } = new(Model: "power-law", Density: 1200, Flow: 12, Diameter: 0.1,
        Length: 350, MinorLossCoefficient: 2, ConsistencyIndex: 0.5, FlowBehaviorIndex: 0.6, FlowUnit: "l/s");

    public override Sheet Sheet(NonNewtonianHeadLossRequest request, NonNewtonianHeadLossResponse answer) => NonNewtonianSheets.HeadLoss(request, answer);

    public override Outcome<NonNewtonianHeadLossResponse> Solve(NonNewtonianHeadLossRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var input = NonNewtonianInput.Read(request, errors);
        var flowUnit = FlowUnit.Parse(request.FlowUnit, input.Units, errors);
        double flow = flowUnit.ToSi(errors.Required("flow", request.Flow, 0, flowUnit.FromSi(NonNewtonianInput.MaxFlow), minExclusive: true, unit: flowUnit.Code));
        double diameter = input.ReadDiameter(errors, request.Diameter);
        double length = input.ReadLength(errors, request.Length);
        double k = input.ReadMinorLoss(errors, request.MinorLossCoefficient);
        if (errors.Any) return ProblemResults.BadInput(errors);

        SolverTrace? trace = context.Trace ? new SolverTrace() : null;
        NonNewtonianHeadLoss h;
        try
        {
            h = NonNewtonianPipe.HeadLoss(input.Fluid, length, diameter, k, flow, trace);
        }
        catch (ArgumentOutOfRangeException e) when (e.ParamName is "reynolds" or "hedstrom")
        {
            return NonNewtonianInput.OutsideRange(e);
        }
        var f = h.Friction;
        var u = input.Units;
        return new NonNewtonianHeadLossResponse(
            u.Length(h.HeadLoss), u.Length(h.FrictionHeadLoss), u.Length(h.MinorHeadLoss), u.Pressure(h.PressureDrop),
            flowUnit.FromSi(h.Flow), u.Velocity(h.Velocity),
            f.Reynolds, NonNewtonianInput.Present(f.Hedstrom), NonNewtonianInput.Present(f.CriticalReynolds), f.Darcy, f.Fanning,
            NonNewtonianInput.RegimeCode(f.Regime), f.Relation, input.ModelCode, NonNewtonianInput.Present(f.PlugRatio), input.Stress(f.WallShearStress),
            u.Length(diameter), u.Length(length), k, u.Density(input.Fluid.Density),
            f.Iterations, f.Converged, f.Residual, f.Status.Code(), f.SolveVariable, u.Code, flowUnit.Code,
            NonNewtonianInput.Validity(f), NonNewtonianInput.Warnings(f), input.Assumptions, TraceStepDto.From(trace))
        {
            Sensitivities = context.Sensitivities ? Sensitivities(input, length, diameter, k, request.MinorLossCoefficient is not null, h) : null,
        };
    }

    /// <summary>d(headLoss, frictionFactor, reynolds, velocity)/d(input) in SI by implicit differentiation
    /// (<see cref="NonNewtonianSensitivity"/>).</summary>
    private static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities(NonNewtonianInput input,
        double length, double diameter, double k, bool kGiven, in NonNewtonianHeadLoss h)
    {
        var s = NonNewtonianSensitivity.OfHeadLoss(input.Fluid, length, diameter, k, h);
        return input.Sensitivities(
            [("headLoss", h.HeadLoss, s.Output), ("frictionFactor", h.Friction.Darcy, s.FrictionFactor),
             ("reynolds", h.Friction.Reynolds, s.Reynolds), ("velocity", h.Velocity, s.Velocity)],
            "flow", h.Flow, diameter, length, kGiven ? k : null);
    }
}
