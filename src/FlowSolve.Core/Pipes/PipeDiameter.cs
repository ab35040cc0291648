using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Pipes;

/// <summary>The smallest inside diameter that carries a flow within an allowed head loss.</summary>
/// <param name="State">The pipe at the diameter found (velocity, Reynolds number, friction factor, losses).</param>
/// <param name="AllowedHeadLoss">Allowed friction + minor head loss in m, as given.</param>
/// <param name="Iterations">Outer Newton (or bisection) steps in ln D.</param>
/// <param name="FrictionIterations">Colebrook-White iterations summed over the solve, the final evaluation included.</param>
/// <param name="Residual">ln(hf + hm) - ln(AllowedHeadLoss) at the diameter found.</param>
/// <param name="Status">Outcome.</param>
/// <param name="SolverStatus">Why the outer Newton solve stopped.</param>
/// <param name="Warnings">Pipe warnings.</param>
public readonly record struct DiameterResult(
    PipeState State, double AllowedHeadLoss, int Iterations, int FrictionIterations, double Residual,
    PipeStatus Status, SolveStatus SolverStatus, PipeWarnings Warnings)
{
    /// <summary>The minimum inside diameter in m (at the answer, hf + hm = AllowedHeadLoss).</summary>
    public double Diameter => State.Diameter;

    /// <summary>True when the result holds a usable diameter.</summary>
    public bool Converged => Status.HasAnswer();

    /// <summary>A second diameter that gives the same head loss, or null: near the turbulent limit (Re 4000) the
    /// friction factor rises where Colebrook-White gives way to Churchill's transition value as the diameter grows, so the
    /// head loss jumps up there and allowances within that jump are met twice (<see cref="PipeWarnings.SecondSolution"/>).
    /// <see cref="Diameter"/> is then the turbulent (Colebrook-White) root, the smaller, and this the transitional
    /// (Churchill) one, the larger, in m. Diameters between the one at Re 4000 and this exceed the allowance.</summary>
    public double? AlternateDiameter { get; init; }

    /// <summary>Friction and pipe warnings as coded messages (allocates).</summary>
    /// <param name="options">Options used.</param>
    public IReadOnlyList<CalculationWarning> DescribeWarnings(PipeOptions? options = null)
    {
        var list = State.Describe(Warnings, options);
        if (AlternateDiameter is not double other) return list;
        double limit = (options ?? PipeOptions.Default).Friction.TurbulentLimit;
        return new List<CalculationWarning>(list)
        {
            new("second-solution", string.Format(System.Globalization.CultureInfo.InvariantCulture,
                "Two diameters give the allowed head loss: {0:G6} m (Reynolds number {1:G5}, turbulent, Colebrook-White), " +
                "reported as the diameter, and {2:G6} m (transitional, Churchill 1977), reported as alternateDiameter. As the " +
                "diameter grows through Reynolds number {3:G4} ({4:G6} m) the friction factor rises from Colebrook-White to " +
                "Churchill's transition value, so every diameter between {4:G6} m and {2:G6} m exceeds the allowance. Flow there " +
                "may be laminar or turbulent; the larger diameter is the cautious choice.",
                Diameter, State.Reynolds, other, limit, State.Diameter * State.Reynolds / limit)),
        };
    }
}

/// <summary>The smallest listed size that meets an allowed head loss, with the minimum diameter behind it.</summary>
/// <param name="Table">The table's name, as found.</param>
/// <param name="Minimum">The continuous minimum inside diameter.</param>
/// <param name="Size">The chosen size; null when <see cref="Status"/> is <see cref="PipeStatus.NoListedSize"/> or the minimum failed.</param>
/// <param name="AtSize">Head loss, velocity and friction at the chosen size's inside diameter; with
/// <see cref="PipeStatus.NoListedSize"/>, at the largest listed size (default when the minimum itself failed).</param>
/// <param name="Status"><see cref="PipeStatus.Solved"/>, <see cref="PipeStatus.NoListedSize"/>, or the minimum's status when it has no answer.</param>
/// <param name="Warnings">Warnings at the chosen size (velocity against the design range).</param>
public readonly record struct SizeSelectionResult(
    string Table, DiameterResult Minimum, PipeSize? Size, HeadLossResult AtSize, PipeStatus Status, PipeWarnings Warnings)
{
    /// <summary>True when a size was chosen.</summary>
    public bool Converged => Status.HasAnswer() && Size.HasValue;
}

/// <summary>Minimum inside diameter from flow and allowed head loss, and the smallest listed size that meets it.</summary>
/// <remarks>
/// <para>The allowed head loss is friction + minor loss (elevation does not depend on the diameter: subtract it first).</para>
/// <para>Numerics: Newton in s = ln D on r(s) = ln h(e^s) - ln H, where h falls roughly as D^-5, so r is nearly linear
/// in s with slope between -4 and -5.3. The slope includes df/dRe and df/d(e/D) by implicit differentiation.
/// Bracket: h is at least the laminar loss C/D^4 with C = 128 nu L Q/(pi g) + 8 K Q^2/(pi^2 g), so
/// D_lam = (C/H)^(1/4) bounds the answer below; a diameter at which Re is half the laminar limit is laminar, and
/// bounds it above. The start is the explicit diameter formula of Swamee and Jain (1976), J. Hydraul. Div. ASCE
/// 102(HY5): D = 0.66 [e^1.25 (L Q^2/(g H))^4.75 + nu Q^9.4 (L/(g H))^5.2]^0.04, kept at least the diameter at
/// which the minor losses alone use the allowance.</para>
/// </remarks>
public static class PipeDiameter
{
    /// <summary>Solves for the minimum inside diameter.</summary>
    /// <param name="length">Pipe length in m; finite and positive.</param>
    /// <param name="roughness">Absolute roughness in m; finite, 0 or more.</param>
    /// <param name="minorLossCoefficient">Sum of K; finite, 0 or more.</param>
    /// <param name="fluid">Kinematic viscosity (density for no purpose here but kept for symmetry).</param>
    /// <param name="flow">Flow in m3/s; finite and positive.</param>
    /// <param name="allowedHeadLoss">Allowed hf + hm in m; finite and positive.</param>
    /// <param name="options">Regime limits and design velocities.</param>
    /// <param name="trace">Optional record of the outer iterations, in ln D.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain (the parameter name says which).</exception>
    public static DiameterResult Solve(double length, double roughness, double minorLossCoefficient, in FluidProperties fluid,
        double flow, double allowedHeadLoss, PipeOptions? options = null, SolverTrace? trace = null)
    {
        var pipe = new PipeGeometry(length, 0, roughness, minorLossCoefficient);
        PipeGuard.WithoutDiameter(pipe);
        PipeGuard.Fluid(fluid);
        PipeGuard.Positive(flow, nameof(flow));
        PipeGuard.Positive(allowedHeadLoss, nameof(allowedHeadLoss));
        var o = options ?? PipeOptions.Default;
        double nu = fluid.KinematicViscosity, g = Physical.StandardGravity, h = allowedHeadLoss;
        double laminarLimit = o.Friction.LaminarLimit;

        double c = 128.0 * nu * length * flow / (Math.PI * g)
                 + 8.0 * minorLossCoefficient * flow * flow / (Math.PI * Math.PI * g);
        double dLam = Math.Sqrt(Math.Sqrt(c / h));
        double reTimesD = 4.0 * flow / (Math.PI * nu);

        double lo, hi, start;
        Bracket bracket;
        if (!(dLam > 0) || !double.IsFinite(dLam) || !(reTimesD > 0) || !(reTimesD / dLam >= DarcyFriction.MinimumReynolds))
        {
            // The laminar bound under- or overflows (a vanishing flow or length, say), or its Reynolds number lies below
            // the smallest the friction relations accept: no answer rather than an infinite or empty one.
            return new DiameterResult(PipeFlow.Empty(double.IsFinite(dLam) ? dLam : 0, 0), h, 0, 0, 0.0,
                PipeStatus.OutsideRange, SolveStatus.NoSignChange, PipeWarnings.None);
        }
        if (reTimesD / dLam < laminarLimit)
        {
            // The laminar diameter is the answer; the solve confirms it in one step.
            start = Math.Log(dLam);
            lo = start - 1e-9;
            hi = start + 1e-9;
            bracket = Bracket.KnownDecreasing(lo, hi);
        }
        else
        {
            hi = Math.Log(reTimesD / (0.5 * laminarLimit));
            double dFloor = Math.Max(roughness * (1 + 1e-9), 2.0 * reTimesD / DarcyFriction.MaximumReynolds);
            if (!(Math.Log(dFloor) < hi))
                return new DiameterResult(PipeFlow.Empty(dFloor, 0), h, 0, 0, 0.0, PipeStatus.OutsideRange,
                    SolveStatus.NoSignChange, PipeWarnings.None);
            if (dLam > dFloor)
            {
                lo = Math.Log(dLam);
                bracket = Bracket.KnownDecreasing(lo, hi);
            }
            else
            {
                lo = Math.Log(dFloor);
                bracket = Bracket.Checked(lo, hi);
            }
            double dMinor = Math.Sqrt(Math.Sqrt(8.0 * minorLossCoefficient * flow * flow / (Math.PI * Math.PI * g * h)));
            start = Math.Log(Math.Max(StartDiameter(length, roughness, nu, flow, h), dMinor));
        }

        var equation = new Equation(pipe, nu, flow, Math.Log(h), o.Friction);
        FrictionCounter.Reset();
        RootResult root = SafeguardedNewton.Solve(in equation, bracket, start, in PipeFlow.Options, trace);
        if (root.Status is SolveStatus.NoSignChange or SolveStatus.NonFiniteValue)
            return new DiameterResult(PipeFlow.Empty(Math.Exp(root.Root), 0), h, root.Iterations, FrictionCounter.Total,
                0.0, PipeStatus.OutsideRange, root.Status, PipeWarnings.None);

        double? alternate = null;
        if (root.Converged)
        {
            // Near Re 4000 the same allowance may be met twice; the turbulent root is the answer, the other the alternate.
            var (turbulent, transitional) = TwoRootsAtTurbulentLimit(in equation, pipe, nu, flow, h,
                reTimesD / o.Friction.TurbulentLimit, root, o.Friction, trace);
            if (turbulent is RootResult t && transitional is RootResult other)
            {
                root = t;
                alternate = Math.Exp(other.Root);
            }
        }

        var state = PipeHeadLoss.Evaluate(pipe.WithDiameter(Math.Exp(root.Root)), nu, flow, o.Friction);
        FrictionCounter.Add(state.FrictionIterations);
        double residual = Math.Log(state.HeadLoss) - Math.Log(h);
        var (status, warnings) = PipeFlow.Classify(root, residual, state, o);
        if (alternate is not null) warnings |= PipeWarnings.SecondSolution;
        return new DiameterResult(state, h, root.Iterations, FrictionCounter.Total, residual, status, root.Status, warnings)
            { AlternateDiameter = alternate };
    }

    /// <summary>
    /// The two diameters that give the allowance when it lies within the jump of the head loss at the turbulent limit
    /// (as the diameter grows through D_T, where Re = 4000, the factor rises from Colebrook-White to Churchill's), or
    /// (null, null) when it does not. The root not yet found is solved on its own side: the turbulent one on
    /// [D_T / 2, D_T] (h falls at least as D^-4 there), the transitional one on [D_T, 2 D_T]; both brackets are checked.
    /// </summary>
    private static (RootResult? Turbulent, RootResult? Transitional) TwoRootsAtTurbulentLimit(in Equation equation,
        in PipeGeometry pipe, double nu, double flow, double allowed, double dLimit, in RootResult found, in FrictionOptions limits,
        SolverTrace? trace)
    {
        double d = Math.Exp(found.Root);
        if (!(d > 0.5 * dLimit && d < 2.0 * dLimit) || !(dLimit > pipe.Roughness)) return (null, null);
        double turbulentSide = PipeHeadLoss.Evaluate(pipe.WithDiameter(dLimit * (1 - PipeFlow.LimitOffset)), nu, flow, limits).HeadLoss;
        double transitionSide = PipeHeadLoss.Evaluate(pipe.WithDiameter(dLimit * (1 + PipeFlow.LimitOffset)), nu, flow, limits).HeadLoss;
        if (!(transitionSide > turbulentSide && allowed > turbulentSide && allowed < transitionSide)) return (null, null);
        double limit = Math.Log(dLimit), lower = Math.Max(limit - Math.Log(2.0), Math.Log(pipe.Roughness * (1 + 1e-9)));
        double step = 0.2 * Math.Log(transitionSide / turbulentSide);
        // The root already found stands for its own side (its iterations and trace stay with the answer).
        trace = found.Root < limit ? null : trace;
        trace?.Clear(); // the answer's own solve replaces the record of the one that found the other root
        var turbulent = found.Root < limit ? found
            : SafeguardedNewton.Solve(in equation, Bracket.Checked(lower, limit - PipeFlow.LimitOffset),
                Math.Max(lower, limit - step), in PipeFlow.Options, trace);
        var transitional = found.Root > limit ? found
            : SafeguardedNewton.Solve(in equation, Bracket.Checked(limit + PipeFlow.LimitOffset, limit + Math.Log(2.0)),
                limit + step, in PipeFlow.Options);
        return turbulent.Converged && transitional.Converged ? (turbulent, transitional) : (null, null);
    }

    /// <summary>Chooses the smallest size in a table whose inside diameter carries the flow within the allowed head loss.</summary>
    /// <param name="table">Table name, one of <see cref="PipeSizeTables.Names"/> (case-insensitive).</param>
    /// <param name="length">Pipe length in m.</param>
    /// <param name="roughness">Absolute roughness in m.</param>
    /// <param name="minorLossCoefficient">Sum of K.</param>
    /// <param name="fluid">Kinematic viscosity and density.</param>
    /// <param name="flow">Flow in m3/s.</param>
    /// <param name="allowedHeadLoss">Allowed hf + hm in m.</param>
    /// <param name="options">Regime limits and design velocities.</param>
    /// <remarks>The first listed size at or above the minimum diameter is checked by computing its head loss; should the
    /// friction factor's jump at a regime limit make it exceed the allowance, the next size is taken. Sizes whose
    /// inside diameter does not exceed the roughness are skipped.</remarks>
    /// <exception cref="ArgumentException">The table is unknown (parameter <c>table</c>).</exception>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static SizeSelectionResult SelectSize(string table, double length, double roughness, double minorLossCoefficient,
        in FluidProperties fluid, double flow, double allowedHeadLoss, PipeOptions? options = null)
    {
        var sizes = PipeSizeTables.Get(table);
        var o = options ?? PipeOptions.Default;
        var minimum = Solve(length, roughness, minorLossCoefficient, fluid, flow, allowedHeadLoss, o);
        if (!minimum.Status.HasAnswer())
            return new SizeSelectionResult(sizes.Name, minimum, null, default, minimum.Status, minimum.Warnings);

        HeadLossResult last = default;
        foreach (var size in sizes.Sizes)
        {
            if (size.InsideDiameter <= roughness || size.InsideDiameter < minimum.Diameter * (1 - 1e-12)) continue;
            var pipe = new PipeGeometry(length, size.InsideDiameter, roughness, minorLossCoefficient);
            last = PipeHeadLoss.Compute(pipe, fluid, flow, 0, o);
            if (last.HeadLoss <= allowedHeadLoss * (1 + 1e-12))
                return new SizeSelectionResult(sizes.Name, minimum, size, last, PipeStatus.Solved, last.Warnings);
        }
        if (last.State.Relation is null)
        {
            // Nothing was large enough to try: report the loss at the largest usable size, for the message.
            var largest = sizes.Sizes[^1];
            if (largest.InsideDiameter > roughness)
                last = PipeHeadLoss.Compute(new PipeGeometry(length, largest.InsideDiameter, roughness, minorLossCoefficient),
                    fluid, flow, 0, o);
        }
        return new SizeSelectionResult(sizes.Name, minimum, null, last, PipeStatus.NoListedSize, PipeWarnings.None);
    }

    /// <summary>The Swamee and Jain (1976) explicit diameter (no minor losses).</summary>
    internal static double StartDiameter(double length, double roughness, double nu, double flow, double head)
    {
        double lOverGh = length / (Physical.StandardGravity * head);
        return 0.66 * Math.Pow(Math.Pow(roughness, 1.25) * Math.Pow(lOverGh * flow * flow, 4.75)
                             + nu * Math.Pow(flow, 9.4) * Math.Pow(lOverGh, 5.2), 0.04);
    }

    /// <summary>r(s) = ln h(e^s) - ln H and dr/ds = D h'(D) / h.</summary>
    private readonly struct Equation(PipeGeometry pipe, double nu, double flow, double logHead, FrictionOptions limits)
        : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double s)
        {
            double d = Math.Exp(s);
            var state = PipeHeadLoss.Evaluate(pipe.WithDiameter(d), nu, flow, limits);
            FrictionCounter.Add(state.FrictionIterations);
            return (Math.Log(state.HeadLoss) - logHead, d * state.DHeadLossDDiameter / state.HeadLoss);
        }
    }
}
