using System.Globalization;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.NonNewtonian;

/// <summary>Warning flags of a non-Newtonian friction evaluation (see <see cref="NonNewtonianFrictionResult.Describe"/>).</summary>
[Flags]
public enum NonNewtonianWarnings
{
    /// <summary>No warning.</summary>
    None = 0,
    /// <summary>Power law: Re_MR within the band around the critical Reynolds number (see <see cref="NonNewtonianFriction.NearCriticalLow"/>).</summary>
    NearCriticalReynolds = 1,
    /// <summary>An input lies outside the published range of the correlation used.</summary>
    OutsideCorrelationRange = 2,
    /// <summary>Bingham plastic: the laminar and turbulent parts of the combination are within a factor of 2.</summary>
    NearTransition = 4,
    /// <summary>Bingham plastic: the plug fills more than 90 percent of the radius (tau0/tau_w above 0.9).</summary>
    PlugLike = 8,
    /// <summary>The implicit solve did not converge.</summary>
    NotConverged = 16,
}

/// <summary>The published range of one correlation for one quantity (read once, so docs and answers cannot drift).</summary>
/// <param name="Method">The correlation's wire name.</param>
/// <param name="Quantity">The input the range applies to.</param>
/// <param name="Minimum">Lower end.</param>
/// <param name="Maximum">Upper end (positive infinity when open).</param>
/// <param name="Source">The publication, and whether the range was read or recalled.</param>
public sealed record NonNewtonianRange(string Method, string Quantity, double Minimum, double Maximum, string Source);

/// <summary>The friction of a non-Newtonian fluid at one velocity in one (smooth) pipe.</summary>
/// <param name="Model">The rheological model.</param>
/// <param name="Fanning">Fanning friction factor f_F = tau_w / (rho V^2 / 2).</param>
/// <param name="Reynolds">Metzner-Reed Reynolds number (power law) or plastic Reynolds number rho V D / mu_p (Bingham).</param>
/// <param name="Hedstrom">Hedstrom number (Bingham); NaN for a power-law fluid.</param>
/// <param name="CriticalReynolds">Ryan-Johnson critical Reynolds number (power law); NaN for a Bingham plastic.</param>
/// <param name="Regime">Laminar or turbulent (power law: by Re_c; Bingham: by the larger part of the combination).</param>
/// <param name="Relation">The relation used: <c>metzner-reed-laminar</c>, <c>dodge-metzner</c> or <c>darby-mun-boger</c>.</param>
/// <param name="LaminarFanning">Bingham: the Buckingham-Reiner part f_L; the laminar law 16/Re_MR for a power law.</param>
/// <param name="TurbulentFanning">Bingham: the Darby turbulent part f_T; Dodge-Metzner when it was solved; otherwise NaN.</param>
/// <param name="PlugRatio">Bingham: tau0 / tau_w of the laminar part; NaN for a power law.</param>
/// <param name="WallShearStress">tau_w = f_F rho V^2 / 2 in Pa.</param>
/// <param name="Iterations">Steps of the implicit solve (0 for an explicit relation).</param>
/// <param name="Residual">Residual of the implicit equation at the returned factor, in its solve variable (0 when explicit).</param>
/// <param name="Status">Why the solve stopped (<see cref="SolveStatus.ClosedForm"/> when explicit).</param>
/// <param name="SolveVariable">The solve variable: <c>1/sqrt(f)</c>, <c>u = 1 - tau0/tau_w</c> or <c>none</c>.</param>
/// <param name="DLnFDLnVelocity">d ln f_F / d ln V at fixed fluid and diameter (the inverse problem's Newton slope).</param>
/// <param name="FlowBehaviorIndex">n (power law), for the validity and warnings; NaN for a Bingham plastic.</param>
/// <param name="Warnings">Warning flags.</param>
public readonly record struct NonNewtonianFrictionResult(
    RheologyModel Model, double Fanning, double Reynolds, double Hedstrom, double CriticalReynolds, FlowRegime Regime,
    string Relation, double LaminarFanning, double TurbulentFanning, double PlugRatio, double WallShearStress,
    int Iterations, double Residual, SolveStatus Status, string SolveVariable, double DLnFDLnVelocity, double FlowBehaviorIndex,
    NonNewtonianWarnings Warnings)
{
    /// <summary>Bingham plastic: d ln f_F / dHe at constant Reynolds number (per unit of He), by implicit differentiation of
    /// Buckingham-Reiner and the combination; NaN for a power-law fluid. With <see cref="DLnFDLnVelocity"/> (which is
    /// d ln f_F / d ln Re for a Bingham plastic) it gives every sensitivity (<see cref="NonNewtonianSensitivity"/>).</summary>
    public double DLnFDHedstrom { get; init; } = double.NaN;

    /// <summary>The Darcy friction factor, 4 f_F, as everywhere in FlowSolve.</summary>
    public double Darcy => 4 * Fanning;

    /// <summary>True when the implicit solve converged (or the relation is explicit).</summary>
    public bool Converged => Status.IsConverged();

    /// <summary>The published ranges that apply, with the inputs as used (allocates).</summary>
    public IReadOnlyList<ValidityCheck> Validity()
    {
        var list = new List<ValidityCheck>(3);
        if (Relation == NonNewtonianFriction.MetznerReedLaminar)
        {
            var l = NonNewtonianFriction.MetznerReedLaminarRange;
            list.Add(new ValidityCheck(l.Method, l.Source, l.Quantity, l.Minimum, CriticalReynolds, Reynolds));
        }
        foreach (var r in NonNewtonianFriction.RangesFor(Relation))
        {
            double value = r.Quantity switch
            {
                "reynolds" => Reynolds,
                "flowBehaviorIndex" => FlowBehaviorIndex,
                "hedstromNumber" => Hedstrom,
                _ => double.NaN,
            };
            list.Add(new ValidityCheck(r.Method, r.Source, r.Quantity, r.Minimum, r.Maximum, value));
        }
        return list;
    }

    /// <summary>The warnings as coded messages (allocates).</summary>
    public IReadOnlyList<CalculationWarning> Describe()
    {
        var c = CultureInfo.InvariantCulture;
        var list = new List<CalculationWarning>(2);
        if ((Warnings & NonNewtonianWarnings.NearCriticalReynolds) != 0)
            list.Add(new("near-critical-reynolds", string.Format(c,
                "The Metzner-Reed Reynolds number {0:G4} lies within the band {1:G4} to {2:G4} ({3} to {4} times the Ryan-Johnson critical Reynolds number {5:G4}): the flow may be laminar or turbulent, and the friction factor jumps between the laminar law and Dodge-Metzner there. Treat the result as uncertain.",
                Reynolds, NonNewtonianFriction.NearCriticalLow * CriticalReynolds, NonNewtonianFriction.NearCriticalHigh * CriticalReynolds,
                NonNewtonianFriction.NearCriticalLow, NonNewtonianFriction.NearCriticalHigh, CriticalReynolds)));
        if ((Warnings & NonNewtonianWarnings.NearTransition) != 0)
            list.Add(new("near-transition", string.Format(c,
                "The laminar (Buckingham-Reiner, {0:G4}) and turbulent (Darby, {1:G4}) parts of the combined Fanning factor are within a factor of 2 of each other: the flow is near the laminar-turbulent transition, where friction is least certain.",
                LaminarFanning, TurbulentFanning)));
        if ((Warnings & NonNewtonianWarnings.PlugLike) != 0)
            list.Add(new("plug-like-flow", string.Format(c,
                "The unsheared plug fills {0:P1} of the radius (tau0/tau_w = {0:G4}): the flow is barely above the yield stress, and the result depends almost entirely on the measured yield stress.",
                PlugRatio)));
        if ((Warnings & NonNewtonianWarnings.OutsideCorrelationRange) != 0)
        {
            foreach (var v in Validity())
                if (!v.InRange)
                    list.Add(new("outside-correlation-range", string.Format(c,
                        "{0} = {1:G4} is outside the range {2:G4} to {3:G4} of {4} ({5}): the correlation is extrapolated.",
                        v.Quantity, v.Value, v.Minimum, v.Maximum, v.Method, v.Source)));
        }
        if ((Warnings & NonNewtonianWarnings.NotConverged) != 0)
            list.Add(new("not-converged", "The friction-factor solve did not converge (" + Status.Reason() + "); the value must not be used."));
        return list;
    }
}

/// <summary>
/// The Fanning (and Darcy) friction factor of a power-law fluid or a Bingham plastic in a smooth pipe, with the regime,
/// the dimensionless groups, the solve's record, validity and warnings. See <see cref="PowerLawFriction"/> and
/// <see cref="BinghamFriction"/> for the relations and their sources.
/// </summary>
public static class NonNewtonianFriction
{
    /// <summary>Smallest Reynolds number evaluated: below it the friction factor exceeds 1e13 and the flow is creeping.</summary>
    public const double MinimumReynolds = 1e-12;

    /// <summary>Largest Reynolds number evaluated (far beyond any published data).</summary>
    public const double MaximumReynolds = 1e12;

    /// <summary>Power law: the lower end of the warned band, as a multiple of Re_c (a margin of 20 percent: common practice
    /// for a stability criterion with this scatter).</summary>
    public const double NearCriticalLow = 0.8;

    /// <summary>Power law: the upper end of the warned band, as a multiple of Re_c (1/0.8, the same margin in log Re).</summary>
    public const double NearCriticalHigh = 1.25;

    /// <summary>Bingham: the plug ratio above which the flow is warned as plug-like.</summary>
    public const double PlugLikeRatio = 0.9;

    /// <summary>The relation names on the wire.</summary>
    public const string MetznerReedLaminar = "metzner-reed-laminar", DodgeMetzner = "dodge-metzner", DarbyMunBoger = "darby-mun-boger";

    /// <summary>Dodge and Metzner's data range (from memory).</summary>
    public static IReadOnlyList<NonNewtonianRange> DodgeMetznerRanges { get; } =
    [
        new(DodgeMetzner, "reynolds", 2900, 36000,
            "Dodge and Metzner (1959), AIChE J. 5(2), 189-204: the range of their smooth-pipe data (from memory)"),
        new(DodgeMetzner, "flowBehaviorIndex", 0.36, 1.0,
            "Dodge and Metzner (1959), AIChE J. 5(2), 189-204: the range of their smooth-pipe data (from memory)"),
    ];

    /// <summary>The laminar law holds below the critical Reynolds number (Ryan and Johnson 1959); the upper end is filled
    /// in per answer.</summary>
    public static NonNewtonianRange MetznerReedLaminarRange { get; } = new(MetznerReedLaminar, "reynolds", 0, double.PositiveInfinity,
        "Metzner and Reed (1955), AIChE J. 1(4), 434-440; laminar below the critical Reynolds number of Ryan and Johnson (1959), AIChE J. 5(4), 433-435 (from memory)");

    /// <summary>The range of the data Darby's combination was fitted to (from memory).</summary>
    public static IReadOnlyList<NonNewtonianRange> DarbyRanges { get; } =
    [
        new(DarbyMunBoger, "hedstromNumber", 0, 1e7,
            "Darby, Mun and Boger (1992), Chem. Eng. 99(9), 116-119; Darby (2001), Chemical Engineering Fluid Mechanics, 2nd ed.: Hedstrom numbers of the data fitted (from memory)"),
        new(DarbyMunBoger, "reynolds", 0, 1e5,
            "Darby, Mun and Boger (1992), Chem. Eng. 99(9), 116-119: all regimes, turbulent data to Re of about 1e5 (from memory)"),
    ];

    /// <summary>The ranges of a relation (the laminar law's upper end is set from Re_c by the result).</summary>
    internal static IReadOnlyList<NonNewtonianRange> RangesFor(string relation) => relation switch
    {
        DodgeMetzner => DodgeMetznerRanges,
        DarbyMunBoger => DarbyRanges,
        _ => [],
    };

    /// <summary>The friction factor of a fluid at a mean velocity in a smooth pipe.</summary>
    /// <param name="fluid">The fluid (see <see cref="NonNewtonianFluid"/>).</param>
    /// <param name="velocity">Mean velocity V in m/s; finite and positive.</param>
    /// <param name="diameter">Inside diameter D in m; finite and positive.</param>
    /// <param name="trace">Optional per-iteration record of the implicit solve.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain, or the Reynolds number is outside
    /// [<see cref="MinimumReynolds"/>, <see cref="MaximumReynolds"/>] (parameter name <c>reynolds</c>).</exception>
    public static NonNewtonianFrictionResult Compute(in NonNewtonianFluid fluid, double velocity, double diameter, SolverTrace? trace = null)
    {
        fluid.Validate();
        if (!(velocity > 0) || !double.IsFinite(velocity)) NonNewtonianFluid.Throw(nameof(velocity), velocity, "must be finite and positive");
        if (!(diameter > 0) || !double.IsFinite(diameter)) NonNewtonianFluid.Throw(nameof(diameter), diameter, "must be finite and positive");
        double rhoV2 = fluid.Density * velocity * velocity / 2;
        return fluid.Model == RheologyModel.PowerLaw
            ? PowerLaw(fluid, velocity, diameter, rhoV2, trace)
            : Bingham(fluid, velocity, diameter, rhoV2, trace);
    }

    /// <summary>True when a Reynolds number lies in the evaluated range.</summary>
    public static bool InEvaluatedRange(double reynolds) => reynolds >= MinimumReynolds && reynolds <= MaximumReynolds;

    private static NonNewtonianFrictionResult PowerLaw(in NonNewtonianFluid fluid, double velocity, double diameter, double rhoV2, SolverTrace? trace)
    {
        double n = fluid.FlowBehaviorIndex;
        double re = PowerLawFriction.Reynolds(fluid.Density, fluid.ConsistencyIndex, n, velocity, diameter);
        if (!InEvaluatedRange(re)) NonNewtonianFluid.Throw("reynolds", re, "outside the evaluated range [1e-12, 1e12]");
        double reC = PowerLawFriction.CriticalReynolds(n);
        double laminar = 16 / re;
        var warnings = re >= NearCriticalLow * reC && re <= NearCriticalHigh * reC ? NonNewtonianWarnings.NearCriticalReynolds : NonNewtonianWarnings.None;
        if (re < reC)
        {
            // The laminar wall stress straight from the rheology (finite where 16/Re times rho V^2/2 would not be).
            double tau = PowerLawFriction.LaminarWallShearStress(fluid.ConsistencyIndex, n, velocity, diameter);
            return new(RheologyModel.PowerLaw, laminar, re, double.NaN, reC, FlowRegime.Laminar, MetznerReedLaminar, laminar, double.NaN,
                double.NaN, tau, 0, 0, SolveStatus.ClosedForm, "none", -(2 - n), n, warnings);
        }
        var dm = PowerLawFriction.DodgeMetzner(re, n, trace);
        if (!dm.Converged) warnings |= NonNewtonianWarnings.NotConverged;
        var result = new NonNewtonianFrictionResult(RheologyModel.PowerLaw, dm.Fanning, re, double.NaN, reC, FlowRegime.Turbulent,
            DodgeMetzner, laminar, dm.Fanning, double.NaN, dm.Fanning * rhoV2, dm.Iterations, dm.Residual, dm.Status, "1/sqrt(f)",
            dm.DLnFDLnReynolds * (2 - n), n, warnings);
        return OutsideRange(result);
    }

    private static NonNewtonianFrictionResult Bingham(in NonNewtonianFluid fluid, double velocity, double diameter, double rhoV2, SolverTrace? trace)
    {
        double re = BinghamFriction.Reynolds(fluid.Density, fluid.PlasticViscosity, velocity, diameter);
        if (!InEvaluatedRange(re)) NonNewtonianFluid.Throw("reynolds", re, "outside the evaluated range [1e-12, 1e12]");
        double he = BinghamFriction.Hedstrom(fluid.Density, fluid.YieldStress, fluid.PlasticViscosity, diameter);
        if (!double.IsFinite(he)) NonNewtonianFluid.Throw("hedstrom", he, "overflows");
        var laminar = BinghamFriction.BuckinghamReiner(re, he, trace);
        double fT = BinghamFriction.DarbyTurbulent(re, he);
        double m = BinghamFriction.CombinationExponent(re);
        double f = BinghamFriction.Combine(laminar.Fanning, fT, m);
        double slope = BinghamFriction.CombinedSlope(laminar.Fanning, fT, m, re, laminar.DLnFDLnReynolds, -0.193);
        var warnings = NonNewtonianWarnings.None;
        if (!laminar.Converged) warnings |= NonNewtonianWarnings.NotConverged;
        double ratio = Math.Min(laminar.Fanning, fT) / Math.Max(laminar.Fanning, fT);
        if (ratio > 0.5) warnings |= NonNewtonianWarnings.NearTransition;
        if (laminar.PlugRatio > PlugLikeRatio) warnings |= NonNewtonianWarnings.PlugLike;
        // Laminar-dominated flow: tau_w from the laminar part scaled by f/f_L, so that a huge f_L times a tiny rho V^2 stays finite.
        double tau = laminar.Fanning >= fT ? fluid.YieldStress / laminar.PlugRatio * (f / laminar.Fanning) : f * rhoV2;
        if (!double.IsFinite(tau) || laminar.PlugRatio == 0) tau = f * rhoV2;
        var result = new NonNewtonianFrictionResult(RheologyModel.BinghamPlastic, f, re, he, double.NaN,
            laminar.Fanning >= fT ? FlowRegime.Laminar : FlowRegime.Turbulent, DarbyMunBoger, laminar.Fanning, fT, laminar.PlugRatio, tau,
            laminar.Iterations, laminar.Residual, laminar.Status, laminar.Iterations == 0 ? "none" : "u = 1 - tau0/tau_w", slope, double.NaN, warnings)
        {
            DLnFDHedstrom = BinghamFriction.CombinedHedstromSlope(laminar.Fanning, fT, m, laminar.DLnFDHedstrom,
                BinghamFriction.DarbyTurbulentDLnFDHedstrom(he)),
        };
        return OutsideRange(result);
    }

    /// <summary>Flags an input outside the relation's published ranges. Allocation-free: it runs on every evaluation of
    /// the inverse problem (the <see cref="NonNewtonianFrictionResult.Validity"/> list is built only for answers).</summary>
    private static NonNewtonianFrictionResult OutsideRange(in NonNewtonianFrictionResult result)
    {
        var ranges = RangesFor(result.Relation);
        for (int i = 0; i < ranges.Count; i++)
        {
            var r = ranges[i];
            double value = r.Quantity switch
            {
                "reynolds" => result.Reynolds,
                "flowBehaviorIndex" => result.FlowBehaviorIndex,
                _ => result.Hedstrom,
            };
            if (!(value >= r.Minimum && value <= r.Maximum))
                return result with { Warnings = result.Warnings | NonNewtonianWarnings.OutsideCorrelationRange };
        }
        return result;
    }
}
