using System.Runtime.CompilerServices;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Pipes;

/// <summary>The hydraulic state of one pipe at one flow: what every pipe result reports.</summary>
/// <param name="Flow">Volumetric flow Q in m3/s.</param>
/// <param name="Diameter">Inside diameter D in m.</param>
/// <param name="Velocity">Mean velocity V = 4Q/(pi D^2) in m/s.</param>
/// <param name="Reynolds">Reynolds number V D / nu.</param>
/// <param name="RelativeRoughness">Relative roughness e/D.</param>
/// <param name="FrictionFactor">Darcy friction factor f.</param>
/// <param name="Regime">Flow regime that chose the friction relation.</param>
/// <param name="Relation">Friction relation used: <c>laminar</c>, <c>churchill</c> (transition) or <c>colebrook-white</c>.</param>
/// <param name="FrictionHeadLoss">Darcy-Weisbach friction loss hf = f (L/D) V^2/(2g) in m.</param>
/// <param name="MinorHeadLoss">Minor (fittings) loss hm = K V^2/(2g) in m.</param>
/// <param name="HeadLoss">hf + hm in m.</param>
/// <param name="DHeadLossDFlow">d(hf + hm)/dQ in m per m3/s, including the friction factor's dependence on the flow
/// through the Reynolds number (Simpson and Elhay 2011, J. Hydraul. Eng. 137(6)).</param>
/// <param name="DHeadLossDDiameter">d(hf + hm)/dD at constant flow in m per m, including df/dRe and df/d(e/D).</param>
/// <param name="FrictionIterations">Iterations of the Colebrook-White solve (0 for the laminar law and Churchill).</param>
/// <param name="FrictionStatus">Status of the friction-factor evaluation.</param>
/// <param name="FrictionWarnings">Warnings from the friction-factor evaluation.</param>
public readonly record struct PipeState(
    double Flow, double Diameter, double Velocity, double Reynolds, double RelativeRoughness,
    double FrictionFactor, FlowRegime Regime, string Relation,
    double FrictionHeadLoss, double MinorHeadLoss, double HeadLoss,
    double DHeadLossDFlow, double DHeadLossDDiameter,
    int FrictionIterations, SolveStatus FrictionStatus, FrictionWarnings FrictionWarnings)
{
    /// <summary>Velocity head V^2/(2g) in m.</summary>
    public double VelocityHead => Velocity * Velocity / (2 * Physical.StandardGravity);

    /// <summary>The Colebrook-White residual in 1/sqrt(f) at the friction factor returned (0 for the laminar law and
    /// the transition zone's explicit relation), as a reviewer checks it.</summary>
    public double FrictionResidualAtAnswer => Relation == FrictionMethodInfo.ColebrookWhite.Code
        ? ColebrookWhite.Residual(FrictionFactor, Reynolds, RelativeRoughness)
        : 0.0;

    /// <summary>Velocity warnings against the design range of <paramref name="options"/>.</summary>
    /// <param name="options">The design velocity range.</param>
    public PipeWarnings VelocityWarnings(in PipeOptions options) =>
        Velocity < options.MinimumDesignVelocity ? PipeWarnings.VelocityBelowDesignRange
        : Velocity > options.MaximumDesignVelocity ? PipeWarnings.VelocityAboveDesignRange
        : PipeWarnings.None;

    /// <summary>Friction and pipe warnings as coded messages (allocates; for reports and the API).</summary>
    /// <param name="warnings">The pipe warnings of the result that holds this state.</param>
    /// <param name="options">Options used; <see cref="PipeOptions.Default"/> when omitted.</param>
    public IReadOnlyList<CalculationWarning> Describe(PipeWarnings warnings, PipeOptions? options = null)
    {
        // Without a flag raised there is nothing to describe (the common case of a batch row): no list, no message text.
        if (warnings == PipeWarnings.None && FrictionWarnings == FrictionWarnings.None) return [];
        var o = options ?? PipeOptions.Default;
        var list = new List<CalculationWarning>(
            DarcyFriction.Describe(FrictionWarnings, Reynolds, RelativeRoughness, Relation, o.Friction));
        return warnings.Describe(Velocity, o, list);
    }

    /// <summary>The published (or common practice) ranges that apply, with the inputs as used (allocates).</summary>
    /// <param name="options">Options used; <see cref="PipeOptions.Default"/> when omitted.</param>
    public IReadOnlyList<ValidityCheck> Validity(PipeOptions? options = null)
    {
        var o = options ?? PipeOptions.Default;
        var cw = FrictionMethodInfo.ColebrookWhite;
        var list = new List<ValidityCheck>(3);
        if (Regime == FlowRegime.Turbulent)
        {
            list.Add(new(cw.Code, cw.RangeProvenance, "reynolds", cw.ReynoldsMinimum, cw.ReynoldsMaximum, Reynolds));
            list.Add(new(cw.Code, cw.RangeProvenance, "relativeRoughness", cw.RelativeRoughnessMinimum, cw.RelativeRoughnessMaximum, RelativeRoughness));
        }
        else if (Regime == FlowRegime.Laminar)
        {
            list.Add(new(DarcyFriction.LaminarRelation, "Hagen-Poiseuille law f = 64/Re; laminar limit (common practice)",
                "reynolds", 0, o.Friction.LaminarLimit, Reynolds));
        }
        else
        {
            list.Add(new(Relation, "transition zone: no relation is reliable (common practice limits)",
                "reynolds", o.Friction.LaminarLimit, o.Friction.TurbulentLimit, Reynolds));
        }
        list.Add(new("design-velocity", "usual design range for water mains (common practice)", "velocity",
            o.MinimumDesignVelocity, o.MaximumDesignVelocity, Velocity));
        return list;
    }
}

/// <summary>Head loss from flow: Darcy-Weisbach with the exact Colebrook-White friction factor
/// (laminar and transition as in <see cref="DarcyFriction"/>), plus minor losses.</summary>
/// <param name="State">Velocity, Reynolds number, friction factor, regime, losses and derivatives.</param>
/// <param name="ElevationRise">Elevation of the outlet above the inlet z2 - z1 in m (negative for a fall), as given.</param>
/// <param name="TotalHead">Head the pipe needs between its ends: HeadLoss + ElevationRise in m (the difference of
/// piezometric heads, or of reservoir levels, that drives this flow).</param>
/// <param name="PressureDrop">rho g (hf + hm) in Pa: the pressure lost to friction and fittings; null without a density.</param>
/// <param name="TotalPressureDifference">rho g TotalHead in Pa: inlet minus outlet pressure for a pipe of constant
/// diameter, elevation included; null without a density.</param>
/// <param name="Status"><see cref="PipeStatus.Solved"/>, or <see cref="PipeStatus.NotConverged"/> when the friction solve failed.</param>
/// <param name="Warnings">Pipe warnings (friction warnings are in <see cref="PipeState.FrictionWarnings"/>).</param>
public readonly record struct HeadLossResult(
    PipeState State, double ElevationRise, double TotalHead, double? PressureDrop, double? TotalPressureDifference,
    PipeStatus Status, PipeWarnings Warnings)
{
    /// <summary>Friction + minor head loss in m.</summary>
    public double HeadLoss => State.HeadLoss;

    /// <summary>Iterations: those of the one Colebrook-White solve.</summary>
    public int Iterations => State.FrictionIterations;

    /// <summary>True when the friction factor converged.</summary>
    public bool Converged => Status == PipeStatus.Solved;

    /// <summary>Friction and pipe warnings as coded messages (allocates).</summary>
    /// <param name="options">Options used.</param>
    public IReadOnlyList<CalculationWarning> DescribeWarnings(PipeOptions? options = null) => State.Describe(Warnings, options);
}

/// <summary>Darcy-Weisbach head loss h = (f L/D + K) V^2/(2g) of one pipe, with its derivatives.</summary>
/// <remarks>
/// <para>Gravity is <see cref="Physical.StandardGravity"/>. The friction factor comes from <see cref="DarcyFriction.Compute"/>
/// with the exact Colebrook-White equation; its derivative df/dRe comes from implicit differentiation, so
/// dh/dQ = 2h/Q + (L/D) (V^2/2g) Re df/dRe / Q is exact (Simpson and Elhay 2011, J. Hydraul. Eng. 137(6), who show that
/// leaving out the df/dQ term spoils Newton's quadratic convergence in network solvers).</para>
/// <para>The friction factor jumps slightly at the regime limits (the laminar law, Churchill's interpolation and
/// Colebrook-White do not meet exactly), so h(Q) is piecewise smooth.</para>
/// </remarks>
public static class PipeHeadLoss
{
    private const double TwoOverLn10 = 0.86858896380650365530;

    /// <summary>Head loss from flow with every field of the result; allocation-free.</summary>
    /// <param name="pipe">The pipe (length, inside diameter, roughness, K); see <see cref="PipeGeometry"/>.</param>
    /// <param name="fluid">Kinematic viscosity, and density for the pressure drop.</param>
    /// <param name="flow">Volumetric flow Q in m3/s; finite and positive.</param>
    /// <param name="elevationRise">Outlet elevation above inlet z2 - z1 in m; finite; any sign.</param>
    /// <param name="options">Regime limits and design velocities; <see cref="PipeOptions.Default"/> when omitted.</param>
    /// <param name="trace">Optional per-iteration record of the Colebrook-White friction-factor solve (the head loss
    /// itself is explicit in the factor).</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain (the parameter name says which),
    /// or the Reynolds number exceeds <see cref="DarcyFriction.MaximumReynolds"/>.</exception>
    public static HeadLossResult Compute(in PipeGeometry pipe, in FluidProperties fluid, double flow,
        double elevationRise = 0, PipeOptions? options = null, SolverTrace? trace = null)
    {
        PipeGuard.Geometry(pipe);
        PipeGuard.Fluid(fluid);
        PipeGuard.Positive(flow, nameof(flow));
        PipeGuard.Finite(elevationRise, nameof(elevationRise));
        var o = options ?? PipeOptions.Default;
        var state = Evaluate(pipe, fluid.KinematicViscosity, flow, o.Friction, trace);
        return Finish(state, fluid, elevationRise, o);
    }

    internal static HeadLossResult Finish(in PipeState state, in FluidProperties fluid, double elevationRise, in PipeOptions o)
    {
        var warnings = state.VelocityWarnings(o);
        var status = state.FrictionStatus.IsConverged() ? PipeStatus.Solved : PipeStatus.NotConverged;
        if (status == PipeStatus.NotConverged) warnings |= PipeWarnings.NotConverged;
        double total = state.HeadLoss + elevationRise;
        double? rhoG = fluid.Density * Physical.StandardGravity;
        return new HeadLossResult(state, elevationRise, total, rhoG * state.HeadLoss, rhoG * total, status, warnings);
    }

    /// <summary>Head loss and its derivative with respect to flow, for network solvers (Simpson and Elhay 2011).</summary>
    /// <param name="pipe">The pipe.</param>
    /// <param name="kinematicViscosity">Kinematic viscosity in m2/s; finite and positive.</param>
    /// <param name="flow">Flow Q in m3/s; finite, any sign. The loss is odd in Q (h(-Q) = -h(Q)); at Q = 0 the
    /// derivative is the laminar slope 128 nu L/(pi g D^4). Below <see cref="DarcyFriction.MinimumReynolds"/> the laminar
    /// law is evaluated in closed form in the velocity, so a vanishing Reynolds number gives a finite (vanishing) loss.</param>
    /// <param name="options">Regime limits; <see cref="FrictionOptions.Default"/> when omitted.</param>
    /// <returns>h = hf + hm in m (signed like Q) and dh/dQ in m per m3/s (always positive).</returns>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static (double HeadLoss, double DHeadLossDFlow) WithDerivative(in PipeGeometry pipe, double kinematicViscosity,
        double flow, FrictionOptions? options = null)
    {
        PipeGuard.Geometry(pipe);
        PipeGuard.Positive(kinematicViscosity, nameof(kinematicViscosity));
        PipeGuard.Finite(flow, nameof(flow));
        if (flow == 0)
        {
            double d = pipe.Diameter;
            return (0.0, 128.0 * kinematicViscosity * pipe.Length / (Math.PI * Physical.StandardGravity * d * d * d * d));
        }
        double area = pipe.Area, aq = Math.Abs(flow);
        double reynolds = aq / area * pipe.Diameter / kinematicViscosity;
        if (!(reynolds >= DarcyFriction.MinimumReynolds))
        {
            // Creeping flow (or a Reynolds number that underflows, as for a huge diameter): the laminar law in closed
            // form, h = 32 nu L V/(g D^2) + K V^2/(2g). Through f = 64/Re the friction factor would overflow and
            // f V^2 become infinity times zero; written in V it is finite, and the limit of the general expression.
            double g = Physical.StandardGravity, d = pipe.Diameter, v = aq / area;
            double laminar = 32.0 * kinematicViscosity * pipe.Length / (g * d * d);
            double h = laminar * v + pipe.MinorLossCoefficient * v * v / (2 * g);
            double slope = (laminar + pipe.MinorLossCoefficient * v / g) / area;
            return (Math.CopySign(h, flow), double.IsFinite(slope) ? slope : 0.0);
        }
        var state = Evaluate(pipe, kinematicViscosity, aq, options ?? FrictionOptions.Default);
        return (Math.CopySign(state.HeadLoss, flow), state.DHeadLossDFlow);
    }

    /// <summary>The state at a flow, unchecked arguments (callers have validated them).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static PipeState Evaluate(in PipeGeometry pipe, double nu, double flow, in FrictionOptions limits, SolverTrace? trace = null)
    {
        double d = pipe.Diameter;
        double velocity = flow / (0.25 * Math.PI * d * d);
        double re = velocity * d / nu;
        double r = pipe.Roughness / d;
        var friction = DarcyFriction.Compute(re, r, FrictionMethod.ColebrookWhite, limits, trace);
        double f = friction.FrictionFactor;
        double velocityHead = velocity * velocity / (2 * Physical.StandardGravity);
        double lOverD = pipe.Length / d;
        double hf = f * lOverD * velocityHead;
        double hm = pipe.MinorLossCoefficient * velocityHead;
        double h = hf + hm;
        double reDfDRe = re * friction.DerivativeReynolds;
        double dhdq = (2.0 * h + lOverD * velocityHead * reDfDRe) / flow;
        double rDfDr = r * DerivativeRelativeRoughness(friction, re, r);
        double dhdd = -((reDfDRe + rDfDr) * lOverD * velocityHead + hf + 4.0 * h) / d;
        return new PipeState(flow, d, velocity, re, r, f, friction.Regime, friction.Relation, hf, hm, h, dhdq, dhdd,
            friction.Iterations, friction.Status, friction.Warnings);
    }

    /// <summary>df/d(e/D) of the relation that gave <paramref name="friction"/>.</summary>
    private static double DerivativeRelativeRoughness(in FrictionResult friction, double re, double r)
    {
        switch (friction.Regime)
        {
            case FlowRegime.Laminar:
                return 0.0;
            case FlowRegime.Turbulent:
            {
                // Implicit differentiation of g(x) = x + 2 log10(r/3.7 + 2.51 x/Re) = 0 at x = 1/sqrt(f), as in
                // ColebrookWhite.Solve: dx/dr = -g_r/g_x, df/dx = -2 f/x.
                double x = 1.0 / Math.Sqrt(friction.FrictionFactor);
                double a = r / 3.7 + 2.51 * x / re;
                double gx = 1.0 + TwoOverLn10 * 2.51 / (re * a);
                double gr = TwoOverLn10 / (3.7 * a);
                return -2.0 * friction.FrictionFactor / x * (-gr / gx);
            }
            default:
            {
                // Churchill's interpolation in the transition zone: a central difference (explicit, cheap).
                double step = Math.Max(r, 1e-8) * 1e-4;
                double lo = Math.Max(r - step, 0.0);
                return (ExplicitFriction.Churchill(re, r + step) - ExplicitFriction.Churchill(re, lo)) / (r + step - lo);
            }
        }
    }
}
