using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>
/// Test-side geometry written independently of Core (closed forms and polygon formulas), and MathNet's Brent on the
/// same equations, for cross-checks.
/// </summary>
internal static class ChannelReference
{
    public const double G = 9.80665;

    /// <summary>Area, wetted perimeter and top width, m units.</summary>
    public readonly record struct Shape(double A, double P, double T);

    public static Shape Trapezoid(double b, double z1, double z2, double y) =>
        new(b * y + 0.5 * (z1 + z2) * y * y, b + y * (Math.Sqrt(1 + z1 * z1) + Math.Sqrt(1 + z2 * z2)), b + (z1 + z2) * y);

    /// <summary>Circular segment of depth h in a circle of radius r: the classic chord formulas.</summary>
    public static Shape Circle(double d, double h)
    {
        double r = 0.5 * d;
        double half = Math.Acos((r - h) / r);
        double chordHalf = Math.Sqrt(Math.Max(0.0, 2 * r * h - h * h));
        return new(r * r * half - (r - h) * chordHalf, 2 * r * half, 2 * chordHalf);
    }

    /// <summary>Manning discharge in SI, Q = (1/n) A R^(2/3) sqrt(S).</summary>
    public static double Manning(Shape s, double slope, double n) => s.A * Math.Pow(s.A / s.P, 2.0 / 3.0) * Math.Sqrt(slope) / n;

    /// <summary>MathNet Brent on f over [lower, upper] to a tight tolerance.</summary>
    public static double Brent(Func<double, double> f, double lower, double upper) =>
        MathNet.Numerics.RootFinding.Brent.FindRoot(f, lower, upper, 1e-13, 200);

    /// <summary>Every root of f on [lower, upper] by a dense scan for sign changes, each refined by MathNet's Brent.</summary>
    public static List<double> AllRoots(Func<double, double> f, double lower, double upper, int samples)
    {
        var roots = new List<double>();
        double x0 = lower, f0 = f(lower);
        for (int i = 1; i <= samples; i++)
        {
            double x1 = lower + (upper - lower) * i / samples, f1 = f(x1);
            if (Math.Sign(f0) != Math.Sign(f1) && f0 != 0) roots.Add(Brent(f, x0, x1));
            x0 = x1;
            f0 = f1;
        }
        return roots;
    }

    /// <summary>Shoelace area and edge length of the wetted polygon of an open section given by its vertices, for a flat water level.</summary>
    public static Shape Polygon(IReadOnlyList<(double X, double Z)> points, double level)
    {
        // Clip each edge below the level, then close the polygon along the water surface.
        var wet = new List<(double X, double Z)>();
        double perimeter = 0;
        for (int i = 0; i < points.Count - 1; i++)
        {
            var (x0, z0) = points[i];
            var (x1, z1) = points[i + 1];
            bool below0 = z0 < level, below1 = z1 < level;
            if (below0) wet.Add((x0, z0));
            if (below0 != below1)
            {
                double t = (level - z0) / (z1 - z0);
                wet.Add((x0 + t * (x1 - x0), level));
            }
            double cx0 = x0, cz0 = z0, cx1 = x1, cz1 = z1;
            if (!below0 && !below1) continue;
            if (!below0) { double t = (level - z0) / (z1 - z0); cx0 = x0 + t * (x1 - x0); cz0 = level; }
            if (!below1) { double t = (level - z0) / (z1 - z0); cx1 = x0 + t * (x1 - x0); cz1 = level; }
            perimeter += Math.Sqrt((cx1 - cx0) * (cx1 - cx0) + (cz1 - cz0) * (cz1 - cz0));
        }
        double twice = 0, minX = double.MaxValue, maxX = double.MinValue;
        for (int i = 0; i < wet.Count; i++)
        {
            var (xa, za) = wet[i];
            var (xb, zb) = wet[(i + 1) % wet.Count];
            twice += xa * zb - xb * za;
            if (za == level) { minX = Math.Min(minX, xa); maxX = Math.Max(maxX, xa); }
        }
        return new(Math.Abs(0.5 * twice), perimeter, maxX - minX);
    }
}
