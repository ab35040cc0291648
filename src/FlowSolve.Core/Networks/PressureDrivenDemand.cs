using System.Globalization;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Networks;

/// <summary>
/// Pressure-driven demand: a junction with a requested demand d &gt; 0 and pressure head p receives d r(p), with
/// r = 0 for p &lt;= <see cref="MinimumPressureHead"/>, r = 1 for p &gt;= <see cref="RequiredPressureHead"/> and
/// r = ((p - min)/(req - min))^<see cref="Exponent"/> between (Wagner, Shamir and Marks 1988, J. Water Resour. Plann.
/// Manage. 114(3), from memory). A negative demand (an inflow injected at the junction) is always delivered in full.
/// </summary>
/// <param name="MinimumPressureHead">Pressure head in m at and below which nothing is delivered; finite, at most
/// <see cref="MaximumPressureHead"/> in size.</param>
/// <param name="RequiredPressureHead">Pressure head in m at and above which the whole demand is delivered; finite, at
/// least <see cref="MinimumBand"/> above <paramref name="MinimumPressureHead"/>, at most <see cref="MaximumPressureHead"/>.</param>
/// <param name="Exponent">Exponent of the law between the two, in [<see cref="MinimumExponent"/>,
/// <see cref="MaximumExponent"/>]; 0.5 (an orifice, Wagner et al. 1988) when omitted.</param>
/// <remarks>
/// With this law the steady network problem has exactly one solution: the heads minimise a strictly convex content
/// function (Elhay, Piller, Deuerlein and Simpson 2016, J. Water Resour. Plann. Manage. 142(2), from memory).
/// <see cref="NetworkSolver"/> solves it by Newton on the whole system (the gradient formulation of Todini 2003 and
/// Giustolisi, Savic and Kapelan 2008, J. Hydraul. Eng. 134(5), from memory), with each such junction's position
/// along the law's graph as an unknown of its own (see <see cref="GraphPoint"/>). Results are engineering estimates to
/// be checked by a qualified engineer.
/// </remarks>
public sealed record PressureDrivenDemand(double MinimumPressureHead, double RequiredPressureHead, double Exponent = 0.5)
{
    /// <summary>Smallest exponent accepted, 0.1: below it the law is nearly a step from nothing to everything, and the
    /// head equations near the minimum pressure become so stiff that the answer is ill-conditioned (a FlowSolve choice).</summary>
    public const double MinimumExponent = 0.1;

    /// <summary>Largest exponent accepted, 3: the exponents in use lie between 0.5 and about 2 (common practice).</summary>
    public const double MaximumExponent = 3.0;

    /// <summary>Smallest difference between the required and the minimum pressure head, 0.01 m: a narrower band makes
    /// the law a step (a FlowSolve choice).</summary>
    public const double MinimumBand = 0.01;

    /// <summary>Largest size of either pressure head, 10 000 m (a FlowSolve bound; real values are tens of metres).</summary>
    public const double MaximumPressureHead = 10_000;

    /// <summary>The problems of this law, each a sentence naming the field; empty when valid (allocates).</summary>
    public IReadOnlyList<NetworkIssue> Validate()
    {
        var issues = new List<NetworkIssue>();
        var c = CultureInfo.InvariantCulture;
        bool minOk = double.IsFinite(MinimumPressureHead) && Math.Abs(MinimumPressureHead) <= MaximumPressureHead;
        bool reqOk = double.IsFinite(RequiredPressureHead) && Math.Abs(RequiredPressureHead) <= MaximumPressureHead;
        if (!minOk)
            issues.Add(new("", "bad-demand-model", string.Format(c, "demand model: minimumPressureHead {0} must be finite and at most {1} m in size", MinimumPressureHead, MaximumPressureHead)));
        if (!reqOk)
            issues.Add(new("", "bad-demand-model", string.Format(c, "demand model: requiredPressureHead {0} must be finite and at most {1} m in size", RequiredPressureHead, MaximumPressureHead)));
        if (minOk && reqOk && !(RequiredPressureHead - MinimumPressureHead >= MinimumBand))
            issues.Add(new("", "bad-demand-model", string.Format(c, "demand model: requiredPressureHead {0} must exceed minimumPressureHead {1} by at least {2} m", RequiredPressureHead, MinimumPressureHead, MinimumBand)));
        if (!(Exponent >= MinimumExponent && Exponent <= MaximumExponent))
            issues.Add(new("", "bad-demand-model", string.Format(c, "demand model: exponent {0} must lie in [{1}, {2}]", Exponent, MinimumExponent, MaximumExponent)));
        return issues;
    }

    /// <summary>The fraction r of a positive demand delivered at pressure head <paramref name="pressureHead"/> (m), by
    /// the exact law: 0 at and below the minimum, 1 at and above the required head, the power law between; NaN for NaN.</summary>
    public double Fraction(double pressureHead) => Exact((pressureHead - MinimumPressureHead) / (RequiredPressureHead - MinimumPressureHead), Exponent);

    /// <summary>The flow delivered (m3/s) for a requested <paramref name="demand"/> at <paramref name="pressureHead"/>:
    /// d r(p) for d &gt; 0, d itself for d &lt;= 0 (an inflow is always delivered in full).</summary>
    public double Delivered(double demand, double pressureHead) => demand > 0 ? demand * Fraction(pressureHead) : demand;

    /// <summary>The exact law in the scaled pressure s = (p - min)/(req - min).</summary>
    internal static double Exact(double s, double exponent)
    {
        if (s >= 1) return 1;
        if (s > 0) return Math.Pow(s, exponent);
        return s <= 0 ? 0 : double.NaN;
    }

    /// <summary>The point of the law's graph at position <paramref name="u"/> = s + x along it (s the scaled pressure
    /// (p - min)/(req - min), x = q/d the fraction delivered): the flat part x = 0 for u &lt;= 0, the power law between,
    /// the flat part x = 1 for u &gt;= 2.</summary>
    /// <param name="u">The position; NaN gives NaN.</param>
    /// <param name="guess">A start for the inner solve (the previous point's <see cref="LawPoint.Good"/>), or NaN.</param>
    /// <remarks>
    /// <para>The whole law, flat parts included, is one increasing curve in the (s, x) plane, and the sum u = s + x
    /// increases strictly along it, so u is a coordinate of the entire curve in which both s and x change at rates
    /// between 0 and 1 (ds/du + dx/du = 1): nothing is unbounded, unlike r'(s) = e s^(e-1) at s = 0 for e &lt; 1, or
    /// the inverse law's slope at x = 0 for e &gt; 1. <see cref="NetworkSolver"/> keeps u as each such junction's unknown.
    /// On the power law the point solves v + v^m = u for v in [0, 1] by <see cref="SafeguardedNewton"/> (bracket
    /// known increasing, the derivative 1 + m v^(m-1) between 1 and 1 + m), in the coordinate with m &gt;= 1: v = x,
    /// m = 1/e for e &lt;= 1; v = s, m = e for e &gt; 1.</para>
    /// </remarks>
    internal LawPoint GraphPoint(double u, double guess)
    {
        if (!(u > 0)) return u <= 0 ? new LawPoint(u, 0, MinimumRatio, 0) : new LawPoint(double.NaN, double.NaN, double.NaN, double.NaN);
        if (u >= 2) return new LawPoint(u - 1, 1, MinimumRatio, 1);
        double e = Exponent;
        bool onX = e <= 1;
        double m = onX ? 1 / e : e;
        var root = SafeguardedNewton.Solve(new GraphEquation(u, m), Bracket.KnownIncreasing(0, Math.Min(u, 1)),
            double.IsFinite(guess) ? guess : 0.5 * Math.Min(u, 1), SolverOptions.Default);
        double v = Math.Clamp(root.Root, 0, 1), w = Math.Pow(v, m);
        // dw/dv = m v^(m-1) >= 0; the tangent's slope dx/ds is 1/(dw/dv) on x, dw/dv on s.
        double slope = m * Math.Pow(v, m - 1);
        double ratio = Math.Clamp(onX ? 1 / slope : slope, MinimumRatio, MaximumRatio);
        return onX ? new LawPoint(w, v, ratio, v) : new LawPoint(v, w, ratio, v);
    }

    // The tangent's dx/ds as the Jacobian takes it: a vertical tangent (e < 1 at s = 0) as 1e6, a bound of the
    // Jacobian only (the point is exact).
    private const double MinimumRatio = 0, MaximumRatio = 1e6;

    /// <summary>v + v^m - u and its derivative, for <see cref="GraphPoint"/>.</summary>
    private readonly struct GraphEquation(double u, double m) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double v)
        {
            double w = v > 0 ? Math.Pow(v, m) : 0;
            return (v + w - u, 1 + (v > 0 ? m * w / v : m == 1 ? 1 : 0));
        }
    }
}

/// <summary>A point of the pressure-driven law's graph (<see cref="PressureDrivenDemand.GraphPoint"/>).</summary>
/// <param name="S">The scaled pressure (p - min)/(req - min).</param>
/// <param name="X">The fraction delivered, q/d, in [0, 1].</param>
/// <param name="Ratio">dx/ds along the graph at the point, as the Jacobian takes it (0 on the flat parts; at most 1e6).</param>
/// <param name="Good">The inner solve's coordinate, a start for the next solve.</param>
internal readonly record struct LawPoint(double S, double X, double Ratio, double Good);
