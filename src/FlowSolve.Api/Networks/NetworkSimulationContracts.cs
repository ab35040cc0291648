using System.ComponentModel;
using FlowSolve.Api.Contracts;

namespace FlowSolve.Api.Networks;

/// <summary>A storage tank: a vertical cylinder whose level moves with the net inflow of its links.</summary>
public sealed record NetworkTankInput(
    [property: Description("Identifier, unique among all nodes (junctions, reservoirs and tanks); 1 to 64 characters. Required. Links (pipes, pumps, valves) end at it by this id.")]
    string? Id,
    [property: Description("Elevation of the tank's bottom above the datum: m (ft with units=us); any sign. The tank's head is elevation + level. Required.")]
    double? Elevation,
    [property: Description("Level at time 0 above the bottom: m (ft with units=us); within [minimumLevel, maximumLevel]. Required.")]
    double? InitialLevel,
    [property: Description("Lowest level above the bottom, where the tank is empty and gives no more outflow: m (ft with units=us); 0 or more; 0 when omitted.")]
    double? MinimumLevel,
    [property: Description("Highest level above the bottom, where the tank is full and takes no more inflow: m (ft with units=us); above minimumLevel by at least 1 mm, at most 10 000 m. Required.")]
    double? MaximumLevel,
    [property: Description("Inside diameter of the cylinder: m (ft with units=us); 0.01 to 10 000 m. Required.")]
    double? Diameter,
    [property: Description("Easting for the schematic, as on the other nodes; optional.")]
    double? X = null,
    [property: Description("Northing for the schematic; optional.")]
    double? Y = null);

/// <summary>A demand pattern: multipliers of a junction's demand over time.</summary>
public sealed record NetworkPatternInput(
    [property: Description("Identifier, unique among the patterns; 1 to 64 characters. Required; junctions name it in their pattern field.")]
    string? Id,
    [property: Description("One multiplier per patternStep seconds, repeating after the last: multiplier k applies on [k x patternStep, (k + 1) x patternStep). Each finite, 0 to 100; at least one (at most 100 000 over all the patterns of a request). Required.")]
    IReadOnlyList<double>? Multipliers);

/// <summary>What a control does to its link.</summary>
public sealed record NetworkControlSetInput(
    [property: Description("open or closed: the link's new status (a pipe; a pump switched on or off; a control valve shut whatever the heads, or regulating again). Give this or speedRatio.")]
    string? Status = null,
    [property: Description("A pump's new speed ratio n/n_rated, 0 (off) to 1.5 (the affinity laws, as a pump's speedRatio); pumps only. Give this or status.")]
    double? SpeedRatio = null);

/// <summary>When a control fires.</summary>
public sealed record NetworkControlWhenInput(
    [property: Description("The tank whose level is watched (with levelBelow or levelAbove).")]
    string? Tank = null,
    [property: Description("Fires when the tank's level falls below this: m above the tank's bottom (ft with units=us), within [minimumLevel, maximumLevel] of that tank.")]
    double? LevelBelow = null,
    [property: Description("Fires when the tank's level rises above this: m above the tank's bottom (ft with units=us), within [minimumLevel, maximumLevel] of that tank.")]
    double? LevelAbove = null,
    [property: Description("Fires at this time, s from the start; 0 to duration. Without tank.")]
    double? Time = null);

/// <summary>A rule that changes a pipe's, pump's or valve's status (or a pump's speed) when its condition is met.</summary>
public sealed record NetworkControlInput(
    [property: Description("The id of the pipe, pump or control valve it acts on. Required.")]
    string? Link,
    [property: Description("What it does: {\"status\": \"open\"|\"closed\"} or {\"speedRatio\": x} (pumps). Required.")]
    NetworkControlSetInput? Set,
    [property: Description("When: {\"tank\": id, \"levelBelow\": m}, {\"tank\": id, \"levelAbove\": m} or {\"time\": s}. A level condition that already holds at time 0 fires at time 0. Required.")]
    NetworkControlWhenInput? When);

/// <summary>An extended-period run: the network document of /v1/networks/solve plus tanks, patterns, controls and times.</summary>
public sealed record NetworkSimulationRequest(
    [property: Description("Junctions (id, elevation, demand, pattern; x and y for the schematic), as in /v1/networks/solve; pattern names a demand pattern.")]
    IReadOnlyList<NetworkJunctionInput>? Junctions,
    [property: Description("Reservoirs: nodes of fixed head all through the run, as in /v1/networks/solve. Optional when there are tanks.")]
    IReadOnlyList<NetworkReservoirInput>? Reservoirs,
    [property: Description("Pipes, as in /v1/networks/solve; their ends may be tanks.")]
    IReadOnlyList<NetworkPipeInput>? Pipes,
    [property: Description("Storage tanks (id, elevation, initialLevel, minimumLevel, maximumLevel, diameter): vertical cylinders whose head, elevation + level, follows their net inflow. At least one tank or reservoir.")]
    IReadOnlyList<NetworkTankInput>? Tanks = null,
    [property: Description("Demand patterns (id, multipliers), one multiplier per patternStep seconds, repeating; optional. Every pattern must be named by a junction.")]
    IReadOnlyList<NetworkPatternInput>? Patterns = null,
    [property: Description("Controls (link, set, when), in the order given: when two fire at the same instant on one link, the later wins; optional, at most 1000.")]
    IReadOnlyList<NetworkControlInput>? Controls = null,
    [property: Description("Length of the run: s, 0 or more; at most FlowSolve:Limits:NetworkMaxSimulationDuration (7 days, 604 800 s, by default), beyond which the request answers 413. Required.")]
    double? Duration = null,
    [property: Description("Interval between reported states: s, at least 1; 3600 when omitted. Reports are at every multiple of it from 0 to duration, and at duration.")]
    double? ReportStep = null,
    [property: Description("Length of one pattern multiplier: s, at least 1; 3600 when omitted.")]
    double? PatternStep = null,
    [property: Description("Pumps, as in /v1/networks/solve; their ends may be tanks. A control can switch them or change their speed.")]
    IReadOnlyList<NetworkPumpInput>? Pumps = null,
    [property: Description("Control valves, as in /v1/networks/solve; a valve may not end at a tank (join it by a pipe); a control may open or close one.")]
    IReadOnlyList<NetworkValveInput>? Valves = null,
    [property: Description("Water temperature: degrees C, 0 to 100 (degrees F, 32 to 212, with units=us). Water at 20 degrees C when no fluid is given.")]
    double? Temperature = null,
    [property: Description("Kinematic viscosity of the fluid: m2/s (ft2/s with units=us); above 0. Instead of temperature.")]
    double? KinematicViscosity = null,
    [property: Description("Unit system of the request and response: si (default) or us. Times are always in seconds.")]
    string? Units = null,
    [property: Description(Hosting.FlowUnit.Description)]
    string? FlowUnit = null,
    [property: Description("A name for the network, shown as the calculation sheet's subtitle; optional, at most 200 characters.")]
    string? Title = null,
    [property: Description("How much of each report to list, as in /v1/networks/solve: {\"detail\": \"summary\"} or {\"elements\": [ids]}; every element when omitted. Tanks are always listed. The rows listed (plus the tanks) times the report times may not exceed FlowSolve:Limits:NetworkMaxElementCases, nor every element times the report times 10 times that (the run keeps every state until it answers).")]
    NetworkOutputInput? Output = null,
    [property: Description("How junction demands respond to pressure, as in /v1/networks/solve; demand-driven when omitted.")]
    NetworkDemandModelInput? DemandModel = null)
{
    /// <summary>The network document alone, for the network reader (one load case, the demands as given).</summary>
    internal NetworkSolveRequest Network() => new(Junctions, Reservoirs, Pipes, Pumps, null, Temperature, KinematicViscosity,
        Units, FlowUnit, Title, Output, DemandModel, Valves);
}

/// <summary>A tank's state at a report time.</summary>
/// <param name="Id">The tank.</param>
/// <param name="Level">Level above its bottom (m, or ft with units=us).</param>
/// <param name="Head">Elevation + level (m, or ft).</param>
/// <param name="Inflow">Net inflow from its links (flow unit); negative when it drains.</param>
/// <param name="AtLimit">full or empty when the tank is held at a limit; omitted between its limits.</param>
public sealed record NetworkTankResultDto(string Id, double Level, double Head, double Inflow, string? AtLimit = null);

/// <summary>The network at one report time.</summary>
/// <param name="Time">s from the start.</param>
/// <param name="Status">The network solve's status at that time, as a load case of /v1/networks/solve reports it.</param>
/// <param name="Converged">True when that network solve converged.</param>
/// <param name="Iterations">Newton iterations of that network solve.</param>
/// <param name="Pipes">Every pipe (or the chosen ones with output.elements; none with detail summary).</param>
/// <param name="Junctions">Every junction, likewise; demand is the junction's demand times its pattern's multiplier at that time.</param>
/// <param name="Pumps">Every pump, likewise; status open or pump-off (a pump switched off by a control, or unable to lift).</param>
/// <param name="Reservoirs">Every reservoir, likewise.</param>
/// <param name="Tanks">Every tank, always.</param>
/// <param name="TotalDemand">Sum of the junction demands applied at that time (flow unit).</param>
/// <param name="TotalSupply">Sum of the reservoirs' net outflows (flow unit).</param>
/// <param name="TotalTankInflow">Sum of the tanks' net inflows (flow unit): totalSupply minus the delivered demand.</param>
/// <param name="Summary">Extremes over every element at that time (lowest and highest pressure head, highest velocity).</param>
/// <param name="Valves">Every control valve, likewise; present only when the request has valves.</param>
public sealed record NetworkSimulationReportDto(
    double Time, string Status, bool Converged, int Iterations,
    IReadOnlyList<NetworkPipeResultDto> Pipes, IReadOnlyList<NetworkJunctionResultDto> Junctions,
    IReadOnlyList<NetworkPumpResultDto> Pumps, IReadOnlyList<NetworkReservoirResultDto> Reservoirs,
    IReadOnlyList<NetworkTankResultDto> Tanks, double TotalDemand, double TotalSupply, double TotalTankInflow,
    NetworkCaseSummaryDto Summary, IReadOnlyList<NetworkValveResultDto>? Valves = null);

/// <summary>Something that happened during the run.</summary>
/// <param name="Time">s from the start; a tank reaching a limit or a level control is located by Newton's method on the
/// integrator's interpolant.</param>
/// <param name="Kind">tank-full, tank-empty or control.</param>
/// <param name="Element">The tank, or the link the control acted on.</param>
/// <param name="Change">What changed, for people (for instance closed, or speedRatio 0.8).</param>
/// <param name="Iterations">Newton iterations that located the time (0 for a time control).</param>
/// <param name="LevelResidual">The level's distance from its limit or threshold at the located time (m, or ft with units=us); 0 for a time control.</param>
public sealed record NetworkSimulationEventDto(double Time, string Kind, string Element, string Change, int Iterations, double LevelResidual);

/// <summary>An extended-period run: the network and its tanks at every report time, the events, and the run's record.</summary>
/// <param name="Times">The report times, s: every multiple of reportStep from 0 to duration, and duration (those reached
/// when the run stopped early).</param>
/// <param name="Reports">One per report time, in order.</param>
/// <param name="Events">Tanks reaching a limit and controls firing, in time order, each once.</param>
/// <param name="Status">completed, network-not-converged (a network solve failed; the run stopped at the last time it had
/// an answer) or too-many-steps (the integrator's step limit).</param>
/// <param name="Converged">True only when the run reached its duration and every network solve converged.</param>
/// <param name="ReachedTime">The time up to which the run has an answer, s (duration when completed).</param>
/// <param name="Duration">The run's length, s.</param>
/// <param name="ReportStep">s.</param>
/// <param name="PatternStep">s.</param>
/// <param name="Iterations">Newton iterations of the slowest reported network solve.</param>
/// <param name="IntegrationSteps">Accepted steps of the time integration.</param>
/// <param name="RejectedSteps">Steps rejected by the error control and retried shorter.</param>
/// <param name="NetworkSolves">Network solves of the whole run (integration stages, events, reports).</param>
/// <param name="LargestErrorEstimate">The largest embedded estimate of a step's local error in a tank level (m, or ft);
/// 0 without tanks.</param>
/// <param name="Method">The relations, the network solve, the integration method and its tolerances.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">m3/s, l/s, m3/h, ft3/s or gpm.</param>
/// <param name="HeadUnit">m or ft: heads, levels, elevations.</param>
/// <param name="VelocityUnit">m/s or ft/s.</param>
/// <param name="KinematicViscosity">Kinematic viscosity used (m2/s, or ft2/s with units=us).</param>
/// <param name="Validity">Each correlation's published range beside the extremes over every report.</param>
/// <param name="Warnings">Warnings about the request and the run (not-converged, the fluid).</param>
/// <param name="ElementWarnings">Warnings about elements (as a load case of /v1/networks/solve has them), each element and
/// code once, at the first report time it holds, the time leading its message; at most
/// FlowSolve:Limits:NetworkWarningsPerCode of one code, then one summary with moreElements.</param>
/// <param name="Assumptions">Defaults that were applied (reportStep, patternStep, the fluid, the integration tolerance).</param>
/// <param name="HeadSolver">The linear solver of the head equations, as in /v1/networks/solve.</param>
/// <param name="Detail">full, summary or elements, as asked in output.</param>
/// <param name="DemandModel">demand-driven or pressure-driven.</param>
public sealed record NetworkSimulationResponse(
    IReadOnlyList<double> Times, IReadOnlyList<NetworkSimulationReportDto> Reports, IReadOnlyList<NetworkSimulationEventDto> Events,
    string Status, bool Converged, double ReachedTime, double Duration, double ReportStep, double PatternStep,
    int Iterations, int IntegrationSteps, int RejectedSteps, int NetworkSolves, double LargestErrorEstimate, string Method,
    string Units, string FlowUnit, string HeadUnit, string VelocityUnit, double KinematicViscosity,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<NetworkWarningDto> ElementWarnings,
    IReadOnlyList<AssumptionDto> Assumptions, string HeadSolver, string Detail, string DemandModel) : Hosting.ISolveSummary
{
    /// <summary>The request's and the run's warnings, then the element warnings.</summary>
    IEnumerable<string> Hosting.IWarned.WarningCodes() => Warnings.Select(w => w.Code).Concat(ElementWarnings.Select(w => w.Code));
}
