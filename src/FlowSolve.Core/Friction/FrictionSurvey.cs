namespace FlowSolve.Core.Friction;

/// <summary>Measures how far an explicit approximation strays from exact Colebrook-White over its stated range.</summary>
public static class FrictionSurvey
{
    /// <summary>The largest deviation in percent and where it occurs.</summary>
    /// <param name="MaxDeviationPercent">Largest |f_approx / f_exact - 1| x 100 on the grid.</param>
    /// <param name="Reynolds">Reynolds number where it occurs.</param>
    /// <param name="RelativeRoughness">Relative roughness where it occurs.</param>
    public readonly record struct Extreme(double MaxDeviationPercent, double Reynolds, double RelativeRoughness);

    /// <summary>
    /// Surveys <paramref name="info"/>'s range on a grid of <paramref name="reynoldsPoints"/> log-spaced Reynolds
    /// numbers by <paramref name="roughnessPoints"/> relative roughnesses (the lower end, which may be 0, then log-spaced
    /// from max(lower, 1e-6) to the upper end).
    /// </summary>
    /// <param name="info">The approximation.</param>
    /// <param name="reynoldsPoints">Grid size in Reynolds number (at least 2).</param>
    /// <param name="roughnessPoints">Grid size in relative roughness (at least 2).</param>
    public static Extreme MaximumDeviation(FrictionMethodInfo info, int reynoldsPoints = 241, int roughnessPoints = 121)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(reynoldsPoints, 2);
        ArgumentOutOfRangeException.ThrowIfLessThan(roughnessPoints, 2);
        var worst = new Extreme(0, double.NaN, double.NaN);
        double logReLo = Math.Log10(info.ReynoldsMinimum), logReHi = Math.Log10(info.ReynoldsMaximum);
        double rLo = Math.Max(info.RelativeRoughnessMinimum, 1e-6);
        double logRLo = Math.Log10(rLo), logRHi = Math.Log10(info.RelativeRoughnessMaximum);
        for (int i = 0; i < reynoldsPoints; i++)
        {
            double re = Math.Pow(10, logReLo + (logReHi - logReLo) * i / (reynoldsPoints - 1));
            for (int j = 0; j < roughnessPoints; j++)
            {
                double r = j == 0 ? info.RelativeRoughnessMinimum
                    : Math.Pow(10, logRLo + (logRHi - logRLo) * (j - 1) / (roughnessPoints - 2));
                double exact = ColebrookWhite.Solve(re, r).FrictionFactor;
                double approx = info.Method == FrictionMethod.ColebrookWhite ? exact : ExplicitFriction.Evaluate(info.Method, re, r);
                double deviation = Math.Abs(approx / exact - 1.0) * 100.0;
                if (deviation > worst.MaxDeviationPercent) worst = new Extreme(deviation, re, r);
            }
        }
        return worst;
    }
}
