using System.ComponentModel;
using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Channels;
using FlowSolve.Core.Numerics;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Channels;

/// <summary>Inputs of the culvert calculation, as query parameters (GET) or a JSON body (POST): every field is a scalar.</summary>
public sealed record CulvertRequest(
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    [FromQuery(Name = "flow")] double? Flow = null,
    [property: Description("Inside diameter D of a circular barrel, m (ft with units=us); greater than 0. Give this, or span and rise for a box.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Inside width B of a box barrel, m (ft with units=us); greater than 0; with rise, instead of diameter.")]
    [FromQuery(Name = "span")] double? Span = null,
    [property: Description("Inside height D of a box barrel, m (ft with units=us); greater than 0; with span, instead of diameter.")]
    [FromQuery(Name = "rise")] double? Rise = null,
    [property: Description("Barrel length L, m (ft with units=us); greater than 0.")]
    [FromQuery(Name = "length")] double? Length = null,
    [property: Description("Barrel slope S, m/m (dimensionless), positive falling toward the outlet; between -1 and 1 (exclusive). The outlet invert lies S L below the inlet invert.")]
    [FromQuery(Name = "slope")] double? Slope = null,
    [property: Description("Manning n of the barrel, s m^-1/3 (quoted the same in both unit systems); greater than 0, at most 1.")]
    [FromQuery(Name = "manningN")] double? ManningN = null,
    [property: Description("Entrance loss coefficient ke (dimensionless), 0 to 5. Optional with inletType (the row's ke is the default); required with explicit coefficients.")]
    [FromQuery(Name = "entranceLossCoefficient")] double? EntranceLossCoefficient = null,
    [property: Description("Tailwater depth TW above the outlet invert, m (ft with units=us); 0 or more.")]
    [FromQuery(Name = "tailwaterDepth")] double? TailwaterDepth = null,
    [property: Description("A named inlet from the shipped table of HDS-5 (2012) Table A.1 rows (see the description for the names). Give this, or the explicit coefficients inletForm, inletK, inletM, inletC and inletY, not both.")]
    [FromQuery(Name = "inletType")] string? InletType = null,
    [property: Description("Explicit coefficients: the unsubmerged equation's form, 1 (HW/D = Hc/D + K X^M + Ks S) or 2 (HW/D = K X^M).")]
    [FromQuery(Name = "inletForm")] int? InletForm = null,
    [property: Description("Explicit coefficients: K of the unsubmerged equation (dimensionless, with X in the publication's foot-second units); greater than 0, at most 10.")]
    [FromQuery(Name = "inletK")] double? InletK = null,
    [property: Description("Explicit coefficients: exponent M of the unsubmerged equation; greater than 0, at most 5.")]
    [FromQuery(Name = "inletM")] double? InletM = null,
    [property: Description("Explicit coefficients: c of the submerged equation HW/D = c X^2 + Y + Ks S; greater than 0, at most 1.")]
    [FromQuery(Name = "inletC")] double? InletC = null,
    [property: Description("Explicit coefficients: Y of the submerged equation; 0 to 5.")]
    [FromQuery(Name = "inletY")] double? InletY = null,
    [property: Description("Explicit coefficients: slope coefficient Ks, -5 to 5; default -0.5 (+0.7 is the publication's value for a mitered inlet).")]
    [FromQuery(Name = "inletKs")] double? InletKs = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    [FromQuery(Name = "units")] string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the critical-depth solve at the design flow.")]
    [FromQuery(Name = "trace")] bool? Trace = null) : ITraceable;

/// <summary>The inlet coefficients and loss coefficients the answer used, with their source.</summary>
/// <param name="InletType">The named inlet, or null for explicit coefficients.</param>
/// <param name="Form">Form of the unsubmerged equation, 1 or 2.</param>
/// <param name="K">K of the unsubmerged equation.</param>
/// <param name="M">Exponent M of the unsubmerged equation.</param>
/// <param name="C">c of the submerged equation.</param>
/// <param name="Y">Y of the submerged equation.</param>
/// <param name="Ks">Slope coefficient Ks.</param>
/// <param name="Ku">The unit coefficient of the flow parameter X = Ku Q/(A D^0.5): 1/sqrt(0.3048) = 1.8113 with Q, A and D in SI (the publication prints 1.811), the equivalent of 1.0 in foot-second units. Answers in either unit system are computed in SI with this value.</param>
/// <param name="EntranceLossCoefficient">ke used in the outlet-control balance.</param>
/// <param name="ExitLossCoefficient">Exit loss coefficient used in the outlet-control balance (1: the full velocity head).</param>
/// <param name="Source">Where the coefficients come from.</param>
public sealed record CulvertCoefficientsDto(string? InletType, int Form, double K, double M, double C, double Y, double Ks, double Ku,
    double EntranceLossCoefficient, double ExitLossCoefficient, string Source);

/// <summary>A culvert's headwater under inlet and outlet control, the governing one, and the outlet velocity.</summary>
/// <param name="Headwater">The governing headwater above the inlet invert: the larger of the two controls, m (ft with units=us).</param>
/// <param name="Control">inlet or outlet: which control governs (ties go to the inlet).</param>
/// <param name="InletControlHeadwater">Headwater above the inlet invert under inlet control (HDS-5 Appendix A), m (ft).</param>
/// <param name="OutletControlHeadwater">Headwater above the inlet invert under outlet control (energy balance), m (ft); negative when the barrel's fall exceeds the losses (outlet control cannot govern then).</param>
/// <param name="HeadwaterRatio">Governing headwater over the rise, HW/D.</param>
/// <param name="InletRegime">unsubmerged, transition or submerged: which inlet relation applied.</param>
/// <param name="FlowParameter">X = Ku Q / (A D^0.5) in the publication's foot-second units, ft^0.5/s, whatever units were asked for.</param>
/// <param name="OutletVelocity">Mean velocity at the outlet, m/s (ft/s).</param>
/// <param name="OutletDepth">Depth at the outlet behind that velocity, m (ft).</param>
/// <param name="BarrelVelocity">Velocity of the full barrel Q/A, m/s (ft/s).</param>
/// <param name="CriticalDepth">Critical depth in the barrel, capped at the rise, m (ft).</param>
/// <param name="CriticalHead">Specific head at critical depth Hc = dc + Vc^2/(2g), m (ft).</param>
/// <param name="NormalDepth">Normal depth in the barrel, m (ft); absent on a flat or adverse slope or above the barrel's part-full capacity.</param>
/// <param name="OutletControlTailwater">h0 = max(TW, (dc + D)/2), the tailwater of the outlet-control balance, m (ft).</param>
/// <param name="EntranceLoss">Entrance loss ke V^2/(2g), m (ft).</param>
/// <param name="FrictionLoss">Friction loss n^2 L V^2 / R^(4/3) (Manning, SI), m (ft).</param>
/// <param name="ExitLoss">Exit loss V^2/(2g) times the exit loss coefficient, m (ft).</param>
/// <param name="Coefficients">The inlet and loss coefficients used, with their source.</param>
/// <param name="Shape">circular or box.</param>
/// <param name="Units">si or us.</param>
/// <param name="Iterations">Newton steps of the depth solves (critical and normal depths), summed.</param>
/// <param name="Converged">True when every depth solve met its tolerance.</param>
/// <param name="Residual">The largest relative residual of the depth solves at their answers.</param>
/// <param name="Status">The stop status of the critical-depth solve at the design flow.</param>
/// <param name="Method">The relations used.</param>
/// <param name="Validity">The ranges that apply beside the values.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
public sealed record CulvertResponse(
    double Headwater, string Control, double InletControlHeadwater, double OutletControlHeadwater, double HeadwaterRatio,
    string InletRegime, double FlowParameter, double OutletVelocity, double OutletDepth, double BarrelVelocity,
    double CriticalDepth, double CriticalHead, double? NormalDepth, double OutletControlTailwater,
    double EntranceLoss, double FrictionLoss, double ExitLoss, CulvertCoefficientsDto Coefficients, string Shape, string Units,
    int Iterations, bool Converged, double Residual, string Status, string Method,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : ISolveSummary
{
    /// <summary>Present only with trace=true: the per-iteration record of the critical-depth solve at the design flow.</summary>
    public IReadOnlyList<TraceStepDto>? Trace { get; init; }
}

/// <summary>Culvert headwater by FHWA HDS-5: <c>GET</c> and <c>POST /v1/channels/culvert</c>.</summary>
public sealed class CulvertCalculation : Calculation<CulvertRequest, CulvertResponse>
{
    private static readonly string InletNames = string.Join(", ", CulvertInlets.All.Select(r =>
        string.Create(CultureInfo.InvariantCulture, $"{r.Name} ({r.Description}; form {r.Coefficients.Form}, K {r.Coefficients.K}, M {r.Coefficients.M}, c {r.Coefficients.C}, Y {r.Coefficients.Y}, Ks {r.Coefficients.SlopeCoefficient}, ke {r.EntranceLossCoefficient})")));

    internal const string MethodText =
        "inlet control: FHWA HDS-5 (2012) Appendix A, unsubmerged form 1 HW/D = Hc/D + K X^M + Ks S or form 2 HW/D = K X^M for X <= 3.5, " +
        "submerged HW/D = c X^2 + Y + Ks S for X >= 4.0, linear in X between, X = Ku Q/(A D^0.5), Ku = 1/sqrt(0.3048) in SI; " +
        "outlet control: HW = h0 + (ke + 1) V^2/(2g) + n^2 L V^2/R^(4/3) - S L, h0 = max(TW, (dc + D)/2); critical and normal depths by safeguarded Newton";

    public override CalculationInfo Info { get; } = new("channels/culvert", "Channels", "Culvert", "headwater",
        "Culvert headwater under inlet and outlet control (FHWA HDS-5)",
        "The headwater of a culvert, measured above the inlet invert, by the method of FHWA HDS-5 (Schall et al. 2012, Hydraulic " +
        "Design of Highway Culverts, 3rd ed., FHWA-HIF-12-026): the larger of the inlet-control and outlet-control headwaters " +
        "governs. A circular barrel (diameter) or a box (span and rise; D is the rise).\n\n" +
        "Inlet control (the publication's Appendix A): with the flow parameter X = Ku Q/(A D^0.5) (A the full barrel area), the " +
        "unsubmerged form 1 is HW/D = Hc/D + K X^M + Ks S with Hc = dc + Vc^2/(2g) the specific head at critical depth in the " +
        "barrel, form 2 is HW/D = K X^M, and the submerged form is HW/D = c X^2 + Y + Ks S. The unsubmerged form applies up to " +
        "X = 3.5 and the submerged from X = 4.0; between them the headwater is interpolated linearly in X between the two end " +
        "values (warned). The publication's coefficients are fitted with X in foot-second units (Ku = 1.0); in SI it prints " +
        "Ku = 1.811, which is 1/sqrt(0.3048) rounded. FlowSolve computes in SI with Ku = 1/sqrt(0.3048) exactly, so SI and " +
        "units=us answers agree to rounding; flowParameter is reported in ft^0.5/s either way.\n\n" +
        "The inlet: inletType names a row of the shipped table (HDS-5 (2012) Appendix A, Table A.1 for form, K, M, c, Y and Ks; " +
        "the publication's table of entrance loss coefficients for the default ke; every figure recalled, from memory: check " +
        "them against the publication), or the explicit coefficients inletForm, inletK, inletM, inletC, inletY and optionally " +
        "inletKs (default -0.5) are given instead; one or the other (400 if both or neither). Rows: " + InletNames + ".\n\n" +
        "Outlet control: an energy balance over the full barrel, HW = h0 + ke V^2/(2g) + n^2 L V^2/R^(4/3) + kx V^2/(2g) - S L, " +
        "with V = Q/A, R the full barrel's hydraulic radius (Manning in SI, R^(4/3) exactly), the exit loss coefficient kx = 1, " +
        "and h0 the larger of the tailwater and (dc + D)/2, as the publication does (dc capped at D). Below HW = 0.75 D with the " +
        "barrel part full, that approximation loses accuracy and a backwater calculation is needed (warned).\n\n" +
        "Outlet velocity: under inlet control the normal-depth velocity in the barrel (the full barrel when the normal depth " +
        "reaches the crown); under outlet control the velocity at the larger of critical depth and tailwater, capped at the full " +
        "barrel. Warnings: headwater above 1.2 D (a common design limit; local standards govern), outlet velocity above 4.5 m/s " +
        "(common practice), the inlet transition, a part-full outlet-control barrel below 0.75 D.\n\n" +
        "Flood design follows local standards (design flows, allowable headwater, freeboard, debris and blockage allowances); the " +
        "result does not replace a hydraulic model of the site. Not covered: tapered or improved inlets, multiple barrels, road " +
        "overtopping, sediment, buoyancy and structural design of the barrel. SI by default; units=us takes and returns ft, " +
        "ft3/s, ft/s. Gravity is standard gravity, 9.80665 m/s2.\n\n" + OpenApiSetup.Cautions)
    {
        Options = [],
    };

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("diameter", "1.2"), ("length", "40"), ("slope", "0.01"), ("manningN", "0.013"), ("inletType", "circular-concrete-square-edge-headwall"),
         ("flow", "1.5"), ("tailwaterDepth", "0.5")];

    // The Vandrel Vale scenario: a box culvert carrying the (invented) Vandrel Brook under the valley road.
    public override CulvertRequest BodyExample { get; } =
        new(Flow: 6.5, Span: 2.4, Rise: 1.5, Length: 28, Slope: 0.004, ManningN: 0.015, TailwaterDepth: 1.1,
            InletType: "box-wingwall-flare-30-to-75");

    public override Sheet Sheet(CulvertRequest request, CulvertResponse answer) => CulvertSheet.Build(request, answer);

    public override Outcome<CulvertResponse> Solve(CulvertRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var units = new ChannelUnits(UnitSystem.Parse(request.Units, errors));
        var assumptions = new List<AssumptionDto>();
        double maxLength = ChannelInput.MaximumLength(units);
        string lu = units.LengthUnit;

        // The barrel: a diameter, or a span and a rise.
        CulvertBarrel? barrel = null;
        bool circular = request.Diameter is not null;
        if (circular)
        {
            if (request.Span is not null || request.Rise is not null)
                errors.Add("diameter", "give either diameter (a circular barrel) or span and rise (a box), not both");
            double d = errors.Required("diameter", request.Diameter, 0, maxLength, minExclusive: true, unit: lu);
            if (!errors.Any) barrel = CulvertBarrel.Circular(units.LengthToSi(d));
        }
        else if (request.Span is null && request.Rise is null)
        {
            errors.Add("diameter", "is required: give diameter (a circular barrel) or span and rise (a box)");
        }
        else
        {
            double b = errors.Required("span", request.Span, 0, maxLength, minExclusive: true, unit: lu);
            double r = errors.Required("rise", request.Rise, 0, maxLength, minExclusive: true, unit: lu);
            if (!errors.Has("span") && !errors.Has("rise")) barrel = CulvertBarrel.Box(units.LengthToSi(b), units.LengthToSi(r));
        }

        double length = errors.Required("length", request.Length, 0, maxLength, minExclusive: true, unit: lu);
        double slope = errors.Required("slope", request.Slope, -1, 1, unit: "m/m");
        if (!errors.Has("slope") && Math.Abs(slope) >= 1) errors.Add("slope", "must lie strictly between -1 and 1");
        double? n = ChannelInput.ManningN(request.ManningN, required: true, errors);
        double flow = errors.Required("flow", request.Flow, 0, ChannelInput.MaximumFlow(units), minExclusive: true, unit: units.FlowUnit);
        double tailwater = errors.Required("tailwaterDepth", request.TailwaterDepth, 0, maxLength, unit: lu);
        double? ke = errors.Optional("entranceLossCoefficient", request.EntranceLossCoefficient, 0, 5);

        // The inlet: a named row, or explicit coefficients; one or the other.
        CulvertInletCoefficients coefficients = default;
        CulvertInletType? row = null;
        bool anyExplicit = request.InletForm is not null || request.InletK is not null || request.InletM is not null ||
                           request.InletC is not null || request.InletY is not null || request.InletKs is not null;
        if (request.InletType is not null)
        {
            if (anyExplicit)
                errors.Add("inletType", "give either inletType or the explicit coefficients (inletForm, inletK, inletM, inletC, inletY, inletKs), not both");
            row = CulvertInlets.Find(request.InletType);
            if (row is null)
                errors.Add("inletType", "is not a shipped inlet type; one of: " + string.Join(", ", CulvertInlets.All.Select(r => r.Name)));
            else if ((row.Shape == CulvertShape.Circular) != circular && (circular || request.Span is not null || request.Rise is not null))
                errors.Add("inletType", $"is a {(row.Shape == CulvertShape.Circular ? "circular" : "box")} inlet, but the barrel is {(circular ? "circular" : "a box")}");
            else
                coefficients = row.Coefficients;
        }
        else if (!anyExplicit)
        {
            errors.Add("inletType", "is required: give inletType (a shipped inlet) or the explicit coefficients inletForm, inletK, inletM, inletC and inletY");
        }
        else
        {
            int form = 0;
            if (request.InletForm is null) errors.Add("inletForm", "is required with explicit coefficients: 1 or 2");
            else if (request.InletForm is not (1 or 2)) errors.Add("inletForm", "must be 1 or 2");
            else form = request.InletForm.Value;
            double k = errors.Required("inletK", request.InletK, 0, 10, minExclusive: true);
            double m = errors.Required("inletM", request.InletM, 0, 5, minExclusive: true);
            double c = errors.Required("inletC", request.InletC, 0, 1, minExclusive: true);
            double y = errors.Required("inletY", request.InletY, 0, 5);
            double ks = errors.Optional("inletKs", request.InletKs, -5, 5) ?? CulvertInletCoefficients.UsualSlopeCoefficient;
            if (request.InletKs is null) assumptions.Add(new("inletKs", "-0.5", "the slope coefficient of every inlet but a mitered one (HDS-5, from memory)"));
            if (request.EntranceLossCoefficient is null)
                errors.Add("entranceLossCoefficient", "is required with explicit inlet coefficients (with inletType the row's ke is the default)");
            coefficients = new CulvertInletCoefficients(form, k, m, c, y, ks);
        }
        if (errors.Any || barrel is null || n is null) return ProblemResults.BadInput(errors);

        double keUsed = ke ?? row!.EntranceLossCoefficient;
        if (ke is null) assumptions.Add(new("entranceLossCoefficient", keUsed.ToString("R", CultureInfo.InvariantCulture),
            $"the entrance loss coefficient of the inlet type {row!.Name} (HDS-5's table of entrance loss coefficients, from memory)"));
        if (request.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));
        assumptions.Add(new("gravity", "9.80665 m/s2", "standard gravity"));
        assumptions.Add(new("exitLossCoefficient", "1", "the full velocity head is lost at the outlet (the channel's velocity below it neglected)"));

        var trace = context.Trace ? new SolverTrace() : null;
        var r2 = Culvert.Solve(barrel, units.LengthToSi(length), slope, n.Value, keUsed, coefficients, units.FlowToSi(flow),
            units.LengthToSi(tailwater), trace);

        var dto = new CulvertCoefficientsDto(row?.Name, coefficients.Form, coefficients.K, coefficients.M, coefficients.C, coefficients.Y,
            coefficients.SlopeCoefficient, Culvert.UnitCoefficientSi, keUsed, Culvert.ExitLossCoefficient,
            row?.Source ?? "explicit coefficients as given");
        return new CulvertResponse(
            units.Length(r2.Headwater), r2.Control == CulvertControl.Inlet ? "inlet" : "outlet",
            units.Length(r2.InletControlHeadwater), units.Length(r2.OutletControlHeadwater), r2.HeadwaterRatio,
            r2.InletRegime.ToString().ToLowerInvariant(), r2.FlowParameter, units.Velocity(r2.OutletVelocity), units.Length(r2.OutletDepth),
            units.Velocity(r2.BarrelVelocity), units.Length(r2.CriticalDepth), units.Length(r2.CriticalHead),
            double.IsNaN(r2.NormalDepth) ? null : units.Length(r2.NormalDepth), units.Length(r2.OutletControlTailwater),
            units.Length(r2.EntranceLoss), units.Length(r2.FrictionLoss), units.Length(r2.ExitLoss), dto,
            barrel.Shape == CulvertShape.Circular ? "circular" : "box", units.System.Code,
            r2.Iterations, r2.Converged, r2.Residual, r2.Status.Code(), MethodText,
            r2.Validity.Select(ValidityDto.From).ToArray(), r2.Warnings.Select(WarningDto.From).ToArray(), assumptions)
        {
            Trace = TraceStepDto.From(trace),
        };
    }
}

/// <summary>The culvert sheet: the inputs, both controls side by side, the losses, and a long section of the culvert.</summary>
public static class CulvertSheet
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public static Sheet Build(CulvertRequest q, CulvertResponse r)
    {
        bool us = r.Units == "us";
        string lu = us ? "ft" : "m", vu = us ? "ft/s" : "m/s", fu = us ? "ft3/s" : "m3/s";
        var sheet = new Sheet { Title = "Culvert headwater (FHWA HDS-5)", Calculation = "channels/culvert" };

        double rise = r.Shape == "circular" ? q.Diameter!.Value : q.Rise!.Value;
        if (r.Shape == "circular")
            sheet.Inputs.Add(new("Barrel", "circular, diameter D " + SheetHtml.Fmt(rise), lu, "as given"));
        else
            sheet.Inputs.Add(new("Barrel", $"box, span {SheetHtml.Fmt(q.Span!.Value)}, rise D {SheetHtml.Fmt(rise)}", lu, "as given"));
        sheet.Inputs.Add(new("Barrel length L", SheetHtml.Fmt(q.Length), lu, "as given"));
        sheet.Inputs.Add(new("Barrel slope S", SheetHtml.Fmt(q.Slope), "m/m", "as given"));
        sheet.Inputs.Add(new("Manning n", SheetHtml.Fmt(q.ManningN), "s m^-1/3", "as given"));
        sheet.Inputs.Add(new("Discharge Q", SheetHtml.Fmt(q.Flow), fu, "as given"));
        sheet.Inputs.Add(new("Tailwater depth TW", SheetHtml.Fmt(q.TailwaterDepth), lu, "above the outlet invert, as given"));
        var k = r.Coefficients;
        sheet.Inputs.Add(new("Inlet", k.InletType ?? "explicit coefficients", "", k.Source));
        sheet.Inputs.Add(new("Inlet coefficients", string.Create(C, $"form {k.Form}, K {k.K:G6}, M {k.M:G6}, c {k.C:G6}, Y {k.Y:G6}, Ks {k.Ks:G6}"), "",
            k.InletType is null ? "as given" : "from the table row"));
        sheet.Inputs.Add(new("Entrance loss coefficient ke", SheetHtml.Fmt(k.EntranceLossCoefficient), "-",
            q.EntranceLossCoefficient is null ? "the row's default" : "as given"));
        sheet.Inputs.Add(new("Exit loss coefficient", SheetHtml.Fmt(k.ExitLossCoefficient), "-", "the full velocity head"));
        sheet.Inputs.Add(new("Units", r.Units, "", q.Units is null ? "default" : "as given"));
        sheet.Assumptions.AddRange(r.Assumptions);

        sheet.Methods.Add(new("Inlet control, unsubmerged (X <= 3.5)",
            "form 1: HW/D = Hc/D + K X^M + Ks S, Hc = dc + Vc^2/(2g); form 2: HW/D = K X^M; X = Ku Q/(A D^0.5), Ku = 1/sqrt(0.3048) in SI",
            "FHWA HDS-5, Schall et al. (2012), Appendix A (from memory)"));
        sheet.Methods.Add(new("Inlet control, submerged (X >= 4.0)", "HW/D = c X^2 + Y + Ks S; between X = 3.5 and 4.0 linear in X between the end values",
            "FHWA HDS-5, Schall et al. (2012), Appendix A (from memory)"));
        sheet.Methods.Add(new("Outlet control", "HW = h0 + ke V^2/(2g) + n^2 L V^2/R^(4/3) + V^2/(2g) - S L, V = Q/A full, h0 = max(TW, (dc + D)/2)",
            "FHWA HDS-5, Schall et al. (2012), outlet control (from memory); Manning (1891) in SI"));
        sheet.Methods.Add(new("Critical and normal depth", "Q^2 T = g A^3; Q = (1/n) A R^(2/3) S^(1/2); safeguarded Newton",
            "Chow (1959), Open-Channel Hydraulics, chapters 4 and 6 (from memory)"));

        sheet.Results.Add(new("Headwater HW (governing)", SheetHtml.Fmt(r.Headwater), lu, r.Control + " control governs"));
        sheet.Results.Add(new("HW/D", SheetHtml.Fmt(r.HeadwaterRatio), "-", ""));
        sheet.Results.Add(new("Outlet velocity", SheetHtml.Fmt(r.OutletVelocity), vu, string.Create(C, $"at depth {r.OutletDepth:G6} {lu}")));
        sheet.Results.Add(new("Flow parameter X", SheetHtml.Fmt(r.FlowParameter), "ft^0.5/s", r.InletRegime));
        sheet.Results.Add(new("Critical depth dc", SheetHtml.Fmt(r.CriticalDepth), lu, r.CriticalDepth >= rise ? "capped at D" : ""));
        sheet.Results.Add(new("Critical head Hc", SheetHtml.Fmt(r.CriticalHead), lu, ""));
        sheet.Results.Add(new("Normal depth", r.NormalDepth is double yn ? SheetHtml.Fmt(yn) : "none", lu, r.NormalDepth is null ? "none (flat or adverse slope, or above part-full capacity)" : ""));
        sheet.Results.Add(new("Full-barrel velocity V", SheetHtml.Fmt(r.BarrelVelocity), vu, ""));

        string Mark(string control) => r.Control == control ? "governs" : "";
        sheet.Tables.Add(new SheetTable("controls", "Both controls", ["Control", $"Headwater ({lu})", "HW/D", "How", "Governs"],
        [
            ["inlet", SheetHtml.Fmt(r.InletControlHeadwater), SheetHtml.Fmt(r.InletControlHeadwater / rise), $"{r.InletRegime} equation, form {k.Form}", Mark("inlet")],
            ["outlet", SheetHtml.Fmt(r.OutletControlHeadwater), SheetHtml.Fmt(r.OutletControlHeadwater / rise),
                string.Create(C, $"h0 {r.OutletControlTailwater:G4} + losses {r.EntranceLoss + r.FrictionLoss + r.ExitLoss:G4} - S L {q.Slope!.Value * q.Length!.Value:G4}"),
                Mark("outlet")],
        ], "Headwater above the inlet invert; the larger governs."));

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual, "the largest relative residual of the critical- and normal-depth solves",
            r.Status, SheetParts.StopReason(r.Status), r.Shape == "circular" ? "x = ln(y/(D - y))" : "u = ln y", steps,
            string.Create(C, $"The depth solves behind this answer took {r.Iterations} iterations in all; the record lists the critical-depth solve at the design flow."));
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);
        sheet.Figures.Add(LongSection(q, r, rise, lu));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(ln ratio)", "Residual of the critical-flow condition at each iteration of the critical-depth solve, log scale; the last iteration is marked."));
        return sheet;
    }

    /// <summary>The culvert in long section (not to scale): inverts, crown, both headwaters at the inlet and the tailwater at the outlet.</summary>
    private static SheetFigure LongSection(CulvertRequest q, CulvertResponse r, double rise, string lu)
    {
        double len = q.Length!.Value, fall = q.Slope!.Value * len, tw = q.TailwaterDepth!.Value;
        double outletInvert = -fall;
        double top = Math.Max(Math.Max(r.InletControlHeadwater, r.OutletControlHeadwater), Math.Max(rise, outletInvert + Math.Max(tw, rise)));
        double bottom = Math.Min(0, outletInvert);
        double pad = 0.1 * (top - bottom) + 1e-9;
        // Room on the left for the two headwater lines and their labels, on the right for the tailwater.
        var plot = new SvgPlot("plot-culvert", "Long section (not to scale)", new PlotAxis($"distance from the inlet ({lu})", -0.6 * len, 1.3 * len),
            new PlotAxis($"height above the inlet invert ({lu})", bottom - pad, top + pad), height: 320);
        plot.Segment("invert", 0, 0, len, outletInvert, "invert", role: "barrel");
        plot.Segment("crown", 0, rise, len, outletInvert + rise, "crown", role: "barrel");
        plot.Level("inlet-control headwater", -0.55 * len, -0.35 * len, r.InletControlHeadwater, string.Create(C, $"inlet control {r.InletControlHeadwater:G4} {lu}"),
            accent: r.Control == "inlet", dashed: r.Control != "inlet");
        plot.Level("outlet-control headwater", -0.55 * len, -0.35 * len, r.OutletControlHeadwater, string.Create(C, $"outlet control {r.OutletControlHeadwater:G4} {lu}"),
            accent: r.Control == "outlet", dashed: r.Control != "outlet");
        plot.Level("tailwater", len, 1.08 * len, outletInvert + tw, string.Create(C, $"TW {tw:G4} {lu}"), accent: false);
        return new SheetFigure("long-section", plot.Render(),
            "The barrel between its inverts and crown (heights to scale, lengths not), with the inlet-control and outlet-control headwaters upstream of the inlet (the governing one in the accent colour) and the tailwater at the outlet.");
    }
}
