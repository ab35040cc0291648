using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Pumps;

/// <summary>Derivatives of the duty point's flow and head with respect to one input.</summary>
/// <param name="Flow">dQ/dp, m3/s per unit of p.</param>
/// <param name="Head">dH/dp, m per unit of p.</param>
public readonly record struct DutyOutputDerivatives(double Flow, double Head);

/// <summary>Derivatives of the duty point with respect to one pipe's inputs (SI).</summary>
/// <param name="Length">Per m of length.</param>
/// <param name="Diameter">Per m of diameter.</param>
/// <param name="Roughness">Per m of roughness.</param>
/// <param name="MinorLossCoefficient">Per unit K.</param>
public readonly record struct DutyPipeDerivatives(
    DutyOutputDerivatives Length, DutyOutputDerivatives Diameter, DutyOutputDerivatives Roughness, DutyOutputDerivatives MinorLossCoefficient);

/// <summary>Derivatives of the duty point with respect to the pump curve, arrangement and system (SI; heads in m,
/// flows in m3/s, the coefficients in the units of H = c0 + c1 Q + c2 Q^2 + c3 Q^3 for one pump at rated speed).</summary>
/// <param name="C0">With respect to c0.</param>
/// <param name="C1">With respect to c1.</param>
/// <param name="C2">With respect to c2.</param>
/// <param name="C3">With respect to c3.</param>
/// <param name="SpeedRatio">With respect to the speed ratio s.</param>
/// <param name="StaticHead">With respect to the static head.</param>
/// <param name="Resistance">With respect to the lumped K of K Q^2.</param>
/// <param name="KinematicViscosity">With respect to the fluid's kinematic viscosity (0 without pipes).</param>
public readonly record struct DutyPointSensitivities(
    DutyOutputDerivatives C0, DutyOutputDerivatives C1, DutyOutputDerivatives C2, DutyOutputDerivatives C3,
    DutyOutputDerivatives SpeedRatio, DutyOutputDerivatives StaticHead, DutyOutputDerivatives Resistance,
    DutyOutputDerivatives KinematicViscosity);

/// <summary>
/// Sensitivities of a duty point by implicit differentiation of F(Q; p) = H_set(Q) - H_sys(Q) = 0, the equation
/// <see cref="DutyPoint.Solve"/> solves.
/// </summary>
/// <remarks>
/// <para>dQ/dp = -F_p / F_Q, where F_Q = Series s H'(q)/Parallel - H_sys'(Q) is the Newton derivative, q = Q/(Parallel s)
/// the flow per pump at rated speed. F_ck = Series s^2 q^k; F_s = Series s (2 H(q) - q H'(q)) (affinity laws);
/// F_Hs = -1; F_K = -Q|Q|; for a pipe input F_p = -dh/dp at the duty flow (<see cref="PipeSensitivity.HeadLossPartials"/>),
/// and for the viscosity the sum over the pipes. The head is H_sys(Q), so dH/dp = H_sys'(Q) dQ/dp - F_p for the system's
/// inputs and H_sys'(Q) dQ/dp for the pump's.</para>
/// <para>Allocation-free (the per-pipe results go into a span the caller gives) and thread-safe.</para>
/// </remarks>
public static class DutyPointSensitivity
{
    /// <summary>The sensitivities at a solved duty point.</summary>
    /// <param name="pump">Head curve of one pump at rated speed.</param>
    /// <param name="system">System curve.</param>
    /// <param name="arrangement">Arrangement and speed ratio.</param>
    /// <param name="flow">The duty flow Q found, m3/s (positive).</param>
    /// <param name="pipes">Receives one entry per pipe of the system, in order; at least <c>system.Pipes.Count</c> long (may be empty without pipes).</param>
    /// <exception cref="ArgumentException">The span is too short.</exception>
    public static DutyPointSensitivities At(in PumpCurve pump, in SystemCurve system, PumpArrangement arrangement, double flow,
        Span<DutyPipeDerivatives> pipes)
    {
        var list = system.Pipes;
        if (pipes.Length < list.Count) throw new ArgumentException("needs one entry per pipe", nameof(pipes));
        double s = arrangement.SpeedRatio, np = arrangement.Parallel, ns = arrangement.Series;
        double q = flow / (np * s);
        var (h, dh) = pump.HeadAndSlope(q);
        double systemSlope = system.HeadAndSlope(flow).Slope;
        double fq = ns * s * dh / np - systemSlope;

        DutyOutputDerivatives Pump(double fp)
        {
            double dq = -fp / fq;
            return new(dq, systemSlope * dq);
        }
        DutyOutputDerivatives System(double fp)
        {
            double dq = -fp / fq;
            return new(dq, systemSlope * dq - fp);
        }

        double headScale = ns * s * s;
        double dnu = 0;
        for (int i = 0; i < list.Count; i++)
        {
            var pipe = list[i];
            var state = PipeHeadLoss.Evaluate(pipe, system.KinematicViscosity, flow, system.Friction);
            var p = PipeSensitivity.HeadLossPartials(state, pipe.Length, system.KinematicViscosity);
            pipes[i] = new DutyPipeDerivatives(System(-p.Length), System(-p.Diameter), System(-p.Roughness), System(-p.MinorLossCoefficient));
            dnu += p.KinematicViscosity;
        }
        return new DutyPointSensitivities(
            Pump(headScale), Pump(headScale * q), Pump(headScale * q * q), Pump(headScale * q * q * q),
            Pump(ns * s * (2.0 * h - q * dh)),
            System(-1.0), System(-flow * Math.Abs(flow)),
            System(-dnu));
    }
}
