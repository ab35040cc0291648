namespace FlowSolve.Core.Networks;

/// <summary>A storage tank: a vertical cylinder whose water level moves with the net inflow of its links.</summary>
/// <param name="Id">Identifier, unique among the nodes (junctions, reservoirs and tanks); not empty.</param>
/// <param name="Elevation">Elevation of the tank's bottom in m above the datum; finite. Its head is Elevation + level.</param>
/// <param name="InitialLevel">Level at time 0 in m above the bottom; within [MinimumLevel, MaximumLevel].</param>
/// <param name="MinimumLevel">Lowest level in m above the bottom (the tank is empty there); 0 or more.</param>
/// <param name="MaximumLevel">Highest level in m above the bottom (the tank is full there); above MinimumLevel.</param>
/// <param name="Diameter">Inside diameter of the cylinder in m; finite and positive.</param>
public sealed record Tank(string Id, double Elevation, double InitialLevel, double MinimumLevel, double MaximumLevel, double Diameter)
{
    /// <summary>Plan area pi D^2 / 4 in m2.</summary>
    public double Area => Math.PI * Diameter * Diameter / 4;
}

/// <summary>A demand pattern: multipliers of a junction's demand, one per pattern step, repeating.</summary>
/// <param name="Id">Identifier, unique among the patterns; not empty.</param>
/// <param name="Multipliers">At least one; each finite and 0 or more. Multiplier k applies on
/// [k x patternStep, (k + 1) x patternStep), and the list repeats.</param>
public sealed record DemandPattern(string Id, IReadOnlyList<double> Multipliers);

/// <summary>What a control does to its link when it fires.</summary>
/// <param name="Open">For <c>set.status</c>: true opens the link, false closes it; null when the control sets a speed.</param>
/// <param name="SpeedRatio">For <c>set.speedRatio</c> (pumps only): the new n/n_rated; null when the control sets a status.</param>
public sealed record ControlAction(bool? Open, double? SpeedRatio);

/// <summary>When a control fires: a tank level crossing a threshold, or a time.</summary>
/// <param name="TankId">For a level condition, the tank; null for a time condition.</param>
/// <param name="LevelBelow">Fires when the tank's level falls below this (m above the bottom).</param>
/// <param name="LevelAbove">Fires when the tank's level rises above this (m above the bottom).</param>
/// <param name="Time">Fires at this time in s from the start.</param>
/// <remarks>Exactly one of <paramref name="LevelBelow"/>, <paramref name="LevelAbove"/> (with <paramref name="TankId"/>)
/// and <paramref name="Time"/> is given. A level condition that already holds at time 0 fires at time 0.</remarks>
public sealed record ControlCondition(string? TankId, double? LevelBelow, double? LevelAbove, double? Time);

/// <summary>A rule that changes a pipe's, pump's or valve's status (or a pump's speed) when its condition is met.</summary>
/// <param name="LinkId">The pipe, pump or valve it acts on.</param>
/// <param name="Set">What it does.</param>
/// <param name="When">When it does it.</param>
public sealed record NetworkControl(string LinkId, ControlAction Set, ControlCondition When);

/// <summary>An extended-period run: a network, its tanks, demand patterns and controls, over a duration.</summary>
/// <param name="Network">The network; its reservoirs keep fixed heads. Tanks are not in it: they are added here.</param>
/// <param name="Tanks">Storage tanks (nodes whose head follows their level); may be empty.</param>
/// <param name="Patterns">Demand patterns; may be empty.</param>
/// <param name="JunctionPatterns">Junction id to pattern id, for the junctions whose demand follows a pattern;
/// the others keep their demand all along.</param>
/// <param name="Controls">Controls, in the order given (when two fire at the same instant on one link, the later wins).</param>
/// <param name="Duration">Length of the run in s; finite, 0 or more.</param>
/// <param name="ReportStep">Interval between reported states in s; finite and positive. Reports are at every
/// multiple of it from 0 to Duration (and at Duration).</param>
/// <param name="PatternStep">Length of one pattern multiplier in s; finite and positive.</param>
public sealed record SimulationModel(
    NetworkModel Network,
    IReadOnlyList<Tank> Tanks,
    IReadOnlyList<DemandPattern> Patterns,
    IReadOnlyDictionary<string, string> JunctionPatterns,
    IReadOnlyList<NetworkControl> Controls,
    double Duration,
    double ReportStep = 3600,
    double PatternStep = 3600);

/// <summary>Accuracy and limits of an extended-period run.</summary>
/// <param name="LevelTolerance">Local error allowed per integration step in a tank level, m (the reported levels are
/// meant to be within 1 mm of the exact solution of the mass balance). The default, 2e-5 m, keeps the accumulated error
/// of a day's run well inside 1 mm: with 1e-4 m the errors of the steps of a pump's running periods add up to about
/// 0.5 mm in the tests' two-tank case, with 2e-5 m to 0.09 mm at a sixth more steps.</param>
/// <param name="EventTimeTolerance">How closely an event's time is located, s.</param>
/// <param name="MaxSteps">Most integration steps (accepted and rejected) before the run stops unfinished.</param>
/// <param name="Network">Options of every network solve.</param>
public sealed record SimulationOptions(
    double LevelTolerance = 2e-5,
    double EventTimeTolerance = 0.01,
    int MaxSteps = 100_000,
    NetworkOptions? Network = null)
{
    /// <summary>Every network solve from the default start instead of the previous state (for measuring what the warm
    /// start saves; slower, same answers to the solve's tolerances).</summary>
    internal bool ColdStarts { get; init; }

    /// <summary>Every stage's network solve to the network's own tolerances instead of the looser stopping rule derived
    /// from <see cref="LevelTolerance"/> (for the test that holds the two runs together and the benchmark that compares
    /// them).</summary>
    internal bool StrictStages { get; init; }
}

/// <summary>Why an extended-period run stopped.</summary>
public enum SimulationStatus
{
    /// <summary>The run reached its duration and every network solve converged.</summary>
    Completed,
    /// <summary>A network solve did not converge; the run stopped at the last time it had an answer.</summary>
    NetworkNotConverged,
    /// <summary>The time budget (cancellation) ran out; the run stopped at the last step boundary.</summary>
    Cancelled,
    /// <summary><see cref="SimulationOptions.MaxSteps"/> was reached.</summary>
    TooManySteps,
}

/// <summary>A tank's state at a reported time.</summary>
/// <param name="Id">The tank.</param>
/// <param name="Level">Level above the bottom, m.</param>
/// <param name="Head">Elevation + level, m.</param>
/// <param name="Inflow">Net inflow from its links, m3/s (negative when it drains).</param>
/// <param name="AtLimit">"full", "empty", or null when the level is between its limits.</param>
public readonly record struct TankState(string Id, double Level, double Head, double Inflow, string? AtLimit);

/// <summary>One reported state: the network's flows and heads and the tanks' levels at a time.</summary>
/// <param name="Time">s from the start.</param>
/// <param name="Network">The network solve at that time (tanks appear in it as reservoirs at their heads, or as
/// junctions when held at a limit).</param>
/// <param name="Tanks">Each tank's state, in the order of <see cref="SimulationModel.Tanks"/>.</param>
public sealed record SimulationReport(double Time, NetworkResult Network, IReadOnlyList<TankState> Tanks);

/// <summary>Something that happened during the run, located in time.</summary>
/// <param name="Time">s from the start, located to within <see cref="SimulationOptions.EventTimeTolerance"/>.</param>
/// <param name="Kind"><c>tank-full</c>, <c>tank-empty</c> or <c>control</c>.</param>
/// <param name="ElementId">The tank, or the link the control acted on.</param>
/// <param name="Change">For people: what changed (for instance "closed", "speedRatio 0.8").</param>
/// <param name="TimeResidual">For an event located by Newton's method on the interpolant: the level residual at the
/// located time, m; 0 for a time control.</param>
/// <param name="Iterations">Newton iterations that located it (0 for a time control).</param>
public readonly record struct SimulationEvent(double Time, string Kind, string ElementId, string Change, double TimeResidual, int Iterations);

/// <summary>One accepted integration step.</summary>
/// <param name="Start">s.</param>
/// <param name="End">s.</param>
/// <param name="NetworkSolves">Network solves the step took (its stages, plus those of rejected attempts).</param>
/// <param name="NetworkIterations">Newton iterations of those solves, summed.</param>
/// <param name="ErrorEstimate">The embedded error estimate of the level, m (largest over the tanks).</param>
/// <param name="Rejected">Attempts rejected before this step was accepted.</param>
public readonly record struct SimulationStep(double Start, double End, int NetworkSolves, int NetworkIterations, double ErrorEstimate, int Rejected);

/// <summary>The result of an extended-period run. Immutable.</summary>
/// <param name="Status">Why it stopped.</param>
/// <param name="ReachedTime">The time up to which the run has an answer, s (the duration when completed).</param>
/// <param name="Reports">One per report time reached, in time order.</param>
/// <param name="Events">In time order.</param>
/// <param name="Steps">Accepted integration steps, in time order.</param>
/// <param name="NetworkSolves">All network solves of the run.</param>
/// <param name="Method">The integration method, for people (for instance "Bogacki-Shampine 3(2), adaptive").</param>
/// <remarks>Hydraulic results are engineering estimates to be checked by a qualified engineer; tank levels and flows
/// are modelled, not water quality or surge.</remarks>
public sealed record SimulationResult(
    SimulationStatus Status,
    double ReachedTime,
    IReadOnlyList<SimulationReport> Reports,
    IReadOnlyList<SimulationEvent> Events,
    IReadOnlyList<SimulationStep> Steps,
    int NetworkSolves,
    string Method)
{
    /// <summary>True when the run reached its duration with every solve converged.</summary>
    public bool Completed => Status == SimulationStatus.Completed;
}
