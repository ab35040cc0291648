using System.ComponentModel;
using System.ComponentModel.DataAnnotations;
using Microsoft.AspNetCore.Mvc;
using FlowSolve.Api.Contracts;

namespace FlowSolve.Api.Friction;

/// <summary>Inputs of the friction-factor calculation (query parameters for GET, a JSON body for POST).</summary>
public sealed record FrictionFactorRequest(
    [property: Description("Reynolds number Re = V D / nu (dimensionless); 0.001 to 1e15.")]
    [property: Required]
    [FromQuery(Name = "reynolds")] double? Reynolds,
    [property: Description("Relative roughness e/D (dimensionless); 0 (smooth pipe) to below 1. Give this, or roughness and diameter.")]
    [FromQuery(Name = "relativeRoughness")] double? RelativeRoughness = null,
    [property: Description("Absolute roughness e, same length unit as diameter (m by default); with diameter, instead of relativeRoughness.")]
    [FromQuery(Name = "roughness")] double? Roughness = null,
    [property: Description("Inside diameter D, same length unit as roughness (m by default); with roughness, instead of relativeRoughness.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Turbulent-flow method: colebrook-white (default, exact), swamee-jain, haaland, churchill or serghides.")]
    [FromQuery(Name = "method")] string? Method = null,
    [property: Description("Reynolds number below which flow is laminar (dimensionless); default 2000 (common practice), 1000 to 4000.")]
    [FromQuery(Name = "laminarLimit")] double? LaminarLimit = null,
    [property: Description("When true, include the solver's per-iteration record in the response.")]
    [FromQuery(Name = "trace")] bool? Trace = null) : FlowSolve.Api.Hosting.ITraceable;

/// <summary>One explicit approximation evaluated beside the exact value.</summary>
/// <param name="Method">The approximation.</param>
/// <param name="FrictionFactor">Its Darcy friction factor at these inputs (dimensionless); absent when the formula overflows far outside its range.</param>
/// <param name="DeviationPercent">(approximation / exact - 1) x 100 at these inputs; absent with frictionFactor.</param>
/// <param name="InRange">True when the inputs are inside the approximation's published range.</param>
/// <param name="MaxDeviationPercentOverRange">Largest |deviation| FlowSolve measured over the approximation's whole published range.</param>
public sealed record ApproximationDto(string Method, double? FrictionFactor, double? DeviationPercent, bool InRange, double MaxDeviationPercentOverRange);

/// <summary>The Darcy friction factor and how it was obtained.</summary>
/// <param name="FrictionFactor">Darcy friction factor f from the requested method (dimensionless).</param>
/// <param name="Method">The relation actually used: laminar (64/Re), colebrook-white, swamee-jain, haaland, churchill or serghides.</param>
/// <param name="Regime">laminar, transitional or turbulent.</param>
/// <param name="ExactFrictionFactor">The exact value for the regime (64/Re, Churchill in transition, or Colebrook-White solved), which approximations are compared with.</param>
/// <param name="Reynolds">Reynolds number as used.</param>
/// <param name="RelativeRoughness">Relative roughness as used (computed from roughness/diameter when those were given).</param>
/// <param name="Iterations">Solver iterations (0 for explicit relations).</param>
/// <param name="Converged">True when the solve met its tolerance (always true for explicit relations).</param>
/// <param name="Residual">Residual of Colebrook-White in 1/sqrt(f) at the answer (0 for explicit relations).</param>
/// <param name="Status">Why the solver stopped: converged-on-step, converged-on-residual, iteration-cap-reached, no-sign-change or non-finite-value; closed-form when no solve ran because the exact value for the regime is explicit (the laminar law 64/Re, Churchill in the transition zone).</param>
/// <param name="SolveVariable">The variable the solver iterated on (x = 1/sqrt(f)).</param>
/// <param name="Validity">Each correlation's published range beside the inputs.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
/// <param name="Approximations">Every explicit approximation beside the exact value.</param>
/// <param name="Trace">Per-iteration solver record, when trace=true.</param>
public sealed record FrictionFactorResponse(
    double FrictionFactor, string Method, string Regime, double ExactFrictionFactor,
    double Reynolds, double RelativeRoughness,
    int Iterations, bool Converged, double Residual, string Status, string SolveVariable,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    IReadOnlyList<ApproximationDto> Approximations, IReadOnlyList<TraceStepDto>? Trace) : FlowSolve.Api.Hosting.ISolveSummary, FlowSolve.Api.Hosting.ISensitive
{
    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }
}

