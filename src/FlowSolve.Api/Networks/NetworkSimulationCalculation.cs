using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Networks;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;

namespace FlowSolve.Api.Networks;

/// <summary>Extended-period runs of a network with tanks, demand patterns and controls: <c>POST /v1/networks/simulate</c>.</summary>
/// <remarks>Like <c>networks/solve</c>, not a row calculation: POST only, no batch or check, format=text answers 400;
/// format=html gives the run's sheet. A run past the request's time budget stops at a step boundary and answers 503
/// saying how far it got.</remarks>
public sealed class NetworkSimulationCalculation : Calculation<NetworkSimulationRequest, NetworkSimulationResponse>
{
    public const string Calculation = "networks/simulate";

    /// <summary>The integrator's accuracy: the Core's defaults, with the network solves of /v1/networks/solve.</summary>
    public static SimulationOptions Options { get; } = new(Network: NetworkSolveCalculation.SolverOptions);

    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>Element states the run may keep per answer row allowed (NetworkMaxElementCases).</summary>
    public const long HeldPerAnswerRow = 10;

    public override CalculationInfo Info { get; } = new(Calculation, "Networks", "NetworkSimulate", "converged",
        "Extended-period run of a network: tank levels, demand patterns and controls over time", NetworkSimulationDocs.Description)
    {
        Text = false,
        Rows = false,
        Options = [],
        Problems = [StatusCodes.Status413PayloadTooLarge, StatusCodes.Status422UnprocessableEntity, StatusCodes.Status503ServiceUnavailable],
    };

    public override NetworkSimulationRequest BodyExample => NetworkSimulationDocs.Example;

    public override Outcome<NetworkSimulationResponse> Solve(NetworkSimulationRequest request, in CalculationContext context) =>
        Solve(request, (context.Services?.GetService<IOptions<FlowSolveOptions>>()?.Value ?? new FlowSolveOptions()).Limits, context.Cancellation);

    public override Sheet Sheet(NetworkSimulationRequest request, NetworkSimulationResponse answer) => NetworkSimulationDocs.Sheet(request, answer);

    public static Outcome<NetworkSimulationResponse> Solve(NetworkSimulationRequest request, FlowSolveOptions.LimitSettings limits,
        CancellationToken cancellation = default)
    {
        if (TooLarge(request, limits) is { } tooLarge) return tooLarge;

        var errors = new NetworkInput.Errors();
        var input = NetworkSimulationReader.Read(request, errors);
        if (errors.Any || input is null) return Invalid(errors);

        // The answer's size: the rows listed (and the tanks) at every report time.
        var model = input.Model;
        long times = NetworkSimulationReader.ReportCount(model.Duration, model.ReportStep);
        long perTime = Math.Max(1, NetworkInput.ListedElements(request.Network()) + model.Tanks.Count);
        long rows = times > long.MaxValue / perTime ? long.MaxValue : times * perTime;
        if (rows > limits.NetworkMaxElementCases)
            return NetworkSolveCalculation.LimitExceeded("The answer would be too large.",
                $"{times} report times (duration {model.Duration} s every reportStep {model.ReportStep} s), each listing {perTime} rows (pipes, pumps, valves, junctions, reservoirs and tanks), make {rows} rows; this service answers at most {limits.NetworkMaxElementCases} (FlowSolve:Limits:NetworkMaxElementCases). Ask for a longer reportStep, output.detail \"summary\" or output.elements with the ids you need.",
                "networkMaxElementCases", limits.NetworkMaxElementCases, rows, "reportStep");

        // What the run itself keeps: every element's state at every report time, whatever the answer lists (a state
        // row is some 40 bytes, an answer row some 150, so it may hold ten times the answer's rows).
        long elements = (long)(request.Pipes?.Count ?? 0) + (request.Pumps?.Count ?? 0) + (request.Valves?.Count ?? 0)
            + (request.Junctions?.Count ?? 0) + (request.Reservoirs?.Count ?? 0) + model.Tanks.Count;
        long held = times > long.MaxValue / Math.Max(1, elements) ? long.MaxValue : times * Math.Max(1, elements);
        long maxHeld = limits.NetworkMaxElementCases > long.MaxValue / HeldPerAnswerRow ? long.MaxValue : limits.NetworkMaxElementCases * HeldPerAnswerRow;
        if (held > maxHeld)
            return NetworkSolveCalculation.LimitExceeded("The run would hold too many states.",
                $"{times} report times of {elements} elements (pipes, pumps, valves, junctions, reservoirs and tanks) make {held} element states, which the run keeps until it answers whatever output lists; this service keeps at most {maxHeld} ({HeldPerAnswerRow} x FlowSolve:Limits:NetworkMaxElementCases). Ask for a longer reportStep or a shorter duration.",
                "networkMaxElementCases", maxHeld, held, "reportStep");

        // The Core's own bound on the report times, whatever the configured row limit.
        if (model.Duration / model.ReportStep > NetworkSimulator.MaximumReports - 2)
            return ProblemResults.BadInput("reportStep", string.Create(C,
                $"gives {times} report times over duration {model.Duration:G6} s; at most {NetworkSimulator.MaximumReports - 1} are reported in one run (lengthen reportStep)"));

        // The Core's own checks, as a backstop: the reading above lets nothing through that they refuse.
        foreach (var issue in NetworkSimulator.Validate(model))
            errors.Add(issue.ElementId.Length == 0 ? "network" : PathOf(request, issue.ElementId),
                issue.ElementId.Length == 0 ? "network" : $"element '{NetworkInput.Short(issue.ElementId)}'", issue.ElementId, issue.Message);
        if (errors.Any) return Invalid(errors);

        SimulationResult result;
        try
        {
            result = NetworkSimulator.Run(model, Options, cancellation);
        }
        catch (ArgumentOutOfRangeException)
        {
            return ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.",
                "The run met values beyond the range of the friction relations or of double precision; check the inputs for a misplaced unit or exponent.",
                new Dictionary<string, object?> { ["networkStatus"] = "not-finite" });
        }
        if (result.Status == SimulationStatus.Cancelled) return OverBudget(result, model, limits);
        if (result.Reports.Count == 0)
            return ProblemResults.NoAnswer("The network could not be solved at the start of the run.",
                $"The run stopped with status {Code(result.Status)} before its first report. Solve the network at time 0 with /v1/networks/solve (the tanks as reservoirs at their initial heads) to see why.",
                new Dictionary<string, object?> { ["simulationStatus"] = Code(result.Status) });
        var answer = Answer(input, result, limits.NetworkWarningsPerCode);
        if (CalculationGuard.Finite.FirstNonFinite(answer) is not null)
            return ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.",
                "The run met values too large for double precision (the inputs are extreme in magnitude); rescale them.",
                new Dictionary<string, object?> { ["networkStatus"] = "not-finite" });
        return answer;
    }

    /// <summary>The answer's code for a run's status.</summary>
    public static string Code(SimulationStatus status) => status switch
    {
        SimulationStatus.Completed => "completed",
        SimulationStatus.NetworkNotConverged => "network-not-converged",
        SimulationStatus.Cancelled => "cancelled",
        _ => "too-many-steps",
    };

    /// <summary>413 before anything is read: a network over the size limit, or a duration over the run limit.</summary>
    private static ProblemHttpResult? TooLarge(NetworkSimulationRequest r, FlowSolveOptions.LimitSettings limits)
    {
        if (NetworkSolveCalculation.SizeOver(r.Junctions, r.Reservoirs, r.Pipes, r.Pumps, limits) is { } size) return size;
        int tanks = r.Tanks?.Count ?? 0;
        int nodes = (r.Junctions?.Count ?? 0) + (r.Reservoirs?.Count ?? 0) + tanks;
        if (nodes > limits.NetworkMaxPipes)
            return NetworkSolveCalculation.LimitExceeded("The network is too large for this service.",
                $"The network has {nodes} nodes (junctions, reservoirs and tanks); this service solves at most {limits.NetworkMaxPipes} (FlowSolve:Limits:NetworkMaxPipes). Split the network or ask the operator to raise the limit.",
                "networkMaxPipes", limits.NetworkMaxPipes, nodes, "tanks");
        double max = limits.NetworkMaxSimulationDuration;
        if (r.Duration is double d && double.IsFinite(d) && d > max)
            return NetworkSolveCalculation.LimitExceeded("The run is too long for this service.",
                $"duration is {d} s; this service runs at most {max} s (FlowSolve:Limits:NetworkMaxSimulationDuration). Run the rest from the levels this run ends with, or ask the operator to raise the limit.",
                "networkMaxSimulationDuration", Whole(max), Whole(d), "duration");
        return null;
    }

    /// <summary>A non-negative number of seconds as a whole number for a problem's figures, long.MaxValue beyond it.</summary>
    private static long Whole(double seconds) => seconds >= 9e18 ? long.MaxValue : (long)Math.Ceiling(Math.Max(seconds, 0));

    private static ValidationProblem Invalid(NetworkInput.Errors errors) =>
        errors.Problem("See errors: each key is a field of the request (the network document, tanks, patterns, controls or the times), each message about an element begins with its id; elements lists their ids.");

    /// <summary>503 for a run stopped by the request's time budget: how far it got.</summary>
    private static ProblemHttpResult OverBudget(SimulationResult result, SimulationModel model, FlowSolveOptions.LimitSettings limits)
    {
        double share = model.Duration > 0 ? result.ReachedTime / model.Duration : 0;
        return TypedResults.Problem(statusCode: StatusCodes.Status503ServiceUnavailable,
            title: "The run ran past its time budget.",
            detail: string.Create(C,
                $"The run stopped at a step boundary at t = {result.ReachedTime:G6} s of a duration of {model.Duration:G6} s ({100 * share:F1} %), after {result.NetworkSolves} network solves and {result.Reports.Count} report times, when the request's time budget of {limits.RequestTimeoutSeconds:G6} s ran out (FlowSolve:Limits:RequestTimeoutSeconds). Shorten the run (or run it in parts, each from the levels the last one ended with), or ask the operator to raise the budget."),
            type: "https://flowsolve.example/problems/time-budget",
            extensions: new Dictionary<string, object?>
            {
                ["limit"] = "requestTimeoutSeconds",
                ["reachedTime"] = result.ReachedTime,
                ["duration"] = model.Duration,
                ["reportsCompleted"] = result.Reports.Count,
                ["networkSolves"] = result.NetworkSolves,
            });
    }

    /// <summary>The answer: one report per report time (the tanks left out of the network tables, where the Core's
    /// solve holds them as reservoirs or junctions), the events, the run's record and the element warnings, each element
    /// and code once at the first time it holds.</summary>
    private static NetworkSimulationResponse Answer(SimulationInput input, SimulationResult result, int warningsPerCode)
    {
        var u = input.Units;
        var network = input.Network;
        var nm = network.Model;
        var model = input.Model;
        var tankIds = new HashSet<string>(model.Tanks.Select(t => t.Id), StringComparer.Ordinal);
        bool all = network.Detail == NetworkInput.FullDetail, none = network.Detail == NetworkInput.SummaryDetail;
        var chosen = network.Chosen;
        bool Listed(string id) => all || (!none && chosen!.Contains(id));
        double nu = nm.KinematicViscosity;

        var validity = new NetworkSolveCalculation.ValidityExtremes();
        var reports = new List<NetworkSimulationReportDto>(result.Reports.Count);
        var times = new List<double>(result.Reports.Count);
        var seen = new HashSet<(string, string)>();
        var elementWarnings = new List<NetworkWarningDto>();
        int iterations = 0;
        bool allConverged = true;
        string? firstFailure = null;
        foreach (var report in result.Reports)
        {
            var r = report.Network;
            times.Add(report.Time);
            iterations = Math.Max(iterations, r.Iterations);
            if (!r.Converged)
            {
                allConverged = false;
                firstFailure ??= string.Create(C, $"the network solve at t = {report.Time:G6} s ended with status {r.Status.Code()}: {r.Status.Reason()}");
            }
            validity.Add(nm, r);

            var t = NetworkSolveCalculation.Tables(nm, r, u, Listed, all, tankIds);
            var tanks = new List<NetworkTankResultDto>(report.Tanks.Count);
            double tankInflow = 0;
            foreach (var tank in report.Tanks)
            {
                tankInflow += tank.Inflow;
                tanks.Add(new(tank.Id, u.Head(tank.Level), u.Head(tank.Head), u.Flow(tank.Inflow), tank.AtLimit));
            }
            reports.Add(new NetworkSimulationReportDto(report.Time, r.Status.Code(), r.Converged, r.Iterations, t.Pipes, t.Junctions, t.Pumps,
                t.Reservoirs, tanks, u.Flow(t.Demand), u.Flow(t.Supply), u.Flow(tankInflow), t.Summary, t.Valves));

            foreach (var w in r.Warnings)
            {
                if (tankIds.Contains(w.ElementId)) continue; // a tank held as a node of the solve: its state is in tanks
                var d = w.Describe(NetworkSolveCalculation.SolverOptions);
                if (!seen.Add((d.Code, w.ElementId))) continue;
                elementWarnings.Add(new NetworkWarningDto(d.Code, string.Create(C, $"From t = {report.Time:G6} s: {d.Message}"),
                    w.ElementId.Length == 0 ? null : w.ElementId));
            }
        }

        var warnings = new List<WarningDto>(network.Warnings);
        bool converged = result.Status == SimulationStatus.Completed && allConverged;
        if (!converged)
        {
            string why = result.Status switch
            {
                SimulationStatus.NetworkNotConverged => "a network solve did not converge" + (firstFailure is null ? "" : " (" + firstFailure + ")"),
                SimulationStatus.TooManySteps => string.Create(C, $"the integrator reached its limit of {Options.MaxSteps} steps"),
                _ => firstFailure ?? "a network solve did not converge",
            };
            // The last event before the stop is often the cause (a tank held empty that leaves junctions without a supply).
            string cause = result.Events.LastOrDefault(e => e.Time <= result.ReachedTime) is { Kind.Length: > 0 } last
                ? string.Create(C, $" The last event before it: {last.Kind} of '{last.ElementId}' at t = {last.Time:G6} s ({last.Change}).")
                : "";
            warnings.Add(new("not-converged", string.Create(C,
                $"The run did not complete: {why}. It has an answer up to t = {result.ReachedTime:G6} s of {model.Duration:G6} s; do not use it for design.") + cause));
        }
        int rejected = 0;
        double largestError = 0;
        foreach (var s in result.Steps)
        {
            rejected += s.Rejected;
            largestError = Math.Max(largestError, s.ErrorEstimate);
        }
        var events = result.Events.Select(e => new NetworkSimulationEventDto(e.Time, e.Kind, e.ElementId, e.Change, e.Iterations, u.Head(e.TimeResidual))).ToArray();
        var assumptions = new List<AssumptionDto>(input.Assumptions)
        {
            new("integration", string.Create(C, $"{Options.LevelTolerance:G6} m"), string.Create(C,
                $"{result.Method}: local error in every tank level held within {Options.LevelTolerance:G6} m per step, the network solves inside a step converged as far as the levels need (what they leave moves no level by more than a tenth of that over the step), every reported state to the network's own tolerances; event times located to within {Options.EventTimeTolerance:G6} s (the service's settings)")),
        };
        return new NetworkSimulationResponse(times, reports, events, Code(result.Status), converged, result.ReachedTime,
            model.Duration, model.ReportStep, model.PatternStep, iterations, result.Steps.Count, rejected, result.NetworkSolves,
            u.Head(largestError), network.Method + "; " + NetworkSimulationDocs.Method(result.Method, Options),
            u.Code, u.FlowUnit, u.HeadUnit, u.IsUs ? "ft/s" : "m/s", u.IsUs ? nu / (Units.Foot * Units.Foot) : nu,
            validity.Report(network), warnings, CapPerCode(elementWarnings, warningsPerCode),
            assumptions, NetworkDocs.HeadSolverCode(NetworkSolveCalculation.SolverOptions.LinearSolver), network.Detail,
            nm.DemandModel is null ? NetworkInput.DemandDriven : NetworkInput.PressureDriven);
    }

    /// <summary>At most <paramref name="cap"/> warnings of each code, then one summary of that code counting the rest.</summary>
    private static List<NetworkWarningDto> CapPerCode(List<NetworkWarningDto> warnings, int cap)
    {
        if (cap <= 0 || warnings.Count <= cap) return warnings;
        var total = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var w in warnings) total[w.Code] = total.GetValueOrDefault(w.Code) + 1;
        var seen = new Dictionary<string, int>(StringComparer.Ordinal);
        var kept = new List<NetworkWarningDto>();
        foreach (var w in warnings)
        {
            int k = seen[w.Code] = seen.GetValueOrDefault(w.Code) + 1;
            if (k <= cap) kept.Add(w);
            else if (k == cap + 1)
            {
                int more = total[w.Code] - cap;
                kept.Add(new NetworkWarningDto(w.Code, string.Create(C,
                    $"{more} more element(s) have this warning ({w.Code}) during the run, {total[w.Code]} in all; only the first {cap} are listed (FlowSolve:Limits:NetworkWarningsPerCode). The report tables carry every value."),
                    null, more));
            }
        }
        return kept;
    }

    /// <summary>The wire path of the element with this id (for the Core's backstop issues).</summary>
    private static string PathOf(NetworkSimulationRequest r, string id)
    {
        static int Index<T>(IReadOnlyList<T>? list, Func<T, string?> key, string value)
        {
            for (int i = 0; i < (list?.Count ?? 0); i++) if (key(list![i]) == value) return i;
            return -1;
        }
        int k;
        if ((k = Index(r.Tanks, x => x?.Id, id)) >= 0) return $"tanks[{k}]";
        if ((k = Index(r.Patterns, x => x?.Id, id)) >= 0) return $"patterns[{k}]";
        if ((k = Index(r.Junctions, x => x?.Id, id)) >= 0) return $"junctions[{k}]";
        if ((k = Index(r.Reservoirs, x => x?.Id, id)) >= 0) return $"reservoirs[{k}]";
        if ((k = Index(r.Pipes, x => x?.Id, id)) >= 0) return $"pipes[{k}]";
        if ((k = Index(r.Pumps, x => x?.Id, id)) >= 0) return $"pumps[{k}]";
        if ((k = Index(r.Valves, x => x?.Id, id)) >= 0) return $"valves[{k}]";
        if ((k = Index(r.Controls, x => x?.Link, id)) >= 0) return $"controls[{k}]";
        return "network";
    }
}
