using System.ComponentModel;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Pumps;

namespace FlowSolve.Api.Networks;

/// <summary>A junction of the network: a node of unknown head where water may be drawn off.</summary>
public sealed record NetworkJunctionInput(
    [property: Description("Identifier, unique among all nodes (junctions and reservoirs); 1 to 64 characters. Required.")]
    string? Id,
    [property: Description("Elevation z of the junction above the datum: m (ft with units=us); any sign. Pressure head is head - elevation. Required.")]
    double? Elevation,
    [property: Description("Water drawn off at the junction: m3/s (ft3/s with units=us, US gal/min with flowUnit=gpm); any sign (negative for an inflow). Multiplied by each of demandMultipliers. 0 when omitted.")]
    double? Demand = null,
    [property: Description("Easting of the junction for the schematic on the calculation sheet, in any consistent length unit; optional (give x and y on every node, or on none).")]
    double? X = null,
    [property: Description("Northing of the junction for the schematic, in the same unit as x; optional.")]
    double? Y = null,
    [property: Description("Only in /v1/networks/simulate: the id of a demand pattern (patterns[]) whose multipliers scale this junction's demand over time; the demand stays as given when omitted. /v1/networks/solve and /v1/networks/fire-flow refuse it (400): a steady solve takes demandMultipliers instead.")]
    string? Pattern = null);

/// <summary>A reservoir (or tank held at a level): a node of fixed total head.</summary>
public sealed record NetworkReservoirInput(
    [property: Description("Identifier, unique among all nodes; 1 to 64 characters. Required.")]
    string? Id,
    [property: Description("Fixed total head (water-surface level) above the datum: m (ft with units=us). Required.")]
    double? Head,
    [property: Description("Easting of the reservoir for the schematic; optional.")]
    double? X = null,
    [property: Description("Northing of the reservoir for the schematic; optional.")]
    double? Y = null);

/// <summary>A pipe between two nodes: Darcy-Weisbach with Colebrook-White (roughness) or Hazen-Williams (hazenWilliamsC).</summary>
public sealed record NetworkPipeInput(
    [property: Description("Identifier, unique among all links (pipes and pumps); 1 to 64 characters. Required.")]
    string? Id,
    [property: Description("Id of the start node; flow is reported positive from 'from' to 'to'. Required.")]
    string? From,
    [property: Description("Id of the end node; not the start node. Required.")]
    string? To,
    [property: Description("Length L: m (ft with units=us); above 0. Required.")]
    double? Length,
    [property: Description("Inside diameter D: m (ft with units=us); above 0. Required.")]
    double? Diameter,
    [property: Description("Absolute roughness e for Darcy-Weisbach: m (ft with units=us); 0 or more, below the diameter. Give this or hazenWilliamsC.")]
    double? Roughness = null,
    [property: Description("Hazen-Williams C factor (dimensionless, the same number in SI and US units); above 0, usually 40 to 150. Give this or roughness.")]
    double? HazenWilliamsC = null,
    [property: Description("Sum of the fittings' loss coefficients K on the pipe's velocity head (dimensionless); 0 or more; 0 when omitted.")]
    double? MinorLossCoefficient = null,
    [property: Description("True for a check valve that lets water pass only from 'from' to 'to'; false when omitted.")]
    bool? CheckValve = null,
    [property: Description("True for a pipe shut by an isolating valve (it carries no flow); false when omitted.")]
    bool? Closed = null);

/// <summary>A pump between two nodes, lifting water from 'from' (suction) to 'to' (delivery).</summary>
public sealed record NetworkPumpInput(
    [property: Description("Identifier, unique among all links (pipes and pumps); 1 to 64 characters. Required.")]
    string? Id,
    [property: Description("Id of the suction node. Required.")]
    string? From,
    [property: Description("Id of the delivery node; not the suction node. Required.")]
    string? To,
    [property: Description("The head curve of the pump at rated speed, as in /v1/pumps/duty-point's pump: catalogue points (flow, head) or coefficients [c0, c1, c2(, c3)] of H = c0 + c1 Q + c2 Q^2 (+ c3 Q^3), H in m and Q in m3/s (ft and ft3/s with units=us, ft and US gal/min with flowUnit=gpm). Required. Efficiency and NPSH on the points are not used here.")]
    PumpInput? Curve,
    [property: Description("Speed ratio s = n / n_rated (dimensionless), 0 to 1.5; 1 when omitted; 0 switches the pump off. Affinity laws: H_s(Q) = s^2 H(Q/s).")]
    double? SpeedRatio = null);

/// <summary>How much of each load case the answer lists: every element (the default), a summary only, or chosen elements.</summary>
public sealed record NetworkOutputInput(
    [property: Description("full (default): every pipe, pump, junction and reservoir in every load case; summary: no element rows, only each load case's status, totals, extremes (summary), convergence record and warnings. The rows listed, times the load cases, count against FlowSolve:Limits:NetworkMaxElementCases (100 000 by default); a full answer over it answers 413, so a large network with many load cases asks for summary or chosen elements.")]
    string? Detail = null,
    [property: Description("Ids of the pipes, pumps, junctions and reservoirs to list in each load case (in the tables' usual order, request order within each kind); the others are left out of the tables but still solved, and still counted in the totals, extremes and warnings. Each id must name an element of the network, at most once. Not with detail=summary.")]
    IReadOnlyList<string?>? Elements = null);

/// <summary>How junction demands respond to pressure: demand-driven (every demand delivered) or pressure-driven (Wagner, Shamir and Marks 1988).</summary>
public sealed record NetworkDemandModelInput(
    [property: Description("demand-driven (every junction receives its whole demand whatever its pressure; the default when demandModel is omitted) or pressure-driven (a junction with a positive demand d and pressure head p receives d r(p): r = 0 for p at or below minimumPressureHead, 1 at or above requiredPressureHead, ((p - min)/(req - min))^exponent between; Wagner, Shamir and Marks 1988). Required.")]
    string? Type,
    [property: Description("pressure-driven only: the pressure head at and below which a junction receives nothing: m (ft with units=us); -10000 to 10000 m; 0 when omitted.")]
    double? MinimumPressureHead = null,
    [property: Description("pressure-driven only, required: the pressure head at and above which a junction receives its whole demand: m (ft with units=us); at least 0.01 m above minimumPressureHead, at most 10000 m.")]
    double? RequiredPressureHead = null,
    [property: Description("pressure-driven only: the exponent of the law between the two heads (dimensionless), 0.1 to 3; 0.5 (an orifice) when omitted.")]
    double? Exponent = null);

/// <summary>A pipe network to solve: nodes, links, the fluid and the load cases.</summary>
public sealed record NetworkSolveRequest(
    [property: Description("Junctions: nodes of unknown head (id, elevation, demand; x and y for the schematic).")]
    IReadOnlyList<NetworkJunctionInput>? Junctions,
    [property: Description("Reservoirs: nodes of fixed total head (id, head). Every connected part of the network needs at least one.")]
    IReadOnlyList<NetworkReservoirInput>? Reservoirs,
    [property: Description("Pipes (id, from, to, length, diameter, roughness or hazenWilliamsC, minorLossCoefficient, checkValve, closed). At least one pipe or pump.")]
    IReadOnlyList<NetworkPipeInput>? Pipes,
    [property: Description("Pumps (id, from, to, curve, speedRatio); optional.")]
    IReadOnlyList<NetworkPumpInput>? Pumps = null,
    [property: Description("Load cases: each multiplies every junction demand; finite, 0 to 100; [1] when omitted. At most FlowSolve:Limits:NetworkMaxDemandMultipliers (24 by default); more answers 413. Each case is solved from the one before.")]
    IReadOnlyList<double>? DemandMultipliers = null,
    [property: Description("Water temperature: degrees C, 0 to 100 (degrees F, 32 to 212, with units=us), for the kinematic viscosity (IAPWS 2008). Water at 20 degrees C when no fluid is given.")]
    double? Temperature = null,
    [property: Description("Kinematic viscosity of the fluid: m2/s (ft2/s with units=us); above 0. Instead of temperature.")]
    double? KinematicViscosity = null,
    [property: Description("Unit system of the request and response: si (default: m, m3/s, m/s, m2/s, degrees C) or us (ft, ft3/s, ft/s, ft2/s, degrees F).")]
    string? Units = null,
    [property: Description(FlowUnit.Description)]
    string? FlowUnit = null,
    [property: Description("A name for the network, shown as the calculation sheet's subtitle; optional, at most 200 characters.")]
    string? Title = null,
    [property: Description("How much of each load case to list: {\"detail\": \"summary\"} for the totals and extremes only, or {\"elements\": [ids]} for chosen elements; every element when omitted. Bounds the answer: the element rows times the load cases may not exceed FlowSolve:Limits:NetworkMaxElementCases.")]
    NetworkOutputInput? Output = null,
    [property: Description("How junction demands respond to pressure: {\"type\": \"pressure-driven\", \"minimumPressureHead\": 0, \"requiredPressureHead\": 20, \"exponent\": 0.5} delivers d r(p) at each junction with a positive demand (Wagner, Shamir and Marks 1988); demand-driven (every demand in full, whatever the pressure) when omitted. Each junction's answer then carries deliveredDemand, and each case totalDeliveredDemand and demandShortfall.")]
    NetworkDemandModelInput? DemandModel = null,
    [property: Description("Control valves (id, from, to, diameter, type, setting, minorLossCoefficient): pressure-reducing, pressure-sustaining, flow-control or throttle; optional, at most 64. Each load case answers each valve's flow, headLoss and status (active, open or closed) in cases[k].valves.")]
    IReadOnlyList<NetworkValveInput>? Valves = null);

/// <summary>One pipe in a load case's answer.</summary>
/// <param name="Id">The pipe's id.</param>
/// <param name="Flow">Flow, positive from the pipe's 'from' node to its 'to' node (flow unit: m3/s, l/s, m3/h, ft3/s or gpm).</param>
/// <param name="Velocity">Mean velocity Q/A, signed like the flow (m/s, or ft/s with units=us).</param>
/// <param name="HeadLoss">Head at 'from' minus head at 'to' (m, or ft with units=us): for an open pipe the friction and minor losses, signed like the flow; for a closed pipe or check valve, the head held across it.</param>
/// <param name="FrictionFactor">Darcy friction factor f (dimensionless); for a Hazen-Williams pipe the equivalent f = 2 g D hf / (L V^2); 0 at zero flow.</param>
/// <param name="Reynolds">Reynolds number |V| D / nu (dimensionless).</param>
/// <param name="Status">open, closed or check-valve-closed.</param>
public sealed record NetworkPipeResultDto(string Id, double Flow, double Velocity, double HeadLoss, double FrictionFactor, double Reynolds, string Status);

/// <summary>One junction in a load case's answer.</summary>
/// <param name="Id">The junction's id.</param>
/// <param name="Head">Total (piezometric) head above the datum (m, or ft with units=us).</param>
/// <param name="PressureHead">Head minus elevation (m, or ft with units=us).</param>
/// <param name="Demand">Demand applied (requested): the junction's demand times the case's multiplier (flow unit).</param>
/// <param name="DeliveredDemand">The flow the junction receives (flow unit): demand itself in a demand-driven solve and for an inflow; under pressure-driven demand, demand times r(pressureHead) by the law of the request's demandModel.</param>
public sealed record NetworkJunctionResultDto(string Id, double Head, double PressureHead, double Demand, double DeliveredDemand);

/// <summary>One pump in a load case's answer.</summary>
/// <param name="Id">The pump's id.</param>
/// <param name="Flow">Flow from suction to delivery (flow unit); 0 when off.</param>
/// <param name="Head">Head added, delivery head minus suction head (m, or ft with units=us); for a stopped pump the head across it.</param>
/// <param name="Status">open (running) or pump-off.</param>
public sealed record NetworkPumpResultDto(string Id, double Flow, double Head, string Status);

/// <summary>One reservoir in a load case's answer.</summary>
/// <param name="Id">The reservoir's id.</param>
/// <param name="Head">Its fixed head (m, or ft with units=us).</param>
/// <param name="Outflow">Net flow out of it into the network (flow unit); negative when it fills.</param>
public sealed record NetworkReservoirResultDto(string Id, double Head, double Outflow);

/// <summary>One Newton iteration of the global gradient solve.</summary>
/// <param name="Iteration">1-based, counted over all status passes.</param>
/// <param name="StatusPass">The status pass (check valves and pumps re-examined between passes) it belongs to, from 1.</param>
/// <param name="MaxFlowChange">Largest change of a link's flow in this step (flow unit).</param>
/// <param name="MaxHeadImbalance">Largest energy imbalance |H_from - H_to - h(Q)| over the open links after the step (m, or ft with units=us); under pressure-driven demand also each junction's head against its point on the law.</param>
/// <param name="MaxContinuityError">Largest continuity error |inflow - outflow - demand| over the junctions after the step (flow unit); under pressure-driven demand with the delivered demand in place of the demand.</param>
/// <param name="LinearIterations">Work of this step's head solve: with the sparse Cholesky solver (the service's), the
/// triangular solves with the factor (1, plus one per refinement step); with conjugate gradients, their iterations.</param>
public sealed record NetworkIterationDto(int Iteration, int StatusPass, double MaxFlowChange, double MaxHeadImbalance, double MaxContinuityError, int LinearIterations);

/// <summary>A warning about one element of the network, or the summary of the rest of one code's warnings.</summary>
/// <param name="Code">Stable kebab-case code: velocity-below-design-range, velocity-above-design-range, negative-pressure, pump-cannot-lift, pump-outside-curve-range, transitional-flow (a Darcy-Weisbach pipe's Reynolds number between 2000 and 4000, where the friction factor is Churchill's 1977 interpolation, as for a single pipe), demand-shortfall (pressure-driven only: how many junctions receive less than their demand and the shortfall in all; about the whole case, without element), valve-state-cycle (a control valve that changed state within a cycle of the status search), not-converged.</param>
/// <param name="Message">What it means, naming the element (figures in SI).</param>
/// <param name="Element">The id of the pipe, pump or junction it is about; omitted for the whole case and for a summary.</param>
/// <param name="MoreElements">Only on a summary: a load case lists at most FlowSolve:Limits:NetworkWarningsPerCode
/// warnings of one code (50 by default); this one, after them, counts the further warnings of its code that are not
/// listed. The pipe, junction and pump tables carry every value, so each of those elements can be found there.</param>
public sealed record NetworkWarningDto(string Code, string Message, string? Element, int? MoreElements = null);

/// <summary>The answer for one load case.</summary>
/// <param name="DemandMultiplier">The multiplier applied to every demand.</param>
/// <param name="Status">solved, iteration-cap-reached, statuses-not-settled or status-cycle (the control valves' states came back to a set already solved; each valve of the cycle has a valve-state-cycle warning) (no-path-to-fixed-head, pump-cannot-lift, linear-solve-failed and flows-out-of-range answer 422).</param>
/// <param name="Reason">What the status means.</param>
/// <param name="Converged">True when continuity and energy balance are met within the tolerances (1e-10 m3/s and 1e-10 m).</param>
/// <param name="Iterations">Newton iterations over all status passes.</param>
/// <param name="StatusPasses">Status passes run (1 when no check valve, pump or control valve changed state).</param>
/// <param name="Pipes">Every pipe, in request order.</param>
/// <param name="Junctions">Every junction, in request order.</param>
/// <param name="Pumps">Every pump, in request order.</param>
/// <param name="Reservoirs">Every reservoir, in request order.</param>
/// <param name="TotalDemand">Sum of the demands applied (requested; flow unit).</param>
/// <param name="TotalSupply">Sum of the reservoirs' net outflows (flow unit); equals totalDeliveredDemand within the flow tolerance.</param>
/// <param name="TotalDeliveredDemand">Sum of the junctions' delivered demands (flow unit); totalDemand in a demand-driven solve.</param>
/// <param name="DemandShortfall">Requested minus delivered demand, summed over the junctions (flow unit); 0 in a demand-driven solve.</param>
/// <param name="Convergence">The convergence record, one row per Newton iteration.</param>
/// <param name="Warnings">Warnings with stable codes, each naming its element; at most FlowSolve:Limits:NetworkWarningsPerCode (50 by default) of one code, then one summary of that code with moreElements.</param>
/// <param name="Summary">The extremes of the load case over every element, whether listed or not.</param>
/// <param name="Valves">Every control valve, in request order (or the chosen ones with output.elements; none with detail summary); present only when the request has valves.</param>
public sealed record NetworkCaseDto(
    double DemandMultiplier, string Status, string Reason, bool Converged, int Iterations, int StatusPasses,
    IReadOnlyList<NetworkPipeResultDto> Pipes, IReadOnlyList<NetworkJunctionResultDto> Junctions,
    IReadOnlyList<NetworkPumpResultDto> Pumps, IReadOnlyList<NetworkReservoirResultDto> Reservoirs,
    double TotalDemand, double TotalSupply, double TotalDeliveredDemand, double DemandShortfall,
    IReadOnlyList<NetworkIterationDto> Convergence, IReadOnlyList<NetworkWarningDto> Warnings,
    NetworkCaseSummaryDto Summary, IReadOnlyList<NetworkValveResultDto>? Valves = null);

/// <summary>One extreme value of a load case and the element where it occurs.</summary>
/// <param name="Element">The id of the junction or pipe.</param>
/// <param name="Value">The value, in the unit its field names.</param>
public sealed record NetworkExtremeDto(string Element, double Value);

/// <summary>The extremes of one load case over every element (listed in the tables or not).</summary>
/// <param name="LowestPressureHead">The junction of lowest pressure head, head minus elevation (m, or ft with units=us); omitted without junctions.</param>
/// <param name="HighestPressureHead">The junction of highest pressure head (m, or ft); omitted without junctions.</param>
/// <param name="HighestVelocity">The pipe of largest mean speed |V| (m/s, or ft/s); omitted without pipes.</param>
/// <param name="TransitionalPipes">How many open Darcy-Weisbach pipes run with a Reynolds number between 2000 and 4000 (each has a transitional-flow warning).</param>
/// <param name="ClosedLinks">How many pipes and pumps carry no flow: closed, check valve shut, or pump off.</param>
/// <param name="ValveStates">How many control valves are active, open and closed; present only when the request has valves.</param>
public sealed record NetworkCaseSummaryDto(
    NetworkExtremeDto? LowestPressureHead, NetworkExtremeDto? HighestPressureHead, NetworkExtremeDto? HighestVelocity,
    int TransitionalPipes, int ClosedLinks, NetworkValveStatesDto? ValveStates = null);

/// <summary>The solved network: one answer per load case, with the method, units and defaults.</summary>
/// <param name="Cases">One answer per demand multiplier, in the order given.</param>
/// <param name="Iterations">Newton iterations of the slowest load case (the largest count of any case).</param>
/// <param name="Converged">True when every load case converged.</param>
/// <param name="Method">The relations and the algorithm used.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">m3/s, l/s, m3/h, ft3/s or gpm.</param>
/// <param name="HeadUnit">m or ft: heads, head losses, elevations.</param>
/// <param name="VelocityUnit">m/s or ft/s.</param>
/// <param name="KinematicViscosity">Kinematic viscosity used (m2/s, or ft2/s with units=us).</param>
/// <param name="Validity">Each correlation's published range beside the extremes of the inputs over every case.</param>
/// <param name="Warnings">Warnings about the request as a whole (the fluid); the element warnings are in each case.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
/// <param name="HeadSolver">The linear solver that ran for the head equations of each Newton step: sparse-cholesky (a
/// direct supernodal Cholesky factorisation under a nested-dissection ordering, the service's) or conjugate-gradient.</param>
/// <param name="Detail">What each load case lists: full (every element), summary (no element rows) or elements (the
/// chosen ones), as asked in output.</param>
/// <param name="DemandModel">demand-driven or pressure-driven: how the junctions' deliveries were found (the request's demandModel type; demand-driven when it was omitted).</param>
public sealed record NetworkSolveResponse(
    IReadOnlyList<NetworkCaseDto> Cases, int Iterations, bool Converged, string Method,
    string Units, string FlowUnit, string HeadUnit, string VelocityUnit, double KinematicViscosity,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    string HeadSolver, string Detail, string DemandModel = NetworkInput.DemandDriven) : ISolveSummary
{
    /// <summary>The request's own warnings, then every load case's element warnings.</summary>
    IEnumerable<string> IWarned.WarningCodes() => Warnings.Select(w => w.Code).Concat(Cases.SelectMany(c => c.Warnings.Select(w => w.Code)));
}
