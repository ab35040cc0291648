using System.Globalization;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Pumps;

/// <summary>Optional data for a duty point: efficiency, NPSH required, suction side and fluid.</summary>
/// <param name="Efficiency">Efficiency curve of one pump at rated speed, for efficiency, shaft power and the BEP ratio.</param>
/// <param name="NpshRequired">NPSH-required curve of one pump at rated speed, for the NPSH margin.</param>
/// <param name="Suction">Suction side, for NPSH available.</param>
/// <param name="Fluid">The fluid: density for shaft power and NPSH available (required with <paramref name="Suction"/>),
/// kinematic viscosity for a suction pipe.</param>
public readonly record struct DutyPointData(
    EfficiencyCurve? Efficiency = null, NpshCurve? NpshRequired = null, SuctionConditions? Suction = null, FluidProperties? Fluid = null);

/// <summary>Limits for the duty-point warnings, and the solver settings.</summary>
/// <param name="PreferredRegionLow">Low end of the preferred operating region as a fraction of the BEP flow (0.70: common practice).</param>
/// <param name="PreferredRegionHigh">High end of the preferred operating region as a fraction of the BEP flow (1.20: common practice).</param>
/// <param name="MinimumNpshMargin">Smallest NPSHa - NPSHr in m not warned about (1.0 m: common practice).</param>
/// <param name="MinimumNpshRatio">Smallest NPSHa/NPSHr not warned about (1.1: common practice).</param>
/// <param name="Solver">Tolerances of the safeguarded Newton solve.</param>
public readonly record struct DutyPointOptions(
    double PreferredRegionLow, double PreferredRegionHigh, double MinimumNpshMargin, double MinimumNpshRatio, SolverOptions Solver)
{
    /// <summary>0.70 to 1.20 of BEP flow, 1.0 m and 1.1 (all common practice); <see cref="SolverOptions.Default"/>.</summary>
    public static DutyPointOptions Default { get; } = new(0.70, 1.20, 1.0, 1.1, SolverOptions.Default);

    internal void Validate()
    {
        PumpGuard.Positive(PreferredRegionLow, "preferredRegionLow");
        PumpGuard.Positive(PreferredRegionHigh, "preferredRegionHigh");
        if (!(PreferredRegionHigh > PreferredRegionLow))
            PumpGuard.Throw("preferredRegionHigh", PreferredRegionHigh, "must exceed preferredRegionLow");
        PumpGuard.NonNegative(MinimumNpshMargin, "minimumNpshMargin");
        PumpGuard.NonNegative(MinimumNpshRatio, "minimumNpshRatio");
    }
}

/// <summary>
/// A duty (operating) point: where the head of a pump set meets the head of the system, with the pump's efficiency,
/// power and suction margin there. Immutable; all heads in m, flows in m3/s, powers in W.
/// </summary>
public readonly record struct DutyPointResult
{
    /// <summary>Outcome, including the no-answer cases.</summary>
    public DutyStatus Status { get; init; }

    /// <summary>Why the Newton solve stopped (<see cref="SolveStatus.NoSignChange"/> for the no-answer statuses).</summary>
    public SolveStatus SolverStatus { get; init; }

    /// <summary>The arrangement solved.</summary>
    public PumpArrangement Arrangement { get; init; }

    /// <summary>Flow of the whole pump set Q in m3/s (0 without an answer).</summary>
    public double Flow { get; init; }

    /// <summary>Head of the whole pump set in m, equal to the system head at <see cref="Flow"/> (0 without an answer).</summary>
    public double Head { get; init; }

    /// <summary>Flow through each pump in m3/s: Q / Parallel.</summary>
    public double FlowPerPump { get; init; }

    /// <summary>Head of each pump in m: Head / Series.</summary>
    public double HeadPerPump { get; init; }

    /// <summary>The flow per pump brought back to rated speed, FlowPerPump / s, in m3/s: where the catalogue curves are read.</summary>
    public double RatedSpeedFlow { get; init; }

    /// <summary>Newton (or bisection) steps.</summary>
    public int Iterations { get; init; }

    /// <summary>Function evaluations of the solve.</summary>
    public int Evaluations { get; init; }

    /// <summary>Pump-set head minus system head at <see cref="Flow"/>, in m.</summary>
    public double Residual { get; init; }

    /// <summary>True when the result holds a duty point.</summary>
    public bool Converged => Status.HasAnswer();

    /// <summary>The pump set's shut-off head at Q = 0, Series s^2 C0, in m.</summary>
    public double ShutOffHead { get; init; }

    /// <summary>The system's static head in m.</summary>
    public double StaticHead { get; init; }

    /// <summary>StaticHead - ShutOffHead in m: how far the pump set falls short of starting flow (positive for
    /// <see cref="DutyStatus.ShutOffBelowStaticHead"/>, negative otherwise).</summary>
    public double HeadShortfall => StaticHead - ShutOffHead;

    /// <summary>The pump set's zero-head flow in m3/s (Parallel s Q0), or null when the curve does not reach zero head.</summary>
    public double? ZeroHeadFlow { get; init; }

    /// <summary>The upper end of the bracket in m3/s: <see cref="ZeroHeadFlow"/>, or the set's search limit.</summary>
    public double BracketUpperFlow { get; init; }

    /// <summary>Without an answer: the value of pump-set head minus system head nearest zero on the bracket, in m
    /// (negative when the pump set falls short, positive when it is always above); 0 when solved.</summary>
    public double ClosestApproach { get; init; }

    /// <summary>Without an answer: the set flow in m3/s at which <see cref="ClosestApproach"/> occurs.</summary>
    public double ClosestApproachFlow { get; init; }

    /// <summary>With a rising curve whose shut-off head does not exceed the static head but which climbs above the system
    /// curve: the lower intersection, where the pump-set curve rises through the system curve, in m3/s. The flow drifts
    /// away from it either way, so it is not a duty point; <see cref="Flow"/> is the stable intersection above it.
    /// Null otherwise.</summary>
    public double? UnstableFlow { get; init; }

    /// <summary>Efficiency of each pump (fraction) at the duty, eta(RatedSpeedFlow); null without efficiency data.</summary>
    public double? Efficiency { get; init; }

    /// <summary>Hydraulic power rho g Q H of the set in W; null without a density.</summary>
    public double? HydraulicPower { get; init; }

    /// <summary>Shaft power of the whole set rho g Q H / eta in W; null without efficiency data, a density, or a positive efficiency.</summary>
    public double? ShaftPower { get; init; }

    /// <summary>Shaft power of each pump in W (ShaftPower / number of pumps).</summary>
    public double? ShaftPowerPerPump { get; init; }

    /// <summary>The BEP flow of one pump at the running speed, s Q_BEP, in m3/s; null without efficiency data.</summary>
    public double? BestEfficiencyFlow { get; init; }

    /// <summary>FlowPerPump / (s Q_BEP): the duty flow as a fraction of the BEP flow; null without efficiency data.</summary>
    public double? BestEfficiencyRatio { get; init; }

    /// <summary>NPSH available in m at the duty; null without suction data.</summary>
    public double? NpshAvailable { get; init; }

    /// <summary>Suction loss used for NPSH available in m (given loss plus the suction pipe's); null without suction data.</summary>
    public double? SuctionLoss { get; init; }

    /// <summary>NPSH required in m at the duty, s^2 NPSHr(RatedSpeedFlow); null without NPSH data.</summary>
    public double? NpshRequired { get; init; }

    /// <summary>NPSHa - NPSHr in m; null unless both are known.</summary>
    public double? NpshMargin { get; init; }

    /// <summary>NPSHa / NPSHr; null unless both are known and NPSHr is positive.</summary>
    public double? NpshRatio { get; init; }

    /// <summary>Warning flags.</summary>
    public PumpWarnings Warnings { get; init; }

    /// <summary>The catalogue range of the head curve in m3/s at rated speed (for the warning text); null without one.</summary>
    public (double Minimum, double Maximum)? CatalogueRange { get; init; }

    /// <summary>The warnings as coded messages (allocates; for reports and the API).</summary>
    /// <param name="options">Options used; <see cref="DutyPointOptions.Default"/> when omitted.</param>
    public IReadOnlyList<CalculationWarning> DescribeWarnings(DutyPointOptions? options = null)
    {
        var o = options ?? DutyPointOptions.Default;
        var c = CultureInfo.InvariantCulture;
        var list = new List<CalculationWarning>();
        var w = Warnings;
        if (w.HasFlag(PumpWarnings.OutsideCatalogueRange) && CatalogueRange is var (lo, hi))
            list.Add(new("outside-catalogue-range", string.Format(c,
                "The duty flow per pump at rated speed, {0:G4} m3/s, lies outside the catalogue range {1:G4} to {2:G4} m3/s; " +
                "the curve is extrapolated there.", RatedSpeedFlow, lo, hi)));
        if (w.HasFlag(PumpWarnings.BelowPreferredRegion))
            list.Add(new("below-preferred-region", string.Format(c,
                "The duty flow is {0:P0} of the best-efficiency flow, below the preferred operating region of {1:P0} to {2:P0} " +
                "(common practice): expect recirculation, vibration and heating.", BestEfficiencyRatio, o.PreferredRegionLow, o.PreferredRegionHigh)));
        if (w.HasFlag(PumpWarnings.AbovePreferredRegion))
            list.Add(new("above-preferred-region", string.Format(c,
                "The duty flow is {0:P0} of the best-efficiency flow, above the preferred operating region of {1:P0} to {2:P0} " +
                "(common practice): expect higher NPSH required and overload.", BestEfficiencyRatio, o.PreferredRegionLow, o.PreferredRegionHigh)));
        if (w.HasFlag(PumpWarnings.NpshMarginShort))
            list.Add(new("npsh-margin-short", string.Format(c,
                "NPSH available {0:G4} m against {1:G4} m required: margin {2:G3} m, ratio {3:G3}; at least {4:G3} m and {5:G3} " +
                "are usual (common practice). Cavitation is likely.", NpshAvailable, NpshRequired, NpshMargin, NpshRatio,
                o.MinimumNpshMargin, o.MinimumNpshRatio)));
        if (w.HasFlag(PumpWarnings.ZeroHeadNotReached))
            list.Add(new("zero-head-not-reached", string.Format(c,
                "The pump curve does not reach zero head up to {0:G4} m3/s (set flow); the search ended there.", BracketUpperFlow)));
        if (w.HasFlag(PumpWarnings.RisingCurve))
            list.Add(new("rising-pump-curve", UnstableFlow is double low
                ? string.Format(c,
                    "The pump curve rises with flow and its shut-off head, {0:G6} m, does not exceed the static head, {1:G6} m, yet it climbs " +
                    "above the system curve: the curves meet at {2:G6} m3/s, where the pump curve rises through the system curve (unstable: " +
                    "the flow runs away from it either way), and at {3:G6} m3/s, where it falls through it. The stable intersection is " +
                    "reported. The pump cannot start against the static head from rest without help (a bypass, a lower static head at " +
                    "start-up) and may surge.", ShutOffHead, StaticHead, low, Flow)
                : "The pump curve rises with flow somewhere on its range: the pump may run unstably and more than one duty point may exist."));
        if (w.HasFlag(PumpWarnings.EfficiencyNotPositive))
            list.Add(new("efficiency-not-positive",
                "The efficiency curve gives zero or less at the duty flow (far outside its data); shaft power is not reported."));
        if (w.HasFlag(PumpWarnings.OutsideEfficiencyData))
            list.Add(new("outside-efficiency-data", "The duty flow lies outside the efficiency data; the efficiency is extrapolated."));
        if (w.HasFlag(PumpWarnings.OutsideNpshData))
            list.Add(new("outside-npsh-data", "The duty flow lies outside the NPSH-required data; the value is extrapolated."));
        if (w.HasFlag(PumpWarnings.BestEfficiencyAtDataEnd))
            list.Add(new("best-efficiency-at-data-end",
                "The efficiency data show no peak inside their range; the best-efficiency flow used is at an end of the data."));
        if (w.HasFlag(PumpWarnings.NotConverged))
            list.Add(new("not-converged", "The duty-point solve did not converge; the values must not be used."));
        return list;
    }
}

/// <summary>
/// The duty point of identical pumps in parallel or series, at a speed ratio, on a system curve.
/// </summary>
/// <remarks>
/// <para>Pump-set head at set flow Q: H_set(Q) = Series s^2 H(Q / (Parallel s)) (parallel pumps share the flow at a
/// common head; series pumps carry the whole flow and add their heads; the affinity laws scale one pump,
/// H_s(q) = s^2 H(q/s): common practice). The solve finds F(Q) = H_set(Q) - H_sys(Q) = 0 by
/// <see cref="SafeguardedNewton"/> on the bracket [0, Parallel s Q0], Q0 the pump's zero-head flow (or its search
/// limit when the curve never reaches zero head), from a regula falsi start. F &gt; 0 at both ends is
/// <see cref="DutyStatus.CurvesDoNotMeet"/>. F(0) &lt;= 0 (shut-off head at or below the static head) is
/// <see cref="DutyStatus.ShutOffBelowStaticHead"/> unless F climbs above zero somewhere, as a curve that rises with flow
/// can: then the largest value of F on the bracket is found (a 64-interval scan refined by golden section), the stable
/// intersection, where F falls through zero, is solved on [that flow, the bracket's end] and reported as the duty point
/// with <see cref="PumpWarnings.RisingCurve"/>, and the unstable one below it, where F rises through zero, is reported in
/// <see cref="DutyPointResult.UnstableFlow"/>. The no-answer statuses carry the curves' closest approach on the bracket.</para>
/// <para>With the curve held as coefficients and the system as K Q^2 or pipes in an array, the solve allocates
/// nothing (the trace, when given, does). Thread-safe.</para>
/// <para>The results are engineering estimates; a duty point used for design is to be checked by a qualified engineer.</para>
/// </remarks>
public static class DutyPoint
{
    /// <summary>Solves for the duty point and evaluates efficiency, power and NPSH where data are given.</summary>
    /// <param name="pump">Head curve of one pump at rated speed.</param>
    /// <param name="system">System curve.</param>
    /// <param name="arrangement">Pumps in parallel or series and speed ratio; <see cref="PumpArrangement.Single"/> when omitted.</param>
    /// <param name="data">Efficiency, NPSH-required, suction and fluid data; none when omitted.</param>
    /// <param name="options">Warning limits and solver tolerances; <see cref="DutyPointOptions.Default"/> when omitted.</param>
    /// <param name="trace">Optional record of the Newton iterations (allocates).</param>
    /// <returns>The duty point, or a no-answer status with the shortfall and closest approach; never throws for a well-formed problem.</returns>
    /// <exception cref="ArgumentException">The pump curve is <c>default</c>, the arrangement or options are out of range,
    /// or suction data come without a fluid density (the parameter name says which).</exception>
    public static DutyPointResult Solve(in PumpCurve pump, in SystemCurve system, PumpArrangement? arrangement = null,
        in DutyPointData data = default, DutyPointOptions? options = null, SolverTrace? trace = null)
    {
        if (!(pump.SearchLimit > 0)) throw new ArgumentException("the pump curve is not initialised (default)", nameof(pump));
        var a = arrangement ?? PumpArrangement.Single;
        a.Validate();
        var o = options ?? DutyPointOptions.Default;
        o.Validate();
        if (data.Suction is SuctionConditions suctionCheck)
        {
            suctionCheck.Validate();
            if (data.Fluid?.Density is null) throw new ArgumentException("suction data need the fluid's density", "density");
        }

        double s = a.SpeedRatio, np = a.Parallel, ns = a.Series;
        var f = new SetMinusSystem(pump, system, np, ns, s);
        double upper = np * s * (pump.ZeroHeadFlow ?? pump.SearchLimit);
        var warnings = PumpWarnings.None;
        if (pump.ZeroHeadFlow is null) warnings |= PumpWarnings.ZeroHeadNotReached;
        if (pump.RisesWithFlow) warnings |= PumpWarnings.RisingCurve;

        var result = new DutyPointResult
        {
            Arrangement = a,
            ShutOffHead = ns * s * s * pump.C0,
            StaticHead = system.StaticHead,
            ZeroHeadFlow = pump.ZeroHeadFlow is double z ? np * s * z : null,
            BracketUpperFlow = upper,
            CatalogueRange = pump.DataMaximumFlow is double dmax ? (pump.DataMinimumFlow ?? 0, dmax) : null,
        };

        double f0 = f.Evaluate(0).Value, fu = f.Evaluate(upper).Value;
        RootResult root;
        double? unstable = null;
        int scanned = 0;
        if (f0 > 0 && fu < 0)
        {
            // Regula falsi start: exact for a straight-line difference, inside the bracket always.
            double guess = upper * f0 / (f0 - fu);
            root = SafeguardedNewton.Solve(f, Bracket.KnownDecreasing(0, upper), guess, o.Solver, trace);
        }
        else
        {
            // Shut-off head at or below the static head: a curve that rises with flow may still climb above the system
            // curve and fall back through it. Then the stable intersection, where the pump-set curve falls through the
            // system curve, lies beyond the largest surplus of pump head; the lower one, where it rises through, is
            // unstable (the flow runs away from it either way) and is only reported.
            var (peak, atPeak, evaluations) = !(f0 > 0) && fu < 0 ? LargestSurplus(f, upper) : (double.NaN, 0.0, 0);
            if (!(peak > 0))
            {
                var (gap, at) = ClosestApproach(f, upper);
                return result with
                {
                    Status = f0 > 0 ? DutyStatus.CurvesDoNotMeet : DutyStatus.ShutOffBelowStaticHead,
                    SolverStatus = SolveStatus.NoSignChange,
                    Evaluations = 2,
                    ClosestApproach = gap,
                    ClosestApproachFlow = at,
                    Warnings = warnings,
                };
            }
            root = SafeguardedNewton.Solve(f, Bracket.Checked(atPeak, upper), atPeak + (upper - atPeak) * peak / (peak - fu), o.Solver, trace);
            var rising = f0 == 0 ? new RootResult(0, 0, 0, 0, 0, 0, 0, SolveStatus.ConvergedOnResidual)
                : SafeguardedNewton.Solve(f, Bracket.Checked(0, atPeak), atPeak * -f0 / (peak - f0), o.Solver);
            if (rising.Converged) unstable = rising.Root;
            scanned = evaluations + rising.Evaluations;
            warnings |= PumpWarnings.RisingCurve;
        }
        double q = root.Root;
        var status = root.Converged ? DutyStatus.Solved : DutyStatus.NotConverged;
        if (!root.Converged) warnings |= PumpWarnings.NotConverged;
        double head = system.Head(q);
        double qpp = q / np, rated = qpp / s;
        result = result with
        {
            Status = status,
            SolverStatus = root.Status,
            Flow = q,
            Head = head,
            FlowPerPump = qpp,
            HeadPerPump = head / ns,
            RatedSpeedFlow = rated,
            Iterations = root.Iterations,
            Evaluations = root.Evaluations + 2 + scanned,
            Residual = root.Residual,
            UnstableFlow = unstable,
        };
        if (pump.DataMaximumFlow is double qmax && (rated > qmax || rated < (pump.DataMinimumFlow ?? 0)))
            warnings |= PumpWarnings.OutsideCatalogueRange;

        double? rho = data.Fluid?.Density;
        if (rho is double r) result = result with { HydraulicPower = r * Physical.StandardGravity * q * head };
        if (data.Efficiency is EfficiencyCurve eff)
        {
            double eta = eff.Efficiency(rated);
            double bep = s * eff.BestEfficiencyFlow;
            double ratio = qpp / bep;
            if (ratio < o.PreferredRegionLow) warnings |= PumpWarnings.BelowPreferredRegion;
            if (ratio > o.PreferredRegionHigh) warnings |= PumpWarnings.AbovePreferredRegion;
            if (!eff.HasInteriorMaximum) warnings |= PumpWarnings.BestEfficiencyAtDataEnd;
            if (rated < eff.DataMinimumFlow || rated > eff.DataMaximumFlow) warnings |= PumpWarnings.OutsideEfficiencyData;
            result = result with { Efficiency = eta, BestEfficiencyFlow = bep, BestEfficiencyRatio = ratio };
            if (!(eta > 0)) warnings |= PumpWarnings.EfficiencyNotPositive;
            else if (result.HydraulicPower is double ph)
                result = result with { ShaftPower = ph / eta, ShaftPowerPerPump = ph / eta / a.Count };
        }
        if (data.NpshRequired is NpshCurve npsh)
        {
            if (rated < npsh.DataMinimumFlow || rated > npsh.DataMaximumFlow) warnings |= PumpWarnings.OutsideNpshData;
            result = result with { NpshRequired = s * s * npsh.Required(rated) };
        }
        if (data.Suction is SuctionConditions suction)
        {
            var (npsha, loss) = Pumps.NpshAvailable.Compute(suction, data.Fluid!.Value, qpp);
            result = result with { NpshAvailable = npsha, SuctionLoss = loss };
            if (result.NpshRequired is double npshr)
            {
                double margin = npsha - npshr;
                double? ratio = npshr > 0 ? npsha / npshr : null;
                if (margin < o.MinimumNpshMargin || ratio < o.MinimumNpshRatio) warnings |= PumpWarnings.NpshMarginShort;
                result = result with { NpshMargin = margin, NpshRatio = ratio };
            }
        }
        return result with { Warnings = warnings };
    }

    /// <summary>Pump-set head in m at a set flow in m3/s: Series s^2 H(Q / (Parallel s)).</summary>
    /// <param name="pump">Head curve of one pump at rated speed.</param>
    /// <param name="arrangement">Arrangement and speed ratio.</param>
    /// <param name="flow">Set flow in m3/s; finite.</param>
    /// <exception cref="ArgumentOutOfRangeException">The arrangement is out of range.</exception>
    public static double SetHead(in PumpCurve pump, PumpArrangement arrangement, double flow)
    {
        arrangement.Validate();
        double s = arrangement.SpeedRatio;
        return arrangement.Series * s * s * pump.Head(flow / (arrangement.Parallel * s));
    }

    /// <summary>The largest value of F on [0, upper] and where it lies: a 64-interval scan, then golden-section refinement
    /// around the best sample (allocation-free), with the evaluations spent.</summary>
    private static (double Value, double At, int Evaluations) LargestSurplus(in SetMinusSystem f, double upper)
    {
        const int n = 64;
        int best = 0, evaluations = 0;
        double bestValue = double.NegativeInfinity;
        for (int i = 0; i <= n; i++, evaluations++)
        {
            double v = f.Evaluate(upper * i / n).Value;
            if (v > bestValue) { bestValue = v; best = i; }
        }
        double a = upper * Math.Max(best - 1, 0) / n, b = upper * Math.Min(best + 1, n) / n;
        const double invPhi = 0.6180339887498949;
        double x1 = b - invPhi * (b - a), x2 = a + invPhi * (b - a);
        double f1 = f.Evaluate(x1).Value, f2 = f.Evaluate(x2).Value;
        evaluations += 2;
        for (int k = 0; k < 60 && b - a > 1e-14 * upper; k++, evaluations++)
        {
            if (f1 > f2) { b = x2; x2 = x1; f2 = f1; x1 = b - invPhi * (b - a); f1 = f.Evaluate(x1).Value; }
            else { a = x1; x1 = x2; f1 = f2; x2 = a + invPhi * (b - a); f2 = f.Evaluate(x2).Value; }
        }
        double candidate = f1 > f2 ? x1 : x2, candidateValue = Math.Max(f1, f2);
        return candidateValue > bestValue ? (candidateValue, candidate, evaluations) : (bestValue, upper * best / n, evaluations);
    }

    /// <summary>The value of F nearest zero on [0, upper]: a 64-interval scan, then golden-section refinement of |F|
    /// around the best sample (allocation-free).</summary>
    private static (double Gap, double At) ClosestApproach(in SetMinusSystem f, double upper)
    {
        const int n = 64;
        int best = 0;
        double bestAbs = double.PositiveInfinity;
        for (int i = 0; i <= n; i++)
        {
            double v = Math.Abs(f.Evaluate(upper * i / n).Value);
            if (v < bestAbs) { bestAbs = v; best = i; }
        }
        double a = upper * Math.Max(best - 1, 0) / n, b = upper * Math.Min(best + 1, n) / n;
        const double invPhi = 0.6180339887498949;
        double x1 = b - invPhi * (b - a), x2 = a + invPhi * (b - a);
        double f1 = Math.Abs(f.Evaluate(x1).Value), f2 = Math.Abs(f.Evaluate(x2).Value);
        for (int k = 0; k < 60 && b - a > 1e-14 * upper; k++)
        {
            if (f1 < f2) { b = x2; x2 = x1; f2 = f1; x1 = b - invPhi * (b - a); f1 = Math.Abs(f.Evaluate(x1).Value); }
            else { a = x1; x1 = x2; f1 = f2; x2 = a + invPhi * (b - a); f2 = Math.Abs(f.Evaluate(x2).Value); }
        }
        double xb = upper * best / n;
        double candidate = f1 < f2 ? x1 : x2;
        double at = Math.Min(f1, f2) < bestAbs ? candidate : xb;
        return (f.Evaluate(at).Value, at);
    }

    /// <summary>F(Q) = H_set(Q) - H_sys(Q) and its slope.</summary>
    internal readonly struct SetMinusSystem(in PumpCurve pump, in SystemCurve system, double parallel, double series, double speedRatio)
        : IDifferentiableFunction
    {
        private readonly PumpCurve _pump = pump;
        private readonly SystemCurve _system = system;
        private readonly double _flowScale = 1.0 / (parallel * speedRatio);
        private readonly double _headScale = series * speedRatio * speedRatio;

        public (double Value, double Derivative) Evaluate(double x)
        {
            var (h, dh) = _pump.HeadAndSlope(x * _flowScale);
            var (hs, dhs) = _system.HeadAndSlope(x);
            return (_headScale * h - hs, _headScale * _flowScale * dh - dhs);
        }
    }
}
