using System.Globalization;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Networks;

/// <summary>A junction: a node whose head is unknown, where water may be drawn off.</summary>
/// <param name="Id">Identifier, unique among the nodes (junctions and reservoirs); not empty.</param>
/// <param name="Elevation">Ground (or pipe invert) elevation z in m above the datum; finite. Pressure head is H - z.</param>
/// <param name="Demand">Water drawn off in m3/s; finite, any sign (negative for an inflow injected at the junction).</param>
public sealed record Junction(string Id, double Elevation, double Demand);

/// <summary>A reservoir (or tank held at a level): a node of fixed total head.</summary>
/// <param name="Id">Identifier, unique among the nodes; not empty.</param>
/// <param name="Head">Total head (water-surface level) in m above the datum; finite.</param>
public sealed record Reservoir(string Id, double Head);

/// <summary>A pipe between two nodes, with Darcy-Weisbach friction (roughness) or Hazen-Williams (C factor).</summary>
/// <param name="Id">Identifier, unique among the links (pipes and pumps); not empty.</param>
/// <param name="From">Id of the start node; flow is positive from <paramref name="From"/> to <paramref name="To"/>.</param>
/// <param name="To">Id of the end node; not <paramref name="From"/>.</param>
/// <param name="Length">Length in m; finite and positive.</param>
/// <param name="Diameter">Inside diameter in m; finite and positive.</param>
/// <param name="Roughness">Absolute roughness in m for Darcy-Weisbach; finite, 0 or more, below the diameter
/// (ignored when <paramref name="HazenWilliamsC"/> is given).</param>
/// <param name="HazenWilliamsC">Hazen-Williams C factor; when given (finite, positive) the pipe uses Hazen-Williams.</param>
/// <param name="MinorLossCoefficient">Sum of fitting loss coefficients K on the pipe's velocity head; finite, 0 or more.</param>
/// <param name="CheckValve">True for a check valve that lets water pass only from <paramref name="From"/> to <paramref name="To"/>.</param>
/// <param name="Closed">True for a pipe shut by an isolating valve (it carries no flow whatever the heads).</param>
public sealed record NetworkPipe(
    string Id, string From, string To, double Length, double Diameter, double Roughness = 0,
    double? HazenWilliamsC = null, double MinorLossCoefficient = 0, bool CheckValve = false, bool Closed = false);

/// <summary>A pump between two nodes, lifting water from <paramref name="From"/> (suction) to <paramref name="To"/> (delivery).</summary>
/// <param name="Id">Identifier, unique among the links; not empty.</param>
/// <param name="From">Id of the suction node.</param>
/// <param name="To">Id of the delivery node; not <paramref name="From"/>.</param>
/// <param name="Curve">Head curve of the pump at rated speed (not <c>default</c>).</param>
/// <param name="SpeedRatio">n/n_rated in [0, <see cref="PumpArrangement.MaximumSpeedRatio"/>]; the curve is scaled by
/// the affinity laws H_s(Q) = s^2 H(Q/s) (common practice). 0 means the pump is switched off.</param>
/// <remarks>A pump cannot run backwards: it stops (<see cref="LinkStatus.PumpOff"/>) when the system would drive water
/// back through it, as if it had a check valve on its delivery side.</remarks>
public sealed record NetworkPump(string Id, string From, string To, PumpCurve Curve, double SpeedRatio = 1.0);

/// <summary>One problem found by <see cref="NetworkModel.Validate"/>: the element that has it and why.</summary>
/// <param name="ElementId">Id of the offending element (empty for a problem of the whole model, such as the fluid).</param>
/// <param name="Code">Stable kebab-case code: <c>empty-id</c>, <c>duplicate-id</c>, <c>unknown-node</c>, <c>self-loop</c>,
/// <c>non-positive-length</c>, <c>non-positive-diameter</c>, <c>bad-roughness</c>, <c>bad-hazen-williams-c</c>,
/// <c>bad-minor-loss</c>, <c>non-finite-value</c>, <c>bad-speed-ratio</c>, <c>missing-pump-curve</c>, <c>bad-viscosity</c>,
/// <c>bad-demand-model</c>; for valves also <c>too-many-valves</c>, <c>shared-valve-node</c>, <c>bad-valve-type</c>,
/// <c>bad-valve-setting</c>, <c>controlled-node-not-junction</c>.</param>
/// <param name="Message">A sentence for people that names the element.</param>
public readonly record struct NetworkIssue(string ElementId, string Code, string Message);

/// <summary>Thrown by <see cref="NetworkSolver"/> for a model that <see cref="NetworkModel.Validate"/> rejects.</summary>
public sealed class NetworkValidationException : ArgumentException
{
    /// <summary>Creates the exception from the issues found.</summary>
    /// <param name="issues">At least one issue.</param>
    public NetworkValidationException(IReadOnlyList<NetworkIssue> issues)
        : base(issues.Count == 0 ? "the network is invalid" : issues[0].Message + (issues.Count > 1 ? $" (and {issues.Count - 1} more)" : ""),
            "network") => Issues = issues;

    /// <summary>Every problem found, each naming its element.</summary>
    public IReadOnlyList<NetworkIssue> Issues { get; }
}

/// <summary>A looped (or branched) pipe network: nodes, links and the fluid, in SI units.</summary>
/// <param name="Junctions">Nodes of unknown head.</param>
/// <param name="Reservoirs">Nodes of fixed head; at least one per connected part of the network for a solution.</param>
/// <param name="Pipes">Pipes.</param>
/// <param name="Pumps">Pumps (may be empty).</param>
/// <param name="KinematicViscosity">Kinematic viscosity of the fluid in m2/s; finite and positive (water at 20 degrees C:
/// about 1.004e-6). Hazen-Williams pipes use it only for the Reynolds number behind their friction factor report.</param>
public sealed record NetworkModel(
    IReadOnlyList<Junction> Junctions, IReadOnlyList<Reservoir> Reservoirs,
    IReadOnlyList<NetworkPipe> Pipes, IReadOnlyList<NetworkPump> Pumps, double KinematicViscosity)
{
    /// <summary>How the junctions' demands respond to pressure: null (the default) for demand-driven, where every
    /// junction receives its whole demand whatever its pressure; a <see cref="PressureDrivenDemand"/> law for
    /// pressure-driven demand, where a junction with a positive demand receives only what its pressure head allows.</summary>
    public PressureDrivenDemand? DemandModel { get; init; }

    /// <summary>Control valves (pressure-reducing, pressure-sustaining, flow-control, throttle); empty by default. Their
    /// ids share the links' namespace; see <see cref="ControlValve"/> for the rules on their nodes.</summary>
    public IReadOnlyList<ControlValve> Valves { get; init; } = [];

    /// <summary>Checks the model and lists every problem, each naming the offending element by id (allocates).</summary>
    /// <returns>An empty list for a valid model.</returns>
    public IReadOnlyList<NetworkIssue> Validate()
    {
        var issues = new List<NetworkIssue>();
        var c = CultureInfo.InvariantCulture;
        if (!(KinematicViscosity > 0) || !double.IsFinite(KinematicViscosity))
            issues.Add(new("", "bad-viscosity", string.Format(c, "kinematicViscosity {0} must be finite and positive", KinematicViscosity)));

        if (DemandModel is not null) issues.AddRange(DemandModel.Validate());

        var nodes = new HashSet<string>((Junctions?.Count ?? 0) + (Reservoirs?.Count ?? 0), StringComparer.Ordinal);
        void Node(string? id, string kind)
        {
            if (string.IsNullOrEmpty(id)) { issues.Add(new(id ?? "", "empty-id", $"a {kind} has an empty id")); return; }
            if (!nodes.Add(id)) issues.Add(new(id, "duplicate-id", $"node id '{id}' is used more than once"));
        }
        foreach (var j in Junctions ?? [])
        {
            Node(j.Id, "junction");
            if (!double.IsFinite(j.Elevation)) issues.Add(new(j.Id ?? "", "non-finite-value", $"junction '{j.Id}': elevation must be finite"));
            if (!double.IsFinite(j.Demand)) issues.Add(new(j.Id ?? "", "non-finite-value", $"junction '{j.Id}': demand must be finite"));
        }
        foreach (var r in Reservoirs ?? [])
        {
            Node(r.Id, "reservoir");
            if (!double.IsFinite(r.Head)) issues.Add(new(r.Id ?? "", "non-finite-value", $"reservoir '{r.Id}': head must be finite"));
        }

        var links = new HashSet<string>((Pipes?.Count ?? 0) + (Pumps?.Count ?? 0), StringComparer.Ordinal);
        void Link(string? id, string from, string to, string kind)
        {
            if (string.IsNullOrEmpty(id)) issues.Add(new(id ?? "", "empty-id", $"a {kind} has an empty id"));
            else if (!links.Add(id)) issues.Add(new(id, "duplicate-id", $"link id '{id}' is used more than once"));
            if (string.IsNullOrEmpty(from) || !nodes.Contains(from))
                issues.Add(new(id ?? "", "unknown-node", $"{kind} '{id}': from-node '{from}' is not a junction or reservoir"));
            if (string.IsNullOrEmpty(to) || !nodes.Contains(to))
                issues.Add(new(id ?? "", "unknown-node", $"{kind} '{id}': to-node '{to}' is not a junction or reservoir"));
            if (from is not null && string.Equals(from, to, StringComparison.Ordinal))
                issues.Add(new(id ?? "", "self-loop", $"{kind} '{id}' runs from node '{from}' to itself"));
        }
        foreach (var p in Pipes ?? [])
        {
            Link(p.Id, p.From, p.To, "pipe");
            string id = p.Id ?? "";
            if (!(p.Length > 0) || !double.IsFinite(p.Length))
                issues.Add(new(id, "non-positive-length", string.Format(c, "pipe '{0}': length {1} must be finite and positive", id, p.Length)));
            if (!(p.Diameter > 0) || !double.IsFinite(p.Diameter))
                issues.Add(new(id, "non-positive-diameter", string.Format(c, "pipe '{0}': diameter {1} must be finite and positive", id, p.Diameter)));
            if (p.HazenWilliamsC is double hw)
            {
                if (!(hw > 0) || !double.IsFinite(hw))
                    issues.Add(new(id, "bad-hazen-williams-c", string.Format(c, "pipe '{0}': hazenWilliamsC {1} must be finite and positive", id, hw)));
            }
            else if (!(p.Roughness >= 0) || !double.IsFinite(p.Roughness) || !(p.Roughness < p.Diameter || !(p.Diameter > 0)))
                issues.Add(new(id, "bad-roughness", string.Format(c, "pipe '{0}': roughness {1} must be finite, 0 or more, and below the diameter", id, p.Roughness)));
            if (!(p.MinorLossCoefficient >= 0) || !double.IsFinite(p.MinorLossCoefficient))
                issues.Add(new(id, "bad-minor-loss", string.Format(c, "pipe '{0}': minorLossCoefficient {1} must be finite and 0 or more", id, p.MinorLossCoefficient)));
        }
        foreach (var p in Pumps ?? [])
        {
            Link(p.Id, p.From, p.To, "pump");
            string id = p.Id ?? "";
            if (!(p.Curve.SearchLimit > 0))
                issues.Add(new(id, "missing-pump-curve", $"pump '{id}': the curve is not set"));
            if (!(p.SpeedRatio >= 0 && p.SpeedRatio <= PumpArrangement.MaximumSpeedRatio))
                issues.Add(new(id, "bad-speed-ratio", string.Format(c, "pump '{0}': speedRatio {1} must lie in [0, {2}]", id, p.SpeedRatio, PumpArrangement.MaximumSpeedRatio)));
        }
        ControlValve.ValidateAll(this, nodes, links, issues);
        return issues;
    }
}
