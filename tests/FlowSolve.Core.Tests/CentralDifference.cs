namespace FlowSolve.Core.Tests;

/// <summary>
/// The stated mathematical property every sensitivity test checks: an analytic derivative equals the central finite
/// difference of the same calculation. The difference is Richardson-extrapolated from steps h and h/2,
/// D = (4 D(h/2) - D(h)) / 3, which cancels the h^2 error term, so its truncation error is O(h^4) (about 1e-12 for
/// h = 1e-3 relative) while the rounding error stays near eps / h (about 1e-13): 1e-6 relative agreement is then a
/// real test of the derivative, not of the step.
/// </summary>
internal static class CentralDifference
{
    /// <summary>Richardson-extrapolated central difference of <paramref name="f"/> at <paramref name="x"/> with step h.</summary>
    public static double Derivative(Func<double, double> f, double x, double h)
    {
        double d1 = (f(x + h) - f(x - h)) / (2 * h);
        double d2 = (f(x + 0.5 * h) - f(x - 0.5 * h)) / h;
        return (4 * d2 - d1) / 3;
    }

    /// <summary>Asserts that <paramref name="derivative"/> matches the central difference of <paramref name="f"/> at
    /// <paramref name="x"/> to <paramref name="tolerance"/> relative (step 1e-3 |x| unless given). A derivative that is
    /// zero in exact arithmetic (an output held fixed by the problem, such as the head loss of the diameter problem)
    /// has a difference quotient of pure solver noise; it passes when the two differ by less than 1e-9 in elasticity,
    /// |error| |x / y| &lt; 1e-9, a thousand times below the relative tolerance.</summary>
    public static void Check(string what, double derivative, Func<double, double> f, double x, double? step = null, double tolerance = 1e-6)
    {
        double h = step ?? 1e-3 * Math.Abs(x);
        double fd = Derivative(f, x, h);
        double error = Math.Abs(derivative - fd);
        double scale = Math.Abs(x / f(x));
        Assert.True(error <= tolerance * Math.Abs(fd) || error * scale < 1e-9,
            $"{what}: analytic {derivative:R}, central difference {fd:R}, relative error {error / Math.Abs(fd):E3} > {tolerance:E1}");
    }
}
