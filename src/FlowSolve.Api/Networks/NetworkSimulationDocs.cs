using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Pumps;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Networks;

namespace FlowSolve.Api.Networks;

/// <summary>The extended-period endpoint's OpenAPI description, method text, example and calculation sheet.</summary>
public static class NetworkSimulationDocs
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>The run's cautions, shown in the description, the docs page and the sheet.</summary>
    public const string RunCautions =
        "Tank inflow and outflow are modelled, not water quality, and not surge or water hammer: each instant is a steady " +
        "network solve. Results are engineering estimates to be checked by a qualified engineer; local codes and licensed " +
        "practice govern, and structural design of tanks and mains is out of scope.";

    /// <summary>The method sentence of a run, after the network's own.</summary>
    public static string Method(string integrator, SimulationOptions options) => string.Create(C,
        $"extended-period run: each tank's level L obeys the mass balance A dL/dt = net inflow, the inflow a full network solve at the tanks' heads (elevation + level), integrated by {integrator} with the local error of every level held within {options.LevelTolerance:G6} m per step (the solves inside a step converged as far as the levels need, every reported state to the network's own tolerances); each tank reaching a limit and each level control located in time by Newton's method on the step's interpolant to within {options.EventTimeTolerance:G6} s, and the run restarted from it; a full tank held at its limit with zero net inflow while its links would fill it further (an empty one likewise), released as soon as the net flow turns; pattern multiplier k applies on [k patternStep, (k + 1) patternStep) and repeats; controls in the order given, the later winning on one link at one instant");

    public const string Description =
        "Extended-period run of a network: the network document of /v1/networks/solve (junctions, reservoirs, pipes, pumps, " +
        "valves, fluid, demandModel, units, flowUnit, output) plus tanks, patterns, controls, duration, reportStep and patternStep. " +
        "tanks[] are vertical cylinders {id, elevation (bottom), initialLevel, minimumLevel, maximumLevel (above the bottom), " +
        "diameter}; a tank's head is elevation + level, and links end at it by its id. A full tank takes no more inflow and an " +
        "empty one gives no more outflow: the tank is held at its limit with zero net inflow while its links would push it " +
        "further, and leaves it as soon as the net flow turns. patterns[] are {id, multipliers}, one multiplier per patternStep " +
        "seconds (3600 by default), repeating; a junction's pattern multiplies its demand (multiplier k applies on " +
        "[k patternStep, (k + 1) patternStep)). controls[] are {link, set, when}: set {\"status\": \"open\"|\"closed\"} for a pipe, " +
        "pump or control valve (closed: shut whatever the heads; open: regulating again), or {\"speedRatio\": x} for a pump; when {\"tank\": id, \"levelBelow\": m}, {\"tank\": id, \"levelAbove\": m} or " +
        "{\"time\": s}. Method: between events each level follows dL/dt = net inflow / area, an ordinary differential equation " +
        "whose right side is a full network solve (the global gradient algorithm of /v1/networks/solve, warm-started), " +
        "integrated by an adaptive embedded Runge-Kutta pair with error control; every tank reaching a limit and every level " +
        "control is located in time by Newton's method on the step's interpolant, and the run restarts from that instant; " +
        "pattern steps and time controls are step boundaries. The answer: times (every multiple of reportStep, 3600 s by " +
        "default, from 0 to duration, and duration), reports (per time the pipe, junction, pump, reservoir and valve tables of " +
        "/v1/networks/solve, tanks with id, level, head, inflow and atLimit, totals, extremes, and the network solve's status, " +
        "converged and iterations), events (time, kind tank-full, tank-empty or control, element, change; each once), status " +
        "(completed, network-not-converged, too-many-steps), converged (true only for a completed run whose every solve " +
        "converged), reachedTime, the integration record (integrationSteps, rejectedSteps, networkSolves, largestErrorEstimate), " +
        "method, validity, warnings, elementWarnings (each element and code once, from the first report time it holds) and " +
        "assumptions (the defaults applied, the integration method and its tolerance). Levels and heads are in m (ft with " +
        "units=us), flows in the flow unit, times always in s. Bad input answers 400 naming the field path (controls[2].link for " +
        "an unknown link; a valve ending at a tank; an unknown tank or pattern; a tank connected to nothing or a pattern no junction names; initialLevel " +
        "outside [minimumLevel, maximumLevel]; reportStep or patternStep below 1 s; a pattern without multipliers or with a " +
        "negative one; a junction's pattern sent to /v1/networks/solve). A duration over FlowSolve:Limits:NetworkMaxSimulationDuration " +
        "(604 800 s, 7 days, by default), or more report rows (the elements listed plus the tanks, times the report times) than " +
        "FlowSolve:Limits:NetworkMaxElementCases, or more element states kept by the run (every element, listed or not, times " +
        "the report times) than 10 times that limit, answers 413 naming the limit before anything is solved. A run past the " +
        "request's time budget stops at a step boundary and answers 503 saying how far it got (reachedTime). A run whose " +
        "network solve fails answers 200 with converged false, its status, a not-converged warning and the reports up to " +
        "reachedTime; one that fails before its first report answers 422. format=html gives the sheet: tank levels and pump " +
        "flows and states over time as plots, the events table, and the cautions; format=text is not offered. " +
        RunCautions + "\n\n" + OpenApiSetup.Cautions;

    private static readonly double[] Day =
    [
        0.5, 0.4, 0.4, 0.4, 0.5, 0.8, 1.2, 1.5, 1.4, 1.2, 1.1, 1.0,
        1.0, 1.0, 1.0, 1.1, 1.2, 1.4, 1.5, 1.3, 1.1, 0.9, 0.7, 0.6,
    ];

    /// <summary>The Vandrel Vale demo run (invented: no real place, firm or person): Orvex intake lifts water by the Helm
    /// pump through a rising main to the Kestrel tank on Skarrow Hill, which feeds Quill Square and Mirrow End by gravity;
    /// their demands follow a day's pattern, and the pump stops when the tank is nearly full and starts again when it is
    /// low.</summary>
    public static NetworkSimulationRequest Example { get; } = new(
        Junctions:
        [
            new("helm-out", 58, 0, 0, 0),
            new("quill-square", 70, 0.012, 2400, 300, Pattern: "day"),
            new("mirrow-end", 66, 0.008, 3200, 0, Pattern: "day"),
        ],
        Reservoirs: [new("orvex-intake", 60, -200, 0)],
        Pipes:
        [
            new("rising-main", "helm-out", "kestrel-tank", 2000, 0.25, Roughness: 0.0001, MinorLossCoefficient: 4),
            new("hill-main", "kestrel-tank", "quill-square", 1500, 0.2, Roughness: 0.0001, MinorLossCoefficient: 2),
            new("mirrow-lane", "quill-square", "mirrow-end", 900, 0.15, Roughness: 0.0001),
        ],
        Tanks: [new("kestrel-tank", 100, 3, 0.5, 6, 15, 1600, 600)],
        Patterns: [new("day", Day)],
        Controls:
        [
            new("helm-pump", new NetworkControlSetInput(Status: "closed"), new NetworkControlWhenInput(Tank: "kestrel-tank", LevelAbove: 5.5)),
            new("helm-pump", new NetworkControlSetInput(Status: "open"), new NetworkControlWhenInput(Tank: "kestrel-tank", LevelBelow: 2)),
        ],
        Duration: 86_400,
        ReportStep: 3600,
        PatternStep: 3600,
        Pumps: [new("helm-pump", "orvex-intake", "helm-out", new PumpInput(Coefficients: [70, 0, -7000], MaximumFlow: 0.08))],
        Temperature: 12,
        Title: "Skarrow Hill day, Vandrel Vale (invented for the demo: no real place, firm or person)");

    /// <summary>The run's sheet: the inputs, method, results, tank levels and pump states over time as plots, the tank
    /// table, the events, warnings and the cautions.</summary>
    public static Sheet Sheet(NetworkSimulationRequest request, NetworkSimulationResponse r)
    {
        string hu = r.HeadUnit, qu = r.FlowUnit;
        var sheet = new Sheet
        {
            Title = request.Title is { Length: > 0 } t ? "Extended-period run: " + t : "Extended-period run",
            Calculation = NetworkSimulationCalculation.Calculation,
        };
        sheet.Inputs.Add(new("junctions", (request.Junctions?.Count ?? 0).ToString(C), "", "nodes of unknown head"));
        sheet.Inputs.Add(new("reservoirs", (request.Reservoirs?.Count ?? 0).ToString(C), "", "nodes of fixed head"));
        sheet.Inputs.Add(new("tanks", (request.Tanks?.Count ?? 0).ToString(C), "", "vertical cylinders; head = elevation + level"));
        sheet.Inputs.Add(new("pipes, pumps and valves", ((request.Pipes?.Count ?? 0) + (request.Pumps?.Count ?? 0) + (request.Valves?.Count ?? 0)).ToString(C)));
        sheet.Inputs.Add(new("patterns", (request.Patterns?.Count ?? 0).ToString(C), "", "demand multipliers over time"));
        sheet.Inputs.Add(new("controls", (request.Controls?.Count ?? 0).ToString(C), "", "status or speed changes on a tank level or a time"));
        sheet.Inputs.Add(new("duration", F(r.Duration), "s", F(r.Duration / 3600) + " h"));
        sheet.Inputs.Add(new("report step", F(r.ReportStep), "s"));
        sheet.Inputs.Add(new("pattern step", F(r.PatternStep), "s"));
        sheet.Inputs.Add(new("demand model", r.DemandModel));
        var tankRows = (request.Tanks ?? []).Where(x => x is not null).Select(x => new[]
        {
            x.Id ?? "", F(x.Elevation ?? double.NaN), F(x.InitialLevel ?? double.NaN), F(x.MinimumLevel ?? 0), F(x.MaximumLevel ?? double.NaN), F(x.Diameter ?? double.NaN),
        }).ToList();
        sheet.Tables.Add(new SheetTable("tank-inputs", "Tanks", ["Tank", $"Bottom elevation ({hu})", $"Initial level ({hu})", $"Minimum level ({hu})", $"Maximum level ({hu})", $"Diameter ({hu})"],
            tankRows, "Levels are above the tank's bottom; its head is elevation + level.", true));
        var controlRows = (request.Controls ?? []).Where(x => x is not null).Select(x => new[]
        {
            x.Link ?? "",
            x.Set?.Status ?? (x.Set?.SpeedRatio is double s ? "speedRatio " + F(s) : ""),
            x.When?.Time is double time ? "at t = " + F(time) + " s"
                : x.When?.LevelBelow is double b ? $"level of '{x.When.Tank}' below {F(b)} {hu}"
                : x.When?.LevelAbove is double a ? $"level of '{x.When.Tank}' above {F(a)} {hu}" : "",
        }).ToList();
        if (controlRows.Count > 0)
            sheet.Tables.Add(new SheetTable("control-inputs", "Controls", ["Link", "Set", "When"], controlRows, "In the order given; when two fire at one instant on one link, the later wins.", true));
        sheet.Assumptions.AddRange(r.Assumptions);

        sheet.Methods.Add(new("Mass balance of each tank", "A dL/dt = sum of the inflows of its links, A = pi D^2/4; held at a limit with zero net inflow while its links would push it beyond",
            "continuity; the float-valve rule at a limit: common practice"));
        sheet.Methods.Add(new("Time integration", "adaptive embedded Runge-Kutta pair with error control on every level; events located by Newton's method on the step's interpolant, the run restarted from each",
            "method as named in the answer (" + r.Method.Split("integrated by ", 2).ElementAtOrDefault(1)?.Split(" with", 2)[0] + "); events: Hairer, Norsett and Wanner (1993), Solving ODE I, sec. II.6, from memory"));
        sheet.Methods.Add(new("Network solve at each instant", r.Method.Split("; extended-period run", 2)[0], "see /v1/networks/solve"));

        sheet.Results.Add(new("status", r.Status, "", r.Converged ? "the run reached its duration; every network solve converged" : "see the warnings"));
        sheet.Results.Add(new("reached time", F(r.ReachedTime), "s", "of " + F(r.Duration) + " s"));
        sheet.Results.Add(new("events", r.Events.Count.ToString(C), "", "tanks full or empty, controls fired"));
        sheet.Results.Add(new("integration steps", r.IntegrationSteps.ToString(C), "", string.Create(C, $"{r.RejectedSteps} rejected; {r.NetworkSolves} network solves")));
        sheet.Results.Add(new("largest local error estimate", E3(r.LargestErrorEstimate), hu, "in a tank level, over the accepted steps"));
        foreach (var id in TankIds(r))
        {
            var levels = r.Reports.Select(k => k.Tanks.First(x => x.Id == id).Level).ToArray();
            sheet.Results.Add(new($"tank '{id}' level range", F(levels.Min()) + " to " + F(levels.Max()), hu, "over the report times"));
        }
        sheet.Results.Add(new("scope", "tank levels and flows", "", RunCautions));

        var columns = new List<string> { "Time (s)" };
        var ids = TankIds(r);
        foreach (var id in ids) { columns.Add($"{id} level ({hu})"); columns.Add($"{id} inflow ({qu})"); }
        var pumpIds = r.Reports.Count > 0 ? r.Reports[0].Pumps.Select(p => p.Id).ToArray() : [];
        foreach (var id in pumpIds) columns.Add($"{id} flow ({qu}), status");
        columns.Add("Network solve");
        var rows = new List<string[]>();
        foreach (var k in r.Reports.Take(NetworkSheet.MaximumTableRows))
        {
            var row = new List<string> { F(k.Time) };
            foreach (var id in ids)
            {
                var tank = k.Tanks.First(x => x.Id == id);
                row.Add(F(tank.Level) + (tank.AtLimit is { } limit ? " (" + limit + ")" : ""));
                row.Add(F(tank.Inflow));
            }
            foreach (var id in pumpIds)
                row.Add(k.Pumps.FirstOrDefault(p => p.Id == id) is { Id: not null } p ? F(p.Flow) + ", " + p.Status : "");
            row.Add(string.Create(C, $"{k.Status}, {k.Iterations} iterations"));
            rows.Add([.. row]);
        }
        sheet.Tables.Add(new SheetTable("reports", "Tanks and pumps at each report time", columns, rows,
            r.Reports.Count > NetworkSheet.MaximumTableRows
                ? string.Create(C, $"The first {NetworkSheet.MaximumTableRows} of {r.Reports.Count} report times; the JSON answer holds every one.")
                : "The JSON answer also holds every pipe, junction and reservoir at each time."));
        sheet.Tables.Add(new SheetTable("events", "Events",
            ["Time (s)", "Kind", "Element", "Change", "Newton iterations", $"Level residual ({hu})"],
            r.Events.Take(NetworkSheet.MaximumTableRows).Select(e => new[] { F(e.Time), e.Kind, e.Element, e.Change, e.Iterations.ToString(C), E3(e.LevelResidual) }).ToList(),
            r.Events.Count == 0 ? "No tank reached a limit and no control fired." : "Each event is announced once, when it happens."));

        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.LargestErrorEstimate,
            $"largest embedded estimate of a step's local error in a tank level, {hu}", r.Status,
            r.Converged ? "the run reached its duration" : "the run stopped early (see the warnings)",
            "the tank levels, step by step; at each stage every junction head and link flow at once", [],
            string.Create(C, $"{r.IntegrationSteps} accepted steps, {r.RejectedSteps} rejected, {r.NetworkSolves} network solves; iterations is the largest Newton count of a reported network solve."));
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);
        sheet.Warnings.AddRange(r.ElementWarnings.Select(w => new WarningDto(w.Code, w.Element is null ? w.Message : $"'{w.Element}': {w.Message}")));

        bool hours = r.Duration >= 7200;
        double scale = hours ? 3600 : 1;
        string xLabel = hours ? "time (h)" : "time (s)";
        double xMax = Math.Max(r.Duration, 1) / scale;
        if (ids.Length > 0) sheet.Figures.Add(Levels(request, r, ids, scale, xLabel, xMax));
        if (pumpIds.Length > 0) sheet.Figures.Add(Pumps(r, pumpIds, scale, xLabel, xMax));
        return sheet;
    }

    private static string[] TankIds(NetworkSimulationResponse r) => r.Reports.Count > 0 ? r.Reports[0].Tanks.Select(t => t.Id).ToArray() : [];

    /// <summary>Each tank's level at the report times and at the instants of its events (<see cref="EventLevels"/>), its limits dashed.</summary>
    private static SheetFigure Levels(NetworkSimulationRequest request, NetworkSimulationResponse r, string[] ids, double scale, string xLabel, double xMax)
    {
        var limits = (request.Tanks ?? []).Where(t => t?.Id is not null).GroupBy(t => t.Id!).ToDictionary(g => g.Key, g => g.First());
        double yMin = double.PositiveInfinity, yMax = double.NegativeInfinity;
        foreach (var k in r.Reports)
            foreach (var t in k.Tanks) { yMin = Math.Min(yMin, t.Level); yMax = Math.Max(yMax, t.Level); }
        foreach (var id in ids)
            if (limits.TryGetValue(id, out var t)) { yMin = Math.Min(yMin, t.MinimumLevel ?? 0); yMax = Math.Max(yMax, t.MaximumLevel ?? yMax); }
        if (!(yMax > yMin)) { yMin -= 1; yMax += 1; }
        double pad = 0.05 * (yMax - yMin);
        var plot = new SvgPlot("plot-tank-levels", "Tank levels over time", new PlotAxis(xLabel, 0, xMax),
            new PlotAxis($"level above the bottom ({r.HeadUnit})", yMin - pad, yMax + pad), height: 320);
        for (int i = 0; i < ids.Length; i++)
        {
            string id = ids[i];
            var points = r.Reports.Select(k => (X: k.Time / scale, Y: k.Tanks.First(x => x.Id == id).Level))
                .Concat(EventLevels(request, r, id, limits).Select(p => (X: p.Time / scale, Y: p.Level)))
                .OrderBy(p => p.X).ToArray();
            plot.Curve($"tank '{id}'", points, accent: i == 0, dashed: i > 0, role: "tank-level");
            if (limits.TryGetValue(id, out var t) && ids.Length <= 3)
            {
                plot.HorizontalLine($"'{id}' maximum level", t.MaximumLevel ?? double.NaN, $"'{id}' full");
                plot.HorizontalLine($"'{id}' minimum level", t.MinimumLevel ?? 0, $"'{id}' empty");
            }
        }
        if (r.Reports.Count > 0)
        {
            var end = r.Reports[^1];
            plot.Marker($"tank '{ids[0]}' at the end", end.Time / scale, end.Tanks.First(x => x.Id == ids[0]).Level, "end", role: "case");
        }
        foreach (var e in r.Events.Where(e => e.Kind is "tank-full" or "tank-empty").Take(200))
            if (limits.TryGetValue(e.Element, out var t))
                plot.Marker($"{e.Kind} '{e.Element}'", e.Time / scale, e.Kind == "tank-full" ? t.MaximumLevel ?? 0 : t.MinimumLevel ?? 0, e.Kind, role: "event");
        return new SheetFigure("tank-levels", plot.Render(),
            "Each tank's level at the report times and at the instants of its events (its limit at a tank-full or tank-empty event, the threshold at a control its level fired), first tank solid, others dashed; its full and empty levels as lines, each tank-full or tank-empty event marked at the instant located, and the first tank's level at the end marked. Between those points the line is straight; the level itself follows the mass balance.");
    }

    /// <summary>The level of tank <paramref name="id"/> at the instants of its events, known without the interpolant: its
    /// limit at a tank-full or tank-empty event, the threshold at a control fired by its level (when the event's link and
    /// change name one threshold of that tank).</summary>
    private static IEnumerable<(double Time, double Level)> EventLevels(NetworkSimulationRequest request, NetworkSimulationResponse r,
        string id, IReadOnlyDictionary<string, NetworkTankInput> limits)
    {
        var controls = request.Controls ?? [];
        foreach (var e in r.Events.Take(10_000))
        {
            if (e.Kind is "tank-full" or "tank-empty")
            {
                if (e.Element == id && limits.TryGetValue(id, out var t) && (e.Kind == "tank-full" ? t.MaximumLevel : t.MinimumLevel ?? 0) is double limit)
                    yield return (e.Time, limit);
                continue;
            }
            if (e.Kind != "control") continue;
            var thresholds = controls
                .Where(c => c?.Link == e.Element && c.When?.Tank == id && Describes(c.Set, e.Change))
                .Select(c => c!.When!.LevelBelow ?? c.When!.LevelAbove)
                .Where(v => v is double level && double.IsFinite(level)).Distinct().ToArray();
            if (thresholds is [double only]) yield return (e.Time, only);
        }
    }

    /// <summary>Whether an event's change text is what <paramref name="set"/> does.</summary>
    private static bool Describes(NetworkControlSetInput? set, string change) => set switch
    {
        { SpeedRatio: double s } => change == "speedRatio " + s.ToString("G6", C),
        { Status: { } status } => string.Equals(status, change, StringComparison.OrdinalIgnoreCase),
        _ => false,
    };

    /// <summary>Each pump's flow at the report times, and its state (running 1, off 0) as a step line.</summary>
    private static SheetFigure Pumps(NetworkSimulationResponse r, string[] pumpIds, double scale, string xLabel, double xMax)
    {
        double qMax = 0;
        foreach (var k in r.Reports) foreach (var p in k.Pumps) qMax = Math.Max(qMax, p.Flow);
        if (!(qMax > 0)) qMax = 1;
        var plot = new SvgPlot("plot-pump-states", "Pump flows and states over time", new PlotAxis(xLabel, 0, xMax),
            new PlotAxis($"flow ({r.FlowUnit}); state: running at the top, off at 0", 0, qMax * 1.1), height: 300);
        for (int i = 0; i < pumpIds.Length; i++)
        {
            string id = pumpIds[i];
            var rows = r.Reports.Select(k => (Time: k.Time, Row: k.Pumps.FirstOrDefault(p => p.Id == id))).Where(x => x.Row is not null).ToArray();
            plot.Curve($"pump '{id}' flow", rows.Select(x => (x.Time / scale, x.Row!.Flow)).ToArray(), accent: i == 0, role: "pump-flow");
            if (rows.Length == 0) continue;
            // The state changes at the instants the controls fired (located in time), not at the report times.
            double top = qMax * 1.05;
            double state = rows[0].Row!.Status == "open" ? top : 0;
            var steps = new List<(double, double)> { (rows[0].Time / scale, state) };
            foreach (var e in r.Events.Where(e => e.Kind == "control" && e.Element == id))
            {
                double? next = Running(e.Change) is bool on ? (on ? top : 0)
                    : rows.FirstOrDefault(x => x.Time >= e.Time) is { Row: { } after } ? (after.Status == "open" ? top : 0) : null;
                if (next is not double y || y == state) continue;
                steps.Add((e.Time / scale, state));
                steps.Add((e.Time / scale, y));
                state = y;
            }
            steps.Add((rows[^1].Time / scale, state));
            plot.Curve($"pump '{id}' state", steps, dashed: true, role: "pump-state");
        }
        if (r.Reports.Count > 0 && r.Reports[^1].Pumps.FirstOrDefault(p => p.Id == pumpIds[0]) is { } lastPump)
            plot.Marker($"pump '{pumpIds[0]}' at the end", r.Reports[^1].Time / scale, lastPump.Flow, "end", role: "case");
        foreach (var e in r.Events.Where(e => e.Kind == "control" && pumpIds.Contains(e.Element)).Take(200))
            plot.Marker($"control on '{e.Element}'", e.Time / scale, 0, e.Change, role: "event", accent: false);
        return new SheetFigure("pump-states", plot.Render(),
            "Each pump's flow at the report times (solid) and its state as a step line switching at the instants its controls fired (dashed: at the top while running, at 0 while off); each control that acted on a pump is marked at that instant, labelled with its change, and the first pump's flow at the end marked.");
    }

    /// <summary>Whether a control's change leaves a pump running: closed or a speed ratio of 0 stops it, open or a
    /// positive speed ratio runs it; null for a change not read here.</summary>
    private static bool? Running(string change)
    {
        if (change.StartsWith("closed", StringComparison.OrdinalIgnoreCase)) return false;
        if (change.StartsWith("open", StringComparison.OrdinalIgnoreCase)) return true;
        const string speed = "speedRatio ";
        if (change.StartsWith(speed, StringComparison.OrdinalIgnoreCase)
            && double.TryParse(change.AsSpan(speed.Length).TrimEnd(), NumberStyles.Float, C, out double s)) return s > 0;
        return null;
    }

    private static string F(double v) => SheetHtml.Fmt(v);

    private static string E3(double v) => double.IsFinite(v) ? v.ToString("E3", C) : "not finite";
}
