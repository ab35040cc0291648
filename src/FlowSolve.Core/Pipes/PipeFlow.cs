using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Pipes;

/// <summary>Flow from an available head: the Darcy-Weisbach flow problem solved by <see cref="SafeguardedNewton"/>.</summary>
/// <param name="State">The pipe at the flow found (zeros when <see cref="Status"/> has no answer).</param>
/// <param name="AvailableHead">Head available to the pipe besides elevation, in m, as given (see <see cref="PipeFlow.Solve"/>).</param>
/// <param name="ElevationRise">Outlet elevation above inlet z2 - z1 in m, as given.</param>
/// <param name="DrivingHead">AvailableHead - ElevationRise in m: the head the friction and minor losses absorb.</param>
/// <param name="PressureDrop">rho g (hf + hm) in Pa; null without a density or without an answer.</param>
/// <param name="Iterations">Outer Newton (or bisection) steps in ln Q.</param>
/// <param name="FrictionIterations">Colebrook-White iterations summed over every friction-factor evaluation of the solve,
/// the final one included.</param>
/// <param name="Residual">ln(hf + hm) - ln(DrivingHead) at the flow found (0 without an answer).</param>
/// <param name="Status">Outcome, including the no-answer cases.</param>
/// <param name="SolverStatus">Why the outer Newton solve stopped (<see cref="SolveStatus.ConvergedOnResidual"/> when no solve ran).</param>
/// <param name="Warnings">Pipe warnings (friction warnings are in <see cref="PipeState.FrictionWarnings"/>).</param>
public readonly record struct FlowResult(
    PipeState State, double AvailableHead, double ElevationRise, double DrivingHead, double? PressureDrop,
    int Iterations, int FrictionIterations, double Residual, PipeStatus Status, SolveStatus SolverStatus, PipeWarnings Warnings)
{
    /// <summary>The flow Q in m3/s (0 when there is no answer).</summary>
    public double Flow => State.Flow;

    /// <summary>True when the result holds a usable flow.</summary>
    public bool Converged => Status.HasAnswer();

    /// <summary>A second flow that the same head drives, or null: near the turbulent limit (Re 4000) the friction
    /// factor drops where Churchill's transition value gives way to Colebrook-White, so the head loss falls slightly as
    /// the flow rises through it and heads within that drop are met twice (<see cref="PipeWarnings.SecondSolution"/>).
    /// <see cref="Flow"/> is then the turbulent (Colebrook-White) root and this the transitional (Churchill) one, the
    /// lower flow, in m3/s.</summary>
    public double? AlternateFlow { get; init; }

    /// <summary>Friction and pipe warnings as coded messages (allocates).</summary>
    /// <param name="options">Options used.</param>
    public IReadOnlyList<CalculationWarning> DescribeWarnings(PipeOptions? options = null)
    {
        var list = State.Describe(Warnings, options);
        if (AlternateFlow is not double other) return list;
        return new List<CalculationWarning>(list)
        {
            new("second-solution", string.Format(System.Globalization.CultureInfo.InvariantCulture,
                "Two flows meet this head: {0:G6} m3/s (Reynolds number {1:G5}, turbulent, Colebrook-White), reported as the flow, " +
                "and {2:G6} m3/s (transitional, Churchill 1977), reported as alternateFlow. Near Reynolds number {3:G4} the " +
                "friction factor drops where Churchill's transition value gives way to Colebrook-White, so the head loss falls " +
                "slightly as the flow rises through it. Flow there may be laminar or turbulent; the lower flow is the cautious " +
                "estimate of what the pipe delivers.",
                Flow, State.Reynolds, other, (options ?? PipeOptions.Default).Friction.TurbulentLimit)),
        };
    }
}

/// <summary>Flow through a pipe from the head available to drive it.</summary>
/// <remarks>
/// <para>Convention: <c>availableHead</c> is the head supplied to the pipe other than by elevation, in m:
/// the pressure-head difference (p1 - p2)/(rho g) between inlet and outlet, or a pump's head. <c>elevationRise</c> is
/// z2 - z1 (negative when the pipe falls). The losses absorb the rest: hf(Q) + hm(Q) = availableHead - elevationRise.
/// For two reservoirs, give the difference of their levels as availableHead and 0 as elevationRise (the levels already
/// include the elevations). When availableHead &lt;= elevationRise no forward flow exists: <see cref="PipeStatus.NoFlow"/>.
/// This is the inverse of <see cref="PipeHeadLoss.Compute"/>, whose TotalHead = HeadLoss + ElevationRise.</para>
/// <para>Numerics: Newton in s = ln Q on r(s) = ln h(e^s) - ln H, whose slope d ln h / d ln Q lies between 1 (laminar)
/// and 2 (fully rough), so the residual is nearly linear and Newton converges in a few steps. The slope includes
/// df/dRe by implicit differentiation of Colebrook-White (<see cref="PipeState.DHeadLossDFlow"/>), which keeps the
/// convergence quadratic. Bracket: since f &gt;= 64/Re in every regime, h(Q) is at least the laminar loss
/// (32 nu L V/(g D^2) + K V^2/(2g)), whose root Q_lam bounds the answer above; a flow at half the smaller of
/// Re(Q_lam) and the laminar limit is laminar and bounds it below. The start is the explicit flow formula of
/// Swamee and Jain (1976), J. Hydraul. Div. ASCE 102(HY5), corrected once for the minor losses.</para>
/// </remarks>
public static class PipeFlow
{
    /// <summary>Outer tolerance: a step in ln Q of 1e-13, so the flow is good to about 1e-13 relative.</summary>
    public const double LogStepTolerance = 1e-13;

    /// <summary>Outer iteration cap (bisections across a discontinuity at a regime limit need about 50).</summary>
    public const int MaxIterations = 100;

    /// <summary>A converged residual in ln h above this means the solve ended at a jump of the friction factor.</summary>
    internal const double JumpResidual = 1e-8;

    internal static readonly SolverOptions Options = new(LogStepTolerance, 0.0, 0.0, MaxIterations);

    /// <summary>Solves for the flow that the available head drives through the pipe.</summary>
    /// <param name="pipe">Length, inside diameter, roughness and K; see <see cref="PipeGeometry"/>.</param>
    /// <param name="fluid">Kinematic viscosity, and density for the pressure drop.</param>
    /// <param name="availableHead">Head available besides elevation in m (see remarks); finite.</param>
    /// <param name="elevationRise">z2 - z1 in m; finite; any sign.</param>
    /// <param name="options">Regime limits and design velocities; <see cref="PipeOptions.Default"/> when omitted.</param>
    /// <param name="trace">Optional record of the outer iterations, in ln Q (allocates).</param>
    /// <returns>The flow with its state, iterations, residual and status; never throws for a well-formed problem.</returns>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain (the parameter name says which).</exception>
    public static FlowResult Solve(in PipeGeometry pipe, in FluidProperties fluid, double availableHead,
        double elevationRise = 0, PipeOptions? options = null, SolverTrace? trace = null)
    {
        PipeGuard.Geometry(pipe);
        PipeGuard.Fluid(fluid);
        PipeGuard.Finite(availableHead, nameof(availableHead));
        PipeGuard.Finite(elevationRise, nameof(elevationRise));
        var o = options ?? PipeOptions.Default;
        double drive = availableHead - elevationRise;
        if (!(drive > 0))
            return NoAnswer(pipe, availableHead, elevationRise, drive, PipeStatus.NoFlow);

        double nu = fluid.KinematicViscosity, d = pipe.Diameter, area = pipe.Area, g = Physical.StandardGravity;
        double laminarLimit = o.Friction.LaminarLimit;

        // Upper bound: the root of the laminar loss a V^2 + b V = H (stable form of the quadratic formula).
        double a = pipe.MinorLossCoefficient / (2 * g);
        double b = 32.0 * nu * pipe.Length / (g * d * d);
        double vLam = 2.0 * drive / (b + Math.Sqrt(b * b + 4.0 * a * drive));
        double qLam = vLam * area;
        double reLam = vLam * d / nu;
        double qPerRe = nu * area / d;

        double lo = Math.Log(0.5 * Math.Min(reLam, laminarLimit) * qPerRe);
        double hi, start;
        Bracket bracket;
        if (!(reLam >= DarcyFriction.MinimumReynolds))
        {
            // Creeping flow below the smallest Reynolds number the friction relations accept (a head of 5e-324 m,
            // say, whose flow underflows): no answer, as for the head loss of such a flow.
            return NoAnswer(pipe, availableHead, elevationRise, drive, PipeStatus.OutsideRange);
        }
        if (reLam < laminarLimit)
        {
            // The laminar root is the answer; the solve confirms it in one step.
            start = Math.Log(qLam);
            hi = start + 1e-9;
            bracket = Bracket.KnownIncreasing(lo, hi);
        }
        else
        {
            double qCap = 0.5 * DarcyFriction.MaximumReynolds * qPerRe;
            if (qLam <= qCap)
            {
                hi = Math.Log(qLam);
                bracket = Bracket.KnownIncreasing(lo, hi);
            }
            else
            {
                // The laminar bound lies beyond the friction relations (or overflows, for a vanishing length): when
                // even the flow at half their largest Reynolds number leaves head over, the answer lies beyond them.
                if (!(PipeHeadLoss.Evaluate(pipe, nu, qCap, o.Friction).HeadLoss >= drive))
                    return NoAnswer(pipe, availableHead, elevationRise, drive, PipeStatus.OutsideRange);
                hi = Math.Log(qCap);
                bracket = Bracket.Checked(lo, hi);
            }
            start = Math.Log(StartFlow(pipe, nu, drive));
        }

        var equation = new Equation(pipe, nu, Math.Log(drive), o.Friction);
        FrictionCounter.Reset();
        RootResult root = SafeguardedNewton.Solve(in equation, bracket, start, in Options, trace);
        if (root.Status is SolveStatus.NoSignChange or SolveStatus.NonFiniteValue)
            return NoAnswer(pipe, availableHead, elevationRise, drive, PipeStatus.OutsideRange) with
                { Iterations = root.Iterations, FrictionIterations = FrictionCounter.Total, SolverStatus = root.Status };

        double? alternate = null;
        if (root.Converged)
        {
            // Near Re 4000 the same head may be met twice; the turbulent root is the answer, the other the alternate.
            double qLimit = o.Friction.TurbulentLimit * qPerRe;
            var (turbulent, transitional) = TwoRootsAtTurbulentLimit(in equation, pipe, nu, drive, qLimit, root, o.Friction, trace);
            if (turbulent is RootResult t && transitional is RootResult other)
            {
                root = t;
                alternate = Math.Exp(other.Root);
            }
        }

        var state = PipeHeadLoss.Evaluate(pipe, nu, Math.Exp(root.Root), o.Friction);
        FrictionCounter.Add(state.FrictionIterations);
        double residual = Math.Log(state.HeadLoss) - Math.Log(drive);
        var (status, warnings) = Classify(root, residual, state, o);
        if (alternate is not null) warnings |= PipeWarnings.SecondSolution;
        double? pressureDrop = fluid.Density * g * state.HeadLoss;
        return new FlowResult(state, availableHead, elevationRise, drive, pressureDrop, root.Iterations,
            FrictionCounter.Total, residual, status, root.Status, warnings) { AlternateFlow = alternate };
    }

    /// <summary>Relative offset from a regime limit at which the relation on either side is evaluated.</summary>
    internal const double LimitOffset = 1e-12;

    /// <summary>
    /// The two flows that meet the head when it lies within the drop of the head loss at the turbulent limit (Churchill's
    /// transition factor just below Re 4000 is above Colebrook-White's just above it), or (null, null) when it does not.
    /// Whichever root the Newton solve found, the other is solved on its own side of the limit: the turbulent one on
    /// [Q_T, 2 Q_T] (h grows at least as Q there, so h(2 Q_T) &gt; the drop's top), the transitional one on
    /// [Q_T / 2, Q_T] (h falls at least as Q below it); both brackets are checked. The turbulent root is the answer
    /// whichever was found first.
    /// </summary>
    private static (RootResult? Turbulent, RootResult? Transitional) TwoRootsAtTurbulentLimit(in Equation equation,
        in PipeGeometry pipe, double nu, double drive, double qLimit, in RootResult found, in FrictionOptions limits, SolverTrace? trace)
    {
        // A root in the drop lies within its height (a few percent) of the limit; far from it there is nothing to do.
        double q = Math.Exp(found.Root);
        if (!(q > 0.5 * qLimit && q < 2.0 * qLimit)) return (null, null);
        double below = PipeHeadLoss.Evaluate(pipe, nu, qLimit * (1 - LimitOffset), limits).HeadLoss;
        double above = PipeHeadLoss.Evaluate(pipe, nu, qLimit * (1 + LimitOffset), limits).HeadLoss;
        if (!(below > above && drive > above && drive < below)) return (null, null);
        // The root already found stands for its own side (so its iterations and trace stay with the answer); the other
        // side is solved afresh.
        double limit = Math.Log(qLimit);
        trace = found.Root > limit ? null : trace;
        trace?.Clear(); // the answer's own solve replaces the record of the one that found the other root
        var turbulent = found.Root > limit ? found
            : SafeguardedNewton.Solve(in equation, Bracket.Checked(limit + LimitOffset, limit + Math.Log(2.0)),
                limit + 0.5 * Math.Log(below / above), in Options, trace);
        var transitional = found.Root < limit ? found
            : SafeguardedNewton.Solve(in equation, Bracket.Checked(limit - Math.Log(2.0), limit - LimitOffset),
                limit - 0.5 * Math.Log(below / above), in Options);
        return turbulent.Converged && transitional.Converged ? (turbulent, transitional) : (null, null);
    }

    /// <summary>Status and warnings shared by the flow and diameter solves.</summary>
    internal static (PipeStatus, PipeWarnings) Classify(in RootResult root, double residual, in PipeState state, in PipeOptions o)
    {
        var warnings = state.VelocityWarnings(o);
        if (!root.Converged || !state.FrictionStatus.IsConverged())
            return (PipeStatus.NotConverged, warnings | PipeWarnings.NotConverged);
        if (Math.Abs(residual) > JumpResidual)
            return (PipeStatus.SolvedAtRegimeLimit, warnings | PipeWarnings.AtRegimeLimit);
        return (PipeStatus.Solved, warnings);
    }

    /// <summary>Swamee and Jain (1976) explicit flow, Q = -0.965 D^2 sqrt(g D S) ln(e/(3.7 D) + 1.784 nu/(D sqrt(g D S)))
    /// with S = H/L (no minor losses), then one correction V = sqrt(2 g H/(f L/D + K)) with that formula's f.</summary>
    internal static double StartFlow(in PipeGeometry pipe, double nu, double drive)
    {
        double d = pipe.Diameter, g = Physical.StandardGravity;
        double s = drive / pipe.Length;
        double root = Math.Sqrt(g * d * s);
        double q = -0.965 * d * d * root * Math.Log(pipe.Roughness / (3.7 * d) + 1.784 * nu / (d * root));
        if (pipe.MinorLossCoefficient == 0 || !(q > 0)) return q;
        double v = q / pipe.Area;
        double f = 2 * g * d * s / (v * v);
        return pipe.Area * Math.Sqrt(2 * g * drive / (f * pipe.Length / d + pipe.MinorLossCoefficient));
    }

    private static FlowResult NoAnswer(in PipeGeometry pipe, double availableHead, double elevationRise, double drive, PipeStatus status) =>
        new(Empty(pipe.Diameter, pipe.RelativeRoughness), availableHead, elevationRise, drive, null, 0, 0, 0.0,
            status, SolveStatus.ConvergedOnResidual, PipeWarnings.None);

    /// <summary>The state reported without an answer: zeros, relation <c>none</c>.</summary>
    internal static PipeState Empty(double diameter, double relativeRoughness) =>
        new(0, diameter, 0, 0, relativeRoughness, 0, FlowRegime.Laminar, "none", 0, 0, 0, 0, 0, 0,
            SolveStatus.ConvergedOnResidual, FrictionWarnings.None);

    /// <summary>r(s) = ln h(e^s) - ln H and dr/ds = Q h'(Q) / h.</summary>
    private readonly struct Equation(PipeGeometry pipe, double nu, double logHead, FrictionOptions limits) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double s)
        {
            double q = Math.Exp(s);
            var state = PipeHeadLoss.Evaluate(pipe, nu, q, limits);
            FrictionCounter.Add(state.FrictionIterations);
            return (Math.Log(state.HeadLoss) - logHead, q * state.DHeadLossDFlow / state.HeadLoss);
        }
    }
}

/// <summary>Sums the Colebrook-White iterations of one outer solve without allocating: the function structs handed
/// to <see cref="SafeguardedNewton"/> are passed by readonly reference and cannot carry a mutable count, so the
/// count lives in a per-thread static (each solve runs on one thread and does not nest).</summary>
internal static class FrictionCounter
{
    [ThreadStatic] private static int _total;

    public static int Total => _total;

    public static void Reset() => _total = 0;

    public static void Add(int iterations) => _total += iterations;
}
