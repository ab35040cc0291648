using System.Globalization;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Networks;

/// <summary>The fire-flow endpoint's OpenAPI description, method text, example and calculation sheet.</summary>
public static class FireFlowDocs
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>The fire-flow cautions, shown in the description, the docs page and the sheet.</summary>
    public const string FireCautions =
        "A fire-flow figure is a model estimate: it does not replace a hydrant flow test, and local fire codes govern the " +
        "residual pressure and the flow required; 14 m (about 20 psi) is a common-practice default only.";

    public const string Method =
        "fire flow: at each junction asked, the largest added draw-off Q (a fixed demand whatever the pressure) on top of the " +
        "first load case's demands at which the junction's pressure head stays at or above residualPressureHead and, when " +
        "minimumPressureHead is given, every other junction's stays at or above that; every pressure head falls as Q grows, so Q " +
        "is the smallest root over the limits, found by safeguarded Newton iteration in sqrt(p(0) - p(Q)) (about linear in Q, " +
        "head losses growing about as Q^2), each evaluation a full network solve warm-started from the one before, dp/dQ for " +
        "every junction from one more solve with the factor of the network's own Jacobian; stopped when the limiting pressure head is within 1e-6 m of its limit; " +
        "on a demand-driven network without control valves, by a bordered Newton iteration instead: the draw-off an unknown of one " +
        "network solve with the limiting junction's pressure head held at its limit (one factorisation and two triangular solves an " +
        "iteration), the most broken other limit held next until every limit holds, the scalar search where that solve fails";

    public const string Description =
        "Fire flow: for each junction listed in fireFlow.junctions (every junction with a positive demand when omitted), the largest " +
        "draw-off that can be added there, on top of the first load case's demands, while its own pressure head stays at or above " +
        "fireFlow.residualPressureHead (14 m, about 20 psi, when omitted) and, when fireFlow.minimumPressureHead is given, every other " +
        "junction's stays at or above that. The request is the network document of /v1/networks/solve (junctions, reservoirs, pipes, " +
        "pumps, fluid, demandMultipliers, demandModel, units, flowUnit) plus fireFlow. Each answer in junctions gives id, " +
        "availableFlow (flow unit), pressureHead at that flow, limitingJunction (the junction whose pressure sets the limit: the " +
        "fire-flow junction itself, or the first other junction to fall to the minimum) with its limitingPressureHead, iterations " +
        "(network solves of the search), networkIterations, converged and status. Method: every pressure head falls as the draw-off " +
        "grows, so the available flow is the smallest draw-off at which any limited pressure head reaches its limit: a scalar root per " +
        "junction, solved by safeguarded Newton iteration in the square root of the pressure drop (nearly linear in the flow), each " +
        "evaluation a full network solve warm-started from the one before, with dp/dQ of every junction from one more solve with the " +
        "factor of the network's own Jacobian. On a demand-driven network without control valves the same root is found faster by " +
        "a bordered Newton iteration: the draw-off is an unknown of one network solve in which the limiting junction's pressure " +
        "head is held at its limit (iterations then counts these solves); where it fails the scalar search runs. Junctions are " +
        "searched in parallel with answers equal to those found one after another. " +
        "Under pressure-driven demand the fire draw-off is a fixed demand, while the other " +
        "demands still follow the law (they shrink as the pressure falls, which leaves more water for the fire). A junction below its " +
        "limit even with no draw-off has no answer: converged false, availableFlow 0, status residual-not-met-at-zero-draw-off or " +
        "minimum-not-met-at-zero-draw-off, and a warning naming it; a search that stops early says so the same way. Bad input " +
        "(an unknown or repeated junction id in fireFlow.junctions, a pressure head out of range) answers 400 naming the field " +
        "(fireFlow.junctions[2], fireFlow.residualPressureHead); more fire-flow junctions than FlowSolve:Limits:NetworkMaxFireFlowJunctions " +
        "(500 by default), or a network over the network limits, answers 413 naming the limit; a network that cannot be solved with no " +
        "draw-off answers 422. A request over its time budget is cut off (503). format=html gives the fire-flow sheet; format=text is " +
        "not offered. Steady state only: water hammer and surge are out of scope. " + FireCautions + "\n\n" + OpenApiSetup.Cautions;

    /// <summary>The Vandrel Vale demo network (<see cref="NetworkDocs.Example"/>, invented) asked for the fire flow at three
    /// junctions with 14 m residual and 10 m everywhere else.</summary>
    public static FireFlowRequest Example { get; } = new(
        NetworkDocs.Example.Junctions, NetworkDocs.Example.Reservoirs, NetworkDocs.Example.Pipes, NetworkDocs.Example.Pumps,
        [1.0], NetworkDocs.Example.Temperature, null, null, "l/s",
        "Quellix village fire flows, Vandrel Vale (invented for the demo: no real place, firm or person)", null,
        new FireFlowInput(["green", "school", "ombrix-row"], 14, 10));

    /// <summary>The fire-flow sheet: the question, the method, one row per junction, warnings and the cautions.</summary>
    public static Sheet Sheet(FireFlowRequest request, FireFlowResponse r)
    {
        string hu = r.HeadUnit, qu = r.FlowUnit;
        var sheet = new Sheet
        {
            Title = request.Title is { Length: > 0 } t ? "Fire flow: " + t : "Fire flow",
            Calculation = FireFlowCalculation.Calculation,
        };
        sheet.Inputs.Add(new("junctions", (request.Junctions?.Count ?? 0).ToString(C), "", "nodes of unknown head"));
        sheet.Inputs.Add(new("reservoirs", (request.Reservoirs?.Count ?? 0).ToString(C), "", "nodes of fixed head"));
        sheet.Inputs.Add(new("pipes and pumps", ((request.Pipes?.Count ?? 0) + (request.Pumps?.Count ?? 0)).ToString(C)));
        sheet.Inputs.Add(new("residual pressure head", F(r.ResidualPressureHead), hu, "at each fire-flow junction"));
        sheet.Inputs.Add(new("minimum pressure head", r.MinimumPressureHead is double m ? F(m) : "none", r.MinimumPressureHead is null ? "" : hu, "at every other junction"));
        sheet.Inputs.Add(new("background demand multiplier", F(r.DemandMultiplier), "", "the first load case"));
        sheet.Inputs.Add(new("demand model", r.DemandModel));
        sheet.Assumptions.AddRange(r.Assumptions);
        sheet.Methods.Add(new("Fire flow",
            "largest draw-off Q with p_k(Q) >= residual and, if given, p_j(Q) >= minimum at every other junction; the smallest root of max over the limits of sqrt(p_c(0) - p_c(Q)) - sqrt(p_c(0) - limit_c), by safeguarded Newton with dp/dQ = -(A^-1 e_k)_c from the network's Jacobian A",
            "FlowSolve's formulation; safeguarded Newton: Press et al., Numerical Recipes (rtsafe); network solve: Todini and Pilati (1988), from memory"));
        sheet.Methods.Add(new("Network solve", r.Method, "see /v1/networks/solve"));
        var rows = new List<string[]>(Math.Min(r.Junctions.Count, NetworkSheet.MaximumTableRows));
        foreach (var j in r.Junctions.Take(NetworkSheet.MaximumTableRows))
            rows.Add([j.Id, F(j.AvailableFlow), F(j.PressureHead), j.LimitingJunction, F(j.LimitingPressureHead), j.Iterations.ToString(C), j.Converged ? "yes" : "no", j.Status]);
        sheet.Tables.Add(new("fire-flow", "Fire flow at each junction",
            ["junction", $"available flow ({qu})", $"pressure head ({hu})", "limiting junction", $"its pressure head ({hu})", "network solves", "converged", "status"],
            rows, r.Junctions.Count > NetworkSheet.MaximumTableRows
                ? string.Create(C, $"The first {NetworkSheet.MaximumTableRows} of {r.Junctions.Count} junctions; the JSON answer holds every one.")
                : ""));
        int solved = r.Junctions.Count(j => j.Converged);
        sheet.Results.Add(new("junctions with an answer", string.Create(C, $"{solved} of {r.Junctions.Count}"), "", r.Converged ? "every search converged" : "see the warnings"));
        if (r.Junctions.Where(j => j.Converged).OrderBy(j => j.AvailableFlow).FirstOrDefault() is { } least)
            sheet.Results.Add(new("smallest available flow", F(least.AvailableFlow), qu, $"at junction '{least.Id}', limited by '{least.LimitingJunction}'"));
        sheet.Results.Add(new("caution", FireCautions));
        sheet.Warnings.AddRange(r.Warnings);
        return sheet;
    }

    private static string F(double v) => v.ToString("G6", C);
}
