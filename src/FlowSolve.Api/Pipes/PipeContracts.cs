using System.ComponentModel;
using System.Diagnostics.CodeAnalysis;
using System.Globalization;
using FlowSolve.Api.Contracts;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Pipes;

/// <summary>Field descriptions shared by the pipe requests, so the three calculations describe a field the same way.</summary>
internal static class PipeFields
{
    public const string Flow = "Volumetric flow Q, m3/s (or l/s or m3/h with flowUnit; ft3/s with units=us, or US gal/min with flowUnit=gpm); greater than 0.";
    public const string Diameter = "Inside diameter D, m (ft with units=us); at least 1e-6 m, at most 100 m.";
    public const string Length = "Pipe length L, m (ft with units=us); greater than 0, at most 1e7 m.";
    public const string Roughness = "Absolute roughness e, m (ft with units=us); 0 (smooth) or more and below the diameter. Give this or material, not both.";
    public const string Material = "Pipe material whose tabulated roughness is used instead of roughness, for example cast-iron or commercial-steel; GET /v1/pipes/materials lists them.";
    public const string SurfaceCondition = "With material: new (default) or aged (only where the table gives an aged value).";
    public const string AgedRoughness = "Optional, used with sensitivities=true: your own aged or condition-assessed absolute roughness, m (ft with units=us); 0 or more, below the diameter. roughnessSpread then runs from the roughness the answer used (the material's value, or roughness) to this value (basis caller-aged), for any material or a given roughness.";
    public const string MinorLossCoefficient = "Sum of the fittings' loss coefficients K (dimensionless), each applied to the pipe's velocity head V^2/(2g); 0 or more, default 0. Give this or fittings, not both.";
    public const string Fittings = "Fittings whose tabulated K values are summed, instead of minorLossCoefficient. JSON: a list of {name, count} (count default 1). Query: name:count pairs separated by commas, for example elbow-90-flanged-regular:3,gate-valve-open:1 (\":count\" may be left out for 1). GET /v1/pipes/fittings lists the names.";
    public const string ElevationChange = "Elevation of the outlet above the inlet, z2 - z1, m (ft with units=us); negative when the pipe falls; default 0.";
    public const string KinematicViscosity = "Kinematic viscosity nu of the fluid, m2/s (ft2/s with units=us); 1e-9 to 10 m2/s. Give this (and density, for pressures), or temperature for water; when neither, water at 20 degrees C (68 degrees F) is assumed and said so in assumptions.";
    public const string Density = "Density rho of the fluid, kg/m3 (lb/ft3 with units=us); 1e-3 to 1e5 kg/m3; with kinematicViscosity. Without it the pressure drop is not reported.";
    public const string Temperature = "Water temperature, degrees C, 0 to 100 (degrees F, 32 to 212, with units=us): the fluid is then liquid water at 1 atm (IAPWS-IF97, IAPWS 2008). Instead of kinematicViscosity and density.";
    public const string Method = "darcy-weisbach (default: Darcy-Weisbach with the exact Colebrook-White friction factor) or hazen-williams (water only; needs hazenWilliamsC; the Darcy-Weisbach result is reported beside it).";
    public const string HazenWilliamsC = "Hazen-Williams C factor (dimensionless), with method=hazen-williams only; greater than 0, at most 1000 (tabulated values for real pipe run from about 40 to 150).";
    public const string Units = "Unit system of the whole request and response: si (default) or us (ft, ft/s, ft3/s, ft2/s, psi, lb/ft3, degrees F).";
    public const string FlowUnit = Hosting.FlowUnit.Description;
    public const string Trace = "When true, include the outer solver's per-iteration record (in the solve variable named by solveVariable, SI units).";
    public const string AvailableHead = "Head available to drive the flow besides elevation, m (ft with units=us): the pressure-head difference (p1 - p2)/(rho g) between inlet and outlet, or a pump's head, or for two reservoirs the difference of their levels (then leave elevationChange at 0). The friction and minor losses absorb headLoss - elevationChange; when that is not positive there is no forward flow (422). This is the inverse of head-loss's totalHead.";
    public const string AllowedHeadLoss = "Head available to the pipe besides elevation, m (ft with units=us), as for /v1/pipes/flow: without elevationChange it is the allowed friction + minor head loss; with it, the losses may use headLoss - elevationChange, which must be positive.";
    public const string SizeTable = "Optional: a pipe size table (GET /v1/pipes/sizes lists them, for example asme-b36.10m-schedule-40); the response then also gives the smallest listed size whose inside diameter meets the allowed loss.";
}

/// <summary>The inputs every pipe calculation shares; the endpoints read them through one validator.</summary>
public interface IPipeRequest
{
    double? Length { get; }
    double? Roughness { get; }
    string? Material { get; }
    string? SurfaceCondition { get; }
    double? AgedRoughness { get; }
    double? MinorLossCoefficient { get; }
    FittingList? Fittings { get; }
    double? ElevationChange { get; }
    double? KinematicViscosity { get; }
    double? Density { get; }
    double? Temperature { get; }
    string? Method { get; }
    double? HazenWilliamsC { get; }
    string? Units { get; }
    string? FlowUnit { get; }
}

/// <summary>Inputs of the head-loss calculation (query parameters for GET, a JSON body for POST).</summary>
public sealed record PipeHeadLossRequest(
    [property: Description(PipeFields.Flow)] [FromQuery(Name = "flow")] double? Flow,
    [property: Description(PipeFields.Diameter)] [FromQuery(Name = "diameter")] double? Diameter,
    [property: Description(PipeFields.Length)] [FromQuery(Name = "length")] double? Length,
    [property: Description(PipeFields.Roughness)] [FromQuery(Name = "roughness")] double? Roughness = null,
    [property: Description(PipeFields.Material)] [FromQuery(Name = "material")] string? Material = null,
    [property: Description(PipeFields.SurfaceCondition)] [FromQuery(Name = "surfaceCondition")] string? SurfaceCondition = null,
    [property: Description(PipeFields.MinorLossCoefficient)] [FromQuery(Name = "minorLossCoefficient")] double? MinorLossCoefficient = null,
    [property: Description(PipeFields.Fittings)] [FromQuery(Name = "fittings")] FittingList? Fittings = null,
    [property: Description(PipeFields.ElevationChange)] [FromQuery(Name = "elevationChange")] double? ElevationChange = null,
    [property: Description(PipeFields.KinematicViscosity)] [FromQuery(Name = "kinematicViscosity")] double? KinematicViscosity = null,
    [property: Description(PipeFields.Density)] [FromQuery(Name = "density")] double? Density = null,
    [property: Description(PipeFields.Temperature)] [FromQuery(Name = "temperature")] double? Temperature = null,
    [property: Description(PipeFields.Method)] [FromQuery(Name = "method")] string? Method = null,
    [property: Description(PipeFields.HazenWilliamsC)] [FromQuery(Name = "hazenWilliamsC")] double? HazenWilliamsC = null,
    [property: Description(PipeFields.Units)] [FromQuery(Name = "units")] string? Units = null,
    [property: Description(PipeFields.FlowUnit)] [FromQuery(Name = "flowUnit")] string? FlowUnit = null,
    [property: Description(PipeFields.AgedRoughness)] [FromQuery(Name = "agedRoughness")] double? AgedRoughness = null,
    [property: Description(PipeFields.Trace)] [FromQuery(Name = "trace")] bool? Trace = null) : IPipeRequest, FlowSolve.Api.Hosting.ITraceable;

/// <summary>Inputs of the flow calculation (query parameters for GET, a JSON body for POST).</summary>
public sealed record PipeFlowRequest(
    [property: Description(PipeFields.AvailableHead)] [FromQuery(Name = "headLoss")] double? HeadLoss,
    [property: Description(PipeFields.Diameter)] [FromQuery(Name = "diameter")] double? Diameter,
    [property: Description(PipeFields.Length)] [FromQuery(Name = "length")] double? Length,
    [property: Description(PipeFields.Roughness)] [FromQuery(Name = "roughness")] double? Roughness = null,
    [property: Description(PipeFields.Material)] [FromQuery(Name = "material")] string? Material = null,
    [property: Description(PipeFields.SurfaceCondition)] [FromQuery(Name = "surfaceCondition")] string? SurfaceCondition = null,
    [property: Description(PipeFields.MinorLossCoefficient)] [FromQuery(Name = "minorLossCoefficient")] double? MinorLossCoefficient = null,
    [property: Description(PipeFields.Fittings)] [FromQuery(Name = "fittings")] FittingList? Fittings = null,
    [property: Description(PipeFields.ElevationChange)] [FromQuery(Name = "elevationChange")] double? ElevationChange = null,
    [property: Description(PipeFields.KinematicViscosity)] [FromQuery(Name = "kinematicViscosity")] double? KinematicViscosity = null,
    [property: Description(PipeFields.Density)] [FromQuery(Name = "density")] double? Density = null,
    [property: Description(PipeFields.Temperature)] [FromQuery(Name = "temperature")] double? Temperature = null,
    [property: Description(PipeFields.Method)] [FromQuery(Name = "method")] string? Method = null,
    [property: Description(PipeFields.HazenWilliamsC)] [FromQuery(Name = "hazenWilliamsC")] double? HazenWilliamsC = null,
    [property: Description(PipeFields.Units)] [FromQuery(Name = "units")] string? Units = null,
    [property: Description(PipeFields.FlowUnit)] [FromQuery(Name = "flowUnit")] string? FlowUnit = null,
    [property: Description(PipeFields.Trace)] [FromQuery(Name = "trace")] bool? Trace = null,
    [property: Description(PipeFields.AgedRoughness)] [FromQuery(Name = "agedRoughness")] double? AgedRoughness = null) : IPipeRequest, FlowSolve.Api.Hosting.ITraceable;

/// <summary>Inputs of the diameter calculation (query parameters for GET, a JSON body for POST).</summary>
public sealed record PipeDiameterRequest(
    [property: Description(PipeFields.Flow)] [FromQuery(Name = "flow")] double? Flow,
    [property: Description(PipeFields.AllowedHeadLoss)] [FromQuery(Name = "headLoss")] double? HeadLoss,
    [property: Description(PipeFields.Length)] [FromQuery(Name = "length")] double? Length,
    [property: Description(PipeFields.Roughness)] [FromQuery(Name = "roughness")] double? Roughness = null,
    [property: Description(PipeFields.Material)] [FromQuery(Name = "material")] string? Material = null,
    [property: Description(PipeFields.SurfaceCondition)] [FromQuery(Name = "surfaceCondition")] string? SurfaceCondition = null,
    [property: Description(PipeFields.MinorLossCoefficient)] [FromQuery(Name = "minorLossCoefficient")] double? MinorLossCoefficient = null,
    [property: Description(PipeFields.Fittings)] [FromQuery(Name = "fittings")] FittingList? Fittings = null,
    [property: Description(PipeFields.ElevationChange)] [FromQuery(Name = "elevationChange")] double? ElevationChange = null,
    [property: Description(PipeFields.KinematicViscosity)] [FromQuery(Name = "kinematicViscosity")] double? KinematicViscosity = null,
    [property: Description(PipeFields.Density)] [FromQuery(Name = "density")] double? Density = null,
    [property: Description(PipeFields.Temperature)] [FromQuery(Name = "temperature")] double? Temperature = null,
    [property: Description(PipeFields.SizeTable)] [FromQuery(Name = "sizeTable")] string? SizeTable = null,
    [property: Description("darcy-weisbach (the only method for the diameter: Darcy-Weisbach with the exact Colebrook-White friction factor).")]
    [FromQuery(Name = "method")] string? Method = null,
    [property: Description("Not used by the diameter calculation (Hazen-Williams is offered for head-loss and flow); must be left out.")]
    [FromQuery(Name = "hazenWilliamsC")] double? HazenWilliamsC = null,
    [property: Description(PipeFields.Units)] [FromQuery(Name = "units")] string? Units = null,
    [property: Description(PipeFields.FlowUnit)] [FromQuery(Name = "flowUnit")] string? FlowUnit = null,
    [property: Description(PipeFields.Trace)] [FromQuery(Name = "trace")] bool? Trace = null,
    [property: Description(PipeFields.AgedRoughness)] [FromQuery(Name = "agedRoughness")] double? AgedRoughness = null) : IPipeRequest, FlowSolve.Api.Hosting.ITraceable;

/// <summary>A number of identical fittings.</summary>
/// <param name="Name">Fitting name from GET /v1/pipes/fittings, for example <c>gate-valve-open</c>.</param>
/// <param name="Count">How many (0 or more, fractions allowed); default 1.</param>
public sealed record FittingCountDto(
    [property: Description("Fitting name from GET /v1/pipes/fittings, for example gate-valve-open.")] string? Name,
    [property: Description("How many (dimensionless count, 0 to 10000, fractions allowed); default 1.")] double? Count = null);

/// <summary>
/// A list of fittings: a JSON array of <see cref="FittingCountDto"/> in a body, or <c>name:count,name:count</c> in a
/// query string. Names and counts are checked by the endpoint (so every bad item is named); only text that is not a
/// list of pairs fails to bind.
/// </summary>
public sealed class FittingList : List<FittingCountDto>
{
    /// <summary>Parses <c>elbow-90-flanged-regular:3,gate-valve-open</c>; false when an item is empty or its count is not a number.</summary>
    public static bool TryParse(string? text, IFormatProvider? provider, [NotNullWhen(true)] out FittingList? result)
    {
        result = null;
        if (string.IsNullOrWhiteSpace(text)) return false;
        var list = new FittingList();
        foreach (var raw in text.Split(','))
        {
            string item = raw.Trim();
            int colon = item.LastIndexOf(':');
            string name = (colon < 0 ? item : item[..colon]).Trim();
            if (name.Length == 0) return false;
            double? count = null;
            if (colon >= 0)
            {
                if (!double.TryParse(item[(colon + 1)..], NumberStyles.Float, CultureInfo.InvariantCulture, out double c)) return false;
                count = c;
            }
            list.Add(new FittingCountDto(name, count));
        }
        result = list;
        return true;
    }
}

/// <summary>A listed pipe size chosen for the flow, with the pipe's state at its inside diameter.</summary>
/// <param name="Name">The size's name in its table, for example <c>NPS 8</c>.</param>
/// <param name="Table">The table it comes from.</param>
/// <param name="InsideDiameter">Inside diameter, m (ft with units=us): outside diameter - 2 x wall thickness.</param>
/// <param name="OutsideDiameter">Outside diameter, m (ft with units=us).</param>
/// <param name="WallThickness">Wall thickness, m (ft with units=us).</param>
/// <param name="HeadLoss">Friction + minor head loss at this size, m (ft with units=us); at most the allowed loss.</param>
/// <param name="FrictionHeadLoss">Darcy-Weisbach friction loss at this size, m (ft with units=us).</param>
/// <param name="MinorHeadLoss">Minor (fittings) loss at this size, m (ft with units=us).</param>
/// <param name="PressureDrop">rho g (hf + hm) at this size, Pa (psi with units=us); absent without a density.</param>
/// <param name="Velocity">Mean velocity at this size, m/s (ft/s with units=us).</param>
/// <param name="Reynolds">Reynolds number at this size.</param>
/// <param name="FrictionFactor">Darcy friction factor at this size.</param>
/// <param name="Regime">laminar, transitional or turbulent at this size.</param>
public sealed record SelectedSizeDto(
    string Name, string Table, double InsideDiameter, double OutsideDiameter, double WallThickness,
    double HeadLoss, double FrictionHeadLoss, double MinorHeadLoss, double? PressureDrop,
    double Velocity, double Reynolds, double FrictionFactor, string Regime);

/// <summary>The Darcy-Weisbach result beside a Hazen-Williams one, and how far they differ.</summary>
/// <param name="Quantity">What is compared: <c>headLoss</c> (head-loss calculation) or <c>flow</c> (flow calculation).</param>
/// <param name="HeadLoss">Darcy-Weisbach friction + minor head loss, m (ft with units=us): at the same flow for head-loss, at the Darcy-Weisbach flow for flow.</param>
/// <param name="FrictionHeadLoss">Darcy-Weisbach friction loss, m (ft with units=us).</param>
/// <param name="Flow">Flow, in the response's flow unit: the given flow for head-loss, the Darcy-Weisbach flow from the same head for flow.</param>
/// <param name="Velocity">Mean velocity, m/s (ft/s with units=us).</param>
/// <param name="Reynolds">Reynolds number.</param>
/// <param name="FrictionFactor">Darcy friction factor (exact Colebrook-White in turbulent flow).</param>
/// <param name="Regime">laminar, transitional or turbulent.</param>
/// <param name="Status">Status of the Darcy-Weisbach calculation (see the main status).</param>
/// <param name="Iterations">Darcy-Weisbach iterations: Colebrook-White steps for head-loss, outer steps in ln Q for flow.</param>
/// <param name="Difference">Hazen-Williams minus Darcy-Weisbach, in the compared quantity's unit.</param>
/// <param name="DifferencePercent">Difference / Darcy-Weisbach value x 100.</param>
public sealed record DarcyWeisbachComparisonDto(
    string Quantity, double HeadLoss, double FrictionHeadLoss, double Flow, double Velocity, double Reynolds,
    double FrictionFactor, string Regime, string Status, int Iterations, double Difference, double DifferencePercent);

/// <summary>Head loss of a pipe at a flow.</summary>
/// <param name="HeadLoss">Friction + minor head loss hf + hm, m (ft with units=us).</param>
/// <param name="FrictionHeadLoss">Friction loss hf, m (ft with units=us): Darcy-Weisbach f (L/D) V^2/(2g), or Hazen-Williams with method=hazen-williams.</param>
/// <param name="MinorHeadLoss">Minor (fittings) loss hm = K V^2/(2g), m (ft with units=us).</param>
/// <param name="PressureDrop">rho g (hf + hm), Pa (psi with units=us): the pressure lost to friction and fittings; absent without a density.</param>
/// <param name="ElevationChange">z2 - z1 as used, m (ft with units=us).</param>
/// <param name="TotalHead">HeadLoss + ElevationChange, m (ft with units=us): the head the pipe needs between its ends to carry this flow (what /v1/pipes/flow takes as headLoss).</param>
/// <param name="TotalPressureDifference">rho g TotalHead, Pa (psi with units=us): inlet minus outlet pressure for a pipe of constant diameter; absent without a density.</param>
/// <param name="Flow">Flow as used, in the flow unit (m3/s, l/s, m3/h, ft3/s or gpm).</param>
/// <param name="Diameter">Inside diameter as used, m (ft with units=us).</param>
/// <param name="Velocity">Mean velocity V = 4Q/(pi D^2), m/s (ft/s with units=us).</param>
/// <param name="VelocityHead">V^2/(2g), m (ft with units=us).</param>
/// <param name="Reynolds">Reynolds number V D / nu.</param>
/// <param name="RelativeRoughness">e/D as used.</param>
/// <param name="FrictionFactor">Darcy friction factor f; with method=hazen-williams, the Darcy factor equivalent to the Hazen-Williams friction loss, hf / ((L/D) V^2/(2g)).</param>
/// <param name="Regime">laminar, transitional or turbulent (by Reynolds number, limits 2000 and 4000: common practice).</param>
/// <param name="Relation">Friction relation used for f: laminar (64/Re), churchill (transition) or colebrook-white.</param>
/// <param name="Length">Length as used, m (ft with units=us).</param>
/// <param name="Roughness">Absolute roughness as used, m (ft with units=us).</param>
/// <param name="MinorLossCoefficient">Sum of K as used.</param>
/// <param name="KinematicViscosity">Kinematic viscosity as used, m2/s (ft2/s with units=us).</param>
/// <param name="Density">Density as used, kg/m3 (lb/ft3 with units=us); absent when not known.</param>
/// <param name="Iterations">Colebrook-White iterations of the friction factor (0 for the laminar law and Churchill); the head loss itself is explicit.</param>
/// <param name="Converged">True when the friction factor converged.</param>
/// <param name="Residual">Colebrook-White residual in 1/sqrt(f) at the friction factor used (0 for explicit relations).</param>
/// <param name="Status">solved or not-converged.</param>
/// <param name="Method">darcy-weisbach or hazen-williams.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">The unit of every flow in this response: m3/s, l/s, m3/h, ft3/s or gpm.</param>
/// <param name="Validity">Each relation's published (or common practice) range beside the values as used, in this response's units.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied (fluid, units, method, minor losses, elevation, gravity).</param>
/// <param name="DarcyWeisbach">With method=hazen-williams: the Darcy-Weisbach head loss at the same flow and the difference.</param>
public sealed record PipeHeadLossResponse(
    double HeadLoss, double FrictionHeadLoss, double MinorHeadLoss, double? PressureDrop,
    double ElevationChange, double TotalHead, double? TotalPressureDifference,
    double Flow, double Diameter, double Velocity, double VelocityHead, double Reynolds, double RelativeRoughness,
    double FrictionFactor, string Regime, string Relation,
    double Length, double Roughness, double MinorLossCoefficient, double KinematicViscosity, double? Density,
    int Iterations, bool Converged, double Residual, string Status, string Method, string Units, string FlowUnit,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    DarcyWeisbachComparisonDto? DarcyWeisbach) : FlowSolve.Api.Hosting.ISolveSummary, FlowSolve.Api.Hosting.ISensitive
{
    /// <summary>Present only with trace=true: the per-iteration record of the Colebrook-White friction-factor solve (solve variable 1/sqrt(f)); the head loss itself is explicit in the factor.</summary>
    public IReadOnlyList<TraceStepDto>? Trace { get; init; }

    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }

    /// <summary>Present only with sensitivities=true and a material whose table entry has new and aged roughness: the answer at both ends of that range.</summary>
    public RoughnessSpreadDto? RoughnessSpread { get; init; }
}


/// <summary>Flow through a pipe from the head available to drive it.</summary>
/// <param name="Flow">The flow found, in the flow unit (m3/s, l/s, m3/h, ft3/s or gpm).</param>
/// <param name="Velocity">Mean velocity, m/s (ft/s with units=us).</param>
/// <param name="Reynolds">Reynolds number.</param>
/// <param name="RelativeRoughness">e/D as used.</param>
/// <param name="FrictionFactor">Darcy friction factor at the flow found (with hazen-williams, the equivalent Darcy factor).</param>
/// <param name="Regime">laminar, transitional or turbulent.</param>
/// <param name="Relation">Friction relation used: laminar, churchill or colebrook-white.</param>
/// <param name="HeadLoss">Friction + minor head loss at the flow found, m (ft with units=us); equals DrivingHead.</param>
/// <param name="FrictionHeadLoss">Friction loss at the flow found, m (ft with units=us).</param>
/// <param name="MinorHeadLoss">Minor loss at the flow found, m (ft with units=us).</param>
/// <param name="PressureDrop">rho g (hf + hm), Pa (psi with units=us); absent without a density.</param>
/// <param name="AvailableHead">The headLoss given: head available besides elevation, m (ft with units=us).</param>
/// <param name="ElevationChange">z2 - z1 as used, m (ft with units=us).</param>
/// <param name="DrivingHead">AvailableHead - ElevationChange, m (ft with units=us): what the losses absorb.</param>
/// <param name="Diameter">Inside diameter as used, m (ft with units=us).</param>
/// <param name="Length">Length as used, m (ft with units=us).</param>
/// <param name="Roughness">Absolute roughness as used, m (ft with units=us).</param>
/// <param name="MinorLossCoefficient">Sum of K as used.</param>
/// <param name="KinematicViscosity">Kinematic viscosity as used, m2/s (ft2/s with units=us).</param>
/// <param name="Density">Density as used, kg/m3 (lb/ft3 with units=us); absent when not known.</param>
/// <param name="Iterations">Outer Newton (or bisection) steps in ln Q.</param>
/// <param name="FrictionIterations">Colebrook-White iterations summed over every friction-factor evaluation of the solve.</param>
/// <param name="Converged">True when the flow is usable (status solved or solved-at-regime-limit).</param>
/// <param name="Residual">ln(hf + hm) - ln(DrivingHead) at the flow found.</param>
/// <param name="Status">solved, solved-at-regime-limit or not-converged (the no-answer cases answer 422).</param>
/// <param name="SolverStatus">Why the outer solve stopped: converged-on-step, converged-on-residual, iteration-cap-reached, no-sign-change or non-finite-value.</param>
/// <param name="SolveVariable">The variable the outer solve iterated on: ln(Q) with Q in m3/s.</param>
/// <param name="Method">darcy-weisbach or hazen-williams.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">The unit of every flow in this response.</param>
/// <param name="Validity">Each relation's range beside the values as used.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
/// <param name="DarcyWeisbach">With method=hazen-williams: the Darcy-Weisbach flow from the same head and the difference.</param>
/// <param name="Trace">Per-iteration record of the outer Darcy-Weisbach solve, when trace=true.</param>
public sealed record PipeFlowResponse(
    double Flow, double Velocity, double Reynolds, double RelativeRoughness, double FrictionFactor, string Regime, string Relation,
    double HeadLoss, double FrictionHeadLoss, double MinorHeadLoss, double? PressureDrop,
    double AvailableHead, double ElevationChange, double DrivingHead,
    double Diameter, double Length, double Roughness, double MinorLossCoefficient, double KinematicViscosity, double? Density,
    int Iterations, int FrictionIterations, bool Converged, double Residual, string Status, string SolverStatus, string SolveVariable,
    string Method, string Units, string FlowUnit,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    DarcyWeisbachComparisonDto? DarcyWeisbach, IReadOnlyList<TraceStepDto>? Trace) : FlowSolve.Api.Hosting.ISolveSummary, FlowSolve.Api.Hosting.ISensitive
{
    /// <summary>Present only when a second flow meets the same head (see the second-solution warning), in the flow unit: near Reynolds number 4000 Churchill's transition friction factor lies above Colebrook-White's, so heads within that drop are met twice. Flow is then the turbulent (Colebrook-White) root and this the transitional (Churchill) one, the lower flow and the cautious estimate of what the pipe delivers. Darcy-Weisbach only.</summary>
    public double? AlternateFlow { get; init; }

    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }

    /// <summary>Present only with sensitivities=true and a material whose table entry has new and aged roughness: the answer at both ends of that range.</summary>
    public RoughnessSpreadDto? RoughnessSpread { get; init; }
}


/// <summary>The minimum inside diameter for a flow within an allowed head loss, and the smallest listed size meeting it.</summary>
/// <param name="Diameter">Minimum inside diameter, m (ft with units=us): at it, hf + hm equals the allowed loss.</param>
/// <param name="Flow">Flow as used, in the flow unit.</param>
/// <param name="Velocity">Mean velocity at the minimum diameter, m/s (ft/s with units=us).</param>
/// <param name="Reynolds">Reynolds number at the minimum diameter.</param>
/// <param name="RelativeRoughness">e/D at the minimum diameter.</param>
/// <param name="FrictionFactor">Darcy friction factor at the minimum diameter.</param>
/// <param name="Regime">laminar, transitional or turbulent.</param>
/// <param name="Relation">Friction relation used: laminar, churchill or colebrook-white.</param>
/// <param name="HeadLoss">Friction + minor head loss at the minimum diameter, m (ft with units=us); equals AllowedHeadLoss.</param>
/// <param name="FrictionHeadLoss">Friction loss at the minimum diameter, m (ft with units=us).</param>
/// <param name="MinorHeadLoss">Minor loss at the minimum diameter, m (ft with units=us).</param>
/// <param name="PressureDrop">rho g (hf + hm), Pa (psi with units=us); absent without a density.</param>
/// <param name="AllowedHeadLoss">headLoss - elevationChange: the friction + minor loss allowed, m (ft with units=us).</param>
/// <param name="ElevationChange">z2 - z1 as used, m (ft with units=us).</param>
/// <param name="Length">Length as used, m (ft with units=us).</param>
/// <param name="Roughness">Absolute roughness as used, m (ft with units=us).</param>
/// <param name="MinorLossCoefficient">Sum of K as used.</param>
/// <param name="KinematicViscosity">Kinematic viscosity as used, m2/s (ft2/s with units=us).</param>
/// <param name="Density">Density as used, kg/m3 (lb/ft3 with units=us); absent when not known.</param>
/// <param name="SelectedSize">With sizeTable: the smallest listed size whose inside diameter carries the flow within the allowed loss, with the loss and velocity there.</param>
/// <param name="Iterations">Outer Newton (or bisection) steps in ln D.</param>
/// <param name="FrictionIterations">Colebrook-White iterations summed over the solve.</param>
/// <param name="Converged">True when the diameter is usable.</param>
/// <param name="Residual">ln(hf + hm) - ln(AllowedHeadLoss) at the diameter found.</param>
/// <param name="Status">solved, solved-at-regime-limit or not-converged (the no-answer cases answer 422).</param>
/// <param name="SolverStatus">Why the outer solve stopped.</param>
/// <param name="SolveVariable">The variable the outer solve iterated on: ln(D) with D in m.</param>
/// <param name="Method">darcy-weisbach.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">The unit of every flow in this response.</param>
/// <param name="Validity">Each relation's range beside the values as used (at the selected size when one was chosen).</param>
/// <param name="Warnings">Warnings with stable codes (at the minimum diameter, and at the selected size).</param>
/// <param name="Assumptions">Defaults that were applied.</param>
/// <param name="Trace">Per-iteration record of the outer solve, when trace=true.</param>
public sealed record PipeDiameterResponse(
    double Diameter, double Flow, double Velocity, double Reynolds, double RelativeRoughness, double FrictionFactor,
    string Regime, string Relation, double HeadLoss, double FrictionHeadLoss, double MinorHeadLoss, double? PressureDrop,
    double AllowedHeadLoss, double ElevationChange,
    double Length, double Roughness, double MinorLossCoefficient, double KinematicViscosity, double? Density,
    SelectedSizeDto? SelectedSize,
    int Iterations, int FrictionIterations, bool Converged, double Residual, string Status, string SolverStatus, string SolveVariable,
    string Method, string Units, string FlowUnit,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    IReadOnlyList<TraceStepDto>? Trace) : FlowSolve.Api.Hosting.ISolveSummary, FlowSolve.Api.Hosting.ISensitive
{
    /// <summary>Present only when a second diameter gives the allowed head loss (see the second-solution warning), m (ft with units=us): near Reynolds number 4000 the friction factor rises from Colebrook-White to Churchill's transition value as the diameter grows, so allowances within that jump are met twice. Diameter is then the turbulent (Colebrook-White) root, the smaller, and this the transitional (Churchill) one, the larger and cautious choice; diameters between the one at Reynolds number 4000 and this exceed the allowance.</summary>
    public double? AlternateDiameter { get; init; }

    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }

    /// <summary>Present only with sensitivities=true and a material whose table entry has new and aged roughness: the answer at both ends of that range.</summary>
    public RoughnessSpreadDto? RoughnessSpread { get; init; }
}

