using System.Globalization;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Gas;

/// <summary>How a gas-line calculation ended, including the well-posed problems without an answer.</summary>
public enum GasFlowStatus
{
    /// <summary>Solved: the reported pressures and mass flow meet the relation to the solver's tolerance.</summary>
    Solved,

    /// <summary>The flow would pass the isothermal limit (outlet velocity sqrt(Z R T / M)): the line cannot carry it;
    /// <see cref="GasFlowResult.Limit"/> gives the largest mass flow it can.</summary>
    Choked,

    /// <summary>The Reynolds number of the flow lies outside the friction relations (below 1e-3 or above 1e15), or the
    /// inputs lie beyond double precision.</summary>
    OutsideRange,

    /// <summary>The solve did not converge; the values are the best iterate and must not be used.</summary>
    NotConverged,
}

/// <summary>Warnings of a gas-line calculation, as flags (friction warnings travel in <see cref="FrictionResult.Warnings"/>).</summary>
[Flags]
public enum GasWarnings
{
    /// <summary>No warning.</summary>
    None = 0,

    /// <summary>The outlet velocity is above half the isothermal limit velocity, or the mass flow above 90 percent of the
    /// largest (common practice thresholds).</summary>
    NearIsothermalLimit = 1,

    /// <summary>The solve did not converge.</summary>
    NotConverged = 2,

    /// <summary>The answer lies in the jump of the friction factor at a regime limit (Re 2000 or 4000): no mass flow meets
    /// the pressures exactly, and the value is the one at the limit.</summary>
    AtRegimeLimit = 4,
}

/// <summary>The largest mass flow an isothermal line passes from a given inlet pressure: the outlet velocity then equals
/// sqrt(Z R T / M) (outlet Mach number 1/sqrt(k)).</summary>
/// <param name="MassFlux">The largest mass flux G = mass flow / area, kg/(m2 s); NaN when <paramref name="Found"/> is false.</param>
/// <param name="OutletPressure">The outlet pressure at that flow, G sqrt(Z R T / M), Pa (absolute); NaN when not found.</param>
/// <param name="Reynolds">Reynolds number G D / mu at that flow; NaN when not found.</param>
/// <param name="Iterations">Steps of the solve.</param>
/// <param name="SolverStatus">Why the solve stopped.</param>
/// <param name="Found">True when the limit lies inside the friction relations' range and the solve converged.</param>
public readonly record struct GasLimit(double MassFlux, double OutletPressure, double Reynolds, int Iterations, SolveStatus SolverStatus, bool Found);

/// <summary>A gas line solved in one direction or the other: both pressures, the mass flux, the friction factor and the
/// isothermal limit, with derived velocities and Mach numbers.</summary>
/// <param name="Status">Outcome.</param>
/// <param name="InletPressure">p1, Pa (absolute), as given.</param>
/// <param name="OutletPressure">p2, Pa (absolute): given, or solved.</param>
/// <param name="MassFlux">G = mass flow / area, kg/(m2 s): given, or solved.</param>
/// <param name="Friction">The Darcy friction factor at Re = G D / mu, with its relation, validity and warnings
/// (default when there is no answer).</param>
/// <param name="Limit">The isothermal limit from this inlet pressure.</param>
/// <param name="Iterations">Steps of the main solve (0 when the answer needed none).</param>
/// <param name="Residual">The relation's residual at the answer, divided by p1^2:
/// (p1^2 - p2^2)/p1^2 - (Z R T G^2 / (M p1^2)) (f L/D + 2 ln(p1/p2)).</param>
/// <param name="SolverStatus">Why the main solve stopped.</param>
/// <param name="Warnings">Gas-line warnings.</param>
/// <param name="Gas">The gas, as given.</param>
/// <param name="Line">The pipe, as given.</param>
public readonly record struct GasFlowResult(
    GasFlowStatus Status, double InletPressure, double OutletPressure, double MassFlux, FrictionResult Friction, GasLimit Limit,
    int Iterations, double Residual, SolveStatus SolverStatus, GasWarnings Warnings, GasProperties Gas, GasLine Line)
{
    /// <summary>True when the result holds pressures and a mass flow that meet the relation.</summary>
    public bool Converged => Status == GasFlowStatus.Solved;

    /// <summary>Mass flow G A, kg/s.</summary>
    public double MassFlow => MassFlux * Line.Area;

    /// <summary>The largest mass flow the line passes from this inlet pressure, kg/s (NaN when not found).</summary>
    public double LargestMassFlow => Limit.MassFlux * Line.Area;

    /// <summary>Reynolds number G D / mu (the same all along an isothermal line).</summary>
    public double Reynolds => MassFlux * Line.Diameter / Gas.DynamicViscosity;

    /// <summary>Inlet velocity G / rho1 = G Z R T / (M p1), m/s.</summary>
    public double InletVelocity => MassFlux / InletPressure * Gas.PressurePerDensity;

    /// <summary>Outlet velocity G / rho2, m/s.</summary>
    public double OutletVelocity => MassFlux / OutletPressure * Gas.PressurePerDensity;

    /// <summary>Inlet Mach number: inlet velocity over the speed of sound sqrt(k Z R T / M).</summary>
    public double InletMachNumber => InletVelocity / Gas.SpeedOfSound;

    /// <summary>Outlet Mach number; at the isothermal limit it is 1/sqrt(k).</summary>
    public double OutletMachNumber => OutletVelocity / Gas.SpeedOfSound;

    /// <summary>Inlet density p1 M / (Z R T), kg/m3.</summary>
    public double InletDensity => InletPressure / Gas.PressurePerDensity;

    /// <summary>Outlet density, kg/m3.</summary>
    public double OutletDensity => OutletPressure / Gas.PressurePerDensity;

    /// <summary>Volume flow at 15 degrees C and 101 325 Pa with the gas taken as ideal there (Z = 1), m3/s.</summary>
    public double StandardVolumeFlow => MassFlow / Gas.StandardDensity;

    /// <summary>The friction factor's published ranges beside the inputs (allocates).</summary>
    public IReadOnlyList<ValidityCheck> Validity() =>
        Friction.Relation is null ? [] : Friction.Validity(FrictionOptions.Default);

    /// <summary>Friction and gas-line warnings as coded messages (allocates).</summary>
    public IReadOnlyList<CalculationWarning> DescribeWarnings()
    {
        var list = new List<CalculationWarning>();
        if (Friction.Relation is not null)
            list.AddRange(DarcyFriction.Describe(Friction.Warnings, Reynolds, Line.RelativeRoughness, Friction.Relation));
        var c = CultureInfo.InvariantCulture;
        if (Warnings.HasFlag(GasWarnings.NearIsothermalLimit))
            list.Add(new("near-isothermal-limit", string.Format(c,
                "The line runs near its isothermal limit: the mass flow is {0:G4} times the largest ({1:G4} kg/s) and the outlet velocity " +
                "{2:G4} m/s is {3:G3} times the limit velocity sqrt(Z R T / M) = {4:G4} m/s (warned above 0.9 and 0.5 respectively, " +
                "common practice). Close to the largest flow the outlet pressure falls steeply for a small gain in flow, so a small error " +
                "in f, Z or the temperature moves the answer a long way; and as the outlet velocity nears the limit, the heat the gas " +
                "must take up to stay at constant temperature grows, and a real line runs closer to adiabatic flow, whose capacity differs.",
                MassFlux / Limit.MassFlux, LargestMassFlow, OutletVelocity, OutletVelocity / Gas.LimitVelocity, Gas.LimitVelocity)));
        if (Warnings.HasFlag(GasWarnings.AtRegimeLimit))
            list.Add(new("at-regime-limit", string.Format(c,
                "The pressures fall inside the jump of the friction factor at a regime limit (Reynolds number {0:G6}): no mass flow " +
                "meets them exactly, and the value is the one at the limit, where flow may be laminar or turbulent.", Reynolds)));
        if (Warnings.HasFlag(GasWarnings.NotConverged))
            list.Add(new("not-converged", "The solve did not converge; the values are the best iterate and must not be used."));
        return list;
    }
}

/// <summary>
/// Steady isothermal flow of a gas in a horizontal pipe of constant section:
/// p1^2 - p2^2 = (Z R T G^2 / M) (f L/D + 2 ln(p1/p2)), G = mass flow / area, f the Darcy factor at Re = G D / mu
/// (constant along the line, since G and mu are), solved for the mass flow from both pressures or for the outlet pressure
/// from the mass flow, with the largest mass flow the line passes (the isothermal limit).
/// </summary>
/// <remarks>
/// <para>The relation integrates the momentum equation dp + rho V dV + f rho V^2 dx / (2 D) = 0 along the line with
/// p / rho = Z R T / M constant (isothermal, Z constant); it is the standard isothermal-flow result (for example
/// Shapiro 1953, The Dynamics and Thermodynamics of Compressible Fluid Flow, vol. 1, ch. 6, from memory). With
/// C = Z R T / M and beta = C G^2 / p1^2 (the square of the inlet velocity over sqrt(C)) it reads, divided by p1^2,
/// h(delta) = delta (2 - delta) - beta F + 2 beta ln(1 - delta) = 0, with delta = (p1 - p2)/p1 and F = f L/D.</para>
/// <para>The isothermal limit. dh/ddelta = 2 ((1 - delta)^2 - beta)/(1 - delta) vanishes where p2 = G sqrt(C), an outlet
/// velocity of sqrt(C), the outlet Mach number 1/sqrt(k): for a given mass flow h rises from -beta F at delta = 0 to its
/// maximum there and falls again. Below the largest flow there are two outlet pressures; the one above G sqrt(C) is the
/// physical one (the gas enters subsonic and the velocity rises monotonically along the line up to the limit, which it
/// can only reach at the outlet), the other lies on the branch beyond the limit, which a subsonic line cannot reach. At
/// the largest flow the maximum is zero: with y = p1^2 / (C G^2), y - 1 - ln y = F(G).</para>
/// <para>Numerics, each solve in a variable that makes its residual nearly linear:
/// the outlet pressure in delta on [0, 1 - sqrt(beta)], where h rises (a known bracket: h(0) = -beta F &lt; 0 and the
/// maximum is positive when the flow is below the limit), written with log1p so a small drop keeps its digits;
/// the mass flux in ln G, r = ln(C G^2 (F + 2 ln(p1/p2))) - ln(p1^2 - p2^2), whose slope 2 + (F/(F + 2 ln(p1/p2))) d ln f/d ln Re
/// lies between 1 and 2 (the friction factor falls no faster than 1/Re), bracketed above by the laminar root (f &gt;= 64/Re in
/// every regime, so that flux meets or exceeds the drop) and below by a laminar flux at half of it;
/// the limit in ln u, u = ln y, r = ln(y - 1 - ln y) - ln F, nearly linear for short lines (y - 1 - ln y ~ u^2/2) and tame
/// for long ones. Every solve is <see cref="SafeguardedNewton"/>'s; logarithms keep pressures up to 1e308 finite.</para>
/// </remarks>
public static class GasPipeFlow
{
    /// <summary>Outlet velocity over the isothermal limit velocity above which <see cref="GasWarnings.NearIsothermalLimit"/>
    /// is raised (common practice: a margin of two on the limit velocity).</summary>
    public const double NearLimitFraction = 0.5;

    /// <summary>Mass flow over the largest mass flow above which <see cref="GasWarnings.NearIsothermalLimit"/> is raised
    /// (common practice: a margin of 10 percent; the mass flow is flat in the outlet pressure near the limit, so the
    /// velocity criterion alone would miss it on long lines).</summary>
    public const double NearLimitFlow = 0.9;

    /// <summary>A converged residual of the mass-flux solve (in ln) above this means the solve ended in a jump of f.</summary>
    internal const double JumpResidual = 1e-8;

    private static readonly SolverOptions DeltaOptions = new(0.0, 4 * SolverOptions.MachineEpsilon, 0.0, 200);
    private static readonly SolverOptions LogOptions = new(1e-15, 4 * SolverOptions.MachineEpsilon, 0.0, 200);

    /// <summary>The outlet pressure of a given mass flow.</summary>
    /// <param name="line">The pipe.</param>
    /// <param name="gas">The gas.</param>
    /// <param name="inletPressure">p1, Pa (absolute); finite and positive.</param>
    /// <param name="massFlow">Mass flow, kg/s; finite and positive.</param>
    /// <param name="trace">Optional record of the solve in delta = (p1 - p2)/p1 (allocates).</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain (the parameter name says which).</exception>
    public static GasFlowResult SolveOutletPressure(in GasLine line, in GasProperties gas, double inletPressure, double massFlow,
        SolverTrace? trace = null)
    {
        Guard(line, gas, inletPressure);
        Positive(massFlow, nameof(massFlow));
        double p1 = inletPressure, g = massFlow / line.Area;
        var limit = LargestMassFlux(line, gas, p1);
        var none = new GasFlowResult(GasFlowStatus.OutsideRange, p1, double.NaN, g, default, limit, 0, double.NaN,
            SolveStatus.NonFiniteValue, GasWarnings.None, gas, line);
        double re = g * line.Diameter / gas.DynamicViscosity;
        if (!(re >= DarcyFriction.MinimumReynolds && re <= DarcyFriction.MaximumReynolds)) return none;

        var friction = DarcyFriction.Compute(re, line.RelativeRoughness);
        double f = friction.FrictionFactor, c = gas.PressurePerDensity;
        double lnLd = Math.Log(line.Length) - Math.Log(line.Diameter);
        double rootBeta = g * Math.Sqrt(c) / p1;                 // inlet velocity over sqrt(C)
        double beta = rootBeta * rootBeta;
        double betaF = BetaF(beta, f, line, lnLd, rootBeta);
        var choked = none with { Status = GasFlowStatus.Choked, Friction = friction };
        if (!(rootBeta < 1)) return choked;
        // The maximum of h, at delta* = 1 - sqrt(beta): 1 - beta - beta F + beta ln(beta).
        double top = 1 - beta - betaF + beta * 2 * Math.Log(rootBeta);
        if (!(top >= 0) || double.IsNaN(top)) return choked;

        double deltaStar = 1 - rootBeta, delta;
        int iterations = 0;
        var solverStatus = SolveStatus.ClosedForm;
        if (betaF == 0)
        {
            delta = 0; // the drop underflows: p2 = p1 to double precision
        }
        else if (top == 0 || !(deltaStar > 0))
        {
            delta = deltaStar; // exactly at the limit
        }
        else
        {
            // Start: the relation without its acceleration term, p2^2 = p1^2 (1 - beta F).
            double start = betaF < 1 ? betaF / (1 + Math.Sqrt(1 - betaF)) : 0.5 * deltaStar;
            var root = SafeguardedNewton.Solve(new DropEquation(beta, betaF), Bracket.KnownIncreasing(0, deltaStar),
                start, DeltaOptions, trace);
            (delta, iterations, solverStatus) = (root.Root, root.Iterations, root.Status);
        }
        double p2 = p1 - p1 * delta;
        double residual = Residual(p1, p2, beta, betaF);
        var status = solverStatus.IsConverged() ? GasFlowStatus.Solved : GasFlowStatus.NotConverged;
        return new GasFlowResult(status, p1, p2, g, friction, limit, iterations, residual, solverStatus,
            Classify(status, p2, g, c, limit), gas, line);
    }

    /// <summary>The mass flow between two pressures.</summary>
    /// <param name="line">The pipe.</param>
    /// <param name="gas">The gas.</param>
    /// <param name="inletPressure">p1, Pa (absolute); finite and positive.</param>
    /// <param name="outletPressure">p2, Pa (absolute); finite, positive and below p1.</param>
    /// <param name="trace">Optional record of the solve in ln G (allocates).</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain (the parameter name says which).</exception>
    public static GasFlowResult SolveMassFlow(in GasLine line, in GasProperties gas, double inletPressure, double outletPressure,
        SolverTrace? trace = null)
    {
        Guard(line, gas, inletPressure);
        Positive(outletPressure, nameof(outletPressure));
        if (!(outletPressure < inletPressure))
            throw new ArgumentOutOfRangeException(nameof(outletPressure), outletPressure, "must be below the inlet pressure");
        double p1 = inletPressure, p2 = outletPressure;
        var limit = LargestMassFlux(line, gas, p1);
        var none = new GasFlowResult(GasFlowStatus.OutsideRange, p1, p2, double.NaN, default, limit, 0, double.NaN,
            SolveStatus.NonFiniteValue, GasWarnings.None, gas, line);

        double delta = (p1 - p2) / p1;
        double a = delta * (2 - delta);                       // (p1^2 - p2^2) / p1^2
        double lg = PressureLog(p1, p2, delta);               // 2 ln(p1/p2)
        double c = gas.PressurePerDensity, mu = gas.DynamicViscosity, d = line.Diameter;
        double lnC = Math.Log(c), lnD = Math.Log(d), lnMu = Math.Log(mu);
        double lnTarget = Math.Log(a) + 2 * Math.Log(p1) - lnC; // ln((p1^2 - p2^2)/C) = ln(G^2 (F + lg))
        double lnLd = Math.Log(line.Length) - lnD;

        // Laminar root: G^2 (b/G + lg) = A with b = 64 mu L / D^2 (f L/D = b/G), in logs so nothing overflows.
        double lnB = Math.Log(64) + lnMu + lnLd - lnD;
        double lnQ = 0.5 * lnTarget;                           // sqrt(A)
        double lnCq = lnB - lnQ;                               // b / sqrt(A)
        double lnDen = lnCq > 300 ? Math.Log(2) + lnCq
            : Math.Log(Math.Exp(lnCq) + Math.Sqrt(Math.Exp(2 * lnCq) + 4 * lg));
        double lnGLam = Math.Log(2) + lnQ - lnDen;
        double lnReLam = lnGLam + lnD - lnMu;
        if (!double.IsFinite(lnReLam) || lnReLam < Math.Log(DarcyFriction.MinimumReynolds)) return none;

        double lnReLaminar = Math.Log(FrictionOptions.Default.LaminarLimit);
        double lo = Math.Log(0.5) + Math.Min(lnReLam, lnReLaminar) - lnD + lnMu;
        double lnReCap = Math.Log(0.5 * DarcyFriction.MaximumReynolds);
        double hi = lnReLam < lnReLaminar ? lnGLam + 1e-9 : Math.Min(lnGLam, lnReCap - lnD + lnMu);
        if (!(lo < hi) || !double.IsFinite(lo) || !double.IsFinite(hi)) return none;

        // Start: f at the fully turbulent end of the Moody chart's middle (0.02, common practice), corrected once.
        double start = 0.5 * (lnTarget - Math.Log(0.02 * Math.Exp(lnLd) + lg));
        var equation = new FluxEquation(lnTarget, lg, lnLd, lnD - lnMu, line.RelativeRoughness);
        var root = SafeguardedNewton.Solve(equation, Bracket.Checked(lo, hi), double.IsFinite(start) ? start : 0.5 * (lo + hi),
            LogOptions, trace);
        if (root.Status is SolveStatus.NoSignChange or SolveStatus.NonFiniteValue)
            return none with { Iterations = root.Iterations, SolverStatus = root.Status };

        double g = Math.Exp(root.Root);
        double re = Math.Clamp(g * d / mu, DarcyFriction.MinimumReynolds, DarcyFriction.MaximumReynolds);
        var friction = DarcyFriction.Compute(re, line.RelativeRoughness);
        double rootBeta = g * Math.Sqrt(c) / p1;
        double beta = rootBeta * rootBeta;
        double betaF = BetaF(beta, friction.FrictionFactor, line, lnLd, rootBeta);
        if (!(p2 >= g * Math.Sqrt(c)))
            return none with { Status = GasFlowStatus.Choked, MassFlux = g, Friction = friction, Iterations = root.Iterations, SolverStatus = root.Status };

        double residual = Residual(p1, p2, beta, betaF);
        var status = root.Converged ? GasFlowStatus.Solved : GasFlowStatus.NotConverged;
        var warnings = Classify(status, p2, g, c, limit);
        if (root.Converged && Math.Abs(equation.Evaluate(root.Root).Value) > JumpResidual)
        {
            // Converged onto a jump of the friction factor, not onto a root.
            status = GasFlowStatus.NotConverged;
            warnings = (warnings & ~GasWarnings.NotConverged) | GasWarnings.AtRegimeLimit;
        }
        return new GasFlowResult(status, p1, p2, g, friction, limit, root.Iterations, residual, root.Status, warnings, gas, line);
    }

    /// <summary>The largest mass flux the line passes from an inlet pressure (the isothermal limit).</summary>
    /// <param name="line">The pipe.</param>
    /// <param name="gas">The gas.</param>
    /// <param name="inletPressure">p1, Pa (absolute); finite and positive.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain (the parameter name says which).</exception>
    public static GasLimit LargestMassFlux(in GasLine line, in GasProperties gas, double inletPressure)
    {
        Guard(line, gas, inletPressure);
        double lnC = Math.Log(gas.PressurePerDensity), lnD = Math.Log(line.Diameter), lnMu = Math.Log(gas.DynamicViscosity);
        double lnG0 = Math.Log(inletPressure) - 0.5 * lnC;    // ln G at u = 0 (inlet at the limit velocity)
        double lnRe0 = lnG0 + lnD - lnMu;
        double uAtMaxRe = 2 * (lnRe0 - Math.Log(DarcyFriction.MaximumReynolds));
        double uAtMinRe = 2 * (lnRe0 - Math.Log(DarcyFriction.MinimumReynolds));
        var none = new GasLimit(double.NaN, double.NaN, double.NaN, 0, SolveStatus.NoSignChange, false);
        if (!(uAtMinRe > 0) || !double.IsFinite(uAtMinRe)) return none;
        // Below u = e^-1100 the residual is below -2000 + (the largest |ln(f L/D)| doubles allow): negative.
        double lo = uAtMaxRe > 0 ? Math.Log(uAtMaxRe) : -1100, hi = Math.Log(uAtMinRe);
        if (!(lo < hi)) return none;

        double lnLd = Math.Log(line.Length) - lnD;
        var equation = new LimitEquation(lnRe0, lnLd, line.RelativeRoughness);
        // Start: invert y - 1 - ln y = F for F from the friction factor at the inlet limit flux, sqrt(2F) for a short line.
        double f0 = DarcyFriction.Compute(Math.Clamp(Math.Exp(lnRe0), DarcyFriction.MinimumReynolds, DarcyFriction.MaximumReynolds),
            line.RelativeRoughness).FrictionFactor;
        double lnF0 = Math.Log(f0) + lnLd;
        double start = lnF0 < 0 ? 0.5 * (Math.Log(2) + lnF0) : Math.Log(Math.Log(1 + Math.Exp(lnF0) + lnF0 + 1));
        var root = SafeguardedNewton.Solve(equation, Bracket.Checked(lo, hi), double.IsFinite(start) ? start : 0.5 * (lo + hi), LogOptions);
        if (!root.Converged) return none with { Iterations = root.Iterations, SolverStatus = root.Status };
        double u = Math.Exp(root.Root);
        double g = Math.Exp(lnG0 - 0.5 * u);
        double pOut = Math.Exp(Math.Log(inletPressure) - 0.5 * u);
        return new GasLimit(g, pOut, Math.Exp(lnRe0 - 0.5 * u), root.Iterations, root.Status, double.IsFinite(g) && g > 0);
    }

    /// <summary>The relation's residual divided by p1^2, evaluated with the drop's own digits.</summary>
    private static double Residual(double p1, double p2, double beta, double betaF)
    {
        double delta = (p1 - p2) / p1;
        return delta * (2 - delta) - betaF - beta * PressureLog(p1, p2, delta);
    }

    /// <summary>beta f L/D as a product, or from the logarithms where the product over- or underflows.</summary>
    private static double BetaF(double beta, double f, in GasLine line, double lnLd, double rootBeta)
    {
        double product = beta * f * (line.Length / line.Diameter);
        return double.IsFinite(product) && product > 0 ? product : Math.Exp(2 * Math.Log(rootBeta) + Math.Log(f) + lnLd);
    }

    /// <summary>2 ln(p1/p2), as -2 log1p(-delta) for a small drop (full relative precision) and from the logarithms otherwise.</summary>
    internal static double PressureLog(double p1, double p2, double delta) =>
        delta < 0.5 ? -2 * Log1P(-delta) : 2 * (Math.Log(p1) - Math.Log(p2));

    /// <summary>ln(1 + x) to a few ulps for small x (Goldberg 1991, "What every computer scientist should know about
    /// floating-point arithmetic", ACM Computing Surveys 23(1), theorem 4): the BCL's double.LogP1 evaluates Log(1 + x)
    /// (it gives 0 for 1e-20), which loses the digits of a small drop.</summary>
    internal static double Log1P(double x)
    {
        double u = 1.0 + x;
        return u == 1.0 ? x : Math.Log(u) * x / (u - 1.0);
    }

    private static GasWarnings Classify(GasFlowStatus status, double p2, double g, double c, in GasLimit limit)
    {
        var w = GasWarnings.None;
        if (status == GasFlowStatus.NotConverged) w |= GasWarnings.NotConverged;
        if (g * Math.Sqrt(c) / p2 > NearLimitFraction || (limit.Found && g > NearLimitFlow * limit.MassFlux))
            w |= GasWarnings.NearIsothermalLimit;
        return w;
    }

    private static void Guard(in GasLine line, in GasProperties gas, double inletPressure)
    {
        Positive(line.Length, "length");
        Positive(line.Diameter, "diameter");
        if (!(line.Roughness >= 0) || !(line.Roughness < line.Diameter))
            throw new ArgumentOutOfRangeException("roughness", line.Roughness, "must be 0 or more and below the diameter");
        Positive(gas.MolarMass, "molarMass");
        if (!(gas.Temperature > -GasConstants.ZeroCelsius) || !double.IsFinite(gas.Temperature))
            throw new ArgumentOutOfRangeException("temperature", gas.Temperature, "must be finite and above absolute zero");
        Positive(gas.CompressibilityFactor, "compressibilityFactor");
        Positive(gas.DynamicViscosity, "dynamicViscosity");
        if (!(gas.HeatCapacityRatio >= 1) || !double.IsFinite(gas.HeatCapacityRatio))
            throw new ArgumentOutOfRangeException("heatCapacityRatio", gas.HeatCapacityRatio, "must be finite and at least 1");
        Positive(inletPressure, nameof(inletPressure));
    }

    private static void Positive(double value, string name)
    {
        if (!(value > 0) || !double.IsFinite(value)) throw new ArgumentOutOfRangeException(name, value, "must be finite and positive");
    }

    /// <summary>h(delta) = delta (2 - delta) - beta F + 2 beta ln(1 - delta): the relation over p1^2 in the relative drop.</summary>
    internal readonly struct DropEquation(double beta, double betaF) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double delta)
        {
            double x = 1 - delta;
            return (delta * (2 - delta) - betaF + 2 * beta * Log1P(-delta), 2 * x - 2 * beta / x);
        }
    }

    /// <summary>r(s) = 2 s + ln(F(e^s) + lg) - ln((p1^2 - p2^2)/C) in s = ln G.</summary>
    internal readonly struct FluxEquation(double lnTarget, double lg, double lnLd, double lnDOverMu, double relativeRoughness)
        : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double s)
        {
            double re = Math.Clamp(Math.Exp(s + lnDOverMu), DarcyFriction.MinimumReynolds, DarcyFriction.MaximumReynolds);
            var fr = DarcyFriction.Compute(re, relativeRoughness);
            double lOverD = Math.Exp(lnLd);
            double friction = fr.FrictionFactor * lOverD, sum = friction + lg;
            // d F / d s = (L/D) Re df/dRe.
            return (2 * s + Math.Log(sum) - lnTarget, 2 + lOverD * re * fr.DerivativeReynolds / sum);
        }
    }

    /// <summary>r(v) = ln(y - 1 - ln y) - ln(f L/D) in v = ln u, u = ln y, y = p1^2 / (C G^2).</summary>
    internal readonly struct LimitEquation(double lnRe0, double lnLd, double relativeRoughness) : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double v)
        {
            double u = Math.Exp(v);
            var (lnPsi, inversePsi) = Psi(u);
            double re = Math.Clamp(Math.Exp(lnRe0 - 0.5 * u), DarcyFriction.MinimumReynolds, DarcyFriction.MaximumReynolds);
            var fr = DarcyFriction.Compute(re, relativeRoughness);
            double slope = re * fr.DerivativeReynolds / fr.FrictionFactor; // d ln f / d ln Re
            // ln(y - 1 - ln y) = 2 v + ln psi(u); its v-derivative u (e^u - 1)/(e^u - 1 - u) = 1/psi + u.
            return (2 * v + lnPsi - Math.Log(fr.FrictionFactor) - lnLd, inversePsi + u + 0.5 * u * slope);
        }

        /// <summary>ln psi(u) and 1/psi(u), psi(u) = (e^u - 1 - u)/u^2: its series below 0.5 (no cancellation), the closed
        /// form up to 30, and the logarithm of e^u (1 - (1 + u) e^-u)/u^2 beyond (no overflow).</summary>
        internal static (double LnPsi, double InversePsi) Psi(double u)
        {
            if (u < 0.5)
            {
                // sum over n >= 2 of u^(n-2)/n!; 18 terms leave less than 0.5^18/20! (far below an ulp).
                double sum = 0;
                for (int n = 19; n >= 2; n--) sum = sum * u / (n + 1) + 1;
                double psi = 0.5 * sum; // nested as (1/2)(1 + u/3 (1 + u/4 (...)))
                return (Math.Log(psi), 1 / psi);
            }
            if (u <= 30)
            {
                double psi = (Math.Exp(u) - 1 - u) / (u * u);
                return (Math.Log(psi), 1 / psi);
            }
            double ln = u - 2 * Math.Log(u) + Log1P(-(1 + u) * Math.Exp(-u));
            return (ln, Math.Exp(-ln));
        }
    }
}
