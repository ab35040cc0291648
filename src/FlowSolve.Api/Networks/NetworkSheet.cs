using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Networks;

/// <summary>
/// The network sheet: the network as understood (nodes and links), the method with its sources, per load case the
/// totals and the tables of pipes, junctions, pumps and reservoirs, the convergence record, a schematic drawn from the
/// node coordinates (when every node has them), the convergence plot, validity, warnings and the cautions.
/// </summary>
public static class NetworkSheet
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>Most rows of one table on the sheet; the JSON answer always holds every element.</summary>
    public const int MaximumTableRows = 2000;

    private const string Name = NetworkSolveCalculation.Calculation;

    public static Sheet Build(NetworkSolveRequest request, NetworkSolveResponse r)
    {
        string qu = r.FlowUnit, hu = r.HeadUnit, vu = r.VelocityUnit;
        var sheet = new Sheet { Title = request.Title is { Length: > 0 } t ? "Pipe network: " + t : "Pipe network", Calculation = Name };

        Inputs(sheet, request, r);
        sheet.Assumptions.AddRange(r.Assumptions);
        Methods(sheet, request, r);
        bool cholesky = r.HeadSolver == "sparse-cholesky";
        bool pressureDriven = r.DemandModel == NetworkInput.PressureDriven;

        for (int c = 0; c < r.Cases.Count; c++)
        {
            var k = r.Cases[c];
            string tag = Tag(c, k);
            string lowest = k.Summary.LowestPressureHead?.Element ?? "no junctions";
            double lowestHead = k.Summary.LowestPressureHead?.Value ?? double.NaN;
            {
                sheet.Results.Add(new($"{tag}: status", k.Status, "", k.Reason));
                sheet.Results.Add(new($"{tag}: total demand", F(k.TotalDemand), qu, "sum of the junction demands times the multiplier"));
                sheet.Results.Add(new($"{tag}: total supply", F(k.TotalSupply), qu, "sum of the reservoirs' net outflows"));
                if (pressureDriven)
                {
                    int shortJunctions = k.Junctions.Count(j => j.DeliveredDemand < j.Demand);
                    sheet.Results.Add(new($"{tag}: total delivered demand", F(k.TotalDeliveredDemand), qu,
                        "sum of what the junctions receive under pressure-driven demand" + Share(k.TotalDeliveredDemand, k.TotalDemand)));
                    sheet.Results.Add(new($"{tag}: demand shortfall", F(k.DemandShortfall), qu,
                        "requested minus delivered, over the junctions" + (r.Detail == "full" ? string.Create(C, $"; {shortJunctions} junction(s) short") : "")));
                }
                sheet.Results.Add(new($"{tag}: lowest pressure head", F(lowestHead), hu, k.Summary.LowestPressureHead is null ? "" : $"at junction '{lowest}'"));
                if (k.Summary.HighestVelocity is { } fastest)
                    sheet.Results.Add(new($"{tag}: highest velocity", F(fastest.Value), vu, $"in pipe '{fastest.Element}'"));
                if (k.Summary.TransitionalPipes > 0)
                    sheet.Results.Add(new($"{tag}: pipes in the transition zone", k.Summary.TransitionalPipes.ToString(C), "", "Reynolds number 2000 to 4000: friction factor by Churchill (1977), as for a single pipe"));
                if (k.Summary.ValveStates is { } vs)
                    sheet.Results.Add(new($"{tag}: control valves", string.Create(C, $"{vs.Active} active, {vs.Open} open, {vs.Closed} closed"), "",
                        "active: holding its setting; open: cannot reach it, acts as a fitting; closed: would pass reverse flow"));
                sheet.Results.Add(new($"{tag}: iterations", k.Iterations.ToString(C), "", $"{k.StatusPasses} status pass(es); converged: {(k.Converged ? "yes" : "no")}"));
            }
            if (r.Detail == "summary")
            {
                sheet.Results.Add(new($"{tag}: element tables", "not listed", "", "the request asked for output.detail summary"));
            }
            else
            {
                string chosenNote = r.Detail == "elements" ? " Only the elements named in output.elements are listed." : "";
                sheet.Tables.Add(Table($"pipes-{c + 1}", $"Pipes, {tag}", ["Pipe", $"Flow ({qu})", $"Velocity ({vu})", $"Head loss ({hu})", "Friction factor f", "Reynolds number", "Status"],
                    k.Pipes.Select(p => new[] { p.Id, F(p.Flow), F(p.Velocity), F(p.HeadLoss), F(p.FrictionFactor), F(p.Reynolds), p.Status }),
                    "Flow is positive from the pipe's 'from' node to its 'to' node; head loss is the head at 'from' minus the head at 'to'." + chosenNote));
                if (pressureDriven)
                    sheet.Tables.Add(Table($"junctions-{c + 1}", $"Junctions, {tag}",
                        ["Junction", $"Head ({hu})", $"Pressure head ({hu})", $"Requested demand ({qu})", $"Delivered ({qu})", "Delivered / requested (%)"],
                        k.Junctions.Select(j => new[] { j.Id, F(j.Head), F(j.PressureHead), F(j.Demand), F(j.DeliveredDemand), Percent(j.DeliveredDemand, j.Demand) }),
                        "Pressure-driven demand: a junction with a positive demand receives demand x ((p - min)/(req - min))^exponent between the minimum and the required pressure head, nothing below, everything above (Wagner, Shamir and Marks 1988); an inflow (negative demand) in full."));
                else
                    sheet.Tables.Add(Table($"junctions-{c + 1}", $"Junctions, {tag}", ["Junction", $"Head ({hu})", $"Pressure head ({hu})", $"Demand ({qu})"],
                        k.Junctions.Select(j => new[] { j.Id, F(j.Head), F(j.PressureHead), F(j.Demand) })));
                if (k.Pumps.Count > 0)
                    sheet.Tables.Add(Table($"pumps-{c + 1}", $"Pumps, {tag}", ["Pump", $"Flow ({qu})", $"Head added ({hu})", "Status"],
                        k.Pumps.Select(p => new[] { p.Id, F(p.Flow), F(p.Head), p.Status })));
                if (k.Valves is { Count: > 0 } valveRows)
                {
                    var given = (request.Valves ?? []).Where(v => v?.Id is not null).GroupBy(v => v!.Id!, StringComparer.Ordinal).ToDictionary(g => g.Key, g => g.First()!, StringComparer.Ordinal);
                    sheet.Tables.Add(Table($"valves-{c + 1}", $"Control valves, {tag}", ["Valve", "Type", "Setting", $"Flow ({qu})", $"Head loss ({hu})", "Status"],
                        valveRows.Select(v => new[] { v.Id, given.TryGetValue(v.Id, out var g) ? g.Type ?? "" : "", given.TryGetValue(v.Id, out var h) ? Setting(h, r) : "", F(v.Flow), F(v.HeadLoss), v.Status }),
                        "Head loss is the head at 'from' minus the head at 'to': the open valve's loss, plus the throttling of an active one; for a closed valve the head held across it. Status: active (holding its setting), open (cannot reach its setting and acts as a fitting), closed (would pass reverse flow)."));
                }
                sheet.Tables.Add(Table($"reservoirs-{c + 1}", $"Reservoirs, {tag}", ["Reservoir", $"Head ({hu})", $"Outflow ({qu})"],
                    k.Reservoirs.Select(x => new[] { x.Id, F(x.Head), F(x.Outflow) })));
            }
            sheet.Tables.Add(Table($"convergence-{c + 1}", $"Convergence record, {tag}",
                ["Iteration", "Status pass", $"Largest flow change ({qu})", $"Largest head imbalance ({hu})", $"Largest continuity error ({qu})", cholesky ? "Triangular solves" : "CG iterations"],
                k.Convergence.Select(t => new[] { t.Iteration.ToString(C), t.StatusPass.ToString(C), E3(t.MaxFlowChange), E3(t.MaxHeadImbalance), E3(t.MaxContinuityError), t.LinearIterations.ToString(C) })));
            foreach (var w in k.Warnings) sheet.Warnings.Add(new WarningDto(w.Code, $"{tag}: {w.Message}"));
        }

        var slowest = r.Cases.MaxBy(k => k.Iterations)!;
        var last = slowest.Convergence.Count > 0 ? slowest.Convergence[^1] : null;
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, last?.MaxHeadImbalance ?? 0,
            $"largest energy imbalance over the open links after the last iteration of the slowest load case, {hu}", slowest.Status, slowest.Reason,
            "every junction head and link flow at once (Newton on the whole network)", [],
            "Each load case's iterations are in its convergence record above; the tolerances are 1e-10 m on every link's energy balance and 1e-10 m3/s on every junction's continuity, or 8 units in the last place of the numbers involved where that is finer than double precision holds.");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.InsertRange(0, r.Warnings);

        if (Schematic(request, r) is { } schematic) sheet.Figures.Add(schematic);
        sheet.Figures.Add(Convergence(r));
        return sheet;
    }

    private static string Tag(int c, NetworkCaseDto k) => string.Create(C, $"case {c + 1} (demands x {k.DemandMultiplier:G6})");

    private static string F(double v) => SheetHtml.Fmt(v);

    /// <summary>delivered / requested in percent, one decimal; a dash where nothing was requested.</summary>
    private static string Percent(double delivered, double requested) =>
        requested == 0 ? "-" : (100 * delivered / requested).ToString("F1", C);

    private static string Share(double delivered, double requested) =>
        requested > 0 ? string.Create(C, $" ({100 * delivered / requested:F1} % of the {F(requested)} requested)") : "";

    private static string E3(double v) => double.IsFinite(v) ? v.ToString("E3", C) : "not finite";

    private static SheetTable Table(string id, string title, string[] columns, IEnumerable<string[]> rows, string note = "", bool inputs = false)
    {
        var all = rows.ToList();
        if (all.Count > MaximumTableRows)
        {
            note = (note.Length > 0 ? note + " " : "") + string.Create(C, $"The first {MaximumTableRows} of {all.Count} rows are shown; the JSON answer holds every row.");
            all = all.Take(MaximumTableRows).ToList();
        }
        return new SheetTable(id, title, columns, all, note, inputs);
    }

    private static void Inputs(Sheet sheet, NetworkSolveRequest q, NetworkSolveResponse r)
    {
        string hu = r.HeadUnit, qu = r.FlowUnit;
        var junctions = q.Junctions ?? [];
        var reservoirs = q.Reservoirs ?? [];
        var pipes = q.Pipes ?? [];
        var pumps = q.Pumps ?? [];
        sheet.Inputs.Add(new("Junctions", junctions.Count.ToString(C), "", "nodes of unknown head"));
        sheet.Inputs.Add(new("Reservoirs", reservoirs.Count.ToString(C), "", "nodes of fixed head"));
        sheet.Inputs.Add(new("Pipes", pipes.Count.ToString(C), "", pipes.Count(p => p.HazenWilliamsC is not null).ToString(C) + " by Hazen-Williams, the rest by Darcy-Weisbach"));
        sheet.Inputs.Add(new("Pumps", pumps.Count.ToString(C), "", ""));
        var valves = q.Valves ?? [];
        if (valves.Count > 0) sheet.Inputs.Add(new("Control valves", valves.Count.ToString(C), "", "pressure-reducing, pressure-sustaining, flow-control or throttle"));
        sheet.Inputs.Add(new("Demand multipliers", string.Join(", ", r.Cases.Select(k => k.DemandMultiplier.ToString("G6", C))), "-",
            q.DemandMultipliers is null ? "default: one load case" : "one load case each"));
        if (q.KinematicViscosity is not null)
            sheet.Inputs.Add(new("Kinematic viscosity nu", F(r.KinematicViscosity), r.Units == "us" ? "ft2/s" : "m2/s", "as given"));
        else
        {
            sheet.Inputs.Add(new("Water temperature", SheetHtml.Fmt(q.Temperature ?? (r.Units == "us" ? 68 : 20)), r.Units == "us" ? "degrees F" : "degrees C",
                q.Temperature is null ? "default fluid" : "as given"));
            sheet.Inputs.Add(new("Kinematic viscosity nu", F(r.KinematicViscosity), r.Units == "us" ? "ft2/s" : "m2/s", "of water at that temperature (IAPWS)"));
        }
        sheet.Inputs.Add(new("Units", r.Units + ", flows in " + qu + ", heads and lengths in " + hu, "", q.Units is null ? "default" : "as given"));
        if (r.DemandModel == NetworkInput.PressureDriven && q.DemandModel is { } dm)
        {
            sheet.Inputs.Add(new("Demand model", "pressure-driven", "", "deliveries limited by pressure (Wagner, Shamir and Marks 1988)"));
            sheet.Inputs.Add(new("Minimum pressure head", SheetHtml.Fmt(dm.MinimumPressureHead ?? 0), hu, dm.MinimumPressureHead is null ? "default: nothing delivered at or below it" : "nothing delivered at or below it"));
            sheet.Inputs.Add(new("Required pressure head", SheetHtml.Fmt(dm.RequiredPressureHead ?? double.NaN), hu, "the whole demand delivered at or above it"));
            sheet.Inputs.Add(new("Exponent", SheetHtml.Fmt(dm.Exponent ?? 0.5), "-", dm.Exponent is null ? "default (an orifice)" : "as given"));
        }
        else sheet.Inputs.Add(new("Demand model", "demand-driven", "", q.DemandModel is null ? "default: every demand delivered whatever the pressure" : "every demand delivered whatever the pressure"));

        var nodes = junctions.Select(j => new[] { j.Id ?? "", "junction", F(j.Elevation ?? double.NaN), "", F(j.Demand ?? 0), Coord(j.X, j.Y) })
            .Concat(reservoirs.Select(x => new[] { x.Id ?? "", "reservoir", "", F(x.Head ?? double.NaN), "", Coord(x.X, x.Y) }));
        sheet.Tables.Add(Table("nodes", "Nodes", ["Node", "Kind", $"Elevation ({hu})", $"Fixed head ({hu})", $"Demand ({qu})", "x, y"], nodes, inputs: true));
        var links = pipes.Select(p => new[]
            {
                p.Id ?? "", p.CheckValve == true ? "pipe, check valve" : p.Closed == true ? "pipe, closed" : "pipe", p.From ?? "", p.To ?? "",
                F(p.Length ?? double.NaN), F(p.Diameter ?? double.NaN),
                p.HazenWilliamsC is double c ? "C " + c.ToString("G6", C) : "e " + F(p.Roughness ?? double.NaN) + " " + hu,
                F(p.MinorLossCoefficient ?? 0),
            })
            .Concat(pumps.Select(p => new[]
            {
                p.Id ?? "", "pump", p.From ?? "", p.To ?? "", "", "", PumpCurve(p), "speed ratio " + (p.SpeedRatio ?? 1).ToString("G6", C),
            }))
            .Concat(valves.Where(v => v is not null).Select(v => new[]
            {
                v.Id ?? "", "valve, " + (v.Type ?? ""), v.From ?? "", v.To ?? "", "", F(v.Diameter ?? double.NaN), "setting " + Setting(v, r),
                F(v.MinorLossCoefficient ?? v.Setting ?? double.NaN),
            }));
        sheet.Tables.Add(Table("links", "Links", ["Link", "Kind", "From", "To", $"Length ({hu})", $"Diameter ({hu})", "Roughness or C; pump curve", "K; pump speed"], links, inputs: true));
    }

    private static string PumpCurve(NetworkPumpInput p)
    {
        if (p.Curve?.Coefficients is { } c) return "H = " + string.Join(" + ", c.Select((v, i) => v.ToString("G6", C) + (i == 0 ? "" : i == 1 ? " Q" : $" Q^{i}")));
        if (p.Curve?.Points is { } pts) return pts.Count.ToString(C) + " catalogue points, " + (p.Curve.CurveDegree ?? "quadratic") + " fit";
        return "";
    }

    /// <summary>A valve's setting with its unit, as given in the request.</summary>
    private static string Setting(NetworkValveInput v, NetworkSolveResponse r)
    {
        string value = F(v.Setting ?? double.NaN);
        return (v.Type ?? "").ToLowerInvariant() switch
        {
            NetworkValveReader.PressureReducing or NetworkValveReader.PressureSustaining => value + " " + r.HeadUnit + " pressure head",
            NetworkValveReader.FlowControl => value + " " + r.FlowUnit,
            _ => "K " + value,
        };
    }

    private static string Coord(double? x, double? y) => x is double a && y is double b ? a.ToString("G6", C) + ", " + b.ToString("G6", C) : "";

    private static void Methods(Sheet sheet, NetworkSolveRequest q, NetworkSolveResponse r)
    {
        var pipes = q.Pipes ?? [];
        sheet.Methods.Add(new("Global gradient algorithm",
            "Newton iteration on energy H_i - H_j = h(Q) for every link and continuity (inflow - outflow = demand) for every junction together; each step solves the Schur complement A21 D^-1 A12 H = b for the junction heads, then the link flows",
            "Todini, E. and Pilati, S. (1988), A gradient algorithm for the analysis of pipe networks, in Computer Applications in Water Supply, vol. 1, Research Studies Press, 1-20 (from memory)"));
        if (r.HeadSolver == "sparse-cholesky")
            sheet.Methods.Add(new("Head equations",
                "direct sparse Cholesky factorisation of the symmetric positive-definite head matrix (supernodal, under a nested-dissection ordering analysed once per network), refactorised each Newton step, with iterative refinement; solved for the head corrections, so the flows keep full precision",
                "Cholesky factorisation; nested dissection: George, A. (1973), SIAM J. Numer. Anal. 10(2), 345-363, from memory"));
        else
            sheet.Methods.Add(new("Head equations",
                "conjugate gradients with an incomplete Cholesky preconditioner on the sparse symmetric positive-definite head matrix",
                "Hestenes and Stiefel (1952); Meijerink and van der Vorst (1977), from memory"));
        if (pipes.Any(p => p.HazenWilliamsC is null))
        {
            sheet.Methods.Add(new("Darcy-Weisbach", "hf = f (L/D) V^2/(2g), hm = K V^2/(2g); V = 4Q/(pi D^2); g = 9.80665 m/s2",
                "Weisbach (1845) and Darcy (1857), from memory; standard gravity, 3rd CGPM (1901)"));
            sheet.Methods.Add(new("Colebrook-White, exact", "1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f))) from Re 4000; 64/Re below 2000; Churchill's interpolation between, as for a single pipe, joined to the neighbouring laws by a cubic (values and slopes matched) within 5 % of each limit so that Newton meets no jump (each such pipe is warned about: transitional-flow)",
                "Colebrook, C. F. (1939), J. Inst. Civ. Eng. 11(4), 133-156; Churchill, S. W. (1977), Chem. Eng. 84(24), 91-92"));
        }
        if (pipes.Any(p => p.HazenWilliamsC is not null))
            sheet.Methods.Add(new("Hazen-Williams", "V = 0.849 C R^0.63 S^0.54 (SI); below 1 mm/s an odd cubic with the same value and slope, so dh/dQ never vanishes",
                "Williams and Hazen (1905), from memory; the low-flow remedy: Elhay and Simpson (2011), J. Hydraul. Eng. 137(10)"));
        if ((q.Pumps ?? []).Count > 0)
            sheet.Methods.Add(new("Pumps", "H_s(Q) = s^2 H(Q/s) for speed ratio s; a pump driven backwards stops, one that cannot lift against the system answers 422", "affinity laws, common practice"));
        if (r.DemandModel == NetworkInput.PressureDriven)
            sheet.Methods.Add(new("Pressure-driven demand",
                "q = d r(p), r = 0 for p <= min, ((p - min)/(req - min))^e between, 1 for p >= req; an inflow in full. Each junction with a positive demand is solved by its position u = s + x along the law's graph (s the scaled pressure, x = q/d), linearised along its tangent as a link to the level z + min on the junction's diagonal of the head equations; after five full steps each Newton step is safeguarded by a backtracking line search; converged only when the exact law and continuity hold at every junction",
                "Wagner, J. M., Shamir, U. and Marks, D. H. (1988), J. Water Resour. Plann. Manage. 114(3), 276-294; gradient formulation: Todini (2003), Giustolisi, Savic and Kapelan (2008), J. Hydraul. Eng. 134(5); one solution: Elhay, Piller, Deuerlein and Simpson (2016), J. Water Resour. Plann. Manage. 142(2); all from memory"));
        if ((q.Valves ?? []).Count > 0)
            sheet.Methods.Add(new("Control valves",
                "open: a fitting, K V^2/(2g) on the valve's bore; active: a pressure-reducing valve holds head - elevation at its 'to' junction at the setting, a pressure-sustaining valve at its 'from' junction, a flow-control valve passes the setting; closed: no flow; a throttle is a fitting of K = setting either way. The held junction leaves the head equations like a reservoir and the valve's flow, by continuity there, enters each Newton step as a rank-one term solved with the same Cholesky factor; the states are re-examined between Newton solves until they settle, and a set of states met before ends the search as not converged (status-cycle)",
                "states and their rules: common practice; the rank-one correction: Sherman and Morrison (1950), Woodbury (1950), from memory"));
        if (pipes.Any(p => p.CheckValve == true))
            sheet.Methods.Add(new("Check valves", "closed under reverse flow, reopened under forward head; statuses re-examined between Newton solves until they settle", "common practice"));
    }

    /// <summary>The network to scale from the node coordinates: pipes as lines (pumps dashed, closed links grey) labelled
    /// with their flow in the design case (the case with multiplier 1, else the first), reservoirs as squares, junctions as
    /// points, and the junction of lowest pressure head marked.</summary>
    private static SheetFigure? Schematic(NetworkSolveRequest q, NetworkSolveResponse r)
    {
        var at = new Dictionary<string, (double X, double Y)>(StringComparer.Ordinal);
        foreach (var j in q.Junctions ?? []) { if (j.X is not double x || j.Y is not double y) return null; at[j.Id!] = (x, y); }
        foreach (var v in q.Reservoirs ?? []) { if (v.X is not double x || v.Y is not double y) return null; at[v.Id!] = (x, y); }
        if (at.Count == 0) return null;
        double xMin = at.Values.Min(p => p.X), xMax = at.Values.Max(p => p.X), yMin = at.Values.Min(p => p.Y), yMax = at.Values.Max(p => p.Y);
        double span = Math.Max(Math.Max(xMax - xMin, yMax - yMin), 1e-9);
        double pad = 0.12 * span;
        var plot = SvgPlot.EqualScale("plot-schematic", "Network schematic", "x", "y", xMin - pad, xMax + pad, yMin - pad, yMax + pad, maxHeight: 560);
        int design = Math.Max(0, r.Cases.ToList().FindIndex(k => k.DemandMultiplier == 1));
        var k = r.Cases[design];
        var pipes = q.Pipes ?? [];
        // The case lists every pipe unless output asked for fewer: then the unlisted ones are drawn without a flow.
        var listedPipes = k.Pipes.ToDictionary(p => p.Id, StringComparer.Ordinal);
        var listedPumps = k.Pumps.ToDictionary(p => p.Id, StringComparer.Ordinal);
        for (int i = 0; i < pipes.Count; i++)
        {
            var p = pipes[i];
            var (a, b) = (at[p.From!], at[p.To!]);
            if (listedPipes.TryGetValue(p.Id!, out var res))
                plot.Segment(p.Id!, a.X, a.Y, b.X, b.Y, p.Id + " " + res.Flow.ToString("G3", C), role: "pipe", grey: res.Status != "open");
            else
                plot.Segment(p.Id!, a.X, a.Y, b.X, b.Y, p.Id!, role: "pipe", grey: p.Closed == true);
        }
        var pumps = q.Pumps ?? [];
        for (int i = 0; i < pumps.Count; i++)
        {
            var p = pumps[i];
            var (a, b) = (at[p.From!], at[p.To!]);
            bool off = listedPumps.TryGetValue(p.Id!, out var pr) ? pr.Status != "open" : (p.SpeedRatio ?? 1) == 0;
            plot.Segment(p.Id!, a.X, a.Y, b.X, b.Y, p.Id + " (pump)", role: "pump", dashed: true, grey: off);
        }
        var listedValves = (k.Valves ?? []).ToDictionary(v => v.Id, StringComparer.Ordinal);
        foreach (var v in q.Valves ?? [])
        {
            if (v?.Id is null || v.From is null || v.To is null || !at.ContainsKey(v.From) || !at.ContainsKey(v.To)) continue;
            var (a, b) = (at[v.From], at[v.To]);
            bool shut = listedValves.TryGetValue(v.Id, out var vr) && vr.Status == "closed";
            plot.Segment(v.Id, a.X, a.Y, b.X, b.Y, v.Id + (vr is null ? " (valve)" : " (valve, " + vr.Status + ")"), role: "valve", dashed: true, grey: shut);
        }
        foreach (var v in q.Reservoirs ?? []) plot.Square(v.Id!, v.X!.Value, v.Y!.Value, v.Id!);
        string? lowest = k.Summary.LowestPressureHead?.Element;
        foreach (var j in q.Junctions ?? [])
        {
            if (j.Id == lowest) continue;
            plot.Marker(j.Id!, j.X!.Value, j.Y!.Value, j.Id!, role: "junction", accent: false);
        }
        if (lowest is not null)
        {
            var j = (q.Junctions ?? []).First(x => x.Id == lowest);
            plot.Marker(lowest, j.X!.Value, j.Y!.Value, lowest, role: "case");
        }
        else
        {
            var v = (q.Reservoirs ?? [])[0];
            plot.Marker(v.Id!, v.X!.Value, v.Y!.Value, "", role: "case");
        }
        return new SheetFigure("schematic", plot.Render(), string.Create(C,
            $"The network drawn from the node coordinates (equal scale); each pipe is labelled with its flow in {r.FlowUnit} in {Tag(design, k)}, positive from its 'from' node to its 'to' node{(r.Detail == "full" ? "" : " (only the pipes the answer lists carry a flow)")}. Squares are reservoirs, dashed lines pumps and control valves (labelled with their state), grey lines closed links; the junction of lowest pressure head is marked in the accent colour."));
    }

    /// <summary>The three convergence measures per iteration on a log scale for the slowest load case, the head
    /// imbalance of every other case beside them, the final iteration marked.</summary>
    private static SheetFigure Convergence(NetworkSolveResponse r)
    {
        int slowest = r.Cases.ToList().FindIndex(k => k.Iterations == r.Iterations);
        var k = r.Cases[slowest];
        const double floor = SheetParts.ResidualFloor;
        double Y(double v) => Math.Max(Math.Abs(v), floor);
        var all = r.Cases.SelectMany(c => c.Convergence).SelectMany(t => new[] { Y(t.MaxFlowChange), Y(t.MaxHeadImbalance), Y(t.MaxContinuityError) }).DefaultIfEmpty(1).ToArray();
        double yMax = Math.Pow(10, Math.Ceiling(Math.Log10(all.Max()) + 0.01));
        double yMin = Math.Pow(10, Math.Floor(Math.Log10(all.Min()) - 0.01));
        if (yMax / yMin < 100) yMin = yMax / 100;
        var plot = new SvgPlot("plot-convergence", "Convergence history", new PlotAxis("iteration", 0.5, Math.Max(1, r.Iterations) + 0.5, Integer: true),
            new PlotAxis($"largest change or error ({r.HeadUnit}, {r.FlowUnit})", yMin, yMax, Log: true), height: 300);
        if (k.Convergence.Count == 0)
        {
            plot.Note("No iterations were needed.");
            return new SheetFigure("convergence", plot.Render(), "No iterations.");
        }
        plot.Curve("largest flow change", k.Convergence.Select(t => ((double)t.Iteration, Y(t.MaxFlowChange))).ToArray(), role: "flow-change");
        plot.Curve("largest head imbalance", k.Convergence.Select(t => ((double)t.Iteration, Y(t.MaxHeadImbalance))).ToArray(), accent: true, role: "head-imbalance");
        plot.Curve("largest continuity error", k.Convergence.Select(t => ((double)t.Iteration, Y(t.MaxContinuityError))).ToArray(), dashed: true, role: "continuity-error");
        for (int c = 0; c < r.Cases.Count; c++)
        {
            if (c == slowest || r.Cases[c].Convergence.Count == 0) continue;
            plot.Curve($"largest head imbalance, {Tag(c, r.Cases[c])}", r.Cases[c].Convergence.Select(t => ((double)t.Iteration, Y(t.MaxHeadImbalance))).ToArray(), dashed: true, role: "other-case");
        }
        var lastRow = k.Convergence[^1];
        plot.Marker("final iteration", lastRow.Iteration, Y(lastRow.MaxHeadImbalance), "final", role: "case");
        return new SheetFigure("convergence", plot.Render(), string.Create(C,
            $"{Tag(slowest, k)}, the slowest load case: the largest flow change (grey), head imbalance (accent) and continuity error (grey, dashed) at each Newton iteration, log scale; other cases' head imbalance dashed. Values below 1e-17 (including exact zeros) are drawn at 1e-17. The tolerances are 1e-10 m and 1e-10 m3/s."));
    }
}
