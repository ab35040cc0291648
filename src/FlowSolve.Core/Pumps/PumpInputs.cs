using System.Runtime.CompilerServices;
using FlowSolve.Core.Numerics;
using MathNet.Numerics.LinearAlgebra;

namespace FlowSolve.Core.Pumps;

/// <summary>The degree of a polynomial fitted to catalogue points.</summary>
public enum CurveDegree
{
    /// <summary>Second degree: H = c0 + c1 Q + c2 Q^2 (the default; needs at least three points).</summary>
    Quadratic = 2,

    /// <summary>Third degree: H = c0 + c1 Q + c2 Q^2 + c3 Q^3 (on request; needs at least four points, or three
    /// for an efficiency curve through the origin).</summary>
    Cubic = 3,
}

/// <summary>How many identical pumps run together, and at what speed.</summary>
/// <remarks>
/// <para>N identical pumps in parallel each carry Q/N at the common head; N in series each carry Q and add their
/// heads. Mixed arrangements (parallel and series both above 1) are not accepted. The speed ratio s = n/n_rated
/// scales each pump by the affinity laws: H_s(Q) = s^2 H(Q/s), efficiency at Q/s, NPSH required s^2 NPSHr(Q/s)
/// (common practice).</para>
/// <para>Use <see cref="Single"/> or the constructor; <c>default</c> holds zeros and is rejected by every method.</para>
/// </remarks>
/// <param name="Parallel">Number of identical pumps in parallel, 1 or more.</param>
/// <param name="Series">Number of identical pumps in series, 1 or more; not above 1 when <paramref name="Parallel"/> is.</param>
/// <param name="SpeedRatio">Speed ratio s = n/n_rated, in (0, 1.5].</param>
public readonly record struct PumpArrangement(int Parallel, int Series, double SpeedRatio)
{
    /// <summary>Highest accepted speed ratio, 1.5 (beyond it a catalogue curve says little about the pump).</summary>
    public const double MaximumSpeedRatio = 1.5;

    /// <summary>One pump at rated speed.</summary>
    public static PumpArrangement Single { get; } = new(1, 1, 1.0);

    /// <summary>N identical pumps in parallel at a speed ratio.</summary>
    /// <param name="count">Number of pumps, 1 or more.</param>
    /// <param name="speedRatio">Speed ratio in (0, 1.5].</param>
    public static PumpArrangement InParallel(int count, double speedRatio = 1.0) => new(count, 1, speedRatio);

    /// <summary>N identical pumps in series at a speed ratio.</summary>
    /// <param name="count">Number of pumps, 1 or more.</param>
    /// <param name="speedRatio">Speed ratio in (0, 1.5].</param>
    public static PumpArrangement InSeries(int count, double speedRatio = 1.0) => new(1, count, speedRatio);

    /// <summary>Total number of pumps, Parallel x Series.</summary>
    public int Count => Parallel * Series;

    /// <summary>Throws when a field is out of range (parameter names <c>parallel</c>, <c>series</c>, <c>speedRatio</c>).</summary>
    internal void Validate()
    {
        if (Parallel < 1) PumpGuard.Throw("parallel", Parallel, "must be 1 or more");
        if (Series < 1) PumpGuard.Throw("series", Series, "must be 1 or more");
        if (Parallel > 1 && Series > 1)
            PumpGuard.Throw("series", Series, "pumps in parallel and in series both above 1 are not supported");
        if (!(SpeedRatio > 0 && SpeedRatio <= MaximumSpeedRatio))
            PumpGuard.Throw("speedRatio", SpeedRatio, "must lie in (0, 1.5]");
    }
}

/// <summary>Argument checks shared by the pump calculations; the throws sit outside the hot methods.</summary>
internal static class PumpGuard
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Finite(double value, string name)
    {
        if (!double.IsFinite(value)) Throw(name, value, "must be finite");
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void NonNegative(double value, string name)
    {
        if (!(value >= 0) || !double.IsFinite(value)) Throw(name, value, "must be finite and 0 or more");
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Positive(double value, string name)
    {
        if (!(value > 0) || !double.IsFinite(value)) Throw(name, value, "must be finite and positive");
    }

    /// <summary>Checks catalogue points: equal lengths, enough of them, finite, flows 0 or more and distinct,
    /// values within [<paramref name="minimum"/>, <paramref name="maximum"/>].</summary>
    public static void Points(ReadOnlySpan<double> flows, ReadOnlySpan<double> values, string flowsName, string valuesName,
        int minimumCount, double minimum, double maximum)
    {
        if (flows.Length != values.Length)
            throw new ArgumentException($"{flowsName} has {flows.Length} values and {valuesName} {values.Length}; they must pair up", valuesName);
        if (flows.Length < minimumCount)
            throw new ArgumentException($"at least {minimumCount} points are needed, {flows.Length} given", flowsName);
        for (int i = 0; i < flows.Length; i++)
        {
            if (!double.IsFinite(flows[i]))
                throw new ArgumentException($"{flowsName}[{i}] = {flows[i]} must be finite", flowsName);
            if (flows[i] < 0)
                throw new ArgumentException($"{flowsName}[{i}] = {flows[i]} must be 0 or more", flowsName);
            if (!double.IsFinite(values[i]))
                throw new ArgumentException($"{valuesName}[{i}] = {values[i]} must be finite", valuesName);
            if (values[i] < minimum || values[i] > maximum)
                throw new ArgumentException($"{valuesName}[{i}] = {values[i]} must lie in [{minimum}, {maximum}]", valuesName);
            for (int j = 0; j < i; j++)
                if (flows[j] == flows[i])
                    throw new ArgumentException($"{flowsName}[{j}] and {flowsName}[{i}] are both {flows[i]}: duplicate flows", flowsName);
        }
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    public static void Throw(string name, double value, string why) =>
        throw new ArgumentOutOfRangeException(name, value, why);
}

/// <summary>Cubic (or lower) polynomials c0 + c1 x + c2 x^2 + c3 x^3: value, slope, extremes, roots.</summary>
internal static class Polynomial
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Value(double c0, double c1, double c2, double c3, double x) => c0 + x * (c1 + x * (c2 + x * c3));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Slope(double c1, double c2, double c3, double x) => c1 + x * (2 * c2 + x * 3 * c3);

    /// <summary>The stationary points (roots of the slope) strictly inside (a, b), at most two, in ascending order.</summary>
    public static int StationaryPoints(double c1, double c2, double c3, double a, double b, Span<double> into)
    {
        int n = 0;
        if (c3 != 0)
        {
            // 3 c3 x^2 + 2 c2 x + c1 = 0, in the stable form of the quadratic formula.
            double qa = 3 * c3, qb = 2 * c2, disc = qb * qb - 4 * qa * c1;
            if (disc >= 0)
            {
                double q = -0.5 * (qb + Math.CopySign(Math.Sqrt(disc), qb));
                double r1 = q / qa, r2 = q != 0 ? c1 / q : r1;
                if (r1 > r2) (r1, r2) = (r2, r1);
                if (r1 > a && r1 < b) into[n++] = r1;
                if (r2 > a && r2 < b && r2 != r1) into[n++] = r2;
            }
        }
        else if (c2 != 0)
        {
            double r = -c1 / (2 * c2);
            if (r > a && r < b) into[n++] = r;
        }
        return n;
    }

    /// <summary>The largest slope on [a, b] and where it occurs (the slope is at most quadratic, so its maximum is at an
    /// end or at its vertex).</summary>
    public static (double Slope, double At) MaximumSlope(double c1, double c2, double c3, double a, double b)
    {
        double best = Slope(c1, c2, c3, a), at = a;
        double sb = Slope(c1, c2, c3, b);
        if (sb > best) (best, at) = (sb, b);
        if (c3 != 0)
        {
            double v = -c2 / (3 * c3);
            if (v > a && v < b)
            {
                double sv = Slope(c1, c2, c3, v);
                if (sv > best) (best, at) = (sv, v);
            }
        }
        return (best, at);
    }

    /// <summary>The largest value on [a, b] and where it occurs.</summary>
    public static (double Value, double At) Maximum(double c0, double c1, double c2, double c3, double a, double b)
    {
        double best = Value(c0, c1, c2, c3, a), at = a;
        double vb = Value(c0, c1, c2, c3, b);
        if (vb > best) (best, at) = (vb, b);
        Span<double> s = stackalloc double[2];
        int n = StationaryPoints(c1, c2, c3, a, b, s);
        for (int i = 0; i < n; i++)
        {
            double v = Value(c0, c1, c2, c3, s[i]);
            if (v > best) (best, at) = (v, s[i]);
        }
        return (best, at);
    }

    /// <summary>The smallest x in (0, limit] where the polynomial falls from positive to zero or below, or null.</summary>
    /// <remarks>Splits [0, limit] at the stationary points so that each piece is monotone, then solves the first piece
    /// that falls through zero with <see cref="SafeguardedNewton"/> on a known decreasing bracket.</remarks>
    public static double? FirstFallToZero(double c0, double c1, double c2, double c3, double limit)
    {
        if (!(c0 > 0)) return null;
        Span<double> stops = stackalloc double[4];
        stops[0] = 0;
        int n = 1 + StationaryPoints(c1, c2, c3, 0, limit, stops[1..]);
        stops[n++] = limit;
        var f = new PolynomialFunction(c0, c1, c2, c3);
        for (int i = 0; i + 1 < n; i++)
        {
            double a = stops[i], b = stops[i + 1];
            double fa = Value(c0, c1, c2, c3, a), fb = Value(c0, c1, c2, c3, b);
            if (fa > 0 && fb <= 0)
            {
                if (fb == 0) return b;
                var root = SafeguardedNewton.Solve(f, Bracket.KnownDecreasing(a, b), a + (b - a) * fa / (fa - fb), SolverOptions.Default);
                return root.Root;
            }
        }
        return null;
    }

    private readonly struct PolynomialFunction(double c0, double c1, double c2, double c3) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double x) => (Value(c0, c1, c2, c3, x), Slope(c1, c2, c3, x));
    }
}

/// <summary>A least-squares polynomial fit with its deviations.</summary>
internal readonly record struct PolynomialFit(double C0, double C1, double C2, double C3, double RmsDeviation, double MaxDeviation)
{
    /// <summary>The fitted value at <paramref name="x"/>.</summary>
    public double Value(double x) => Polynomial.Value(C0, C1, C2, C3, x);
}

/// <summary>Least-squares polynomial fits by a QR solve of the Vandermonde system (MathNet.Numerics).</summary>
internal static class LeastSquares
{
    /// <summary>Fits y = sum of c_k x^k for k from (throughOrigin ? 1 : 0) to degree (at most 3).</summary>
    /// <remarks>The flows are scaled by their largest value before the solve (x/xmax lies in [0, 1]), which keeps the
    /// Vandermonde matrix well conditioned whatever the flow unit; the coefficients are scaled back afterwards.
    /// Householder QR solves the least-squares problem without forming the normal equations, whose condition number
    /// is the square of the matrix's.</remarks>
    public static PolynomialFit Fit(ReadOnlySpan<double> x, ReadOnlySpan<double> y, int degree, bool throughOrigin)
    {
        double scale = 0;
        foreach (double v in x) scale = Math.Max(scale, v);
        if (!(scale > 0)) scale = 1;
        int first = throughOrigin ? 1 : 0, columns = degree - first + 1;
        var a = Matrix<double>.Build.Dense(x.Length, columns);
        var b = Vector<double>.Build.Dense(x.Length);
        for (int i = 0; i < x.Length; i++)
        {
            double t = x[i] / scale;
            for (int j = 0; j < columns; j++) a[i, j] = Math.Pow(t, first + j);
            b[i] = y[i];
        }
        var solution = a.QR().Solve(b);
        Span<double> c = stackalloc double[4];
        c.Clear();
        for (int j = 0; j < columns; j++) c[first + j] = solution[j] / Math.Pow(scale, first + j);
        double sum = 0, max = 0;
        for (int i = 0; i < x.Length; i++)
        {
            double r = Math.Abs(Polynomial.Value(c[0], c[1], c[2], c[3], x[i]) - y[i]);
            sum += r * r;
            max = Math.Max(max, r);
        }
        return new PolynomialFit(c[0], c[1], c[2], c[3], Math.Sqrt(sum / x.Length), max);
    }
}
