using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Pipes;

/// <summary>A Hazen-Williams head loss, with the Darcy-Weisbach result for the same pipe and flow beside it.</summary>
/// <param name="Flow">Flow Q in m3/s.</param>
/// <param name="Diameter">Inside diameter in m.</param>
/// <param name="Velocity">Mean velocity in m/s.</param>
/// <param name="Coefficient">The C factor, as given.</param>
/// <param name="FrictionHeadLoss">Hazen-Williams friction loss in m.</param>
/// <param name="MinorHeadLoss">K V^2/(2g) in m (the same as Darcy-Weisbach's).</param>
/// <param name="HeadLoss">FrictionHeadLoss + MinorHeadLoss in m.</param>
/// <param name="DarcyWeisbach">The Darcy-Weisbach state at the same flow (exact Colebrook-White).</param>
/// <param name="Difference">HeadLoss - DarcyWeisbach.HeadLoss in m.</param>
/// <param name="RelativeDifference">Difference / DarcyWeisbach.HeadLoss.</param>
/// <param name="Warnings">Hazen-Williams validity warnings, <see cref="PipeWarnings.MethodsDisagree"/>, and design-velocity warnings.</param>
public readonly record struct HazenWilliamsResult(
    double Flow, double Diameter, double Velocity, double Coefficient,
    double FrictionHeadLoss, double MinorHeadLoss, double HeadLoss,
    PipeState DarcyWeisbach, double Difference, double RelativeDifference, PipeWarnings Warnings)
{
    /// <summary>Friction and pipe warnings as coded messages (allocates).</summary>
    /// <param name="options">Options used.</param>
    public IReadOnlyList<CalculationWarning> DescribeWarnings(PipeOptions? options = null) => DarcyWeisbach.Describe(Warnings, options);

    /// <summary>Hazen-Williams' usual range (common practice) with the inputs as used (allocates).</summary>
    public IReadOnlyList<ValidityCheck> Validity() => HazenWilliams.Validity(Diameter, Velocity, DarcyWeisbach.Reynolds, Coefficient,
        HazenWilliams.ViscosityFrom(DarcyWeisbach));
}

/// <summary>A flow from a head by Hazen-Williams, with the Darcy-Weisbach flow from the same head beside it.</summary>
/// <param name="HeadLoss">The Hazen-Williams result at the flow found.</param>
/// <param name="DrivingHead">AvailableHead - ElevationRise in m (the PipeFlow convention).</param>
/// <param name="Iterations">Newton steps in ln Q (0 without minor losses: the inverse is explicit).</param>
/// <param name="Status">Outcome; <see cref="PipeStatus.NoFlow"/> when the driving head is not positive.</param>
/// <param name="DarcyWeisbach">The Darcy-Weisbach flow from the same head.</param>
/// <param name="FlowDifference">Flow - DarcyWeisbach.Flow in m3/s.</param>
/// <param name="RelativeFlowDifference">FlowDifference / DarcyWeisbach.Flow (0 without an answer).</param>
public readonly record struct HazenWilliamsFlowResult(
    HazenWilliamsResult HeadLoss, double DrivingHead, int Iterations, PipeStatus Status,
    FlowResult DarcyWeisbach, double FlowDifference, double RelativeFlowDifference)
{
    /// <summary>The Hazen-Williams flow in m3/s (0 without an answer).</summary>
    public double Flow => HeadLoss.Flow;

    /// <summary>True when the result holds a usable flow.</summary>
    public bool Converged => Status.HasAnswer();
}

/// <summary>
/// The Hazen-Williams formula for water in full pipes, in SI units: V = 0.849 C R^0.63 S^0.54 with R = D/4 the
/// hydraulic radius and S = hf/L. Rearranged exactly, hf = k L Q^(1/0.54) / (C^(1/0.54) D^(2.63/0.54)) with
/// k = (4^1.63/(0.849 pi))^(1/0.54) = 10.675, exponents 1.85185 and 4.8704: the usual hf = 10.67 L Q^1.852 /
/// (C^1.852 D^4.87) is this with rounded figures (common practice). FlowSolve derives from the velocity form.
/// </summary>
/// <remarks>Usual validity (common practice, not a published limit): water at ordinary temperatures (about 4 to 30
/// degrees C), turbulent flow, diameters of about 50 mm to 1.8 m, velocities up to about 3 m/s, C from about 40
/// (badly tuberculated) to 150 (plastic). Outside, the result is flagged and Darcy-Weisbach is the better estimate.</remarks>
public static class HazenWilliams
{
    /// <summary>Exponent of V (and Q) for the head loss, 1/0.54.</summary>
    public const double FlowExponent = 1.0 / 0.54;

    /// <summary>Exponent of D for the head loss at constant Q, 2.63/0.54.</summary>
    public const double DiameterExponent = 2.63 / 0.54;

    /// <summary>The SI velocity-form constant 0.849.</summary>
    public const double VelocityConstant = 0.849;

    /// <summary>Lowest kinematic viscosity taken as water at ordinary temperatures, 0.79e-6 m2/s (about 30 degrees C).</summary>
    public const double MinimumViscosity = 0.79e-6;

    /// <summary>Highest kinematic viscosity taken as water at ordinary temperatures, 1.57e-6 m2/s (about 4 degrees C).</summary>
    public const double MaximumViscosity = 1.57e-6;

    /// <summary>Smallest diameter of the usual range, 0.05 m (common practice).</summary>
    public const double MinimumDiameter = 0.05;

    /// <summary>Largest diameter of the usual range, 1.8 m (common practice).</summary>
    public const double MaximumDiameter = 1.8;

    /// <summary>Highest velocity of the usual range, 3 m/s (common practice).</summary>
    public const double MaximumVelocity = 3.0;

    /// <summary>Lowest tabulated C factor, 40 (common practice).</summary>
    public const double MinimumCoefficient = 40;

    /// <summary>Highest tabulated C factor, 150 (common practice).</summary>
    public const double MaximumCoefficient = 150;

    /// <summary>Relative difference from Darcy-Weisbach above which <see cref="PipeWarnings.MethodsDisagree"/> is raised.</summary>
    public const double DisagreementThreshold = 0.10;

    private const string RangeSource = "Hazen-Williams usual range (common practice)";

    /// <summary>Hazen-Williams head loss from flow, with Darcy-Weisbach beside it.</summary>
    /// <param name="pipe">Length, inside diameter, K, and the roughness used for the Darcy-Weisbach comparison.</param>
    /// <param name="fluid">Kinematic viscosity (for the Reynolds number, the fluid check and Darcy-Weisbach).</param>
    /// <param name="flow">Flow in m3/s; finite and positive.</param>
    /// <param name="coefficient">The C factor; finite and positive (typically 40 to 150).</param>
    /// <param name="options">Regime limits and design velocities.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static HazenWilliamsResult HeadLoss(in PipeGeometry pipe, in FluidProperties fluid, double flow, double coefficient,
        PipeOptions? options = null)
    {
        PipeGuard.Geometry(pipe);
        PipeGuard.Fluid(fluid);
        PipeGuard.Positive(flow, nameof(flow));
        PipeGuard.Positive(coefficient, nameof(coefficient));
        var o = options ?? PipeOptions.Default;
        var dw = PipeHeadLoss.Evaluate(pipe, fluid.KinematicViscosity, flow, o.Friction);
        return Build(pipe, fluid.KinematicViscosity, flow, coefficient, dw, o);
    }

    /// <summary>Hazen-Williams flow from an available head (the <see cref="PipeFlow.Solve"/> convention), with the
    /// Darcy-Weisbach flow from the same head beside it.</summary>
    /// <param name="pipe">Length, inside diameter, K, and the roughness for Darcy-Weisbach.</param>
    /// <param name="fluid">Kinematic viscosity.</param>
    /// <param name="availableHead">Head available besides elevation in m; finite.</param>
    /// <param name="coefficient">The C factor; finite and positive.</param>
    /// <param name="elevationRise">z2 - z1 in m; finite.</param>
    /// <param name="options">Regime limits and design velocities.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static HazenWilliamsFlowResult Flow(in PipeGeometry pipe, in FluidProperties fluid, double availableHead,
        double coefficient, double elevationRise = 0, PipeOptions? options = null)
    {
        PipeGuard.Positive(coefficient, nameof(coefficient));
        var o = options ?? PipeOptions.Default;
        var dw = PipeFlow.Solve(pipe, fluid, availableHead, elevationRise, o);
        double drive = availableHead - elevationRise;
        if (!(drive > 0))
            return new HazenWilliamsFlowResult(default, drive, 0, PipeStatus.NoFlow, dw, 0, 0);

        // Friction alone: Q = (pi/4) D^2 0.849 C (D/4)^0.63 S^0.54, explicit.
        double d = pipe.Diameter, area = pipe.Area;
        double qFriction = area * VelocityConstant * coefficient * Math.Pow(0.25 * d, 0.63) * Math.Pow(drive / pipe.Length, 0.54);
        double q = qFriction;
        int iterations = 0;
        var status = PipeStatus.Solved;
        if (pipe.MinorLossCoefficient > 0)
        {
            // h(Q) = hf + hm rises; solve ln h(Q) = ln H in ln Q. Bounds: hf(Q) = H/2 and hm(Q) = H/2 give Q's at
            // which both parts are at most H/2 (below); hf = H or hm = H give Q's at which h >= H (above).
            double a = pipe.MinorLossCoefficient / (2 * Physical.StandardGravity * area * area);
            double qMinor = Math.Sqrt(drive / a);
            double lo = Math.Min(qFriction * Math.Pow(0.5, 0.54), qMinor * Math.Sqrt(0.5));
            double hi = Math.Min(qFriction, qMinor);
            var equation = new Equation(FrictionConstant(pipe.Length, d, coefficient), a, Math.Log(drive));
            var root = SafeguardedNewton.Solve(in equation, Bracket.Checked(Math.Log(lo), Math.Log(hi)),
                Math.Log(Math.Sqrt(lo * hi)), in PipeFlow.Options);
            q = Math.Exp(root.Root);
            iterations = root.Iterations;
            if (!root.Converged) status = PipeStatus.NotConverged;
        }

        double reynolds = q / area * d / fluid.KinematicViscosity;
        if (!(reynolds <= DarcyFriction.MaximumReynolds && reynolds >= DarcyFriction.MinimumReynolds))
        {
            // The Darcy-Weisbach state beside the answer cannot be evaluated there (a vanishing length drives an
            // unbounded flow): no answer, as for Darcy-Weisbach itself.
            return new HazenWilliamsFlowResult(default, drive, iterations, PipeStatus.OutsideRange, dw, 0, 0);
        }
        var dwAtQ = PipeHeadLoss.Evaluate(pipe, fluid.KinematicViscosity, q, o.Friction);
        var result = Build(pipe, fluid.KinematicViscosity, q, coefficient, dwAtQ, o);
        if (status == PipeStatus.NotConverged) result = result with { Warnings = result.Warnings | PipeWarnings.NotConverged };
        double difference = dw.Status.HasAnswer() ? q - dw.Flow : 0;
        return new HazenWilliamsFlowResult(result, drive, iterations, status, dw, difference,
            dw.Status.HasAnswer() ? difference / dw.Flow : 0);
    }

    /// <summary>The usual range of the formula (common practice) with the inputs as used (allocates).</summary>
    /// <param name="diameter">Inside diameter in m.</param>
    /// <param name="velocity">Mean velocity in m/s.</param>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="coefficient">C factor.</param>
    /// <param name="kinematicViscosity">Kinematic viscosity in m2/s.</param>
    public static IReadOnlyList<ValidityCheck> Validity(double diameter, double velocity, double reynolds, double coefficient,
        double kinematicViscosity) =>
    [
        new("hazen-williams", RangeSource, "kinematicViscosity", MinimumViscosity, MaximumViscosity, kinematicViscosity),
        new("hazen-williams", RangeSource, "reynolds", FrictionOptions.Default.TurbulentLimit, double.PositiveInfinity, reynolds),
        new("hazen-williams", RangeSource, "diameter", MinimumDiameter, MaximumDiameter, diameter),
        new("hazen-williams", RangeSource, "velocity", 0, MaximumVelocity, velocity),
        new("hazen-williams", RangeSource, "coefficient", MinimumCoefficient, MaximumCoefficient, coefficient),
    ];

    internal static double ViscosityFrom(in PipeState state) => state.Reynolds > 0 ? state.Velocity * state.Diameter / state.Reynolds : 0;

    /// <summary>k L / (C^(1/0.54) D^(2.63/0.54)) with k = (4^1.63 / (0.849 pi))^(1/0.54): hf = this x Q^(1/0.54).</summary>
    private static double FrictionConstant(double length, double diameter, double coefficient)
    {
        double k = Math.Pow(Math.Pow(4.0, 1.63) / (VelocityConstant * Math.PI), FlowExponent);
        return k * length / (Math.Pow(coefficient, FlowExponent) * Math.Pow(diameter, DiameterExponent));
    }

    private static HazenWilliamsResult Build(in PipeGeometry pipe, double nu, double flow, double coefficient, in PipeState dw,
        in PipeOptions o)
    {
        double hf = FrictionConstant(pipe.Length, pipe.Diameter, coefficient) * Math.Pow(flow, FlowExponent);
        double hm = dw.MinorHeadLoss;
        double h = hf + hm;
        var warnings = dw.VelocityWarnings(o);
        if (!(nu >= MinimumViscosity && nu <= MaximumViscosity)) warnings |= PipeWarnings.HazenWilliamsFluidOutsideRange;
        if (dw.Reynolds < o.Friction.TurbulentLimit) warnings |= PipeWarnings.HazenWilliamsNotTurbulent;
        if (!(pipe.Diameter >= MinimumDiameter && pipe.Diameter <= MaximumDiameter)) warnings |= PipeWarnings.HazenWilliamsDiameterOutsideRange;
        if (dw.Velocity > MaximumVelocity) warnings |= PipeWarnings.HazenWilliamsVelocityOutsideRange;
        if (!(coefficient >= MinimumCoefficient && coefficient <= MaximumCoefficient)) warnings |= PipeWarnings.HazenWilliamsCoefficientOutsideRange;
        double difference = h - dw.HeadLoss;
        double relative = difference / dw.HeadLoss;
        if (Math.Abs(relative) > DisagreementThreshold) warnings |= PipeWarnings.MethodsDisagree;
        return new HazenWilliamsResult(flow, pipe.Diameter, dw.Velocity, coefficient, hf, hm, h, dw, difference, relative, warnings);
    }

    /// <summary>r(s) = ln(c Q^(1/0.54) + a Q^2) - ln H with Q = e^s.</summary>
    private readonly struct Equation(double frictionConstant, double minorConstant, double logHead) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double s)
        {
            double q = Math.Exp(s);
            double hf = frictionConstant * Math.Pow(q, FlowExponent);
            double hm = minorConstant * q * q;
            return (Math.Log(hf + hm) - logHead, (FlowExponent * hf + 2.0 * hm) / (hf + hm));
        }
    }
}
