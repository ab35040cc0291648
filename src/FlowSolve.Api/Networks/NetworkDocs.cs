using FlowSolve.Api.Hosting;
using FlowSolve.Api.Pumps;
using FlowSolve.Core.Networks;

namespace FlowSolve.Api.Networks;

/// <summary>The network endpoint's OpenAPI description and example.</summary>
public static class NetworkDocs
{
    /// <summary>How the head equations were solved, for the answer's method text.</summary>
    public static string HeadSolverMethod(NetworkLinearSolver solver) => solver == NetworkLinearSolver.ConjugateGradient
        ? "head equations solved by conjugate gradients with an incomplete Cholesky preconditioner"
        : "head equations solved in each Newton step by a direct sparse Cholesky factorisation (supernodal, under a nested-dissection ordering analysed once per network), with iterative refinement";

    /// <summary>The answer's headSolver code.</summary>
    public static string HeadSolverCode(NetworkLinearSolver solver) =>
        solver == NetworkLinearSolver.ConjugateGradient ? "conjugate-gradient" : "sparse-cholesky";

    public const string Solve =
        "Steady flows and heads of a looped (or branched) pipe network by the global gradient algorithm of Todini and Pilati " +
        "(1988): Newton iteration on the energy equation of every link and the continuity equation of every junction together, " +
        "each step's head equations solved by a direct sparse Cholesky factorisation (headSolver in the answer names it). " +
        "The request is a network document: junctions (id, elevation, demand), reservoirs (id, fixed head), pipes (id, from, to, " +
        "length, diameter, and roughness for Darcy-Weisbach with the exact Colebrook-White friction factor from Re 4000, 64/Re below " +
        "Re 2000 and Churchill's (1977) interpolation between, the same relations as /v1/pipes/flow (joined to the neighbouring laws " +
        "by a cubic within 5 % of each limit, where the single-pipe relations jump), or hazenWilliamsC for " +
        "Hazen-Williams; minorLossCoefficient; checkValve; closed), pumps (id, from, to, curve as in /v1/pumps/duty-point, " +
        "speedRatio), optional x and y on the nodes for the schematic of the calculation sheet, the fluid (water's temperature or " +
        "kinematicViscosity; water at 20 degrees C when neither is given) and demandMultipliers, one load case each (default [1]). " +
        "demandModel chooses how demands respond to pressure: demand-driven (the default: every demand delivered in full whatever " +
        "the pressure) or {\"type\": \"pressure-driven\", \"minimumPressureHead\": 0, \"requiredPressureHead\": 20, \"exponent\": 0.5}: " +
        "a junction with a positive demand d at pressure head p receives d ((p - min)/(req - min))^exponent between the two heads, " +
        "nothing at or below the minimum, d at or above the required head (Wagner, Shamir and Marks 1988), solved with the network " +
        "by Newton's method and reported converged only when that law and continuity hold; each junction then reports deliveredDemand " +
        "beside demand, each case totalDeliveredDemand and demandShortfall, and a demand-shortfall warning says how many junctions " +
        "receive less than their demand and how much in all. " +
        "valves lists control valves (id, from, to, diameter, type, setting, minorLossCoefficient; the open valve's loss is " +
        "minorLossCoefficient x V^2/2g with V from diameter): pressure-reducing (setting: the pressure head held at 'to'), " +
        "pressure-sustaining (the pressure head held at 'from'), flow-control (the most flow passed, in the flow unit) and throttle " +
        "(a loss coefficient K in place of minorLossCoefficient); the first three pass flow only from 'from' to 'to', and a node may " +
        "be an end of one valve only. Each case's valves report flow, headLoss and status: active (holding its setting), open " +
        "(cannot reach it and acts as a fitting) or closed (would pass reverse flow); the states are searched between Newton " +
        "solves (statusPasses counts the passes), and a set of states met before ends the search as status-cycle, not converged, " +
        "with a valve-state-cycle warning on each valve of the cycle. " +
        "Flows are positive from a pipe's 'from' node to its 'to' node. Each load case reports every pipe (flow, velocity, head " +
        "loss, friction factor, Reynolds number, status), junction (head, pressure head, demand), pump and reservoir, the supply " +
        "and demand totals, iterations, the convergence record per iteration (largest flow change, head imbalance and continuity " +
        "error) and warnings with stable codes naming their element (velocities outside 0.6 to 3 m/s, common practice; negative " +
        "pressures, whose message in a demand-driven solve points to the pressure-driven model; pumps; transitional-flow for each pipe whose Reynolds number lies between 2000 and 4000, as single pipes have), " +
        "at most FlowSolve:Limits:NetworkWarningsPerCode (50 by default) of one code per load case, then one " +
        "summary of that code whose moreElements counts the rest (the pipe, junction and pump tables still carry every value), and " +
        "a summary of extremes (lowest and highest pressure head, highest velocity). Converged means continuity to 1e-10 m3/s at every junction and energy to 1e-10 m on every link, " +
        "or, where that is finer than double precision holds (a very short or very wide pipe between heads of some metres), to 8 units in the last place of the numbers involved. " +
        "output bounds the answer: {\"detail\": \"summary\"} lists no element rows, {\"elements\": [ids]} lists only those elements; " +
        "the rows listed times the load cases may not exceed FlowSolve:Limits:NetworkMaxElementCases (100 000 by default), or the " +
        "request answers 413 naming that limit before anything is solved. " +
        "Units: SI by default (m, m3/s, m/s, m2/s, degrees C); units=us gives ft, ft3/s (or US gal/min with flowUnit=gpm), ft/s, " +
        "ft2/s and degrees F, for inputs and outputs alike; warning messages quote SI figures. Bad input answers 400 whose errors " +
        "map names each field (pipes[2].length) and whose messages name the element by id (duplicate ids, unknown nodes, a link " +
        "from a node to itself, non-positive lengths); elements lists those ids. A network over the size limit " +
        "(FlowSolve:Limits:NetworkMaxPipes links or nodes, 10 000 by default) or with too many load cases " +
        "(FlowSolve:Limits:NetworkMaxDemandMultipliers, 24) answers 413 naming the limit. A part of the network with no path to a " +
        "reservoir, a pump that cannot lift against the system, or head equations that cannot be solved answer 422 saying which. " +
        "format=text is not offered (the answer is tables, not one value), nor batch or check; format=html gives the calculation " +
        "sheet with a schematic drawn from the coordinates. Steady state only: water hammer and surge are out of scope.\n\n" +
        OpenApiSetup.Cautions;

    /// <summary>The Vandrel Vale demo network (invented data, no real place; samples/scenario/vandrel-network.json holds
    /// the same document, and a test keeps the two equal): Quellix village, fed from Orvex reservoir by a trunk main,
    /// three loops, a back-feed from the Tazmerin tank through a check valve, and a booster pump to the Zemmit Rise zone.</summary>
    public static NetworkSolveRequest Example { get; } = new(
        Junctions:
        [
            new("trunk-end", 74, 0, 600, 600),
            new("dovrix-lane", 70, 0.004, 1000, 600),
            new("brook-end", 66, 0.005, 1400, 600),
            new("green", 69, 0.006, 600, 200),
            new("tazzle-row", 67, 0.005, 1000, 200),
            new("ombrix-row", 64, 0.004, 1400, 200),
            new("school", 71, 0.003, 600, -200),
            new("booster-out", 71, 0, 300, -200),
            new("zemmit-rise", 104, 0.003, 0, -200),
            new("zemmit-top", 110, 0.002, 0, -500),
        ],
        Reservoirs:
        [
            new("orvex", 118.5, 0, 600),
            new("tazmerin-tank", 96.0, 1800, 200),
        ],
        Pipes:
        [
            new("trunk", "orvex", "trunk-end", 1800, 0.25, Roughness: 0.0001, MinorLossCoefficient: 2),
            new("p1", "trunk-end", "dovrix-lane", 400, 0.2, Roughness: 0.0001),
            new("p2", "dovrix-lane", "brook-end", 400, 0.15, Roughness: 0.0001),
            new("p3", "trunk-end", "green", 400, 0.2, Roughness: 0.0001),
            new("p4", "dovrix-lane", "tazzle-row", 400, 0.1, HazenWilliamsC: 100),
            new("p5", "brook-end", "ombrix-row", 400, 0.1, HazenWilliamsC: 100),
            new("p6", "green", "tazzle-row", 400, 0.15, Roughness: 0.0001),
            new("p7", "tazzle-row", "ombrix-row", 400, 0.1, Roughness: 0.0001),
            new("p8", "green", "school", 400, 0.15, Roughness: 0.0001),
            new("p9", "school", "tazzle-row", 560, 0.1, Roughness: 0.0001),
            new("rise-main", "booster-out", "zemmit-rise", 300, 0.1, Roughness: 0.00001, MinorLossCoefficient: 3, CheckValve: true),
            new("zemmit-spur", "zemmit-rise", "zemmit-top", 300, 0.08, Roughness: 0.00001),
            new("tank-feed", "tazmerin-tank", "ombrix-row", 900, 0.15, Roughness: 0.0001, MinorLossCoefficient: 3, CheckValve: true),
        ],
        Pumps:
        [
            new("zemmit-booster", "school", "booster-out", new PumpInput(Coefficients: [48, 0, -300000], MaximumFlow: 0.01)),
        ],
        DemandMultipliers: [0.4, 1.0, 1.8],
        Temperature: 12,
        Title: "Quellix village network, Vandrel Vale (invented for the demo: no real place, firm or person)");
}
