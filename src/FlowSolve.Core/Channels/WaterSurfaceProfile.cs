using System.Globalization;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>The bed slope's class for gradually varied flow: by the sign of the slope and normal against critical depth.</summary>
public enum SlopeClass
{
    /// <summary>Normal depth above critical depth.</summary>
    Mild,

    /// <summary>Normal depth below critical depth.</summary>
    Steep,

    /// <summary>Normal depth equal to critical depth (to 1e-9 relative).</summary>
    Critical,

    /// <summary>Zero slope: no normal depth.</summary>
    Horizontal,

    /// <summary>A bed rising in the direction of flow: no normal depth.</summary>
    Adverse,
}

/// <summary>One station of a water-surface profile.</summary>
/// <param name="Distance">Distance from the downstream end, m.</param>
/// <param name="Depth">Flow depth, m.</param>
/// <param name="Velocity">Mean velocity, m/s.</param>
/// <param name="FroudeNumber">Q sqrt(T/(g A^3)).</param>
/// <param name="SpecificEnergy">y + V^2/(2g), m.</param>
/// <param name="FrictionSlope">Manning's friction slope Q^2 n^2 / (A^2 R^(4/3)), m/m.</param>
public readonly record struct ProfileStation(double Distance, double Depth, double Velocity, double FroudeNumber, double SpecificEnergy, double FrictionSlope);

/// <summary>A gradually varied water-surface profile in a prismatic channel.</summary>
public sealed record WaterSurfaceProfile
{
    /// <summary>Normal depth, m; NaN where there is none (horizontal or adverse bed, or a flow above a closed section's capacity).</summary>
    public required double NormalDepth { get; init; }

    /// <summary>Critical depth, m (the lowest, for a survey with several).</summary>
    public required double CriticalDepth { get; init; }

    /// <summary>The slope's class.</summary>
    public required SlopeClass SlopeClass { get; init; }

    /// <summary>The profile's class: M1, M2, M3, S1, S2, S3, C1, C3, H2, H3, A2 or A3; <c>uniform</c> when the control is the normal depth.</summary>
    public required string ProfileType { get; init; }

    /// <summary>The stations, downstream end first; fewer than asked where the profile stops at critical depth.</summary>
    public required IReadOnlyList<ProfileStation> Stations { get; init; }

    /// <summary>Where (distance from the downstream end, m) the profile reaches critical depth inside the reach, or null.</summary>
    public required double? CriticalDepthDistance { get; init; }

    /// <summary>Newton steps over all stations.</summary>
    public required int Iterations { get; init; }

    /// <summary>True when every station's depth met its tolerance.</summary>
    public required bool Converged { get; init; }

    /// <summary>The largest |x(y) - x| over the stations, relative to the reach length: the distance equation at the depths returned.</summary>
    public required double Residual { get; init; }

    /// <summary>Warnings with stable codes.</summary>
    public required IReadOnlyList<CalculationWarning> Warnings { get; init; }

    /// <summary>The hydraulic jump joining a supercritical profile from an upstream control to a subcritical one from a
    /// downstream control, or null (one control, or a jump that forms outside the reach).</summary>
    public ProfileJump? Jump { get; init; }
}

/// <summary>A hydraulic jump located inside a reach between two controls.</summary>
/// <param name="Distance">Where the jump stands, m from the downstream end.</param>
/// <param name="UpstreamDepth">The supercritical depth just upstream of it, m.</param>
/// <param name="SequentDepth">Its sequent depth, equal to the subcritical profile's depth there, m.</param>
/// <param name="EnergyLoss">The specific energy lost in it, m.</param>
/// <param name="UpstreamFroudeNumber">The Froude number just upstream of it.</param>
/// <param name="JumpLength">Its length by the rectangular apron relation L = 6.1 y2 (Peterka 1958), m: an indication only.</param>
/// <param name="Iterations">Newton steps of the root in distance.</param>
/// <param name="Residual">|sequent depth of the supercritical profile - subcritical depth| at the distance returned, relative to the sequent depth.</param>
public sealed record ProfileJump(double Distance, double UpstreamDepth, double SequentDepth, double EnergyLoss, double UpstreamFroudeNumber,
    double JumpLength, int Iterations, double Residual);

/// <summary>Why a profile cannot be computed from the control given.</summary>
public enum ProfileProblem
{
    /// <summary>None.</summary>
    None,

    /// <summary>A downstream control below critical depth: supercritical flow is controlled from upstream.</summary>
    DownstreamControlSupercritical,

    /// <summary>An upstream control above critical depth: subcritical flow is controlled from downstream.</summary>
    UpstreamControlSubcritical,

    /// <summary>The control depth is the critical depth itself, where the profile's direction is undefined.</summary>
    ControlAtCriticalDepth,
}

/// <summary>
/// Gradually varied flow in a prismatic channel, solved exactly rather than by steps: along the flow
/// dy/dx = (S0 - Sf)/(1 - Fr^2), Fr^2 = Q^2 T/(g A^3), Sf = Q^2/K^2 with Manning's conveyance K (energy coefficient 1;
/// Chow 1959, Open-Channel Hydraulics, chapter 9, from memory). The distance from the control to a depth is the integral
/// of dx/dy over depth, evaluated by adaptive Gauss-Kronrod quadrature to about 1e-13 relative; the depth at each
/// station is the root of that distance (safeguarded Newton, with dx/dy as the derivative), bracketed between the last
/// station's depth and the depth the profile tends to (normal depth, critical depth, or the section's top).
/// </summary>
public static class GraduallyVariedFlow
{
    private const double G = Physical.StandardGravity;

    private static readonly SolverOptions Options = new(0.0, 1e-14, 0.0, 200);

    /// <summary>Whether a depth can control the profile at the end given, or why not.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s.</param>
    /// <param name="controlDepth">The control depth, m.</param>
    /// <param name="controlDownstream">True for a control at the downstream end.</param>
    public static ProfileProblem Check(ChannelSection section, double flow, double controlDepth, bool controlDownstream)
    {
        double yc = CriticalFlow.CriticalDepth(section, flow).CriticalDepth;
        if (Math.Abs(controlDepth - yc) <= 1e-9 * yc) return ProfileProblem.ControlAtCriticalDepth;
        if (controlDownstream && controlDepth < yc) return ProfileProblem.DownstreamControlSupercritical;
        if (!controlDownstream && controlDepth > yc) return ProfileProblem.UpstreamControlSubcritical;
        return ProfileProblem.None;
    }

    /// <summary>The water-surface profile over a reach from a control depth at one end.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; greater than 0.</param>
    /// <param name="slope">Bed slope S0, m/m, positive falling along the flow; 0 or negative allowed.</param>
    /// <param name="manningN">Manning n (for segments without their own, in a survey).</param>
    /// <param name="length">Reach length, m; greater than 0.</param>
    /// <param name="controlDepth">The depth held at the control, m.</param>
    /// <param name="controlDownstream">True for a control at the downstream end (subcritical flow), false for upstream.</param>
    /// <param name="stations">How many equally spaced stations to report, 2 or more.</param>
    public static WaterSurfaceProfile Profile(ChannelSection section, double flow, double slope, double manningN, double length,
        double controlDepth, bool controlDownstream, int stations)
    {
        GuardReach(section, flow, slope, manningN, length, stations);
        ChannelGuard.Depth(controlDepth, section.MaximumDepth, nameof(controlDepth));

        var (yn, yc, slopeClass) = Classes(section, flow, slope, manningN);
        string type = Classify(slopeClass, controlDepth, yn, yc);

        if (Math.Abs(controlDepth - yc) <= 1e-9 * yc)
            throw new ArgumentOutOfRangeException(nameof(controlDepth), controlDepth, "is the critical depth, where the profile's direction is undefined");
        if (!double.IsNaN(yn) && Math.Abs(controlDepth - yn) <= 1e-12 * yn)
        {
            // Uniform flow: the water surface is parallel to the bed at normal depth all along.
            var uniform = Enumerable.Range(0, stations).Select(k => Station(section, flow, manningN, k * length / (stations - 1), controlDepth)).ToArray();
            return new WaterSurfaceProfile
            {
                NormalDepth = yn, CriticalDepth = yc, SlopeClass = slopeClass, ProfileType = "uniform", Stations = uniform,
                CriticalDepthDistance = null, Iterations = 0, Converged = true, Residual = 0, Warnings = [],
            };
        }

        var branch = new Branch(section, flow, slope, manningN, controlDepth, controlDownstream, yn, yc);
        var warnings = new List<CalculationWarning>();
        var list = new List<ProfileStation>(stations);
        double spacing = length / (stations - 1);
        double yPrev = controlDepth, sPrev = 0;
        int iterations = 0;
        bool converged = true;
        double residual = 0;
        double? criticalAt = null;
        list.Add(Station(section, flow, manningN, controlDownstream ? 0 : length, controlDepth));

        for (int k = 1; k < stations; k++)
        {
            double s = k * spacing;
            if (s > branch.End)
            {
                double at = controlDownstream ? branch.End : length - branch.End;
                if (branch.LimitIsCritical)
                {
                    criticalAt = at;
                    warnings.Add(ReachesCritical(yc, at));
                }
                else
                {
                    warnings.Add(new("profile-leaves-section", string.Create(CultureInfo.InvariantCulture,
                        $"The profile reaches the top of the section ({section.MaximumDepth:G6} m) {at:G6} m from the downstream end: the channel would overflow or run full; no stations are given past it.")));
                }
                list.Add(Station(section, flow, manningN, at, branch.Limit));
                break;
            }
            var step = branch.DepthAt(s, yPrev, sPrev);
            iterations += step.Iterations;
            converged &= step.Converged;
            residual = Math.Max(residual, Math.Abs(step.Reached - s) / length);
            list.Add(Station(section, flow, manningN, controlDownstream ? s : length - s, step.Depth));
            yPrev = step.Depth;
            sPrev = step.Reached;
        }
        if (!controlDownstream) list.Reverse();
        if (!converged) warnings.Add(new("not-converged", "A station's depth did not meet its tolerance."));
        return new WaterSurfaceProfile
        {
            NormalDepth = yn, CriticalDepth = yc, SlopeClass = slopeClass, ProfileType = type, Stations = list,
            CriticalDepthDistance = criticalAt, Iterations = iterations, Converged = converged, Residual = residual, Warnings = warnings,
        };
    }

    /// <summary>
    /// The water surface between two controls: a supercritical depth held at the upstream end (below a gate) and a
    /// subcritical depth held at the downstream end (a weir, a lake). The supercritical profile runs downstream from the
    /// upstream control and the subcritical one upstream from the downstream control; the hydraulic jump stands where
    /// the supercritical depth's sequent depth (equal momentum function, <see cref="HydraulicJump"/>) equals the
    /// subcritical depth. That distance is a root of F(x) = y2*(y1(x)) - y2(x), found by safeguarded Newton with
    /// dF/dx = (dy2*/dy1) dy1/dx - dy2/dx, where dy2*/dy1 = A1 (1 - Fr1^2) / (A2 (1 - Fr2^2)) (both sides keep the
    /// momentum function equal) and each dy/dx comes from the gradually-varied-flow equation; the bracket is the first
    /// sign change of F scanning downstream from the upstream end (F &gt; 0 there means the supercritical flow still
    /// holds, Chow 1959, Open-Channel Hydraulics, section 15-4, from memory). Without a sign change in the reach, one
    /// profile holds over the whole reach and a warning says which: a jump drowned against the upstream control, or
    /// swept past the downstream end.
    /// </summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; greater than 0.</param>
    /// <param name="slope">Bed slope S0, m/m; 0 or negative allowed.</param>
    /// <param name="manningN">Manning n.</param>
    /// <param name="length">Reach length, m; greater than 0.</param>
    /// <param name="upstreamDepth">The supercritical depth held at the upstream end, m; below critical depth.</param>
    /// <param name="downstreamDepth">The subcritical depth held at the downstream end, m; above critical depth.</param>
    /// <param name="stations">How many equally spaced stations to report, 2 or more (the jump adds two at its distance).</param>
    public static WaterSurfaceProfile ProfileBetween(ChannelSection section, double flow, double slope, double manningN, double length,
        double upstreamDepth, double downstreamDepth, int stations)
    {
        GuardReach(section, flow, slope, manningN, length, stations);
        ChannelGuard.Depth(upstreamDepth, section.MaximumDepth, nameof(upstreamDepth));
        ChannelGuard.Depth(downstreamDepth, section.MaximumDepth, nameof(downstreamDepth));
        if (Check(section, flow, upstreamDepth, controlDownstream: false) != ProfileProblem.None)
            throw new ArgumentOutOfRangeException(nameof(upstreamDepth), upstreamDepth, "must be supercritical (below critical depth)");
        if (Check(section, flow, downstreamDepth, controlDownstream: true) != ProfileProblem.None)
            throw new ArgumentOutOfRangeException(nameof(downstreamDepth), downstreamDepth, "must be subcritical (above critical depth)");

        var (yn, yc, slopeClass) = Classes(section, flow, slope, manningN);
        var upper = new Branch(section, flow, slope, manningN, upstreamDepth, controlDownstream: false, yn, yc);
        var lower = new Branch(section, flow, slope, manningN, downstreamDepth, controlDownstream: true, yn, yc);
        string upperType = upper.Uniform ? "uniform" : Classify(slopeClass, upstreamDepth, yn, yc);
        string lowerType = lower.Uniform ? "uniform" : Classify(slopeClass, downstreamDepth, yn, yc);

        // Where both profiles exist: the supercritical one from the upstream end down to where it reaches critical depth,
        // the subcritical one from the downstream end up to where it reaches critical depth (or the section's top).
        double lo = Math.Max(0, length - upper.End), hi = Math.Min(length, lower.End);
        var jumpFunction = new JumpFunction(section, flow, length, upper, lower, yc);
        int iterations = 0;
        // Scanning downstream from the upstream end, the first x with F(x) <= 0 brackets the jump with the point before
        // it. F(hi) <= 0 drowns the jump against the upstream control; no sign change down to lo sweeps it out.
        double found = double.NaN, previous = double.NaN, fFound = double.NaN;
        bool drowned = !(lo < hi) || jumpFunction.Value(hi) <= 0;
        if (!drowned)
        {
            const int Scan = 64;
            previous = hi;
            for (int k = 1; k <= Scan; k++)
            {
                double x = hi - (hi - lo) * k / Scan;
                double f = jumpFunction.Value(x);
                if (f <= 0) { (found, fFound) = (x, f); break; }
                previous = x;
            }
        }
        if (double.IsNaN(found))
        {
            // No jump in the reach: one profile holds all along.
            var single = drowned
                ? Profile(section, flow, slope, manningN, length, downstreamDepth, controlDownstream: true, stations)
                : Profile(section, flow, slope, manningN, length, upstreamDepth, controlDownstream: false, stations);
            var warnings = new List<CalculationWarning>(single.Warnings)
            {
                drowned
                    ? new("jump-drowned", "The subcritical profile from the downstream control stands at or above the sequent depth of the supercritical flow all the way to the upstream control: no free jump forms in the reach (the downstream control drowns the upstream one, a submerged gate say), and the profile from the downstream control is given over the whole reach.")
                    : new("jump-beyond-reach", "The sequent depth of the supercritical flow stays above the subcritical profile down to the downstream end: the jump is swept out of the reach, and the profile from the upstream control is given over the whole reach."),
            };
            return single with { Warnings = warnings };
        }

        double xj;
        int jumpIterations = 0;
        if (fFound == 0)
        {
            xj = found;
        }
        else
        {
            var root = SafeguardedNewton.Solve(jumpFunction, Bracket.KnownIncreasing(found, previous), 0.5 * (found + previous),
                new SolverOptions(1e-13 * length, 1e-13, 0.0, 100));
            jumpIterations = root.Iterations;
            xj = root.Root;
        }
        var at = jumpFunction.At(xj);
        var jump = HydraulicJump.Solve(section, flow, at.Upper);
        double jumpResidual = Math.Abs(jump.SequentDepth - at.Lower) / jump.SequentDepth;
        bool converged = jump.Converged && jumpResidual <= 1e-8;
        iterations += jumpIterations + at.Iterations;

        // Stations: the subcritical profile from the downstream end to the jump, the jump's two depths, the supercritical
        // profile from the jump to the upstream end; each profile walked from its own control.
        var list = new List<ProfileStation>(stations + 2);
        double spacing = length / (stations - 1);
        double residual = 0;
        double yPrev = downstreamDepth, sPrev = 0;
        for (int k = 0; k < stations; k++)
        {
            double x = k == stations - 1 ? length : k * spacing;
            if (x >= xj) break;
            var step = lower.DepthAt(x, yPrev, sPrev);
            iterations += step.Iterations;
            converged &= step.Converged;
            residual = Math.Max(residual, Math.Abs(step.Reached - x) / length);
            list.Add(Station(section, flow, manningN, x, step.Depth));
            (yPrev, sPrev) = (step.Depth, step.Reached);
        }
        list.Add(Station(section, flow, manningN, xj, at.Lower));
        list.Add(Station(section, flow, manningN, xj, at.Upper));
        var upstreamPart = new List<ProfileStation>();
        yPrev = upstreamDepth;
        sPrev = 0;
        for (int k = stations - 1; k >= 0; k--)
        {
            double x = k == stations - 1 ? length : k * spacing;
            if (x <= xj) break;
            double s = length - x;
            var step = upper.DepthAt(s, yPrev, sPrev);
            iterations += step.Iterations;
            converged &= step.Converged;
            residual = Math.Max(residual, Math.Abs(step.Reached - s) / length);
            upstreamPart.Add(Station(section, flow, manningN, x, step.Depth));
            (yPrev, sPrev) = (step.Depth, step.Reached);
        }
        upstreamPart.Reverse();
        list.AddRange(upstreamPart);

        var jumpWarnings = jump.Warnings.Where(w => w.Code != "not-converged").ToList();
        if (!converged) jumpWarnings.Add(new("not-converged", "The jump's distance or a station's depth did not meet its tolerance."));
        return new WaterSurfaceProfile
        {
            NormalDepth = yn, CriticalDepth = yc, SlopeClass = slopeClass, ProfileType = upperType + "+" + lowerType, Stations = list,
            CriticalDepthDistance = null, Iterations = iterations, Converged = converged, Residual = Math.Max(residual, jumpResidual),
            Warnings = jumpWarnings,
            Jump = new ProfileJump(xj, at.Upper, jump.SequentDepth, jump.EnergyLoss, jump.UpstreamFroudeNumber, jump.JumpLength,
                jumpIterations, jumpResidual),
        };
    }

    /// <summary>F(x) = sequent depth of the supercritical profile's depth at x minus the subcritical profile's depth at x,
    /// x from the downstream end, and dF/dx.</summary>
    private readonly struct JumpFunction(ChannelSection section, double flow, double length, Branch upper, Branch lower, double yc) : IDifferentiableFunction
    {
        /// <summary>Both profiles' depths at x (each from its own control).</summary>
        public (double Upper, double Lower, int Iterations) At(double x)
        {
            double s1 = length - x;
            var a = s1 >= upper.End ? (Depth: upper.Limit, Reached: upper.End, Iterations: 0, Converged: true) : upper.DepthAt(s1, upper.ControlDepth, 0);
            var b = x >= lower.End ? (Depth: lower.Limit, Reached: lower.End, Iterations: 0, Converged: true) : lower.DepthAt(x, lower.ControlDepth, 0);
            return (a.Depth, b.Depth, a.Iterations + b.Iterations);
        }

        private double Sequent(double y1)
        {
            if (y1 >= yc) return yc;
            var jump = HydraulicJump.Solve(section, flow, y1);
            return jump.Status switch
            {
                JumpStatus.Solved or JumpStatus.NotConverged => jump.SequentDepth,
                JumpStatus.AboveSection => double.PositiveInfinity, // no subcritical depth in the section balances it
                _ => yc,
            };
        }

        public double Value(double x)
        {
            var (y1, y2, _) = At(x);
            return Sequent(y1) - y2;
        }

        public (double Value, double Derivative) Evaluate(double x)
        {
            var (y1, y2, _) = At(x);
            double seq = Sequent(y1);
            if (!double.IsFinite(seq)) return (double.MaxValue, 0);
            var g1 = section.Evaluate(y1, fromBelow: true);
            var g2 = section.Evaluate(seq, fromBelow: true);
            double fr1 = flow * flow * g1.TopWidth / (G * g1.Area * g1.Area * g1.Area);
            double fr2 = flow * flow * g2.TopWidth / (G * g2.Area * g2.Area * g2.Area);
            double dSeq = g1.Area * (1 - fr1) / (g2.Area * (1 - fr2));
            double dy1dx = -1 / upper.DsDy(y1), dy2dx = 1 / lower.DsDy(y2);
            return (seq - y2, dSeq * dy1dx - dy2dx);
        }
    }

    private static CalculationWarning ReachesCritical(double yc, double at) => new("reaches-critical-depth", string.Create(CultureInfo.InvariantCulture,
        $"The profile reaches critical depth ({yc:G6} m) {at:G6} m from the downstream end, inside the reach: the gradually-varied-flow equation does not hold beyond it (a hydraulic jump or a drop forms there), so no stations are given past it."));

    /// <summary>The argument guards both profile entry points share.</summary>
    private static void GuardReach(ChannelSection section, double flow, double slope, double manningN, double length, int stations)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(flow, nameof(flow));
        ChannelGuard.Positive(manningN, nameof(manningN));
        ChannelGuard.Positive(length, nameof(length));
        ArgumentOutOfRangeException.ThrowIfLessThan(stations, 2);
        if (!double.IsFinite(slope)) throw new ArgumentOutOfRangeException(nameof(slope), slope, "must be finite");
    }

    /// <summary>Normal depth (NaN where there is none), critical depth and the slope's class.</summary>
    private static (double NormalDepth, double CriticalDepth, SlopeClass SlopeClass) Classes(ChannelSection section, double flow, double slope, double manningN)
    {
        double yc = CriticalFlow.CriticalDepth(section, flow).CriticalDepth;
        double yn = double.NaN;
        if (slope > 0)
        {
            var normal = ManningSolver.NormalDepth(section, flow, slope, manningN);
            if (normal.Solution != DepthSolution.None && normal.Converged) yn = normal.NormalDepth;
        }
        var slopeClass = slope == 0 ? SlopeClass.Horizontal : slope < 0 ? SlopeClass.Adverse
            : double.IsNaN(yn) ? SlopeClass.Mild
            : Math.Abs(yn - yc) <= 1e-9 * yc ? SlopeClass.Critical : yn > yc ? SlopeClass.Mild : SlopeClass.Steep;
        return (yn, yc, slopeClass);
    }

    /// <summary>The usual class letters and zone numbers (Chow 1959, chapter 9, from memory).</summary>
    private static string Classify(SlopeClass slope, double y, double yn, double yc)
    {
        char letter = slope switch { SlopeClass.Mild => 'M', SlopeClass.Steep => 'S', SlopeClass.Critical => 'C', SlopeClass.Horizontal => 'H', _ => 'A' };
        int zone;
        if (double.IsNaN(yn)) zone = y > yc ? 2 : 3;
        else if (y > Math.Max(yn, yc)) zone = 1;
        else if (y < Math.Min(yn, yc)) zone = 3;
        else zone = 2;
        return letter + zone.ToString(CultureInfo.InvariantCulture);
    }

    private static ProfileStation Station(ChannelSection section, double flow, double n, double distance, double y)
    {
        var g = section.At(y);
        double v = flow / g.Area;
        double k = ManningSolver.Discharge(section, y, 1.0, n);
        return new ProfileStation(distance, y, v, flow * Math.Sqrt(g.TopWidth / (G * g.Area * g.Area * g.Area)),
            y + v * v / (2 * G), flow * flow / (k * k));
    }

    /// <summary>One profile from one control: where its depth tends, how far it runs before it reaches critical depth
    /// or the section's top, and its depth at a distance from the control.</summary>
    private sealed class Branch
    {
        private readonly Slope _phi;
        private readonly double _direction;

        public Branch(ChannelSection section, double flow, double slope, double manningN, double controlDepth, bool controlDownstream, double yn, double yc)
        {
            ControlDepth = controlDepth;
            _phi = new Slope(section, flow, slope, manningN, controlDownstream);
            if (!double.IsNaN(yn) && Math.Abs(controlDepth - yn) <= 1e-12 * yn)
            {
                // Uniform flow: the depth stays at the control's all along.
                Uniform = true;
                Limit = controlDepth;
                End = double.PositiveInfinity;
                return;
            }
            _direction = Math.Sign(1.0 / _phi.At(controlDepth));
            // Where the depth tends as s grows: the nearest of yn and yc in the direction of travel, else the section's top or 0.
            Limit = _direction > 0 ? section.MaximumDepth : 0.0;
            foreach (double candidate in new[] { yn, yc })
            {
                if (double.IsNaN(candidate)) continue;
                bool ahead = _direction > 0 ? candidate > controlDepth && candidate < Limit : candidate < controlDepth && candidate > Limit;
                if (ahead) { Limit = candidate; LimitIsCritical = candidate == yc; }
            }
            // How far the profile runs before it meets critical depth or the section's top, when it tends to either.
            End = double.PositiveInfinity;
            if (LimitIsCritical || (!double.IsInfinity(Limit) && Limit > 0 && Limit != yn))
                End = Integrate(_phi, controlDepth, Limit);
        }

        public double ControlDepth { get; }

        /// <summary>True when the control holds normal depth: the profile is uniform.</summary>
        public bool Uniform { get; }

        /// <summary>The depth the profile tends to: normal or critical depth, the section's top (infinite when open), or 0.</summary>
        public double Limit { get; }

        /// <summary>True when the profile runs into critical depth at <see cref="End"/>.</summary>
        public bool LimitIsCritical { get; }

        /// <summary>The distance from the control at which the profile reaches critical depth or the section's top; infinite when it does not.</summary>
        public double End { get; }

        /// <summary>ds/dy at a depth.</summary>
        public double DsDy(double y) => Uniform ? double.PositiveInfinity : _phi.At(y);

        /// <summary>The depth at distance <paramref name="s"/> (below <see cref="End"/>) from the control, found from a
        /// known point of the profile (<paramref name="yFrom"/> at <paramref name="sFrom"/>, sFrom at most s).</summary>
        public (double Depth, double Reached, int Iterations, bool Converged) DepthAt(double s, double yFrom, double sFrom)
        {
            if (s == sFrom || Uniform) return (yFrom, s, 0, true);
            // The depth where s is reached lies between the known depth and the limit; with no finite limit ahead (an H2
            // or A2 profile rising upstream), double the step until it is passed.
            double far = Limit;
            if (double.IsInfinity(far) || far <= 0)
            {
                far = yFrom;
                double grow = Math.Max(yFrom, 1e-3);
                for (int j = 0; j < 200; j++)
                {
                    double trial = _direction > 0 ? far + grow : far / 2;
                    if (sFrom + Integrate(_phi, yFrom, trial) >= s) { far = trial; break; }
                    far = trial;
                    grow *= 2;
                }
            }
            var function = new Distance(_phi, yFrom, s - sFrom);
            var bracket = _direction > 0 ? Bracket.KnownIncreasing(yFrom, far) : Bracket.KnownDecreasing(far, yFrom);
            var root = SafeguardedNewton.Solve(function, bracket, yFrom + (far - yFrom) * 0.5, Options);
            double y = root.Root;
            return (y, sFrom + Integrate(_phi, yFrom, y), root.Iterations, root.Converged);
        }
    }

    /// <summary>ds/dy along the integration: (1 - Fr^2)/(Sf - S0) upstream from a downstream control, its negative downstream.</summary>
    private readonly struct Slope(ChannelSection section, double flow, double s0, double n, bool upstream)
    {
        public double At(double y)
        {
            var g = section.Evaluate(y, fromBelow: true);
            double fr2 = flow * flow * g.TopWidth / (G * g.Area * g.Area * g.Area);
            double k = ManningSolver.Discharge(section, y, 1.0, n);
            double sf = flow * flow / (k * k);
            double value = (1 - fr2) / (sf - s0);
            return upstream ? value : -value;
        }
    }

    /// <summary>s(y) - target with s measured from the last station, and ds/dy.</summary>
    private readonly struct Distance(Slope phi, double from, double target) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double y) => (Integrate(phi, from, y) - target, phi.At(y));
    }

    /// <summary>The integral of ds/dy from a to b by adaptive Gauss-Kronrod (7-15 points), to about 1e-13 relative.</summary>
    /// <remarks>ds/dy keeps one sign between a depth and the depth the profile tends to, so a relative tolerance on each
    /// piece bounds the whole integral's relative error by the same figure; only the pieces next to a singular end
    /// (normal depth, where ds/dy grows without bound) keep splitting, so the work grows with the depth of the split,
    /// not exponentially.</remarks>
    private static double Integrate(Slope phi, double a, double b)
    {
        if (a == b) return 0.0;
        var (whole, error) = Kronrod(phi, a, b);
        return Adapt(phi, a, b, whole, error, 0);
    }

    private static double Adapt(Slope phi, double a, double b, double whole, double error, int depth)
    {
        if (error <= 1e-13 * Math.Abs(whole) || depth >= 60 || !double.IsFinite(whole)) return whole;
        double m = 0.5 * (a + b);
        if (m == a || m == b) return whole; // the piece is as narrow as doubles allow
        var (left, el) = Kronrod(phi, a, m);
        var (right, er) = Kronrod(phi, m, b);
        // Close to normal depth Sf - S0 cancels, and the integrand carries rounding noise that no split removes: when
        // splitting no longer shrinks the error estimate, the piece is as good as doubles make it.
        if (depth >= 8 && el + er >= 0.5 * error) return left + right;
        return Adapt(phi, a, m, left, el, depth + 1) + Adapt(phi, m, b, right, er, depth + 1);
    }

    // Gauss-Kronrod 7-15 nodes and weights (Kronrod 1965; the standard table, as in QUADPACK's qk15).
    private static readonly double[] Xk = [0.991455371120812639206854697526329, 0.949107912342758524526189684047851,
        0.864864423359769072789712788640926, 0.741531185599394439863864773280788, 0.586087235467691130294144845693013,
        0.405845151377397166906606412076961, 0.207784955007898467600689403773245, 0.0];
    private static readonly double[] Wk = [0.022935322010529224963732008058970, 0.063092092629978553290700663189204,
        0.104790010322250183839876322541518, 0.140653259715525918745189590510238, 0.169004726639267902826583426598550,
        0.190350578064785409913256402421014, 0.204432940075298892414161999234649, 0.209482141084727828012999174891714];
    private static readonly double[] Wg = [0.129484966168869693270611432679082, 0.279705391489276667901467771423780,
        0.381830050505118944950369775488975, 0.417959183673469387755102040816327];

    private static (double Value, double Error) Kronrod(Slope phi, double a, double b)
    {
        double c = 0.5 * (a + b), h = 0.5 * (b - a);
        double fc = phi.At(c);
        double kronrod = Wk[7] * fc, gauss = Wg[3] * fc;
        for (int i = 0; i < 7; i++)
        {
            double f1 = phi.At(c - h * Xk[i]), f2 = phi.At(c + h * Xk[i]);
            kronrod += Wk[i] * (f1 + f2);
            if (i % 2 == 1) gauss += Wg[i / 2] * (f1 + f2);
        }
        return (kronrod * h, Math.Abs((kronrod - gauss) * h));
    }
}
