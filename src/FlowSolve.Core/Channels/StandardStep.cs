using System.Globalization;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>One surveyed cross-section of a reach.</summary>
/// <param name="Distance">Distance from the downstream end of the reach, m, increasing upstream.</param>
/// <param name="Section">The surveyed section; its points' elevations place its bed.</param>
/// <param name="ManningN">Manning n, s m^-1/3, of the segments without their own n; 0 when every segment has its own.</param>
public sealed record ReachSection(double Distance, SurveyedSection Section, double ManningN);

/// <summary>Which end of the reach holds the known water surface.</summary>
public enum ReachStart
{
    /// <summary>The downstream end (subcritical flow): the steps run upstream.</summary>
    Downstream,

    /// <summary>The upstream end (supercritical flow): the steps run downstream.</summary>
    Upstream,
}

/// <summary>The computed water surface at one section of a reach.</summary>
/// <param name="Distance">Distance from the downstream end, m.</param>
/// <param name="BedElevation">The section's lowest point, m.</param>
/// <param name="Elevation">Water-surface elevation, m.</param>
/// <param name="Depth">Elevation minus the lowest point, m.</param>
/// <param name="Area">Flow area, m2.</param>
/// <param name="TopWidth">Water-surface width, m.</param>
/// <param name="Velocity">Mean velocity Q/A, m/s.</param>
/// <param name="FroudeNumber">Q sqrt(T/(g A^3)).</param>
/// <param name="EnergyElevation">The energy grade line: elevation + V^2/(2g), m (energy coefficient 1).</param>
/// <param name="FrictionSlope">Manning's friction slope (Q/K)^2, m/m (Horton-Einstein composite n where segments carry their own).</param>
/// <param name="CriticalElevation">The lowest point plus the (lowest) critical depth, m; NaN where the section has none below its top (or its solve did not converge).</param>
/// <param name="FrictionLoss">The step's friction loss from the section before it in the computation, m: the distance times the mean of the two friction slopes; 0 at the start.</param>
/// <param name="TransitionLoss">The step's expansion or contraction loss, m: the coefficient times the change of velocity head; 0 at the start.</param>
/// <param name="Iterations">Newton steps of this section's energy equation (0 at the start and where critical depth was taken).</param>
/// <param name="Residual">The energy equation at the elevation returned, m (0 at the start).</param>
/// <param name="AtCriticalDepth">True where the energy equation had no root of the regime asked and critical depth was taken instead.</param>
public readonly record struct ReachStation(
    double Distance, double BedElevation, double Elevation, double Depth, double Area, double TopWidth, double Velocity,
    double FroudeNumber, double EnergyElevation, double FrictionSlope, double CriticalElevation, double FrictionLoss,
    double TransitionLoss, int Iterations, double Residual, bool AtCriticalDepth);

/// <summary>Water-surface elevations along a surveyed reach by the standard step method.</summary>
public sealed record ReachProfile
{
    /// <summary>The stations, downstream end first (as many as sections; fewer when <see cref="OvertopsSection"/> is set).</summary>
    public required IReadOnlyList<ReachStation> Stations { get; init; }

    /// <summary>Newton steps over all sections.</summary>
    public required int Iterations { get; init; }

    /// <summary>True when every section's energy equation met its tolerance.</summary>
    public required bool Converged { get; init; }

    /// <summary>The largest |energy equation| over the steps, m.</summary>
    public required double Residual { get; init; }

    /// <summary>The index of the section whose water surface would rise above its lower end point (the survey does not
    /// reach high enough), or null. The stations then stop before it.</summary>
    public required int? OvertopsSection { get; init; }

    /// <summary>Warnings with stable codes.</summary>
    public required IReadOnlyList<CalculationWarning> Warnings { get; init; }
}

/// <summary>Why a starting elevation cannot start the computation.</summary>
public enum ReachStartProblem
{
    /// <summary>None.</summary>
    None,

    /// <summary>At or below the start section's lowest point.</summary>
    BelowBed,

    /// <summary>Above the start section's lower end point.</summary>
    AboveSection,

    /// <summary>A downstream start below critical depth (supercritical flow is controlled from upstream).</summary>
    DownstreamStartSupercritical,

    /// <summary>An upstream start above critical depth (subcritical flow is controlled from downstream).</summary>
    UpstreamStartSubcritical,
}

/// <summary>
/// The standard step method for a surveyed reach: from a known water surface at one end, each next section's
/// water-surface elevation z is the root of the energy equation between neighbouring sections,
/// z_u + V_u^2/(2g) = z_d + V_d^2/(2g) + L (Sf_u + Sf_d)/2 + C |V_d^2/(2g) - V_u^2/(2g)|
/// (u upstream, d downstream, L the distance between them, Sf Manning's friction slope, energy coefficient 1; C the
/// contraction coefficient where the velocity head grows downstream, the expansion coefficient where it falls).
/// </summary>
/// <remarks>
/// <para>Method: the energy equation between sections with the average friction slope (Chow 1959, Open-Channel
/// Hydraulics, section 10-4; Henderson 1966, Open Channel Flow, section 4.8; both from memory). The average of the two
/// friction slopes is the trapezoidal rule for the friction integral, so on a prismatic channel without transition
/// losses the result converges to the gradually-varied-flow profile with the square of the spacing. Expansion and
/// contraction coefficients 0.3 and 0.1 for gradual transitions are common practice.</para>
/// <para>Roots: the equation has two roots at most sections, one subcritical and one supercritical. Steps upstream
/// (subcritical flow) take the highest root, and only when it lies at or above the section's critical depth; steps
/// downstream (supercritical flow) the lowest root at or below it. The roots are bracketed by a scan of the residual
/// over the section's depth range (survey break depths included, spacing finest next to critical depth, and a
/// golden-section search of the lowest cell when no sign change shows), then solved in the water-surface elevation by
/// safeguarded Newton with a checked bracket: the residual is smooth between survey break depths and the switch
/// between the two loss coefficients, and the bracket keeps the iteration safe across both. Where no root of the
/// regime exists the section takes its critical depth, with a warning.</para>
/// <para>A subcritical step whose residual is still negative at the section's lower end point needs a higher water
/// surface than the survey describes: the computation stops there (<see cref="ReachProfile.OvertopsSection"/>).</para>
/// </remarks>
public static class StandardStep
{
    private const double G = Physical.StandardGravity;

    /// <summary>The default expansion coefficient for gradual transitions, 0.3 (common practice).</summary>
    public const double DefaultExpansionCoefficient = 0.3;

    /// <summary>The default contraction coefficient for gradual transitions, 0.1 (common practice).</summary>
    public const double DefaultContractionCoefficient = 0.1;

    /// <summary>A start this close to critical depth on the other side (relative) is taken as given: a rounded critical depth.</summary>
    public const double StartCriticalTolerance = 1e-3;

    // Elevations in m: steps to 1e-12 m or 4 ulps of the elevation, or a residual of 1e-13 m.
    private static readonly SolverOptions Options = new(1e-12, 4 * SolverOptions.MachineEpsilon, 1e-13, 100);

    /// <summary>Cells of the bracketing scan between critical depth and the far end of the range.</summary>
    private const int ScanCells = 48;

    /// <summary>Whether <paramref name="startElevation"/> can start the computation, or why not.</summary>
    /// <param name="start">The section at the start end.</param>
    /// <param name="flow">Discharge, m3/s.</param>
    /// <param name="startElevation">Water-surface elevation there, m.</param>
    /// <param name="from">Which end the start section is.</param>
    /// <returns>The problem, and the start section's critical elevation (NaN where it has no critical depth below its top).</returns>
    public static (ReachStartProblem Problem, double CriticalElevation) CheckStart(ReachSection start, double flow, double startElevation, ReachStart from)
    {
        ArgumentNullException.ThrowIfNull(start);
        ChannelGuard.Positive(flow, nameof(flow));
        var s = start.Section;
        double depth = startElevation - s.InvertElevation;
        var solved = CriticalFlow.CriticalDepth(s, flow);
        // An unconverged critical depth cannot judge the regime: the start is then taken as given.
        double yc = solved.Converged || double.IsNaN(solved.CriticalDepth) ? solved.CriticalDepth : 0.0;
        double critical = yc > 0 ? s.InvertElevation + yc : double.NaN;
        if (!(depth > 0)) return (ReachStartProblem.BelowBed, critical);
        if (depth > s.MaximumDepth) return (ReachStartProblem.AboveSection, critical);
        if (from == ReachStart.Downstream && (double.IsNaN(yc) || depth < yc * (1 - StartCriticalTolerance)))
            return (ReachStartProblem.DownstreamStartSupercritical, critical);
        if (from == ReachStart.Upstream && yc > 0 && depth > yc * (1 + StartCriticalTolerance))
            return (ReachStartProblem.UpstreamStartSubcritical, critical);
        return (ReachStartProblem.None, critical);
    }

    /// <summary>The water surface along a reach.</summary>
    /// <param name="sections">The sections, in increasing distance (downstream end first); at least two.</param>
    /// <param name="flow">Discharge Q, m3/s; greater than 0.</param>
    /// <param name="startElevation">The known water-surface elevation at the start end, m; must pass <see cref="CheckStart"/>.</param>
    /// <param name="from">Which end holds it.</param>
    /// <param name="expansionCoefficient">Loss coefficient where the velocity head falls along the flow; 0 to 1.</param>
    /// <param name="contractionCoefficient">Loss coefficient where the velocity head grows along the flow; 0 to 1.</param>
    /// <exception cref="ArgumentException">Fewer than two sections, distances not increasing, a coefficient or the
    /// flow out of range, or a start elevation that <see cref="CheckStart"/> refuses.</exception>
    public static ReachProfile Solve(IReadOnlyList<ReachSection> sections, double flow, double startElevation, ReachStart from,
        double expansionCoefficient = DefaultExpansionCoefficient, double contractionCoefficient = DefaultContractionCoefficient)
    {
        ArgumentNullException.ThrowIfNull(sections);
        if (sections.Count < 2) ChannelGuard.Throw(nameof(sections), "a reach needs at least two sections");
        for (int i = 0; i < sections.Count; i++)
        {
            ArgumentNullException.ThrowIfNull(sections[i]);
            if (!double.IsFinite(sections[i].Distance)) ChannelGuard.Throw(nameof(sections), $"section {i}: the distance is not finite");
            if (!(sections[i].ManningN >= 0) || double.IsInfinity(sections[i].ManningN)) ChannelGuard.Throw(nameof(sections), $"section {i}: Manning n must be finite and not negative");
            if (i > 0 && !(sections[i].Distance > sections[i - 1].Distance))
                ChannelGuard.Throw(nameof(sections), $"section {i}: distances must increase upstream");
        }
        ChannelGuard.Positive(flow, nameof(flow));
        Coefficient(expansionCoefficient, nameof(expansionCoefficient));
        Coefficient(contractionCoefficient, nameof(contractionCoefficient));
        bool upstreamSteps = from == ReachStart.Downstream;
        int first = upstreamSteps ? 0 : sections.Count - 1;
        if (CheckStart(sections[first], flow, startElevation, from).Problem != ReachStartProblem.None)
            throw new ArgumentOutOfRangeException(nameof(startElevation), startElevation, "cannot start the computation (see CheckStart)");

        var stations = new ReachStation[sections.Count];
        var warnings = new List<CalculationWarning>();
        var known = Station(sections[first], flow, CriticalDepthOf(sections[first].Section, flow), startElevation, 0, 0, 0, 0, false);
        stations[first] = known;
        int iterations = 0;
        bool converged = true;
        double residual = 0;
        int? overtops = null;
        for (int step = 1; step < sections.Count; step++)
        {
            int index = upstreamSteps ? step : sections.Count - 1 - step;
            var section = sections[index];
            var prior = sections[upstreamSteps ? index - 1 : index + 1];
            var f = new EnergyResidual(section, known, flow, Math.Abs(section.Distance - prior.Distance),
                unknownUpstream: upstreamSteps, expansionCoefficient, contractionCoefficient);
            // One critical-depth solve per section serves the bracket and the answer.
            var critical = CriticalFlow.CriticalDepth(section.Section, flow);
            double yc = critical.Converged ? critical.CriticalDepth : double.NaN;
            var outcome = Step(f, section, critical, upstreamSteps);
            if (outcome.Overtops)
            {
                overtops = index;
                break;
            }
            ReachStation station;
            if (outcome.Critical)
            {
                double z = section.Section.InvertElevation + outcome.Depth;
                var (_, hf, ho) = f.Terms(outcome.Depth);
                station = Station(section, flow, yc, z, hf, ho, 0, 0, true);
                warnings.Add(new(upstreamSteps ? "no-subcritical-solution" : "no-supercritical-solution", string.Create(CultureInfo.InvariantCulture,
                    $"sections[{index}] (distance {section.Distance:G6} m): the energy equation from the section before has no {(upstreamSteps ? "subcritical" : "supercritical")} root, so critical depth ({outcome.Depth:G6} m, elevation {z:G6} m) is taken there. The flow passes through critical depth near this section (a drop, a jump or a control); the elevations next to it are estimates only.")));
            }
            else
            {
                var root = outcome.Root;
                iterations += root.Iterations;
                converged &= root.Converged;
                double z = section.Section.InvertElevation + root.Root;
                double r = f.Evaluate(root.Root).Value;
                residual = Math.Max(residual, Math.Abs(r));
                var (_, hf, ho) = f.Terms(root.Root);
                station = Station(section, flow, yc, z, hf, ho, root.Iterations, r, false);
                if (!root.Converged)
                    warnings.Add(new("not-converged", $"sections[{index}]: the energy equation did not meet its tolerance ({root.Reason})."));
            }
            stations[index] = station;
            known = station;
        }

        IReadOnlyList<ReachStation> list = stations;
        if (overtops is int k)
            list = upstreamSteps ? stations[..k] : stations[(k + 1)..];
        return new ReachProfile
        {
            Stations = list, Iterations = iterations, Converged = converged && overtops is null, Residual = residual,
            OvertopsSection = overtops, Warnings = warnings,
        };
    }

    private static void Coefficient(double value, string name)
    {
        if (!(value >= 0 && value <= 1)) throw new ArgumentOutOfRangeException(name, value, "must lie in 0 to 1");
    }

    private readonly record struct StepOutcome(RootResult Root, double Depth, bool Critical, bool Overtops);

    /// <summary>Brackets the root of the regime asked and solves it; or critical depth; or overtopping.</summary>
    private static StepOutcome Step(in EnergyResidual f, ReachSection reach, CriticalDepthResult critical, bool upstreamSteps)
    {
        var s = reach.Section;
        double top = s.MaximumDepth;
        double yc = critical.CriticalDepth;
        // A section that cannot pass the flow at critical depth below its top needs water above it.
        if (double.IsNaN(yc)) return new(default, double.NaN, false, true);
        // Without a trustworthy critical depth there is no bracket of the regime: the step is reported unconverged.
        if (!critical.Converged) return new(new RootResult(yc, 0, 0, double.NaN, yc, yc, 0, critical.Status), double.NaN, false, false);
        if (upstreamSteps && f.Value(top) < 0) return new(default, double.NaN, false, true);

        // Subcritical: from the top down to critical depth. Supercritical: from a depth where the residual is provably
        // positive up to critical depth. The first sign change met is the root of the regime asked.
        double[] ys = upstreamSteps ? GridDown(s, yc, top) : GridUp(s, LowestDepth(f, yc), yc);
        var fs = new double[ys.Length];
        fs[0] = f.Value(ys[0]);
        if (fs[0] == 0) return new(Solve(f, ys[0], ys[0], 0, 0), double.NaN, false, false);
        // Positive at the start of the scan by construction; anything else is arithmetic out of range (reported unconverged).
        if (!(fs[0] > 0)) return new(new RootResult(ys[0], 0, 1, fs[0], ys[0], ys[0], 0, SolveStatus.NonFiniteValue), double.NaN, false, false);
        int lowest = 0;
        for (int i = 1; i < ys.Length; i++)
        {
            fs[i] = f.Value(ys[i]);
            if (fs[i] <= 0) return new(Solve(f, ys[i - 1], ys[i], fs[i - 1], fs[i]), double.NaN, false, false);
            if (fs[i] < fs[lowest]) lowest = i;
        }

        // No sign change on the grid: a golden-section search for the minimum between the lowest value's neighbours. A
        // negative minimum brackets a root with the neighbour on the side the scan came from.
        int before = Math.Max(lowest - 1, 0), after = Math.Min(lowest + 1, ys.Length - 1);
        if (Minimum(f, ys[before], ys[after]) is double p)
            return new(Solve(f, ys[before], p, fs[before], f.Value(p)), double.NaN, false, false);
        return new(default, yc, true, false);
    }

    private static RootResult Solve(in EnergyResidual f, double a, double b, double fa, double fb)
    {
        if (fb == 0 || a == b) return new RootResult(b, 0, 1, fb, b, b, 0, SolveStatus.ConvergedOnResidual);
        if (fa == 0) return new RootResult(a, 0, 1, 0, a, a, 0, SolveStatus.ConvergedOnResidual);
        (a, b, fa, fb) = a < b ? (a, b, fa, fb) : (b, a, fb, fa);
        // Started from the secant point of the scan's cell; the solver checks the cell's signs again.
        double start = a - fa * (b - a) / (fb - fa);
        return SafeguardedNewton.Solve(f, Bracket.Checked(a, b), start, Options);
    }

    /// <summary>Depths from the top down to critical depth: a grid finest next to critical depth, and the survey's break depths.</summary>
    private static double[] GridDown(SurveyedSection s, double yc, double top)
    {
        var points = new SortedSet<double>();
        for (int k = 0; k <= ScanCells; k++)
        {
            double t = (double)k / ScanCells;
            points.Add(yc + (top - yc) * t * t);
        }
        foreach (double d in s.BreakDepths) if (d > yc && d < top) points.Add(d);
        return points.Reverse().ToArray();
    }

    /// <summary>Depths from the lowest up to critical depth: geometric from the lowest, finest next to critical depth, and the survey's break depths.</summary>
    private static double[] GridUp(SurveyedSection s, double lowest, double yc)
    {
        var points = new SortedSet<double>();
        double ratio = yc / lowest;
        for (int k = 0; k <= ScanCells; k++)
            points.Add(k == ScanCells ? yc : lowest * Math.Pow(ratio, Math.Sqrt((double)k / ScanCells)));
        foreach (double d in s.BreakDepths) if (d > lowest && d < yc) points.Add(d);
        return points.ToArray();
    }

    /// <summary>A depth below critical depth at which the residual of a downstream step is positive.</summary>
    /// <remarks>The residual is at least z_b + y + V^2/(2g) - H_known (the losses are never negative), so it is positive
    /// wherever the velocity head alone exceeds the known energy above this bed; the area falls to zero with the depth,
    /// so halving the depth from a thousandth of critical depth reaches such a depth.</remarks>
    private static double LowestDepth(in EnergyResidual f, double yc)
    {
        double y = 1e-3 * yc;
        for (int k = 0; k < 200 && !(f.Value(y) > 0); k++) y *= 0.5;
        return y;
    }

    /// <summary>Golden-section search for a negative value of the residual on [a, b]; the first point found, or null.</summary>
    private static double? Minimum(in EnergyResidual f, double a, double b)
    {
        const double R = 0.6180339887498949;
        double c = b - R * (b - a), d = a + R * (b - a);
        double fc = f.Value(c), fd = f.Value(d);
        for (int k = 0; k < 60; k++)
        {
            if (fc < 0) return c;
            if (fd < 0) return d;
            if (fc < fd) { b = d; d = c; fd = fc; c = b - R * (b - a); fc = f.Value(c); }
            else { a = c; c = d; fc = fd; d = a + R * (b - a); fd = f.Value(d); }
        }
        return null;
    }

    /// <summary>The (lowest) critical depth, or NaN where there is none below the top or its solve did not converge.</summary>
    private static double CriticalDepthOf(SurveyedSection s, double flow)
    {
        var critical = CriticalFlow.CriticalDepth(s, flow);
        return critical.Converged ? critical.CriticalDepth : double.NaN;
    }

    private static ReachStation Station(ReachSection reach, double flow, double yc, double elevation, double frictionLoss, double transitionLoss,
        int iterations, double residual, bool atCritical)
    {
        var s = reach.Section;
        double depth = elevation - s.InvertElevation;
        var g = s.Evaluate(depth);
        double v = flow / g.Area;
        double k = g.Conveyance(reach.ManningN);
        return new ReachStation(reach.Distance, s.InvertElevation, elevation, depth, g.Area, g.TopWidth, v,
            flow * Math.Sqrt(g.TopWidth / (G * g.Area * g.Area * g.Area)), elevation + v * v / (2 * G), flow * flow / (k * k),
            s.InvertElevation + yc, frictionLoss, transitionLoss, iterations, residual, atCritical);
    }

    /// <summary>
    /// The energy equation in the unknown section's depth y: H(y) - H_known - L (Sf(y) + Sf_known)/2 - h_t(y) for a step
    /// upstream, H(y) - H_known + L (Sf(y) + Sf_known)/2 + h_t(y) for a step downstream (H the energy elevation, h_t the
    /// transition loss), with its derivative: dH/dy = 1 - Fr^2, dSf/dy = -2 Sf dlnK/dy, d(V^2/2g)/dy = -Fr^2.
    /// </summary>
    private readonly struct EnergyResidual(ReachSection unknown, ReachStation known, double flow, double length,
        bool unknownUpstream, double expansion, double contraction) : IDifferentiableFunction
    {
        public double Value(double y) => Evaluate(y).Value;

        public (double Value, double Derivative) Evaluate(double y)
        {
            var g = unknown.Section.Evaluate(y, fromBelow: y >= unknown.Section.MaximumDepth);
            double a = g.Area;
            double hv = flow * flow / (2 * G * a * a);
            double fr2 = flow * flow * g.TopWidth / (G * a * a * a);
            double k = g.Conveyance(unknown.ManningN);
            double sf = flow * flow / (k * k);
            double dSf = -2 * sf * g.LogConveyanceDerivative(unknown.ManningN);
            double energy = unknown.Section.InvertElevation + y + hv;
            double knownHv = known.EnergyElevation - known.Elevation;
            // Velocity head downstream less upstream: positive for a contraction along the flow.
            double change = unknownUpstream ? knownHv - hv : hv - knownHv;
            double dChange = unknownUpstream ? fr2 : -fr2;
            double c = change > 0 ? contraction : expansion;
            double transition = c * Math.Abs(change);
            double dTransition = c * Math.Sign(change) * dChange;
            double friction = 0.5 * length * (sf + known.FrictionSlope);
            double sign = unknownUpstream ? -1 : 1;
            double value = energy - known.EnergyElevation + sign * (friction + transition);
            double derivative = 1 - fr2 + sign * (0.5 * length * dSf + dTransition);
            return (value, derivative);
        }

        /// <summary>The residual, the friction loss and the transition loss at depth y.</summary>
        public (double Value, double Friction, double Transition) Terms(double y)
        {
            var g = unknown.Section.Evaluate(y, fromBelow: y >= unknown.Section.MaximumDepth);
            double hv = flow * flow / (2 * G * g.Area * g.Area);
            double k = g.Conveyance(unknown.ManningN);
            double sf = flow * flow / (k * k);
            double knownHv = known.EnergyElevation - known.Elevation;
            double change = unknownUpstream ? knownHv - hv : hv - knownHv;
            double transition = (change > 0 ? contraction : expansion) * Math.Abs(change);
            return (Value(y), 0.5 * length * (sf + known.FrictionSlope), transition);
        }
    }
}
