using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.NonNewtonian;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Api.NonNewtonian;

/// <summary>The flow of a non-Newtonian fluid that meets a head loss: <c>GET</c> and <c>POST /v1/non-newtonian/flow</c>.</summary>
public sealed class NonNewtonianFlowCalculation : Calculation<NonNewtonianFlowRequest, NonNewtonianFlowResponse>
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public override CalculationInfo Info { get; } = new("non-newtonian/flow", "Non-Newtonian fluids", "NonNewtonianFlow",
        "flow", "Flow of a power-law fluid or a Bingham plastic from a head loss", NonNewtonianDocs.Flow);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("model", "bingham-plastic"), ("density", "1450"), ("yieldStress", "25"), ("plasticViscosity", "0.06"),
         ("headLoss", "80"), ("diameter", "0.15"), ("length", "1200"), ("minorLossCoefficient", "4.5")];

    public override NonNewtonianFlowRequest BodyExample { get; } = new(Model: "power-law", Density: 1200, HeadLoss: 25, Diameter: 0.1,
        Length: 350, MinorLossCoefficient: 2, ConsistencyIndex: 0.5, FlowBehaviorIndex: 0.6, FlowUnit: "l/s");

    /// <summary>A number for a problem's extensions: JSON has no infinity (a yield head of a vanishing density, say), so null then.</summary>
    private static double? Finite(double value) => double.IsFinite(value) ? value : null;

    public override Sheet Sheet(NonNewtonianFlowRequest request, NonNewtonianFlowResponse answer) => NonNewtonianSheets.Flow(request, answer);

    public override Outcome<NonNewtonianFlowResponse> Solve(NonNewtonianFlowRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var input = NonNewtonianInput.Read(request, errors);
        var flowUnit = FlowUnit.Parse(request.FlowUnit, input.Units, errors);
        double head = input.ReadHead(errors, request.HeadLoss);
        double diameter = input.ReadDiameter(errors, request.Diameter);
        double length = input.ReadLength(errors, request.Length);
        double k = input.ReadMinorLoss(errors, request.MinorLossCoefficient);
        if (errors.Any) return ProblemResults.BadInput(errors);

        SolverTrace? trace = context.Trace ? new SolverTrace() : null;
        var r = NonNewtonianPipe.Flow(input.Fluid, length, diameter, k, head, trace);
        var u = input.Units;
        string lu = u.LengthUnit;
        switch (r.Status)
        {
            case NonNewtonianFlowStatus.BelowYield:
                return ProblemResults.NoAnswer("The head loss does not overcome the yield stress.", string.Create(C,
                    $"A Bingham plastic moves only when the wall stress exceeds its yield stress: this pipe needs a head loss above 4 tau0 L/(rho g D) = {u.Length(r.YieldHeadLoss):G6} {lu} before anything flows, and headLoss is {u.Length(head):G6} {lu}."),
                    new Dictionary<string, object?> { ["flowStatus"] = "below-yield", ["yieldHeadLoss"] = Finite(u.Length(r.YieldHeadLoss)) });
            case NonNewtonianFlowStatus.InTransitionGap:
                return ProblemResults.NoAnswer("The head loss falls in the jump of friction at the critical Reynolds number.", string.Create(C,
                    $"At the critical Reynolds number {PowerLawFriction.CriticalReynolds(input.Fluid.FlowBehaviorIndex):G5} (flow {flowUnit.FromSi(r.CriticalFlow):G6} {flowUnit.Code}) the laminar law gives a head loss of {u.Length(r.GapLow):G6} {lu} and Dodge-Metzner {u.Length(r.GapHigh):G6} {lu}; headLoss {u.Length(head):G6} {lu} lies between them, so no flow meets it under these correlations. The flow is at the laminar-turbulent transition, about {flowUnit.FromSi(r.CriticalFlow):G4} {flowUnit.Code}, where friction is uncertain."),
                    new Dictionary<string, object?>
                    {
                        ["flowStatus"] = "in-transition-gap", ["criticalFlow"] = Finite(flowUnit.FromSi(r.CriticalFlow)),
                        ["laminarHeadLossAtCritical"] = Finite(u.Length(r.GapLow)), ["turbulentHeadLossAtCritical"] = Finite(u.Length(r.GapHigh)),
                    });
            case NonNewtonianFlowStatus.OutsideRange:
                return ProblemResults.NoAnswer("No flow inside the relations' range meets the head loss.", string.Create(C,
                    $"The flow that would meet headLoss {u.Length(head):G6} {lu} lies outside the velocities ({NonNewtonianPipe.MinimumVelocity:G3} to {NonNewtonianPipe.MaximumVelocity:G3} m/s) and Reynolds numbers ({NonNewtonianFriction.MinimumReynolds:G3} to {NonNewtonianFriction.MaximumReynolds:G3}) the relations evaluate: check the orders of magnitude and units of the inputs."),
                    new Dictionary<string, object?> { ["flowStatus"] = "outside-range" });
        }

        var s = r.State;
        var f = s.Friction;
        var warnings = NonNewtonianInput.Warnings(f).ToList();
        if (r.Status == NonNewtonianFlowStatus.NotConverged)
            warnings.Add(new("not-converged", "The flow solve did not converge (" + r.SolverStatus.Reason() + "); the flow is the best iterate and must not be used."));
        if (context.Sensitivities && r.Status != NonNewtonianFlowStatus.Solved)
            warnings.Add(new("sensitivities-unavailable", "Sensitivities are given only for a flow that meets the head loss; this solve did not converge."));
        if (!double.IsNaN(r.AlternateFlow))
            warnings.Add(new("second-solution", string.Create(C,
                $"Two flows meet this head: {flowUnit.FromSi(s.Flow):G6} {flowUnit.Code} (turbulent, Dodge-Metzner) and {flowUnit.FromSi(r.AlternateFlow):G6} {flowUnit.Code} (laminar, in alternateFlow), because Dodge-Metzner at the critical Reynolds number lies below the laminar law for n = {input.Fluid.FlowBehaviorIndex:G4}. Which one the pipe runs at depends on how it is started; the laminar flow is the cautious estimate.")));
        return new NonNewtonianFlowResponse(
            flowUnit.FromSi(s.Flow), u.Velocity(s.Velocity), u.Length(s.HeadLoss), u.Length(s.FrictionHeadLoss), u.Length(s.MinorHeadLoss),
            u.Pressure(s.PressureDrop), f.Reynolds, NonNewtonianInput.Present(f.Hedstrom), NonNewtonianInput.Present(f.CriticalReynolds),
            f.Darcy, f.Fanning, NonNewtonianInput.RegimeCode(f.Regime), f.Relation, input.ModelCode, NonNewtonianInput.Present(f.PlugRatio),
            input.Stress(f.WallShearStress), input.Fluid.Model == RheologyModel.BinghamPlastic ? u.Length(r.YieldHeadLoss) : null,
            u.Length(diameter), u.Length(length), k, u.Density(input.Fluid.Density),
            r.Iterations, f.Iterations, r.Converged, r.Residual, r.Converged ? "solved" : "not-converged", r.SolverStatus.Code(), "ln(Q)",
            u.Code, flowUnit.Code, NonNewtonianInput.Validity(f), warnings, input.Assumptions, TraceStepDto.From(trace))
        {
            AlternateFlow = double.IsNaN(r.AlternateFlow) ? null : flowUnit.FromSi(r.AlternateFlow),
            Sensitivities = context.Sensitivities && r.Status == NonNewtonianFlowStatus.Solved
                ? Sensitivities(input, head, length, diameter, k, request.MinorLossCoefficient is not null, r) : null,
        };
    }

    /// <summary>d(flow, velocity, frictionFactor, reynolds)/d(input) in SI by implicit differentiation of h(Q) = headLoss
    /// (<see cref="NonNewtonianSensitivity"/>).</summary>
    private static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities(NonNewtonianInput input,
        double head, double length, double diameter, double k, bool kGiven, in NonNewtonianFlowResult r)
    {
        var s = NonNewtonianSensitivity.OfFlow(input.Fluid, length, diameter, k, r);
        var state = r.State;
        return input.Sensitivities(
            [("flow", state.Flow, s.Output), ("velocity", state.Velocity, s.Velocity),
             ("frictionFactor", state.Friction.Darcy, s.FrictionFactor), ("reynolds", state.Friction.Reynolds, s.Reynolds)],
            "headLoss", head, diameter, length, kGiven ? k : null);
    }
}
