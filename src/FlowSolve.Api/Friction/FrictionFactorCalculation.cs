using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using System.ComponentModel;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Friction;

/// <summary>The Darcy friction factor: <c>GET</c> and <c>POST /v1/friction-factor</c>.</summary>
public sealed class FrictionFactorCalculation : Calculation<FrictionFactorRequest, FrictionFactorResponse>
{
    public override CalculationInfo Info { get; } = new("friction-factor", "Friction factor", "FrictionFactor", "frictionFactor",
        "Darcy friction factor", FrictionDocs.Description);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } = [("reynolds", "75000"), ("relativeRoughness", "0.005")];

    public override FrictionFactorRequest BodyExample { get; } = new(Reynolds: 250000, Roughness: 0.00026, Diameter: 0.3, Method: "haaland");

    public override Sheet Sheet(FrictionFactorRequest request, FrictionFactorResponse answer) => FrictionSheet.Build(request, answer);

    /// <summary>A batch that asks only for <c>frictionFactor</c> (<c>select=frictionFactor</c>) gets it without the rest of
    /// the answer (the approximations, validity, assumptions) for the rows the full solve takes as they stand.</summary>
    protected override IReadOnlyDictionary<string, Func<FrictionFactorRequest, double?>> RowShortcuts { get; } =
        new Dictionary<string, Func<FrictionFactorRequest, double?>>(StringComparer.OrdinalIgnoreCase) { ["frictionFactor"] = DefaultFactor };

    /// <summary>The default method's factor, from the same Core call as <see cref="Solve"/> with the same options, for a
    /// request of Reynolds number and relative roughness alone within their ranges; null (the row takes the full solve)
    /// for any other request, and for a factor or residual the answer's guard would refuse as not finite.</summary>
    private static double? DefaultFactor(FrictionFactorRequest request)
    {
        if (request is not { Reynolds: double reynolds, RelativeRoughness: double relativeRoughness, Roughness: null, Diameter: null,
            Method: null, LaminarLimit: null, Trace: not true })
            return null;
        if (!(reynolds >= DarcyFriction.MinimumReynolds && reynolds <= DarcyFriction.MaximumReynolds && relativeRoughness >= 0 && relativeRoughness < 1))
            return null;
        var options = new FrictionOptions(FrictionOptions.Default.LaminarLimit, Math.Max(FrictionOptions.Default.LaminarLimit, FrictionOptions.Default.TurbulentLimit));
        var exact = DarcyFriction.Compute(reynolds, relativeRoughness, FrictionMethod.ColebrookWhite, options);
        return double.IsFinite(exact.FrictionFactor) && double.IsFinite(exact.ResidualAtAnswer) ? exact.FrictionFactor : null;
    }

    public override Outcome<FrictionFactorResponse> Solve(FrictionFactorRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        double reynolds = errors.Required("reynolds", request.Reynolds, DarcyFriction.MinimumReynolds, DarcyFriction.MaximumReynolds);
        double laminarLimit = errors.Optional("laminarLimit", request.LaminarLimit, 1000, 4000) ?? FrictionOptions.Default.LaminarLimit;
        var assumptions = new List<AssumptionDto>();

        double relativeRoughness = double.NaN;
        if (request.RelativeRoughness is not null)
        {
            relativeRoughness = errors.Required("relativeRoughness", request.RelativeRoughness, 0, 1);
            if (relativeRoughness >= 1) errors.Add("relativeRoughness", "must be below 1 (roughness smaller than the diameter)");
            if (request.Roughness is not null || request.Diameter is not null)
                errors.Add("relativeRoughness", "give either relativeRoughness, or roughness and diameter, not both");
        }
        else if (request.Roughness is null && request.Diameter is null)
        {
            errors.Add("relativeRoughness", "is required (or give roughness and diameter)");
        }
        else
        {
            double roughness = errors.Required("roughness", request.Roughness, 0, double.MaxValue);
            double diameter = errors.Required("diameter", request.Diameter, 0, double.MaxValue, minExclusive: true);
            if (!errors.Has("roughness") && !errors.Has("diameter"))
            {
                relativeRoughness = roughness / diameter;
                if (!(relativeRoughness < 1)) errors.Add("roughness", "must be smaller than the diameter");
                else assumptions.Add(new("relativeRoughness", relativeRoughness.ToString("R", CultureInfo.InvariantCulture),
                    "computed as roughness / diameter (both in the same length unit)"));
            }
        }

        var method = FrictionMethodInfo.ColebrookWhite;
        if (request.Method is null)
            assumptions.Add(new("method", method.Code, "the exact Colebrook-White equation (default)"));
        else if (!FrictionMethodInfo.TryParse(request.Method, out method))
            errors.Add("method", "must be one of: " + string.Join(", ", FrictionMethodInfo.All.Select(m => m.Code)));

        if (errors.Any) return ProblemResults.BadInput(errors);

        if (request.LaminarLimit is null)
            assumptions.Add(new("laminarLimit", "2000", "laminar below Re 2000 and turbulent from Re 4000 (common practice)"));
        var options = new FrictionOptions(laminarLimit, Math.Max(laminarLimit, FrictionOptions.Default.TurbulentLimit));
        SolverTrace? trace = context.Trace ? new SolverTrace() : null;

        var exact = DarcyFriction.Compute(reynolds, relativeRoughness, FrictionMethod.ColebrookWhite, options, trace);
        var chosen = method.Method == FrictionMethod.ColebrookWhite
            ? exact
            : DarcyFriction.Compute(reynolds, relativeRoughness, method.Method, options);

        var approximations = FrictionMethodInfo.Approximations.Select(a =>
        {
            // Far outside its range (creeping flow, say) an approximation can overflow: report it as not evaluable.
            double f = ExplicitFriction.Evaluate(a.Method, reynolds, relativeRoughness);
            double deviation = (f / exact.FrictionFactor - 1) * 100;
            bool finite = double.IsFinite(f) && f > 0 && double.IsFinite(deviation);
            return new ApproximationDto(a.Code, finite ? f : null, finite ? deviation : null, a.InRange(reynolds, relativeRoughness),
                a.MeasuredMaxDeviationPercent);
        }).ToArray();

        var warnings = DarcyFriction.Describe(chosen.Warnings | exact.Warnings & ~FrictionWarnings.ApproximationOutOfRange,
            reynolds, relativeRoughness, chosen.Relation, options).Select(WarningDto.From).ToArray();

        var response = new FrictionFactorResponse(
            chosen.FrictionFactor, chosen.Relation, RegimeCode(chosen.Regime), exact.FrictionFactor,
            reynolds, relativeRoughness,
            exact.Iterations, exact.Converged && chosen.Converged, exact.ResidualAtAnswer,
            exact.Status.Code(), "1/sqrt(f)",
            chosen.Validity(options).Select(ValidityDto.From).ToArray(), warnings, assumptions, approximations,
            TraceStepDto.From(trace));
        if (context.Sensitivities) response = response with { Sensitivities = Sensitivities(chosen, reynolds, relativeRoughness, request) };
        return response;
    }

    /// <summary>df/dRe and df/d(e/D) of the relation used (analytic; <see cref="FrictionSensitivity"/>), and through
    /// e/D = roughness/diameter when those were given.</summary>
    private static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities(
        in FrictionResult chosen, double reynolds, double relativeRoughness, FrictionFactorRequest request)
    {
        var p = FrictionSensitivity.Of(chosen, reynolds, relativeRoughness);
        var b = new SensitivityBuilder();
        double f = chosen.FrictionFactor;
        b.Add("frictionFactor", f, "reynolds", reynolds, p.Reynolds);
        if (request.RelativeRoughness is not null)
        {
            b.Add("frictionFactor", f, "relativeRoughness", relativeRoughness, p.RelativeRoughness);
        }
        else
        {
            // Roughness and diameter share one (unstated) length unit, so these derivatives are per that unit.
            double e = request.Roughness!.Value, d = request.Diameter!.Value;
            b.Add("frictionFactor", f, "roughness", e, p.RelativeRoughness / d);
            b.Add("frictionFactor", f, "diameter", d, -p.RelativeRoughness * e / (d * d));
        }
        return b.Build();
    }

    private static string RegimeCode(FlowRegime regime) => regime switch
    {
        FlowRegime.Laminar => "laminar",
        FlowRegime.Transitional => "transitional",
        _ => "turbulent",
    };
}
