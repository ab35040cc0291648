using System.Globalization;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>
/// Normal (uniform-flow) depth from Manning's equation Q = (1/n) A R^(2/3) sqrt(S), SI with k = 1. Pure SI; thread-safe;
/// allocation-free for the prismatic shapes and for a circle with one normal depth.
/// </summary>
/// <remarks>
/// <para>US customary inputs are converted at the API boundary: lengths at 0.3048 m/ft exactly, n unchanged. The
/// customary constant 1.486 is then implied, since (1/0.3048)^(1/3) = 1.4859 (<see cref="UsCustomaryCoefficient"/>).</para>
/// <para>The equation is solved for ln K(y) = ln(Q / sqrt(S)), K = A^(5/3) / (n P^(2/3)) the conveyance, a residual that
/// is nearly linear in ln y. Open prismatic shapes (rectangle, trapezoid, V) have a conveyance that rises with depth,
/// d ln K / d ln y lying between 1 and 10/3, so one normal depth exists; the solve runs in u = ln y from a wide-channel
/// or V-section estimate with a bracket that follows from those slope bounds.</para>
/// <para>A circle's discharge peaks at y/D of about 0.938 (<see cref="CircularSection.PeakDischargeDepthRatio"/>) and falls
/// to the full-pipe value at the crown: a flow above the peak has no normal depth, one between the full-pipe flow and the
/// peak has two (both are returned, the lower as <see cref="NormalDepthResult.NormalDepth"/>, with a
/// <see cref="ChannelWarningCode.TwoNormalDepths"/> warning), and one at or below the full-pipe flow has one.</para>
/// <para>A surveyed section's conveyance need not rise monotonically (single-section Horton-Einstein roughness, flat
/// overbanks): every depth on [0, MaximumDepth] that carries the flow is found, by splitting the range at the survey
/// points and at the conveyance's stationary points (roots of a quadratic between survey points) into monotone pieces and
/// solving each piece that brackets a root. A flow above the section's greatest conveyance (it overtops the lower bank)
/// has no normal depth.</para>
/// <para>The result also carries the critical depth and slope (<see cref="CriticalFlow"/>), the Froude number on the
/// hydraulic depth A/T, the regime, and the specific energy with an energy coefficient of 1.</para>
/// </remarks>
public static class ManningSolver
{
    /// <summary>
    /// The Manning constant for US customary units, 1.486 (common practice; 1.49 is the usual rounding): the k in
    /// Q = (k/n) A R^(2/3) sqrt(S) with feet and seconds. Core works in SI (k = 1); this is for documentation and for callers
    /// that must quote it.
    /// </summary>
    public const double UsCustomaryCoefficient = 1.486;

    /// <summary>Mean velocity above which a normal-depth answer warns, m/s: 6 m/s, the usual upper limit for concrete
    /// linings (common practice; earth and grass channels scour at well under half of it).</summary>
    public const double MaximumDesignVelocity = 6.0;

    /// <summary>Mean velocity below which a normal-depth answer warns, m/s: 0.3 m/s, below which silt settles and weeds
    /// grow in open channels (common practice; sewers aim at 0.6 m/s or more for self-cleansing).</summary>
    public const double MinimumDesignVelocity = 0.3;

    /// <summary>Froude number above which a normal-depth answer warns: 2 (a band chosen here; lined chutes are designed
    /// above it, ordinary channels never).</summary>
    public const double MaximumDesignFroudeNumber = 2.0;

    /// <summary>Froude numbers within this band around 1 raise <see cref="ChannelWarningCode.NearCritical"/>: 0.9 to 1.1 (a band chosen here).</summary>
    public const double NearCriticalBand = 0.1;

    private const string MethodSingle = "Manning (SI, k = 1), normal depth by safeguarded Newton on ln K(y) = ln(Q/sqrt(S))";
    private const string MethodComposite = "Manning (SI, k = 1) with Horton-Einstein composite roughness n = [sum(P_i n_i^1.5)/P]^(2/3), normal depth by safeguarded Newton on ln K(y) = ln(Q/sqrt(S))";

    /// <summary>The normal depth of a flow in a section with a Manning n.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="slope">Bed (energy) slope S, m/m; finite and greater than zero.</param>
    /// <param name="manningN">
    /// Manning n, s m^-1/3 (SI); finite and greater than zero. For a surveyed section with segment roughness, the n of the
    /// segments that have none of their own.
    /// </param>
    /// <returns>
    /// The normal depth with the flow at it, the critical depth and slope, the regime, the solve's iterations and status,
    /// and warnings; <see cref="NormalDepthResult.Solution"/> says whether there are one, several or no normal depths.
    /// </returns>
    /// <exception cref="ArgumentNullException"><paramref name="section"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException">The flow, slope or n is not positive and finite.</exception>
    public static NormalDepthResult NormalDepth(ChannelSection section, double flow, double slope, double manningN) =>
        NormalDepth(section, flow, slope, manningN, null);

    /// <summary>As <see cref="NormalDepth(ChannelSection, double, double, double)"/>, recording the solve of the reported
    /// depth in <paramref name="trace"/> (in ln y for the prismatic shapes, in y for the circle and a surveyed section).</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="slope">Bed (energy) slope S, m/m; finite and greater than zero.</param>
    /// <param name="manningN">Manning n, s m^-1/3 (SI); finite and greater than zero.</param>
    /// <param name="trace">The per-iteration record to fill, or null.</param>
    public static NormalDepthResult NormalDepth(ChannelSection section, double flow, double slope, double manningN, SolverTrace? trace)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(flow, nameof(flow));
        ChannelGuard.Positive(slope, nameof(slope));
        ChannelGuard.Positive(manningN, nameof(manningN));
        return Solve(section, flow, slope, manningN, trace);
    }

    /// <summary>The normal depth of a flow in a section that carries its own roughness on every segment (a surveyed section with a full set of segment n).</summary>
    /// <param name="section">The cross-section; <see cref="ChannelSection.HasOwnRoughness"/> must be true.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="slope">Bed (energy) slope S, m/m; finite and greater than zero.</param>
    /// <returns>As for <see cref="NormalDepth(ChannelSection, double, double, double)"/>.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="section"/> is null.</exception>
    /// <exception cref="ArgumentException">The section does not carry its own roughness on every segment.</exception>
    /// <exception cref="ArgumentOutOfRangeException">The flow or slope is not positive and finite.</exception>
    public static NormalDepthResult NormalDepth(ChannelSection section, double flow, double slope) => NormalDepth(section, flow, slope, (SolverTrace?)null);

    /// <summary>As <see cref="NormalDepth(ChannelSection, double, double)"/>, recording the solve of the reported depth in <paramref name="trace"/>.</summary>
    /// <param name="section">The cross-section; <see cref="ChannelSection.HasOwnRoughness"/> must be true.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="slope">Bed (energy) slope S, m/m; finite and greater than zero.</param>
    /// <param name="trace">The per-iteration record to fill, or null.</param>
    public static NormalDepthResult NormalDepth(ChannelSection section, double flow, double slope, SolverTrace? trace)
    {
        ArgumentNullException.ThrowIfNull(section);
        RequireOwnRoughness(section);
        ChannelGuard.Positive(flow, nameof(flow));
        ChannelGuard.Positive(slope, nameof(slope));
        return Solve(section, flow, slope, 0.0, trace);
    }

    /// <summary>The Manning discharge at a given depth, Q = K(y) sqrt(S), m3/s.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="depth">Flow depth above the invert, m; greater than zero and at most <see cref="ChannelSection.MaximumDepth"/>.</param>
    /// <param name="slope">Bed slope S, m/m; finite and greater than zero.</param>
    /// <param name="manningN">Manning n, s m^-1/3; finite and greater than zero (for segments without their own n).</param>
    /// <returns>The discharge, m3/s.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="section"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException">A value is out of range.</exception>
    public static double Discharge(ChannelSection section, double depth, double slope, double manningN)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(depth, nameof(depth));
        ChannelGuard.Depth(depth, section.MaximumDepth, nameof(depth));
        ChannelGuard.Positive(slope, nameof(slope));
        ChannelGuard.Positive(manningN, nameof(manningN));
        return section.Evaluate(depth).Conveyance(manningN) * Math.Sqrt(slope);
    }

    /// <summary>
    /// The capacity of a circle or a surveyed section at a slope and n: its greatest Manning discharge and where it occurs,
    /// and the discharge when full (to the crown or the lower bank top). Null for the open prismatic shapes, which have no limit.
    /// </summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="slope">Bed slope S, m/m; finite and greater than zero.</param>
    /// <param name="manningN">Manning n, s m^-1/3; finite and greater than zero (for segments without their own n).</param>
    /// <returns>The capacity, or null for an open prismatic shape.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="section"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException">A value is out of range.</exception>
    public static ChannelCapacity? Capacity(ChannelSection section, double slope, double manningN)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(slope, nameof(slope));
        ChannelGuard.Positive(manningN, nameof(manningN));
        double sqrtS = Math.Sqrt(slope);
        switch (section)
        {
            case CircularSection circle:
                return new ChannelCapacity(circle.Evaluate(circle.PeakDischargeDepth).Conveyance(manningN) * sqrtS, circle.PeakDischargeDepth,
                    circle.Evaluate(circle.Diameter).Conveyance(manningN) * sqrtS, circle.Diameter);
            case SurveyedSection surveyed:
            {
                // The scan's residual is ln(Q(y)/Q) for a reference Q of 1 m3/s.
                var scan = DepthScan.Run(surveyed, new ConveyanceResidual(surveyed, manningN, Math.Log(1.0 / sqrtS)), LogDepthSolve.DepthOptions);
                return new ChannelCapacity(Math.Exp(scan.MaximumValue), scan.DepthAtMaximum, Math.Exp(scan.ValueAtTop), surveyed.MaximumDepth);
            }
            default:
                return null;
        }
    }

    private static void RequireOwnRoughness(ChannelSection section)
    {
        if (!section.HasOwnRoughness)
            ChannelGuard.Throw(nameof(section), "the section does not carry its own Manning n on every segment; pass manningN");
    }

    private static NormalDepthResult Solve(ChannelSection section, double flow, double slope, double defaultN, SolverTrace? trace)
    {
        double sqrtS = Math.Sqrt(slope);
        double logTarget = Math.Log(flow / sqrtS);
        switch (section.Shape)
        {
            case SectionShape.Circular:
                return Circle((CircularSection)section, flow, slope, defaultN, logTarget, trace);
            case SectionShape.Surveyed:
                return Surveyed((SurveyedSection)section, flow, slope, defaultN, logTarget, trace);
            default:
            {
                var function = new LogDepthConveyanceResidual(section, defaultN, logTarget);
                double start = section.NormalDepthGuess(flow * defaultN / sqrtS);
                var root = LogDepthSolve.Solve(function, Math.Log(start), 1.0, 10.0 / 3.0, trace);
                return Build(section, flow, slope, defaultN, Math.Exp(root.Root), root, root.Iterations, root.Converged,
                    Array.Empty<double>(), null, null);
            }
        }
    }

    private static NormalDepthResult Circle(CircularSection circle, double flow, double slope, double n, double logTarget, SolverTrace? trace)
    {
        double d = circle.Diameter, peak = circle.PeakDischargeDepth;
        var function = new ConveyanceResidual(circle, n, logTarget);
        // Residuals ln(Q(y)/Q) at the peak and at the crown.
        double atPeak = function.Value(peak, false), atFull = function.Value(d, false);
        // From the conveyances themselves, as Capacity does, not as Q e^r: for a vanishing flow (5e-324 m3/s) e^r
        // overflows, and the target ln(Q / sqrt(S)) of a subnormal Q carries little precision.
        double sqrtS = Math.Sqrt(slope);
        var capacity = new ChannelCapacity(circle.Evaluate(peak).Conveyance(n) * sqrtS, peak, circle.Evaluate(d).Conveyance(n) * sqrtS, d);

        const double touch = 1e-13; // a flow within this relative margin of the peak is taken as the peak itself
        if (atPeak < -touch)
        {
            return NoDepth(circle, flow, slope, n, capacity, atPeak, 0,
                $"No normal depth: {flow.ToString("G6", CultureInfo.InvariantCulture)} m3/s exceeds the pipe's greatest part-full discharge, {capacity.MaximumFlow.ToString("G6", CultureInfo.InvariantCulture)} m3/s at a depth of {peak.ToString("G6", CultureInfo.InvariantCulture)} m (y/D = {CircularSection.PeakDischargeDepthRatio:F4}), for this slope and n; the full-pipe discharge is {capacity.FullFlow.ToString("G6", CultureInfo.InvariantCulture)} m3/s. The pipe would run surcharged: size it larger or check it as a pressure conduit.");
        }
        if (atPeak <= touch)
        {
            var atTop = new RootResult(peak, 0, 1, atPeak, peak, peak, 0.0, SolveStatus.ConvergedOnResidual);
            return Build(circle, flow, slope, n, peak, atTop, 0, true, Array.Empty<double>(), capacity, null);
        }

        // Lower branch: ln K rises on (0, peak). Start from a rough fit of the part-full curve (y/D = 0.5 at half the
        // full-pipe flow, about 0.76 at the full-pipe flow); the bracket makes any start safe.
        double fraction = Math.Exp(-atFull);
        double start = Math.Clamp(0.5 * d * Math.Pow(2.0 * fraction, 0.6), 1e-6 * d, 0.999 * peak);
        var lower = SafeguardedNewton.Solve(function, Bracket.KnownIncreasing(0.0, peak), start, LogDepthSolve.DepthOptions, trace);
        // At or below the full-pipe flow (to the same margin) the only other depth is the full pipe itself.
        if (!(atFull < -touch))
            return Build(circle, flow, slope, n, lower.Root, lower, lower.Iterations, lower.Converged, Array.Empty<double>(), capacity, null);

        // Upper branch: ln K falls on (peak, D); start by linear interpolation of the residual.
        double upperStart = peak + (d - peak) * atPeak / (atPeak - atFull);
        var upper = SafeguardedNewton.Solve(function, Bracket.KnownDecreasing(peak, d), upperStart, LogDepthSolve.DepthOptions);
        var warning = new ChannelWarning(ChannelWarningCode.TwoNormalDepths, string.Create(CultureInfo.InvariantCulture,
            $"Two depths carry {flow:G6} m3/s: {lower.Root:G6} m and {upper.Root:G6} m. The flow lies between the full-pipe discharge ({capacity.FullFlow:G6} m3/s) and the part-full peak ({capacity.MaximumFlow:G6} m3/s at {peak:G6} m), because near the crown the wetted perimeter grows faster than the area. The lower depth is reported as the normal depth and is the usual design answer: the upper one lies on the falling branch just below the crown, where a small disturbance, air or a wave seals the crown and the pipe runs surcharged, so design does not count on capacity above the full-pipe discharge (common practice)."));
        return Build(circle, flow, slope, n, lower.Root, lower, lower.Iterations + upper.Iterations, lower.Converged && upper.Converged,
            new[] { upper.Root }, capacity, new List<ChannelWarning> { warning });
    }

    private static NormalDepthResult Surveyed(SurveyedSection section, double flow, double slope, double n, double logTarget, SolverTrace? trace)
    {
        var scan = DepthScan.Run(section, new ConveyanceResidual(section, n, logTarget), LogDepthSolve.DepthOptions, trace);
        var capacity = new ChannelCapacity(Math.Exp(scan.MaximumValue + Math.Log(flow)), scan.DepthAtMaximum, Math.Exp(scan.ValueAtTop + Math.Log(flow)), section.MaximumDepth);
        if (scan.Depths.Count == 0)
        {
            return NoDepth(section, flow, slope, n, capacity, scan.MaximumValue, scan.Iterations, string.Create(CultureInfo.InvariantCulture,
                $"No normal depth: {flow:G6} m3/s overtops the section. Its greatest discharge below the lower bank top ({section.MaximumDepth:G6} m above the invert) is {capacity.MaximumFlow:G6} m3/s at a depth of {capacity.DepthAtMaximumFlow:G6} m, for this slope and roughness; extend the survey or check the overbank flow separately."));
        }

        List<ChannelWarning>? warnings = null;
        double[] alternates = Array.Empty<double>();
        int count = scan.Depths.Count;
        if (count > 1)
        {
            alternates = scan.Depths.GetRange(1, count - 1).ToArray();
            warnings = new List<ChannelWarning>
            {
                new(count == 2 ? ChannelWarningCode.TwoNormalDepths : ChannelWarningCode.MultipleNormalDepths, string.Create(CultureInfo.InvariantCulture,
                    $"{count} depths carry {flow:G6} m3/s on this section: {CriticalFlow.JoinDepths(scan.Depths)} m. Its conveyance does not rise steadily with depth, as happens when the water spreads onto a flat overbank and the wetted perimeter grows faster than the area; the section is treated as one unit with Horton-Einstein roughness. The lowest depth is reported as the normal depth, the usual answer for a flow rising from low water; a divided-channel computation (main channel and overbanks apart) usually removes the ambiguity (common practice).")),
            };
        }
        if (scan.AnyJump)
            (warnings ??= new()).Add(CriticalFlow.JumpWarning(scan));
        return Build(section, flow, slope, n, scan.Depths[0], scan.Results[0], scan.Iterations, scan.AllConverged, alternates, capacity, warnings);
    }

    private static NormalDepthResult NoDepth(ChannelSection section, double flow, double slope, double n, ChannelCapacity capacity,
        double residual, int iterations, string message)
    {
        var critical = CriticalFlow.Solve(section, flow, n);
        var warnings = new List<ChannelWarning> { new(ChannelWarningCode.ExceedsCapacity, message) };
        warnings.AddRange(critical.Warnings);
        return new NormalDepthResult
        {
            NormalDepth = double.NaN, AlternateNormalDepth = null, AlternateNormalDepths = Array.Empty<double>(),
            Solution = DepthSolution.None,
            Area = double.NaN, WettedPerimeter = double.NaN, HydraulicRadius = double.NaN, TopWidth = double.NaN,
            HydraulicDepth = double.NaN, Velocity = double.NaN, FroudeNumber = double.NaN, Regime = FroudeRegime.Subcritical,
            SpecificEnergy = double.NaN, EffectiveManningN = double.NaN,
            CriticalDepth = critical.CriticalDepth, CriticalSlope = critical.CriticalSlope, Critical = critical,
            Capacity = capacity, Iterations = iterations, Converged = false, Residual = residual, Status = SolveStatus.NoSignChange,
            Method = section.HasCompositeRoughness ? MethodComposite : MethodSingle,
            Validity = ManningValidity.For(n == 0.0 ? double.NaN : n),
            Warnings = warnings.ToArray(),
        };
    }

    private static NormalDepthResult Build(ChannelSection section, double flow, double slope, double n, double depth, in RootResult root,
        int iterations, bool converged, IReadOnlyList<double> alternates, ChannelCapacity? capacity, List<ChannelWarning>? warnings)
    {
        var g = section.Evaluate(depth);
        double velocity = flow / g.Area;
        double hydraulicDepth = g.Area / g.TopWidth;
        double froude = velocity / Math.Sqrt(CriticalFlow.StandardGravity * hydraulicDepth);
        var regime = froude < 0.99 ? FroudeRegime.Subcritical : froude > 1.01 ? FroudeRegime.Supercritical : FroudeRegime.Critical;
        double effectiveN = g.EffectiveManningN(n);
        var validity = ManningValidity.For(effectiveN);
        var critical = CriticalFlow.Solve(section, flow, n);

        if (!converged)
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.NotConverged, "normal depth: " + root.Status.Reason()));
        if (Math.Abs(froude - 1.0) <= NearCriticalBand)
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.NearCritical, string.Create(CultureInfo.InvariantCulture,
                $"The Froude number at normal depth is {froude:F3}, close to 1: near-critical flow has an unstable, wavy surface and small changes of slope or roughness switch the regime; design guides advise keeping clear of it (common practice; the band 0.9 to 1.1 is chosen here).")));
        if (velocity > MaximumDesignVelocity)
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.VelocityAboveDesignRange, string.Create(CultureInfo.InvariantCulture,
                $"The mean velocity at normal depth is {velocity:G4} m/s, above {MaximumDesignVelocity} m/s, the usual upper limit for concrete linings (common practice): expect scour, or check the slope (m/m, not percent) and the flow's unit.")));
        else if (velocity < MinimumDesignVelocity)
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.VelocityBelowDesignRange, string.Create(CultureInfo.InvariantCulture,
                $"The mean velocity at normal depth is {velocity:G4} m/s, below {MinimumDesignVelocity} m/s, where silt settles and weeds grow (common practice); check the flow's unit.")));
        if (froude > MaximumDesignFroudeNumber)
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.FroudeAboveDesignRange, string.Create(CultureInfo.InvariantCulture,
                $"The Froude number at normal depth is {froude:G4}, above {MaximumDesignFroudeNumber} (a band chosen here): strongly supercritical flow with standing waves and a hydraulic jump at any obstruction; check that the slope is in m/m, not percent.")));
        if (!validity.InTypicalRange)
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.RoughnessOutsideTypicalRange, string.Create(CultureInfo.InvariantCulture,
                $"Manning n = {effectiveN:G4} lies outside the tabulated range {ManningValidity.TypicalLowestN} to {ManningValidity.TypicalHighestN} s m^-1/3; check the value and its units.")));
        if (critical.Warnings.Count > 0)
            (warnings ??= new()).AddRange(critical.Warnings);

        return new NormalDepthResult
        {
            NormalDepth = depth,
            AlternateNormalDepth = alternates.Count > 0 ? alternates[0] : null,
            AlternateNormalDepths = alternates,
            Solution = alternates.Count > 0 ? DepthSolution.Multiple : DepthSolution.Unique,
            Area = g.Area,
            WettedPerimeter = g.WettedPerimeter,
            HydraulicRadius = g.HydraulicRadius,
            TopWidth = g.TopWidth,
            HydraulicDepth = hydraulicDepth,
            Velocity = velocity,
            FroudeNumber = froude,
            Regime = regime,
            SpecificEnergy = depth + velocity * velocity / (2.0 * CriticalFlow.StandardGravity),
            EffectiveManningN = effectiveN,
            CriticalDepth = critical.CriticalDepth,
            CriticalSlope = critical.CriticalSlope,
            Critical = critical,
            Capacity = capacity,
            Iterations = iterations,
            Converged = converged,
            Residual = root.Residual,
            Status = root.Status,
            Method = section.HasCompositeRoughness ? MethodComposite : MethodSingle,
            Validity = validity,
            Warnings = warnings is null ? Array.Empty<ChannelWarning>() : warnings.ToArray(),
        };
    }
}
