using System.ComponentModel;
using FlowSolve.Api.Contracts;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Channels;

/// <summary>One surveyed point of an irregular section, and the roughness of the segment that starts at it.</summary>
public sealed record SurveyPointInput(
    [property: Description("Horizontal position of the point, m (ft with units=us); stations must not decrease from one point to the next (two equal stations make a vertical wall).")]
    double? Station,
    [property: Description("Elevation of the point, m (ft with units=us), on any datum; depths are measured from the lowest point.")]
    double? Elevation,
    [property: Description("Optional Manning n, s m^-1/3 (the same number with units=us), of the segment that starts at this point and runs to the next one; not allowed on the last point, which starts no segment. Segments without one take the request's manningN.")]
    double? ManningN = null);

/// <summary>A channel cross-section: its shape and the dimensions that shape takes (other dimensions are rejected).</summary>
public sealed record SectionInput(
    [property: Description("Shape of the section: rectangular (bottomWidth), trapezoidal (bottomWidth and sideSlope, or leftSideSlope and rightSideSlope), triangular (sideSlope, or leftSideSlope and rightSideSlope), circular (diameter) or surveyed (points). A dimension that does not belong to the shape is rejected.")]
    string? Shape,
    [property: Description("Bottom width b, m (ft with units=us); greater than 0. Rectangular and trapezoidal sections.")]
    double? BottomWidth = null,
    [property: Description("Side slope z of both sides, horizontal per unit vertical (dimensionless, z : 1); 0 (vertical) or more for a trapezoid, greater than 0 for a triangle. Instead of leftSideSlope and rightSideSlope.")]
    double? SideSlope = null,
    [property: Description("Left side slope, horizontal per unit vertical (dimensionless); 0 or more; with rightSideSlope, instead of sideSlope.")]
    double? LeftSideSlope = null,
    [property: Description("Right side slope, horizontal per unit vertical (dimensionless); 0 or more; with leftSideSlope, instead of sideSlope.")]
    double? RightSideSlope = null,
    [property: Description("Inside diameter D, m (ft with units=us); greater than 0. Circular sections (a pipe or culvert running part full).")]
    double? Diameter = null,
    [property: Description("Surveyed points, left to right, at least 3 and at most 1000; stations and elevations in m (ft with units=us). The section holds water up to the lower of its two end points.")]
    IReadOnlyList<SurveyPointInput>? Points = null);

/// <summary>Inputs of the normal-depth calculation as a JSON body.</summary>
public sealed record NormalDepthRequest(
    [property: Description("The cross-section.")]
    SectionInput? Section,
    [property: Description("Manning n, s m^-1/3; greater than 0 and at most 1. The same number with units=us: lengths are converted exactly, which gives the customary k = 1.486. Optional for a surveyed section whose every segment has its own manningN; otherwise required (it also serves segments without their own).")]
    double? ManningN,
    [property: Description("Bed slope S, m/m (the same with units=us); greater than 0 and at most 1. Uniform flow: the energy slope equals the bed slope.")]
    double? Slope,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    double? Flow,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the reported depth in the response.")]
    bool? Trace = null) : FlowSolve.Api.Hosting.ITraceable;

/// <summary>Inputs of the critical-depth calculation as a JSON body.</summary>
public sealed record CriticalDepthRequest(
    [property: Description("The cross-section.")]
    SectionInput? Section,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    double? Flow,
    [property: Description("Optional Manning n, s m^-1/3 (the same number with units=us); greater than 0 and at most 1. When given (or when every surveyed segment has its own), the response includes the critical slope.")]
    double? ManningN = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the reported depth in the response.")]
    bool? Trace = null) : FlowSolve.Api.Hosting.ITraceable;

/// <summary>Inputs of the normal-depth calculation as query parameters: the section's fields stand at the top level.</summary>
public sealed record NormalDepthQuery(
    [property: Description("Shape of the section: rectangular, trapezoidal, triangular, circular or surveyed.")]
    [FromQuery(Name = "shape")] string? Shape,
    [property: Description("Manning n, s m^-1/3 (the same number with units=us; lengths are converted exactly, giving k = 1.486); greater than 0 and at most 1. Optional only for a surveyed section whose every segment has its own n.")]
    [FromQuery(Name = "manningN")] double? ManningN,
    [property: Description("Bed slope S, m/m; greater than 0 and at most 1.")]
    [FromQuery(Name = "slope")] double? Slope,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    [FromQuery(Name = "flow")] double? Flow,
    [property: Description("Bottom width b, m (ft with units=us); greater than 0. Rectangular and trapezoidal sections.")]
    [FromQuery(Name = "bottomWidth")] double? BottomWidth = null,
    [property: Description("Side slope z of both sides, horizontal per unit vertical (dimensionless). Trapezoidal (0 or more) and triangular (greater than 0) sections.")]
    [FromQuery(Name = "sideSlope")] double? SideSlope = null,
    [property: Description("Left side slope, horizontal per unit vertical (dimensionless); with rightSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "leftSideSlope")] double? LeftSideSlope = null,
    [property: Description("Right side slope, horizontal per unit vertical (dimensionless); with leftSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "rightSideSlope")] double? RightSideSlope = null,
    [property: Description("Inside diameter D, m (ft with units=us); greater than 0. Circular sections.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Surveyed points, left to right, as station:elevation pairs separated by commas, each optionally followed by :manningN for the segment that starts at that point (for example 0:2,4:0,7:0,11:2 or 0:2:0.035,4:0,7:0,11:2); m (ft with units=us); at least 3 points.")]
    [FromQuery(Name = "points")] string? Points = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    [FromQuery(Name = "units")] string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the reported depth in the response.")]
    [FromQuery(Name = "trace")] bool? Trace = null) : FlowSolve.Api.Hosting.ITraceable;

/// <summary>Inputs of the critical-depth calculation as query parameters: the section's fields stand at the top level.</summary>
public sealed record CriticalDepthQuery(
    [property: Description("Shape of the section: rectangular, trapezoidal, triangular, circular or surveyed.")]
    [FromQuery(Name = "shape")] string? Shape,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    [FromQuery(Name = "flow")] double? Flow,
    [property: Description("Optional Manning n, s m^-1/3 (the same number with units=us); greater than 0 and at most 1; when given, the response includes the critical slope.")]
    [FromQuery(Name = "manningN")] double? ManningN = null,
    [property: Description("Bottom width b, m (ft with units=us); greater than 0. Rectangular and trapezoidal sections.")]
    [FromQuery(Name = "bottomWidth")] double? BottomWidth = null,
    [property: Description("Side slope z of both sides, horizontal per unit vertical (dimensionless). Trapezoidal (0 or more) and triangular (greater than 0) sections.")]
    [FromQuery(Name = "sideSlope")] double? SideSlope = null,
    [property: Description("Left side slope, horizontal per unit vertical (dimensionless); with rightSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "leftSideSlope")] double? LeftSideSlope = null,
    [property: Description("Right side slope, horizontal per unit vertical (dimensionless); with leftSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "rightSideSlope")] double? RightSideSlope = null,
    [property: Description("Inside diameter D, m (ft with units=us); greater than 0. Circular sections.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Surveyed points, left to right, as station:elevation pairs separated by commas, each optionally followed by :manningN for the segment that starts at that point (for example 0:2,4:0,7:0,11:2); m (ft with units=us); at least 3 points.")]
    [FromQuery(Name = "points")] string? Points = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    [FromQuery(Name = "units")] string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the reported depth in the response.")]
    [FromQuery(Name = "trace")] bool? Trace = null) : FlowSolve.Api.Hosting.ITraceable;

/// <summary>What a closed or surveyed section can carry in uniform flow at this slope and roughness.</summary>
/// <param name="MaximumFlow">The greatest Manning discharge over the section's depth range, m3/s (ft3/s with units=us): for a circle, at about 0.938 D.</param>
/// <param name="DepthAtMaximumFlow">The depth at which it occurs, m (ft with units=us).</param>
/// <param name="FullFlow">The discharge when full, m3/s (ft3/s with units=us): to the crown of a pipe, or to the lower bank top of a surveyed section.</param>
/// <param name="FullDepth">That depth, m (ft with units=us): the diameter, or the lower bank top above the invert.</param>
public sealed record ChannelCapacityDto(double MaximumFlow, double DepthAtMaximumFlow, double FullFlow, double FullDepth);

/// <summary>The normal (uniform-flow) depth from Manning's equation and the flow at that depth.</summary>
/// <param name="NormalDepth">Normal depth y_n above the invert, m (ft with units=us): the lowest depth that carries the flow, the usual design answer.</param>
/// <param name="AlternateNormalDepth">The next depth above it that also carries the flow, m (ft with units=us); present only when there are two or more (see the two-normal-depths warning).</param>
/// <param name="AlternateNormalDepths">Every further depth that carries the flow, m (ft with units=us), ascending; present only when there is more than one normal depth.</param>
/// <param name="Area">Flow area A at normal depth, m2 (ft2 with units=us).</param>
/// <param name="WettedPerimeter">Wetted perimeter P at normal depth, m (ft with units=us).</param>
/// <param name="HydraulicRadius">Hydraulic radius R = A/P, m (ft with units=us).</param>
/// <param name="TopWidth">Water-surface width T, m (ft with units=us).</param>
/// <param name="Velocity">Mean velocity V = Q/A, m/s (ft/s with units=us).</param>
/// <param name="FroudeNumber">Froude number V / sqrt(g A/T) on the hydraulic depth, dimensionless; g = 9.80665 m/s2.</param>
/// <param name="Regime">subcritical (Froude below 0.99), critical (within 1 percent of 1) or supercritical (above 1.01).</param>
/// <param name="SpecificEnergy">Specific energy y + V^2/(2g) at normal depth, m (ft with units=us), energy coefficient 1.</param>
/// <param name="EffectiveManningN">The Manning n at normal depth, s m^-1/3: the given n, or the Horton-Einstein composite where surveyed segments carry their own.</param>
/// <param name="CriticalDepth">Critical depth of the same flow, m (ft with units=us); absent when it would lie above a surveyed section.</param>
/// <param name="CriticalSlope">Critical slope for the same flow and roughness, m/m: the bed slope whose normal depth is the critical depth; absent with the critical depth.</param>
/// <param name="Capacity">For a circular or surveyed section, what it can carry at this slope and n; absent for the open shapes, which have no limit.</param>
/// <param name="Shape">The section's shape as understood.</param>
/// <param name="Units">si or us.</param>
/// <param name="Iterations">Newton iterations over the normal-depth solves (the critical-depth solve is not counted).</param>
/// <param name="Converged">True when every normal-depth solve met its tolerances.</param>
/// <param name="Residual">ln(Q(y_n)/Q) at the normal depth: the relative discharge mismatch (dimensionless, the same in both unit systems).</param>
/// <param name="Status">Why the solver stopped: converged-on-step, converged-on-residual, converged-on-predicted-step, iteration-cap-reached, no-sign-change or non-finite-value.</param>
/// <param name="Method">The relations used.</param>
/// <param name="Validity">The Manning n used beside the range of tabulated values.</param>
/// <param name="Warnings">Warnings with stable codes (two-normal-depths, near-critical, roughness-outside-typical-range, ...).</param>
/// <param name="Assumptions">Defaults and interpretations that were applied.</param>
public sealed record NormalDepthResponse(
    double NormalDepth, double? AlternateNormalDepth, IReadOnlyList<double>? AlternateNormalDepths,
    double Area, double WettedPerimeter, double HydraulicRadius, double TopWidth, double Velocity,
    double FroudeNumber, string Regime, double SpecificEnergy, double EffectiveManningN,
    double? CriticalDepth, double? CriticalSlope, ChannelCapacityDto? Capacity,
    string Shape, string Units,
    int Iterations, bool Converged, double Residual, string Status, string Method,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : FlowSolve.Api.Hosting.ISolveSummary, FlowSolve.Api.Hosting.ISensitive
{
    /// <summary>Present only with trace=true: the per-iteration record of the reported depth's solve (solve variable: ln y for rectangular, trapezoidal and triangular sections; y in m for a circle's normal depth and a surveyed section; ln(y/(D - y)) for a circle's critical depth).</summary>
    public IReadOnlyList<TraceStepDto>? Trace { get; init; }

    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }
}


/// <summary>The critical depth of a flow (Q^2 T = g A^3) and the flow at that depth.</summary>
/// <param name="CriticalDepth">Critical depth y_c above the invert, m (ft with units=us); the lowest, when there are several.</param>
/// <param name="AlternateCriticalDepths">Further critical depths, m (ft with units=us), ascending; present only when a surveyed section has more than one.</param>
/// <param name="Area">Flow area at critical depth, m2 (ft2 with units=us).</param>
/// <param name="TopWidth">Water-surface width at critical depth, m (ft with units=us).</param>
/// <param name="Velocity">Mean velocity at critical depth, m/s (ft/s with units=us).</param>
/// <param name="SpecificEnergy">Specific energy y_c + V^2/(2g), m (ft with units=us): the least energy with which the section passes the flow (energy coefficient 1).</param>
/// <param name="CriticalSlope">Critical slope, m/m, for the given Manning n (or the section's own); absent when no n was given.</param>
/// <param name="Shape">The section's shape as understood.</param>
/// <param name="Units">si or us.</param>
/// <param name="Iterations">Newton iterations over the critical-depth solves.</param>
/// <param name="Converged">True when every solve met its tolerances.</param>
/// <param name="Residual">ln(g A^3 / (Q^2 T)) at the critical depth: the relative mismatch of the critical-flow condition (dimensionless).</param>
/// <param name="Status">Why the solver stopped: converged-on-step, converged-on-residual, converged-on-predicted-step, iteration-cap-reached, no-sign-change or non-finite-value.</param>
/// <param name="Method">The relation used.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults and interpretations that were applied.</param>
public sealed record CriticalDepthResponse(
    double CriticalDepth, IReadOnlyList<double>? AlternateCriticalDepths, double Area, double TopWidth, double Velocity,
    double SpecificEnergy, double? CriticalSlope, string Shape, string Units,
    int Iterations, bool Converged, double Residual, string Status, string Method,
    IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : FlowSolve.Api.Hosting.ISolveSummary, FlowSolve.Api.Hosting.ISensitive
{
    /// <summary>Present only with trace=true: the per-iteration record of the reported depth's solve (solve variable: ln y for rectangular, trapezoidal and triangular sections; y in m for a circle's normal depth and a surveyed section; ln(y/(D - y)) for a circle's critical depth).</summary>
    public IReadOnlyList<TraceStepDto>? Trace { get; init; }

    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }
}

