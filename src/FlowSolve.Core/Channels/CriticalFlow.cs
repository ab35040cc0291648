using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>
/// Critical depth from Q^2 T = g A^3 (Froude number 1 on the hydraulic depth A/T), and the critical slope for a Manning n.
/// Pure SI; thread-safe; allocation-free for the prismatic shapes and the circle.
/// </summary>
/// <remarks>
/// <para>The condition is solved as ln(A^3/T) = ln(Q^2/g): for the open prismatic shapes in u = ln y, where the residual
/// rises with a slope between 2 and 6 so its bracket follows from the start (exact starts for the rectangle,
/// (q^2/g)^(1/3), and the V section); for the circle in y on (0, D), where A^3/T grows without bound towards the crown so
/// the critical depth always exists; for a surveyed section by splitting the depth range into pieces on which the
/// residual is monotone, so that every critical depth is found (a compound section can have several).</para>
/// <para>The critical slope is (Q / K(y_c))^2, K = A R^(2/3) / n the Manning conveyance (SI, k = 1), with the
/// Horton-Einstein composite n where segments differ.</para>
/// </remarks>
public static class CriticalFlow
{
    /// <summary>Standard gravity, 9.80665 m/s2 (CGPM 1901), used throughout.</summary>
    public const double StandardGravity = Physical.StandardGravity;

    /// <summary>The critical depth of a flow in a section. The critical slope is given only when the section carries its own roughness.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <returns>The critical depth, the flow at it, the solve's iterations and status, and warnings.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="section"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="flow"/> is not positive and finite.</exception>
    public static CriticalDepthResult CriticalDepth(ChannelSection section, double flow) => CriticalDepth(section, flow, (SolverTrace?)null);

    /// <summary>As <see cref="CriticalDepth(ChannelSection, double)"/>, recording the solve of the reported depth in
    /// <paramref name="trace"/> (in ln y for the prismatic shapes, ln(y/(D - y)) for the circle, y for a surveyed section).</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="trace">The per-iteration record to fill, or null.</param>
    public static CriticalDepthResult CriticalDepth(ChannelSection section, double flow, SolverTrace? trace)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(flow, nameof(flow));
        return Solve(section, flow, section.HasOwnRoughness ? 0.0 : double.NaN, trace);
    }

    /// <summary>The critical depth of a flow in a section, and the critical slope for a Manning n.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="manningN">Manning n, s m^-1/3 (SI); finite and greater than zero; for a surveyed section, the n of the segments without their own.</param>
    /// <returns>The critical depth and critical slope, the solve's iterations and status, and warnings.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="section"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="flow"/> or <paramref name="manningN"/> is not positive and finite.</exception>
    public static CriticalDepthResult CriticalDepth(ChannelSection section, double flow, double manningN) => CriticalDepth(section, flow, manningN, null);

    /// <summary>As <see cref="CriticalDepth(ChannelSection, double, double)"/>, recording the solve of the reported depth in <paramref name="trace"/>.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="manningN">Manning n, s m^-1/3 (SI); finite and greater than zero.</param>
    /// <param name="trace">The per-iteration record to fill, or null.</param>
    public static CriticalDepthResult CriticalDepth(ChannelSection section, double flow, double manningN, SolverTrace? trace)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(flow, nameof(flow));
        ChannelGuard.Positive(manningN, nameof(manningN));
        return Solve(section, flow, manningN, trace);
    }

    private const string MethodText = "critical depth from Q^2 T = g A^3 (g = 9.80665 m/s2), safeguarded Newton";

    // defaultN: NaN for no critical slope; 0 for the section's own roughness; otherwise the n.
    internal static CriticalDepthResult Solve(ChannelSection section, double flow, double defaultN, SolverTrace? trace = null)
    {
        double logTarget = Math.Log(flow * flow / StandardGravity);
        switch (section.Shape)
        {
            case SectionShape.Circular:
            {
                var circle = (CircularSection)section;
                // Solved in x = ln(y/(D - y)); the checked bracket x in [-30, 30] spans y/D from 1e-13 to 1 - 1e-13
                // (a flow beyond it is reported as no sign change, never silently clamped).
                var function = new LogitDepthCriticalResidual(circle, logTarget);
                double start = LogitDepthCriticalResidual.LogitOf(circle.CriticalDepthGuess(flow * flow / StandardGravity), circle.Diameter);
                var inLogit = SafeguardedNewton.Solve(function, Bracket.Checked(-30.0, 30.0), start, LogDepthSolve.Options, trace);
                var root = inLogit with { Root = LogitDepthCriticalResidual.DepthOf(inLogit.Root, circle.Diameter) };
                return Build(section, flow, defaultN, root.Root, root, root.Iterations, root.Converged, Array.Empty<double>(), null);
            }
            case SectionShape.Surveyed:
                return Surveyed((SurveyedSection)section, flow, defaultN, logTarget, trace);
            default:
            {
                var function = new LogDepthCriticalResidual(section, logTarget);
                var root = LogDepthSolve.Solve(function, Math.Log(section.CriticalDepthGuess(flow * flow / StandardGravity)), 2.0, 6.0, trace);
                return Build(section, flow, defaultN, Math.Exp(root.Root), root, root.Iterations, root.Converged, Array.Empty<double>(), null);
            }
        }
    }

    private static CriticalDepthResult Surveyed(SurveyedSection section, double flow, double defaultN, double logTarget, SolverTrace? trace)
    {
        var scan = DepthScan.Run(section, new CriticalResidual(section, logTarget), LogDepthSolve.DepthOptions, trace);
        if (scan.Depths.Count == 0)
        {
            var warning = new ChannelWarning(ChannelWarningCode.NoCriticalDepthInSection,
                $"The critical depth of {flow:G6} m3/s would lie above the lower bank top ({section.MaximumDepth:G6} m above the invert): the section is too small to pass this flow at critical depth.");
            return new CriticalDepthResult
            {
                CriticalDepth = double.NaN, Area = double.NaN, TopWidth = double.NaN, HydraulicDepth = double.NaN,
                Velocity = double.NaN, SpecificEnergy = double.NaN, CriticalSlope = double.NaN,
                AlternateCriticalDepths = Array.Empty<double>(), Solution = DepthSolution.None,
                Iterations = scan.Iterations, Converged = false, Residual = scan.ValueAtTop, Status = SolveStatus.NoSignChange,
                Method = MethodText, Warnings = [warning],
            };
        }

        double[] alternates = Array.Empty<double>();
        List<ChannelWarning>? warnings = null;
        if (scan.Depths.Count > 1)
        {
            alternates = scan.Depths.GetRange(1, scan.Depths.Count - 1).ToArray();
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.MultipleCriticalDepths,
                $"{scan.Depths.Count} depths satisfy the critical-flow condition on this section ({JoinDepths(scan.Depths)} m), as happens in compound sections where the top width grows fast over a flat overbank; the lowest is reported as the critical depth."));
        }
        if (scan.AnyJump)
            (warnings ??= new()).Add(JumpWarning(scan));
        return Build(section, flow, defaultN, scan.Depths[0], scan.Results[0], scan.Iterations, scan.AllConverged, alternates, warnings);
    }

    private static CriticalDepthResult Build(ChannelSection section, double flow, double defaultN, double depth, in RootResult root,
        int iterations, bool converged, IReadOnlyList<double> alternates, List<ChannelWarning>? warnings)
    {
        var g = section.Evaluate(depth);
        double velocity = flow / g.Area;
        double criticalSlope = double.NaN;
        if (!double.IsNaN(defaultN))
        {
            double ratio = flow / g.Conveyance(defaultN);
            criticalSlope = ratio * ratio;
        }
        if (!converged)
            (warnings ??= new()).Add(new ChannelWarning(ChannelWarningCode.NotConverged, "critical depth: " + root.Status.Reason()));
        return new CriticalDepthResult
        {
            CriticalDepth = depth,
            Area = g.Area,
            TopWidth = g.TopWidth,
            HydraulicDepth = g.HydraulicDepth,
            Velocity = velocity,
            SpecificEnergy = depth + velocity * velocity / (2.0 * StandardGravity),
            CriticalSlope = criticalSlope,
            AlternateCriticalDepths = alternates,
            Solution = alternates.Count > 0 ? DepthSolution.Multiple : DepthSolution.Unique,
            Iterations = iterations,
            Converged = converged,
            Residual = root.Residual,
            Status = root.Status,
            Method = MethodText,
            Warnings = warnings is null ? Array.Empty<ChannelWarning>() : warnings.ToArray(),
        };
    }

    internal static string JoinDepths(List<double> depths)
    {
        var parts = new string[depths.Count];
        for (int i = 0; i < parts.Length; i++) parts[i] = depths[i].ToString("G6", System.Globalization.CultureInfo.InvariantCulture);
        return string.Join(", ", parts);
    }

    internal static ChannelWarning JumpWarning(DepthScan scan)
    {
        var at = new List<double>();
        for (int i = 0; i < scan.Depths.Count; i++) if (scan.AtJump[i]) at.Add(scan.Depths[i]);
        return new ChannelWarning(ChannelWarningCode.ConveyanceJump,
            $"At {JoinDepths(at)} m a horizontal survey segment floods all at once, so the section's properties jump there and the equation changes sign without passing through zero; that depth is reported. Check the survey or split the section.");
    }
}
