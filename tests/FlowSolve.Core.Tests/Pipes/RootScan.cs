using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Pipes;

/// <summary>The independent reference for relations with more than one root near a regime limit; shared with the API
/// tests (linked into that project).</summary>
internal static class RootScan
{
    /// <summary>Every root of g on [a, b]: a scan of n log-spaced intervals for sign changes, Brent in each, and only
    /// the points where g really vanishes (relative to <paramref name="scale"/>) kept. The intervals (0.035 percent
    /// wide) are far narrower than the gap between a root and the jump, so a root and the jump never share one.</summary>
    public static List<double> All(Func<double, double> g, double a, double b, double scale, int n = 4000)
    {
        var roots = new List<double>();
        double x0 = a, g0 = g(a);
        for (int i = 1; i <= n; i++)
        {
            double x1 = a * Math.Pow(b / a, (double)i / n), g1 = g(x1);
            if (Math.Sign(g0) != Math.Sign(g1))
            {
                double x = Brent.FindRoot(g, x0, x1, 1e-15 * x1, 200);
                if (Math.Abs(g(x)) < 1e-9 * scale) roots.Add(x);
            }
            (x0, g0) = (x1, g1);
        }
        return roots;
    }
}
