using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>How many depths satisfy the equation on the section's depth range.</summary>
public enum DepthSolution
{
    /// <summary>Exactly one depth.</summary>
    Unique,

    /// <summary>More than one depth; the lowest is the primary answer and the others are listed as alternates.</summary>
    Multiple,

    /// <summary>No depth: for normal depth, the flow exceeds the section's capacity; for critical depth, it would lie above the section.</summary>
    None,
}

/// <summary>The state of flow, from the Froude number.</summary>
public enum FroudeRegime
{
    /// <summary>Froude number below 0.99: tranquil flow, controlled from downstream.</summary>
    Subcritical,

    /// <summary>Froude number within 1 % of 1.</summary>
    Critical,

    /// <summary>Froude number above 1.01: rapid flow, controlled from upstream.</summary>
    Supercritical,
}

/// <summary>The most a closed or surveyed section can carry in uniform flow at a given slope and n.</summary>
/// <param name="MaximumFlow">The largest Manning discharge over the section's depth range, m3/s.</param>
/// <param name="DepthAtMaximumFlow">The depth at which it occurs, m (about 0.938 D for a circle).</param>
/// <param name="FullFlow">The discharge at <see cref="ChannelSection.MaximumDepth"/>, m3/s: the full-pipe flow, or the flow at the lower bank top.</param>
/// <param name="FullDepth">That depth, m: the diameter, or the lower bank top above the invert.</param>
public readonly record struct ChannelCapacity(double MaximumFlow, double DepthAtMaximumFlow, double FullFlow, double FullDepth);

/// <summary>Whether the roughness used lies within the range of tabulated Manning n values.</summary>
/// <param name="EffectiveManningN">The n used at the solved depth (the Horton-Einstein composite where segments differ), s m^-1/3.</param>
/// <param name="InTypicalRange">True when <paramref name="EffectiveManningN"/> lies in [<see cref="TypicalLowestN"/>, <see cref="TypicalHighestN"/>].</param>
public readonly record struct ManningValidity(double EffectiveManningN, bool InTypicalRange)
{
    /// <summary>
    /// Lowest tabulated n considered typical, 0.008 (smooth glass-like and plastic surfaces; from memory, Chow 1959,
    /// Open-Channel Hydraulics, Table 5-6, rounded down).
    /// </summary>
    public const double TypicalLowestN = 0.008;

    /// <summary>
    /// Highest tabulated n considered typical, 0.20 (densely wooded flood plains; from memory, Chow 1959, Table 5-6,
    /// rounded up).
    /// </summary>
    public const double TypicalHighestN = 0.20;

    /// <summary>
    /// What Manning's equation assumes: steady uniform flow, fully rough turbulence, an n that does not vary with depth
    /// (common practice).
    /// </summary>
    public const string Range = "Manning's equation: steady uniform flow in the fully rough turbulent regime, n independent of depth; tabulated n from 0.008 to 0.20";

    internal static ManningValidity For(double n) => new(n, n >= TypicalLowestN && n <= TypicalHighestN);

    /// <summary>The range of typical tabulated n beside the n used, as a validity entry.</summary>
    public ValidityCheck Check => new("manning",
        "typical tabulated n, Chow 1959, Open-Channel Hydraulics, Table 5-6 (from memory); " + Range,
        "manningN", TypicalLowestN, TypicalHighestN, EffectiveManningN);
}

/// <summary>
/// The critical depth of a flow in a section (Q^2 T = g A^3), with the flow at that depth and how it was found.
/// Hydraulic results are engineering estimates to be checked by a qualified engineer.
/// </summary>
/// <remarks>
/// When <see cref="Solution"/> is <see cref="DepthSolution.None"/> the depth-dependent fields are NaN: callers that
/// serialise the result must test <see cref="Solution"/> first.
/// </remarks>
public readonly record struct CriticalDepthResult
{
    /// <summary>Critical depth y_c, m (the lowest, when there are several).</summary>
    public double CriticalDepth { get; init; }

    /// <summary>Flow area at critical depth, m2.</summary>
    public double Area { get; init; }

    /// <summary>Top width at critical depth, m.</summary>
    public double TopWidth { get; init; }

    /// <summary>Hydraulic depth A/T at critical depth, m.</summary>
    public double HydraulicDepth { get; init; }

    /// <summary>Mean velocity at critical depth, m/s.</summary>
    public double Velocity { get; init; }

    /// <summary>Specific energy y + V^2/(2g) at critical depth, m: the least energy with which the section passes the flow (energy coefficient 1).</summary>
    public double SpecificEnergy { get; init; }

    /// <summary>
    /// The critical slope, dimensionless: the bed slope whose normal depth is the critical depth, (Q / K(y_c))^2 with K the
    /// Manning conveyance. NaN when no Manning n was given.
    /// </summary>
    public double CriticalSlope { get; init; }

    /// <summary>Further critical depths above <see cref="CriticalDepth"/>, m, ascending; empty when the depth is unique.</summary>
    public IReadOnlyList<double> AlternateCriticalDepths { get; init; }

    /// <summary>Whether the critical depth is unique, multiple or absent from the section.</summary>
    public DepthSolution Solution { get; init; }

    /// <summary>Newton iterations over all the solves.</summary>
    public int Iterations { get; init; }

    /// <summary>True when every solve met its tolerances.</summary>
    public bool Converged { get; init; }

    /// <summary>ln(g A^3 / (Q^2 T)) at <see cref="CriticalDepth"/>: the relative mismatch of the critical-flow condition.</summary>
    public double Residual { get; init; }

    /// <summary>Why the solve for <see cref="CriticalDepth"/> stopped (<see cref="SolveStatus.NoSignChange"/> when there is no critical depth).</summary>
    public SolveStatus Status { get; init; }

    /// <summary>The method, for a reviewer.</summary>
    public string Method { get; init; }

    /// <summary>Warnings for the engineer; empty when there are none.</summary>
    public IReadOnlyList<ChannelWarning> Warnings { get; init; }
}

/// <summary>
/// The normal (uniform-flow) depth of a flow from Manning's equation, with the flow state at that depth and how it was
/// found. Hydraulic results are engineering estimates to be checked by a qualified engineer.
/// </summary>
/// <remarks>
/// When <see cref="Solution"/> is <see cref="DepthSolution.None"/> (the flow exceeds the section's capacity) the
/// depth-dependent fields are NaN and <see cref="Capacity"/> says what the section can carry: an API answers 422 with it.
/// </remarks>
public readonly record struct NormalDepthResult
{
    /// <summary>Normal depth y_n, m: the lowest depth that carries the flow (the usual design answer; see the warnings when there are more).</summary>
    public double NormalDepth { get; init; }

    /// <summary>The other normal depth, m, when there are two or more (the next one above <see cref="NormalDepth"/>); null otherwise.</summary>
    public double? AlternateNormalDepth { get; init; }

    /// <summary>Every normal depth above <see cref="NormalDepth"/>, m, ascending; empty when the depth is unique.</summary>
    public IReadOnlyList<double> AlternateNormalDepths { get; init; }

    /// <summary>Whether the normal depth is unique, multiple or absent.</summary>
    public DepthSolution Solution { get; init; }

    /// <summary>Flow area at normal depth, m2.</summary>
    public double Area { get; init; }

    /// <summary>Wetted perimeter at normal depth, m.</summary>
    public double WettedPerimeter { get; init; }

    /// <summary>Hydraulic radius A/P at normal depth, m.</summary>
    public double HydraulicRadius { get; init; }

    /// <summary>Top width at normal depth, m.</summary>
    public double TopWidth { get; init; }

    /// <summary>Hydraulic depth A/T at normal depth, m.</summary>
    public double HydraulicDepth { get; init; }

    /// <summary>Mean velocity Q/A, m/s.</summary>
    public double Velocity { get; init; }

    /// <summary>Froude number V / sqrt(g A/T), on the hydraulic depth, dimensionless.</summary>
    public double FroudeNumber { get; init; }

    /// <summary>Flow regime from the Froude number.</summary>
    public FroudeRegime Regime { get; init; }

    /// <summary>Specific energy y + V^2/(2g) at normal depth, m (energy coefficient 1).</summary>
    public double SpecificEnergy { get; init; }

    /// <summary>The Manning n at normal depth, s m^-1/3: the given n, or the Horton-Einstein composite for a section with segment roughness.</summary>
    public double EffectiveManningN { get; init; }

    /// <summary>Critical depth of the same flow, m (NaN when it would lie above the section).</summary>
    public double CriticalDepth { get; init; }

    /// <summary>Critical slope for the same flow and roughness, dimensionless (NaN when there is no critical depth).</summary>
    public double CriticalSlope { get; init; }

    /// <summary>The full critical-depth result (its own iterations, status and warnings).</summary>
    public CriticalDepthResult Critical { get; init; }

    /// <summary>For a circle or a surveyed section, its capacity at this slope and n; null for the open prismatic shapes.</summary>
    public ChannelCapacity? Capacity { get; init; }

    /// <summary>Newton iterations over all the normal-depth solves (the critical-depth solve counts separately).</summary>
    public int Iterations { get; init; }

    /// <summary>True when every normal-depth solve met its tolerances; false when there is no normal depth.</summary>
    public bool Converged { get; init; }

    /// <summary>ln(Q(y_n) / Q) at <see cref="NormalDepth"/>: the relative discharge mismatch of the solution.</summary>
    public double Residual { get; init; }

    /// <summary>Why the solve for <see cref="NormalDepth"/> stopped (<see cref="SolveStatus.NoSignChange"/> when the flow exceeds capacity).</summary>
    public SolveStatus Status { get; init; }

    /// <summary>The method, for a reviewer (Manning, and Horton-Einstein where the roughness is composite).</summary>
    public string Method { get; init; }

    /// <summary>The roughness range check.</summary>
    public ManningValidity Validity { get; init; }

    /// <summary>Warnings for the engineer; empty when there are none.</summary>
    public IReadOnlyList<ChannelWarning> Warnings { get; init; }
}
