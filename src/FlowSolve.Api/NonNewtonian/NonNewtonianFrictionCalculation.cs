using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.NonNewtonian;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Api.NonNewtonian;

/// <summary>The friction factor of a non-Newtonian fluid: <c>GET</c> and <c>POST /v1/non-newtonian/friction-factor</c>.</summary>
public sealed class NonNewtonianFrictionCalculation : Calculation<NonNewtonianFrictionRequest, NonNewtonianFrictionResponse>
{
    public override CalculationInfo Info { get; } = new("non-newtonian/friction-factor", "Non-Newtonian fluids", "NonNewtonianFrictionFactor",
        "frictionFactor", "Friction factor of a power-law fluid or a Bingham plastic", NonNewtonianDocs.Friction);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("model", "power-law"), ("density", "1200"), ("consistencyIndex", "0.5"), ("flowBehaviorIndex", "0.6"), ("velocity", "2"), ("diameter", "0.1")];

    public override NonNewtonianFrictionRequest BodyExample { get; } = new(Model: "bingham-plastic", Density: 1450, Velocity: 1.5, Diameter: 0.15,
        YieldStress: 25, PlasticViscosity: 0.06);

    public override Sheet Sheet(NonNewtonianFrictionRequest request, NonNewtonianFrictionResponse answer) => NonNewtonianSheets.Friction(request, answer);

    public override Outcome<NonNewtonianFrictionResponse> Solve(NonNewtonianFrictionRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var input = NonNewtonianInput.Read(request, errors);
        double velocity = input.ReadVelocity(errors, request.Velocity);
        double diameter = input.ReadDiameter(errors, request.Diameter);
        if (errors.Any) return ProblemResults.BadInput(errors);

        SolverTrace? trace = context.Trace ? new SolverTrace() : null;
        NonNewtonianFrictionResult f;
        try
        {
            f = NonNewtonianFriction.Compute(input.Fluid, velocity, diameter, trace);
        }
        catch (ArgumentOutOfRangeException e) when (e.ParamName is "reynolds" or "hedstrom")
        {
            return NonNewtonianInput.OutsideRange(e);
        }
        var u = input.Units;
        return new NonNewtonianFrictionResponse(
            f.Darcy, f.Fanning, f.Reynolds, NonNewtonianInput.Present(f.Hedstrom), NonNewtonianInput.Present(f.CriticalReynolds),
            NonNewtonianInput.RegimeCode(f.Regime), f.Relation, input.ModelCode, f.LaminarFanning, NonNewtonianInput.Present(f.TurbulentFanning),
            NonNewtonianInput.Present(f.PlugRatio), input.Stress(f.WallShearStress), u.Velocity(velocity), u.Length(diameter), u.Density(input.Fluid.Density),
            f.Iterations, f.Converged, f.Residual, f.Status.Code(), f.SolveVariable, u.Code,
            NonNewtonianInput.Validity(f), NonNewtonianInput.Warnings(f), input.Assumptions, TraceStepDto.From(trace))
        {
            Sensitivities = context.Sensitivities ? Sensitivities(input, velocity, diameter, f) : null,
        };
    }

    /// <summary>d(frictionFactor, reynolds)/d(input) in SI by implicit differentiation (<see cref="NonNewtonianSensitivity"/>).</summary>
    private static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities(NonNewtonianInput input,
        double velocity, double diameter, in NonNewtonianFrictionResult f)
    {
        var s = NonNewtonianSensitivity.OfFriction(input.Fluid, velocity, diameter, f);
        return input.Sensitivities([("frictionFactor", f.Darcy, s.FrictionFactor), ("reynolds", f.Reynolds, s.Reynolds)],
            "velocity", velocity, diameter);
    }
}
