using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Pumps;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Networks;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Api.Networks;

/// <summary>A validated network request, in SI, ready for the Core.</summary>
/// <remarks>Detail is full, summary or elements (see <see cref="NetworkOutputInput"/>); Chosen holds the ids to list
/// with elements, else null.</remarks>
internal sealed record NetworkProblem(
    PumpUnits Units, NetworkModel Model, double[] Multipliers, string Method, double? WaterCelsius,
    List<AssumptionDto> Assumptions, List<WarningDto> Warnings, string Detail = NetworkInput.FullDetail, HashSet<string>? Chosen = null);

/// <summary>
/// Reads and validates a network request. Every bad field is reported at once under its wire path
/// (<c>pipes[2].length</c>), and each message begins with the element it belongs to by id (<c>pipe 'P3': ...</c>);
/// the ids of the offending elements are listed too. Nothing reaches the Core that its own validation would reject.
/// </summary>
internal static class NetworkInput
{
    public const int MaximumIdLength = 64;
    public const double MaximumMultiplier = 100;
    private const double DefaultTemperature = 20.0;
    public const string FullDetail = "full", SummaryDetail = "summary", ElementsDetail = "elements";
    public const string DemandDriven = "demand-driven", PressureDriven = "pressure-driven";

    /// <summary>The rows of the element tables an answer would list per load case (pipes, pumps, junctions and
    /// reservoirs), read from the raw request before anything is validated or solved: 0 for a summary, the chosen
    /// elements' count when they are given, else every element.</summary>
    public static long ListedElements(NetworkSolveRequest r)
    {
        if (r.Output?.Elements is { } chosen) return chosen.Count;
        if (r.Output?.Detail is string d && d.Equals(SummaryDetail, StringComparison.OrdinalIgnoreCase)) return 0;
        return (long)(r.Pipes?.Count ?? 0) + (r.Pumps?.Count ?? 0) + (r.Junctions?.Count ?? 0) + (r.Reservoirs?.Count ?? 0) + (r.Valves?.Count ?? 0);
    }

    /// <summary>The element ids named by the errors (for the problem's <c>elements</c> list).</summary>
    public sealed class Errors
    {
        public FieldErrors Fields { get; } = new();

        public SortedSet<string> Elements { get; } = new(StringComparer.Ordinal);

        public bool Any => Fields.Any;

        /// <summary>The 400 for these errors: every field with its messages, <c>elements</c> listing the ids named, and
        /// <paramref name="detail"/> saying what the keys are.</summary>
        public Microsoft.AspNetCore.Http.HttpResults.ValidationProblem Problem(string detail)
        {
            var extensions = new Dictionary<string, object?>();
            if (Elements.Count > 0) extensions["elements"] = Elements.ToArray();
            return TypedResults.ValidationProblem(Fields.ToDictionary(), title: "One or more fields are invalid.", detail: detail,
                type: "https://flowsolve.example/problems/invalid-input", extensions: extensions);
        }

        /// <summary>Runs <paramref name="read"/> on a scratch collector and files what it finds under the element's label.</summary>
        public T Scoped<T>(string label, string? id, Func<FieldErrors, T> read)
        {
            var scratch = new FieldErrors();
            T value = read(scratch);
            if (!scratch.Any) return value;
            foreach (var (field, messages) in scratch.ToDictionary())
                foreach (var m in messages) Fields.Add(field, label + ": " + m);
            if (!string.IsNullOrEmpty(id)) Elements.Add(Short(id));
            return value;
        }

        public void Add(string field, string label, string? id, string message)
        {
            Fields.Add(field, label + ": " + message);
            if (!string.IsNullOrEmpty(id)) Elements.Add(Short(id));
        }
    }

    /// <summary>An id as quoted in a message: cut to the longest accepted length.</summary>
    public static string Short(string? id) => id is null ? "" : id.Length <= MaximumIdLength ? id : id[..MaximumIdLength] + "...";

    /// <summary>Reads and validates a network document.</summary>
    /// <param name="request">The document.</param>
    /// <param name="errors">The collector.</param>
    /// <param name="storage">For /v1/networks/simulate: reads the storage tanks (nodes of the document besides the
    /// junctions and reservoirs), given the request's units and the node ids read so far (to which it adds the tanks'),
    /// and gives each as a reservoir at its initial head, so that the links may end at tanks and the Core's backstop
    /// check sees them; junctions may then name a pattern, read by the caller. Null for the steady routes, which
    /// refuse a junction's pattern.</param>
    public static NetworkProblem? Read(NetworkSolveRequest request, Errors errors,
        Func<PumpUnits, Dictionary<string, string>, IReadOnlyList<Reservoir>>? storage = null)
    {
        var fields = errors.Fields;
        var assumptions = new List<AssumptionDto>();
        var warnings = new List<WarningDto>();
        var method = new List<string>
        {
            "global gradient algorithm (Todini and Pilati 1988): Newton iteration on the energy and continuity equations of the whole network, "
                + NetworkDocs.HeadSolverMethod(NetworkSolveCalculation.SolverOptions.LinearSolver)
                + "; converged when every link's energy and every junction's continuity are within 1e-10 m and 1e-10 m3/s, or within what double precision resolves at that element's scale where that is finer",
        };

        // Units first: every other field is read in them.
        bool us = false;
        if (request.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));
        else if (request.Units.Equals("us", StringComparison.OrdinalIgnoreCase)) us = true;
        else if (!request.Units.Equals("si", StringComparison.OrdinalIgnoreCase)) fields.Add("units", "must be si or us");
        var flowUnit = Hosting.FlowUnit.Parse(request.FlowUnit, new Hosting.UnitSystem(us), fields.Add);
        var u = new PumpUnits(us, flowUnit);
        string hu = u.HeadUnit, qu = u.FlowUnit;

        // Fluid: water at a temperature, or a kinematic viscosity.
        double nu = double.NaN;
        double? waterCelsius = null;
        if (request.KinematicViscosity is not null)
        {
            if (request.Temperature is not null)
                fields.Add("temperature", "give either temperature (water) or kinematicViscosity, not both");
            double v = fields.Required("kinematicViscosity", request.KinematicViscosity, 0, double.PositiveInfinity, minExclusive: true, unit: us ? "ft2/s" : "m2/s");
            nu = u.KinematicViscosityToSi(v);
            if (double.IsFinite(v) && !(nu > 0 && double.IsFinite(nu))) fields.Add("kinematicViscosity", "is out of range once converted to SI");
        }
        else
        {
            double t;
            if (request.Temperature is null)
            {
                t = DefaultTemperature;
                assumptions.Add(new("temperature", us ? "68" : "20", "water at 20 degrees C (68 degrees F): IAPWS 2008 viscosity at 1 atm (default fluid)"));
            }
            else if (us) t = u.TemperatureToCelsius(fields.Required("temperature", request.Temperature, 32, 212, unit: "degrees F"));
            else t = fields.Required("temperature", request.Temperature, Water.MinimumTemperature, Water.MaximumTemperature, unit: "degrees C");
            if (double.IsFinite(t))
            {
                t = Math.Clamp(t, Water.MinimumTemperature, Water.MaximumTemperature);
                waterCelsius = t;
                nu = Water.At(t).KinematicViscosity;
                method.Add("water's kinematic viscosity from IAPWS-IF97 density and the IAPWS 2008 viscosity release");
                if (Water.IsAboveAtmosphericBoiling(t))
                    warnings.Add(new("above-boiling-point", "The water temperature is above its boiling point at 1 atm; the properties are those of saturated liquid."));
            }
        }

        if (request.Title is { Length: > 200 }) fields.Add("title", "must be at most 200 characters");

        // Load cases.
        double[] multipliers = [1.0];
        if (request.DemandMultipliers is null) assumptions.Add(new("demandMultipliers", "[1]", "one load case, the demands as given (default)"));
        else if (request.DemandMultipliers.Count == 0) fields.Add("demandMultipliers", "must hold at least one multiplier (or leave it out for [1])");
        else
        {
            multipliers = new double[request.DemandMultipliers.Count];
            for (int i = 0; i < multipliers.Length; i++)
                multipliers[i] = fields.Required($"demandMultipliers[{i}]", request.DemandMultipliers[i], 0, MaximumMultiplier);
        }

        var law = ReadDemandModel(request.DemandModel, u, us, fields, assumptions, method);

        // Nodes.
        var nodeAt = new Dictionary<string, string>(StringComparer.Ordinal); // id -> wire path of its first use
        var junctions = new List<Junction>();
        var reservoirs = new List<Reservoir>();
        var js = request.Junctions ?? [];
        for (int i = 0; i < js.Count; i++)
        {
            string at = $"junctions[{i}]";
            var j = js[i];
            if (j is null) { fields.Add(at, "must be an object {id, elevation, demand}"); continue; }
            string label = $"junction '{Short(j.Id)}'";
            bool idOk = Id(errors, at, label, j.Id, "junction", nodeAt);
            if (storage is null && j.Pattern is not null)
                errors.Add(at + ".pattern", label, j.Id, "a demand pattern belongs to /v1/networks/simulate (demands over time); a steady solve scales demands by demandMultipliers instead");
            var (z, q) = errors.Scoped(label, j.Id, e =>
            {
                double z = u.HeadToSi(e.Required(at + ".elevation", j.Elevation, double.NegativeInfinity, double.PositiveInfinity, unit: hu));
                double q = u.FlowToSi(e.Optional(at + ".demand", j.Demand, double.NegativeInfinity, double.PositiveInfinity, unit: qu) ?? 0);
                if (!double.IsFinite(z) && j.Elevation is double ze && double.IsFinite(ze)) e.Add(at + ".elevation", "is too large once converted to SI");
                if (!double.IsFinite(q)) { if (j.Demand is double qd && double.IsFinite(qd)) e.Add(at + ".demand", "is too large once converted to SI"); }
                Coordinates(e, at, j.X, j.Y);
                return (z, q);
            });
            if (idOk) junctions.Add(new Junction(j.Id!, z, q));
        }
        var rs = request.Reservoirs ?? [];
        for (int i = 0; i < rs.Count; i++)
        {
            string at = $"reservoirs[{i}]";
            var r = rs[i];
            if (r is null) { fields.Add(at, "must be an object {id, head}"); continue; }
            string label = $"reservoir '{Short(r.Id)}'";
            bool idOk = Id(errors, at, label, r.Id, "reservoir", nodeAt);
            double h = errors.Scoped(label, r.Id, e =>
            {
                double h = u.HeadToSi(e.Required(at + ".head", r.Head, double.NegativeInfinity, double.PositiveInfinity, unit: hu));
                if (!double.IsFinite(h) && r.Head is double hr && double.IsFinite(hr)) e.Add(at + ".head", "is too large once converted to SI");
                Coordinates(e, at, r.X, r.Y);
                return h;
            });
            if (idOk) reservoirs.Add(new Reservoir(r.Id!, h));
        }
        var tanks = storage?.Invoke(u, nodeAt) ?? [];
        if (rs.Count == 0 && storage is null) fields.Add("reservoirs", "at least one reservoir (a node of fixed head) is needed: without one the heads are undefined");
        else if (rs.Count == 0 && tanks.Count == 0)
            fields.Add("reservoirs", "at least one reservoir or tank is needed: without a node of known head the heads are undefined");

        // Links.
        var linkAt = new Dictionary<string, string>(StringComparer.Ordinal);
        var pipes = new List<NetworkPipe>();
        var ps = request.Pipes ?? [];
        var pumpsIn = request.Pumps ?? [];
        if (ps.Count == 0 && pumpsIn.Count == 0) fields.Add("pipes", "at least one pipe (or pump) is needed");
        bool hazen = false, darcy = false;
        for (int i = 0; i < ps.Count; i++)
        {
            string at = $"pipes[{i}]";
            var p = ps[i];
            if (p is null) { fields.Add(at, "must be an object {id, from, to, length, diameter, roughness}"); continue; }
            string label = $"pipe '{Short(p.Id)}'";
            bool ok = Id(errors, at, label, p.Id, "link", linkAt);
            ok &= Ends(errors, at, label, p.Id, p.From, p.To, nodeAt);
            var pipe = errors.Scoped(label, p.Id, e =>
            {
                double l = Length(e, at + ".length", p.Length, u, hu);
                double d = Length(e, at + ".diameter", p.Diameter, u, hu);
                double k = e.Optional(at + ".minorLossCoefficient", p.MinorLossCoefficient, 0, double.PositiveInfinity) ?? 0;
                double? c = null;
                double rough = 0;
                if (p.HazenWilliamsC is not null && p.Roughness is not null)
                    e.Add(at + ".hazenWilliamsC", "give either roughness (Darcy-Weisbach) or hazenWilliamsC (Hazen-Williams), not both");
                else if (p.HazenWilliamsC is not null)
                    c = e.Required(at + ".hazenWilliamsC", p.HazenWilliamsC, 0, double.PositiveInfinity, minExclusive: true);
                else if (p.Roughness is null)
                    e.Add(at + ".roughness", "is required (or give hazenWilliamsC for Hazen-Williams)");
                else
                {
                    double eIn = e.Required(at + ".roughness", p.Roughness, 0, double.PositiveInfinity, unit: hu);
                    rough = u.HeadToSi(eIn);
                    if (double.IsFinite(eIn) && double.IsFinite(d) && !(rough < d)) e.Add(at + ".roughness", "must be smaller than the diameter");
                }
                return new NetworkPipe(p.Id ?? "", p.From ?? "", p.To ?? "", l, d, rough, c, k, p.CheckValve == true, p.Closed == true);
            });
            if (ok) { pipes.Add(pipe); if (pipe.HazenWilliamsC is null) darcy = true; else hazen = true; }
        }
        var pumps = new List<NetworkPump>();
        for (int i = 0; i < pumpsIn.Count; i++)
        {
            string at = $"pumps[{i}]";
            var p = pumpsIn[i];
            if (p is null) { fields.Add(at, "must be an object {id, from, to, curve}"); continue; }
            string label = $"pump '{Short(p.Id)}'";
            bool ok = Id(errors, at, label, p.Id, "link", linkAt);
            ok &= Ends(errors, at, label, p.Id, p.From, p.To, nodeAt);
            var pump = errors.Scoped(label, p.Id, e =>
            {
                double s = e.Optional(at + ".speedRatio", p.SpeedRatio, 0, PumpArrangement.MaximumSpeedRatio) ?? 1.0;
                var reading = PumpInputReader.ReadCurve(p.Curve, at + ".curve", u, e, n => n, [], []);
                return reading is null ? null : new NetworkPump(p.Id ?? "", p.From ?? "", p.To ?? "", reading.Curve, s);
            });
            if (ok && pump is not null) pumps.Add(pump);
        }

        var valves = NetworkValveReader.Read(request.Valves, errors, u, nodeAt, linkAt);

        // What the answer lists.
        string detail = FullDetail;
        HashSet<string>? chosen = null;
        if (request.Output is { } output)
        {
            if (output.Detail is string od)
            {
                if (od.Equals(SummaryDetail, StringComparison.OrdinalIgnoreCase)) detail = SummaryDetail;
                else if (!od.Equals(FullDetail, StringComparison.OrdinalIgnoreCase)) fields.Add("output.detail", "must be full or summary");
            }
            if (output.Elements is { } ids)
            {
                if (detail == SummaryDetail)
                    fields.Add("output.elements", "give elements with detail full, or leave detail out: a summary lists no elements");
                else if (ids.Count == 0)
                    fields.Add("output.elements", "must name at least one element (or ask for detail summary)");
                else
                {
                    detail = ElementsDetail;
                    chosen = new HashSet<string>(ids.Count, StringComparer.Ordinal);
                    for (int i = 0; i < ids.Count; i++)
                    {
                        string? id = ids[i];
                        if (string.IsNullOrEmpty(id) || !(nodeAt.ContainsKey(id) || linkAt.ContainsKey(id)))
                            fields.Add($"output.elements[{i}]", $"'{Short(id)}' is not the id of a pipe, pump, valve, junction or reservoir of this network");
                        else if (!chosen.Add(id))
                            fields.Add($"output.elements[{i}]", $"'{Short(id)}' is listed more than once");
                    }
                }
            }
        }

        if (errors.Any || !double.IsFinite(nu)) return null;

        var model = new NetworkModel(junctions, reservoirs, pipes, pumps, nu) { DemandModel = law, Valves = valves };
        // The Core's own checks, as a backstop: they find nothing the reading above let through, but a rule added
        // there must still answer 400 naming the element rather than fail the solve.
        // Tanks stand in as reservoirs at their initial heads, so that links ending at them are checked too.
        var check = tanks.Count == 0 ? model : model with { Reservoirs = [.. reservoirs, .. tanks] };
        foreach (var issue in check.Validate())
            errors.Add(PathOf(request, issue.ElementId), issue.ElementId.Length == 0 ? "network" : $"element '{Short(issue.ElementId)}'", issue.ElementId, issue.Message);
        if (errors.Any) return null;

        if (darcy) method.Add("pipes with roughness by Darcy-Weisbach, hf = f (L/D) V^2/(2g), with the exact Colebrook-White friction factor (1939) from Re 4000, 64/Re below Re 2000 and Churchill's (1977) interpolation between, as for a single pipe (/v1/pipes/...), joined to the neighbouring laws by a cubic within 5 % of each limit so that the head loss has no jump, each such pipe with a transitional-flow warning; minor losses K V^2/(2g); g = 9.80665 m/s2");
        if (hazen) method.Add("pipes with hazenWilliamsC by Hazen-Williams, V = 0.849 C R^0.63 S^0.54 (SI), made linear below 1 mm/s so that its slope never vanishes (Elhay and Simpson 2011)");
        if (pumps.Count > 0) method.Add("pumps by their curves and the affinity laws, H_s(Q) = s^2 H(Q/s); a pump driven backwards stops");
        if (valves.Count > 0) method.Add(NetworkValveReader.Method);
        if (pipes.Any(p => p.CheckValve)) method.Add("check valves close under reverse flow and reopen under forward head, re-examined between Newton solves");
        return new NetworkProblem(u, model, multipliers, string.Join("; ", method), waterCelsius, assumptions, warnings, detail, chosen);
    }

    /// <summary>Reads demandModel: absent or demand-driven, every demand in full (null); pressure-driven, the law of
    /// Wagner, Shamir and Marks (1988) in SI, its defaults echoed in the assumptions. Every bad field is named by its
    /// path (demandModel.requiredPressureHead).</summary>
    private static PressureDrivenDemand? ReadDemandModel(NetworkDemandModelInput? input, PumpUnits u, bool us, FieldErrors fields,
        List<AssumptionDto> assumptions, List<string> method)
    {
        const string at = "demandModel";
        string hu = u.HeadUnit;
        if (input is null)
        {
            assumptions.Add(new(at, DemandDriven, "every junction receives its whole demand whatever its pressure (default); demandModel {\"type\": \"pressure-driven\", ...} lets the pressure limit what a junction receives"));
            return null;
        }
        bool pressureDriven = false;
        if (input.Type is null) fields.Add(at + ".type", "is required: demand-driven or pressure-driven");
        else if (input.Type.Equals(PressureDriven, StringComparison.OrdinalIgnoreCase)) pressureDriven = true;
        else if (!input.Type.Equals(DemandDriven, StringComparison.OrdinalIgnoreCase))
            fields.Add(at + ".type", $"must be demand-driven or pressure-driven, not '{Short(input.Type)}'");
        if (!pressureDriven)
        {
            // Demand-driven takes no parameters: a law's field given with it would be silently ignored, so it is refused.
            if (input.MinimumPressureHead is not null) fields.Add(at + ".minimumPressureHead", "applies only to type pressure-driven");
            if (input.RequiredPressureHead is not null) fields.Add(at + ".requiredPressureHead", "applies only to type pressure-driven");
            if (input.Exponent is not null) fields.Add(at + ".exponent", "applies only to type pressure-driven");
            return null;
        }

        double bound = PressureDrivenDemand.MaximumPressureHead / u.HeadFactor; // in the request's unit
        double min;
        if (input.MinimumPressureHead is null)
        {
            min = 0;
            assumptions.Add(new(at + ".minimumPressureHead", "0", "nothing is delivered at or below atmospheric pressure (default)"));
        }
        else min = fields.Required(at + ".minimumPressureHead", input.MinimumPressureHead, -bound, bound, unit: hu);
        double req = fields.Required(at + ".requiredPressureHead", input.RequiredPressureHead, -bound, bound, unit: hu);
        double e;
        if (input.Exponent is null)
        {
            e = 0.5;
            assumptions.Add(new(at + ".exponent", "0.5", "the orifice exponent of Wagner, Shamir and Marks (1988) (default)"));
        }
        else e = fields.Required(at + ".exponent", input.Exponent, PressureDrivenDemand.MinimumExponent, PressureDrivenDemand.MaximumExponent);
        if (!double.IsFinite(min) || !double.IsFinite(req) || !double.IsFinite(e)) return null;
        double minSi = u.HeadToSi(min), reqSi = u.HeadToSi(req);
        if (!(reqSi - minSi >= PressureDrivenDemand.MinimumBand))
        {
            string band = us
                ? Format($"{PressureDrivenDemand.MinimumBand / Hosting.Units.Foot:G4} ft ({PressureDrivenDemand.MinimumBand} m)")
                : Format($"{PressureDrivenDemand.MinimumBand} m");
            fields.Add(at + ".requiredPressureHead", Format($"must exceed minimumPressureHead ({min:G6} {hu}) by at least {band}: the law needs a band of pressures between nothing and everything"));
            return null;
        }
        method.Add(Format($"pressure-driven demand (Wagner, Shamir and Marks 1988): a junction with a positive demand d receives d ((p - {min:G6})/({req:G6} - {min:G6}))^{e:G6} between pressure heads of {min:G6} and {req:G6} {hu}, nothing below, d above; inflows in full; solved with the network by Newton in each junction's position along the law's graph, the later steps safeguarded by a line search, and judged converged only when the exact law and continuity hold"));
        return new PressureDrivenDemand(minSi, reqSi, e);
    }

    internal static double Length(FieldErrors e, string field, double? value, PumpUnits u, string unit)
    {
        double v = e.Required(field, value, 0, double.PositiveInfinity, minExclusive: true, unit: unit);
        double si = u.HeadToSi(v);
        if (double.IsFinite(v) && !double.IsFinite(si)) e.Add(field, "is too large once converted to SI");
        return si;
    }

    private static void Coordinates(FieldErrors e, string at, double? x, double? y)
    {
        e.Optional(at + ".x", x, double.NegativeInfinity, double.PositiveInfinity);
        e.Optional(at + ".y", y, double.NegativeInfinity, double.PositiveInfinity);
        if ((x is null) != (y is null)) e.Add(at + (x is null ? ".x" : ".y"), "give both x and y for the schematic, or neither");
    }

    /// <summary>Checks an id: present, not too long, unique among the nodes (or the links).</summary>
    internal static bool Id(Errors errors, string at, string label, string? id, string kind, Dictionary<string, string> seen)
    {
        if (string.IsNullOrEmpty(id))
        {
            errors.Fields.Add(at + ".id", $"every {kind} needs an id (1 to {MaximumIdLength} characters)");
            return false;
        }
        if (id.Length > MaximumIdLength)
        {
            errors.Add(at + ".id", label, id, $"the id has {id.Length} characters; at most {MaximumIdLength} are accepted");
            return false;
        }
        if (seen.TryGetValue(id, out var first))
        {
            string what = kind == "link" ? "link (pipe or pump)" : "node (junction or reservoir)";
            errors.Add(at + ".id", label, id, $"duplicate id: '{id}' is already the id of {first}; every {what} needs its own id");
            return false;
        }
        seen[id] = at;
        return true;
    }

    /// <summary>Checks a link's ends: both named nodes, and not the same node.</summary>
    internal static bool Ends(Errors errors, string at, string label, string? id, string? from, string? to, Dictionary<string, string> nodes)
    {
        bool ok = true;
        foreach (var (field, node, end) in new[] { (".from", from, "from"), (".to", to, "to") })
        {
            if (string.IsNullOrEmpty(node)) { errors.Add(at + field, label, id, $"'{end}' is required: the id of a junction or reservoir"); ok = false; }
            else if (!nodes.ContainsKey(node)) { errors.Add(at + field, label, id, $"unknown node: '{Short(node)}' is not the id of a junction or reservoir"); ok = false; }
        }
        if (ok && string.Equals(from, to, StringComparison.Ordinal))
        {
            errors.Add(at + ".to", label, id, $"runs from node '{Short(from)}' to itself; a link joins two different nodes");
            ok = false;
        }
        return ok;
    }

    /// <summary>The wire path of the element with this id (for the Core's backstop issues).</summary>
    private static string PathOf(NetworkSolveRequest r, string id)
    {
        if (id.Length == 0) return "network";
        int k;
        if ((k = Index(r.Junctions, x => x?.Id, id)) >= 0) return $"junctions[{k}]";
        if ((k = Index(r.Reservoirs, x => x?.Id, id)) >= 0) return $"reservoirs[{k}]";
        if ((k = Index(r.Pipes, x => x?.Id, id)) >= 0) return $"pipes[{k}]";
        if ((k = Index(r.Pumps, x => x?.Id, id)) >= 0) return $"pumps[{k}]";
        if ((k = Index(r.Valves, x => x?.Id, id)) >= 0) return $"valves[{k}]";
        return "network";
    }

    private static int Index<T>(IReadOnlyList<T>? list, Func<T, string?> id, string value)
    {
        for (int i = 0; i < (list?.Count ?? 0); i++) if (id(list![i]) == value) return i;
        return -1;
    }

    internal static string Format(FormattableString s) => s.ToString(CultureInfo.InvariantCulture);
}
