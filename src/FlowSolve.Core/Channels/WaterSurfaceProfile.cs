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
}

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
        ArgumentNullException.ThrowIfNull(section);
        ChannelGuard.Positive(flow, nameof(flow));
        ChannelGuard.Positive(manningN, nameof(manningN));
        ChannelGuard.Positive(length, nameof(length));
        ChannelGuard.Depth(controlDepth, section.MaximumDepth, nameof(controlDepth));
        ArgumentOutOfRangeException.ThrowIfLessThan(stations, 2);
        if (!double.IsFinite(slope)) throw new ArgumentOutOfRangeException(nameof(slope), slope, "must be finite");

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

        // s: distance from the control along the integration (upstream for a downstream control). ds/dy = phi(y).
        var phi = new Slope(section, flow, slope, manningN, controlDownstream);
        double direction = Math.Sign(1.0 / phi.At(controlDepth));
        // Where the depth tends as s grows: the nearest of yn and yc in the direction of travel, else the section's top or 0.
        double limit = direction > 0 ? section.MaximumDepth : 0.0;
        bool limitIsCritical = false;
        foreach (double candidate in new[] { yn, yc })
        {
            if (double.IsNaN(candidate)) continue;
            bool ahead = direction > 0 ? candidate > controlDepth && candidate < limit : candidate < controlDepth && candidate > limit;
            if (ahead) { limit = candidate; limitIsCritical = candidate == yc; }
        }

        var warnings = new List<CalculationWarning>();
        var list = new List<ProfileStation>(stations);
        double spacing = length / (stations - 1);
        double yPrev = controlDepth, sPrev = 0;
        int iterations = 0;
        bool converged = true;
        double residual = 0;
        double? criticalAt = null;
        list.Add(Station(section, flow, manningN, controlDownstream ? 0 : length, controlDepth));

        // How far the profile runs before it meets critical depth or the section's top, when it tends to either.
        double sEnd = double.PositiveInfinity;
        if (limitIsCritical || (!double.IsInfinity(limit) && limit > 0 && limit != yn))
            sEnd = Integrate(phi, controlDepth, limit);

        for (int k = 1; k < stations; k++)
        {
            double s = k * spacing;
            if (s > sEnd)
            {
                double at = controlDownstream ? sEnd : length - sEnd;
                if (limitIsCritical)
                {
                    criticalAt = at;
                    warnings.Add(new("reaches-critical-depth", string.Create(CultureInfo.InvariantCulture,
                        $"The profile reaches critical depth ({yc:G6} m) {at:G6} m from the downstream end, inside the reach: the gradually-varied-flow equation does not hold beyond it (a hydraulic jump or a drop forms there), so no stations are given past it.")));
                }
                else
                {
                    warnings.Add(new("profile-leaves-section", string.Create(CultureInfo.InvariantCulture,
                        $"The profile reaches the top of the section ({section.MaximumDepth:G6} m) {at:G6} m from the downstream end: the channel would overflow or run full; no stations are given past it.")));
                }
                list.Add(Station(section, flow, manningN, at, limit));
                break;
            }
            // The depth where s is reached lies between the last station's depth and the limit; with no finite limit
            // ahead (an H2 or A2 profile rising upstream), double the step until it is passed.
            double far = limit;
            if (double.IsInfinity(far) || far <= 0)
            {
                far = yPrev;
                double grow = Math.Max(yPrev, 1e-3);
                for (int j = 0; j < 200; j++)
                {
                    double trial = direction > 0 ? far + grow : far / 2;
                    if (sPrev + Integrate(phi, yPrev, trial) >= s) { far = trial; break; }
                    far = trial;
                    grow *= 2;
                }
            }
            var function = new Distance(phi, yPrev, s - sPrev);
            var bracket = direction > 0 ? Bracket.KnownIncreasing(yPrev, far) : Bracket.KnownDecreasing(far, yPrev);
            var root = SafeguardedNewton.Solve(function, bracket, yPrev + (far - yPrev) * 0.5, Options);
            iterations += root.Iterations;
            converged &= root.Converged;
            double y = root.Root;
            double reached = sPrev + Integrate(phi, yPrev, y);
            residual = Math.Max(residual, Math.Abs(reached - s) / length);
            list.Add(Station(section, flow, manningN, controlDownstream ? s : length - s, y));
            yPrev = y;
            sPrev = reached;
        }
        if (!controlDownstream) list.Reverse();
        if (!converged) warnings.Add(new("not-converged", "A station's depth did not meet its tolerance."));
        return new WaterSurfaceProfile
        {
            NormalDepth = yn, CriticalDepth = yc, SlopeClass = slopeClass, ProfileType = type, Stations = list,
            CriticalDepthDistance = criticalAt, Iterations = iterations, Converged = converged, Residual = residual, Warnings = warnings,
        };
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
