namespace FlowSolve.Core.Pumps;

/// <summary>
/// The efficiency of one pump at rated speed against flow, eta(Q) = E0 + E1 Q + E2 Q^2 + E3 Q^3 (eta as a fraction,
/// Q in m3/s), with its best-efficiency point (BEP).
/// </summary>
/// <remarks>
/// <para>Fitted by least squares like the head curve; through the origin (E0 = 0, since a pump delivering no flow
/// does no useful work) by default, or general. The BEP is the largest value of the polynomial on
/// [0, <see cref="DataMaximumFlow"/>]; when it lies at the end of that range the data do not show a peak and
/// <see cref="HasInteriorMaximum"/> is false.</para>
/// <para><c>default</c> is not a curve; build one with <see cref="Fit"/> or <see cref="FromCoefficients"/>.</para>
/// </remarks>
public readonly record struct EfficiencyCurve
{
    internal EfficiencyCurve(double e0, double e1, double e2, double e3, double dataMinimumFlow, double dataMaximumFlow)
    {
        E0 = e0; E1 = e1; E2 = e2; E3 = e3;
        DataMinimumFlow = dataMinimumFlow;
        DataMaximumFlow = dataMaximumFlow;
        (BestEfficiency, BestEfficiencyFlow) = Polynomial.Maximum(e0, e1, e2, e3, 0, dataMaximumFlow);
        HasInteriorMaximum = BestEfficiencyFlow > 0 && BestEfficiencyFlow < dataMaximumFlow;
    }

    /// <summary>Constant term (0 for a fit through the origin).</summary>
    public double E0 { get; }

    /// <summary>Linear coefficient per m3/s.</summary>
    public double E1 { get; }

    /// <summary>Quadratic coefficient per (m3/s)^2.</summary>
    public double E2 { get; }

    /// <summary>Cubic coefficient per (m3/s)^3.</summary>
    public double E3 { get; }

    /// <summary>Smallest catalogue flow in m3/s.</summary>
    public double DataMinimumFlow { get; }

    /// <summary>Largest catalogue flow in m3/s.</summary>
    public double DataMaximumFlow { get; }

    /// <summary>Best-efficiency flow Q_BEP at rated speed, m3/s.</summary>
    public double BestEfficiencyFlow { get; }

    /// <summary>Best efficiency (fraction).</summary>
    public double BestEfficiency { get; }

    /// <summary>True when the maximum lies strictly inside (0, DataMaximumFlow).</summary>
    public bool HasInteriorMaximum { get; }

    /// <summary>Efficiency (fraction) at a flow per pump at rated speed, m3/s (the polynomial, also outside the data).</summary>
    /// <param name="flow">Flow in m3/s.</param>
    public double Efficiency(double flow) => Polynomial.Value(E0, E1, E2, E3, flow);

    /// <summary>An efficiency curve from coefficients.</summary>
    /// <param name="e0">Constant term; finite.</param>
    /// <param name="e1">Linear coefficient per m3/s; finite.</param>
    /// <param name="e2">Quadratic coefficient per (m3/s)^2; finite.</param>
    /// <param name="e3">Cubic coefficient per (m3/s)^3; finite.</param>
    /// <param name="maximumFlow">Largest flow of the published range in m3/s; finite, positive (the BEP is sought on [0, maximumFlow]).</param>
    /// <exception cref="ArgumentException">A value is not finite, or maximumFlow is not positive.</exception>
    public static EfficiencyCurve FromCoefficients(double e0, double e1, double e2, double e3, double maximumFlow)
    {
        PumpGuard.Finite(e0, nameof(e0));
        PumpGuard.Finite(e1, nameof(e1));
        PumpGuard.Finite(e2, nameof(e2));
        PumpGuard.Finite(e3, nameof(e3));
        PumpGuard.Positive(maximumFlow, nameof(maximumFlow));
        return new EfficiencyCurve(e0, e1, e2, e3, 0, maximumFlow);
    }

    /// <summary>Fits an efficiency curve to catalogue points by least squares (Householder QR, MathNet.Numerics).</summary>
    /// <param name="flows">Flows in m3/s: at least three (four for a general cubic), finite, 0 or more, distinct.</param>
    /// <param name="efficiencies">Efficiencies as fractions in [0, 1], paired with <paramref name="flows"/>.</param>
    /// <param name="degree">Quadratic (default) or cubic.</param>
    /// <param name="throughOrigin">True (default) to fit eta = E1 Q + E2 Q^2 (+ E3 Q^3) with E0 = 0; false for a general polynomial.</param>
    /// <exception cref="ArgumentException">The points are malformed (the parameter name says which).</exception>
    public static EfficiencyCurveFit Fit(ReadOnlySpan<double> flows, ReadOnlySpan<double> efficiencies,
        CurveDegree degree = CurveDegree.Quadratic, bool throughOrigin = true)
    {
        int d = PumpCurve.DegreeOf(degree);
        PumpGuard.Points(flows, efficiencies, nameof(flows), nameof(efficiencies), Math.Max(3, throughOrigin ? d : d + 1), 0, 1);
        var fit = LeastSquares.Fit(flows, efficiencies, d, throughOrigin);
        double qmin = double.MaxValue, qmax = 0;
        foreach (double q in flows) { qmin = Math.Min(qmin, q); qmax = Math.Max(qmax, q); }
        var curve = new EfficiencyCurve(fit.C0, fit.C1, fit.C2, fit.C3, qmin, qmax);
        double highest = 0;
        foreach (double e in efficiencies) highest = Math.Max(highest, e);
        return new EfficiencyCurveFit(curve, fit.RmsDeviation, fit.MaxDeviation, flows.Length) { DataMaximumEfficiency = highest };
    }
}

/// <summary>An efficiency curve fitted to catalogue points, with the quality of the fit.</summary>
/// <param name="Curve">The fitted curve.</param>
/// <param name="RmsDeviation">Root-mean-square deviation from the points (fraction).</param>
/// <param name="MaxDeviation">Largest absolute deviation from a point (fraction).</param>
/// <param name="PointCount">Number of points fitted.</param>
public readonly record struct EfficiencyCurveFit(EfficiencyCurve Curve, double RmsDeviation, double MaxDeviation, int PointCount)
{
    /// <summary>How far a fitted efficiency may rise above the highest catalogue value before it is flagged: half a
    /// percentage point, 0.005 (a margin chosen here, so that rounding in catalogue figures is not flagged).</summary>
    public const double AboveDataMargin = 0.005;

    /// <summary>The highest efficiency among the points fitted (fraction).</summary>
    public double DataMaximumEfficiency { get; init; }

    /// <summary>True when the fitted curve's best efficiency exceeds the highest catalogue value by more than
    /// <see cref="AboveDataMargin"/>: the fit (through the origin, say) overshoots the data, and powers computed from it
    /// come out low.</summary>
    public bool PeakAboveData => Curve.BestEfficiency > DataMaximumEfficiency + AboveDataMargin;
}
