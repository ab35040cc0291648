namespace FlowSolve.Core.Pumps;

/// <summary>How an <see cref="NpshCurve"/> turns catalogue points into a value at any flow.</summary>
public enum NpshCurveKind
{
    /// <summary>Straight lines between the points, extended linearly beyond the end points (never below 0).</summary>
    Interpolated,

    /// <summary>A least-squares polynomial through the points (never below 0).</summary>
    Fitted,
}

/// <summary>The net positive suction head required by one pump at rated speed against flow.</summary>
/// <remarks>Immutable; the points are copied (sorted by flow) when the curve is built, and evaluation allocates nothing.</remarks>
public sealed class NpshCurve
{
    private readonly double[] _flows;
    private readonly double[] _values;
    private readonly PolynomialFit _fit;

    private NpshCurve(NpshCurveKind kind, double[] flows, double[] values, PolynomialFit fit)
    {
        Kind = kind;
        _flows = flows;
        _values = values;
        _fit = fit;
    }

    /// <summary>Interpolated or fitted.</summary>
    public NpshCurveKind Kind { get; }

    /// <summary>The catalogue flows in m3/s, ascending.</summary>
    public IReadOnlyList<double> Flows => _flows;

    /// <summary>The catalogue NPSH required in m, paired with <see cref="Flows"/>.</summary>
    public IReadOnlyList<double> Values => _values;

    /// <summary>Smallest catalogue flow in m3/s.</summary>
    public double DataMinimumFlow => _flows[0];

    /// <summary>Largest catalogue flow in m3/s.</summary>
    public double DataMaximumFlow => _flows[^1];

    /// <summary>Fitted polynomial coefficients (C0, C1, C2, C3) in m per (m3/s)^k; zeros when interpolated.</summary>
    public (double C0, double C1, double C2, double C3) Coefficients => (_fit.C0, _fit.C1, _fit.C2, _fit.C3);

    /// <summary>RMS deviation of a fitted curve from the points, in m (0 when interpolated).</summary>
    public double RmsDeviation => _fit.RmsDeviation;

    /// <summary>Largest deviation of a fitted curve from a point, in m (0 when interpolated).</summary>
    public double MaxDeviation => _fit.MaxDeviation;

    /// <summary>NPSH required in m at a flow per pump at rated speed; allocation-free.</summary>
    /// <param name="flow">Flow in m3/s; finite.</param>
    /// <returns>The interpolated or fitted value, and never below 0.</returns>
    public double Required(double flow)
    {
        if (Kind == NpshCurveKind.Fitted) return Math.Max(0, _fit.Value(flow));
        var x = _flows;
        int i = 0;
        // The segment holding the flow; the end segments extend beyond the data.
        while (i < x.Length - 2 && flow > x[i + 1]) i++;
        double t = (flow - x[i]) / (x[i + 1] - x[i]);
        return Math.Max(0, _values[i] + t * (_values[i + 1] - _values[i]));
    }

    /// <summary>An NPSH-required curve interpolated linearly between catalogue points.</summary>
    /// <param name="flows">Flows in m3/s: at least three, finite, 0 or more, distinct; any order.</param>
    /// <param name="npshRequired">NPSH required in m, paired with <paramref name="flows"/>: finite, 0 or more.</param>
    /// <exception cref="ArgumentException">The points are malformed (the parameter name says which).</exception>
    public static NpshCurve Interpolate(ReadOnlySpan<double> flows, ReadOnlySpan<double> npshRequired)
    {
        PumpGuard.Points(flows, npshRequired, nameof(flows), nameof(npshRequired), 3, 0, double.MaxValue);
        var (x, y) = Sorted(flows, npshRequired);
        return new NpshCurve(NpshCurveKind.Interpolated, x, y, default);
    }

    /// <summary>An NPSH-required curve fitted by least squares (Householder QR, MathNet.Numerics).</summary>
    /// <param name="flows">Flows in m3/s: at least three (four for a cubic), finite, 0 or more, distinct.</param>
    /// <param name="npshRequired">NPSH required in m: finite, 0 or more.</param>
    /// <param name="degree">Quadratic (default) or cubic.</param>
    /// <exception cref="ArgumentException">The points are malformed (the parameter name says which).</exception>
    public static NpshCurve Fit(ReadOnlySpan<double> flows, ReadOnlySpan<double> npshRequired, CurveDegree degree = CurveDegree.Quadratic)
    {
        int d = PumpCurve.DegreeOf(degree);
        PumpGuard.Points(flows, npshRequired, nameof(flows), nameof(npshRequired), Math.Max(3, d + 1), 0, double.MaxValue);
        var (x, y) = Sorted(flows, npshRequired);
        return new NpshCurve(NpshCurveKind.Fitted, x, y, LeastSquares.Fit(x, y, d, throughOrigin: false));
    }

    private static (double[] X, double[] Y) Sorted(ReadOnlySpan<double> flows, ReadOnlySpan<double> values)
    {
        double[] x = flows.ToArray(), y = values.ToArray();
        Array.Sort(x, y);
        return (x, y);
    }
}
