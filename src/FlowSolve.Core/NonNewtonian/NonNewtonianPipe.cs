using System.Runtime.CompilerServices;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.NonNewtonian;

/// <summary>The head loss of a non-Newtonian fluid in one smooth pipe at one flow.</summary>
/// <param name="Friction">The friction factor and its record.</param>
/// <param name="Flow">Q in m3/s.</param>
/// <param name="Velocity">V = 4Q/(pi D^2) in m/s.</param>
/// <param name="FrictionHeadLoss">hf = 4 tau_w L/(rho g D) = f_Darcy (L/D) V^2/(2g) in m.</param>
/// <param name="MinorHeadLoss">hm = K V^2/(2g) in m.</param>
/// <param name="HeadLoss">hf + hm in m.</param>
/// <param name="PressureDrop">rho g (hf + hm) in Pa.</param>
/// <param name="DHeadLossDFlow">d(hf + hm)/dQ in m per m3/s, with the friction factor's own dependence on the flow.</param>
public readonly record struct NonNewtonianHeadLoss(NonNewtonianFrictionResult Friction, double Flow, double Velocity,
    double FrictionHeadLoss, double MinorHeadLoss, double HeadLoss, double PressureDrop, double DHeadLossDFlow)
{
    /// <summary>Velocity head V^2/(2g) in m.</summary>
    public double VelocityHead => Velocity * Velocity / (2 * Physical.StandardGravity);
}

/// <summary>Why a non-Newtonian flow solve ended.</summary>
public enum NonNewtonianFlowStatus
{
    /// <summary>The flow meets the head loss.</summary>
    Solved,
    /// <summary>The iteration did not converge; the best iterate is reported.</summary>
    NotConverged,
    /// <summary>A Bingham plastic: the head loss does not exceed 4 tau0 L/(rho g D), the least the yield stress needs before any flow.</summary>
    BelowYield,
    /// <summary>A power-law fluid: the head loss falls in the jump of friction at the critical Reynolds number (between
    /// the laminar law's loss and Dodge-Metzner's there), so no flow meets it under these correlations.</summary>
    InTransitionGap,
    /// <summary>The flow that would meet the head loss lies outside the evaluated Reynolds numbers or velocities.</summary>
    OutsideRange,
}

/// <summary>The flow a head loss drives through a pipe, with the state at that flow.</summary>
/// <param name="Status">Why the solve ended.</param>
/// <param name="State">The pipe's state at the flow found (default when there is none).</param>
/// <param name="HeadLoss">The head loss asked for, m.</param>
/// <param name="Iterations">Steps of the outer solve in ln Q.</param>
/// <param name="Residual">ln(h(Q)) - ln(headLoss) at the returned flow.</param>
/// <param name="SolverStatus">The outer solver's status.</param>
/// <param name="YieldHeadLoss">Bingham: 4 tau0 L/(rho g D), the head below which nothing flows (m); 0 for a power law.</param>
/// <param name="CriticalFlow">Power law: the flow at the critical Reynolds number (m3/s); NaN for a Bingham plastic.</param>
/// <param name="GapLow">Power law: the head loss of the laminar law at the critical Reynolds number (m); NaN for a Bingham plastic.</param>
/// <param name="GapHigh">Power law: Dodge-Metzner's head loss at the critical Reynolds number (m); NaN for a Bingham plastic.</param>
public readonly record struct NonNewtonianFlowResult(NonNewtonianFlowStatus Status, NonNewtonianHeadLoss State, double HeadLoss,
    int Iterations, double Residual, SolveStatus SolverStatus, double YieldHeadLoss, double CriticalFlow, double GapLow, double GapHigh)
{
    /// <summary>Power law: a second, laminar flow (m3/s) that meets the same head, or NaN. Where Dodge-Metzner at Re_c lies
    /// below the laminar law (small n: n below about 0.37), h(Q) drops at Re_c and heads between the two are met twice;
    /// <see cref="State"/> is then the turbulent flow and this the laminar one, the lower and cautious estimate.</summary>
    public double AlternateFlow { get; init; } = double.NaN;

    /// <summary>True when a flow meeting the head loss was found.</summary>
    public bool Converged => Status == NonNewtonianFlowStatus.Solved;
}

/// <summary>
/// Head loss from flow, and the flow that meets a head loss (the inverse problem), for a power-law fluid or a Bingham
/// plastic in a smooth pipe: Darcy-Weisbach with the friction factor of <see cref="NonNewtonianFriction"/>, plus minor
/// losses K V^2/(2g). Gravity is <see cref="Physical.StandardGravity"/>.
/// </summary>
/// <remarks>
/// <para>The inverse is solved by <see cref="SafeguardedNewton"/> in y = ln Q on F(y) = ln h(e^y) - ln h*, whose slope
/// d ln h / d ln Q = (2 + s) hf/h + 2 hm/h (s = d ln f / d ln V) lies between about 1 (laminar) and 2 (turbulent): F is
/// nearly linear in ln Q over many decades, so Newton converges in a few steps from any start. The bracket is the
/// velocities from 1e-12 to 1e4 m/s cut to the Reynolds numbers the relations evaluate, and its ends are checked.</para>
/// <para>A Bingham plastic needs a wall stress of tau0 before it moves: h(Q) tends to 4 tau0 L/(rho g D) as Q tends to 0,
/// and a head loss at or below it gives <see cref="NonNewtonianFlowStatus.BelowYield"/>. A power-law fluid's friction
/// factor jumps at Re_c (laminar law below, Dodge-Metzner from it), so h(Q) jumps there; a head loss inside the jump
/// gives <see cref="NonNewtonianFlowStatus.InTransitionGap"/> with both ends reported.</para>
/// </remarks>
public static class NonNewtonianPipe
{
    /// <summary>Smallest and largest mean velocities the inverse searches, m/s.</summary>
    public const double MinimumVelocity = 1e-12, MaximumVelocity = 1e4;

    private static readonly SolverOptions Options = new(1e-14, 0.0, 0.0, 200);

    /// <summary>Head loss at a flow.</summary>
    /// <param name="fluid">The fluid.</param>
    /// <param name="length">L in m; finite and positive.</param>
    /// <param name="diameter">D in m; finite and positive.</param>
    /// <param name="minorLossCoefficient">K (dimensionless); finite, 0 or more.</param>
    /// <param name="flow">Q in m3/s; finite and positive.</param>
    /// <param name="trace">Optional record of the friction factor's implicit solve.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain, or the Reynolds number is outside
    /// the evaluated range (parameter <c>reynolds</c>).</exception>
    public static NonNewtonianHeadLoss HeadLoss(in NonNewtonianFluid fluid, double length, double diameter, double minorLossCoefficient,
        double flow, SolverTrace? trace = null)
    {
        Guard(length, diameter, minorLossCoefficient);
        if (!(flow > 0) || !double.IsFinite(flow)) NonNewtonianFluid.Throw(nameof(flow), flow, "must be finite and positive");
        return Evaluate(fluid, length, diameter, minorLossCoefficient, flow, trace);
    }

    /// <summary>The flow that meets a head loss (friction + minor), m.</summary>
    /// <param name="fluid">The fluid.</param>
    /// <param name="length">L in m.</param>
    /// <param name="diameter">D in m.</param>
    /// <param name="minorLossCoefficient">K.</param>
    /// <param name="headLoss">h* in m; finite and positive.</param>
    /// <param name="trace">Optional record of the outer solve in ln Q.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static NonNewtonianFlowResult Flow(in NonNewtonianFluid fluid, double length, double diameter, double minorLossCoefficient,
        double headLoss, SolverTrace? trace = null)
    {
        Guard(length, diameter, minorLossCoefficient);
        fluid.Validate();
        if (!(headLoss > 0) || !double.IsFinite(headLoss)) NonNewtonianFluid.Throw(nameof(headLoss), headLoss, "must be finite and positive");
        double area = 0.25 * Math.PI * diameter * diameter;
        double g = Physical.StandardGravity;

        double yieldHead = fluid.Model == RheologyModel.BinghamPlastic ? 4 * fluid.YieldStress * length / (fluid.Density * g * diameter) : 0;
        double criticalFlow = double.NaN, gapLow = double.NaN, gapHigh = double.NaN;
        if (fluid.Model == RheologyModel.BinghamPlastic && !(headLoss > yieldHead))
            return new(NonNewtonianFlowStatus.BelowYield, default, headLoss, 0, double.NaN, SolveStatus.ClosedForm, yieldHead,
                criticalFlow, gapLow, gapHigh);

        // The velocity bracket, cut to the evaluated Reynolds numbers (Re grows as V^(2-n), or as V for a Bingham plastic).
        double lnLo = Math.Log(MinimumVelocity), lnHi = Math.Log(MaximumVelocity);
        double lnRe1, power; // ln Re at V = 1 m/s, and d ln Re / d ln V
        if (fluid.Model == RheologyModel.PowerLaw)
        {
            lnRe1 = Math.Log(PowerLawFriction.Reynolds(fluid.Density, fluid.ConsistencyIndex, fluid.FlowBehaviorIndex, 1.0, diameter));
            power = 2 - fluid.FlowBehaviorIndex;
        }
        else
        {
            lnRe1 = Math.Log(BinghamFriction.Reynolds(fluid.Density, fluid.PlasticViscosity, 1.0, diameter));
            power = 1;
        }
        double margin = 1e-9; // keep the ends strictly inside the evaluated range against rounding
        if (power > 0)
        {
            lnLo = Math.Max(lnLo, (Math.Log(NonNewtonianFriction.MinimumReynolds) + margin - lnRe1) / power);
            lnHi = Math.Min(lnHi, (Math.Log(NonNewtonianFriction.MaximumReynolds) - margin - lnRe1) / power);
        }
        else if (!NonNewtonianFriction.InEvaluatedRange(Math.Exp(lnRe1)))
        {
            lnHi = lnLo; // n = 2: Re does not depend on V, and it is outside the range
        }
        if (!(lnLo < lnHi) || !double.IsFinite(lnLo) || !double.IsFinite(lnHi))
            return new(NonNewtonianFlowStatus.OutsideRange, default, headLoss, 0, double.NaN, SolveStatus.NoSignChange, yieldHead,
                criticalFlow, gapLow, gapHigh);

        if (fluid.Model == RheologyModel.PowerLaw && power > 0)
        {
            double lnVc = (Math.Log(PowerLawFriction.CriticalReynolds(fluid.FlowBehaviorIndex)) - lnRe1) / power;
            criticalFlow = Math.Exp(lnVc) * area;
            if (lnVc > lnLo && lnVc < lnHi)
            {
                // Both sides of the jump at Re_c, each by its own law (evaluating at V_c itself would fall on either side
                // by rounding): the laminar wall stress, and Dodge-Metzner's at Re_c.
                double vc = Math.Exp(lnVc);
                double n = fluid.FlowBehaviorIndex;
                double reC = PowerLawFriction.CriticalReynolds(n);
                double tauLaminar = PowerLawFriction.LaminarWallShearStress(fluid.ConsistencyIndex, n, vc, diameter);
                double tauTurbulent = PowerLawFriction.DodgeMetzner(reC, n).Fanning * fluid.Density * vc * vc / 2;
                double hm = minorLossCoefficient * vc * vc / (2 * g);
                gapLow = 4 * tauLaminar * length / (fluid.Density * g * diameter) + hm;
                gapHigh = 4 * tauTurbulent * length / (fluid.Density * g * diameter) + hm;
            }
        }

        var equation = new FlowEquation(fluid, length, diameter, minorLossCoefficient, Math.Log(headLoss));
        double lnArea = Math.Log(area);
        double yLo = lnLo + lnArea, yHi = lnHi + lnArea;
        double alternate = double.NaN;
        double yC = Math.Log(criticalFlow), step = 1e-12 * Math.Max(1, Math.Abs(yC));
        if (gapHigh < gapLow && headLoss >= gapHigh && headLoss < gapLow && yLo < yC - step && yC + step < yHi)
        {
            // h(Q) drops at Re_c: one root on each side. The turbulent one is the answer, the laminar one the alternate.
            var laminar = SafeguardedNewton.Solve(in equation, Bracket.Checked(yLo, yC - step), yC - 1, in Options);
            if (laminar.Converged) alternate = Math.Exp(laminar.Root);
            yLo = yC + step;
        }
        // Start at a velocity of 1 m/s, a usual one for slurries and pastes; F is nearly linear in ln Q, so the start
        // matters little (outside the bracket the solver starts from its midpoint).
        RootResult root = SafeguardedNewton.Solve(in equation, Bracket.Checked(yLo, yHi), lnArea, in Options, trace);

        if (root.Status == SolveStatus.NoSignChange)
            return new(NonNewtonianFlowStatus.OutsideRange, default, headLoss, root.Iterations, root.Residual, root.Status, yieldHead,
                criticalFlow, gapLow, gapHigh);
        double q = Math.Exp(root.Root);
        var state = Evaluate(fluid, length, diameter, minorLossCoefficient, q, null);
        double residual = Math.Log(state.HeadLoss) - Math.Log(headLoss);
        if (gapLow < gapHigh && headLoss >= gapLow && headLoss < gapHigh)
            return new(NonNewtonianFlowStatus.InTransitionGap, state, headLoss, root.Iterations, residual, root.Status, yieldHead,
                criticalFlow, gapLow, gapHigh);
        // A converged bracket that closed on a jump rather than a root leaves a residual far above rounding: not converged.
        bool met = root.Converged && Math.Abs(residual) <= 1e-9;
        return new(met ? NonNewtonianFlowStatus.Solved : NonNewtonianFlowStatus.NotConverged, state, headLoss, root.Iterations, residual,
            root.Status, yieldHead, criticalFlow, gapLow, gapHigh) { AlternateFlow = alternate };
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Guard(double length, double diameter, double minorLossCoefficient)
    {
        if (!(length > 0) || !double.IsFinite(length)) NonNewtonianFluid.Throw(nameof(length), length, "must be finite and positive");
        if (!(diameter > 0) || !double.IsFinite(diameter)) NonNewtonianFluid.Throw(nameof(diameter), diameter, "must be finite and positive");
        if (!(minorLossCoefficient >= 0) || !double.IsFinite(minorLossCoefficient))
            NonNewtonianFluid.Throw(nameof(minorLossCoefficient), minorLossCoefficient, "must be finite and 0 or more");
    }

    private static NonNewtonianHeadLoss Evaluate(in NonNewtonianFluid fluid, double length, double diameter, double minorLossCoefficient,
        double flow, SolverTrace? trace)
    {
        double g = Physical.StandardGravity;
        double velocity = flow / (0.25 * Math.PI * diameter * diameter);
        var friction = NonNewtonianFriction.Compute(fluid, velocity, diameter, trace);
        double hf = 4 * friction.WallShearStress * length / (fluid.Density * g * diameter);
        double hm = minorLossCoefficient * velocity * velocity / (2 * g);
        double h = hf + hm;
        double dhdq = ((2 + friction.DLnFDLnVelocity) * hf + 2 * hm) / flow;
        return new NonNewtonianHeadLoss(friction, flow, velocity, hf, hm, h, fluid.Density * g * h, dhdq);
    }

    /// <summary>F(y) = ln h(e^y) - ln h* and F'(y) = Q h'(Q) / h.</summary>
    private readonly struct FlowEquation(NonNewtonianFluid fluid, double length, double diameter, double k, double lnTarget)
        : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double y)
        {
            double q = Math.Exp(y);
            var s = NonNewtonianPipe.Evaluate(fluid, length, diameter, k, q, null);
            return (Math.Log(s.HeadLoss) - lnTarget, q * s.DHeadLossDFlow / s.HeadLoss);
        }
    }
}
