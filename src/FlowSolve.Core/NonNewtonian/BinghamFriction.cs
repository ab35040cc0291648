using System.Runtime.CompilerServices;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.NonNewtonian;

/// <summary>
/// Friction of a Bingham plastic in a pipe: the Hedstrom number, the exact laminar law of Buckingham and Reiner, the
/// turbulent correlation and the all-regime combination of Darby, Mun and Boger. Fanning friction factors throughout.
/// </summary>
/// <remarks>
/// <para>Sources (from memory): Buckingham, E. (1921), Proc. ASTM 21, 1154-1156, and Reiner, M. (1926), Kolloid-Z.
/// 39, 80-87 (laminar flow of a Bingham plastic in a tube); Hedstrom, B. O. A. (1952), Ind. Eng. Chem. 44(3), 651-656
/// (the Hedstrom number); Darby, R., Mun, R. and Boger, D. V. (1992), Chem. Eng. 99(9), 116-119, and Darby, R. (2001),
/// Chemical Engineering Fluid Mechanics, 2nd ed., Marcel Dekker (the turbulent correlation and the combination).</para>
/// <para>Buckingham-Reiner, f_L = (16/Re)(1 + He/(6 Re) - He^4/(3 f_L^3 Re^7)), is solved in u = 1 - tau0/tau_w (one minus
/// the plug's share of the radius). With xi = tau0/tau_w = 2 He/(f Re^2) the equation is exactly
/// f_L = 16/(Re phi) with phi = 1 - 4 xi/3 + xi^4/3 = u^2 (2 - 4u/3 + u^2/3), and xi = a phi with a = He/(8 Re), so u solves
/// h(u) = a u^2 (2 - 4u/3 + u^2/3) - (1 - u) = 0. Written in u the near-plug limit (xi near 1, where phi is a small
/// difference of order-one terms in xi) keeps full precision, and h'(u) = 1 + a (4u - 4u^2 + 4u^3/3) &gt;= 1 on [0, 1]:
/// h rises strictly from h(0) = -1 to h(1) = a &gt; 0, so [0, 1] is a known increasing bracket with one root.</para>
/// </remarks>
public static class BinghamFriction
{
    private const double Ln10 = 2.302585092994045684;

    /// <summary>The iteration cap (bisection of [0, 1] to the last bit takes about 60 steps).</summary>
    public const int MaxIterations = 100;

    private static readonly SolverOptions Options = new(0.0, 4 * SolverOptions.MachineEpsilon, 0.0, MaxIterations);

    /// <summary>The Hedstrom number He = rho D^2 tau0 / mu_p^2.</summary>
    public static double Hedstrom(double density, double yieldStress, double plasticViscosity, double diameter) =>
        density * diameter * diameter * yieldStress / (plasticViscosity * plasticViscosity);

    /// <summary>The plastic Reynolds number Re = rho V D / mu_p.</summary>
    public static double Reynolds(double density, double plasticViscosity, double velocity, double diameter) =>
        density * velocity * diameter / plasticViscosity;

    /// <summary>Solves Buckingham-Reiner for the laminar Fanning friction factor.</summary>
    /// <param name="reynolds">Re = rho V D / mu_p; finite and positive.</param>
    /// <param name="hedstrom">He; finite, 0 or more (0: the Newtonian law f = 16/Re, no iteration).</param>
    /// <param name="trace">Optional per-iteration record in u = 1 - tau0/tau_w.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is non-finite or outside its domain.</exception>
    public static BuckinghamReinerResult BuckinghamReiner(double reynolds, double hedstrom, SolverTrace? trace = null)
    {
        if (!(reynolds > 0) || !double.IsFinite(reynolds)) NonNewtonianFluid.Throw(nameof(reynolds), reynolds, "must be finite and positive");
        if (!(hedstrom >= 0) || !double.IsFinite(hedstrom)) NonNewtonianFluid.Throw(nameof(hedstrom), hedstrom, "must be finite and 0 or more");
        double a = hedstrom / (8 * reynolds);
        // He = 0: u = 1, phi'(1) = 4/3, so d ln f_L / dHe = 1/(6 Re), the slope of (16/Re)(1 + He/(6 Re)).
        if (a == 0) return new BuckinghamReinerResult(16 / reynolds, 0, 0, 0, SolveStatus.ClosedForm, -1) { DLnFDHedstrom = 1 / (6 * reynolds) };
        if (!double.IsFinite(a)) NonNewtonianFluid.Throw(nameof(hedstrom), hedstrom, "He/Re overflows");

        var equation = new Equation(a);
        // Start from the two limits: u = 1 - a (a small, little plug) or u = 1/sqrt(2a) (a large: phi ~ 2u^2 ~ 1/a).
        double guess = a < 0.5 ? 1 - a / (1 + a) : 1 / Math.Sqrt(2 * a);
        RootResult root = SafeguardedNewton.Solve(in equation, Bracket.KnownIncreasing(0.0, 1.0), guess, in Options, trace);
        double u = root.Root;
        double phi = Phi(u);
        // d ln f_L / d ln Re = -1 - (phi'/phi) du/dlnRe, with du/dlnRe = a phi / h'(u) (da/dlnRe = -a, h_a = phi).
        double dphi = DPhi(u);
        double hu = 1 + a * dphi;
        double dlnf = -1 - dphi / phi * (a * phi / hu);
        // d ln f_L / dHe = (phi'/phi) (phi/h'(u)) / (8 Re) = phi'(u) / (8 Re h'(u)) (da/dHe = 1/(8 Re)); finite at He = 0.
        return new BuckinghamReinerResult(16 / (reynolds * phi), a * phi, root.Iterations, root.Residual, root.Status, dlnf)
        {
            DLnFDHedstrom = dphi / (8 * reynolds * hu),
        };
    }

    /// <summary>The residual of Buckingham-Reiner in the published form, f - (16/Re)(1 + He/(6 Re) - He^4/(3 f^3 Re^7)),
    /// divided by 16/Re: what a reviewer evaluates at a claimed laminar factor.</summary>
    public static double BuckinghamReinerResidual(double fanning, double reynolds, double hedstrom)
    {
        double heRe2 = hedstrom / (reynolds * reynolds);
        // He^4/(3 f^3 Re^7) = (He/Re^2)^4 Re / (3 f^3), written so that no power overflows.
        double xi = 2 * heRe2 / fanning;
        return fanning * reynolds / 16 - (1 + hedstrom / (6 * reynolds) - xi * xi * xi * xi * fanning * reynolds / 48);
    }

    /// <summary>The turbulent correlation of Darby, Mun and Boger (1992): f_T = 10^a Re^-0.193 with
    /// a = -1.47 (1 + 0.146 exp(-2.9e-5 He)).</summary>
    public static double DarbyTurbulent(double reynolds, double hedstrom)
    {
        double a = -1.47 * (1 + 0.146 * Math.Exp(-2.9e-5 * hedstrom));
        return Math.Pow(10, a) * Math.Pow(reynolds, -0.193);
    }

    /// <summary>d ln f_T / dHe of <see cref="DarbyTurbulent"/> at constant Re: ln 10 x 1.47 x 0.146 x 2.9e-5 exp(-2.9e-5 He).</summary>
    public static double DarbyTurbulentDLnFDHedstrom(double hedstrom) => Ln10 * 1.47 * 0.146 * 2.9e-5 * Math.Exp(-2.9e-5 * hedstrom);

    /// <summary>The exponent of the combination, m = 1.7 + 40000/Re.</summary>
    public static double CombinationExponent(double reynolds) => 1.7 + 40000 / reynolds;

    /// <summary>(a^m + b^m)^(1/m), evaluated as max (1 + (min/max)^m)^(1/m) so that large m does not overflow.</summary>
    /// <param name="a">A positive factor.</param>
    /// <param name="b">Another positive factor.</param>
    /// <param name="m">The exponent, positive.</param>
    public static double Combine(double a, double b, double m)
    {
        double hi = Math.Max(a, b), lo = Math.Min(a, b);
        return hi * Math.Pow(1 + Math.Pow(lo / hi, m), 1 / m);
    }

    /// <summary>d ln F / d ln Re of F = combine(f_L, f_T, m(Re)), from the parts' own logarithmic slopes.</summary>
    internal static double CombinedSlope(double fL, double fT, double m, double reynolds, double dLnFL, double dLnFT)
    {
        double hi = Math.Max(fL, fT), lo = Math.Min(fL, fT);
        double r = lo / hi, rm = Math.Pow(r, m), s = 1 + rm;
        // Weights f_i^m / sum f^m of the parts.
        double wLo = rm / s, wHi = 1 / s;
        double slopeHi = fL >= fT ? dLnFL : dLnFT, slopeLo = fL >= fT ? dLnFT : dLnFL;
        double dLnFdm = -Math.Log(s) / (m * m) + (rm == 0 ? 0 : rm * Math.Log(r) / (m * s));
        double dmDLnRe = -40000 / reynolds;
        return wHi * slopeHi + wLo * slopeLo + dLnFdm * dmDLnRe;
    }

    /// <summary>d ln F / dHe of F = combine(f_L, f_T, m) at constant Re: the parts' slopes weighted by f_i^m / sum f^m
    /// (m does not depend on He).</summary>
    internal static double CombinedHedstromSlope(double fL, double fT, double m, double dLnFLDHe, double dLnFTDHe)
    {
        double hi = Math.Max(fL, fT), lo = Math.Min(fL, fT);
        double rm = Math.Pow(lo / hi, m), s = 1 + rm;
        return fL >= fT ? (dLnFLDHe + rm * dLnFTDHe) / s : (dLnFTDHe + rm * dLnFLDHe) / s;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double Phi(double u) => u * u * (2 - 4 * u / 3 + u * u / 3);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double DPhi(double u) => 4 * u * (1 - u + u * u / 3);

    /// <summary>h(u) = a phi(u) - (1 - u) and h'(u) = a phi'(u) + 1.</summary>
    private readonly struct Equation(double a) : IDifferentiableFunction
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public (double Value, double Derivative) Evaluate(double u) => (a * Phi(u) - (1 - u), a * DPhi(u) + 1);
    }
}

/// <summary>The Buckingham-Reiner laminar Fanning friction factor and how it was solved.</summary>
/// <param name="Fanning">Laminar Fanning friction factor f_L.</param>
/// <param name="PlugRatio">xi = tau0/tau_w: the unsheared plug's share of the pipe radius (0 for a Newtonian fluid, 1 at the
/// onset of flow).</param>
/// <param name="Iterations">Newton or bisection steps (0 when He = 0: f = 16/Re in closed form).</param>
/// <param name="Residual">Residual of the solve equation in u = 1 - xi at the returned factor.</param>
/// <param name="Status">Why the solve stopped.</param>
/// <param name="DLnFDLnReynolds">d ln f_L / d ln Re at constant He, by implicit differentiation.</param>
public readonly record struct BuckinghamReinerResult(double Fanning, double PlugRatio, int Iterations, double Residual,
    SolveStatus Status, double DLnFDLnReynolds)
{
    /// <summary>d ln f_L / dHe at constant Re (per unit of He), by implicit differentiation; 1/(6 Re) at He = 0.</summary>
    public double DLnFDHedstrom { get; init; }

    /// <summary>True when the solve converged (or the value is closed-form).</summary>
    public bool Converged => Status.IsConverged();
}
