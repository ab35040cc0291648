namespace FlowSolve.Core.Pumps;

/// <summary>
/// The head-flow curve of one pump at rated speed, H(Q) = C0 + C1 Q + C2 Q^2 + C3 Q^3 (H in m, Q in m3/s), with the
/// flow range it was taken from and its zero-head flow.
/// </summary>
/// <remarks>
/// <para>Build it with <see cref="Fit"/> (catalogue points, least squares) or <see cref="FromCoefficients"/>.
/// <c>default</c> is not a curve and is rejected by <see cref="DutyPoint.Solve"/>.</para>
/// <para>Zero-head flow: the smallest flow at which the polynomial falls to zero, searched up to
/// <see cref="SearchLimit"/>. A curve with a data range is searched to <see cref="ZeroHeadSearchFactor"/> times the
/// largest catalogue flow (beyond that a fitted polynomial is pure extrapolation); a curve that does not reach zero
/// head there has <see cref="ZeroHeadFlow"/> null, and the duty-point bracket ends at the search limit.</para>
/// <para>The values are engineering estimates; a result used for design is to be checked by a qualified engineer.</para>
/// </remarks>
public readonly record struct PumpCurve
{
    /// <summary>The zero-head search extends to this multiple of the largest catalogue flow (a design choice of
    /// FlowSolve, not a published figure).</summary>
    public const double ZeroHeadSearchFactor = 3.0;

    internal PumpCurve(double c0, double c1, double c2, double c3, double? dataMinimumFlow, double? dataMaximumFlow)
    {
        C0 = c0; C1 = c1; C2 = c2; C3 = c3;
        DataMinimumFlow = dataMinimumFlow;
        DataMaximumFlow = dataMaximumFlow;
        double limit = dataMaximumFlow is double qmax ? ZeroHeadSearchFactor * qmax : CauchyBound(c0, c1, c2, c3);
        ZeroHeadFlow = Polynomial.FirstFallToZero(c0, c1, c2, c3, limit);
        SearchLimit = dataMaximumFlow is null && ZeroHeadFlow is double z ? z : limit;
        double slopeEnd = dataMaximumFlow ?? ZeroHeadFlow ?? limit;
        (MaximumSlope, MaximumSlopeFlow) = Polynomial.MaximumSlope(c1, c2, c3, 0, slopeEnd);
    }

    /// <summary>Constant term: the shut-off head H(0) in m.</summary>
    public double C0 { get; }

    /// <summary>Linear coefficient in m per m3/s.</summary>
    public double C1 { get; }

    /// <summary>Quadratic coefficient in m per (m3/s)^2.</summary>
    public double C2 { get; }

    /// <summary>Cubic coefficient in m per (m3/s)^3 (0 for a quadratic).</summary>
    public double C3 { get; }

    /// <summary>Smallest catalogue flow in m3/s (0 for a coefficient curve with a maximum flow); null without a range.</summary>
    public double? DataMinimumFlow { get; }

    /// <summary>Largest catalogue flow in m3/s; null for a coefficient curve given without a maximum flow.</summary>
    public double? DataMaximumFlow { get; }

    /// <summary>The smallest flow in m3/s at which the head falls to zero, or null when it does not within
    /// <see cref="SearchLimit"/>.</summary>
    public double? ZeroHeadFlow { get; }

    /// <summary>The flow in m3/s up to which the zero-head flow was searched; the duty-point bracket ends at
    /// <see cref="ZeroHeadFlow"/>, or here when that is null.</summary>
    public double SearchLimit { get; }

    /// <summary>The largest slope dH/dQ in m per m3/s on [0, DataMaximumFlow] (or [0, ZeroHeadFlow] without a range).</summary>
    public double MaximumSlope { get; }

    /// <summary>Where <see cref="MaximumSlope"/> occurs, in m3/s.</summary>
    public double MaximumSlopeFlow { get; }

    /// <summary>True when the head rises with flow somewhere on the range of <see cref="MaximumSlope"/> (an unstable
    /// curve: two duty points may exist).</summary>
    public bool RisesWithFlow => MaximumSlope > RisingTolerance(C0, DataMaximumFlow ?? SearchLimit);

    /// <summary>Shut-off head H(0) in m.</summary>
    public double ShutOffHead => C0;

    /// <summary>Polynomial degree: 3 when <see cref="C3"/> is not 0, else 2 (1 or 0 for degenerate coefficients).</summary>
    public int Degree => C3 != 0 ? 3 : C2 != 0 ? 2 : C1 != 0 ? 1 : 0;

    /// <summary>Head in m at a flow in m3/s (the polynomial, also outside the data range).</summary>
    /// <param name="flow">Flow per pump at rated speed, m3/s; finite.</param>
    public double Head(double flow) => Polynomial.Value(C0, C1, C2, C3, flow);

    /// <summary>Head in m and slope dH/dQ in m per m3/s at a flow; allocation-free.</summary>
    /// <param name="flow">Flow per pump at rated speed, m3/s; finite.</param>
    public (double Head, double Slope) HeadAndSlope(double flow) =>
        (Polynomial.Value(C0, C1, C2, C3, flow), Polynomial.Slope(C1, C2, C3, flow));

    /// <summary>A curve from given coefficients H = c0 + c1 Q + c2 Q^2 + c3 Q^3 for one pump at rated speed.</summary>
    /// <param name="c0">Shut-off head in m; finite and positive.</param>
    /// <param name="c1">Linear coefficient in m per m3/s; finite.</param>
    /// <param name="c2">Quadratic coefficient in m per (m3/s)^2; finite.</param>
    /// <param name="c3">Cubic coefficient in m per (m3/s)^3; finite; 0 for a quadratic.</param>
    /// <param name="maximumFlow">Largest flow of the curve's published range in m3/s (finite, positive), or null.
    /// Without it the curve must reach zero head (its zero-head flow then bounds the duty point).</param>
    /// <returns>The curve, with data range [0, maximumFlow] when a maximum flow is given.</returns>
    /// <exception cref="ArgumentException">A coefficient is not finite, c0 is not positive, maximumFlow is not finite and
    /// positive, or the curve never reaches zero head and no maximumFlow is given (parameter name says which).</exception>
    public static PumpCurve FromCoefficients(double c0, double c1, double c2, double c3 = 0, double? maximumFlow = null)
    {
        PumpGuard.Positive(c0, nameof(c0));
        PumpGuard.Finite(c1, nameof(c1));
        PumpGuard.Finite(c2, nameof(c2));
        PumpGuard.Finite(c3, nameof(c3));
        if (maximumFlow is double q) PumpGuard.Positive(q, nameof(maximumFlow));
        else if (c1 == 0 && c2 == 0 && c3 == 0)
            throw new ArgumentException("a constant head never reaches zero; give maximumFlow", nameof(maximumFlow));
        var curve = new PumpCurve(c0, c1, c2, c3, maximumFlow is null ? null : 0.0, maximumFlow);
        if (maximumFlow is null && curve.ZeroHeadFlow is null)
            throw new ArgumentException("the curve never reaches zero head; give maximumFlow to bound it", nameof(maximumFlow));
        return curve;
    }

    /// <summary>Fits a pump curve to catalogue (flow, head) points by least squares (Householder QR, MathNet.Numerics).</summary>
    /// <param name="flows">Flows in m3/s: at least three (four for a cubic), finite, 0 or more, no two equal; any order.</param>
    /// <param name="heads">Heads in m, paired with <paramref name="flows"/>: finite, 0 or more.</param>
    /// <param name="degree">Quadratic (default) or cubic.</param>
    /// <returns>The curve, its RMS and largest deviation from the points, and <see cref="CurveFitStatus.RisesWithFlow"/>
    /// when dH/dQ &gt; 0 anywhere on [0, largest flow] (the curve is returned all the same, for display).</returns>
    /// <exception cref="ArgumentException">The points are malformed (the parameter name says which).</exception>
    public static PumpCurveFit Fit(ReadOnlySpan<double> flows, ReadOnlySpan<double> heads, CurveDegree degree = CurveDegree.Quadratic)
    {
        int d = DegreeOf(degree);
        PumpGuard.Points(flows, heads, nameof(flows), nameof(heads), Math.Max(3, d + 1), 0, double.MaxValue);
        var fit = LeastSquares.Fit(flows, heads, d, throughOrigin: false);
        double qmin = double.MaxValue, qmax = 0;
        foreach (double q in flows) { qmin = Math.Min(qmin, q); qmax = Math.Max(qmax, q); }
        if (!(qmax > 0)) throw new ArgumentException("at least one flow must be positive", nameof(flows));
        var curve = new PumpCurve(fit.C0, fit.C1, fit.C2, fit.C3, qmin, qmax);
        var status = curve.RisesWithFlow ? CurveFitStatus.RisesWithFlow : CurveFitStatus.Fitted;
        return new PumpCurveFit(curve, status, fit.RmsDeviation, fit.MaxDeviation, flows.Length);
    }

    internal static int DegreeOf(CurveDegree degree) => degree switch
    {
        CurveDegree.Quadratic => 2,
        CurveDegree.Cubic => 3,
        _ => throw new ArgumentOutOfRangeException(nameof(degree), degree, "must be Quadratic or Cubic"),
    };

    /// <summary>A slope below 1e-12 H0/Qmax is rounding noise of a flat curve, not a rise.</summary>
    private static double RisingTolerance(double c0, double qmax) => 1e-12 * Math.Abs(c0) / qmax;

    /// <summary>Cauchy's bound: every real root has |x| &lt;= 1 + max |c_k / c_n| for the leading coefficient c_n.</summary>
    private static double CauchyBound(double c0, double c1, double c2, double c3)
    {
        double lead = c3 != 0 ? c3 : c2 != 0 ? c2 : c1;
        if (lead == 0) return 1.0;
        double m = Math.Abs(c0 / lead);
        if (c3 != 0) m = Math.Max(m, Math.Max(Math.Abs(c1 / lead), Math.Abs(c2 / lead)));
        else if (c2 != 0) m = Math.Max(m, Math.Abs(c1 / lead));
        return 1.0 + m;
    }
}

/// <summary>A pump curve fitted to catalogue points, with the quality of the fit.</summary>
/// <param name="Curve">The fitted curve (also when <paramref name="Status"/> rejects it, for display).</param>
/// <param name="Status"><see cref="CurveFitStatus.Fitted"/>, or <see cref="CurveFitStatus.RisesWithFlow"/>.</param>
/// <param name="RmsDeviation">Root-mean-square deviation of the curve from the points, in m.</param>
/// <param name="MaxDeviation">Largest absolute deviation of the curve from a point, in m.</param>
/// <param name="PointCount">Number of points fitted.</param>
public readonly record struct PumpCurveFit(PumpCurve Curve, CurveFitStatus Status, double RmsDeviation, double MaxDeviation, int PointCount)
{
    /// <summary>True when the curve is usable (it does not rise with flow on the data range).</summary>
    public bool Accepted => Status == CurveFitStatus.Fitted;

    /// <summary>The largest slope dH/dQ on [0, largest flow], in m per m3/s (positive when rejected).</summary>
    public double MaximumSlope => Curve.MaximumSlope;

    /// <summary>The flow in m3/s where <see cref="MaximumSlope"/> occurs.</summary>
    public double MaximumSlopeFlow => Curve.MaximumSlopeFlow;
}
