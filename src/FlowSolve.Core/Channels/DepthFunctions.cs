using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>A residual in depth y that a surveyed-section scan can split into monotone pieces.</summary>
internal interface IDepthFunction : IDifferentiableFunction
{
    /// <summary>The residual at a depth, approached from below or above; -infinity at depth 0.</summary>
    double Value(double depth, bool fromBelow);

    /// <summary>
    /// The depths strictly inside (<paramref name="lower"/>, <paramref name="upper"/>) where the derivative vanishes, given the
    /// geometry at the middle of an interval on which A is quadratic and T and the perimeters are linear in y.
    /// </summary>
    int Stationary(in SectionGeometry middle, double lower, double upper, out double first, out double second);
}

/// <summary>
/// Manning's equation as ln K(y) - ln(Q / sqrt(S)), K = A^(5/3) W^(-2/3): nearly linear in ln y, so Newton converges fast.
/// </summary>
internal readonly struct ConveyanceResidual : IDepthFunction
{
    private readonly ChannelSection _section;
    private readonly double _defaultN;
    private readonly double _logTarget;

    public ConveyanceResidual(ChannelSection section, double defaultN, double logTarget)
    {
        _section = section;
        _defaultN = defaultN;
        _logTarget = logTarget;
    }

    public static double LogConveyance(in SectionGeometry g, double defaultN) =>
        (5.0 / 3.0) * Math.Log(g.Area) - (2.0 / 3.0) * Math.Log(g.WeightedPerimeter(defaultN));

    public (double Value, double Derivative) Evaluate(double depth)
    {
        var g = _section.Evaluate(depth);
        return (LogConveyance(g, _defaultN) - _logTarget, g.LogConveyanceDerivative(_defaultN));
    }

    public double Value(double depth, bool fromBelow)
    {
        if (depth <= 0.0) return double.NegativeInfinity;
        var g = _section.Evaluate(depth, fromBelow);
        return LogConveyance(g, _defaultN) - _logTarget;
    }

    // d ln K/dy = 0  <=>  5 T W - 2 A W' = 0. With s = y - y_m, T = T_m + T' s, W = W_m + W' s, A = A_m + T_m s + T' s^2/2:
    // 4 T' W' s^2 + (3 T_m W' + 5 T' W_m) s + (5 T_m W_m - 2 A_m W') = 0.
    public int Stationary(in SectionGeometry middle, double lower, double upper, out double first, out double second)
    {
        double t = middle.TopWidth, dt = middle.TopWidthDerivative, a = middle.Area;
        double w = middle.WeightedPerimeter(_defaultN), dw = middle.WeightedPerimeterDerivative(_defaultN);
        return Quadratic.RootsIn(4.0 * dt * dw, 3.0 * t * dw + 5.0 * dt * w, 5.0 * t * w - 2.0 * a * dw,
            middle.Depth, lower, upper, out first, out second);
    }
}

/// <summary>The same residual in u = ln y, for the open prismatic shapes (d f/du lies between 1 and 10/3 there).</summary>
internal readonly struct LogDepthConveyanceResidual : IDifferentiableFunction
{
    private readonly ChannelSection _section;
    private readonly double _defaultN;
    private readonly double _logTarget;

    public LogDepthConveyanceResidual(ChannelSection section, double defaultN, double logTarget)
    {
        _section = section;
        _defaultN = defaultN;
        _logTarget = logTarget;
    }

    public (double Value, double Derivative) Evaluate(double logDepth)
    {
        double depth = Math.Exp(logDepth);
        var g = _section.Evaluate(depth);
        return (ConveyanceResidual.LogConveyance(g, _defaultN) - _logTarget, depth * g.LogConveyanceDerivative(_defaultN));
    }
}

/// <summary>The critical-flow condition as ln(A^3 / T) - ln(Q^2 / g) in depth y.</summary>
internal readonly struct CriticalResidual : IDepthFunction
{
    private readonly ChannelSection _section;
    private readonly double _logTarget;

    public CriticalResidual(ChannelSection section, double logTarget)
    {
        _section = section;
        _logTarget = logTarget;
    }

    public (double Value, double Derivative) Evaluate(double depth)
    {
        var g = _section.Evaluate(depth);
        return (3.0 * Math.Log(g.Area) - Math.Log(g.TopWidth) - _logTarget,
            3.0 * g.TopWidth / g.Area - g.TopWidthDerivative / g.TopWidth);
    }

    public double Value(double depth, bool fromBelow)
    {
        if (depth <= 0.0) return double.NegativeInfinity;
        var g = _section.Evaluate(depth, fromBelow);
        return 3.0 * Math.Log(g.Area) - Math.Log(g.TopWidth) - _logTarget;
    }

    // d/dy ln(A^3/T) = 0  <=>  3 T^2 - A T' = 0:  2.5 T'^2 s^2 + 5 T_m T' s + (3 T_m^2 - A_m T') = 0.
    public int Stationary(in SectionGeometry middle, double lower, double upper, out double first, out double second)
    {
        double t = middle.TopWidth, dt = middle.TopWidthDerivative, a = middle.Area;
        return Quadratic.RootsIn(2.5 * dt * dt, 5.0 * t * dt, 3.0 * t * t - a * dt, middle.Depth, lower, upper, out first, out second);
    }
}

/// <summary>The critical-flow residual in u = ln y, for the open prismatic shapes (d f/du lies between 2 and 6 there).</summary>
internal readonly struct LogDepthCriticalResidual : IDifferentiableFunction
{
    private readonly ChannelSection _section;
    private readonly double _logTarget;

    public LogDepthCriticalResidual(ChannelSection section, double logTarget)
    {
        _section = section;
        _logTarget = logTarget;
    }

    public (double Value, double Derivative) Evaluate(double logDepth)
    {
        double depth = Math.Exp(logDepth);
        var g = _section.Evaluate(depth);
        return (3.0 * Math.Log(g.Area) - Math.Log(g.TopWidth) - _logTarget,
            depth * (3.0 * g.TopWidth / g.Area - g.TopWidthDerivative / g.TopWidth));
    }
}

/// <summary>
/// The critical-flow residual of a circle in x = ln(y / (D - y)): ln(A^3/T) behaves as 5 x near the invert and as x/2 near
/// the crown, where it grows without bound, so it is nearly linear in x at both ends and Newton needs few steps.
/// </summary>
internal readonly struct LogitDepthCriticalResidual : IDifferentiableFunction
{
    private readonly CircularSection _section;
    private readonly double _logTarget;

    public LogitDepthCriticalResidual(CircularSection section, double logTarget)
    {
        _section = section;
        _logTarget = logTarget;
    }

    public static double DepthOf(double x, double diameter) => diameter / (1.0 + Math.Exp(-x));

    public static double LogitOf(double depth, double diameter) => Math.Log(depth / (diameter - depth));

    public (double Value, double Derivative) Evaluate(double x)
    {
        double d = _section.Diameter;
        double depth = DepthOf(x, d);
        var g = _section.Evaluate(depth);
        double dydx = depth * (d - depth) / d;
        return (3.0 * Math.Log(g.Area) - Math.Log(g.TopWidth) - _logTarget,
            dydx * (3.0 * g.TopWidth / g.Area - g.TopWidthDerivative / g.TopWidth));
    }
}

internal static class Quadratic
{
    /// <summary>Real roots of c2 s^2 + c1 s + c0 = 0, shifted by <paramref name="origin"/>, that lie strictly inside (lower, upper), ascending.</summary>
    public static int RootsIn(double c2, double c1, double c0, double origin, double lower, double upper, out double first, out double second)
    {
        first = second = double.NaN;
        double r1, r2;
        double scale = Math.Abs(c1) * (upper - lower);
        if (Math.Abs(c2) * (upper - lower) * (upper - lower) <= 1e-14 * scale || c2 == 0.0)
        {
            if (c1 == 0.0) return 0;
            r1 = -c0 / c1;
            r2 = double.NaN;
        }
        else
        {
            double disc = c1 * c1 - 4.0 * c2 * c0;
            if (disc < 0.0) return 0;
            // The numerically stable pair: q = -(c1 + sign(c1) sqrt(disc)) / 2, roots q/c2 and c0/q.
            double q = -0.5 * (c1 + Math.CopySign(Math.Sqrt(disc), c1));
            r1 = q / c2;
            r2 = q != 0.0 ? c0 / q : double.NaN;
        }
        int count = 0;
        Keep(origin + r1, lower, upper, ref count, ref first, ref second);
        Keep(origin + r2, lower, upper, ref count, ref first, ref second);
        if (count == 2 && second < first) (first, second) = (second, first);
        return count;
    }

    private static void Keep(double depth, double lower, double upper, ref int count, ref double first, ref double second)
    {
        if (!(depth > lower && depth < upper)) return;
        if (count == 0) first = depth;
        else if (depth != first) second = depth;
        else return;
        count++;
    }
}
