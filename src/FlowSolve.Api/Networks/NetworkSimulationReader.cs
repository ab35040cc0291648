using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Pumps;
using FlowSolve.Core.Networks;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Api.Networks;

/// <summary>A validated extended-period request, in SI, ready for the Core.</summary>
/// <param name="Network">The network document as read by <see cref="NetworkInput"/> (without the tanks).</param>
/// <param name="Model">The run's model.</param>
/// <param name="Assumptions">The network's defaults and the run's.</param>
internal sealed record SimulationInput(NetworkProblem Network, SimulationModel Model, List<AssumptionDto> Assumptions)
{
    public PumpUnits Units => Network.Units;
}

/// <summary>
/// Reads and validates the extended-period part of a request (tanks, patterns, controls, times) beside the network
/// document, which <see cref="NetworkInput.Read"/> reads (the tanks through its storage hook, so links may end at them).
/// Every bad field is reported at once under its wire path (<c>controls[2].link</c>), each message beginning with its
/// element; nothing reaches the Core that its own validation would reject.
/// </summary>
internal static class NetworkSimulationReader
{
    public const int MaximumControls = 1000, MaximumPatterns = 1000, MaximumMultipliers = 100_000;

    /// <summary>Default report step and pattern step, s (an hour: common practice for a day's run).</summary>
    public const double DefaultStep = 3600;

    /// <summary>Shortest report and pattern step, s.</summary>
    public const double MinimumStep = 1;

    /// <summary>Largest tank level and diameter, m (far beyond any built tank; it keeps the arithmetic well inside double range).</summary>
    public const double MaximumTankSize = 10_000;

    /// <summary>Smallest tank diameter, m: a standpipe of 1 cm; below it the plan area underflows toward 0 and the
    /// level's rate of change has no useful meaning.</summary>
    public const double MinimumTankDiameter = 0.01;

    /// <summary>Smallest span between a tank's minimum and maximum levels, m (1 mm, the accuracy asked of the levels).</summary>
    public const double MinimumLevelSpan = 0.001;

    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public static SimulationInput? Read(NetworkSimulationRequest request, NetworkInput.Errors errors)
    {
        var fields = errors.Fields;
        var tanks = new List<Tank>();
        var tankAt = new Dictionary<string, int>(StringComparer.Ordinal); // id -> index in request.Tanks
        bool defaultMinimum = false;
        var network = NetworkInput.Read(request.Network(), errors, (u, nodeAt) =>
        {
            var stand = new List<Reservoir>();
            var ts = request.Tanks ?? [];
            string hu = u.HeadUnit;
            double bound = MaximumTankSize / u.HeadFactor;
            for (int i = 0; i < ts.Count; i++)
            {
                string at = $"tanks[{i}]";
                var t = ts[i];
                if (t is null) { fields.Add(at, "must be an object {id, elevation, initialLevel, minimumLevel, maximumLevel, diameter}"); continue; }
                string label = $"tank '{NetworkInput.Short(t.Id)}'";
                bool idOk = NetworkInput.Id(errors, at, label, t.Id, "tank", nodeAt);
                var tank = errors.Scoped(label, t.Id, e =>
                {
                    double z = e.Required(at + ".elevation", t.Elevation, double.NegativeInfinity, double.PositiveInfinity, unit: hu);
                    double zSi = u.HeadToSi(z);
                    if (double.IsFinite(z) && !double.IsFinite(zSi)) e.Add(at + ".elevation", "is too large once converted to SI");
                    double min = e.Optional(at + ".minimumLevel", t.MinimumLevel, 0, bound, unit: hu) ?? 0;
                    if (t.MinimumLevel is null) defaultMinimum = true;
                    double max = e.Required(at + ".maximumLevel", t.MaximumLevel, 0, bound, minExclusive: true, unit: hu);
                    if (double.IsFinite(min) && double.IsFinite(max) && !(u.HeadToSi(max) - u.HeadToSi(min) >= MinimumLevelSpan))
                        e.Add(at + ".maximumLevel", Format($"must be above minimumLevel ({min:G6} {hu}) by at least {MinimumLevelSpan / u.HeadFactor:G4} {hu} (1 mm, the accuracy of the levels)"));
                    double level = e.Required(at + ".initialLevel", t.InitialLevel, 0, bound, unit: hu);
                    if (double.IsFinite(level) && double.IsFinite(min) && double.IsFinite(max) && (level < min || level > max))
                        e.Add(at + ".initialLevel", Format($"must lie within [minimumLevel, maximumLevel] = [{min:G6}, {max:G6}] {hu}"));
                    double d = e.Required(at + ".diameter", t.Diameter, MinimumTankDiameter / u.HeadFactor, bound, unit: hu);
                    e.Optional(at + ".x", t.X, double.NegativeInfinity, double.PositiveInfinity);
                    e.Optional(at + ".y", t.Y, double.NegativeInfinity, double.PositiveInfinity);
                    if ((t.X is null) != (t.Y is null)) e.Add(at + (t.X is null ? ".x" : ".y"), "give both x and y for the schematic, or neither");
                    return new Tank(t.Id ?? "", zSi, u.HeadToSi(level), u.HeadToSi(min), u.HeadToSi(max), u.HeadToSi(d));
                });
                if (!idOk) continue;
                tankAt[t.Id!] = i;
                // Every tank with an id stands in as a node of known head (a bad field has its own 400, and the
                // backstop check runs only on a request without errors).
                stand.Add(new Reservoir(tank.Id, tank.Elevation + tank.InitialLevel));
                if (double.IsFinite(tank.Elevation + tank.InitialLevel + tank.MinimumLevel + tank.MaximumLevel + tank.Diameter))
                    tanks.Add(tank);
            }
            return stand;
        });
        var u = network?.Units ?? new PumpUnits(string.Equals(request.Units, "us", StringComparison.OrdinalIgnoreCase), Hosting.FlowUnit.CubicMetrePerSecond);
        string hu = u.HeadUnit;

        // Every link end, for the tanks that nothing connects.
        var ends = new HashSet<string>(StringComparer.Ordinal);
        foreach (var p in request.Pipes ?? []) { if (p?.From is { } f) ends.Add(f); if (p?.To is { } t) ends.Add(t); }
        foreach (var p in request.Pumps ?? []) { if (p?.From is { } f) ends.Add(f); if (p?.To is { } t) ends.Add(t); }
        foreach (var v in request.Valves ?? []) { if (v?.From is { } f) ends.Add(f); if (v?.To is { } t) ends.Add(t); }
        foreach (var (id, i) in tankAt)
            if (!ends.Contains(id))
                errors.Add($"tanks[{i}].id", $"tank '{NetworkInput.Short(id)}'", id, "is connected to no pipe, pump or valve, so its level could never change; connect it or leave it out");

        // A control valve holds the pressure or flow at its ends, which a tank's moving head would contradict.
        var vs = request.Valves ?? [];
        for (int i = 0; i < vs.Count; i++)
        {
            if (vs[i] is not { } v) continue;
            foreach (var (end, node) in new[] { (".from", v.From), (".to", v.To) })
                if (node is not null && tankAt.ContainsKey(node))
                    errors.Add($"valves[{i}]{end}", $"valve '{NetworkInput.Short(v.Id)}'", v.Id, $"ends at tank '{NetworkInput.Short(node)}'; join a valve to a tank by a pipe");
        }

        // Patterns, and the junctions that name them.
        var patterns = new List<DemandPattern>();
        var patternAt = new Dictionary<string, int>(StringComparer.Ordinal);
        var ps = request.Patterns ?? [];
        long multipliers = 0;
        foreach (var p in ps) multipliers += p?.Multipliers?.Count ?? 0;
        if (ps.Count > MaximumPatterns) fields.Add("patterns", $"holds {ps.Count} patterns; at most {MaximumPatterns} are accepted");
        else if (multipliers > MaximumMultipliers) fields.Add("patterns", $"hold {multipliers} multipliers in all; at most {MaximumMultipliers} are accepted in one request");
        else
            for (int i = 0; i < ps.Count; i++)
            {
                string at = $"patterns[{i}]";
                var p = ps[i];
                if (p is null) { fields.Add(at, "must be an object {id, multipliers}"); continue; }
                string label = $"pattern '{NetworkInput.Short(p.Id)}'";
                bool ok = true;
                if (string.IsNullOrEmpty(p.Id)) { fields.Add(at + ".id", $"every pattern needs an id (1 to {NetworkInput.MaximumIdLength} characters)"); ok = false; }
                else if (p.Id.Length > NetworkInput.MaximumIdLength) { errors.Add(at + ".id", label, p.Id, $"the id has {p.Id.Length} characters; at most {NetworkInput.MaximumIdLength} are accepted"); ok = false; }
                else if (patternAt.TryGetValue(p.Id, out int first)) { errors.Add(at + ".id", label, p.Id, $"duplicate id: '{p.Id}' is already the id of patterns[{first}]"); ok = false; }
                var values = errors.Scoped(label, p.Id, e =>
                {
                    if (p.Multipliers is null) { e.Add(at + ".multipliers", "is required: one multiplier per patternStep, at least one"); return null; }
                    if (p.Multipliers.Count == 0) { e.Add(at + ".multipliers", "must hold at least one multiplier"); return null; }
                    var m = new double[p.Multipliers.Count];
                    for (int k = 0; k < m.Length; k++) m[k] = e.Required($"{at}.multipliers[{k}]", p.Multipliers[k], 0, NetworkInput.MaximumMultiplier);
                    return m;
                });
                if (!ok) continue;
                patternAt[p.Id!] = i;
                if (values is not null && values.All(double.IsFinite)) patterns.Add(new DemandPattern(p.Id!, values));
            }
        var junctionPatterns = new Dictionary<string, string>(StringComparer.Ordinal);
        var named = new HashSet<string>(StringComparer.Ordinal);
        var js = request.Junctions ?? [];
        for (int i = 0; i < js.Count; i++)
        {
            if (js[i] is not { Pattern: { } pattern } j) continue;
            named.Add(pattern);
            if (!patternAt.ContainsKey(pattern))
                errors.Add($"junctions[{i}].pattern", $"junction '{NetworkInput.Short(j.Id)}'", j.Id, $"'{NetworkInput.Short(pattern)}' is not the id of a pattern of this request (patterns[])");
            else if (!string.IsNullOrEmpty(j.Id)) junctionPatterns[j.Id] = pattern;
        }
        foreach (var (id, i) in patternAt)
            if (!named.Contains(id))
                errors.Add($"patterns[{i}].id", $"pattern '{NetworkInput.Short(id)}'", id, "is named by no junction (junctions[].pattern); name it or leave it out");

        // Times.
        var assumptions = new List<AssumptionDto>();
        double duration = fields.Required("duration", request.Duration, 0, double.PositiveInfinity, unit: "s");
        double reportStep = Step(fields, "reportStep", request.ReportStep, assumptions, "a report every hour (default)");
        double patternStep = Step(fields, "patternStep", request.PatternStep, assumptions, "each pattern multiplier holds for an hour (default)");
        if (defaultMinimum) assumptions.Add(new("tanks[].minimumLevel", "0", "a tank without minimumLevel is empty at its bottom (default)"));

        // Controls.
        var controls = new List<NetworkControl>();
        var cs = request.Controls ?? [];
        var pipeIds = Ids(request.Pipes, p => p?.Id);
        var pumpIds = Ids(request.Pumps, p => p?.Id);
        var valveIds = Ids(request.Valves, v => v?.Id);
        if (cs.Count > MaximumControls) fields.Add("controls", $"holds {cs.Count} controls; at most {MaximumControls} are accepted");
        else
            for (int i = 0; i < cs.Count; i++)
            {
                string at = $"controls[{i}]";
                var c = cs[i];
                if (c is null) { fields.Add(at, "must be an object {link, set, when}"); continue; }
                string label = $"control {i} on '{NetworkInput.Short(c.Link)}'";
                bool pump = false, ok = true;
                if (string.IsNullOrEmpty(c.Link)) { fields.Add(at + ".link", "is required: the id of a pipe, pump or valve"); ok = false; }
                else if (pumpIds.Contains(c.Link)) pump = true;
                else if (!pipeIds.Contains(c.Link) && !valveIds.Contains(c.Link))
                {
                    errors.Add(at + ".link", label, c.Link, $"'{NetworkInput.Short(c.Link)}' is not the id of a pipe, pump or valve of this network");
                    ok = false;
                }
                var control = errors.Scoped(label, c.Link, e =>
                {
                    var action = Action(e, at + ".set", c.Set, pump, ok);
                    var condition = Condition(e, at + ".when", c.When, tanks, tankAt, duration, u);
                    return action is null || condition is null ? null : new NetworkControl(c.Link ?? "", action, condition);
                });
                if (ok && control is not null) controls.Add(control);
            }

        if (errors.Any || network is null) return null;
        var model = new SimulationModel(network.Model, tanks, patterns, junctionPatterns, controls, duration, reportStep, patternStep);
        var all = network.Assumptions.Where(a => a.Field != "demandMultipliers").Concat(assumptions).ToList();
        return new SimulationInput(network, model, all);
    }

    /// <summary>How many report times a run has (every multiple of the report step from 0 to the duration, and the
    /// duration), counted without building the list, for the 413 before anything is solved; long.MaxValue when it
    /// does not fit.</summary>
    public static long ReportCount(double duration, double reportStep)
    {
        double n = Math.Floor(duration / reportStep);
        if (!(n < long.MaxValue / 2)) return long.MaxValue;
        long count = (long)n + 1;
        return n * reportStep < duration ? count + 1 : count;
    }

    private static double Step(Problems.FieldErrors fields, string field, double? value, List<AssumptionDto> assumptions, string message)
    {
        if (value is null)
        {
            assumptions.Add(new(field, DefaultStep.ToString(C), message));
            return DefaultStep;
        }
        return fields.Required(field, value, MinimumStep, double.PositiveInfinity, unit: "s");
    }

    private static ControlAction? Action(Problems.FieldErrors e, string at, NetworkControlSetInput? set, bool pump, bool linkKnown)
    {
        if (set is null) { e.Add(at, "is required: {\"status\": \"open\"|\"closed\"} or {\"speedRatio\": x}"); return null; }
        if ((set.Status is null) == (set.SpeedRatio is null))
        {
            e.Add(at, "give exactly one of status (open or closed) and speedRatio");
            return null;
        }
        if (set.Status is { } status)
        {
            if (status.Equals("open", StringComparison.OrdinalIgnoreCase)) return new ControlAction(true, null);
            if (status.Equals("closed", StringComparison.OrdinalIgnoreCase)) return new ControlAction(false, null);
            e.Add(at + ".status", $"must be open or closed, not '{NetworkInput.Short(status)}'");
            return null;
        }
        if (linkKnown && !pump) { e.Add(at + ".speedRatio", "applies to pumps only; a pipe or valve is opened or closed with status"); return null; }
        double s = e.Required(at + ".speedRatio", set.SpeedRatio, 0, PumpArrangement.MaximumSpeedRatio);
        return double.IsFinite(s) ? new ControlAction(null, s) : null;
    }

    private static ControlCondition? Condition(Problems.FieldErrors e, string at, NetworkControlWhenInput? when, List<Tank> tanks,
        Dictionary<string, int> tankAt, double duration, PumpUnits u)
    {
        if (when is null) { e.Add(at, "is required: {\"tank\": id, \"levelBelow\": m}, {\"tank\": id, \"levelAbove\": m} or {\"time\": s}"); return null; }
        bool level = when.LevelBelow is not null || when.LevelAbove is not null;
        if (when.Time is not null)
        {
            bool bad = false;
            if (when.Tank is not null) { e.Add(at + ".tank", "is not given with time: a control fires either at a time or on a tank's level"); bad = true; }
            if (level) { e.Add(at + (when.LevelBelow is not null ? ".levelBelow" : ".levelAbove"), "is not given with time: a control fires either at a time or on a tank's level"); bad = true; }
            double end = double.IsFinite(duration) ? duration : double.PositiveInfinity;
            double t = e.Required(at + ".time", when.Time, 0, end, unit: "s");
            return bad || !double.IsFinite(t) ? null : new ControlCondition(null, null, null, t);
        }
        if (!level) { e.Add(at, "give tank with levelBelow or levelAbove, or time"); return null; }
        if (when.LevelBelow is not null && when.LevelAbove is not null) { e.Add(at + ".levelAbove", "give levelBelow or levelAbove, not both (use two controls)"); return null; }
        string field = at + (when.LevelBelow is not null ? ".levelBelow" : ".levelAbove");
        if (string.IsNullOrEmpty(when.Tank)) { e.Add(at + ".tank", "is required with levelBelow or levelAbove: the id of a tank"); return null; }
        if (!tankAt.ContainsKey(when.Tank)) { e.Add(at + ".tank", $"'{NetworkInput.Short(when.Tank)}' is not the id of a tank of this request (tanks[])"); return null; }
        var tank = tanks.FirstOrDefault(t => t.Id == when.Tank);
        string hu = u.HeadUnit;
        double min = tank is null ? 0 : tank.MinimumLevel / u.HeadFactor, max = tank is null ? MaximumTankSize / u.HeadFactor : tank.MaximumLevel / u.HeadFactor;
        double value = e.Required(field, when.LevelBelow ?? when.LevelAbove, min, max, unit: hu);
        if (!double.IsFinite(value) || tank is null) return null;
        double si = Math.Clamp(u.HeadToSi(value), tank.MinimumLevel, tank.MaximumLevel);
        return when.LevelBelow is not null ? new ControlCondition(tank.Id, si, null, null) : new ControlCondition(tank.Id, null, si, null);
    }

    private static HashSet<string> Ids<T>(IReadOnlyList<T>? list, Func<T, string?> id)
    {
        var set = new HashSet<string>(StringComparer.Ordinal);
        foreach (var x in list ?? []) if (id(x) is { Length: > 0 } s) set.Add(s);
        return set;
    }

    private static string Format(FormattableString s) => s.ToString(C);
}
