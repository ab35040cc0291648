using System.ComponentModel;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Pumps;

/// <summary>One catalogue point of one pump at rated speed.</summary>
public sealed record PumpPointInput(
    [property: Description("Flow through one pump at rated speed: m3/s (ft3/s with units=us, US gal/min with flowUnit=gpm); 0 or more, no two points equal.")]
    double? Flow,
    [property: Description("Head of one pump at that flow: m (ft with units=us); 0 or more.")]
    double? Head,
    [property: Description("Efficiency of the pump at that flow as a fraction, above 0 and at most 1 (0.78 for 78 percent; percent is not accepted). Optional; at least three points with it give an efficiency curve, fitted through the origin.")]
    double? Efficiency = null,
    [property: Description("NPSH required at that flow: m (ft with units=us); 0 or more. Optional; at least three points with it give an NPSH-required curve, interpolated linearly.")]
    double? NpshRequired = null);

/// <summary>The head curve of one pump at rated speed: catalogue points or polynomial coefficients.</summary>
public sealed record PumpInput(
    [property: Description("Catalogue points, at least three (four for a cubic), fitted by least squares. Give this or coefficients.")]
    IReadOnlyList<PumpPointInput>? Points = null,
    [property: Description("Coefficients [c0, c1, c2] or [c0, c1, c2, c3] of H = c0 + c1 Q + c2 Q^2 (+ c3 Q^3) for one pump at rated speed: H in m and Q in m3/s (ft and ft3/s with units=us, ft and US gal/min with flowUnit=gpm); c0, the shut-off head, above 0. Give this or points.")]
    IReadOnlyList<double>? Coefficients = null,
    [property: Description("Degree of the polynomial fitted to points: quadratic (default) or cubic. With coefficients it must match their count.")]
    string? CurveDegree = null,
    [property: Description("With coefficients: the largest flow of the curve's published range, in the flow unit; above 0. Optional; bounds the search and the catalogue-range warning.")]
    double? MaximumFlow = null);

/// <summary>One pipe of the system, in series with the others; each carries the whole flow.</summary>
public sealed record PipeInput(
    [property: Description("Pipe length L: m (ft with units=us); above 0.")]
    double? Length,
    [property: Description("Inside diameter D: m (ft with units=us); above 0.")]
    double? Diameter,
    [property: Description("Absolute roughness e: m (ft with units=us); 0 or more and below the diameter.")]
    double? Roughness,
    [property: Description("Sum of the fittings' loss coefficients K on this pipe's velocity head (dimensionless); 0 or more; 0 when omitted.")]
    double? MinorLossCoefficient = null);

/// <summary>The system curve: static head plus lumped losses and/or pipes.</summary>
public sealed record SystemInput(
    [property: Description("Static head Hs: rise from the suction level to the delivery level (plus any pressure head difference): m (ft with units=us); any sign.")]
    double? StaticHead,
    [property: Description("Lumped resistance K of H = Hs + K Q^2: m per (m3/s)^2 (ft per (ft3/s)^2 with units=us, ft per (US gal/min)^2 with flowUnit=gpm); 0 or more. Give this, pipes, or both (then it adds to the pipes' losses).")]
    double? Resistance = null,
    [property: Description("Pipes in series, Darcy-Weisbach with the exact Colebrook-White friction factor and each pipe's minor losses. Give this, resistance, or both.")]
    IReadOnlyList<PipeInput>? Pipes = null);

/// <summary>The suction side of each pump, for NPSH available.</summary>
public sealed record SuctionInput(
    [property: Description("Height of the liquid level above the pump's datum (impeller eye): m (ft with units=us); positive for a flooded suction, negative for a suction lift.")]
    double? StaticSuctionHead,
    [property: Description("Suction losses (entrance, fittings, friction) as a head: m (ft with units=us); 0 or more; 0 when omitted.")]
    double? LossHead = null,
    [property: Description("Absolute pressure on the liquid surface: Pa (psi with units=us); above 0; 101325 Pa (1 standard atmosphere, an open tank at sea level) when omitted.")]
    double? SurfacePressure = null,
    [property: Description("Vapour pressure of the liquid: Pa (psi with units=us); 0 or more; from the water temperature (IAPWS-IF97 region 4) when omitted; required when the fluid is given by kinematicViscosity and density.")]
    double? VapourPressure = null);

/// <summary>Inputs of the duty-point calculation (POST body; also the batch row).</summary>
public sealed record DutyPointRequest(
    [property: Description("The head curve of one pump at rated speed: points or coefficients.")]
    PumpInput? Pump,
    [property: Description("The system curve: staticHead plus resistance and/or pipes.")]
    SystemInput? System,
    [property: Description("Number of identical pumps in parallel (they share the flow at a common head); 1 to 100; 1 when omitted. Not above 1 together with pumpsInSeries.")]
    int? PumpsInParallel = null,
    [property: Description("Number of identical pumps in series (each carries the whole flow; heads add); 1 to 100; 1 when omitted.")]
    int? PumpsInSeries = null,
    [property: Description("Speed ratio s = n / n_rated (dimensionless), above 0 and at most 1.5; 1 when omitted. Affinity laws: flow scales with s, head with s^2.")]
    double? SpeedRatio = null,
    [property: Description("Water temperature: degrees C, 0 to 100 (degrees F, 32 to 212, with units=us). Gives density, viscosity and vapour pressure (IAPWS). Water at 20 degrees C when no fluid is given.")]
    double? Temperature = null,
    [property: Description("Kinematic viscosity of the fluid: m2/s (ft2/s with units=us); above 0. With density, instead of temperature.")]
    double? KinematicViscosity = null,
    [property: Description("Density of the fluid: kg/m3 (lb/ft3 with units=us); above 0. With kinematicViscosity, instead of temperature.")]
    double? Density = null,
    [property: Description("Suction side of each pump, for NPSH available. Optional.")]
    SuctionInput? Suction = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft3/s, psi, lb/ft3, ft2/s, degrees F, hp).")]
    string? Units = null,
    [property: Description(FlowUnit.Description)]
    string? FlowUnit = null,
    [property: Description("When true, include the solver's per-iteration record in the response (solve variable: the set flow in m3/s).")]
    bool? Trace = null) : FlowSolve.Api.Hosting.ITraceable;

/// <summary>The compact GET form for a spreadsheet cell: a polynomial pump curve and one pipe or a lumped resistance.</summary>
public sealed record DutyPointQuery(
    [property: Description("Shut-off head c0 of H = c0 + c1 Q + c2 Q^2 + c3 Q^3 for one pump at rated speed: m (ft with units=us); above 0. Required.")]
    [FromQuery(Name = "c0")] double? C0 = null,
    [property: Description("Linear coefficient c1: m per m3/s (ft per ft3/s, or ft per US gal/min with flowUnit=gpm); 0 when omitted.")]
    [FromQuery(Name = "c1")] double? C1 = null,
    [property: Description("Quadratic coefficient c2: m per (m3/s)^2 (ft per (ft3/s)^2, or ft per (US gal/min)^2 with flowUnit=gpm); 0 when omitted.")]
    [FromQuery(Name = "c2")] double? C2 = null,
    [property: Description("Cubic coefficient c3: m per (m3/s)^3 (ft per (ft3/s)^3, or ft per (US gal/min)^3 with flowUnit=gpm); omitted for a quadratic.")]
    [FromQuery(Name = "c3")] double? C3 = null,
    [property: Description("Largest flow of the curve's published range, in the flow unit; above 0; optional.")]
    [FromQuery(Name = "maximumFlow")] double? MaximumFlow = null,
    [property: Description("Static head Hs: m (ft with units=us); any sign. Required.")]
    [FromQuery(Name = "staticHead")] double? StaticHead = null,
    [property: Description("Lumped resistance K of H = Hs + K Q^2: m per (m3/s)^2 (ft per (flow unit)^2 with units=us); 0 or more. Give this, one pipe (length, diameter, roughness), or both.")]
    [FromQuery(Name = "resistance")] double? Resistance = null,
    [property: Description("Length of the one pipe: m (ft with units=us); above 0.")]
    [FromQuery(Name = "length")] double? Length = null,
    [property: Description("Inside diameter of the pipe: m (ft with units=us); above 0.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Absolute roughness of the pipe: m (ft with units=us); 0 or more, below the diameter.")]
    [FromQuery(Name = "roughness")] double? Roughness = null,
    [property: Description("Sum of the pipe's fitting loss coefficients (dimensionless); 0 or more; 0 when omitted.")]
    [FromQuery(Name = "minorLossCoefficient")] double? MinorLossCoefficient = null,
    [property: Description("Number of identical pumps in parallel; 1 to 100; 1 when omitted.")]
    [FromQuery(Name = "pumpsInParallel")] int? PumpsInParallel = null,
    [property: Description("Number of identical pumps in series; 1 to 100; 1 when omitted.")]
    [FromQuery(Name = "pumpsInSeries")] int? PumpsInSeries = null,
    [property: Description("Speed ratio n / n_rated (dimensionless), above 0 and at most 1.5; 1 when omitted.")]
    [FromQuery(Name = "speedRatio")] double? SpeedRatio = null,
    [property: Description("Water temperature: degrees C, 0 to 100 (degrees F with units=us). Water at 20 degrees C when no fluid is given.")]
    [FromQuery(Name = "temperature")] double? Temperature = null,
    [property: Description("Kinematic viscosity: m2/s (ft2/s with units=us); with density, instead of temperature.")]
    [FromQuery(Name = "kinematicViscosity")] double? KinematicViscosity = null,
    [property: Description("Density: kg/m3 (lb/ft3 with units=us); with kinematicViscosity, instead of temperature.")]
    [FromQuery(Name = "density")] double? Density = null,
    [property: Description("Liquid level above the pump for NPSH available: m (ft with units=us); negative for a lift. Optional.")]
    [FromQuery(Name = "staticSuctionHead")] double? StaticSuctionHead = null,
    [property: Description("Suction losses as a head: m (ft with units=us); 0 or more.")]
    [FromQuery(Name = "suctionLossHead")] double? SuctionLossHead = null,
    [property: Description("Absolute surface pressure: Pa (psi with units=us); 101325 Pa when omitted.")]
    [FromQuery(Name = "surfacePressure")] double? SurfacePressure = null,
    [property: Description("Vapour pressure: Pa (psi with units=us); from the water temperature when omitted.")]
    [FromQuery(Name = "vapourPressure")] double? VapourPressure = null,
    [property: Description("Unit system: si (default) or us.")]
    [FromQuery(Name = "units")] string? Units = null,
    [property: Description(FlowUnit.Description)]
    [FromQuery(Name = "flowUnit")] string? FlowUnit = null,
    [property: Description("When true, include the solver's per-iteration record.")]
    [FromQuery(Name = "trace")] bool? Trace = null) : FlowSolve.Api.Hosting.ITraceable;

/// <summary>A flow range.</summary>
/// <param name="MinimumFlow">Smallest flow, in the flow unit.</param>
/// <param name="MaximumFlow">Largest flow, in the flow unit.</param>
public sealed record FlowRangeDto(double MinimumFlow, double MaximumFlow);

/// <summary>The pump curve used, in the request's units.</summary>
/// <param name="Coefficients">c0..c3 of H = c0 + c1 Q + c2 Q^2 + c3 Q^3 for one pump at rated speed (head unit per flow unit to the power).</param>
/// <param name="Degree">2 or 3 (lower for degenerate coefficients).</param>
/// <param name="FitStatus">fitted or given (coefficients).</param>
/// <param name="ShutOffHead">Shut-off head of one pump at rated speed, head unit.</param>
/// <param name="ZeroHeadFlow">Flow of one pump at rated speed where the head falls to zero, flow unit; omitted when not reached.</param>
public sealed record PumpCurveDto(IReadOnlyList<double> Coefficients, int Degree, string FitStatus, double ShutOffHead, double? ZeroHeadFlow);

/// <summary>The duty point of a pump set on a system, with efficiency, power and suction margin where data allow.</summary>
/// <param name="Flow">Flow of the whole pump set at the duty point (flow unit: m3/s, ft3/s or US gal/min).</param>
/// <param name="Head">Head of the whole pump set there, equal to the system head (m, or ft with units=us).</param>
/// <param name="FlowPerPump">Flow through each pump: Flow / pumpsInParallel (flow unit).</param>
/// <param name="HeadPerPump">Head of each pump: Head / pumpsInSeries (head unit).</param>
/// <param name="RatedSpeedFlow">Flow per pump brought back to rated speed, FlowPerPump / speedRatio: where the catalogue curves are read (flow unit).</param>
/// <param name="Iterations">Safeguarded Newton iterations.</param>
/// <param name="Converged">True when the solve met its tolerance.</param>
/// <param name="Residual">Pump-set head minus system head at the answer (head unit).</param>
/// <param name="Status">solved or not-converged (the no-answer statuses answer 422).</param>
/// <param name="SolverStatus">Why the Newton solve stopped: converged-on-step, converged-on-residual, iteration-cap-reached, no-sign-change or non-finite-value.</param>
/// <param name="SolveVariable">The variable the solver iterated on.</param>
/// <param name="Method">The relations used.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">m3/s, l/s, m3/h, ft3/s or gpm.</param>
/// <param name="HeadUnit">m or ft.</param>
/// <param name="PowerUnit">W or hp.</param>
/// <param name="PumpsInParallel">Pumps in parallel, as used.</param>
/// <param name="PumpsInSeries">Pumps in series, as used.</param>
/// <param name="SpeedRatio">Speed ratio, as used.</param>
/// <param name="ShutOffHead">Shut-off head of the pump set, pumpsInSeries s^2 c0 (head unit).</param>
/// <param name="StaticHead">Static head of the system (head unit).</param>
/// <param name="PumpCurve">The pump curve used (fitted or given), in the request's units.</param>
/// <param name="RmsDeviation">With points: root-mean-square deviation of the fitted curve from the points (head unit).</param>
/// <param name="MaxDeviation">With points: largest deviation of the fitted curve from a point (head unit).</param>
/// <param name="CatalogueRange">Flow range of the pump curve's data at rated speed, per pump (flow unit); omitted for coefficients without maximumFlow.</param>
/// <param name="Efficiency">Efficiency of each pump at the duty (fraction), from the points' efficiency curve at RatedSpeedFlow.</param>
/// <param name="HydraulicPower">Hydraulic power of the set, rho g Q H (W, or hp with units=us); with g = 9.80665 m/s2.</param>
/// <param name="ShaftPower">Shaft power of the whole set, rho g Q H / efficiency (W, or hp with units=us).</param>
/// <param name="ShaftPowerPerPump">Shaft power of each pump (W, or hp with units=us).</param>
/// <param name="BestEfficiencyFlow">Best-efficiency flow of one pump at the running speed, s Q_BEP (flow unit).</param>
/// <param name="BestEfficiencyRatio">FlowPerPump / BestEfficiencyFlow (dimensionless).</param>
/// <param name="NpshAvailable">NPSH available at each pump's suction (head unit).</param>
/// <param name="SuctionLoss">Suction loss used for NPSH available (head unit).</param>
/// <param name="NpshRequired">NPSH required at the duty, s^2 NPSHr(RatedSpeedFlow) (head unit).</param>
/// <param name="NpshMargin">NpshAvailable - NpshRequired (head unit).</param>
/// <param name="NpshRatio">NpshAvailable / NpshRequired (dimensionless).</param>
/// <param name="Validity">Each correlation's published range beside the inputs.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
/// <param name="Trace">Per-iteration solver record, when trace=true.</param>
public sealed record DutyPointResponse(
    double Flow, double Head, double FlowPerPump, double HeadPerPump, double RatedSpeedFlow,
    int Iterations, bool Converged, double Residual, string Status, string SolverStatus, string SolveVariable, string Method,
    string Units, string FlowUnit, string HeadUnit, string PowerUnit,
    int PumpsInParallel, int PumpsInSeries, double SpeedRatio, double ShutOffHead, double StaticHead,
    [property: Description("The pump curve used (fitted or given), in the request's units.")] PumpCurveDto PumpCurve,
    double? RmsDeviation, double? MaxDeviation,
    [property: Description("Flow range of the pump curve's data at rated speed, per pump (flow unit); omitted for coefficients without maximumFlow.")] FlowRangeDto? CatalogueRange,
    double? Efficiency, double? HydraulicPower, double? ShaftPower, double? ShaftPowerPerPump,
    double? BestEfficiencyFlow, double? BestEfficiencyRatio,
    double? NpshAvailable, double? SuctionLoss, double? NpshRequired, double? NpshMargin, double? NpshRatio,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    IReadOnlyList<TraceStepDto>? Trace) : ISolveSummary, ISensitive
{
    /// <summary>With efficiency points: root-mean-square deviation of the fitted efficiency curve from the points (fraction), as rmsDeviation is for the head curve.</summary>
    public double? EfficiencyRmsDeviation { get; init; }

    /// <summary>With efficiency points: largest deviation of the fitted efficiency curve from a point (fraction), as maxDeviation is for the head curve.</summary>
    public double? EfficiencyMaxDeviation { get; init; }

    /// <summary>With efficiency points: the best efficiency of the fitted curve (fraction), at bestEfficiencyFlow; warned (efficiency-above-data) when it exceeds the highest catalogue efficiency by more than 0.005.</summary>
    public double? BestEfficiency { get; init; }

    /// <summary>Only for a rising pump curve whose shut-off head does not exceed the static head but which climbs above the system curve: the lower intersection, where the pump-set curve rises through the system curve (flow unit). It is unstable (the flow runs away from it either way), so flow is the stable intersection above it; see the rising-pump-curve warning.</summary>
    public double? UnstableFlow { get; init; }

    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }
}


/// <summary>The pump, pump-set and system curves sampled on one flow axis, for plotting, with the duty point.</summary>
/// <param name="Flow">Set flows, evenly spaced from 0 (flow unit).</param>
/// <param name="PumpHead">Head of one pump at the running speed at each flow (head unit).</param>
/// <param name="SetHead">Head of the whole pump set at each set flow (head unit): the combined curve.</param>
/// <param name="SystemHead">System head at each flow (head unit).</param>
/// <param name="Efficiency">Efficiency of each pump (fraction) when the set delivers each flow; omitted without efficiency data.</param>
/// <param name="NpshRequired">NPSH required of each pump when the set delivers each flow (head unit); omitted without NPSH data.</param>
/// <param name="Status">The duty point's status: solved, not-converged, shut-off-below-static-head or curves-do-not-meet (the curves are returned in every case).</param>
/// <param name="Reason">What the status means.</param>
/// <param name="DutyPoint">The duty point, as from /v1/pumps/duty-point; omitted when there is none.</param>
/// <param name="Iterations">Iterations of the duty-point solve (0 without an answer).</param>
/// <param name="Converged">True when a duty point was found.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">m3/s, l/s, m3/h, ft3/s or gpm.</param>
/// <param name="HeadUnit">m or ft.</param>
/// <param name="Warnings">Warnings with stable codes (including why there is no duty point).</param>
/// <param name="Assumptions">Defaults that were applied.</param>
public sealed record PumpCurvesResponse(
    IReadOnlyList<double> Flow, IReadOnlyList<double> PumpHead, IReadOnlyList<double> SetHead, IReadOnlyList<double> SystemHead,
    IReadOnlyList<double>? Efficiency, IReadOnlyList<double>? NpshRequired,
    string Status, string Reason,
    [property: Description("The duty point, as from /v1/pumps/duty-point; omitted when there is none.")] DutyPointResponse? DutyPoint,
    int Iterations, bool Converged,
    string Units, string FlowUnit, string HeadUnit,
    IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : ISolveSummary;
