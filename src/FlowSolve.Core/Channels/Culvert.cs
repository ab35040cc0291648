using System.Globalization;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>A culvert barrel: circular (diameter) or box (span and rise), with its full-flow properties.</summary>
public sealed record CulvertBarrel
{
    private CulvertBarrel(CulvertShape shape, double span, double rise)
    {
        Shape = shape;
        Span = span;
        Rise = rise;
        Section = shape == CulvertShape.Circular ? new CircularSection(rise) : new RectangularSection(span);
        FullArea = shape == CulvertShape.Circular ? Math.PI * rise * rise / 4 : span * rise;
        FullPerimeter = shape == CulvertShape.Circular ? Math.PI * rise : 2 * (span + rise);
    }

    /// <summary>A circular barrel.</summary>
    /// <param name="diameter">Inside diameter D, m; finite and greater than zero.</param>
    public static CulvertBarrel Circular(double diameter)
    {
        ChannelGuard.Positive(diameter, nameof(diameter));
        return new(CulvertShape.Circular, diameter, diameter);
    }

    /// <summary>A rectangular box barrel.</summary>
    /// <param name="span">Inside width B, m; finite and greater than zero.</param>
    /// <param name="rise">Inside height D, m; finite and greater than zero.</param>
    public static CulvertBarrel Box(double span, double rise)
    {
        ChannelGuard.Positive(span, nameof(span));
        ChannelGuard.Positive(rise, nameof(rise));
        return new(CulvertShape.Box, span, rise);
    }

    /// <summary>Circular or box.</summary>
    public CulvertShape Shape { get; }

    /// <summary>Inside width, m (the diameter for a circle).</summary>
    public double Span { get; }

    /// <summary>Inside height D, m (the diameter for a circle): the D of HW/D.</summary>
    public double Rise { get; }

    /// <summary>Area of the full barrel, m2.</summary>
    public double FullArea { get; }

    /// <summary>Wetted perimeter of the full barrel, m.</summary>
    public double FullPerimeter { get; }

    /// <summary>Hydraulic radius of the full barrel A/P, m.</summary>
    public double FullHydraulicRadius => FullArea / FullPerimeter;

    /// <summary>The open-channel section of the barrel running part full (a box as a rectangle of its span).</summary>
    public ChannelSection Section { get; }

    /// <summary>Flow area at a depth, capped at the full area at and above the crown, m2.</summary>
    public double AreaAt(double depth) => depth >= Rise ? FullArea : Section.At(Math.Max(depth, 0.0)).Area;
}

/// <summary>Which relation set the inlet-control headwater.</summary>
public enum CulvertInletRegime
{
    /// <summary>The unsubmerged (weir-like) equation: flow parameter at most 3.5.</summary>
    Unsubmerged,

    /// <summary>Between the two: interpolated linearly in the flow parameter from 3.5 to 4.0.</summary>
    Transition,

    /// <summary>The submerged (orifice-like) equation: flow parameter at least 4.0.</summary>
    Submerged,
}

/// <summary>Which control governs the headwater.</summary>
public enum CulvertControl
{
    /// <summary>The inlet: its headwater is the larger (ties go to the inlet).</summary>
    Inlet,

    /// <summary>The barrel and tailwater: the outlet-control headwater is the larger.</summary>
    Outlet,
}

/// <summary>A culvert's headwater under inlet and outlet control, the governing one, and what went into both.</summary>
public sealed record CulvertResult
{
    /// <summary>Headwater above the inlet invert under inlet control (HDS-5 Appendix A), m.</summary>
    public required double InletControlHeadwater { get; init; }

    /// <summary>Headwater above the inlet invert under outlet control (energy balance), m; negative when the barrel's fall exceeds the losses.</summary>
    public required double OutletControlHeadwater { get; init; }

    /// <summary>The larger of the two, m.</summary>
    public double Headwater => Math.Max(InletControlHeadwater, OutletControlHeadwater);

    /// <summary>Inlet when the inlet-control headwater is at least the outlet-control one.</summary>
    public CulvertControl Control => InletControlHeadwater >= OutletControlHeadwater ? CulvertControl.Inlet : CulvertControl.Outlet;

    /// <summary>Headwater over rise, HW/D.</summary>
    public required double HeadwaterRatio { get; init; }

    /// <summary>Which inlet relation applied.</summary>
    public required CulvertInletRegime InletRegime { get; init; }

    /// <summary>The flow parameter X = Ku Q / (A D^0.5) in the publication's foot-second units (ft^0.5/s).</summary>
    public required double FlowParameter { get; init; }

    /// <summary>Critical depth in the barrel, m, capped at the rise.</summary>
    public required double CriticalDepth { get; init; }

    /// <summary>Specific head at critical depth Hc = dc + Vc^2/(2g), m (used by the unsubmerged form 1).</summary>
    public required double CriticalHead { get; init; }

    /// <summary>Normal depth in the barrel, m; NaN where there is none (a flat or adverse slope, or a flow above the barrel's part-full capacity).</summary>
    public required double NormalDepth { get; init; }

    /// <summary>Mean velocity of the full barrel Q/A, m/s.</summary>
    public required double BarrelVelocity { get; init; }

    /// <summary>The outlet-control tailwater h0 = max(TW, (dc + D)/2), m above the outlet invert.</summary>
    public required double OutletControlTailwater { get; init; }

    /// <summary>Entrance loss ke V^2/(2g), m.</summary>
    public required double EntranceLoss { get; init; }

    /// <summary>Friction loss n^2 L V^2 / R^(4/3) (Manning, SI), m.</summary>
    public required double FrictionLoss { get; init; }

    /// <summary>Exit loss kx V^2/(2g) with kx = <see cref="Culvert.ExitLossCoefficient"/>, m.</summary>
    public required double ExitLoss { get; init; }

    /// <summary>Depth at the outlet used for the outlet velocity, m.</summary>
    public required double OutletDepth { get; init; }

    /// <summary>Mean velocity at the outlet, m/s.</summary>
    public required double OutletVelocity { get; init; }

    /// <summary>Newton steps of the depth solves (critical depths and normal depth), summed.</summary>
    public required int Iterations { get; init; }

    /// <summary>The largest relative residual of the depth solves at their answers.</summary>
    public required double Residual { get; init; }

    /// <summary>The stop status of the critical-depth solve at the design flow.</summary>
    public required SolveStatus Status { get; init; }

    /// <summary>True when every depth solve met its tolerance.</summary>
    public required bool Converged { get; init; }

    /// <summary>Warnings with stable codes.</summary>
    public required IReadOnlyList<CalculationWarning> Warnings { get; init; }

    /// <summary>The ranges that apply beside the values.</summary>
    public required IReadOnlyList<ValidityCheck> Validity { get; init; }
}

/// <summary>
/// Culvert headwater by the FHWA HDS-5 method (Schall et al. 2012, Hydraulic Design of Highway Culverts, 3rd ed.):
/// inlet control by the publication's Appendix A equations, outlet control by an energy balance over the full barrel,
/// the governing headwater the larger of the two. Headwater is measured above the inlet invert; the outlet invert lies
/// S L below it.
/// </summary>
/// <remarks>
/// <para>Inlet control, with the flow parameter X = Ku Q / (A D^0.5) in foot-second units (ft^0.5/s): unsubmerged form 1,
/// HW/D = Hc/D + K X^M + Ks S, with Hc = dc + Vc^2/(2g) the specific head at critical depth; form 2, HW/D = K X^M;
/// submerged, HW/D = c X^2 + Y + Ks S. The unsubmerged form applies up to X = 3.5, the submerged from X = 4.0, and the
/// headwater between them is interpolated linearly in X between the two end values (HDS-5 Appendix A, from memory).</para>
/// <para>Ku: the publication fits X in ft^0.5/s and prints Ku = 1.0 for customary units and 1.811 for SI (from memory).
/// That is the exact change of unit sqrt(1 ft / 1 m)^-1 = 1/sqrt(0.3048) = 1.81130..., used here unrounded with Q in
/// m3/s and lengths in m, so SI and customary answers agree to rounding.</para>
/// <para>Outlet control: HW = h0 + (1 + ke) V^2/(2g) + n^2 L V^2 / R^(4/3) - S L with V = Q/A of the full barrel, the exit
/// loss coefficient 1, and h0 the larger of the tailwater and (dc + D)/2 (HDS-5, chapter on outlet control, from memory).</para>
/// <para>Outlet velocity (HDS-5, from memory): under inlet control the normal-depth velocity in the barrel (full barrel when
/// the normal depth reaches the crown or does not exist on a positive slope); under outlet control the velocity at the
/// larger of critical depth and tailwater, capped at the full barrel.</para>
/// </remarks>
public static class Culvert
{
    /// <summary>Ku for SI: 1/sqrt(0.3048) exactly, the change of the flow parameter from m^0.5/s to ft^0.5/s (HDS-5 prints 1.811).</summary>
    public static readonly double UnitCoefficientSi = 1.0 / Math.Sqrt(0.3048);

    /// <summary>The exit loss coefficient of the outlet-control balance: the full velocity head is lost at the outlet.</summary>
    public const double ExitLossCoefficient = 1.0;

    /// <summary>The flow parameter up to which the unsubmerged equation applies.</summary>
    public const double UnsubmergedLimit = 3.5;

    /// <summary>The flow parameter from which the submerged equation applies.</summary>
    public const double SubmergedLimit = 4.0;

    /// <summary>HW/D above which an answer warns (common practice: many agencies limit design headwater to 1.2 D; local standards govern).</summary>
    public const double HeadwaterRatioLimit = 1.2;

    /// <summary>Outlet velocity above which an answer warns, m/s: 4.5 m/s (about 15 ft/s), above which outlet protection or an
    /// energy dissipator is usually needed (common practice; local standards set their own limits).</summary>
    public const double OutletVelocityLimit = 4.5;

    /// <summary>HW/D below which an outlet-control answer of a barrel running part full warns: 0.75, below which the
    /// (dc + D)/2 approximation loses accuracy and a backwater calculation is needed (HDS-5, from memory).</summary>
    public const double PartlyFullLimit = 0.75;

    /// <summary>The publication's source line for the method, for answers and documentation.</summary>
    public const string Source =
        "FHWA HDS-5: Schall et al. (2012), Hydraulic Design of Highway Culverts, 3rd ed., FHWA-HIF-12-026: Appendix A (inlet control) " +
        "and the outlet-control energy balance (from memory)";

    private const double G = Physical.StandardGravity;

    /// <summary>Headwater of a culvert under inlet and outlet control.</summary>
    /// <param name="barrel">The barrel.</param>
    /// <param name="length">Barrel length L, m; finite and greater than zero.</param>
    /// <param name="slope">Barrel slope S, m/m, positive falling toward the outlet; finite, between -1 and 1.</param>
    /// <param name="manningN">Manning n of the barrel, s m^-1/3; finite and greater than zero.</param>
    /// <param name="entranceLossCoefficient">ke; finite and not negative.</param>
    /// <param name="inlet">The inlet-control coefficients.</param>
    /// <param name="flow">Discharge Q, m3/s; finite and greater than zero.</param>
    /// <param name="tailwaterDepth">Tailwater depth above the outlet invert, m; finite and not negative.</param>
    /// <param name="trace">Optional per-iteration record of the critical-depth solve at the design flow.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is out of its domain.</exception>
    public static CulvertResult Solve(CulvertBarrel barrel, double length, double slope, double manningN, double entranceLossCoefficient,
        CulvertInletCoefficients inlet, double flow, double tailwaterDepth, SolverTrace? trace = null)
    {
        ArgumentNullException.ThrowIfNull(barrel);
        ChannelGuard.Positive(length, nameof(length));
        if (!(Math.Abs(slope) < 1)) throw new ArgumentOutOfRangeException(nameof(slope), slope, "must lie between -1 and 1");
        ChannelGuard.Positive(manningN, nameof(manningN));
        ChannelGuard.NonNegative(entranceLossCoefficient, nameof(entranceLossCoefficient));
        ChannelGuard.Positive(flow, nameof(flow));
        ChannelGuard.NonNegative(tailwaterDepth, nameof(tailwaterDepth));
        if (inlet.Form is not (1 or 2)) throw new ArgumentOutOfRangeException(nameof(inlet), inlet.Form, "the form must be 1 or 2");
        if (!(inlet.K > 0) || !(inlet.M > 0) || !(inlet.C > 0) || !double.IsFinite(inlet.K) || !double.IsFinite(inlet.M) ||
            !double.IsFinite(inlet.C) || !double.IsFinite(inlet.Y) || !double.IsFinite(inlet.SlopeCoefficient))
            throw new ArgumentOutOfRangeException(nameof(inlet), "K, M and c must be finite and positive, Y and Ks finite");

        double d = barrel.Rise, area = barrel.FullArea;
        var warnings = new List<CalculationWarning>();
        int iterations = 0;
        double residual = 0;
        bool converged = true;

        // Critical depth at the design flow (Q^2 T = g A^3 in the barrel's part-full section), capped at the rise.
        var critical = CriticalFlow.CriticalDepth(barrel.Section, flow, trace);
        Count(critical, ref iterations, ref residual, ref converged, warnings, "critical depth");
        double dc = Math.Min(critical.CriticalDepth, d);
        double hc = CriticalHead(barrel, flow, dc);

        // Inlet control.
        double x = UnitCoefficientSi * flow / (area * Math.Sqrt(d));
        double ks = inlet.SlopeCoefficient;
        double ratio;
        CulvertInletRegime regime;
        if (x <= UnsubmergedLimit)
        {
            regime = CulvertInletRegime.Unsubmerged;
            ratio = Unsubmerged(inlet, x, hc / d, slope);
        }
        else if (x >= SubmergedLimit)
        {
            regime = CulvertInletRegime.Submerged;
            ratio = Submerged(inlet, x, slope);
        }
        else
        {
            regime = CulvertInletRegime.Transition;
            // The unsubmerged end needs the critical head at the flow where X = 3.5.
            double hcAtLimit = hc;
            if (inlet.Form == 1)
            {
                double flowAtLimit = UnsubmergedLimit * area * Math.Sqrt(d) / UnitCoefficientSi;
                var atLimit = CriticalFlow.CriticalDepth(barrel.Section, flowAtLimit);
                Count(atLimit, ref iterations, ref residual, ref converged, warnings, "critical depth at the end of the unsubmerged range");
                hcAtLimit = CriticalHead(barrel, flowAtLimit, Math.Min(atLimit.CriticalDepth, d));
            }
            double low = Unsubmerged(inlet, UnsubmergedLimit, hcAtLimit / d, slope);
            double high = Submerged(inlet, SubmergedLimit, slope);
            double t = (x - UnsubmergedLimit) / (SubmergedLimit - UnsubmergedLimit);
            ratio = low + t * (high - low);
            warnings.Add(new("inlet-control-transition", string.Create(CultureInfo.InvariantCulture,
                $"The flow parameter Ku Q/(A D^0.5) = {x:G4} lies between 3.5 and 4.0, between the unsubmerged and submerged inlet equations: the inlet-control headwater is interpolated linearly between them (HDS-5, Appendix A).")));
        }
        double inletHeadwater = ratio * d;

        // Outlet control: energy balance over the full barrel.
        double v = flow / area;
        double velocityHead = v * v / (2 * G);
        double r = barrel.FullHydraulicRadius;
        double entrance = entranceLossCoefficient * velocityHead;
        double friction = manningN * manningN * length * v * v / Math.Pow(r, 4.0 / 3.0);
        double exit = ExitLossCoefficient * velocityHead;
        double h0 = Math.Max(tailwaterDepth, 0.5 * (dc + d));
        double outletHeadwater = h0 + entrance + friction + exit - slope * length;

        // Normal depth in the barrel (for the outlet velocity under inlet control).
        double yn = double.NaN;
        if (slope > 0)
        {
            var normal = ManningSolver.NormalDepth(barrel.Section, flow, slope, manningN);
            if (normal.Solution != DepthSolution.None)
            {
                iterations += normal.Iterations;
                residual = Math.Max(residual, Math.Abs(normal.Residual));
                if (!normal.Converged)
                {
                    converged = false;
                    warnings.Add(new("not-converged", "normal depth: the solve stopped without meeting its tolerance (" + normal.Status.Reason() + ")."));
                }
                yn = normal.NormalDepth;
            }
        }

        bool inletGoverns = inletHeadwater >= outletHeadwater;
        double outletDepth;
        if (inletGoverns && slope > 0)
            outletDepth = double.IsNaN(yn) ? d : Math.Min(yn, d);
        else
            outletDepth = Math.Min(Math.Max(dc, tailwaterDepth), d);
        double outletVelocity = flow / barrel.AreaAt(outletDepth);
        if (inletGoverns && !(slope > 0))
            warnings.Add(new("no-normal-depth", "The barrel is flat or adverse, so it has no normal depth: the outlet velocity under inlet control is taken at the larger of critical depth and tailwater, as under outlet control."));

        double headwater = Math.Max(inletHeadwater, outletHeadwater);
        double headwaterRatio = headwater / d;
        if (headwaterRatio > HeadwaterRatioLimit)
            warnings.Add(new("headwater-ratio-high", string.Create(CultureInfo.InvariantCulture,
                $"The headwater is {headwaterRatio:G4} times the barrel's rise, above 1.2, a common design limit (common practice; local standards govern the allowable headwater).")));
        if (outletVelocity > OutletVelocityLimit)
            warnings.Add(new("outlet-velocity-high", string.Create(CultureInfo.InvariantCulture,
                $"The outlet velocity {outletVelocity:G4} m/s is above 4.5 m/s (about 15 ft/s): scour at the outlet is likely, and outlet protection or an energy dissipator is usually needed (common practice).")));
        if (!inletGoverns && h0 < d && outletHeadwater < PartlyFullLimit * d)
            warnings.Add(new("outlet-control-partly-full", string.Create(CultureInfo.InvariantCulture,
                $"Outlet control governs with the barrel running part full and the headwater {outletHeadwater / d:G4} D, below 0.75 D: the (dc + D)/2 approximation of HDS-5 loses accuracy here, and a backwater calculation of the barrel is needed.")));
        if (headwater <= 0)
            warnings.Add(new("headwater-below-invert", "Both headwaters lie at or below the inlet invert: the slope term outweighs the flow terms, so the equations are outside their range at this flow and slope."));

        var validity = new List<ValidityCheck>
        {
            regime switch
            {
                CulvertInletRegime.Unsubmerged => new ValidityCheck("hds5-unsubmerged", Source, "flowParameter", 0, UnsubmergedLimit, x),
                CulvertInletRegime.Submerged => new ValidityCheck("hds5-submerged", Source, "flowParameter", SubmergedLimit, double.PositiveInfinity, x),
                _ => new ValidityCheck("hds5-transition", Source + "; linear interpolation between the forms", "flowParameter", UnsubmergedLimit, SubmergedLimit, x),
            },
            new ManningValidity(manningN, manningN >= ManningValidity.TypicalLowestN && manningN <= ManningValidity.TypicalHighestN).Check,
        };

        return new CulvertResult
        {
            InletControlHeadwater = inletHeadwater, OutletControlHeadwater = outletHeadwater, HeadwaterRatio = headwaterRatio,
            InletRegime = regime, FlowParameter = x, CriticalDepth = dc, CriticalHead = hc, NormalDepth = yn, BarrelVelocity = v,
            OutletControlTailwater = h0, EntranceLoss = entrance, FrictionLoss = friction, ExitLoss = exit, OutletDepth = outletDepth,
            OutletVelocity = outletVelocity, Iterations = iterations, Residual = residual, Status = critical.Status, Converged = converged,
            Warnings = warnings, Validity = validity,
        };
    }

    /// <summary>HW/D of the unsubmerged equation: form 1 with Hc/D and the slope term, form 2 without either.</summary>
    public static double Unsubmerged(CulvertInletCoefficients inlet, double flowParameter, double criticalHeadRatio, double slope) =>
        inlet.Form == 1
            ? criticalHeadRatio + inlet.K * Math.Pow(flowParameter, inlet.M) + inlet.SlopeCoefficient * slope
            : inlet.K * Math.Pow(flowParameter, inlet.M);

    /// <summary>HW/D of the submerged equation, c X^2 + Y + Ks S.</summary>
    public static double Submerged(CulvertInletCoefficients inlet, double flowParameter, double slope) =>
        inlet.C * flowParameter * flowParameter + inlet.Y + inlet.SlopeCoefficient * slope;

    private static double CriticalHead(CulvertBarrel barrel, double flow, double dc)
    {
        double vc = flow / barrel.AreaAt(dc);
        return dc + vc * vc / (2 * G);
    }

    private static void Count(in CriticalDepthResult r, ref int iterations, ref double residual, ref bool converged,
        List<CalculationWarning> warnings, string what)
    {
        iterations += r.Iterations;
        residual = Math.Max(residual, Math.Abs(r.Residual));
        if (!r.Converged)
        {
            converged = false;
            warnings.Add(new("not-converged", what + ": the solve stopped without meeting its tolerance (" + r.Status.Reason() + ")."));
        }
    }
}
