using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Friction;

/// <summary>Regime limits for <see cref="DarcyFriction"/>.</summary>
/// <param name="LaminarLimit">Below this Reynolds number flow is laminar (2000: common practice).</param>
/// <param name="TurbulentLimit">At or above this Reynolds number flow is turbulent (4000: common practice).</param>
public readonly record struct FrictionOptions(double LaminarLimit, double TurbulentLimit)
{
    /// <summary>2000 and 4000 (common practice).</summary>
    public static FrictionOptions Default { get; } = new(2000, 4000);
}

/// <summary>A Darcy friction factor with the record of how it was obtained.</summary>
/// <remarks>The derivative df/dRe is computed when read, so the callers that want only the factor (head loss, the
/// friction endpoint) do not pay for it.</remarks>
public readonly struct FrictionResult
{
    private readonly double _reynolds, _relativeRoughness;
    private readonly FrictionMethod _method;

    internal FrictionResult(double frictionFactor, FlowRegime regime, string relation, int iterations, double residual,
        SolveStatus status, FrictionWarnings warnings, double reynolds, double relativeRoughness, FrictionMethod method)
    {
        FrictionFactor = frictionFactor;
        Regime = regime;
        Relation = relation;
        Iterations = iterations;
        Residual = residual;
        Status = status;
        Warnings = warnings;
        _reynolds = reynolds;
        _relativeRoughness = relativeRoughness;
        _method = method;
    }

    /// <summary>Darcy friction factor f (dimensionless).</summary>
    public double FrictionFactor { get; }

    /// <summary>The regime that chose the relation.</summary>
    public FlowRegime Regime { get; }

    /// <summary>The relation actually used: <c>laminar</c> (64/Re), or a <see cref="FrictionMethodInfo.Code"/>.</summary>
    public string Relation { get; }

    /// <summary>Solver steps (0 for explicit relations).</summary>
    public int Iterations { get; }

    /// <summary>Colebrook-White residual in 1/sqrt(f) for the exact solve; 0 for explicit relations.</summary>
    public double Residual { get; }

    /// <summary>Solver status; <see cref="SolveStatus.ClosedForm"/> for the laminar law and the explicit relations, which
    /// involve no iteration and are exact by definition.</summary>
    public SolveStatus Status { get; }

    /// <summary>Warning flags.</summary>
    public FrictionWarnings Warnings { get; }

    /// <summary>True when the relation's value is trustworthy as a solve (always true for explicit relations).</summary>
    public bool Converged => Status.IsConverged();

    /// <summary>The Colebrook-White residual in 1/sqrt(f) at the returned factor itself, as a reviewer checks it;
    /// 0 for the laminar law and the explicit relations. (<see cref="Residual"/> is the solver's, at the last evaluated
    /// iterate, one predicted Newton step earlier: reading it costs nothing on the hot path, this costs a logarithm.)</summary>
    public double ResidualAtAnswer => Relation == FrictionMethodInfo.ColebrookWhite.Code
        ? ColebrookWhite.Residual(FrictionFactor, _reynolds, _relativeRoughness)
        : 0.0;

    /// <summary>The published range of the relation used beside the inputs (allocates): the laminar law's limit; the
    /// all-regime range of Churchill (or the transition zone's); otherwise the method's Reynolds and relative-roughness
    /// ranges with their provenance.</summary>
    /// <param name="options">The regime limits the factor was computed with.</param>
    public IReadOnlyList<ValidityCheck> Validity(FrictionOptions options)
    {
        if (Relation == DarcyFriction.LaminarRelation)
            return [new ValidityCheck("laminar", "Hagen-Poiseuille law; laminar limit as configured (common practice)",
                "reynolds", 0, options.LaminarLimit, _reynolds)];
        FrictionMethodInfo.TryParse(Relation, out var info);
        string source = info.SourceAndRange;
        var reynolds = Regime == FlowRegime.Transitional || (info.Method == FrictionMethod.Churchill && Regime != FlowRegime.Turbulent)
            ? new ValidityCheck(info.Code, info.SourceAndRange + " (all regimes)", "reynolds", 0, double.PositiveInfinity, _reynolds)
            : new ValidityCheck(info.Code, source, "reynolds", info.ReynoldsMinimum, info.ReynoldsMaximum, _reynolds);
        return [reynolds, new ValidityCheck(info.Code, source, "relativeRoughness",
            info.RelativeRoughnessMinimum, info.RelativeRoughnessMaximum, _relativeRoughness)];
    }

    /// <summary>df/dRe of the relation used: analytic for the laminar law and Colebrook-White (implicit
    /// differentiation), a central difference (about 1e-10 relative) for the explicit formulas.</summary>
    public double DerivativeReynolds
    {
        get
        {
            if (Relation == DarcyFriction.LaminarRelation) return -FrictionFactor / _reynolds;
            if (_method == FrictionMethod.ColebrookWhite)
                return new ColebrookResult(FrictionFactor, Iterations, 0, Residual, Status, _reynolds, _relativeRoughness).DerivativeReynolds;
            double h = _reynolds * 1e-5;
            return (ExplicitFriction.Evaluate(_method, _reynolds + h, _relativeRoughness)
                  - ExplicitFriction.Evaluate(_method, _reynolds - h, _relativeRoughness)) / (2 * h);
        }
    }
}

/// <summary>
/// The Darcy friction factor in every regime: Hagen-Poiseuille f = 64/Re in laminar flow, Churchill (1977) in the
/// transition zone (with a warning: no relation is reliable there), and the chosen turbulent method above it
/// (exact Colebrook-White by default).
/// </summary>
public static class DarcyFriction
{
    /// <summary>The relation name for the laminar law.</summary>
    public const string LaminarRelation = "laminar";

    /// <summary>The smallest Reynolds number the service accepts: deep creeping flow (f = 64 000). Below it 64/Re
    /// loses meaning for pipe flow and the explicit formulas overflow.</summary>
    public const double MinimumReynolds = 1e-3;

    /// <summary>The largest Reynolds number accepted (far beyond any pipe; keeps the known bracket valid).</summary>
    public const double MaximumReynolds = 1e15;

    /// <summary>The published ranges of the relation the exact friction factor uses at a Reynolds number (the laminar law,
    /// Churchill in the transition zone, Colebrook-White above it) beside the inputs, without computing the factor: for
    /// callers that report the validity of a friction factor computed elsewhere. Any finite input is accepted.</summary>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    /// <param name="options">Regime limits.</param>
    public static IReadOnlyList<ValidityCheck> ValidityAt(double reynolds, double relativeRoughness, FrictionOptions options)
    {
        var (regime, relation, method) = reynolds < options.LaminarLimit ? (FlowRegime.Laminar, LaminarRelation, FrictionMethod.ColebrookWhite)
            : reynolds < options.TurbulentLimit ? (FlowRegime.Transitional, FrictionMethodInfo.Churchill.Code, FrictionMethod.Churchill)
            : (FlowRegime.Turbulent, FrictionMethodInfo.ColebrookWhite.Code, FrictionMethod.ColebrookWhite);
        return new FrictionResult(double.NaN, regime, relation, 0, 0.0, SolveStatus.ClosedForm, FrictionWarnings.None,
            reynolds, relativeRoughness, method).Validity(options);
    }

    /// <summary>Computes the friction factor.</summary>
    /// <param name="reynolds">Reynolds number; finite, positive, at most <see cref="MaximumReynolds"/>.</param>
    /// <param name="relativeRoughness">Relative roughness e/D in [0, 1).</param>
    /// <param name="method">The turbulent method; Churchill also applies in laminar and transitional flow.</param>
    /// <param name="options">Regime limits; <see cref="FrictionOptions.Default"/> when omitted.</param>
    /// <param name="trace">Optional per-iteration record of the Colebrook-White solve.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static FrictionResult Compute(double reynolds, double relativeRoughness,
        FrictionMethod method = FrictionMethod.ColebrookWhite, FrictionOptions? options = null, SolverTrace? trace = null)
    {
        var limits = options ?? FrictionOptions.Default;
        if (!(reynolds > 0) || !(reynolds <= MaximumReynolds))
            throw new ArgumentOutOfRangeException(nameof(reynolds), reynolds, $"must be in (0, {MaximumReynolds:0e0}]");
        if (!(relativeRoughness >= 0) || !(relativeRoughness < 1))
            throw new ArgumentOutOfRangeException(nameof(relativeRoughness), relativeRoughness, "must be in [0, 1)");
        if (!(limits.LaminarLimit > 0) || !(limits.TurbulentLimit >= limits.LaminarLimit) || !double.IsFinite(limits.TurbulentLimit))
            throw new ArgumentOutOfRangeException(nameof(options), "need 0 < laminar limit <= turbulent limit");

        var warnings = FrictionWarnings.None;
        if (relativeRoughness > FrictionMethodInfo.ColebrookWhite.RelativeRoughnessMaximum)
            warnings |= FrictionWarnings.RelativeRoughnessAboveRange;

        if (method == FrictionMethod.Churchill)
        {
            // Churchill's single expression spans every regime, so it is used as asked even below the turbulent limit.
            var regime = reynolds < limits.LaminarLimit ? FlowRegime.Laminar
                : reynolds < limits.TurbulentLimit ? FlowRegime.Transitional : FlowRegime.Turbulent;
            if (regime == FlowRegime.Transitional) warnings |= FrictionWarnings.TransitionalFlow;
            if (reynolds > 1e8) warnings |= FrictionWarnings.ReynoldsAboveRange;
            return Explicit(FrictionMethodInfo.Churchill, reynolds, relativeRoughness, regime, warnings);
        }

        if (reynolds < limits.LaminarLimit)
        {
            if (method != FrictionMethod.ColebrookWhite) warnings |= FrictionWarnings.MethodNotApplicableInRegime;
            return new FrictionResult(64.0 / reynolds, FlowRegime.Laminar, LaminarRelation, 0, 0.0,
                SolveStatus.ClosedForm, warnings, reynolds, relativeRoughness, FrictionMethod.ColebrookWhite);
        }

        if (reynolds < limits.TurbulentLimit)
        {
            warnings |= FrictionWarnings.TransitionalFlow;
            if (method != FrictionMethod.ColebrookWhite) warnings |= FrictionWarnings.MethodNotApplicableInRegime;
            return Explicit(FrictionMethodInfo.Churchill, reynolds, relativeRoughness, FlowRegime.Transitional, warnings);
        }

        if (reynolds > FrictionMethodInfo.ColebrookWhite.ReynoldsMaximum) warnings |= FrictionWarnings.ReynoldsAboveRange;

        if (method == FrictionMethod.ColebrookWhite)
        {
            var exact = ColebrookWhite.Solve(reynolds, relativeRoughness, trace);
            if (!exact.Converged) warnings |= FrictionWarnings.NotConverged;
            return new FrictionResult(exact.FrictionFactor, FlowRegime.Turbulent, FrictionMethodInfo.ColebrookWhite.Code,
                exact.Iterations, exact.Residual, exact.Status, warnings, reynolds, relativeRoughness, FrictionMethod.ColebrookWhite);
        }

        return Explicit(FrictionMethodInfo.For(method), reynolds, relativeRoughness, FlowRegime.Turbulent, warnings);
    }

    /// <summary>The exact value in every regime: what explicit approximations are compared with.</summary>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness e/D.</param>
    /// <param name="options">Regime limits.</param>
    public static FrictionResult Exact(double reynolds, double relativeRoughness, FrictionOptions? options = null) =>
        Compute(reynolds, relativeRoughness, FrictionMethod.ColebrookWhite, options);

    private static FrictionResult Explicit(FrictionMethodInfo info, double reynolds, double relativeRoughness,
        FlowRegime regime, FrictionWarnings warnings)
    {
        if (regime == FlowRegime.Turbulent && !info.InRange(reynolds, relativeRoughness))
            warnings |= FrictionWarnings.ApproximationOutOfRange;
        double f = ExplicitFriction.Evaluate(info.Method, reynolds, relativeRoughness);
        return new FrictionResult(f, regime, info.Code, 0, 0.0, SolveStatus.ClosedForm, warnings,
            reynolds, relativeRoughness, info.Method);
    }

    /// <summary>Expands warning flags into coded messages (allocates; for reports and the API, not the hot path).</summary>
    /// <param name="warnings">The flags.</param>
    /// <param name="reynolds">Reynolds number, quoted in the messages.</param>
    /// <param name="relativeRoughness">Relative roughness, quoted in the messages.</param>
    /// <param name="relation">The relation used, quoted in the messages.</param>
    /// <param name="options">Regime limits.</param>
    public static IReadOnlyList<CalculationWarning> Describe(FrictionWarnings warnings, double reynolds,
        double relativeRoughness, string relation, FrictionOptions? options = null)
    {
        var limits = options ?? FrictionOptions.Default;
        var list = new List<CalculationWarning>();
        var c = System.Globalization.CultureInfo.InvariantCulture;
        if (warnings.HasFlag(FrictionWarnings.TransitionalFlow))
            list.Add(new("transitional-flow", string.Format(c,
                "Reynolds number {0:G6} lies in the transition zone ({1:G4} to {2:G4}), where flow may be laminar or turbulent " +
                "and no relation is reliable; the value is Churchill's (1977) interpolation. Design for the worse case.",
                reynolds, limits.LaminarLimit, limits.TurbulentLimit)));
        if (warnings.HasFlag(FrictionWarnings.ReynoldsAboveRange))
            list.Add(new("reynolds-above-range", string.Format(c,
                "Reynolds number {0:G6} is above 1e8, the top of Colebrook-White's stated range; the value is an extrapolation.", reynolds)));
        if (warnings.HasFlag(FrictionWarnings.RelativeRoughnessAboveRange))
            list.Add(new("relative-roughness-above-range", string.Format(c,
                "Relative roughness {0:G6} is above 0.05, the top of Colebrook-White's stated range; the value is an extrapolation.", relativeRoughness)));
        if (warnings.HasFlag(FrictionWarnings.ApproximationOutOfRange))
        {
            FrictionMethodInfo.TryParse(relation, out var info);
            list.Add(new("approximation-out-of-range", string.Format(c,
                "The inputs are outside {0}'s stated range (Re {1:G3} to {2:G3}, e/D {3:G3} to {4:G3}); compare with the exact value.",
                relation, info.ReynoldsMinimum, info.ReynoldsMaximum, info.RelativeRoughnessMinimum, info.RelativeRoughnessMaximum)));
        }
        if (warnings.HasFlag(FrictionWarnings.MethodNotApplicableInRegime))
            list.Add(new("method-not-applicable", string.Format(c,
                "The requested method is a turbulent-flow approximation; at Reynolds number {0:G6} the value comes from {1}.", reynolds, relation)));
        if (warnings.HasFlag(FrictionWarnings.NotConverged))
            list.Add(new("not-converged", "The Colebrook-White solve did not converge; the value is the best iterate and must not be used."));
        return list;
    }
}
