using System.Globalization;

namespace FlowSolve.Core.Networks;

/// <summary>What a control valve holds.</summary>
public enum ControlValveType
{
    /// <summary>Holds the pressure head at its <c>To</c> node at most at the setting (m); flow only from <c>From</c> to <c>To</c>.</summary>
    PressureReducing,

    /// <summary>Holds the pressure head at its <c>From</c> node at least at the setting (m); flow only from <c>From</c> to <c>To</c>.</summary>
    PressureSustaining,

    /// <summary>Passes at most the setting (m3/s) from <c>From</c> to <c>To</c>; never the other way.</summary>
    FlowControl,

    /// <summary>A fitting of loss coefficient K = the setting (dimensionless), in place of the minor loss coefficient; flow either way.</summary>
    Throttle,
}

/// <summary>The state of a control valve in a result.</summary>
public enum ValveState
{
    /// <summary>Holding its setting (a throttle always is: its setting is its loss coefficient).</summary>
    Active,

    /// <summary>Fully open: it cannot reach its setting and acts as a fitting of loss K V^2/(2g).</summary>
    Open,

    /// <summary>Shut: it would pass reverse flow (or, for a pressure-reducing valve, the pressure beyond it already
    /// exceeds its setting).</summary>
    Closed,
}

/// <summary>
/// A control valve between two nodes. Open, its loss is K V^2/(2g) with V = Q/A from <paramref name="Diameter"/>
/// (K = <paramref name="MinorLossCoefficient"/>, or the setting for a <see cref="ControlValveType.Throttle"/>).
/// </summary>
/// <param name="Id">Identifier, unique among the links (pipes, pumps and valves); not empty.</param>
/// <param name="From">Id of the upstream node; flow is positive from <paramref name="From"/> to <paramref name="To"/>.</param>
/// <param name="To">Id of the downstream node; not <paramref name="From"/>.</param>
/// <param name="Diameter">Nominal bore in m for the velocity head; finite and positive.</param>
/// <param name="Type">What the valve holds.</param>
/// <param name="Setting">Pressure-reducing: the pressure head held at <paramref name="To"/> (m, 0 to
/// <see cref="MaximumPressureSetting"/>); pressure-sustaining: the pressure head held at <paramref name="From"/> (m);
/// flow-control: the largest flow passed (m3/s, above 0, at most <see cref="MaximumFlowSetting"/>); throttle: the loss
/// coefficient K (<see cref="MinimumLossCoefficient"/> to <see cref="MaximumLossCoefficient"/>).</param>
/// <param name="MinorLossCoefficient">K of the fully open valve (<see cref="MinimumLossCoefficient"/> to
/// <see cref="MaximumLossCoefficient"/>); not used by a throttle, whose K is its setting.</param>
/// <remarks>A node may be an end of at most one control valve (join two valves by a pipe): an active pressure valve
/// fixes the head of its controlled node, and two valves fixing one node, or one valve's flow set by another's, would
/// leave the flows undetermined. The controlled node (the <paramref name="To"/> node of a pressure-reducing valve, the
/// <paramref name="From"/> node of a pressure-sustaining one) must be a junction, since a pressure head needs an
/// elevation.</remarks>
public sealed record ControlValve(string Id, string From, string To, double Diameter, ControlValveType Type, double Setting, double MinorLossCoefficient = 1)
{
    /// <summary>Smallest loss coefficient accepted, 0.01: a full-bore ball valve's K is about 0.05 (common practice, from
    /// memory); below 0.01 the open valve's conductance near zero flow dwarfs every pipe's.</summary>
    public const double MinimumLossCoefficient = 0.01;

    /// <summary>Largest loss coefficient accepted, 1e8 (a FlowSolve bound: beyond it the valve is as good as shut).</summary>
    public const double MaximumLossCoefficient = 1e8;

    /// <summary>Largest pressure setting, 10 000 m (a FlowSolve bound, as for the pressure-driven demand law).</summary>
    public const double MaximumPressureSetting = 10_000;

    /// <summary>Largest flow setting, 1000 m3/s (a FlowSolve bound; water mains carry a few m3/s).</summary>
    public const double MaximumFlowSetting = 1000;

    /// <summary>Most control valves in one model, 64: each active pressure valve costs one extra solve with the
    /// factor of the head equations per Newton step and one column of junction-length scratch (a FlowSolve bound).</summary>
    public const int MaximumCount = 64;

    /// <summary>The loss coefficient of the open valve: the setting for a throttle, else <see cref="MinorLossCoefficient"/>.</summary>
    public double OpenLossCoefficient => Type == ControlValveType.Throttle ? Setting : MinorLossCoefficient;

    /// <summary>Checks every valve of <paramref name="model"/> against its nodes and links (used by <see cref="NetworkModel.Validate"/>).</summary>
    internal static void ValidateAll(NetworkModel model, HashSet<string> nodes, HashSet<string> links, List<NetworkIssue> issues)
    {
        var valves = model.Valves;
        if (valves is null || valves.Count == 0) return;
        var c = CultureInfo.InvariantCulture;
        if (valves.Count > MaximumCount)
            issues.Add(new("", "too-many-valves", string.Format(c, "the network has {0} control valves; at most {1} are accepted", valves.Count, MaximumCount)));
        var junctions = new HashSet<string>(StringComparer.Ordinal);
        foreach (var j in model.Junctions ?? []) if (j.Id is not null) junctions.Add(j.Id);
        var ends = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var v in valves)
        {
            string id = v?.Id ?? "";
            if (v is null) { issues.Add(new("", "empty-id", "a valve is missing")); continue; }
            if (string.IsNullOrEmpty(v.Id)) issues.Add(new("", "empty-id", "a valve has an empty id"));
            else if (!links.Add(v.Id)) issues.Add(new(id, "duplicate-id", $"link id '{id}' is used more than once"));
            foreach (var node in new[] { v.From, v.To })
            {
                if (string.IsNullOrEmpty(node) || !nodes.Contains(node))
                {
                    issues.Add(new(id, "unknown-node", $"valve '{id}': node '{node}' is not a junction or reservoir"));
                    continue;
                }
                if (ends.TryGetValue(node, out var other) && other != id)
                    issues.Add(new(id, "shared-valve-node", $"valve '{id}': node '{node}' is already an end of valve '{other}'; join two valves by a pipe"));
                else ends[node] = id;
            }
            if (v.From is not null && string.Equals(v.From, v.To, StringComparison.Ordinal))
                issues.Add(new(id, "self-loop", $"valve '{id}' runs from node '{v.From}' to itself"));
            if (!(v.Diameter > 0) || !double.IsFinite(v.Diameter))
                issues.Add(new(id, "non-positive-diameter", string.Format(c, "valve '{0}': diameter {1} must be finite and positive", id, v.Diameter)));
            if (!Enum.IsDefined(v.Type))
                issues.Add(new(id, "bad-valve-type", $"valve '{id}': type {(int)v.Type} is not a known valve type"));
            if (v.Type != ControlValveType.Throttle && !LossInRange(v.MinorLossCoefficient))
                issues.Add(new(id, "bad-minor-loss", string.Format(c, "valve '{0}': minorLossCoefficient {1} must lie in [{2}, {3}]", id, v.MinorLossCoefficient, MinimumLossCoefficient, MaximumLossCoefficient)));
            string? bad = v.Type switch
            {
                ControlValveType.PressureReducing or ControlValveType.PressureSustaining when !(v.Setting >= 0 && v.Setting <= MaximumPressureSetting)
                    => string.Format(c, "a pressure head in [0, {0}] m", MaximumPressureSetting),
                ControlValveType.FlowControl when !(v.Setting > 0 && v.Setting <= MaximumFlowSetting)
                    => string.Format(c, "a flow above 0 and at most {0} m3/s", MaximumFlowSetting),
                ControlValveType.Throttle when !LossInRange(v.Setting)
                    => string.Format(c, "a loss coefficient in [{0}, {1}]", MinimumLossCoefficient, MaximumLossCoefficient),
                _ => null,
            };
            if (bad is not null) issues.Add(new(id, "bad-valve-setting", string.Format(c, "valve '{0}': setting {1} must be {2}", id, v.Setting, bad)));
            string? controlled = v.Type switch
            {
                ControlValveType.PressureReducing => v.To,
                ControlValveType.PressureSustaining => v.From,
                _ => null,
            };
            if (controlled is not null && nodes.Contains(controlled) && !junctions.Contains(controlled))
                issues.Add(new(id, "controlled-node-not-junction", $"valve '{id}': node '{controlled}', whose pressure it holds, must be a junction (a reservoir has no elevation and its head is fixed)"));
        }
    }

    private static bool LossInRange(double k) => k >= MinimumLossCoefficient && k <= MaximumLossCoefficient;
}

/// <summary>One control valve in a result.</summary>
/// <param name="Id">The valve's id.</param>
/// <param name="Flow">Flow in m3/s, positive from its From node to its To node (0 when closed).</param>
/// <param name="HeadLoss">H_from - H_to in m: the open valve's loss K V^2/(2g), plus the throttling an active valve adds;
/// for a closed valve the head held across it.</param>
/// <param name="State">Active, open or closed.</param>
public readonly record struct ValveResult(string Id, double Flow, double HeadLoss, ValveState State);

/// <summary>Stable codes for the valve enums (static strings).</summary>
public static class ValveCodes
{
    /// <summary>Kebab-case code: pressure-reducing, pressure-sustaining, flow-control, throttle.</summary>
    /// <param name="type">The type.</param>
    public static string Code(this ControlValveType type) => type switch
    {
        ControlValveType.PressureReducing => "pressure-reducing",
        ControlValveType.PressureSustaining => "pressure-sustaining",
        ControlValveType.FlowControl => "flow-control",
        ControlValveType.Throttle => "throttle",
        _ => "unknown",
    };

    /// <summary>Kebab-case code: active, open, closed.</summary>
    /// <param name="state">The state.</param>
    public static string Code(this ValveState state) => state switch
    {
        ValveState.Active => "active",
        ValveState.Open => "open",
        ValveState.Closed => "closed",
        _ => "unknown",
    };
}
