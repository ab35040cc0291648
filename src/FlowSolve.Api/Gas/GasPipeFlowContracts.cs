using System.ComponentModel;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Gas;

/// <summary>Inputs of the gas-line calculation (query parameters for GET, a JSON body for POST).</summary>
public sealed record GasPipeFlowRequest(
    [property: Description("Inlet pressure p1, absolute: Pa (psi absolute with units=us); greater than 0.")]
    [FromQuery(Name = "inletPressure")] double? InletPressure,
    [property: Description("Outlet pressure p2, absolute: Pa (psi absolute with units=us); greater than 0 and below inletPressure. Give this to solve for massFlow, or massFlow to solve for it; not both.")]
    [FromQuery(Name = "outletPressure")] double? OutletPressure = null,
    [property: Description("Mass flow: kg/s (lb/s with units=us); greater than 0. Give this to solve for outletPressure, or outletPressure to solve for it; not both.")]
    [FromQuery(Name = "massFlow")] double? MassFlow = null,
    [property: Description("Temperature of the gas along the line (isothermal flow): degrees C (degrees F with units=us); above absolute zero.")]
    [FromQuery(Name = "temperature")] double? Temperature = null,
    [property: Description("Molar mass M: kg/mol in both unit systems (methane 0.01604); 0.001 to 1. Give this or specificGravity, not both.")]
    [FromQuery(Name = "molarMass")] double? MolarMass = null,
    [property: Description("Specific gravity: molar mass relative to dry air, 0.0289647 kg/mol (dimensionless); 0.03 to 35. Give this or molarMass, not both.")]
    [FromQuery(Name = "specificGravity")] double? SpecificGravity = null,
    [property: Description("Compressibility factor Z (dimensionless), taken as constant along the line; 0.05 to 5; default 1 (ideal gas).")]
    [FromQuery(Name = "compressibilityFactor")] double? CompressibilityFactor = null,
    [property: Description("Dynamic viscosity mu of the gas: Pa s (lbf s/ft2 with units=us); greater than 0 and at most 1 Pa s.")]
    [FromQuery(Name = "dynamicViscosity")] double? DynamicViscosity = null,
    [property: Description("Ratio of specific heats k = cp/cv (dimensionless), for the speed of sound and Mach numbers only; 1 to 1.7; default 1.3.")]
    [FromQuery(Name = "heatCapacityRatio")] double? HeatCapacityRatio = null,
    [property: Description("Pipe length L: m (ft with units=us); greater than 0.")]
    [FromQuery(Name = "length")] double? Length = null,
    [property: Description("Inside diameter D: m (ft with units=us); greater than 0.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Absolute roughness e: m (ft with units=us); 0 or more and below the diameter.")]
    [FromQuery(Name = "roughness")] double? Roughness = null,
    [property: Description("Unit system of the request and response: si (default) or us (psi absolute, degrees F, ft, lb/s, lbf s/ft2, ft/s, lb/ft3, ft3/s); molarMass stays in kg/mol.")]
    [FromQuery(Name = "units")] string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the main solve (solve variable named by solveVariable).")]
    [FromQuery(Name = "trace")] bool? Trace = null) : ITraceable;

/// <summary>A gas line solved: both pressures, the mass flow, velocities and Mach numbers at both ends, the standard volume
/// flow, and the isothermal limit.</summary>
/// <param name="Result">The solved quantity: massFlow when outletPressure was given, outletPressure when massFlow was given (see solvedFor); what format=text answers by default.</param>
/// <param name="SolvedFor">massFlow or outletPressure: which input was missing and was solved for.</param>
/// <param name="MassFlow">Mass flow, kg/s (lb/s with units=us).</param>
/// <param name="InletPressure">Inlet pressure, absolute, as given: Pa (psi).</param>
/// <param name="OutletPressure">Outlet pressure, absolute: Pa (psi).</param>
/// <param name="PressureDrop">inletPressure - outletPressure: Pa (psi).</param>
/// <param name="InletVelocity">Mean velocity at the inlet, mass flow / (density area): m/s (ft/s).</param>
/// <param name="OutletVelocity">Mean velocity at the outlet: m/s (ft/s).</param>
/// <param name="InletMachNumber">Inlet velocity over the speed of sound sqrt(k Z R T / M) (dimensionless).</param>
/// <param name="OutletMachNumber">Outlet velocity over the speed of sound (dimensionless); at most 1/sqrt(k), the isothermal limit.</param>
/// <param name="InletDensity">Density at the inlet p1 M / (Z R T): kg/m3 (lb/ft3).</param>
/// <param name="OutletDensity">Density at the outlet: kg/m3 (lb/ft3).</param>
/// <param name="Reynolds">Reynolds number G D / mu, the same all along an isothermal line (dimensionless).</param>
/// <param name="FrictionFactor">Darcy friction factor at that Reynolds number (dimensionless).</param>
/// <param name="FrictionRelation">The friction relation used: colebrook-white, laminar (64/Re) or churchill (transition zone).</param>
/// <param name="RelativeRoughness">roughness / diameter (dimensionless).</param>
/// <param name="StandardVolumeFlow">Volume flow at standard conditions, 15 degrees C and 101 325 Pa, the gas taken as ideal there (Z = 1): m3/s (ft3/s with units=us, at the same 15 degrees C and 101 325 Pa).</param>
/// <param name="LargestMassFlow">The largest mass flow the line passes from this inlet pressure (the isothermal limit, outlet Mach number 1/sqrt(k)): kg/s (lb/s); absent when it lies outside the friction relations' range.</param>
/// <param name="OutletPressureAtLimit">The outlet pressure at the largest mass flow: Pa (psi); absent with largestMassFlow.</param>
/// <param name="LimitVelocity">The isothermal limit velocity sqrt(Z R T / M): m/s (ft/s).</param>
/// <param name="SpeedOfSound">The speed of sound sqrt(k Z R T / M): m/s (ft/s).</param>
/// <param name="MolarMass">Molar mass as used, kg/mol (from specificGravity x 0.0289647 when that was given).</param>
/// <param name="Units">si or us.</param>
/// <param name="Iterations">Steps of the main solve (0 when none was needed).</param>
/// <param name="Converged">True when the main solve met its tolerance.</param>
/// <param name="Residual">The relation's residual at the answer divided by p1^2 (dimensionless): (p1^2 - p2^2)/p1^2 - (Z R T G^2 / (M p1^2)) (f L/D + 2 ln(p1/p2)).</param>
/// <param name="Status">Why the main solve stopped (closed-form when no iteration was needed).</param>
/// <param name="SolveVariable">The variable the main solve iterated on.</param>
/// <param name="Method">The relations used.</param>
/// <param name="Validity">The friction relation's published ranges beside the inputs.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
public sealed record GasPipeFlowResponse(
    double Result, string SolvedFor, double MassFlow, double InletPressure, double OutletPressure, double PressureDrop,
    double InletVelocity, double OutletVelocity, double InletMachNumber, double OutletMachNumber, double InletDensity, double OutletDensity,
    double Reynolds, double FrictionFactor, string FrictionRelation, double RelativeRoughness, double StandardVolumeFlow,
    double? LargestMassFlow, double? OutletPressureAtLimit, double LimitVelocity, double SpeedOfSound, double MolarMass, string Units,
    int Iterations, bool Converged, double Residual, string Status, string SolveVariable, string Method,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : ISolveSummary, ISensitive
{
    /// <summary>Present only with sensitivities=true: the solved field (outletPressure or massFlow), then each numeric input field, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units (per Pa, per kg/s, per m, per kelvin, per Pa s, per kg/mol); elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }

    /// <summary>Present only with trace=true: the per-iteration record of the main solve (see solveVariable).</summary>
    public IReadOnlyList<TraceStepDto>? Trace { get; init; }
}
