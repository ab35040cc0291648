using System.Runtime.CompilerServices;

namespace FlowSolve.Core.Friction;

/// <summary>The partial derivatives of a Darcy friction factor f(Re, e/D).</summary>
/// <param name="Reynolds">df/dRe (dimensionless per unit Reynolds number).</param>
/// <param name="RelativeRoughness">df/d(e/D).</param>
public readonly record struct FrictionPartials(double Reynolds, double RelativeRoughness);

/// <summary>
/// df/dRe and df/d(e/D) of the relation that gave a friction factor, analytically: the laminar law directly,
/// Colebrook-White by implicit differentiation of the solved equation (<see cref="ColebrookResult.Derivatives"/>),
/// and each explicit approximation by the chain rule through its own formula (forward-mode differentiation with a
/// value-and-derivative pair, so the derivative is exact to rounding, not a difference quotient).
/// </summary>
/// <remarks>Allocation-free and thread-safe.</remarks>
public static class FrictionSensitivity
{
    /// <summary>The partials of the relation recorded in <paramref name="result"/> at its inputs.</summary>
    /// <param name="result">A result of <see cref="DarcyFriction.Compute"/>.</param>
    /// <param name="reynolds">The Reynolds number it was computed at.</param>
    /// <param name="relativeRoughness">The relative roughness it was computed at.</param>
    public static FrictionPartials Of(in FrictionResult result, double reynolds, double relativeRoughness)
    {
        string relation = result.Relation;
        if (relation == DarcyFriction.LaminarRelation) return new(-result.FrictionFactor / reynolds, 0.0);
        if (relation == FrictionMethodInfo.ColebrookWhite.Code)
        {
            var (dRe, dR) = new ColebrookResult(result.FrictionFactor, 0, 0, 0.0, result.Status, reynolds, relativeRoughness).Derivatives();
            return new(dRe, dR);
        }
        FrictionMethodInfo.TryParse(relation, out var info);
        return Explicit(info.Method, reynolds, relativeRoughness);
    }

    /// <summary>The partials of an explicit approximation (<see cref="ExplicitFriction"/>).</summary>
    /// <param name="method">An explicit method (not <see cref="FrictionMethod.ColebrookWhite"/>).</param>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    /// <exception cref="ArgumentOutOfRangeException">The method is not explicit.</exception>
    public static FrictionPartials Explicit(FrictionMethod method, double reynolds, double relativeRoughness)
    {
        var re = Dual.Variable(reynolds);
        var r = Dual.Constant(relativeRoughness);
        double dRe = Evaluate(method, re, r).Derivative;
        double dR = Evaluate(method, Dual.Constant(reynolds), Dual.Variable(relativeRoughness)).Derivative;
        return new(dRe, dR);
    }

    private static Dual Evaluate(FrictionMethod method, Dual re, Dual r) => method switch
    {
        FrictionMethod.SwameeJain => SwameeJain(re, r),
        FrictionMethod.Haaland => Haaland(re, r),
        FrictionMethod.Churchill => Churchill(re, r),
        FrictionMethod.Serghides => Serghides(re, r),
        _ => throw new ArgumentOutOfRangeException(nameof(method), method, "not an explicit approximation"),
    };

    // Each formula is written as in ExplicitFriction, operation for operation.
    private static Dual SwameeJain(Dual re, Dual r)
    {
        var l = Dual.Log(r / 3.7 + 5.74 / Dual.Pow(re, 0.9));
        return 1.325 / (l * l);
    }

    private static Dual Haaland(Dual re, Dual r)
    {
        var x = -1.8 / Math.Log(10) * Dual.Log(Dual.Pow(r / 3.7, 1.11) + 6.9 / re);
        return 1.0 / (x * x);
    }

    private static Dual Churchill(Dual re, Dual r)
    {
        var a = Dual.Pow(-2.457 * Dual.Log(Dual.Pow(7.0 / re, 0.9) + 0.27 * r), 16);
        var b = Dual.Pow(37530.0 / re, 16);
        return 8.0 * Dual.Pow(Dual.Pow(8.0 / re, 12) + Dual.Pow(a + b, -1.5), 1.0 / 12.0);
    }

    private static Dual Serghides(Dual re, Dual r)
    {
        const double twoOverLn10 = 0.86858896380650365530;
        var q = r / 3.7;
        var a = -twoOverLn10 * Dual.Log(q + 12.0 / re);
        var b = -twoOverLn10 * Dual.Log(q + 2.51 * a / re);
        var c = -twoOverLn10 * Dual.Log(q + 2.51 * b / re);
        var x = a - (b - a) * (b - a) / (c - 2.0 * b + a);
        return 1.0 / (x * x);
    }
}

/// <summary>A value with its derivative along one input (forward-mode differentiation); the chain rule is in the operators.</summary>
internal readonly struct Dual(double value, double derivative)
{
    public double Value { get; } = value;
    public double Derivative { get; } = derivative;

    public static Dual Variable(double x) => new(x, 1.0);
    public static Dual Constant(double x) => new(x, 0.0);

    public static Dual operator +(Dual a, Dual b) => new(a.Value + b.Value, a.Derivative + b.Derivative);
    public static Dual operator -(Dual a, Dual b) => new(a.Value - b.Value, a.Derivative - b.Derivative);
    public static Dual operator *(Dual a, Dual b) => new(a.Value * b.Value, a.Derivative * b.Value + a.Value * b.Derivative);
    public static Dual operator /(Dual a, Dual b) =>
        new(a.Value / b.Value, (a.Derivative * b.Value - a.Value * b.Derivative) / (b.Value * b.Value));
    public static Dual operator +(Dual a, double b) => new(a.Value + b, a.Derivative);
    public static Dual operator *(double a, Dual b) => new(a * b.Value, a * b.Derivative);
    public static Dual operator /(Dual a, double b) => new(a.Value / b, a.Derivative / b);
    public static Dual operator /(double a, Dual b) => new(a / b.Value, -a * b.Derivative / (b.Value * b.Value));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Dual Log(Dual a) => new(Math.Log(a.Value), a.Derivative / a.Value);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Dual Pow(Dual a, double p) => new(Math.Pow(a.Value, p), p * Math.Pow(a.Value, p - 1) * a.Derivative);
}
