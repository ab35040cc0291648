using System.Globalization;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>Why a hydraulic-jump evaluation has or has no answer.</summary>
public enum JumpStatus
{
    /// <summary>The sequent depth was found.</summary>
    Solved,

    /// <summary>The upstream depth is not supercritical (Froude number at most 1): no jump forms from it.</summary>
    NotSupercritical,

    /// <summary>The sequent depth would lie above the top of the section (a pipe would run full, a survey would overtop).</summary>
    AboveSection,

    /// <summary>The root solve stopped without meeting its tolerances.</summary>
    NotConverged,
}

/// <summary>A hydraulic jump in a prismatic channel: the depths on both sides, the Froude numbers, the energy lost.</summary>
public sealed record HydraulicJumpResult
{
    /// <summary>Depth before the jump, m (as given).</summary>
    public required double UpstreamDepth { get; init; }

    /// <summary>Depth after the jump (the conjugate or sequent depth), m; NaN without an answer.</summary>
    public required double SequentDepth { get; init; }

    /// <summary>Froude number Q sqrt(T/(g A^3)) before the jump.</summary>
    public required double UpstreamFroudeNumber { get; init; }

    /// <summary>Froude number after the jump.</summary>
    public required double DownstreamFroudeNumber { get; init; }

    /// <summary>Specific energy y + Q^2/(2 g A^2) before the jump, m.</summary>
    public required double UpstreamSpecificEnergy { get; init; }

    /// <summary>Specific energy after the jump, m.</summary>
    public required double DownstreamSpecificEnergy { get; init; }

    /// <summary>Energy dissipated in the jump, m: the difference of the two specific energies.</summary>
    public double EnergyLoss => UpstreamSpecificEnergy - DownstreamSpecificEnergy;

    /// <summary>The momentum function per unit weight M = A ybar + Q^2/(g A), m3, equal on both sides.</summary>
    public required double MomentumFunction { get; init; }

    /// <summary>Mean velocities before and after the jump, m/s.</summary>
    public required double UpstreamVelocity { get; init; }

    /// <inheritdoc cref="UpstreamVelocity"/>
    public required double DownstreamVelocity { get; init; }

    /// <summary>Length of the jump on a horizontal rectangular apron, 6.1 times the sequent depth, m (Peterka 1958; see
    /// <see cref="HydraulicJump.LengthSource"/>); stated for any shape, with its range in the validity.</summary>
    public double JumpLength => HydraulicJump.LengthRatio * SequentDepth;

    /// <summary>Newton steps of the sequent-depth solve.</summary>
    public required int Iterations { get; init; }

    /// <summary>|M(y2) - M(y1)| / M(y1) at the sequent depth returned.</summary>
    public required double Residual { get; init; }

    /// <summary>The solver's stop reason.</summary>
    public required SolveStatus SolverStatus { get; init; }

    /// <summary>Solved, or why not.</summary>
    public required JumpStatus Status { get; init; }

    /// <summary>True when the sequent depth was found to tolerance.</summary>
    public bool Converged => Status == JumpStatus.Solved;

    /// <summary>Warnings with stable codes.</summary>
    public required IReadOnlyList<CalculationWarning> Warnings { get; init; }

    /// <summary>The published ranges that apply beside the values.</summary>
    public required IReadOnlyList<ValidityCheck> Validity { get; init; }
}

/// <summary>
/// The hydraulic jump: the sequent depth y2 that carries the same momentum function as the supercritical depth y1,
/// M(y) = A(y) ybar(y) + Q^2/(g A(y)), where A ybar is the first moment of the flow area about the water surface,
/// equal to the integral of A from 0 to y (the momentum equation for a short horizontal reach with hydrostatic pressure
/// and uniform velocity; Belanger, 1828, for the rectangle, where y2/y1 = (sqrt(1 + 8 Fr1^2) - 1)/2; Chow 1959,
/// Open-Channel Hydraulics, chapter 15, from memory). Every section shape: closed forms for the rectangle, trapezoid,
/// triangle and part-full circle, and an exact piecewise Simpson rule for a surveyed section (its area is quadratic
/// in depth between the survey's break depths, so the rule is exact there).
/// </summary>
public static class HydraulicJump
{
    /// <summary>Jump length over sequent depth on a horizontal rectangular apron.</summary>
    public const double LengthRatio = 6.1;

    /// <summary>Where <see cref="LengthRatio"/> comes from, and its range.</summary>
    public const string LengthSource =
        "Peterka (1958), Hydraulic design of stilling basins and energy dissipators, USBR Engineering Monograph 25: " +
        "L about 6.1 y2 on a horizontal rectangular apron for upstream Froude numbers 4.5 to 13 (from memory)";

    /// <summary>Upstream Froude numbers over which <see cref="LengthRatio"/> holds.</summary>
    public const double LengthMinimumFroude = 4.5, LengthMaximumFroude = 13;

    private const double G = Physical.StandardGravity;

    private static readonly SolverOptions Options = new(0.0, 1e-14, 1e-15, 100);

    /// <summary>The first moment of the flow area about the water surface, A ybar = integral of A from 0 to y, m3.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="depth">Depth above the invert, m; from 0 to the section's maximum depth.</param>
    public static double FirstMoment(ChannelSection section, double depth)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Depth(depth, section.MaximumDepth, nameof(depth));
        double y = depth;
        switch (section)
        {
            case RectangularSection r:
                return r.Width * y * y / 2;
            case TrapezoidalSection t:
                return t.BottomWidth * y * y / 2 + (t.LeftSideSlope + t.RightSideSlope) * y * y * y / 6;
            case TriangularSection t:
                return (t.LeftSideSlope + t.RightSideSlope) * y * y * y / 6;
            case CircularSection c:
            {
                // Central angle theta of the water surface; the segment's centroid lies 4 r sin^3(theta/2) / (3 (theta - sin theta))
                // from the centre and the surface r cos(theta/2) from it, so A ybar = (2/3) r^3 sin^3(theta/2) - r cos(theta/2) A.
                double r = c.Diameter / 2;
                double half = Math.Acos(Math.Clamp(1 - y / r, -1.0, 1.0));
                double area = r * r * (2 * half - Math.Sin(2 * half)) / 2;
                double s = Math.Sin(half);
                return 2.0 / 3.0 * r * r * r * s * s * s - r * Math.Cos(half) * area;
            }
            case SurveyedSection s:
            {
                double sum = 0, lower = 0;
                foreach (double b in s.BreakDepths)
                {
                    if (b >= y) break;
                    sum += Simpson(s, lower, b);
                    lower = b;
                }
                return sum + Simpson(s, lower, y);
            }
            default:
                throw new ArgumentException("unknown section shape", nameof(section));
        }
    }

    private static double Simpson(ChannelSection s, double a, double b) =>
        b <= a ? 0.0 : (b - a) / 6 * (s.Evaluate(a).Area + 4 * s.Evaluate(0.5 * (a + b)).Area + s.Evaluate(b, fromBelow: true).Area);

    /// <summary>The momentum function per unit weight M = A ybar + Q^2/(g A), m3.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s.</param>
    /// <param name="depth">Depth, m; greater than 0.</param>
    public static double MomentumFunction(ChannelSection section, double flow, double depth) =>
        FirstMoment(section, depth) + flow * flow / (G * section.At(depth).Area);

    /// <summary>The sequent depth of a supercritical depth, and the jump between them.</summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than 0.</param>
    /// <param name="upstreamDepth">The supercritical depth before the jump, m; greater than 0 and within the section.</param>
    /// <param name="trace">Optional per-iteration record of the sequent-depth solve (in y, m).</param>
    /// <exception cref="ArgumentOutOfRangeException">The flow or the depth is out of its domain.</exception>
    public static HydraulicJumpResult Solve(ChannelSection section, double flow, double upstreamDepth, SolverTrace? trace = null)
    {
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(flow, nameof(flow));
        ChannelGuard.Positive(upstreamDepth, nameof(upstreamDepth));
        ChannelGuard.Depth(upstreamDepth, section.MaximumDepth, nameof(upstreamDepth));

        var at1 = section.At(upstreamDepth);
        double fr1 = Froude(at1, flow);
        double m1 = FirstMoment(section, upstreamDepth) + flow * flow / (G * at1.Area);
        var warnings = new List<CalculationWarning>();
        if (!(fr1 > 1))
            return Result(section, flow, upstreamDepth, double.NaN, m1, 0, double.NaN, SolveStatus.NoSignChange, JumpStatus.NotSupercritical, warnings);

        // M falls while the flow is supercritical and rises once it is subcritical: the first depth above y1 where
        // M - M1 turns non-negative is the sequent depth. Find an upper end (double it in an open channel), scan for the
        // first sign change, then solve there with dM/dy = A (1 - Fr^2).
        var function = new MomentumResidual(section, flow, m1);
        double top = section.MaximumDepth;
        double upper;
        if (double.IsPositiveInfinity(top))
        {
            upper = 2 * upstreamDepth;
            for (int k = 0; k < 200 && function.Value(upper) < 0; k++) upper *= 2;
        }
        else
        {
            upper = top;
        }
        if (!(function.Value(upper) >= 0))
            return Result(section, flow, upstreamDepth, double.NaN, m1, 0, double.NaN, SolveStatus.NoSignChange, JumpStatus.AboveSection, warnings);

        const int Scan = 512;
        double previous = upstreamDepth, found = upper;
        for (int k = 1; k <= Scan; k++)
        {
            double d = upstreamDepth + (upper - upstreamDepth) * k / Scan;
            if (function.Value(d) >= 0) { found = d; break; }
            previous = d;
        }
        var root = SafeguardedNewton.Solve(function, Bracket.KnownIncreasing(previous, found), 0.5 * (previous + found), Options, trace);
        double y2 = root.Root;
        double residual = Math.Abs(function.Value(y2)) / m1;
        var status = root.Converged ? JumpStatus.Solved : JumpStatus.NotConverged;
        if (!root.Converged)
            warnings.Add(new("not-converged", $"The sequent-depth solve stopped without meeting its tolerance ({root.Status.Reason()})."));
        return Result(section, flow, upstreamDepth, y2, m1, root.Iterations, residual, root.Status, status, warnings);
    }

    /// <summary>
    /// Sensitivities of the sequent depth y2 and the energy loss to the flow Q and the upstream depth y1, by implicit
    /// differentiation of M(y2, Q) - M(y1, Q) = 0 with M_y = A (1 - Fr^2) (the derivative the Newton solve used) and
    /// M_Q = 2 Q/(g A): dy2/dy1 = M_y(y1)/M_y(y2), dy2/dQ = -(M_Q(y2) - M_Q(y1))/M_y(y2); the loss E(y1) - E(y2) with
    /// E_y = 1 - Fr^2 and E_Q = Q/(g A^2) follows by the chain rule.
    /// </summary>
    /// <param name="section">The cross-section.</param>
    /// <param name="flow">Discharge Q, m3/s.</param>
    /// <param name="upstreamDepth">y1, m.</param>
    /// <param name="sequentDepth">y2 as solved, m.</param>
    public static (double SequentByFlow, double SequentByUpstreamDepth, double LossByFlow, double LossByUpstreamDepth) Sensitivities(
        ChannelSection section, double flow, double upstreamDepth, double sequentDepth)
    {
        ArgumentNullException.ThrowIfNull(section);
        var g1 = section.At(upstreamDepth);
        var g2 = section.At(sequentDepth);
        double fr1 = flow * flow * g1.TopWidth / (G * g1.Area * g1.Area * g1.Area);
        double fr2 = flow * flow * g2.TopWidth / (G * g2.Area * g2.Area * g2.Area);
        double my1 = g1.Area * (1 - fr1), my2 = g2.Area * (1 - fr2);
        double dY2dY1 = my1 / my2;
        double dY2dQ = -(2 * flow / G) * (1 / g2.Area - 1 / g1.Area) / my2;
        double dLossdY1 = (1 - fr1) - (1 - fr2) * dY2dY1;
        double dLossdQ = flow / (G * g1.Area * g1.Area) - flow / (G * g2.Area * g2.Area) - (1 - fr2) * dY2dQ;
        return (dY2dQ, dY2dY1, dLossdQ, dLossdY1);
    }

    private static double Froude(in SectionGeometry g, double flow) => flow * Math.Sqrt(g.TopWidth / (G * g.Area * g.Area * g.Area));

    private static HydraulicJumpResult Result(ChannelSection section, double flow, double y1, double y2, double m1, int iterations,
        double residual, SolveStatus solver, JumpStatus status, List<CalculationWarning> warnings)
    {
        var g1 = section.At(y1);
        double v1 = flow / g1.Area, fr1 = Froude(g1, flow);
        double v2 = double.NaN, fr2 = double.NaN, e2 = double.NaN;
        var validity = new List<ValidityCheck>
        {
            new("momentum", "momentum equation for a short horizontal reach: hydrostatic pressure, uniform velocity, no bed friction (common practice)",
                "upstreamFroudeNumber", 1, double.PositiveInfinity, fr1),
        };
        if (status is JumpStatus.Solved or JumpStatus.NotConverged)
        {
            var g2 = section.At(y2);
            v2 = flow / g2.Area;
            fr2 = Froude(g2, flow);
            e2 = y2 + v2 * v2 / (2 * G);
            validity.Add(new("peterka-1958-length", LengthSource, "upstreamFroudeNumber", LengthMinimumFroude, LengthMaximumFroude, fr1));
            if (section is not RectangularSection)
                warnings.Add(new("jump-length-rectangular-only", "The jump length is the rectangular apron's relation, L = 6.1 y2 (Peterka 1958); in other shapes jumps are longer and less stable: treat it as an indication only (common practice)."));
            else if (fr1 < LengthMinimumFroude || fr1 > LengthMaximumFroude)
                warnings.Add(new("jump-length-outside-range", string.Create(CultureInfo.InvariantCulture,
                    $"The upstream Froude number {fr1:G4} lies outside 4.5 to 13, where L = 6.1 y2 was measured (Peterka 1958); the length is an estimate only.")));
            if (fr1 < 1.7)
                warnings.Add(new("undular-jump", string.Create(CultureInfo.InvariantCulture,
                    $"The upstream Froude number {fr1:G4} is below about 1.7: the jump is undular (a train of standing waves), and the depths are those of the momentum balance only (common practice).")));
        }
        return new HydraulicJumpResult
        {
            UpstreamDepth = y1, SequentDepth = y2, UpstreamFroudeNumber = fr1, DownstreamFroudeNumber = fr2,
            UpstreamSpecificEnergy = y1 + v1 * v1 / (2 * G), DownstreamSpecificEnergy = e2, MomentumFunction = m1,
            UpstreamVelocity = v1, DownstreamVelocity = v2, Iterations = iterations, Residual = residual,
            SolverStatus = solver, Status = status, Warnings = warnings, Validity = validity,
        };
    }

    /// <summary>M(y) - M1 and dM/dy = A - Q^2 T / (g A^2) = A (1 - Fr^2).</summary>
    private readonly struct MomentumResidual(ChannelSection section, double flow, double target) : IDifferentiableFunction
    {
        public double Value(double y) => y <= 0 ? double.NegativeInfinity : FirstMoment(section, Math.Min(y, section.MaximumDepth))
            + flow * flow / (G * section.Evaluate(Math.Min(y, section.MaximumDepth), fromBelow: true).Area) - target;

        public (double Value, double Derivative) Evaluate(double y)
        {
            var g = section.Evaluate(y, fromBelow: true);
            double m = FirstMoment(section, y) + flow * flow / (G * g.Area) - target;
            return (m, g.Area - flow * flow * g.TopWidth / (G * g.Area * g.Area));
        }
    }
}
