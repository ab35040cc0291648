using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core.Channels;
using FlowSolve.Core.Numerics;
using System.ComponentModel;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Channels;

/// <summary>Normal and critical depth from a body's section object or a query's top-level section fields (whose
/// problems name the fields as typed: <c>section.bottomWidth</c> in a body, <c>bottomWidth</c> in a query).</summary>
internal static class ChannelDepths
{
    public static Outcome<NormalDepthResponse> NormalDepth(NormalDepthRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        if (request.Section is null) errors.Add("section", "is required: an object with shape and its dimensions");
        return NormalDepth(request.Section is null ? null : SectionFields.From(request.Section), "section.",
            request.ManningN, request.Slope, request.Flow, request.Units, errors, context);
    }

    public static Outcome<NormalDepthResponse> NormalDepth(NormalDepthQuery q, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var fields = new SectionFields(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter,
            ChannelInput.ParsePoints(q.Points, errors));
        return NormalDepth(fields, "", q.ManningN, q.Slope, q.Flow, q.Units, errors, context);
    }

    public static Outcome<CriticalDepthResponse> CriticalDepth(CriticalDepthRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        if (request.Section is null) errors.Add("section", "is required: an object with shape and its dimensions");
        return CriticalDepth(request.Section is null ? null : SectionFields.From(request.Section), "section.",
            request.ManningN, request.Flow, request.Units, errors, context);
    }

    public static Outcome<CriticalDepthResponse> CriticalDepth(CriticalDepthQuery q, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var fields = new SectionFields(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter,
            ChannelInput.ParsePoints(q.Points, errors));
        return CriticalDepth(fields, "", q.ManningN, q.Flow, q.Units, errors, context);
    }

    private static Outcome<NormalDepthResponse> NormalDepth(
        SectionFields? fields, string prefix, double? manningN, double? slope, double? flow, string? unitsText, FieldErrors errors,
        in CalculationContext context)
    {
        var units = new ChannelUnits(UnitSystem.Parse(unitsText, errors));
        var assumptions = new List<AssumptionDto>();
        var section = fields is null ? null : ChannelInput.Read(fields, prefix, units, errors, assumptions);
        double? n = ChannelInput.ManningN(manningN, required: fields?.HasOwnRoughness != true, errors);
        double s = errors.Required("slope", slope, 0, 1, minExclusive: true, unit: "m/m");
        double q = errors.Required("flow", flow, 0, ChannelInput.MaximumFlow(units), minExclusive: true, unit: units.FlowUnit);
        if (errors.Any || section is null) return ProblemResults.BadInput(errors);

        double qSi = units.FlowToSi(q);
        var trace = context.Trace ? new SolverTrace() : null;
        var r = n is double nn ? ManningSolver.NormalDepth(section, qSi, s, nn, trace) : ManningSolver.NormalDepth(section, qSi, s, trace);

        // The Core marks a flow beyond capacity with Solution = None and NaN depths: answer 422 before anything is serialised.
        if (r.Solution == DepthSolution.None)
            return r.Capacity is ChannelCapacity c ? BeyondCapacity(section, q, c, units) : Unrepresentable();

        // A critical solve that stopped short (its not-converged warning is in the list) has no depth worth quoting.
        double? criticalDepth = Finite(r.CriticalDepth) && r.Critical.Converged ? units.Length(r.CriticalDepth) : null;
        double? criticalSlope = criticalDepth is not null && Finite(r.CriticalSlope) ? r.CriticalSlope : null;
        var response = new NormalDepthResponse(
            units.Length(r.NormalDepth),
            r.AlternateNormalDepth is double alt ? units.Length(alt) : null,
            r.AlternateNormalDepths.Count > 0 ? r.AlternateNormalDepths.Select(units.Length).ToArray() : null,
            units.Area(r.Area), units.Length(r.WettedPerimeter), units.Length(r.HydraulicRadius), units.Length(r.TopWidth),
            units.Velocity(r.Velocity), r.FroudeNumber, RegimeCode(r.Regime), units.Length(r.SpecificEnergy), r.EffectiveManningN,
            criticalDepth, criticalSlope, r.Capacity is ChannelCapacity cap ? Capacity(cap, units) : null,
            ShapeCode(section.Shape), units.System.Code,
            r.Iterations, r.Converged, r.Residual, r.Status.Code(), r.Method,
            [ValidityDto.From(r.Validity.Check)],
            Warnings(r.Warnings, units), CommonAssumptions(assumptions, unitsText, units, n));
        if (!AllFinite(response.NormalDepth, response.Area, response.WettedPerimeter, response.HydraulicRadius, response.TopWidth,
                response.Velocity, response.FroudeNumber, response.SpecificEnergy, response.EffectiveManningN, response.Residual))
            return Unrepresentable();
        if (trace is not null) response = response with { Trace = TraceStepDto.From(trace) };
        if (context.Sensitivities && r.Converged)
        {
            double nUsed = n ?? 0.0;
            var d = ChannelSensitivity.NormalDepth(section, r.NormalDepth, qSi, s, nUsed);
            var b = new SensitivityBuilder();
            void Add(string input, double value, in ChannelOutputDerivatives e)
            {
                b.Add("normalDepth", r.NormalDepth, input, value, e.Depth);
                b.Add("velocity", r.Velocity, input, value, e.Velocity);
                b.Add("froudeNumber", r.FroudeNumber, input, value, e.FroudeNumber);
            }
            Add("flow", qSi, d.Flow);
            Add("slope", s, d.Slope);
            if (n is double given) Add("manningN", given, d.ManningN);
            AddDimensions(fields!, prefix, section, d, Add);
            response = response with { Sensitivities = b.Build() };
        }
        return response;
    }

    /// <summary>The section's own dimensions, named as the request gave them (sideSlope moves both sides at once).</summary>
    private static void AddDimensions(SectionFields fields, string prefix, ChannelSection section, in ChannelSensitivities d,
        DimensionSink add)
    {
        switch (section)
        {
            case RectangularSection rect: add(prefix + "bottomWidth", rect.Width, d.BottomWidth); break;
            case TrapezoidalSection t:
                add(prefix + "bottomWidth", t.BottomWidth, d.BottomWidth);
                Sides(t.LeftSideSlope, t.RightSideSlope, d, add);
                break;
            case TriangularSection t: Sides(t.LeftSideSlope, t.RightSideSlope, d, add); break;
            case CircularSection c: add(prefix + "diameter", c.Diameter, d.Diameter); break;
        }

        void Sides(double left, double right, in ChannelSensitivities d, DimensionSink add)
        {
            if (fields.SideSlope is not null)
                add(prefix + "sideSlope", left, new ChannelOutputDerivatives(d.LeftSideSlope.Depth + d.RightSideSlope.Depth,
                    d.LeftSideSlope.Velocity + d.RightSideSlope.Velocity, d.LeftSideSlope.FroudeNumber + d.RightSideSlope.FroudeNumber));
            else
            {
                add(prefix + "leftSideSlope", left, d.LeftSideSlope);
                add(prefix + "rightSideSlope", right, d.RightSideSlope);
            }
        }
    }

    private delegate void DimensionSink(string input, double value, in ChannelOutputDerivatives derivatives);

    private static Outcome<CriticalDepthResponse> CriticalDepth(
        SectionFields? fields, string prefix, double? manningN, double? flow, string? unitsText, FieldErrors errors,
        in CalculationContext context)
    {
        var units = new ChannelUnits(UnitSystem.Parse(unitsText, errors));
        var assumptions = new List<AssumptionDto>();
        var section = fields is null ? null : ChannelInput.Read(fields, prefix, units, errors, assumptions);
        double? n = ChannelInput.ManningN(manningN, required: false, errors);
        double q = errors.Required("flow", flow, 0, ChannelInput.MaximumFlow(units), minExclusive: true, unit: units.FlowUnit);
        if (errors.Any || section is null) return ProblemResults.BadInput(errors);

        double qSi = units.FlowToSi(q);
        var trace = context.Trace ? new SolverTrace() : null;
        var r = n is double nn ? CriticalFlow.CriticalDepth(section, qSi, nn, trace) : CriticalFlow.CriticalDepth(section, qSi, trace);
        if (r.Solution == DepthSolution.None)
        {
            double top = units.Length(section.MaximumDepth);
            return ProblemResults.NoAnswer("No critical depth in the section.", string.Create(CultureInfo.InvariantCulture,
                $"The critical depth of {q:G6} {units.FlowUnit} would lie above the lower bank top ({top:G6} {units.LengthUnit} above the invert): the section is too small to pass this flow at critical depth. Extend the survey to higher ground."),
                new Dictionary<string, object?> { ["flow"] = q, ["fullDepth"] = top, ["units"] = units.System.Code });
        }
        if (r.Status is SolveStatus.NoSignChange or SolveStatus.NonFiniteValue) return Unrepresentable();

        if (n is null && r.CriticalSlope is double cs && !double.IsNaN(cs))
            assumptions.Add(new("manningN", "section's own", "the critical slope uses the n that every surveyed segment carries"));
        var response = new CriticalDepthResponse(
            units.Length(r.CriticalDepth),
            r.AlternateCriticalDepths.Count > 0 ? r.AlternateCriticalDepths.Select(units.Length).ToArray() : null,
            units.Area(r.Area), units.Length(r.TopWidth), units.Velocity(r.Velocity), units.Length(r.SpecificEnergy),
            Finite(r.CriticalSlope) ? r.CriticalSlope : null, ShapeCode(section.Shape), units.System.Code,
            r.Iterations, r.Converged, r.Residual, r.Status.Code(), r.Method,
            Warnings(r.Warnings, units), CommonAssumptions(assumptions, unitsText, units, n));
        if (!AllFinite(response.CriticalDepth, response.Area, response.TopWidth, response.Velocity, response.SpecificEnergy, response.Residual))
            return Unrepresentable();
        if (trace is not null) response = response with { Trace = TraceStepDto.From(trace) };
        if (context.Sensitivities && r.Converged)
        {
            var d = ChannelSensitivity.CriticalDepth(section, r.CriticalDepth, qSi);
            var b = new SensitivityBuilder();
            void Add(string input, double value, in ChannelOutputDerivatives e)
            {
                b.Add("criticalDepth", r.CriticalDepth, input, value, e.Depth);
                b.Add("velocity", r.Velocity, input, value, e.Velocity);
            }
            Add("flow", qSi, d.Flow);
            AddDimensions(fields!, prefix, section, d, Add);
            response = response with { Sensitivities = b.Build() };
        }
        return response;
    }

    /// <summary>422 for a flow above a part-full pipe's peak discharge or one that overtops a surveyed section, in the request's units.</summary>
    private static ProblemHttpResult BeyondCapacity(ChannelSection section, double flow, ChannelCapacity c, ChannelUnits units)
    {
        var capacity = Capacity(c, units);
        string fu = units.FlowUnit, lu = units.LengthUnit;
        string detail = section is CircularSection
            ? string.Create(CultureInfo.InvariantCulture,
                $"{flow:G6} {fu} exceeds the pipe's greatest part-full discharge, {capacity.MaximumFlow:G6} {fu} at a depth of {capacity.DepthAtMaximumFlow:G6} {lu} (y/D = {CircularSection.PeakDischargeDepthRatio:F4}), for this slope and n; the full-pipe discharge is {capacity.FullFlow:G6} {fu}. The pipe would run surcharged: choose a larger pipe or a steeper slope, or check it as a pressure conduit.")
            : string.Create(CultureInfo.InvariantCulture,
                $"{flow:G6} {fu} overtops the section: its greatest discharge below the lower bank top ({capacity.FullDepth:G6} {lu} above the invert) is {capacity.MaximumFlow:G6} {fu} at a depth of {capacity.DepthAtMaximumFlow:G6} {lu}, for this slope and roughness. Extend the survey to higher ground or check the overbank flow separately.");
        return ProblemResults.NoAnswer("The flow exceeds the section's capacity.", detail,
            new Dictionary<string, object?> { ["flow"] = flow, ["capacity"] = capacity, ["units"] = units.System.Code });
    }

    private static ProblemHttpResult Unrepresentable() =>
        ProblemResults.NoAnswer("The result cannot be represented.",
            "The inputs are valid one by one, but together they put the depth so close to the invert or the crown, or the figures so far out of scale, that the solution cannot be resolved in double precision. Check the units and the orders of magnitude of the inputs.");

    private static ChannelCapacityDto Capacity(ChannelCapacity c, ChannelUnits units) =>
        new(units.Flow(c.MaximumFlow), units.Length(c.DepthAtMaximumFlow), units.Flow(c.FullFlow), units.Length(c.FullDepth));

    /// <summary>The Core's messages quote SI figures; with units=us say so rather than leave the reader to guess.</summary>
    private static IReadOnlyList<WarningDto> Warnings(IReadOnlyList<ChannelWarning> warnings, ChannelUnits units) =>
        warnings.Select(w => new WarningDto(w.CodeText,
            units.IsUs && QuotesFigures(w.Code) ? w.Message + " (The figures in this message are SI: m, m2, m3/s.)" : w.Message)).ToArray();

    private static bool QuotesFigures(ChannelWarningCode code) => code is ChannelWarningCode.TwoNormalDepths
        or ChannelWarningCode.MultipleNormalDepths or ChannelWarningCode.ExceedsCapacity or ChannelWarningCode.ConveyanceJump
        or ChannelWarningCode.MultipleCriticalDepths or ChannelWarningCode.NoCriticalDepthInSection
        or ChannelWarningCode.VelocityAboveDesignRange or ChannelWarningCode.VelocityBelowDesignRange;

    private static List<AssumptionDto> CommonAssumptions(List<AssumptionDto> list, string? unitsText, ChannelUnits units, double? n)
    {
        if (unitsText is null) list.Add(new("units", "si", "SI units (default)"));
        if (units.IsUs && n is double value)
            list.Add(new("manningN", value.ToString("R", CultureInfo.InvariantCulture),
                "Manning n is used unchanged; lengths are converted at 0.3048 m/ft exactly, which gives the customary k = 1.486 in Q = (k/n) A R^(2/3) S^(1/2)"));
        list.Add(new("gravity", "9.80665 m/s2", "standard gravity"));
        list.Add(new("energyCoefficient", "1", "uniform velocity over the section in the specific energy and the Froude number (common practice)"));
        return list;
    }

    private static bool Finite(double value) => double.IsFinite(value);

    private static bool AllFinite(params double[] values) => values.All(double.IsFinite);

    private static string RegimeCode(FroudeRegime regime) => regime switch
    {
        FroudeRegime.Subcritical => "subcritical",
        FroudeRegime.Critical => "critical",
        _ => "supercritical",
    };

    private static string ShapeCode(SectionShape shape) => shape switch
    {
        SectionShape.Rectangular => "rectangular",
        SectionShape.Trapezoidal => "trapezoidal",
        SectionShape.Triangular => "triangular",
        SectionShape.Circular => "circular",
        _ => "surveyed",
    };
}
