using System.ComponentModel;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.NonNewtonian;

/// <summary>Field descriptions shared by the non-Newtonian requests (units stated; US customary with units=us).</summary>
internal static class NonNewtonianFields
{
    public const string Model = "Rheological model: power-law (needs density, consistencyIndex, flowBehaviorIndex) or bingham-plastic (needs density, yieldStress, plasticViscosity). A field of the other model is refused (400), never ignored.";
    public const string Density = "Density rho of the fluid, kg/m3 (lb/ft3 with units=us); 1e-3 to 1e5 kg/m3.";
    public const string ConsistencyIndex = "Power law: consistency index K, Pa s^n (lbf s^n/ft2 with units=us); greater than 0, at most 1e6 Pa s^n. From measurements of the actual fluid over the pipe's shear rates.";
    public const string FlowBehaviorIndex = "Power law: flow behaviour index n (dimensionless); 0.01 to 2 (below 1 shear-thinning, above 1 shear-thickening). From measurements of the actual fluid.";
    public const string YieldStress = "Bingham plastic: yield stress tau0, Pa (lbf/ft2 with units=us); 0 (a Newtonian fluid) to 1e6 Pa. From measurements of the actual fluid.";
    public const string PlasticViscosity = "Bingham plastic: plastic viscosity mu_p, Pa s (lbf s/ft2 with units=us); greater than 0, at most 1e4 Pa s. From measurements of the actual fluid.";
    public const string Velocity = "Mean velocity V, m/s (ft/s with units=us); greater than 0, at most 1e4 m/s.";
    public const string Diameter = "Inside diameter D, m (ft with units=us); 1e-6 to 100 m. The wall is taken as hydraulically smooth.";
    public const string Length = "Pipe length L, m (ft with units=us); greater than 0, at most 1e7 m.";
    public const string MinorLossCoefficient = "Sum of the fittings' loss coefficients K (dimensionless), applied to V^2/(2g); 0 (default) to 1e6. Values measured with water are a rough guide for non-Newtonian fluids.";
    public const string Flow = "Volumetric flow Q, in flowUnit (m3/s by default); greater than 0, at most 1e7 m3/s.";
    public const string HeadLoss = "Head loss to be met by friction and fittings, hf + hm, m (ft with units=us); greater than 0, at most 1e7 m. A Bingham plastic needs more than 4 tau0 L/(rho g D) before it flows at all (422 otherwise).";
    public const string Units = "Unit system of the whole request and response: si (default) or us (ft, ft/s, lb/ft3, lbf/ft2, lbf s/ft2, lbf s^n/ft2, psi).";
    public const string Trace = "When true, include the solver's per-iteration record (in the solve variable named by solveVariable).";
}

/// <summary>The fluid fields every non-Newtonian request shares; one reader validates them.</summary>
public interface INonNewtonianRequest
{
    string? Model { get; }
    double? Density { get; }
    double? ConsistencyIndex { get; }
    double? FlowBehaviorIndex { get; }
    double? YieldStress { get; }
    double? PlasticViscosity { get; }
    string? Units { get; }
}

/// <summary>Inputs of the non-Newtonian friction factor (query parameters for GET, a JSON body for POST).</summary>
public sealed record NonNewtonianFrictionRequest(
    [property: Description(NonNewtonianFields.Model)] [FromQuery(Name = "model")] string? Model,
    [property: Description(NonNewtonianFields.Density)] [FromQuery(Name = "density")] double? Density,
    [property: Description(NonNewtonianFields.Velocity)] [FromQuery(Name = "velocity")] double? Velocity,
    [property: Description(NonNewtonianFields.Diameter)] [FromQuery(Name = "diameter")] double? Diameter,
    [property: Description(NonNewtonianFields.ConsistencyIndex)] [FromQuery(Name = "consistencyIndex")] double? ConsistencyIndex = null,
    [property: Description(NonNewtonianFields.FlowBehaviorIndex)] [FromQuery(Name = "flowBehaviorIndex")] double? FlowBehaviorIndex = null,
    [property: Description(NonNewtonianFields.YieldStress)] [FromQuery(Name = "yieldStress")] double? YieldStress = null,
    [property: Description(NonNewtonianFields.PlasticViscosity)] [FromQuery(Name = "plasticViscosity")] double? PlasticViscosity = null,
    [property: Description(NonNewtonianFields.Units)] [FromQuery(Name = "units")] string? Units = null,
    [property: Description(NonNewtonianFields.Trace)] [FromQuery(Name = "trace")] bool? Trace = null) : INonNewtonianRequest, ITraceable;

/// <summary>Inputs of the non-Newtonian head loss (query parameters for GET, a JSON body for POST).</summary>
public sealed record NonNewtonianHeadLossRequest(
    [property: Description(NonNewtonianFields.Model)] [FromQuery(Name = "model")] string? Model,
    [property: Description(NonNewtonianFields.Density)] [FromQuery(Name = "density")] double? Density,
    [property: Description(NonNewtonianFields.Flow)] [FromQuery(Name = "flow")] double? Flow,
    [property: Description(NonNewtonianFields.Diameter)] [FromQuery(Name = "diameter")] double? Diameter,
    [property: Description(NonNewtonianFields.Length)] [FromQuery(Name = "length")] double? Length,
    [property: Description(NonNewtonianFields.MinorLossCoefficient)] [FromQuery(Name = "minorLossCoefficient")] double? MinorLossCoefficient = null,
    [property: Description(NonNewtonianFields.ConsistencyIndex)] [FromQuery(Name = "consistencyIndex")] double? ConsistencyIndex = null,
    [property: Description(NonNewtonianFields.FlowBehaviorIndex)] [FromQuery(Name = "flowBehaviorIndex")] double? FlowBehaviorIndex = null,
    [property: Description(NonNewtonianFields.YieldStress)] [FromQuery(Name = "yieldStress")] double? YieldStress = null,
    [property: Description(NonNewtonianFields.PlasticViscosity)] [FromQuery(Name = "plasticViscosity")] double? PlasticViscosity = null,
    [property: Description(NonNewtonianFields.Units)] [FromQuery(Name = "units")] string? Units = null,
    [property: Description(Hosting.FlowUnit.Description)] [FromQuery(Name = "flowUnit")] string? FlowUnit = null,
    [property: Description(NonNewtonianFields.Trace)] [FromQuery(Name = "trace")] bool? Trace = null) : INonNewtonianRequest, ITraceable;

/// <summary>Inputs of the non-Newtonian flow from a head loss (query parameters for GET, a JSON body for POST).</summary>
public sealed record NonNewtonianFlowRequest(
    [property: Description(NonNewtonianFields.Model)] [FromQuery(Name = "model")] string? Model,
    [property: Description(NonNewtonianFields.Density)] [FromQuery(Name = "density")] double? Density,
    [property: Description(NonNewtonianFields.HeadLoss)] [FromQuery(Name = "headLoss")] double? HeadLoss,
    [property: Description(NonNewtonianFields.Diameter)] [FromQuery(Name = "diameter")] double? Diameter,
    [property: Description(NonNewtonianFields.Length)] [FromQuery(Name = "length")] double? Length,
    [property: Description(NonNewtonianFields.MinorLossCoefficient)] [FromQuery(Name = "minorLossCoefficient")] double? MinorLossCoefficient = null,
    [property: Description(NonNewtonianFields.ConsistencyIndex)] [FromQuery(Name = "consistencyIndex")] double? ConsistencyIndex = null,
    [property: Description(NonNewtonianFields.FlowBehaviorIndex)] [FromQuery(Name = "flowBehaviorIndex")] double? FlowBehaviorIndex = null,
    [property: Description(NonNewtonianFields.YieldStress)] [FromQuery(Name = "yieldStress")] double? YieldStress = null,
    [property: Description(NonNewtonianFields.PlasticViscosity)] [FromQuery(Name = "plasticViscosity")] double? PlasticViscosity = null,
    [property: Description(NonNewtonianFields.Units)] [FromQuery(Name = "units")] string? Units = null,
    [property: Description(Hosting.FlowUnit.Description)] [FromQuery(Name = "flowUnit")] string? FlowUnit = null,
    [property: Description(NonNewtonianFields.Trace)] [FromQuery(Name = "trace")] bool? Trace = null) : INonNewtonianRequest, ITraceable;

/// <summary>The non-Newtonian friction factor and how it was obtained.</summary>
/// <param name="FrictionFactor">Darcy friction factor, 4 times the Fanning factor (dimensionless), as everywhere in FlowSolve.</param>
/// <param name="FanningFrictionFactor">Fanning friction factor tau_w / (rho V^2/2), the factor the published relations give.</param>
/// <param name="Reynolds">Metzner-Reed Reynolds number (power-law) or plastic Reynolds number rho V D / mu_p (bingham-plastic).</param>
/// <param name="HedstromNumber">bingham-plastic: Hedstrom number rho D^2 tau0 / mu_p^2; absent for power-law.</param>
/// <param name="CriticalReynolds">power-law: critical Reynolds number of Ryan and Johnson (1959); absent for bingham-plastic.</param>
/// <param name="Regime">laminar or turbulent (power-law: below or from the critical Reynolds number; bingham-plastic: the larger part of Darby's combination).</param>
/// <param name="Method">The relation used: metzner-reed-laminar (16/Re), dodge-metzner or darby-mun-boger.</param>
/// <param name="Model">power-law or bingham-plastic.</param>
/// <param name="LaminarFanningFrictionFactor">The laminar Fanning factor: 16/Re (power-law) or Buckingham-Reiner (bingham-plastic).</param>
/// <param name="TurbulentFanningFrictionFactor">The turbulent Fanning factor: Dodge-Metzner (power-law, turbulent only) or Darby's correlation (bingham-plastic); absent when not evaluated.</param>
/// <param name="PlugRatio">bingham-plastic: tau0 / tau_w of the laminar part, the unsheared plug's share of the radius; absent for power-law.</param>
/// <param name="WallShearStress">Wall shear stress tau_w, Pa (lbf/ft2 with units=us).</param>
/// <param name="Velocity">Mean velocity as used, m/s (ft/s with units=us).</param>
/// <param name="Diameter">Inside diameter as used, m (ft with units=us).</param>
/// <param name="Density">Density as used, kg/m3 (lb/ft3 with units=us).</param>
/// <param name="Iterations">Steps of the implicit solve (0 for an explicit relation).</param>
/// <param name="Converged">True when the solve met its tolerance (always true for an explicit relation).</param>
/// <param name="Residual">Residual of the implicit equation at the answer, in the solve variable (0 when explicit).</param>
/// <param name="Status">Why the solver stopped: converged-on-step, converged-on-residual, iteration-cap-reached, no-sign-change, non-finite-value, or closed-form.</param>
/// <param name="SolveVariable">The solve variable: 1/sqrt(f) (Dodge-Metzner), u = 1 - tau0/tau_w (Buckingham-Reiner) or none.</param>
/// <param name="Units">si or us.</param>
/// <param name="Validity">Each correlation's published range beside the inputs.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults and assumptions that were applied.</param>
/// <param name="Trace">Per-iteration solver record, when trace=true.</param>
public sealed record NonNewtonianFrictionResponse(
    double FrictionFactor, double FanningFrictionFactor, double Reynolds, double? HedstromNumber, double? CriticalReynolds,
    string Regime, string Method, string Model, double LaminarFanningFrictionFactor, double? TurbulentFanningFrictionFactor,
    double? PlugRatio, double WallShearStress, double Velocity, double Diameter, double Density,
    int Iterations, bool Converged, double Residual, string Status, string SolveVariable, string Units,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    IReadOnlyList<TraceStepDto>? Trace) : ISolveSummary, ISensitive
{
    /// <summary>Present only with sensitivities=true: frictionFactor and reynolds, then each numeric input field given (velocity, diameter, density, and consistencyIndex and flowBehaviorIndex or yieldStress and plasticViscosity), then {derivative, elasticity}; see the sensitivities query parameter. By implicit differentiation of the solved relations. Derivatives in SI units whatever the request's units (per m/s, per m3/s, per m, per kg/m3, per Pa s^n, per Pa, per Pa s); elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }
}

/// <summary>Head loss of a non-Newtonian fluid in a pipe at a flow.</summary>
/// <param name="HeadLoss">Friction + minor head loss hf + hm, m (ft with units=us).</param>
/// <param name="FrictionHeadLoss">Friction loss hf = frictionFactor (L/D) V^2/(2g) = 4 tau_w L/(rho g D), m (ft with units=us).</param>
/// <param name="MinorHeadLoss">Minor loss hm = K V^2/(2g), m (ft with units=us).</param>
/// <param name="PressureDrop">rho g (hf + hm), Pa (psi with units=us).</param>
/// <param name="Flow">Flow as used, in flowUnit.</param>
/// <param name="Velocity">Mean velocity 4Q/(pi D^2), m/s (ft/s with units=us).</param>
/// <param name="Reynolds">Metzner-Reed (power-law) or plastic (bingham-plastic) Reynolds number.</param>
/// <param name="HedstromNumber">bingham-plastic: Hedstrom number; absent for power-law.</param>
/// <param name="CriticalReynolds">power-law: Ryan-Johnson critical Reynolds number; absent for bingham-plastic.</param>
/// <param name="FrictionFactor">Darcy friction factor (4 x Fanning).</param>
/// <param name="FanningFrictionFactor">Fanning friction factor.</param>
/// <param name="Regime">laminar or turbulent.</param>
/// <param name="Method">metzner-reed-laminar, dodge-metzner or darby-mun-boger.</param>
/// <param name="Model">power-law or bingham-plastic.</param>
/// <param name="PlugRatio">bingham-plastic: tau0/tau_w of the laminar part; absent for power-law.</param>
/// <param name="WallShearStress">Wall shear stress, Pa (lbf/ft2 with units=us).</param>
/// <param name="Diameter">Inside diameter, m (ft with units=us).</param>
/// <param name="Length">Length, m (ft with units=us).</param>
/// <param name="MinorLossCoefficient">K as used.</param>
/// <param name="Density">Density, kg/m3 (lb/ft3 with units=us).</param>
/// <param name="Iterations">Steps of the friction factor's implicit solve (0 when explicit).</param>
/// <param name="Converged">True when the friction factor converged.</param>
/// <param name="Residual">Residual of the friction factor's implicit equation at the answer (0 when explicit).</param>
/// <param name="Status">Why the friction solve stopped (closed-form when explicit).</param>
/// <param name="SolveVariable">1/sqrt(f), u = 1 - tau0/tau_w, or none.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">The flow unit of flow.</param>
/// <param name="Validity">Each correlation's published range beside the inputs.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults and assumptions that were applied.</param>
/// <param name="Trace">Per-iteration record of the friction factor's solve, when trace=true.</param>
public sealed record NonNewtonianHeadLossResponse(
    double HeadLoss, double FrictionHeadLoss, double MinorHeadLoss, double PressureDrop, double Flow, double Velocity,
    double Reynolds, double? HedstromNumber, double? CriticalReynolds, double FrictionFactor, double FanningFrictionFactor,
    string Regime, string Method, string Model, double? PlugRatio, double WallShearStress,
    double Diameter, double Length, double MinorLossCoefficient, double Density,
    int Iterations, bool Converged, double Residual, string Status, string SolveVariable, string Units, string FlowUnit,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    IReadOnlyList<TraceStepDto>? Trace) : ISolveSummary, ISensitive
{
    /// <summary>Present only with sensitivities=true: headLoss, frictionFactor, reynolds and velocity, then each numeric input field given (flow (per m3/s whatever flowUnit), diameter, length, minorLossCoefficient when given, density, and the model's rheology fields), then {derivative, elasticity}; see the sensitivities query parameter. By implicit differentiation of the solved relations. Derivatives in SI units whatever the request's units (per m/s, per m3/s, per m, per kg/m3, per Pa s^n, per Pa, per Pa s); elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }
}

/// <summary>The flow of a non-Newtonian fluid that meets a head loss.</summary>
/// <param name="Flow">Flow, in flowUnit.</param>
/// <param name="Velocity">Mean velocity, m/s (ft/s with units=us).</param>
/// <param name="HeadLoss">hf + hm at the flow, m (ft with units=us): the head loss asked for, to the solve's tolerance.</param>
/// <param name="FrictionHeadLoss">Friction loss at the flow, m (ft with units=us).</param>
/// <param name="MinorHeadLoss">Minor loss at the flow, m (ft with units=us).</param>
/// <param name="PressureDrop">rho g (hf + hm), Pa (psi with units=us).</param>
/// <param name="Reynolds">Metzner-Reed (power-law) or plastic (bingham-plastic) Reynolds number at the flow.</param>
/// <param name="HedstromNumber">bingham-plastic: Hedstrom number; absent for power-law.</param>
/// <param name="CriticalReynolds">power-law: Ryan-Johnson critical Reynolds number; absent for bingham-plastic.</param>
/// <param name="FrictionFactor">Darcy friction factor at the flow (4 x Fanning).</param>
/// <param name="FanningFrictionFactor">Fanning friction factor at the flow.</param>
/// <param name="Regime">laminar or turbulent.</param>
/// <param name="Method">metzner-reed-laminar, dodge-metzner or darby-mun-boger.</param>
/// <param name="Model">power-law or bingham-plastic.</param>
/// <param name="PlugRatio">bingham-plastic: tau0/tau_w of the laminar part; absent for power-law.</param>
/// <param name="WallShearStress">Wall shear stress at the flow, Pa (lbf/ft2 with units=us).</param>
/// <param name="YieldHeadLoss">bingham-plastic: 4 tau0 L/(rho g D), the head loss below which nothing flows, m (ft with units=us); absent for power-law.</param>
/// <param name="Diameter">Inside diameter, m (ft with units=us).</param>
/// <param name="Length">Length, m (ft with units=us).</param>
/// <param name="MinorLossCoefficient">K as used.</param>
/// <param name="Density">Density, kg/m3 (lb/ft3 with units=us).</param>
/// <param name="Iterations">Steps of the outer solve in ln(Q).</param>
/// <param name="FrictionIterations">Steps of the friction factor's implicit solve at the flow found.</param>
/// <param name="Converged">True when the flow meets the head loss to the solve's tolerance.</param>
/// <param name="Residual">ln(h(Q)) - ln(headLoss) at the returned flow.</param>
/// <param name="Status">solved or not-converged.</param>
/// <param name="SolverStatus">Why the outer solver stopped (converged-on-step, ...).</param>
/// <param name="SolveVariable">The outer solve variable, ln(Q).</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">The flow unit of flow.</param>
/// <param name="Validity">Each correlation's published range beside the inputs.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults and assumptions that were applied.</param>
/// <param name="Trace">Per-iteration record of the outer solve in ln(Q) (SI), when trace=true.</param>
public sealed record NonNewtonianFlowResponse(
    double Flow, double Velocity, double HeadLoss, double FrictionHeadLoss, double MinorHeadLoss, double PressureDrop,
    double Reynolds, double? HedstromNumber, double? CriticalReynolds, double FrictionFactor, double FanningFrictionFactor,
    string Regime, string Method, string Model, double? PlugRatio, double WallShearStress, double? YieldHeadLoss,
    double Diameter, double Length, double MinorLossCoefficient, double Density,
    int Iterations, int FrictionIterations, bool Converged, double Residual, string Status, string SolverStatus, string SolveVariable,
    string Units, string FlowUnit,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    IReadOnlyList<TraceStepDto>? Trace) : ISolveSummary, ISensitive
{
    /// <summary>Present only with sensitivities=true: flow (m3/s whatever flowUnit), velocity, frictionFactor and reynolds, then each numeric input field given (headLoss, diameter, length, minorLossCoefficient when given, density, and the model's rheology fields), then {derivative, elasticity}; see the sensitivities query parameter. By implicit differentiation of the solved relations. Derivatives in SI units whatever the request's units (per m/s, per m3/s, per m, per kg/m3, per Pa s^n, per Pa, per Pa s); elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }

    /// <summary>Present only when a second flow meets the same head (see the second-solution warning), in flowUnit: for a power-law fluid of small n, Dodge-Metzner at the critical Reynolds number lies below the laminar law, so heads within that drop are met by a laminar and a turbulent flow. flow is then the turbulent one and this the laminar one, the lower flow and the cautious estimate.</summary>
    public double? AlternateFlow { get; init; }
}
