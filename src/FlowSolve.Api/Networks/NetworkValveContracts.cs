using System.ComponentModel;

namespace FlowSolve.Api.Networks;

/// <summary>A control valve between two nodes: pressure-reducing, pressure-sustaining, flow-control or throttle.</summary>
public sealed record NetworkValveInput(
    [property: Description("Identifier, unique among all links (pipes, pumps and valves); 1 to 64 characters. Required.")]
    string? Id,
    [property: Description("Id of the upstream node; flow is reported positive from 'from' to 'to'. Required. A node may be an end of at most one valve (join two valves by a pipe).")]
    string? From,
    [property: Description("Id of the downstream node; not the upstream node. Required.")]
    string? To,
    [property: Description("Bore D for the velocity head V = 4Q/(pi D^2) of the open valve's loss minorLossCoefficient x V^2/2g: m (ft with units=us); above 0. Required.")]
    double? Diameter,
    [property: Description("pressure-reducing (holds the pressure head at 'to', which must be a junction, at most at the setting), pressure-sustaining (holds the pressure head at 'from', which must be a junction, at least at the setting), flow-control (passes at most the setting) or throttle (a fitting of loss coefficient setting). The first three pass flow only from 'from' to 'to'. Required.")]
    string? Type,
    [property: Description("pressure-reducing and pressure-sustaining: the pressure head held, head minus elevation: m (ft with units=us), 0 to 10000 m; flow-control: the largest flow passed from 'from' to 'to' (flow unit: m3/s, or flowUnit), above 0, at most 1000 m3/s; throttle: the loss coefficient K (dimensionless) that replaces minorLossCoefficient, 0.01 to 1e8. Required.")]
    double? Setting,
    [property: Description("Loss coefficient K of the fully open valve on its velocity head (dimensionless), 0.01 to 1e8. Required for pressure-reducing, pressure-sustaining and flow-control valves; not given for a throttle, whose K is its setting.")]
    double? MinorLossCoefficient = null);

/// <summary>One control valve in a load case's answer.</summary>
/// <param name="Id">The valve's id.</param>
/// <param name="Flow">Flow, positive from the valve's 'from' node to its 'to' node (flow unit); 0 when closed.</param>
/// <param name="HeadLoss">Head at 'from' minus head at 'to' (m, or ft with units=us): the open valve's loss, plus the throttling of an active valve; for a closed valve the head held across it.</param>
/// <param name="Status">active (holding its setting; a throttle always is), open (cannot reach its setting and acts as a fitting of loss minorLossCoefficient x V^2/2g) or closed (it would pass reverse flow, or a pressure-reducing valve's downstream pressure already exceeds its setting).</param>
public sealed record NetworkValveResultDto(string Id, double Flow, double HeadLoss, string Status);

/// <summary>How many control valves of a load case are in each state (every valve, listed or not).</summary>
/// <param name="Active">Valves holding their setting.</param>
/// <param name="Open">Valves fully open, unable to reach their setting.</param>
/// <param name="Closed">Valves shut.</param>
public sealed record NetworkValveStatesDto(int Active, int Open, int Closed);
