using System.ComponentModel;
using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Networks;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;

namespace FlowSolve.Api.Networks;

/// <summary>The fire-flow question: where, and which pressure heads must hold.</summary>
public sealed record FireFlowInput(
    [property: Description("Ids of the junctions to find the fire flow at, each once; every junction with a positive demand when omitted. At most FlowSolve:Limits:NetworkMaxFireFlowJunctions (500 by default); more answers 413.")]
    IReadOnlyList<string?>? Junctions = null,
    [property: Description("Pressure head each fire-flow junction must keep while the fire flow is drawn: m (ft with units=us), 0 to 10000 m; 14 m (about 20 psi) when omitted, a common-practice default only: local fire codes govern.")]
    double? ResidualPressureHead = null,
    [property: Description("When given, the pressure head every other junction must keep while the fire flow is drawn: m (ft with units=us), 0 to 10000 m. null (the default) sets no limit elsewhere.")]
    double? MinimumPressureHead = null);

/// <summary>A network document and the fire-flow question.</summary>
public sealed record FireFlowRequest(
    [property: Description("Junctions: nodes of unknown head (id, elevation, demand; x and y for the schematic), as in /v1/networks/solve.")]
    IReadOnlyList<NetworkJunctionInput>? Junctions,
    [property: Description("Reservoirs: nodes of fixed total head (id, head), as in /v1/networks/solve.")]
    IReadOnlyList<NetworkReservoirInput>? Reservoirs,
    [property: Description("Pipes, as in /v1/networks/solve. At least one pipe or pump.")]
    IReadOnlyList<NetworkPipeInput>? Pipes,
    [property: Description("Pumps, as in /v1/networks/solve; optional.")]
    IReadOnlyList<NetworkPumpInput>? Pumps = null,
    [property: Description("Load cases as in /v1/networks/solve: the fire flow is drawn on top of the first one's demands (the junction demands times demandMultipliers[0]); [1] when omitted.")]
    IReadOnlyList<double>? DemandMultipliers = null,
    [property: Description("Water temperature: degrees C, 0 to 100 (degrees F, 32 to 212, with units=us). Water at 20 degrees C when no fluid is given.")]
    double? Temperature = null,
    [property: Description("Kinematic viscosity of the fluid: m2/s (ft2/s with units=us); above 0. Instead of temperature.")]
    double? KinematicViscosity = null,
    [property: Description("Unit system of the request and response: si (default) or us.")]
    string? Units = null,
    [property: Description(Hosting.FlowUnit.Description)]
    string? FlowUnit = null,
    [property: Description("A name for the network, shown as the calculation sheet's subtitle; optional, at most 200 characters.")]
    string? Title = null,
    [property: Description("How junction demands respond to pressure, as in /v1/networks/solve; the fire flow itself is a fixed draw-off whatever the pressure.")]
    NetworkDemandModelInput? DemandModel = null,
    [property: Description("The question: {\"junctions\": [ids], \"residualPressureHead\": 14, \"minimumPressureHead\": null}; all of it optional.")]
    FireFlowInput? FireFlow = null)
{
    /// <summary>The network document alone, for the network reader (no element tables are listed).</summary>
    internal NetworkSolveRequest Network() => new(Junctions, Reservoirs, Pipes, Pumps, DemandMultipliers, Temperature,
        KinematicViscosity, Units, FlowUnit, Title, new NetworkOutputInput(NetworkInput.SummaryDetail), DemandModel);
}

/// <summary>The fire flow available at one junction.</summary>
/// <param name="Id">The fire-flow junction.</param>
/// <param name="AvailableFlow">The largest draw-off on top of the background demands at which every limit holds (flow unit); 0 when there is no answer.</param>
/// <param name="PressureHead">The junction's own pressure head at that draw-off (m, or ft with units=us).</param>
/// <param name="LimitingJunction">The junction whose pressure head sets the limit: this junction (residualPressureHead) or another (minimumPressureHead).</param>
/// <param name="LimitingPressureHead">The limiting junction's pressure head at that draw-off (m, or ft).</param>
/// <param name="Iterations">Network solves of the search at this junction (each warm-started from the one before).</param>
/// <param name="Converged">True when the available flow was found; false for no answer or a search that did not converge (status says which).</param>
/// <param name="Status">solved, residual-not-met-at-zero-draw-off, minimum-not-met-at-zero-draw-off, above-search-limit, network-not-solved or iteration-cap-reached.</param>
/// <param name="NetworkIterations">Newton iterations of those network solves, summed.</param>
public sealed record FireFlowJunctionDto(
    string Id, double AvailableFlow, double PressureHead, string LimitingJunction, double LimitingPressureHead,
    int Iterations, bool Converged, string Status, int NetworkIterations);

/// <summary>The fire flows, one per junction asked, with the method, units and defaults.</summary>
/// <param name="Junctions">One answer per junction asked, in the order asked.</param>
/// <param name="Iterations">Network solves of the longest search.</param>
/// <param name="Converged">True when every junction's search found its available flow.</param>
/// <param name="Method">The relations and the algorithm used.</param>
/// <param name="Units">si or us.</param>
/// <param name="FlowUnit">m3/s, l/s, m3/h, ft3/s or gpm.</param>
/// <param name="HeadUnit">m or ft.</param>
/// <param name="ResidualPressureHead">The residual pressure head applied (m, or ft).</param>
/// <param name="MinimumPressureHead">The minimum pressure head applied at the other junctions (m, or ft); omitted when none.</param>
/// <param name="DemandMultiplier">The multiplier of the background demands (the first load case).</param>
/// <param name="DemandModel">demand-driven or pressure-driven.</param>
/// <param name="Warnings">Warnings with stable codes: each junction without an answer (its status as the code), and about the request as a whole.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
public sealed record FireFlowResponse(
    IReadOnlyList<FireFlowJunctionDto> Junctions, int Iterations, bool Converged, string Method,
    string Units, string FlowUnit, string HeadUnit, double ResidualPressureHead, double? MinimumPressureHead,
    double DemandMultiplier, string DemandModel, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : ISolveSummary;

/// <summary>Fire flow in a network: <c>POST /v1/networks/fire-flow</c>.</summary>
/// <remarks>Like <c>networks/solve</c>, not a row calculation: POST only, no batch or check, format=text answers 400;
/// format=html gives the fire-flow sheet.</remarks>
public sealed class FireFlowCalculation : Calculation<FireFlowRequest, FireFlowResponse>
{
    public const string Calculation = "networks/fire-flow";

    /// <summary>The default residual pressure head, 14 m (about 20 psi): common practice only; local fire codes govern.</summary>
    public const double DefaultResidualPressureHead = 14;

    public override CalculationInfo Info { get; } = new(Calculation, "Networks", "NetworkFireFlow", "converged",
        "Fire flow available at network junctions at a residual pressure head", FireFlowDocs.Description)
    {
        Text = false,
        Rows = false,
        Options = [],
        Problems = [StatusCodes.Status413PayloadTooLarge, StatusCodes.Status422UnprocessableEntity],
    };

    public override FireFlowRequest BodyExample => FireFlowDocs.Example;

    public override Outcome<FireFlowResponse> Solve(FireFlowRequest request, in CalculationContext context) =>
        Solve(request, (context.Services?.GetService<IOptions<FlowSolveOptions>>()?.Value ?? new FlowSolveOptions()).Limits, context.Cancellation);

    public override Sheet Sheet(FireFlowRequest request, FireFlowResponse answer) => FireFlowDocs.Sheet(request, answer);

    public static Outcome<FireFlowResponse> Solve(FireFlowRequest request, FlowSolveOptions.LimitSettings limits, CancellationToken cancellation = default)
    {
        if (TooLarge(request, limits) is { } tooLarge) return tooLarge;

        var errors = new NetworkInput.Errors();
        var input = NetworkInput.Read(request.Network(), errors);
        var fields = errors.Fields;
        var u = input?.Units ?? new Pumps.PumpUnits(string.Equals(request.Units, "us", StringComparison.OrdinalIgnoreCase), Hosting.FlowUnit.CubicMetrePerSecond);
        var assumptions = new List<AssumptionDto>();
        var fire = request.FireFlow ?? new FireFlowInput();
        string hu = u.HeadUnit;
        double bound = FireFlowOptions.MaximumPressureHead / u.HeadFactor;
        double residual;
        if (fire.ResidualPressureHead is null)
        {
            residual = DefaultResidualPressureHead / u.HeadFactor;
            assumptions.Add(new("fireFlow.residualPressureHead", residual.ToString("G6", CultureInfo.InvariantCulture),
                "14 m (about 20 psi) at each fire-flow junction: a common-practice default only; local fire codes govern (default)"));
        }
        else residual = fields.Required("fireFlow.residualPressureHead", fire.ResidualPressureHead, 0, bound, unit: hu);
        double? minimum = fire.MinimumPressureHead is null ? null
            : fields.Required("fireFlow.minimumPressureHead", fire.MinimumPressureHead, 0, bound, unit: hu);
        if (fire.MinimumPressureHead is null)
            assumptions.Add(new("fireFlow.minimumPressureHead", "null", "no pressure limit at the other junctions (default)"));

        // The junctions asked: every one a junction of this network, each once.
        var junctionIds = new HashSet<string>(StringComparer.Ordinal);
        foreach (var j in request.Junctions ?? []) if (j?.Id is { } id) junctionIds.Add(id);
        var reservoirIds = new HashSet<string>(StringComparer.Ordinal);
        foreach (var r in request.Reservoirs ?? []) if (r?.Id is { } id) reservoirIds.Add(id);
        List<string> asked;
        if (fire.Junctions is { } list)
        {
            asked = new List<string>(list.Count);
            if (list.Count == 0) fields.Add("fireFlow.junctions", "must name at least one junction (or leave it out for every junction with a positive demand)");
            var seen = new HashSet<string>(StringComparer.Ordinal);
            for (int i = 0; i < list.Count; i++)
            {
                string at = $"fireFlow.junctions[{i}]";
                string? id = list[i];
                if (string.IsNullOrEmpty(id)) fields.Add(at, "must be the id of a junction of this network");
                else if (reservoirIds.Contains(id)) fields.Add(at, $"'{NetworkInput.Short(id)}' is a reservoir: fire flow is sought at junctions, whose heads are unknown");
                else if (!junctionIds.Contains(id)) fields.Add(at, $"'{NetworkInput.Short(id)}' is not the id of a junction of this network");
                else if (!seen.Add(id)) fields.Add(at, $"'{NetworkInput.Short(id)}' is listed more than once");
                else asked.Add(id);
            }
        }
        else
        {
            asked = [];
            assumptions.Add(new("fireFlow.junctions", "every junction with a positive demand", "fire flow at every junction with a positive demand (default)"));
        }

        if (errors.Any || input is null)
            return errors.Problem("See errors: each key is a field of the request (the network document or fireFlow), each message about an element begins with its id.");
        if (fire.Junctions is null) asked = [.. FireFlow.DefaultJunctions(input.Model)];
        if (asked.Count > limits.NetworkMaxFireFlowJunctions)
            return LimitExceeded(asked.Count, limits.NetworkMaxFireFlowJunctions);

        // A head at the bound in feet can round a unit in the last place above 10 000 m once converted: clamp it there.
        static double Si(Pumps.PumpUnits u, double h) => Math.Min(u.HeadToSi(h), FireFlowOptions.MaximumPressureHead);
        var options = new FireFlowOptions(Si(u, residual), minimum is double m ? Si(u, m) : null, input.Multipliers[0]);
        FireFlowReport report;
        try
        {
            report = FireFlow.Solve(input.Model, asked, options, NetworkSolveCalculation.SolverOptions, cancellation);
        }
        catch (ArgumentOutOfRangeException)
        {
            // A backstop only: the Core reports flows beyond the friction relations as statuses.
            return ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.",
                "The solve met values beyond the range of the friction relations or of double precision; check the inputs for a misplaced unit or exponent.",
                new Dictionary<string, object?> { ["networkStatus"] = "not-finite" });
        }
        var background = report.Background;
        if (background.Status == NetworkStatus.NoPathToFixedHead)
        {
            var ids = background.UnsuppliedJunctions;
            string shown = string.Join(", ", ids.Take(10).Select(i => "'" + i + "'")) + (ids.Count > 10 ? $" and {ids.Count - 10} more" : "");
            return ProblemResults.NoAnswer("Part of the network has no path to a fixed head.",
                $"Junctions {shown} are not connected to any reservoir through pipes or pumps, so their heads are undefined. Connect that part to a reservoir, or remove it.",
                new Dictionary<string, object?> { ["networkStatus"] = background.Status.Code(), ["unsuppliedJunctions"] = ids.ToArray() });
        }
        if (!background.Converged)
            return ProblemResults.NoAnswer("The network could not be solved without a draw-off.",
                $"The background solve (the demands of the first load case, no fire flow) ended with status {background.Status.Code()}: {background.Status.Reason()}. Solve the network with /v1/networks/solve to see why.",
                new Dictionary<string, object?> { ["networkStatus"] = background.Status.Code() });

        var warnings = new List<WarningDto>(input.Warnings);
        if (background.Status == NetworkStatus.PumpCannotLift)
            warnings.Add(new("pump-cannot-lift", "With no draw-off, pump(s) " + string.Join(", ", background.PumpsUnableToLift.Select(p => "'" + p + "'"))
                + " cannot lift against the system and stand off; the fire flows are those of the network with them off."));
        var rows = new FireFlowJunctionDto[report.Junctions.Count];
        int iterations = 0;
        bool converged = true;
        for (int i = 0; i < rows.Length; i++)
        {
            var r = report.Junctions[i];
            rows[i] = new FireFlowJunctionDto(r.Id, u.Flow(r.AvailableFlow), u.Head(r.PressureHead), r.LimitingJunction,
                u.Head(r.LimitingPressureHead), r.Iterations, r.Converged, r.Status.Code(), r.NetworkIterations);
            iterations = Math.Max(iterations, r.Iterations);
            converged &= r.Converged;
            if (!r.Converged) warnings.Add(new(r.Status.Code(), Warning(r, u)));
            if (!Finite(rows[i]))
                return ProblemResults.NoAnswer("The network lies outside the range of the arithmetic.",
                    "The fire-flow search met values too large for double precision (the inputs are extreme in magnitude); rescale them.",
                    new Dictionary<string, object?> { ["networkStatus"] = "not-finite" });
        }
        assumptions.AddRange(input.Assumptions);
        string method = string.Join("; ", FireFlowDocs.Method, input.Method);
        return new FireFlowResponse(rows, iterations, converged, method, u.Code, u.FlowUnit, hu, residual, minimum,
            input.Multipliers[0], input.Model.DemandModel is null ? NetworkInput.DemandDriven : NetworkInput.PressureDriven,
            warnings, assumptions);
    }

    private static bool Finite(FireFlowJunctionDto r) =>
        double.IsFinite(r.AvailableFlow) && double.IsFinite(r.PressureHead) && double.IsFinite(r.LimitingPressureHead);

    /// <summary>The warning of a junction without an answer, naming it and its figures (in the request's units).</summary>
    private static string Warning(FireFlowResult r, Pumps.PumpUnits u)
    {
        var c = CultureInfo.InvariantCulture;
        string hu = u.HeadUnit;
        return r.Status switch
        {
            FireFlowStatus.ResidualNotMetAtZeroDrawOff => string.Format(c,
                "Junction '{0}': its pressure head is {1:G6} {2} with no draw-off, below the residual pressure head: no fire flow is available there.",
                r.Id, u.Head(r.PressureHead), hu),
            FireFlowStatus.MinimumNotMetAtZeroDrawOff => string.Format(c,
                "Junction '{0}': junction '{1}' has {2:G6} {3} with no draw-off, below the minimum pressure head: no fire flow is available while that limit applies.",
                r.Id, r.LimitingJunction, u.Head(r.LimitingPressureHead), hu),
            FireFlowStatus.AboveSearchLimit => string.Format(c,
                "Junction '{0}': every limit still holds at {1:G6} {2}, the flow that would run every pipe at the junction at 30 m/s; the available flow is larger than the pipes can carry in practice.",
                r.Id, u.Flow(r.AvailableFlow), u.FlowUnit),
            _ => string.Format(c, "Junction '{0}': {1}. Do not use its figure for design.", r.Id, r.Status.Reason()),
        };
    }

    private static ProblemHttpResult? TooLarge(FireFlowRequest r, FlowSolveOptions.LimitSettings limits)
    {
        if (NetworkSolveCalculation.SizeOver(r.Junctions, r.Reservoirs, r.Pipes, r.Pumps, limits) is { } size) return size;
        int cases = r.DemandMultipliers?.Count ?? 1;
        if (cases > limits.NetworkMaxDemandMultipliers)
            return NetworkSolveCalculation.LimitExceeded("Too many load cases.",
                $"demandMultipliers holds {cases} load cases; this service reads at most {limits.NetworkMaxDemandMultipliers} (FlowSolve:Limits:NetworkMaxDemandMultipliers); the fire flow uses the first only.",
                "networkMaxDemandMultipliers", limits.NetworkMaxDemandMultipliers, cases, "demandMultipliers");
        if (r.FireFlow?.Junctions is { } asked && asked.Count > limits.NetworkMaxFireFlowJunctions)
            return LimitExceeded(asked.Count, limits.NetworkMaxFireFlowJunctions);
        return null;
    }

    private static ProblemHttpResult LimitExceeded(int asked, int maximum) =>
        NetworkSolveCalculation.LimitExceeded("Too many fire-flow junctions.",
            $"The request asks for the fire flow at {asked} junctions; this service answers at most {maximum} in one request (FlowSolve:Limits:NetworkMaxFireFlowJunctions). Name fewer junctions in fireFlow.junctions and send the rest in further requests.",
            "networkMaxFireFlowJunctions", maximum, asked, "fireFlow.junctions");
}
