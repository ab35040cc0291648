using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Pipes;

/// <summary>Derivatives of one output with respect to each pipe input, in SI units (per m3/s, per m, per m2/s, ...).</summary>
/// <param name="Flow">d/dQ, per m3/s.</param>
/// <param name="Diameter">d/dD, per m.</param>
/// <param name="Length">d/dL, per m.</param>
/// <param name="Roughness">d/de, per m.</param>
/// <param name="MinorLossCoefficient">d/dK, per unit K.</param>
/// <param name="KinematicViscosity">d/dnu, per m2/s.</param>
/// <param name="Head">d/dH, per m of head: the available head (flow problem) or the allowed loss (diameter problem);
/// 0 for the head-loss problem, whose answer does not depend on it. The elevation change enters with the opposite sign.</param>
public readonly record struct PipeInputDerivatives(
    double Flow, double Diameter, double Length, double Roughness, double MinorLossCoefficient, double KinematicViscosity, double Head)
{
    /// <summary>a + k b, input by input.</summary>
    internal PipeInputDerivatives Plus(double k, in PipeInputDerivatives b) => new(
        Flow + k * b.Flow, Diameter + k * b.Diameter, Length + k * b.Length, Roughness + k * b.Roughness,
        MinorLossCoefficient + k * b.MinorLossCoefficient, KinematicViscosity + k * b.KinematicViscosity, Head + k * b.Head);

    /// <summary>k a, input by input.</summary>
    internal PipeInputDerivatives Times(double k) => new(
        k * Flow, k * Diameter, k * Length, k * Roughness, k * MinorLossCoefficient, k * KinematicViscosity, k * Head);
}

/// <summary>The sensitivities of a pipe answer: the derivatives of its main outputs with respect to every input.</summary>
/// <param name="Answer">The solved-for quantity: head loss (m) for the head-loss problem, flow (m3/s) for the flow
/// problem, diameter (m) for the diameter problem.</param>
/// <param name="HeadLoss">Friction + minor head loss hf + hm, m.</param>
/// <param name="Velocity">Mean velocity, m/s.</param>
/// <param name="Reynolds">Reynolds number.</param>
/// <param name="FrictionFactor">Darcy friction factor.</param>
public readonly record struct PipeSensitivities(
    PipeInputDerivatives Answer, PipeInputDerivatives HeadLoss, PipeInputDerivatives Velocity,
    PipeInputDerivatives Reynolds, PipeInputDerivatives FrictionFactor);

/// <summary>
/// Sensitivities of the three pipe problems, from the explicit partials of Darcy-Weisbach at the solved state and, for
/// the inverse problems, implicit differentiation of the equation that was solved.
/// </summary>
/// <remarks>
/// <para>At a state (Q, D, L, e, K, nu) with V = 4Q/(pi D^2), Re = V D/nu, r = e/D and f = f(Re, r)
/// (<see cref="FrictionSensitivity"/>): h = (f L/D + K) V^2/(2g), so dh/dL = hf/L, dh/dK = V^2/(2g),
/// dh/de = (L/D) (V^2/2g) f_r / D, dh/dnu = -(L/D) (V^2/2g) f_Re Re/nu, and dh/dQ, dh/dD as in
/// <see cref="PipeState"/> (both including df/dRe and df/d(e/D)).</para>
/// <para>Flow problem: h(Q; p) = H solved for Q, so dQ/dp = -(dh/dp)/(dh/dQ) and dQ/dH = 1/(dh/dQ): dh/dQ is the
/// derivative the Newton solve already used. Diameter problem: h(D; p) = H solved for D, dD/dp = -(dh/dp)/(dh/dD).
/// The secondary outputs (velocity, Reynolds number, friction factor) then follow by the chain rule,
/// dy/dp = y_p + y_x dx/dp, x the solved-for quantity.</para>
/// <para>The friction factor jumps where the regime changes (2000 and 4000 by default): there the derivatives are
/// one-sided, and at an answer pinned to such a jump they do not exist; callers check the status first.</para>
/// <para>Allocation-free and thread-safe.</para>
/// </remarks>
public static class PipeSensitivity
{
    /// <summary>Sensitivities of the head-loss problem at a computed state.</summary>
    /// <param name="state">The state from <see cref="PipeHeadLoss.Compute"/>.</param>
    /// <param name="length">Pipe length in m.</param>
    /// <param name="kinematicViscosity">Kinematic viscosity in m2/s.</param>
    public static PipeSensitivities HeadLoss(in PipeState state, double length, double kinematicViscosity)
    {
        var p = Partials(state, length, kinematicViscosity);
        return new PipeSensitivities(p.HeadLoss, p.HeadLoss, p.Velocity, p.Reynolds, p.FrictionFactor);
    }

    /// <summary>Sensitivities of the flow problem (flow from the available head) at its answer.</summary>
    /// <param name="state">The state at the flow found (<see cref="FlowResult.State"/>).</param>
    /// <param name="length">Pipe length in m.</param>
    /// <param name="kinematicViscosity">Kinematic viscosity in m2/s.</param>
    public static PipeSensitivities Flow(in PipeState state, double length, double kinematicViscosity)
    {
        var p = Partials(state, length, kinematicViscosity);
        // dQ/dp = -(dh/dp)/(dh/dQ); the flow is no longer an input, and dQ/dH = 1/(dh/dQ).
        double inv = 1.0 / p.HeadLoss.Flow;
        var dq = (p.HeadLoss with { Flow = 0.0, Head = -1.0 }).Times(-inv);
        return new PipeSensitivities(dq, Chain(p.HeadLoss, dq), Chain(p.Velocity, dq), Chain(p.Reynolds, dq), Chain(p.FrictionFactor, dq));

        static PipeInputDerivatives Chain(in PipeInputDerivatives y, in PipeInputDerivatives dq) => (y with { Flow = 0.0 }).Plus(y.Flow, dq);
    }

    /// <summary>Sensitivities of the diameter problem (minimum diameter for an allowed loss) at its answer.</summary>
    /// <param name="state">The state at the diameter found (<see cref="DiameterResult.State"/>).</param>
    /// <param name="length">Pipe length in m.</param>
    /// <param name="kinematicViscosity">Kinematic viscosity in m2/s.</param>
    public static PipeSensitivities Diameter(in PipeState state, double length, double kinematicViscosity)
    {
        var p = Partials(state, length, kinematicViscosity);
        double inv = 1.0 / p.HeadLoss.Diameter;
        var dd = (p.HeadLoss with { Diameter = 0.0, Head = -1.0 }).Times(-inv);
        return new PipeSensitivities(dd, Chain(p.HeadLoss, dd), Chain(p.Velocity, dd), Chain(p.Reynolds, dd), Chain(p.FrictionFactor, dd));

        static PipeInputDerivatives Chain(in PipeInputDerivatives y, in PipeInputDerivatives dd) => (y with { Diameter = 0.0 }).Plus(y.Diameter, dd);
    }

    /// <summary>Head-loss partials for a system curve or a network: dh/dp at constant flow for every pipe input.</summary>
    /// <param name="state">A state from <see cref="PipeHeadLoss"/>.</param>
    /// <param name="length">Pipe length in m.</param>
    /// <param name="kinematicViscosity">Kinematic viscosity in m2/s.</param>
    public static PipeInputDerivatives HeadLossPartials(in PipeState state, double length, double kinematicViscosity) =>
        Partials(state, length, kinematicViscosity).HeadLoss;

    private readonly record struct StatePartials(
        PipeInputDerivatives HeadLoss, PipeInputDerivatives Velocity, PipeInputDerivatives Reynolds, PipeInputDerivatives FrictionFactor);

    private static StatePartials Partials(in PipeState s, double length, double nu)
    {
        double q = s.Flow, d = s.Diameter, v = s.Velocity, re = s.Reynolds, r = s.RelativeRoughness;
        // h = (f L/D + K) V^2/(2g): dh/dQ = (L/D)(V^2/2g) f_Q + 2h/Q; dh/dD = (L/D)(V^2/2g) f_D - (hf + 4h)/D.
        var friction = FrictionAt(s);
        double fRe = friction.Reynolds, fR = friction.RelativeRoughness;
        double vh = s.VelocityHead;
        double lOverD = length / d;

        var velocity = new PipeInputDerivatives(v / q, -2.0 * v / d, 0, 0, 0, 0, 0);
        var reynolds = new PipeInputDerivatives(re / q, -re / d, 0, 0, 0, -re / nu, 0);
        var f = new PipeInputDerivatives(
            fRe * re / q,
            -(fRe * re + fR * r) / d,
            0,
            fR / d,
            0,
            -fRe * re / nu,
            0);
        var h = new PipeInputDerivatives(
            lOverD * vh * f.Flow + 2.0 * s.HeadLoss / q,
            lOverD * vh * f.Diameter - (s.FrictionHeadLoss + 4.0 * s.HeadLoss) / d,
            s.FrictionHeadLoss / length,
            lOverD * vh * f.Roughness,
            vh,
            lOverD * vh * f.KinematicViscosity,
            0);
        return new StatePartials(h, velocity, reynolds, f);
    }

    /// <summary>f's partials for the relation the state used (Colebrook-White, laminar, or Churchill in transition).</summary>
    private static FrictionPartials FrictionAt(in PipeState s)
    {
        if (s.Regime == FlowRegime.Laminar) return new(-s.FrictionFactor / s.Reynolds, 0.0);
        if (s.Regime == FlowRegime.Transitional) return FrictionSensitivity.Explicit(FrictionMethod.Churchill, s.Reynolds, s.RelativeRoughness);
        var (dRe, dR) = new ColebrookResult(s.FrictionFactor, 0, 0, 0.0, s.FrictionStatus, s.Reynolds, s.RelativeRoughness).Derivatives();
        return new(dRe, dR);
    }
}
