using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
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
public static class NetworkEndpoints
{
    public const string Calculation = "networks/solve";

    public static IEndpointRouteBuilder MapNetworkEndpoints(this IEndpointRouteBuilder routes)
    {
        var group = routes.MapGroup("/v1/networks").WithTags("Networks");

        group.MapPost("/solve", (NetworkSolveRequest request, IOptions<FlowSolveOptions> options, CancellationToken cancellation) =>
                Solve(request, options.Value.Limits, cancellation))
            .WithName("PostNetworkSolve")
            .WithSummary("Steady flows and heads of a looped pipe network, for one or more load cases (JSON body)")
            .WithDescription(NetworkDocs.Solve)
            .WithBodyExample(NetworkDocs.Example)
            .ProducesProblem(StatusCodes.Status413PayloadTooLarge)
            .ProducesProblem(StatusCodes.Status422UnprocessableEntity)
            .AsCalculation(Calculation, "converged", text: false);
        return routes;
    }

    public static Results<Ok<NetworkSolveResponse>, ValidationProblem, ProblemHttpResult> Solve(
        NetworkSolveRequest request, FlowSolveOptions.LimitSettings limits, CancellationToken cancellation = default)
    {
        if (TooLarge(request, limits) is { } tooLarge) return tooLarge;

        var errors = new NetworkInput.Errors();
        var input = NetworkInput.Read(request, errors);
        if (errors.Any || input is null)
        {
            var extensions = new Dictionary<string, object?>();
            if (errors.Elements.Count > 0) extensions["elements"] = errors.Elements.ToArray();
            return TypedResults.ValidationProblem(errors.Fields.ToDictionary(),
                title: "One or more fields are invalid.",
                detail: "See errors: each key is a field of the network document, each message begins with the element it belongs to; elements lists their ids.",
                type: "https://flowsolve.example/problems/invalid-input", extensions: extensions);
        }

        var results = new NetworkResult[input.Multipliers.Length];
        try
        {
            var solver = new NetworkSolver(input.Model);
            for (int i = 0; i < results.Length; i++)
            {
                // A request over its time budget stops between load cases (the timeout middleware answers 503).
                cancellation.ThrowIfCancellationRequested();
                results[i] = solver.SolveCase(input.Multipliers[i]);
            }
        }
        catch (ArgumentOutOfRangeException)
        {
            // A backstop only: the Core reports flows beyond the friction relations as NetworkStatus.FlowsOutOfRange.
            return OutOfRange(FlowsOutOfRangeDetail);
        }

        if (NoAnswer(input, results) is { } none) return none;
        var response = Response(input, results, limits.NetworkWarningsPerCode);
        if (!Finite(response)) return OutOfRange("The solve met values too large for double precision (the inputs are extreme in magnitude); rescale them.");
        return TypedResults.Ok(response);
    }

    private static ProblemHttpResult? TooLarge(NetworkSolveRequest r, FlowSolveOptions.LimitSettings limits)
    {
        int links = (r.Pipes?.Count ?? 0) + (r.Pumps?.Count ?? 0);
        int nodes = (r.Junctions?.Count ?? 0) + (r.Reservoirs?.Count ?? 0);
        int cases = r.DemandMultipliers?.Count ?? 1;
        int max = limits.NetworkMaxPipes;
        if (links > max || nodes > max)
        {
            bool l = links > max;
            return TypedResults.Problem(statusCode: StatusCodes.Status413PayloadTooLarge, title: "The network is too large for this service.",
                detail: string.Create(CultureInfo.InvariantCulture,
                    $"The network has {(l ? links : nodes)} {(l ? "links (pipes and pumps)" : "nodes (junctions and reservoirs)")}; this service solves at most {max} (FlowSolve:Limits:NetworkMaxPipes). Split the network or ask the operator to raise the limit."),
                type: "https://flowsolve.example/problems/limit-exceeded",
                extensions: new Dictionary<string, object?> { ["limit"] = "networkMaxPipes", ["maximum"] = max, ["given"] = l ? links : nodes, ["field"] = l ? "pipes" : "junctions" });
        }
        int maxCases = limits.NetworkMaxDemandMultipliers;
        if (cases > maxCases)
            return TypedResults.Problem(statusCode: StatusCodes.Status413PayloadTooLarge, title: "Too many load cases.",
                detail: string.Create(CultureInfo.InvariantCulture,
                    $"demandMultipliers holds {cases} load cases; this service solves at most {maxCases} in one request (FlowSolve:Limits:NetworkMaxDemandMultipliers). Send the rest in further requests."),
                type: "https://flowsolve.example/problems/limit-exceeded",
                extensions: new Dictionary<string, object?> { ["limit"] = "networkMaxDemandMultipliers", ["maximum"] = maxCases, ["given"] = cases, ["field"] = "demandMultipliers" });
        return null;
    }

    /// <summary>422 for a network with no physical answer: a part without a fixed head, a pump that cannot lift, or head
    /// equations that cannot be solved.</summary>
    private static ProblemHttpResult? NoAnswer(NetworkProblem input, NetworkResult[] results)
    {
        var first = results[0];
        if (first.Status == NetworkStatus.NoPathToFixedHead)
        {
            var ids = first.UnsuppliedJunctions;
            string list = string.Join(", ", ids.Take(10).Select(i => "'" + i + "'")) + (ids.Count > 10 ? $" and {ids.Count - 10} more" : "");
            return ProblemResults.NoAnswer("Part of the network has no path to a fixed head.",
                $"Junctions {list} are not connected to any reservoir through pipes or pumps, so their heads are undefined. Connect that part to a reservoir, or remove it.",
                new Dictionary<string, object?> { ["networkStatus"] = first.Status.Code(), ["unsuppliedJunctions"] = ids.ToArray() });
        }
        var lift = results.Where(r => r.Status == NetworkStatus.PumpCannotLift).ToArray();
        if (lift.Length > 0)
        {
            var u = input.Units;
            var cases = lift.Select(r => new Dictionary<string, object?>
            {
                ["demandMultiplier"] = r.DemandMultiplier,
                ["pumps"] = r.PumpsUnableToLift.Select(id => new Dictionary<string, object?>
                {
                    ["id"] = id,
                    ["headAcross"] = FiniteOrNull(u.Head(r.Pump(id).Head)),
                }).ToArray(),
            }).ToArray();
            var r0 = lift[0];
            string id0 = r0.PumpsUnableToLift[0];
            string detail = string.Create(CultureInfo.InvariantCulture,
                $"Pump '{id0}' cannot lift against the system at demand multiplier {r0.DemandMultiplier:G6}: the head of {u.Head(r0.Pump(id0).Head):G6} {u.HeadUnit} across it exceeds its shut-off head at its speed, so it would deliver nothing.")
                + (lift.Sum(r => r.PumpsUnableToLift.Count) > 1 ? " Other pumps or load cases are affected too (see cases)." : "")
                + " Raise its speed or choose a larger pump, or lower the delivery head.";
            return ProblemResults.NoAnswer("A pump cannot lift against the system.", detail,
                new Dictionary<string, object?> { ["networkStatus"] = NetworkStatus.PumpCannotLift.Code(), ["headUnit"] = u.HeadUnit, ["cases"] = cases });
        }
        if (results.FirstOrDefault(r => r.Status == NetworkStatus.LinearSolveFailed) is { } failed)
            return ProblemResults.NoAnswer("The head equations could not be solved.",
                string.Create(CultureInfo.InvariantCulture,
                    $"At demand multiplier {failed.DemandMultiplier:G6} the head equations met a non-finite value or could not be solved. Check for pipes whose sizes differ by many orders of magnitude, or extreme demands."),
                new Dictionary<string, object?> { ["networkStatus"] = failed.Status.Code() });
        if (results.FirstOrDefault(r => r.Status == NetworkStatus.FlowsOutOfRange) is { } outside)
            return ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.",
                string.Create(CultureInfo.InvariantCulture, $"At demand multiplier {outside.DemandMultiplier:G6}: ") + FlowsOutOfRangeDetail,
                new Dictionary<string, object?> { ["networkStatus"] = outside.Status.Code() });
        return null;
    }

    private const string FlowsOutOfRangeDetail = "The Newton iteration reached flows beyond the range of the friction relations (Reynolds number above 1e15). Check the demands, pump curves, diameters and viscosity for a misplaced unit or exponent.";

    private static ProblemHttpResult OutOfRange(string detail) =>
        ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.", detail,
            new Dictionary<string, object?> { ["networkStatus"] = "not-finite" });

    private static double? FiniteOrNull(double v) => double.IsFinite(v) ? v : null;

    private static NetworkSolveResponse Response(NetworkProblem input, NetworkResult[] results, int warningsPerCode)
    {
        var u = input.Units;
        var model = input.Model;
        double nu = model.KinematicViscosity;
        var cases = new NetworkCaseDto[results.Length];
        for (int c = 0; c < results.Length; c++)
        {
            var r = results[c];
            var pipes = new NetworkPipeResultDto[r.Pipes.Count];
            for (int i = 0; i < pipes.Length; i++)
            {
                var p = r.Pipes[i];
                double re = Math.Abs(p.Velocity) * model.Pipes[i].Diameter / nu;
                pipes[i] = new(p.Id, u.Flow(p.Flow), u.Head(p.Velocity), u.Head(p.HeadLoss), p.FrictionFactor, re, p.Status.Code());
            }
            var junctions = r.Junctions.Select(j => new NetworkJunctionResultDto(j.Id, u.Head(j.Head), u.Head(j.PressureHead), u.Flow(j.Demand))).ToArray();
            var pumps = r.Pumps.Select(p => new NetworkPumpResultDto(p.Id, u.Flow(p.Flow), u.Head(p.Head), p.Status.Code())).ToArray();
            var reservoirs = r.Reservoirs.Select(x => new NetworkReservoirResultDto(x.Id, u.Head(x.Head), u.Flow(x.Outflow))).ToArray();
            var record = r.Record.Select(t => new NetworkIterationDto(t.Iteration, t.StatusPass, u.Flow(t.MaxFlowChange),
                u.Head(t.MaxHeadImbalance), u.Flow(t.MaxContinuityError), t.LinearIterations)).ToArray();
            var warnings = new List<NetworkWarningDto>();
            if (!r.Converged)
                warnings.Add(new("not-converged", $"Load case {c + 1} (demand multiplier {r.DemandMultiplier.ToString("G6", CultureInfo.InvariantCulture)}) did not converge: {r.Status.Reason()}. The last iterate is reported; do not use it for design.", null));
            warnings.AddRange(r.Warnings.Select(w => { var d = w.Describe(); return new NetworkWarningDto(d.Code, d.Message, w.ElementId); }));
            cases[c] = new NetworkCaseDto(r.DemandMultiplier, r.Status.Code(), r.Status.Reason(), r.Converged, r.Iterations, r.StatusPasses,
                pipes, junctions, pumps, reservoirs, u.Flow(r.TotalDemand), u.Flow(r.TotalSupply), record,
                CapPerCode(warnings, warningsPerCode, c + 1));
        }
        return new NetworkSolveResponse(cases, results.Max(r => r.Iterations), results.All(r => r.Converged), input.Method,
            u.Code, u.FlowUnit, u.HeadUnit, u.IsUs ? "ft/s" : "m/s", u.IsUs ? nu / (Units.Foot * Units.Foot) : nu,
            Validity(input, results), input.Warnings, input.Assumptions);
    }

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
    /// for the turbulent Darcy-Weisbach pipes, the usual range of Hazen-Williams (common practice) for the others.</summary>
    private static List<ValidityDto> Validity(NetworkProblem input, NetworkResult[] results)
    {
        var list = new List<ValidityDto>();
        var model = input.Model;
        var u = input.Units;
        double nu = model.KinematicViscosity;
        double reMin = double.PositiveInfinity, reMax = 0, relMax = -1, vMax = -1;
        for (int i = 0; i < model.Pipes.Count; i++)
        {
            var p = model.Pipes[i];
            if (p.HazenWilliamsC is null) relMax = Math.Max(relMax, p.Roughness / p.Diameter);
            foreach (var r in results)
            {
                var pr = r.Pipes[i];
                if (pr.Status != LinkStatus.Open || pr.Flow == 0) continue;
                double re = Math.Abs(pr.Velocity) * p.Diameter / nu;
                if (p.HazenWilliamsC is null)
                {
                    if (re < FrictionOptions.Default.TurbulentLimit) continue;
                    reMin = Math.Min(reMin, re);
                    reMax = Math.Max(reMax, re);
                }
                else vMax = Math.Max(vMax, Math.Abs(pr.Velocity));
            }
        }
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

    private static bool Finite(NetworkSolveResponse r)
    {
        if (!double.IsFinite(r.KinematicViscosity)) return false;
        foreach (var c in r.Cases)
        {
            if (!double.IsFinite(c.TotalDemand) || !double.IsFinite(c.TotalSupply)) return false;
            foreach (var p in c.Pipes)
                if (!double.IsFinite(p.Flow) || !double.IsFinite(p.Velocity) || !double.IsFinite(p.HeadLoss) || !double.IsFinite(p.FrictionFactor) || !double.IsFinite(p.Reynolds)) return false;
            foreach (var j in c.Junctions)
                if (!double.IsFinite(j.Head) || !double.IsFinite(j.PressureHead) || !double.IsFinite(j.Demand)) return false;
            foreach (var p in c.Pumps)
                if (!double.IsFinite(p.Flow) || !double.IsFinite(p.Head)) return false;
            foreach (var x in c.Reservoirs)
                if (!double.IsFinite(x.Outflow)) return false;
            foreach (var t in c.Convergence)
                if (!double.IsFinite(t.MaxFlowChange) || !double.IsFinite(t.MaxHeadImbalance) || !double.IsFinite(t.MaxContinuityError)) return false;
        }
        return r.Validity.All(v => double.IsFinite(v.Value));
    }
}
