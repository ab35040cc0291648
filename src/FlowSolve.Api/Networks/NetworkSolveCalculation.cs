using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Api.Pumps;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;

namespace FlowSolve.Api.Networks;

/// <summary>Looped pipe networks: <c>POST /v1/networks/solve</c>.</summary>
/// <remarks>Not a row calculation: there is no GET form, no batch and no check (a network answer is tables, not one
/// value per row), and format=text answers 400 naming <c>format</c>; format=html gives the calculation sheet.</remarks>
public sealed class NetworkSolveCalculation : Calculation<NetworkSolveRequest, NetworkSolveResponse>
{
    public const string Calculation = "networks/solve";

    /// <summary>The solver's options: the Core's defaults (the sparse Cholesky head solve); the method text and the
    /// answer's headSolver are read from them, so they name what ran.</summary>
    public static NetworkOptions SolverOptions { get; } = NetworkOptions.Default;

    public override CalculationInfo Info { get; } = new(Calculation, "Networks", "NetworkSolve", "converged",
        "Steady flows and heads of a looped pipe network, for one or more load cases", NetworkDocs.Solve)
    {
        Text = false,
        Rows = false,
        Options = [],
        Problems = [StatusCodes.Status413PayloadTooLarge, StatusCodes.Status422UnprocessableEntity],
    };

    public override NetworkSolveRequest BodyExample => NetworkDocs.Example;

    public override Outcome<NetworkSolveResponse> Solve(NetworkSolveRequest request, in CalculationContext context) =>
        Solve(request, (context.Services?.GetService<IOptions<FlowSolveOptions>>()?.Value ?? new FlowSolveOptions()).Limits, context.Cancellation);

    public override Sheet Sheet(NetworkSolveRequest request, NetworkSolveResponse answer) => NetworkSheet.Build(request, answer);

    public static Outcome<NetworkSolveResponse> Solve(
        NetworkSolveRequest request, FlowSolveOptions.LimitSettings limits, CancellationToken cancellation = default)
    {
        if (TooLarge(request, limits) is { } tooLarge) return tooLarge;

        var errors = new NetworkInput.Errors();
        var input = NetworkInput.Read(request, errors);
        if (errors.Any || input is null)
            return errors.Problem("See errors: each key is a field of the network document, each message begins with the element it belongs to; elements lists their ids.");

        // Each load case is solved, turned into its answer (only the rows asked for) and let go before the next, so a
        // request holds one case's full result at a time beside the answer it is building.
        int n = input.Multipliers.Length;
        var cases = new NetworkCaseDto[n];
        var validity = new ValidityExtremes();
        var trouble = new Trouble();
        int iterations = 0;
        bool converged = true;
        try
        {
            var solver = new NetworkSolver(input.Model, SolverOptions);
            for (int i = 0; i < n; i++)
            {
                // A request over its time budget stops between load cases (the timeout middleware answers 503).
                cancellation.ThrowIfCancellationRequested();
                var result = solver.SolveCase(input.Multipliers[i]);
                if (result.Status == NetworkStatus.NoPathToFixedHead) return NoPath(result); // the same for every case
                iterations = Math.Max(iterations, result.Iterations);
                converged &= result.Converged;
                trouble.Add(result);
                if (trouble.Any) continue; // the answer will be a 422: no case tables needed
                validity.Add(input.Model, result);
                cases[i] = Case(input, result, i, limits.NetworkWarningsPerCode);
            }
        }
        catch (ArgumentOutOfRangeException)
        {
            // A backstop only: the Core reports flows beyond the friction relations as NetworkStatus.FlowsOutOfRange.
            return OutOfRange(FlowsOutOfRangeDetail);
        }

        if (NoAnswer(input, trouble) is { } none) return none;
        var u = input.Units;
        double nu = input.Model.KinematicViscosity;
        var response = new NetworkSolveResponse(cases, iterations, converged, input.Method,
            u.Code, u.FlowUnit, u.HeadUnit, u.IsUs ? "ft/s" : "m/s", u.IsUs ? nu / (Units.Foot * Units.Foot) : nu,
            validity.Report(input), input.Warnings, input.Assumptions,
            NetworkDocs.HeadSolverCode(SolverOptions.LinearSolver), input.Detail,
            input.Model.DemandModel is null ? NetworkInput.DemandDriven : NetworkInput.PressureDriven);
        if (!Finite(response)) return OutOfRange("The solve met values too large for double precision (the inputs are extreme in magnitude); rescale them.");
        return response;
    }

    private static ProblemHttpResult? TooLarge(NetworkSolveRequest r, FlowSolveOptions.LimitSettings limits)
    {
        if (SizeOver(r.Junctions, r.Reservoirs, r.Pipes, r.Pumps, limits) is { } size) return size;
        int cases = r.DemandMultipliers?.Count ?? 1;
        int maxCases = limits.NetworkMaxDemandMultipliers;
        if (cases > maxCases)
            return LimitExceeded("Too many load cases.",
                $"demandMultipliers holds {cases} load cases; this service solves at most {maxCases} in one request (FlowSolve:Limits:NetworkMaxDemandMultipliers). Send the rest in further requests.",
                "networkMaxDemandMultipliers", maxCases, cases, "demandMultipliers");
        long rows = NetworkInput.ListedElements(r) * Math.Max(cases, 1);
        long maxRows = limits.NetworkMaxElementCases;
        if (rows > maxRows)
            return LimitExceeded("The answer would be too large.",
                $"Listing {NetworkInput.ListedElements(r)} elements (pipes, pumps, junctions and reservoirs) in each of {Math.Max(cases, 1)} load cases makes {rows} rows; this service answers at most {maxRows} (FlowSolve:Limits:NetworkMaxElementCases). Ask for output.detail \"summary\" (totals and extremes per load case), or output.elements with the ids you need, or fewer load cases per request.",
                "networkMaxElementCases", maxRows, rows, "output");
        return null;
    }

    /// <summary>413 for a configured network limit: which limit, its maximum, what the request asked for, and the field.</summary>
    /// <summary>413 for a network with more links (pipes and pumps) or nodes (junctions and reservoirs) than
    /// FlowSolve:Limits:NetworkMaxPipes, or null; every route that takes a network document checks it first.</summary>
    internal static ProblemHttpResult? SizeOver<TJunction, TReservoir, TPipe, TPump>(IReadOnlyList<TJunction>? junctions,
        IReadOnlyList<TReservoir>? reservoirs, IReadOnlyList<TPipe>? pipes, IReadOnlyList<TPump>? pumps, FlowSolveOptions.LimitSettings limits)
    {
        int links = (pipes?.Count ?? 0) + (pumps?.Count ?? 0);
        int nodes = (junctions?.Count ?? 0) + (reservoirs?.Count ?? 0);
        int max = limits.NetworkMaxPipes;
        if (links <= max && nodes <= max) return null;
        bool l = links > max;
        return LimitExceeded("The network is too large for this service.",
            $"The network has {(l ? links : nodes)} {(l ? "links (pipes and pumps)" : "nodes (junctions and reservoirs)")}; this service solves at most {max} (FlowSolve:Limits:NetworkMaxPipes). Split the network or ask the operator to raise the limit.",
            "networkMaxPipes", max, l ? links : nodes, l ? "pipes" : "junctions");
    }

    /// <summary>A 413 problem naming the limit, its maximum, what was given and the field.</summary>
    internal static ProblemHttpResult LimitExceeded(string title, FormattableString detail, string limit, long maximum, long given, string field) =>
        TypedResults.Problem(statusCode: StatusCodes.Status413PayloadTooLarge, title: title,
            detail: FormattableString.Invariant(detail),
            type: "https://flowsolve.example/problems/limit-exceeded",
            extensions: new Dictionary<string, object?> { ["limit"] = limit, ["maximum"] = maximum, ["given"] = given, ["field"] = field });

    /// <summary>The load cases without a physical answer, gathered while solving (small: ids and figures only).</summary>
    private sealed class Trouble
    {
        public List<(double Multiplier, (string Id, double Head)[] Pumps)> Lift { get; } = [];
        public double? LinearSolveFailed { get; private set; }
        public double? FlowsOutOfRange { get; private set; }
        public bool Any => Lift.Count > 0 || LinearSolveFailed is not null || FlowsOutOfRange is not null;

        public void Add(NetworkResult r)
        {
            if (r.Status == NetworkStatus.PumpCannotLift)
                Lift.Add((r.DemandMultiplier, r.PumpsUnableToLift.Select(id => (id, r.Pump(id).Head)).ToArray()));
            else if (r.Status == NetworkStatus.LinearSolveFailed) LinearSolveFailed ??= r.DemandMultiplier;
            else if (r.Status == NetworkStatus.FlowsOutOfRange) FlowsOutOfRange ??= r.DemandMultiplier;
        }
    }

    /// <summary>422 for a part of the network without a path to a fixed head.</summary>
    private static ProblemHttpResult NoPath(NetworkResult first)
    {
        var ids = first.UnsuppliedJunctions;
        string list = string.Join(", ", ids.Take(10).Select(i => "'" + i + "'")) + (ids.Count > 10 ? $" and {ids.Count - 10} more" : "");
        return ProblemResults.NoAnswer("Part of the network has no path to a fixed head.",
            $"Junctions {list} are not connected to any reservoir through pipes or pumps, so their heads are undefined. Connect that part to a reservoir, or remove it.",
            new Dictionary<string, object?> { ["networkStatus"] = first.Status.Code(), ["unsuppliedJunctions"] = ids.ToArray() });
    }

    /// <summary>422 for a network with no physical answer: a pump that cannot lift, or head equations that cannot be
    /// solved, or flows beyond the friction relations.</summary>
    private static ProblemHttpResult? NoAnswer(NetworkProblem input, Trouble trouble)
    {
        if (trouble.Lift.Count > 0)
        {
            var u = input.Units;
            var cases = trouble.Lift.Select(r => new Dictionary<string, object?>
            {
                ["demandMultiplier"] = r.Multiplier,
                ["pumps"] = r.Pumps.Select(p => new Dictionary<string, object?>
                {
                    ["id"] = p.Id,
                    ["headAcross"] = FiniteOrNull(u.Head(p.Head)),
                }).ToArray(),
            }).ToArray();
            var r0 = trouble.Lift[0];
            var (id0, head0) = r0.Pumps[0];
            string detail = string.Create(CultureInfo.InvariantCulture,
                $"Pump '{id0}' cannot lift against the system at demand multiplier {r0.Multiplier:G6}: the head of {u.Head(head0):G6} {u.HeadUnit} across it exceeds its shut-off head at its speed, so it would deliver nothing.")
                + (trouble.Lift.Sum(r => r.Pumps.Length) > 1 ? " Other pumps or load cases are affected too (see cases)." : "")
                + " Raise its speed or choose a larger pump, or lower the delivery head.";
            return ProblemResults.NoAnswer("A pump cannot lift against the system.", detail,
                new Dictionary<string, object?> { ["networkStatus"] = NetworkStatus.PumpCannotLift.Code(), ["headUnit"] = u.HeadUnit, ["cases"] = cases });
        }
        if (trouble.LinearSolveFailed is double failed)
            return ProblemResults.NoAnswer("The head equations could not be solved.",
                string.Create(CultureInfo.InvariantCulture,
                    $"At demand multiplier {failed:G6} the head equations met a non-finite value or could not be solved. Check for pipes whose sizes differ by many orders of magnitude, or extreme demands."),
                new Dictionary<string, object?> { ["networkStatus"] = NetworkStatus.LinearSolveFailed.Code() });
        if (trouble.FlowsOutOfRange is double outside)
            return ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.",
                string.Create(CultureInfo.InvariantCulture, $"At demand multiplier {outside:G6}: ") + FlowsOutOfRangeDetail,
                new Dictionary<string, object?> { ["networkStatus"] = NetworkStatus.FlowsOutOfRange.Code() });
        return null;
    }

    private const string FlowsOutOfRangeDetail = "The Newton iteration reached flows beyond the range of the friction relations (Reynolds number above 1e15). Check the demands, pump curves, diameters and viscosity for a misplaced unit or exponent.";

    private static ProblemHttpResult OutOfRange(string detail) =>
        ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.", detail,
            new Dictionary<string, object?> { ["networkStatus"] = "not-finite" });

    private static double? FiniteOrNull(double v) => double.IsFinite(v) ? v : null;

    /// <summary>One load case's answer: the rows asked for (all, none, or the chosen elements), the extremes over every
    /// element, the convergence record and the warnings.</summary>
    private static NetworkCaseDto Case(NetworkProblem input, NetworkResult r, int c, int warningsPerCode)
    {
        var u = input.Units;
        var model = input.Model;
        bool all = input.Detail == NetworkInput.FullDetail, none = input.Detail == NetworkInput.SummaryDetail;
        var chosen = input.Chosen;
        bool Listed(string id) => all || (!none && chosen!.Contains(id));

        var t = Tables(model, r, u, Listed, all);
        var record = r.Record.Select(t => new NetworkIterationDto(t.Iteration, t.StatusPass, u.Flow(t.MaxFlowChange),
            u.Head(t.MaxHeadImbalance), u.Flow(t.MaxContinuityError), t.LinearIterations)).ToArray();
        var warnings = new List<NetworkWarningDto>();
        if (!r.Converged)
            warnings.Add(new("not-converged", $"Load case {c + 1} (demand multiplier {r.DemandMultiplier.ToString("G6", CultureInfo.InvariantCulture)}) did not converge: {r.Status.Reason()}. The last iterate is reported; do not use it for design.", null));
        // A warning about the whole case (demand-shortfall) has no element.
        warnings.AddRange(r.Warnings.Select(w => { var d = w.Describe(SolverOptions); return new NetworkWarningDto(d.Code, d.Message, w.ElementId.Length == 0 ? null : w.ElementId); }));
        return new NetworkCaseDto(r.DemandMultiplier, r.Status.Code(), r.Status.Reason(), r.Converged, r.Iterations, r.StatusPasses,
            t.Pipes, t.Junctions, t.Pumps, t.Reservoirs, u.Flow(r.TotalDemand), u.Flow(r.TotalSupply),
            u.Flow(r.TotalDeliveredDemand), u.Flow(r.DemandShortfall), record,
            CapPerCode(warnings, warningsPerCode, c + 1), t.Summary, t.Valves);
    }

    /// <summary>The tables of one network solve as an answer carries them: the rows of the elements listed, the extremes
    /// and counts over every element, and the totals of demand and supply.</summary>
    /// <param name="model">The network solved.</param>
    /// <param name="r">Its result.</param>
    /// <param name="u">The units of the answer.</param>
    /// <param name="listed">Whether an element's row is written.</param>
    /// <param name="all">Every row is written (the lists are sized for them).</param>
    /// <param name="skip">Nodes that are not junctions or reservoirs of the answer (the tanks of a run, which the solve
    /// holds as either): left out of the rows, the extremes and the totals; null for none.</param>
    internal static NetworkTables Tables(NetworkModel model, NetworkResult r, PumpUnits u, Func<string, bool> listed, bool all,
        IReadOnlySet<string>? skip = null)
    {
        double nu = model.KinematicViscosity;
        var friction = SolverOptions.Friction;
        var pipes = new List<NetworkPipeResultDto>(all ? r.Pipes.Count : 0);
        NetworkExtremeDto? fastest = null;
        int transitional = 0, closed = 0;
        double vMax = -1;
        for (int i = 0; i < r.Pipes.Count; i++)
        {
            var p = r.Pipes[i];
            if (p.Status != LinkStatus.Open) closed++;
            double speed = Math.Abs(p.Velocity);
            if (speed > vMax) { vMax = speed; fastest = new NetworkExtremeDto(p.Id, u.Head(speed)); }
            double re = speed * model.Pipes[i].Diameter / nu;
            if (model.Pipes[i].HazenWilliamsC is null && p.Status == LinkStatus.Open && p.Flow != 0
                && re >= friction.LaminarLimit && re < friction.TurbulentLimit) transitional++;
            if (listed(p.Id)) pipes.Add(new(p.Id, u.Flow(p.Flow), u.Head(p.Velocity), u.Head(p.HeadLoss), p.FrictionFactor, re, p.Status.Code()));
        }
        var junctions = new List<NetworkJunctionResultDto>(all ? r.Junctions.Count : 0);
        NetworkExtremeDto? lowest = null, highest = null;
        double pMin = double.PositiveInfinity, pMax = double.NegativeInfinity, demand = 0, supply = 0;
        foreach (var j in r.Junctions)
        {
            if (skip is not null && skip.Contains(j.Id)) continue;
            demand += j.Demand;
            if (j.PressureHead < pMin) { pMin = j.PressureHead; lowest = new NetworkExtremeDto(j.Id, u.Head(j.PressureHead)); }
            if (j.PressureHead > pMax) { pMax = j.PressureHead; highest = new NetworkExtremeDto(j.Id, u.Head(j.PressureHead)); }
            if (listed(j.Id)) junctions.Add(new(j.Id, u.Head(j.Head), u.Head(j.PressureHead), u.Flow(j.Demand), u.Flow(j.DeliveredDemand)));
        }
        var pumps = new List<NetworkPumpResultDto>();
        foreach (var p in r.Pumps)
        {
            if (p.Status != LinkStatus.Open) closed++;
            if (listed(p.Id)) pumps.Add(new(p.Id, u.Flow(p.Flow), u.Head(p.Head), p.Status.Code()));
        }
        var reservoirs = new List<NetworkReservoirResultDto>();
        foreach (var x in r.Reservoirs)
        {
            if (skip is not null && skip.Contains(x.Id)) continue;
            supply += x.Outflow;
            if (listed(x.Id)) reservoirs.Add(new(x.Id, u.Head(x.Head), u.Flow(x.Outflow)));
        }
        List<NetworkValveResultDto>? valves = null;
        NetworkValveStatesDto? valveStates = null;
        if (model.Valves.Count > 0)
        {
            valves = [];
            int active = 0, open = 0, shut = 0;
            foreach (var v in r.Valves)
            {
                if (v.State == ValveState.Active) active++;
                else if (v.State == ValveState.Open) open++;
                else shut++;
                if (listed(v.Id)) valves.Add(new(v.Id, u.Flow(v.Flow), u.Head(v.HeadLoss), v.State.Code()));
            }
            valveStates = new NetworkValveStatesDto(active, open, shut);
        }
        return new NetworkTables(pipes, junctions, pumps, reservoirs, valves,
            new NetworkCaseSummaryDto(lowest, highest, fastest, transitional, closed, valveStates), demand, supply);
    }

    /// <summary>What <see cref="Tables"/> gives: the rows, the summary, and the totals (SI) of demand and supply.</summary>
    internal sealed record NetworkTables(List<NetworkPipeResultDto> Pipes, List<NetworkJunctionResultDto> Junctions,
        List<NetworkPumpResultDto> Pumps, List<NetworkReservoirResultDto> Reservoirs, List<NetworkValveResultDto>? Valves,
        NetworkCaseSummaryDto Summary, double Demand, double Supply);

    /// <summary>At most <paramref name="cap"/> warnings of each code, in their order; in place of the first one over the
    /// cap, one summary of that code counting the rest. The list itself when no code exceeds the cap, or cap is 0 or less.</summary>
    internal static List<NetworkWarningDto> CapPerCode(List<NetworkWarningDto> warnings, int cap, int caseNumber)
    {
        if (cap <= 0 || warnings.Count <= cap) return warnings;
        var total = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var w in warnings) total[w.Code] = total.GetValueOrDefault(w.Code) + 1;
        if (total.Values.All(n => n <= cap)) return warnings;

        var seen = new Dictionary<string, int>(StringComparer.Ordinal);
        var kept = new List<NetworkWarningDto>();
        foreach (var w in warnings)
        {
            int k = seen[w.Code] = seen.GetValueOrDefault(w.Code) + 1;
            if (k <= cap) kept.Add(w);
            else if (k == cap + 1)
            {
                int more = total[w.Code] - cap;
                kept.Add(new NetworkWarningDto(w.Code, string.Create(CultureInfo.InvariantCulture,
                    $"{more} more element{(more == 1 ? " in load case " + caseNumber + " has" : "s in load case " + caseNumber + " have")} this warning ({w.Code}), {total[w.Code]} in all; only the first {cap} are listed (FlowSolve:Limits:NetworkWarningsPerCode). The pipe, junction and pump tables carry every value."),
                    null, more));
            }
        }
        return kept;
    }

    /// <summary>Each correlation's range beside the extremes over every pipe and case: Colebrook-White's published range
    /// for the turbulent Darcy-Weisbach pipes, the usual range of Hazen-Williams (common practice) for the others. The
    /// extremes are gathered case by case (<see cref="Add"/>), so no case's result need be kept.</summary>
    internal sealed class ValidityExtremes
    {
        private double _reMin = double.PositiveInfinity, _reMax, _vMax = -1;

        public void Add(NetworkModel model, NetworkResult r)
        {
            double nu = model.KinematicViscosity;
            for (int i = 0; i < model.Pipes.Count; i++)
            {
                var p = model.Pipes[i];
                var pr = r.Pipes[i];
                if (pr.Status != LinkStatus.Open || pr.Flow == 0) continue;
                double re = Math.Abs(pr.Velocity) * p.Diameter / nu;
                if (p.HazenWilliamsC is null)
                {
                    if (re < FrictionOptions.Default.TurbulentLimit) continue;
                    _reMin = Math.Min(_reMin, re);
                    _reMax = Math.Max(_reMax, re);
                }
                else _vMax = Math.Max(_vMax, Math.Abs(pr.Velocity));
            }
        }

        public List<ValidityDto> Report(NetworkProblem input)
        {
            var list = new List<ValidityDto>();
            var model = input.Model;
            var u = input.Units;
            double nu = model.KinematicViscosity;
            double relMax = -1;
            foreach (var p in model.Pipes)
                if (p.HazenWilliamsC is null) relMax = Math.Max(relMax, p.Roughness / p.Diameter);
            double reMin = _reMin, reMax = _reMax, vMax = _vMax;
            var cw = FrictionMethodInfo.ColebrookWhite;
            string cwSource = cw.Source + "; range: " + cw.RangeProvenance;
            if (reMax > 0)
            {
                list.Add(new ValidityDto(cw.Code, "smallest turbulent pipe Reynolds number", cw.ReynoldsMinimum, cw.ReynoldsMaximum, reMin, reMin >= cw.ReynoldsMinimum && reMin <= cw.ReynoldsMaximum, cwSource));
                list.Add(new ValidityDto(cw.Code, "largest pipe Reynolds number", cw.ReynoldsMinimum, cw.ReynoldsMaximum, reMax, reMax <= cw.ReynoldsMaximum, cwSource));
            }
            if (relMax >= 0)
                list.Add(new ValidityDto(cw.Code, "largest relative roughness e/D", cw.RelativeRoughnessMinimum, cw.RelativeRoughnessMaximum, relMax, relMax <= cw.RelativeRoughnessMaximum, cwSource));
            var hw = model.Pipes.Where(p => p.HazenWilliamsC is not null).ToArray();
            if (hw.Length > 0)
            {
                const string source = "Hazen-Williams usual range (common practice): water at ordinary temperatures, turbulent flow";
                double dMin = hw.Min(p => p.Diameter), dMax = hw.Max(p => p.Diameter);
                double cMin = hw.Min(p => p.HazenWilliamsC!.Value), cMax = hw.Max(p => p.HazenWilliamsC!.Value);
                list.Add(new ValidityDto("hazen-williams", "smallest diameter", u.Head(HazenWilliams.MinimumDiameter), u.Head(HazenWilliams.MaximumDiameter), u.Head(dMin), dMin >= HazenWilliams.MinimumDiameter, source));
                list.Add(new ValidityDto("hazen-williams", "largest diameter", u.Head(HazenWilliams.MinimumDiameter), u.Head(HazenWilliams.MaximumDiameter), u.Head(dMax), dMax <= HazenWilliams.MaximumDiameter, source));
                list.Add(new ValidityDto("hazen-williams", "smallest C", HazenWilliams.MinimumCoefficient, HazenWilliams.MaximumCoefficient, cMin, cMin >= HazenWilliams.MinimumCoefficient, source));
                list.Add(new ValidityDto("hazen-williams", "largest C", HazenWilliams.MinimumCoefficient, HazenWilliams.MaximumCoefficient, cMax, cMax <= HazenWilliams.MaximumCoefficient, source));
                if (vMax >= 0)
                    list.Add(new ValidityDto("hazen-williams", "largest velocity", 0, u.Head(HazenWilliams.MaximumVelocity), u.Head(vMax), vMax <= HazenWilliams.MaximumVelocity, source));
                double nuShown = u.IsUs ? 1 / (Units.Foot * Units.Foot) : 1;
                list.Add(new ValidityDto("hazen-williams", "kinematic viscosity", HazenWilliams.MinimumViscosity * nuShown, HazenWilliams.MaximumViscosity * nuShown, nu * nuShown,
                    nu >= HazenWilliams.MinimumViscosity && nu <= HazenWilliams.MaximumViscosity, source));
            }
            return list;
        }
    }

    private static bool Finite(NetworkSolveResponse r)
    {
        if (!double.IsFinite(r.KinematicViscosity)) return false;
        foreach (var c in r.Cases)
        {
            if (!double.IsFinite(c.TotalDemand) || !double.IsFinite(c.TotalSupply) || !double.IsFinite(c.TotalDeliveredDemand) || !double.IsFinite(c.DemandShortfall)) return false;
            foreach (var p in c.Pipes)
                if (!double.IsFinite(p.Flow) || !double.IsFinite(p.Velocity) || !double.IsFinite(p.HeadLoss) || !double.IsFinite(p.FrictionFactor) || !double.IsFinite(p.Reynolds)) return false;
            foreach (var j in c.Junctions)
                if (!double.IsFinite(j.Head) || !double.IsFinite(j.PressureHead) || !double.IsFinite(j.Demand) || !double.IsFinite(j.DeliveredDemand)) return false;
            foreach (var p in c.Pumps)
                if (!double.IsFinite(p.Flow) || !double.IsFinite(p.Head)) return false;
            foreach (var x in c.Reservoirs)
                if (!double.IsFinite(x.Outflow)) return false;
            foreach (var v in c.Valves ?? [])
                if (!double.IsFinite(v.Flow) || !double.IsFinite(v.HeadLoss)) return false;
            foreach (var e in new[] { c.Summary.LowestPressureHead, c.Summary.HighestPressureHead, c.Summary.HighestVelocity })
                if (e is not null && !double.IsFinite(e.Value)) return false;
            foreach (var t in c.Convergence)
                if (!double.IsFinite(t.MaxFlowChange) || !double.IsFinite(t.MaxHeadImbalance) || !double.IsFinite(t.MaxContinuityError)) return false;
        }
        return r.Validity.All(v => double.IsFinite(v.Value));
    }
}
