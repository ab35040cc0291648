using System.Globalization;
using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Networks;

/// <summary>Tolerances and limits of <see cref="NetworkSolver"/>.</summary>
/// <param name="HeadTolerance">Converged when every open link's energy imbalance |H_from - H_to - h(Q)| is at most this,
/// in m (default 1e-10 m), or, where that is finer than a double can hold at the link's heads, at most 8 units in the
/// last place of the heads, head loss and |Q| dh/dQ summed (about 1.8e-14 m at heads of 10 m)...</param>
/// <param name="FlowTolerance">...and every junction's continuity error |inflow - outflow - demand| is at most this, in
/// m3/s (default 1e-10 m3/s), or 8 units in the last place of |demand| plus the |Q| of its links where that is larger.
/// The final linear solves are driven to a tenth of it.</param>
/// <param name="MaxIterations">Cap on Newton iterations over all status passes together (default 100).</param>
/// <param name="MaxStatusPasses">Cap on passes of the status check (check valves, pumps, control valves) after which the statuses must
/// have settled (default 10).</param>
/// <param name="MaxLinearIterations">Cap on conjugate-gradient iterations per Newton iteration (default 5000), for
/// <see cref="NetworkLinearSolver.ConjugateGradient"/>; the direct solve takes at most 4 refinement steps.</param>
/// <param name="RegularisationVelocity">Below this mean velocity in m/s a Hazen-Williams pipe's head loss is replaced by an
/// odd cubic a Q + b Q^3 that meets the formula's value and slope there, so dh/dQ never vanishes at Q = 0 (the remedy of
/// Elhay and Simpson 2011, J. Hydraul. Eng. 137(10)); default 1e-3 m/s. Darcy-Weisbach pipes need none: their laminar
/// law is linear in Q near zero.</param>
/// <param name="MinimumDesignVelocity">Open pipes slower than this (m/s) are warned about (0.6 m/s, common practice).</param>
/// <param name="MaximumDesignVelocity">Pipes faster than this (m/s) are warned about (3.0 m/s, common practice).</param>
/// <param name="Friction">Regime limits for the Darcy friction factor.</param>
public readonly record struct NetworkOptions(
    double HeadTolerance, double FlowTolerance, int MaxIterations, int MaxStatusPasses, int MaxLinearIterations,
    double RegularisationVelocity, double MinimumDesignVelocity, double MaximumDesignVelocity, FrictionOptions Friction)
{
    /// <summary>1e-10 m, 1e-10 m3/s, 100 iterations, 10 status passes, 5000 linear iterations, 1e-3 m/s, 0.6 to 3.0 m/s,
    /// regime limits 2000 and 4000, the direct (sparse Cholesky) head solve.</summary>
    public static NetworkOptions Default { get; } = new(1e-10, 1e-10, 100, 10, 5000, 1e-3, 0.6, 3.0, FrictionOptions.Default);

    /// <summary>How the head equations of each Newton iteration are solved; <see cref="NetworkLinearSolver.SparseCholesky"/>
    /// (the default value, 0) unless set.</summary>
    public NetworkLinearSolver LinearSolver { get; init; }

    /// <summary>Cores a large network's solve may use (0, the default: every core; 1: one). The friction pass of a network
    /// of at least <see cref="NetworkSolver.ParallelLinks"/> links is split across them, each link's loss computed by the
    /// same operations as on one core, and so is the factorisation of a large head system
    /// (<see cref="SparseCholesky.MaxDegreeOfParallelism"/>), the same factor bit for bit: the answer is the same. A caller that already runs solves side by
    /// side (fire flow, one solver per core) sets 1.</summary>
    public int MaxParallelism { get; init; }

    /// <summary>Friction one pipe at a time, as before the span solve of the friction pass: kept for the benchmark that
    /// compares the two passes and the test that holds them equal bit for bit.</summary>
    internal bool ScalarFrictionPass { get; init; }

    internal void Validate()
    {
        static void Positive(double v, string name)
        {
            if (!(v > 0) || !double.IsFinite(v)) throw new ArgumentOutOfRangeException(name, v, "must be finite and positive");
        }
        Positive(HeadTolerance, nameof(HeadTolerance));
        Positive(FlowTolerance, nameof(FlowTolerance));
        Positive(RegularisationVelocity, nameof(RegularisationVelocity));
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(MaxIterations);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(MaxStatusPasses);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(MaxLinearIterations);
        if (!(MinimumDesignVelocity >= 0) || !(MaximumDesignVelocity >= MinimumDesignVelocity) || !double.IsFinite(MaximumDesignVelocity))
            throw new ArgumentOutOfRangeException(nameof(MaximumDesignVelocity), "need 0 <= minimum <= maximum design velocity");
        if (!(Friction.LaminarLimit > 0) || !(Friction.TurbulentLimit >= Friction.LaminarLimit))
            throw new ArgumentOutOfRangeException(nameof(Friction), "need 0 < laminar limit <= turbulent limit");
        ArgumentOutOfRangeException.ThrowIfNegative(MaxParallelism);
        if (!Enum.IsDefined(LinearSolver))
            throw new ArgumentOutOfRangeException(nameof(LinearSolver), LinearSolver, "not a known linear solver");
    }
}

/// <summary>The linear solver for the head equations of <see cref="NetworkSolver"/> (a symmetric positive definite
/// system, solved once per Newton iteration).</summary>
public enum NetworkLinearSolver
{
    /// <summary>Direct: a supernodal sparse Cholesky factorisation under a nested-dissection ordering
    /// (<see cref="Networks.SparseCholesky"/>), analysed once per network and refactorised each iteration, with iterative
    /// refinement when the residual exceeds the tolerance. The default: measured 6 times faster than the
    /// conjugate-gradient path on a 10,000-pipe grid and 14 times on 100,000 (DEVELOPERS.md), exact up to rounding; it
    /// holds the factor, about 45 % more memory.</summary>
    SparseCholesky,

    /// <summary>Iterative: conjugate gradients with an incomplete Cholesky IC(0) preconditioner
    /// (<see cref="SymmetricSparseSolver"/>), warm-started from the current heads, capped at
    /// <see cref="NetworkOptions.MaxLinearIterations"/> iterations; less memory, much slower on large grids.</summary>
    ConjugateGradient,
}

/// <summary>Why a network solve stopped.</summary>
public enum NetworkStatus
{
    /// <summary>Converged with every link's status settled; every pump running.</summary>
    Solved,

    /// <summary>Converged, but at least one pump is off because the head against it exceeds its shut-off head at its
    /// speed (it cannot lift against the system); see <see cref="NetworkResult.PumpsUnableToLift"/>.</summary>
    PumpCannotLift,

    /// <summary>Not solved: part of the network has no path to a reservoir (no fixed head), so its heads are undefined;
    /// see <see cref="NetworkResult.UnsuppliedJunctions"/>. No iteration was run.</summary>
    NoPathToFixedHead,

    /// <summary>The Newton iteration cap was reached before the tolerances were met; the last iterate is reported.</summary>
    IterationCapReached,

    /// <summary>The check valves, pumps and control valves kept changing status after the last permitted status pass.</summary>
    StatusesNotSettled,

    /// <summary>The head equations could not be solved (a non-finite value, or a failed factorisation).</summary>
    LinearSolveFailed,

    /// <summary>Stopped: an iterate's flows reached Reynolds numbers beyond the friction relations' range
    /// (<see cref="Friction.DarcyFriction.MaximumReynolds"/>), so there is no answer within it (demands absurd for the pipe
    /// sizes and viscosity, most often a misplaced unit or exponent). The last iterate is reported.</summary>
    FlowsOutOfRange,

    /// <summary>Stopped: the status search of a network with control valves came back to a set of valve, check-valve and
    /// pump states it had already solved, so it would cycle for ever; the valves that changed within the cycle carry a
    /// <see cref="NetworkWarningCode.ValveStateCycle"/> warning. The last iterate is reported.</summary>
    StatusCycle,
}

/// <summary>The state of one link (pipe or pump) in a result.</summary>
public enum LinkStatus
{
    /// <summary>Open (a pump: running).</summary>
    Open,

    /// <summary>Shut by the model (<see cref="NetworkPipe.Closed"/>).</summary>
    Closed,

    /// <summary>A check valve held shut by reverse head.</summary>
    CheckValveClosed,

    /// <summary>A pump stopped: switched off (speed 0), or unable to lift against the head across it.</summary>
    PumpOff,
}

/// <summary>Stable codes and reasons for the network enums (static strings; no allocation).</summary>
public static class NetworkStatusExtensions
{
    /// <summary>Kebab-case code for wire formats.</summary>
    /// <param name="status">The status.</param>
    public static string Code(this NetworkStatus status) => status switch
    {
        NetworkStatus.Solved => "solved",
        NetworkStatus.PumpCannotLift => "pump-cannot-lift",
        NetworkStatus.NoPathToFixedHead => "no-path-to-fixed-head",
        NetworkStatus.IterationCapReached => "iteration-cap-reached",
        NetworkStatus.StatusesNotSettled => "statuses-not-settled",
        NetworkStatus.LinearSolveFailed => "linear-solve-failed",
        NetworkStatus.FlowsOutOfRange => "flows-out-of-range",
        NetworkStatus.StatusCycle => "status-cycle",
        _ => "unknown",
    };

    /// <summary>A sentence that says why the solve stopped.</summary>
    /// <param name="status">The status.</param>
    public static string Reason(this NetworkStatus status) => status switch
    {
        NetworkStatus.Solved => "converged: continuity and energy balance met at every junction and link",
        NetworkStatus.PumpCannotLift => "converged, with at least one pump stopped because it cannot lift against the system",
        NetworkStatus.NoPathToFixedHead => "not solved: some junctions have no path to a reservoir",
        NetworkStatus.IterationCapReached => "stopped: the iteration cap was reached before convergence",
        NetworkStatus.StatusesNotSettled => "stopped: check valves, pumps or control valves kept changing status",
        NetworkStatus.LinearSolveFailed => "stopped: the head equations could not be solved",
        NetworkStatus.FlowsOutOfRange => "stopped: the flows left the range of the friction relations (Reynolds number above 1e15)",
        NetworkStatus.StatusCycle => "stopped: the valve states came back to a set already solved (a cycle), so the status search cannot settle",
        _ => "unknown",
    };

    /// <summary>True for a status whose flows and heads satisfy the equations within the tolerances.</summary>
    /// <param name="status">The status.</param>
    public static bool HasAnswer(this NetworkStatus status) => status is NetworkStatus.Solved or NetworkStatus.PumpCannotLift;

    /// <summary>Kebab-case code for wire formats.</summary>
    /// <param name="status">The status.</param>
    public static string Code(this LinkStatus status) => status switch
    {
        LinkStatus.Open => "open",
        LinkStatus.Closed => "closed",
        LinkStatus.CheckValveClosed => "check-valve-closed",
        LinkStatus.PumpOff => "pump-off",
        _ => "unknown",
    };

    /// <summary>Kebab-case code for wire formats.</summary>
    /// <param name="code">The warning code.</param>
    public static string Code(this NetworkWarningCode code) => code switch
    {
        NetworkWarningCode.VelocityBelowDesignRange => "velocity-below-design-range",
        NetworkWarningCode.VelocityAboveDesignRange => "velocity-above-design-range",
        NetworkWarningCode.NegativePressure => "negative-pressure",
        NetworkWarningCode.PumpCannotLift => "pump-cannot-lift",
        NetworkWarningCode.PumpOutsideCurveRange => "pump-outside-curve-range",
        NetworkWarningCode.TransitionalFlow => "transitional-flow",
        NetworkWarningCode.DemandShortfall => "demand-shortfall",
        NetworkWarningCode.ValveStateCycle => "valve-state-cycle",
        _ => "unknown",
    };
}

/// <summary>What a network warning is about.</summary>
public enum NetworkWarningCode
{
    /// <summary>An open pipe's mean velocity is below the design range (value: |V| in m/s).</summary>
    VelocityBelowDesignRange,

    /// <summary>A pipe's mean velocity is above the design range (value: |V| in m/s).</summary>
    VelocityAboveDesignRange,

    /// <summary>A junction's head is below its elevation (value: pressure head in m).</summary>
    NegativePressure,

    /// <summary>A pump is off because the head across it exceeds its shut-off head (value: head across in m).</summary>
    PumpCannotLift,

    /// <summary>A running pump's flow (at rated speed) is beyond its curve's data range (value: rated-speed flow in m3/s).</summary>
    PumpOutsideCurveRange,

    /// <summary>A Darcy-Weisbach pipe's Reynolds number lies in the transition zone, from the laminar to the turbulent
    /// limit (2000 to 4000 by default), where the friction factor is Churchill's (1977) interpolation, as for a single
    /// pipe, joined continuously to the neighbouring laws within 5 % of each limit (<see cref="Friction.TransitionalFriction"/>;
    /// value: the Reynolds number).</summary>
    TransitionalFlow,

    /// <summary>A pressure-driven case delivers less than requested: <see cref="NetworkWarning.Count"/> junctions
    /// receive less than their demand (value: the shortfall, requested minus delivered, summed over the junctions, in
    /// m3/s). About the whole case: the element id is empty.</summary>
    DemandShortfall,

    /// <summary>A control valve changed state within a cycle of the status search (<see cref="NetworkStatus.StatusCycle"/>;
    /// value: the number of status passes run).</summary>
    ValveStateCycle,
}

/// <summary>A warning on one element; cheap to hold (no message until <see cref="Describe"/> is called).</summary>
/// <param name="ElementId">The pipe, pump or junction id.</param>
/// <param name="Code">What the warning is about.</param>
/// <param name="Value">The figure behind it (see <see cref="NetworkWarningCode"/> for its unit).</param>
public readonly record struct NetworkWarning(string ElementId, NetworkWarningCode Code, double Value)
{
    /// <summary>For <see cref="NetworkWarningCode.DemandShortfall"/>, the number of junctions that receive less than
    /// their demand; else 0.</summary>
    public int Count { get; init; }

    /// <summary>True for a warning of a pressure-driven solve (<see cref="NetworkModel.DemandModel"/> set): a
    /// negative-pressure warning then says that the junction's delivery is limited, else that the demand-driven answer
    /// delivers it in full and points to the pressure-driven model.</summary>
    public bool PressureDriven { get; init; }

    /// <summary>The coded message (allocates).</summary>
    /// <param name="options">The options of the solve, for the design range quoted; <see cref="NetworkOptions.Default"/> when omitted.</param>
    public CalculationWarning Describe(NetworkOptions? options = null)
    {
        var o = options ?? NetworkOptions.Default;
        var c = CultureInfo.InvariantCulture;
        string message = Code switch
        {
            NetworkWarningCode.VelocityBelowDesignRange => string.Format(c,
                "Pipe '{0}': mean velocity {1:G4} m/s is below {2:G3} m/s, the low end of the usual design range (common practice).",
                ElementId, Value, o.MinimumDesignVelocity),
            NetworkWarningCode.VelocityAboveDesignRange => string.Format(c,
                "Pipe '{0}': mean velocity {1:G4} m/s is above {2:G3} m/s, the high end of the usual design range (common practice).",
                ElementId, Value, o.MaximumDesignVelocity),
            NetworkWarningCode.NegativePressure => string.Format(c,
                "Junction '{0}': pressure head {1:G4} m is negative; the pipe would run below atmospheric pressure or empty. ",
                ElementId, Value) + (PressureDriven
                ? "Under pressure-driven demand the junction receives only what its pressure allows (deliveredDemand)."
                : "A demand-driven solve delivers the whole demand whatever the pressure, which overstates what the junction can draw: "
                  + "solve with pressure-driven demand (demandModel of type pressure-driven in the service, NetworkModel.DemandModel in the library) "
                  + "to deliver only what the pressure allows."),
            NetworkWarningCode.DemandShortfall => string.Format(c,
                "{0} junction{1} receive{2} less than {3} demand under pressure-driven demand: {4:G4} m3/s in all is not delivered "
                + "(requested minus delivered; see each junction's deliveredDemand).",
                Count, Count == 1 ? "" : "s", Count == 1 ? "s" : "", Count == 1 ? "its" : "their", Value),
            NetworkWarningCode.ValveStateCycle => string.Format(c,
                "Valve '{0}' changed state within a cycle of the status search ({1:G4} passes): the valve states came back to a set already solved, so no consistent set was found and the case is not converged. Check the settings of the valves named for conflicts (a pressure-reducing valve set above the head that reaches it, valves in series fighting each other).",
                ElementId, Value),
            NetworkWarningCode.PumpCannotLift => string.Format(c,
                "Pump '{0}' is off: the head of {1:G4} m across it exceeds its shut-off head at its speed.", ElementId, Value),
            NetworkWarningCode.PumpOutsideCurveRange => string.Format(c,
                "Pump '{0}': the flow {1:G4} m3/s (at rated speed) lies outside its curve's data range; the head is extrapolated.",
                ElementId, Value),
            NetworkWarningCode.TransitionalFlow => string.Format(c,
                "Pipe '{0}': Reynolds number {1:G6} lies in the transition zone ({2:G4} to {3:G4}), where flow may be laminar or " +
                "turbulent and no relation is reliable; the friction factor is Churchill's (1977) interpolation, as for a single pipe (joined smoothly to the neighbouring law within 5 % of each limit). Design for the worse case.",
                ElementId, Value, o.Friction.LaminarLimit, o.Friction.TurbulentLimit),
            _ => ElementId,
        };
        return new CalculationWarning(Code.Code(), message);
    }
}

/// <summary>One pipe in a result.</summary>
/// <param name="Id">The pipe's id.</param>
/// <param name="Flow">Flow in m3/s, positive from the pipe's From node to its To node.</param>
/// <param name="Velocity">Mean velocity Q/A in m/s, signed like <paramref name="Flow"/>.</param>
/// <param name="HeadLoss">H_from - H_to in m: for an open pipe the friction and minor loss (signed like the flow), for a
/// closed one the head held across it.</param>
/// <param name="FrictionFactor">Darcy friction factor f (for a Hazen-Williams pipe, the equivalent f = 2 g D hf/(L V^2));
/// 0 at zero flow; NaN where the flow is beyond Reynolds 1e15 (only in a <see cref="NetworkStatus.FlowsOutOfRange"/> result).</param>
/// <param name="Status">Open, closed or check-valve-closed.</param>
public readonly record struct PipeResult(string Id, double Flow, double Velocity, double HeadLoss, double FrictionFactor, LinkStatus Status);

/// <summary>One pump in a result.</summary>
/// <param name="Id">The pump's id.</param>
/// <param name="Flow">Flow in m3/s from suction to delivery (0 when off).</param>
/// <param name="Head">Head added H_to - H_from in m (for a stopped pump, the head across it).</param>
/// <param name="Status">Open (running) or pump-off.</param>
public readonly record struct PumpResult(string Id, double Flow, double Head, LinkStatus Status);

/// <summary>One junction in a result.</summary>
/// <param name="Id">The junction's id.</param>
/// <param name="Head">Total (piezometric) head H in m above the datum.</param>
/// <param name="PressureHead">H - elevation in m.</param>
/// <param name="Demand">The demand applied (requested) in m3/s: the model's demand times the load case's multiplier.</param>
public readonly record struct JunctionResult(string Id, double Head, double PressureHead, double Demand)
{
    /// <summary>The flow the junction receives in m3/s: <see cref="Demand"/> itself in a demand-driven solve (and for an
    /// inflow); under pressure-driven demand d r(p) by the exact law of <see cref="PressureDrivenDemand"/> at
    /// <see cref="PressureHead"/>; 0 where the network could not be solved (no path to a fixed head).</summary>
    public double DeliveredDemand { get; init; }
}

/// <summary>One reservoir in a result.</summary>
/// <param name="Id">The reservoir's id.</param>
/// <param name="Head">Its fixed head in m.</param>
/// <param name="Outflow">Net flow out of it into the network in m3/s (negative when it fills).</param>
public readonly record struct ReservoirResult(string Id, double Head, double Outflow);

/// <summary>One Newton iteration of a network solve.</summary>
/// <param name="Iteration">1-based, counted over all status passes.</param>
/// <param name="StatusPass">1-based status pass the iteration belongs to.</param>
/// <param name="MaxFlowChange">Largest |Q_new - Q_old| over the links in this step, in m3/s.</param>
/// <param name="MaxHeadImbalance">Largest |H_from - H_to - h(Q)| over the open links after the step, in m; under
/// pressure-driven demand also each such junction's |H - z - min - (req - min) s(u)| (its head against its point on the
/// law's graph).</param>
/// <param name="MaxContinuityError">Largest |inflow - outflow - demand| over the junctions after the step, in m3/s; under
/// pressure-driven demand with the delivery in place of the demand, both the iterate's and the exact law's d r(p).</param>
/// <param name="LinearIterations">Conjugate-gradient iterations of this step's head solve; for the direct solve
/// (<see cref="NetworkLinearSolver.SparseCholesky"/>), triangular solves with the factor (1, plus one per refinement step).</param>
public readonly record struct NetworkIteration(
    int Iteration, int StatusPass, double MaxFlowChange, double MaxHeadImbalance, double MaxContinuityError, int LinearIterations);

/// <summary>The result of a network solve: flows, heads, totals, how it was reached, and warnings. Immutable.</summary>
/// <remarks>Hydraulic results are engineering estimates to be checked by a qualified engineer.</remarks>
public sealed class NetworkResult
{
    private readonly IReadOnlyDictionary<string, int> _linkIndex, _nodeIndex;

    internal NetworkResult(NetworkStatus status, double multiplier, PipeResult[] pipes, PumpResult[] pumps,
        JunctionResult[] junctions, ReservoirResult[] reservoirs, NetworkIteration[] record, int statusPasses,
        string[] unsupplied, string[] pumpsUnableToLift, NetworkWarning[] warnings,
        IReadOnlyDictionary<string, int> linkIndex, IReadOnlyDictionary<string, int> nodeIndex)
    {
        Status = status;
        DemandMultiplier = multiplier;
        Pipes = pipes;
        Pumps = pumps;
        Junctions = junctions;
        Reservoirs = reservoirs;
        Record = record;
        StatusPasses = statusPasses;
        UnsuppliedJunctions = unsupplied;
        PumpsUnableToLift = pumpsUnableToLift;
        Warnings = warnings;
        _linkIndex = linkIndex;
        _nodeIndex = nodeIndex;
        double demand = 0, supply = 0, delivered = 0, shortfall = 0;
        foreach (var j in junctions)
        {
            demand += j.Demand;
            delivered += j.DeliveredDemand;
            shortfall += j.Demand - j.DeliveredDemand;
        }
        foreach (var r in reservoirs) supply += r.Outflow;
        TotalDemand = demand;
        TotalSupply = supply;
        TotalDeliveredDemand = delivered;
        DemandShortfall = shortfall;
    }

    /// <summary>Why the solve stopped.</summary>
    public NetworkStatus Status { get; }

    /// <summary>True when the flows and heads meet the tolerances (<see cref="NetworkStatus.Solved"/> or
    /// <see cref="NetworkStatus.PumpCannotLift"/>).</summary>
    public bool Converged => Status.HasAnswer();

    /// <summary>Newton iterations over all status passes (the length of <see cref="Record"/>).</summary>
    public int Iterations => Record.Count;

    /// <summary>Status passes run (1 when no check valve or pump changed status).</summary>
    public int StatusPasses { get; }

    /// <summary>The multiplier applied to every demand.</summary>
    public double DemandMultiplier { get; }

    /// <summary>Pipes in model order.</summary>
    public IReadOnlyList<PipeResult> Pipes { get; }

    /// <summary>Pumps in model order.</summary>
    public IReadOnlyList<PumpResult> Pumps { get; }

    /// <summary>Junctions in model order.</summary>
    public IReadOnlyList<JunctionResult> Junctions { get; }

    /// <summary>Reservoirs in model order.</summary>
    public IReadOnlyList<ReservoirResult> Reservoirs { get; }

    /// <summary>Sum of the junction demands applied, in m3/s.</summary>
    public double TotalDemand { get; }

    /// <summary>Sum of the reservoirs' net outflows, in m3/s (equals <see cref="TotalDeliveredDemand"/>, and in a
    /// demand-driven solve <see cref="TotalDemand"/>, within the flow tolerance times the number of junctions).</summary>
    public double TotalSupply { get; }

    /// <summary>Sum of the junctions' delivered demands (<see cref="JunctionResult.DeliveredDemand"/>), in m3/s; equal to
    /// <see cref="TotalDemand"/> in a demand-driven solve.</summary>
    public double TotalDeliveredDemand { get; }

    /// <summary>Requested minus delivered demand summed over the junctions, in m3/s: 0 in a demand-driven solve, 0 or
    /// more under pressure-driven demand.</summary>
    public double DemandShortfall { get; }

    /// <summary>The pressure-driven demand law of the solve, or null for demand-driven.</summary>
    public PressureDrivenDemand? DemandModel { get; init; }

    /// <summary>Control valves in model order (empty without valves).</summary>
    public IReadOnlyList<ValveResult> Valves { get; init; } = [];

    /// <summary>The control valve with this id.</summary>
    /// <param name="id">A valve id of the model.</param>
    /// <exception cref="KeyNotFoundException">No valve has this id.</exception>
    public ValveResult Valve(string id)
    {
        foreach (var v in Valves) if (v.Id == id) return v;
        throw new KeyNotFoundException($"no valve '{id}'");
    }

    /// <summary>One row per Newton iteration.</summary>
    public IReadOnlyList<NetworkIteration> Record { get; }

    /// <summary>Junctions with no path to a reservoir (for <see cref="NetworkStatus.NoPathToFixedHead"/>; else empty).</summary>
    public IReadOnlyList<string> UnsuppliedJunctions { get; }

    /// <summary>Pumps that are off because they cannot lift against the system (switched-off pumps are not listed).</summary>
    public IReadOnlyList<string> PumpsUnableToLift { get; }

    /// <summary>Velocity, pressure and pump warnings (see <see cref="NetworkWarning.Describe"/> for messages).</summary>
    public IReadOnlyList<NetworkWarning> Warnings { get; }

    /// <summary>The pipe with this id.</summary>
    /// <param name="id">A pipe id of the model.</param>
    /// <exception cref="KeyNotFoundException">No pipe has this id.</exception>
    public PipeResult Pipe(string id) =>
        _linkIndex.TryGetValue(id, out int k) && k >= 0 ? Pipes[k] : throw new KeyNotFoundException($"no pipe '{id}'");

    /// <summary>The pump with this id.</summary>
    /// <param name="id">A pump id of the model.</param>
    /// <exception cref="KeyNotFoundException">No pump has this id.</exception>
    public PumpResult Pump(string id) =>
        _linkIndex.TryGetValue(id, out int k) && k < 0 ? Pumps[~k] : throw new KeyNotFoundException($"no pump '{id}'");

    /// <summary>The junction with this id.</summary>
    /// <param name="id">A junction id of the model.</param>
    /// <exception cref="KeyNotFoundException">No junction has this id.</exception>
    public JunctionResult Junction(string id) =>
        _nodeIndex.TryGetValue(id, out int k) && k >= 0 ? Junctions[k] : throw new KeyNotFoundException($"no junction '{id}'");

    /// <summary>The reservoir with this id.</summary>
    /// <param name="id">A reservoir id of the model.</param>
    /// <exception cref="KeyNotFoundException">No reservoir has this id.</exception>
    public ReservoirResult Reservoir(string id) =>
        _nodeIndex.TryGetValue(id, out int k) && k < 0 ? Reservoirs[~k] : throw new KeyNotFoundException($"no reservoir '{id}'");
}
