using FlowSolve.Api.Problems;
using FlowSolve.Api.Pumps;
using FlowSolve.Core.Networks;

namespace FlowSolve.Api.Networks;

/// <summary>Reads and validates the request's control valves: every bad field under its wire path
/// (<c>valves[2].setting</c>), each message beginning with the valve's id, in the units of the request.</summary>
internal static class NetworkValveReader
{
    public const string PressureReducing = "pressure-reducing", PressureSustaining = "pressure-sustaining", FlowControl = "flow-control", Throttle = "throttle";

    private static readonly Dictionary<string, ControlValveType> Types = new(StringComparer.OrdinalIgnoreCase)
    {
        [PressureReducing] = ControlValveType.PressureReducing,
        [PressureSustaining] = ControlValveType.PressureSustaining,
        [FlowControl] = ControlValveType.FlowControl,
        [Throttle] = ControlValveType.Throttle,
    };

    /// <param name="input">The request's valves (null: none).</param>
    /// <param name="errors">The collector.</param>
    /// <param name="u">The request's units.</param>
    /// <param name="nodeAt">Node id to the wire path of its definition (junctions[k] or reservoirs[k]).</param>
    /// <param name="linkAt">Link id to its wire path; the valves' ids are added.</param>
    public static List<ControlValve> Read(IReadOnlyList<NetworkValveInput?>? input, NetworkInput.Errors errors, PumpUnits u,
        Dictionary<string, string> nodeAt, Dictionary<string, string> linkAt)
    {
        var valves = new List<ControlValve>();
        if (input is null) return valves;
        var fields = errors.Fields;
        if (input.Count > ControlValve.MaximumCount)
        {
            fields.Add("valves", $"holds {input.Count} valves; at most {ControlValve.MaximumCount} are accepted");
            return valves;
        }
        string hu = u.HeadUnit, qu = u.FlowUnit;
        var endOf = new Dictionary<string, string>(StringComparer.Ordinal); // node id -> the valve path that ends there
        for (int i = 0; i < input.Count; i++)
        {
            string at = $"valves[{i}]";
            var v = input[i];
            if (v is null) { fields.Add(at, "must be an object {id, from, to, diameter, type, setting, minorLossCoefficient}"); continue; }
            string label = $"valve '{NetworkInput.Short(v.Id)}'";
            bool ok = NetworkInput.Id(errors, at, label, v.Id, "link", linkAt);
            bool ends = NetworkInput.Ends(errors, at, label, v.Id, v.From, v.To, nodeAt);
            ok &= ends;
            if (ends)
            {
                foreach (var (field, node) in new[] { (".from", v.From!), (".to", v.To!) })
                {
                    if (endOf.TryGetValue(node, out var other))
                    {
                        errors.Add(at + field, label, v.Id, $"node '{NetworkInput.Short(node)}' is already an end of {other}; a node may be an end of one valve only (join two valves by a pipe)");
                        ok = false;
                    }
                    else endOf[node] = $"{at} ('{NetworkInput.Short(v.Id)}')";
                }
            }
            var valve = errors.Scoped(label, v.Id, e =>
            {
                double d = NetworkInput.Length(e, at + ".diameter", v.Diameter, u, hu);
                ControlValveType type = default;
                bool typed = false;
                if (v.Type is null) e.Add(at + ".type", "is required: pressure-reducing, pressure-sustaining, flow-control or throttle");
                else if (!Types.TryGetValue(v.Type, out type))
                    e.Add(at + ".type", $"must be pressure-reducing, pressure-sustaining, flow-control or throttle, not '{NetworkInput.Short(v.Type)}'");
                else typed = true;
                double setting = double.NaN, k = double.NaN;
                if (typed)
                {
                    string s = at + ".setting";
                    switch (type)
                    {
                        case ControlValveType.PressureReducing or ControlValveType.PressureSustaining:
                            setting = u.HeadToSi(e.Required(s, v.Setting, 0, ControlValve.MaximumPressureSetting / u.HeadFactor, unit: hu));
                            break;
                        case ControlValveType.FlowControl:
                            setting = u.FlowToSi(e.Required(s, v.Setting, 0, ControlValve.MaximumFlowSetting / u.FlowFactor, minExclusive: true, unit: qu));
                            break;
                        default:
                            setting = e.Required(s, v.Setting, ControlValve.MinimumLossCoefficient, ControlValve.MaximumLossCoefficient);
                            break;
                    }
                    if (type == ControlValveType.Throttle)
                    {
                        if (v.MinorLossCoefficient is not null)
                            e.Add(at + ".minorLossCoefficient", "is not given for a throttle: its loss coefficient is its setting");
                        k = setting;
                    }
                    else k = e.Required(at + ".minorLossCoefficient", v.MinorLossCoefficient, ControlValve.MinimumLossCoefficient, ControlValve.MaximumLossCoefficient);
                    string? controlled = type switch { ControlValveType.PressureReducing => v.To, ControlValveType.PressureSustaining => v.From, _ => null };
                    if (controlled is not null && nodeAt.TryGetValue(controlled, out var path) && !path.StartsWith("junctions[", StringComparison.Ordinal))
                        e.Add(at + (type == ControlValveType.PressureReducing ? ".to" : ".from"),
                            $"a {v.Type!.ToLowerInvariant()} valve holds the pressure at '{NetworkInput.Short(controlled)}', which must be a junction (a reservoir's head is fixed and has no elevation)");
                }
                return typed ? new ControlValve(v.Id ?? "", v.From ?? "", v.To ?? "", d, type, setting, k) : null;
            });
            if (ok && valve is not null) valves.Add(valve);
        }
        return valves;
    }

    /// <summary>The method's sentence for the valves of a request.</summary>
    public const string Method = "control valves (pressure-reducing, pressure-sustaining, flow-control, throttle): open, each a fitting K V^2/(2g) on its bore; active, a pressure valve fixes the pressure head of its held node (its flow by continuity there, a rank-one term of each Newton step solved with the head equations' own factor) and a flow-control valve its flow; closed, no flow; the states re-examined between Newton solves until they settle, a recurring set of states reported as status-cycle (not converged)";
}
