using System.Runtime.CompilerServices;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.NonNewtonian;

/// <summary>
/// Friction of a power-law fluid in a smooth pipe: the Metzner-Reed Reynolds number, the laminar law f = 16/Re_MR, the
/// critical Reynolds number of Ryan and Johnson, and the Dodge-Metzner equation solved exactly. Fanning friction
/// factors throughout (the Darcy factor is four times as large).
/// </summary>
/// <remarks>
/// <para>Sources (from memory): Metzner, A. B. and Reed, J. C. (1955), AIChE J. 1(4), 434-440 (the generalised
/// Reynolds number); Dodge, D. W. and Metzner, A. B. (1959), AIChE J. 5(2), 189-204 (turbulent flow in smooth pipes,
/// fitted for 0.36 &lt;= n &lt;= 1.0 and 2900 &lt;= Re_MR &lt;= 36000); Ryan, N. W. and Johnson, M. M. (1959), AIChE J.
/// 5(4), 433-435 (the stability criterion).</para>
/// <para>Dodge-Metzner, 1/sqrt(f) = (4.0/n^0.75) log10(Re_MR f^(1-n/2)) - 0.4/n^1.2, is solved in x = 1/sqrt(f), where
/// it reads g(x) = x - c (log10 Re_MR + (n - 2) log10 x) + d = 0 with c = 4/n^0.75 and d = 0.4/n^1.2. For n &lt;= 2,
/// g'(x) = 1 + c (2 - n)/(x ln 10) &gt;= 1 and g'' &lt;= 0: g rises strictly and is concave, so the root is unique and
/// Newton converges from any start below it (as for Colebrook-White, which is the case n = 1 in Fanning form). The
/// bracket [1e-3, 1e6] is checked: it holds every root for Re_MR up to 1e12 and n from 0.01 to 2.</para>
/// </remarks>
public static class PowerLawFriction
{
    private const double Ln10 = 2.302585092994045684;

    /// <summary>Relative step tolerance in x = 1/sqrt(f).</summary>
    public const double RelativeTolerance = 4 * SolverOptions.MachineEpsilon;

    /// <summary>The iteration cap: bracket checks and bisections included, 100 steps halve any double bracket to its last bit.</summary>
    public const int MaxIterations = 100;

    private static readonly SolverOptions Options = new(0.0, RelativeTolerance, 0.0, MaxIterations);

    /// <summary>The Metzner-Reed Reynolds number Re_MR = rho V^(2-n) D^n / (K 8^(n-1) ((3n+1)/(4n))^n).</summary>
    /// <param name="density">rho in kg/m3.</param>
    /// <param name="consistencyIndex">K in Pa s^n.</param>
    /// <param name="flowBehaviorIndex">n.</param>
    /// <param name="velocity">Mean velocity V in m/s.</param>
    /// <param name="diameter">Inside diameter D in m.</param>
    public static double Reynolds(double density, double consistencyIndex, double flowBehaviorIndex, double velocity, double diameter)
    {
        double n = flowBehaviorIndex;
        // In logarithms, so that no intermediate power overflows where the number itself is representable.
        double ln = Math.Log(density) + (2 - n) * Math.Log(velocity) + n * Math.Log(diameter)
                    - Math.Log(consistencyIndex) - (n - 1) * Math.Log(8.0) - n * Math.Log((3 * n + 1) / (4 * n));
        return Math.Exp(ln);
    }

    /// <summary>The critical Reynolds number of Ryan and Johnson (1959): Re_c = 6464 n (2+n)^((2+n)/(1+n)) / (1+3n)^2
    /// (about 2100 at n = 1).</summary>
    /// <param name="flowBehaviorIndex">n.</param>
    public static double CriticalReynolds(double flowBehaviorIndex)
    {
        double n = flowBehaviorIndex;
        double s = 1 + 3 * n;
        return 6464 * n * Math.Pow(2 + n, (2 + n) / (1 + n)) / (s * s);
    }

    /// <summary>The wall shear stress of laminar flow, tau_w = K ((3n+1)/(4n) 8V/D)^n in Pa (Rabinowitsch-Mooney for a
    /// power-law fluid): the laminar law f = 16/Re_MR written without the friction factor, finite at any velocity.</summary>
    /// <param name="consistencyIndex">K in Pa s^n.</param>
    /// <param name="flowBehaviorIndex">n.</param>
    /// <param name="velocity">V in m/s.</param>
    /// <param name="diameter">D in m.</param>
    public static double LaminarWallShearStress(double consistencyIndex, double flowBehaviorIndex, double velocity, double diameter)
    {
        double n = flowBehaviorIndex;
        return consistencyIndex * Math.Pow((3 * n + 1) / (4 * n) * 8 * velocity / diameter, n);
    }

    /// <summary>Solves Dodge-Metzner for the Fanning friction factor.</summary>
    /// <param name="reynolds">Re_MR; finite and positive (the equation is meant for turbulent flow).</param>
    /// <param name="flowBehaviorIndex">n in [0.01, 2].</param>
    /// <param name="trace">Optional per-iteration record in x = 1/sqrt(f).</param>
    /// <returns>The factor with the solve's record and d ln f / d ln Re_MR.</returns>
    /// <exception cref="ArgumentOutOfRangeException">An argument is non-finite or outside its domain.</exception>
    public static DodgeMetznerResult DodgeMetzner(double reynolds, double flowBehaviorIndex, SolverTrace? trace = null)
    {
        if (!(reynolds > 0) || !double.IsFinite(reynolds)) NonNewtonianFluid.Throw(nameof(reynolds), reynolds, "must be finite and positive");
        if (!(flowBehaviorIndex >= NonNewtonianFluid.MinimumFlowBehaviorIndex && flowBehaviorIndex <= NonNewtonianFluid.MaximumFlowBehaviorIndex))
            NonNewtonianFluid.Throw(nameof(flowBehaviorIndex), flowBehaviorIndex, "must be in [0.01, 2]");
        var equation = new DodgeMetznerEquation(reynolds, flowBehaviorIndex);
        // Start: one fixed-point sweep x = c (log10 Re + (n-2) log10 x) - d from x = 10, which lands near the root for
        // the usual turbulent range (f about 0.001 to 0.01); outside the bracket the solver starts from its midpoint.
        double guess = equation.C * (Math.Log10(reynolds) + (flowBehaviorIndex - 2)) - equation.D;
        RootResult root = SafeguardedNewton.Solve(in equation, Bracket.Checked(1e-3, 1e6), guess, in Options, trace);
        double x = root.Root;
        double gx = 1 + equation.C * (2 - flowBehaviorIndex) / (x * Ln10);
        return new DodgeMetznerResult(1 / (x * x), root.Iterations, root.Residual, root.Status, -2 * equation.C / (Ln10 * x * gx));
    }

    /// <summary>The residual of Dodge-Metzner in x = 1/sqrt(f) at a Fanning friction factor: what a reviewer evaluates.</summary>
    /// <param name="fanning">A Fanning friction factor.</param>
    /// <param name="reynolds">Re_MR.</param>
    /// <param name="flowBehaviorIndex">n.</param>
    public static double DodgeMetznerResidual(double fanning, double reynolds, double flowBehaviorIndex) =>
        new DodgeMetznerEquation(reynolds, flowBehaviorIndex).Evaluate(1 / Math.Sqrt(fanning)).Value;

    /// <summary>g(x) = x - c (log10 Re + (n - 2) log10 x) + d and g'(x).</summary>
    private readonly struct DodgeMetznerEquation(double reynolds, double n) : IDifferentiableFunction
    {
        public readonly double C = 4.0 / Math.Pow(n, 0.75);
        public readonly double D = 0.4 / Math.Pow(n, 1.2);
        private readonly double _log10Re = Math.Log10(reynolds);
        private readonly double _twoMinusN = 2 - n;

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public (double Value, double Derivative) Evaluate(double x) =>
            (x - C * (_log10Re - _twoMinusN * Math.Log10(x)) + D, 1 + C * _twoMinusN / (x * Ln10));
    }
}

/// <summary>The Dodge-Metzner Fanning friction factor and how it was solved.</summary>
/// <param name="Fanning">Fanning friction factor f.</param>
/// <param name="Iterations">Newton or bisection steps.</param>
/// <param name="Residual">Residual in x = 1/sqrt(f) at the returned factor.</param>
/// <param name="Status">Why the solve stopped.</param>
/// <param name="DLnFDLnReynolds">d ln f / d ln Re_MR by implicit differentiation: -2 (c/ln 10) / (x g'(x)).</param>
public readonly record struct DodgeMetznerResult(double Fanning, int Iterations, double Residual, SolveStatus Status, double DLnFDLnReynolds)
{
    /// <summary>True when the solve converged.</summary>
    public bool Converged => Status.IsConverged();
}
