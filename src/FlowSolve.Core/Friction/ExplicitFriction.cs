namespace FlowSolve.Core.Friction;

/// <summary>
/// Published explicit approximations of the Colebrook-White friction factor, each exactly as its paper gives it.
/// </summary>
/// <remarks>
/// Each is cheap and each has an error against the exact equation that depends on where in its range it is
/// used; <see cref="FrictionMethodInfo"/> lists the ranges and the largest deviations FlowSolve measured.
/// Arguments are not validated here (these are hot-path kernels); <see cref="DarcyFriction"/> validates.
/// </remarks>
public static class ExplicitFriction
{
    /// <summary>Swamee and Jain (1976): f = 1.325 / [ln(e/(3.7 D) + 5.74/Re^0.9)]^2.</summary>
    /// <remarks>The paper's natural-log form with its constant 1.325 (from memory). The often-quoted decimal form
    /// 0.25/[log10(...)]^2 is the same formula with 1.325 unrounded (0.25 ln(10)^2 = 1.32547), 0.036 percent higher.</remarks>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    public static double SwameeJain(double reynolds, double relativeRoughness)
    {
        double l = Math.Log(relativeRoughness / 3.7 + 5.74 / Math.Pow(reynolds, 0.9));
        return 1.325 / (l * l);
    }

    /// <summary>Haaland (1983): 1/sqrt(f) = -1.8 log10[ (e/(3.7 D))^1.11 + 6.9/Re ].</summary>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    public static double Haaland(double reynolds, double relativeRoughness)
    {
        double x = -1.8 * Math.Log10(Math.Pow(relativeRoughness / 3.7, 1.11) + 6.9 / reynolds);
        return 1.0 / (x * x);
    }

    /// <summary>
    /// Churchill (1977): f = 8 [ (8/Re)^12 + (A + B)^-1.5 ]^(1/12), with
    /// A = [2.457 ln(1/((7/Re)^0.9 + 0.27 e/D))]^16 and B = (37530/Re)^16. Covers laminar, transitional and turbulent flow.
    /// </summary>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    public static double Churchill(double reynolds, double relativeRoughness)
    {
        double a = Math.Pow(-2.457 * Math.Log(Math.Pow(7.0 / reynolds, 0.9) + 0.27 * relativeRoughness), 16);
        double b = Math.Pow(37530.0 / reynolds, 16);
        return 8.0 * Math.Pow(Math.Pow(8.0 / reynolds, 12) + Math.Pow(a + b, -1.5), 1.0 / 12.0);
    }

    /// <summary>
    /// Serghides (1984): three fixed-point sweeps of Colebrook-White, A = -2 log10(e/(3.7 D) + 12/Re),
    /// B = -2 log10(e/(3.7 D) + 2.51 A/Re), C = -2 log10(e/(3.7 D) + 2.51 B/Re), combined by Steffensen's
    /// acceleration: 1/sqrt(f) = A - (B - A)^2 / (C - 2B + A).
    /// </summary>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    public static double Serghides(double reynolds, double relativeRoughness)
    {
        double r = relativeRoughness / 3.7;
        double a = -2.0 * Math.Log10(r + 12.0 / reynolds);
        double b = -2.0 * Math.Log10(r + 2.51 * a / reynolds);
        double c = -2.0 * Math.Log10(r + 2.51 * b / reynolds);
        double x = a - (b - a) * (b - a) / (c - 2.0 * b + a);
        return 1.0 / (x * x);
    }

    /// <summary>Evaluates the named explicit method; <see cref="FrictionMethod.ColebrookWhite"/> is not explicit and throws.</summary>
    /// <param name="method">An explicit method.</param>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    public static double Evaluate(FrictionMethod method, double reynolds, double relativeRoughness) => method switch
    {
        FrictionMethod.SwameeJain => SwameeJain(reynolds, relativeRoughness),
        FrictionMethod.Haaland => Haaland(reynolds, relativeRoughness),
        FrictionMethod.Churchill => Churchill(reynolds, relativeRoughness),
        FrictionMethod.Serghides => Serghides(reynolds, relativeRoughness),
        _ => throw new ArgumentOutOfRangeException(nameof(method), method, "not an explicit approximation"),
    };
}
