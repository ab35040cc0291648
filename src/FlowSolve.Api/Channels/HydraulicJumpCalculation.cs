using System.ComponentModel;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core.Channels;
using FlowSolve.Core.Numerics;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Channels;

/// <summary>Inputs of the hydraulic-jump calculation as a JSON body.</summary>
public sealed record HydraulicJumpRequest(
    [property: Description("The cross-section: an object with shape and its dimensions, as for the normal depth.")]
    SectionInput? Section,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    double? Flow,
    [property: Description("Depth before the jump, m (ft with units=us): supercritical (Froude number above 1), greater than 0 and within the section.")]
    double? UpstreamDepth,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the sequent-depth solve (solve variable: the depth y, m).")]
    bool? Trace = null) : ITraceable;

/// <summary>Inputs of the hydraulic-jump calculation as query parameters: the section's fields stand at the top level.</summary>
public sealed record HydraulicJumpQuery(
    [property: Description("Shape of the section: rectangular, trapezoidal, triangular, circular or surveyed.")]
    [FromQuery(Name = "shape")] string? Shape,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    [FromQuery(Name = "flow")] double? Flow,
    [property: Description("Depth before the jump, m (ft with units=us): supercritical (Froude number above 1), greater than 0 and within the section.")]
    [FromQuery(Name = "upstreamDepth")] double? UpstreamDepth,
    [property: Description("Bottom width b, m (ft with units=us); greater than 0. Rectangular and trapezoidal sections.")]
    [FromQuery(Name = "bottomWidth")] double? BottomWidth = null,
    [property: Description("Side slope z of both sides, horizontal per unit vertical (dimensionless). Trapezoidal (0 or more) and triangular (greater than 0) sections.")]
    [FromQuery(Name = "sideSlope")] double? SideSlope = null,
    [property: Description("Left side slope, horizontal per unit vertical (dimensionless); with rightSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "leftSideSlope")] double? LeftSideSlope = null,
    [property: Description("Right side slope, horizontal per unit vertical (dimensionless); with leftSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "rightSideSlope")] double? RightSideSlope = null,
    [property: Description("Inside diameter D, m (ft with units=us); greater than 0. Circular sections.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Surveyed points, left to right, as station:elevation pairs separated by commas (for example 0:2,4:0,7:0,11:2); m (ft with units=us); at least 3 points.")]
    [FromQuery(Name = "points")] string? Points = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    [FromQuery(Name = "units")] string? Units = null,
    [property: Description("When true, include the solver's per-iteration record of the sequent-depth solve.")]
    [FromQuery(Name = "trace")] bool? Trace = null) : ITraceable;

/// <summary>A hydraulic jump: the depths on both sides, the Froude numbers and the energy dissipated.</summary>
/// <param name="SequentDepth">Depth after the jump (the sequent or conjugate depth), m (ft with units=us).</param>
/// <param name="UpstreamDepth">Depth before the jump, as given.</param>
/// <param name="CriticalDepth">Critical depth of the flow in the section (the lowest, for a survey with several).</param>
/// <param name="UpstreamFroudeNumber">Froude number Q sqrt(T/(g A^3)) before the jump.</param>
/// <param name="DownstreamFroudeNumber">Froude number after the jump.</param>
/// <param name="UpstreamVelocity">Mean velocity before the jump, m/s (ft/s).</param>
/// <param name="DownstreamVelocity">Mean velocity after the jump, m/s (ft/s).</param>
/// <param name="UpstreamSpecificEnergy">Specific energy y + V^2/(2g) before the jump, m (ft).</param>
/// <param name="DownstreamSpecificEnergy">Specific energy after the jump, m (ft).</param>
/// <param name="EnergyLoss">Energy dissipated in the jump, m (ft): the difference of the specific energies.</param>
/// <param name="MomentumFunction">The momentum function per unit weight A ybar + Q^2/(g A), equal on both sides, m3 (ft3).</param>
/// <param name="JumpLength">Length of the jump, 6.1 times the sequent depth (Peterka 1958, a horizontal rectangular apron), m (ft); see validity and warnings for its range.</param>
/// <param name="Shape">The section's shape.</param>
/// <param name="Units">si or us.</param>
/// <param name="Iterations">Newton steps of the sequent-depth solve.</param>
/// <param name="Converged">True when the sequent depth met its tolerance.</param>
/// <param name="Residual">|M(y2) - M(y1)| / M(y1) at the answer.</param>
/// <param name="Status">The solver's stop status.</param>
/// <param name="Method">The relations used.</param>
/// <param name="Validity">The ranges that apply beside the values.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
public sealed record HydraulicJumpResponse(
    double SequentDepth, double UpstreamDepth, double CriticalDepth, double UpstreamFroudeNumber, double DownstreamFroudeNumber,
    double UpstreamVelocity, double DownstreamVelocity, double UpstreamSpecificEnergy, double DownstreamSpecificEnergy,
    double EnergyLoss, double MomentumFunction, double JumpLength, string Shape, string Units,
    int Iterations, bool Converged, double Residual, string Status, string Method,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : ISolveSummary, ISensitive
{
    /// <summary>Present only with sensitivities=true: d(sequentDepth, energyLoss)/d(flow, upstreamDepth), SI, by implicit differentiation of the momentum equation.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }

    /// <summary>Present only with trace=true: the per-iteration record of the sequent-depth solve (solve variable: the depth y, m).</summary>
    public IReadOnlyList<TraceStepDto>? Trace { get; init; }
}

/// <summary>The hydraulic jump: <c>GET</c> and <c>POST /v1/channels/hydraulic-jump</c>.</summary>
public sealed class HydraulicJumpCalculation : Calculation<HydraulicJumpQuery, HydraulicJumpRequest, HydraulicJumpResponse>
{
    private const string Method =
        "momentum equation M(y1) = M(y2), M = A ybar + Q^2/(g A) with A ybar the first moment of the area about the surface " +
        "(Belanger 1828 for the rectangle), solved by safeguarded Newton in y with dM/dy = A (1 - Fr^2); jump length 6.1 y2 (Peterka 1958)";

    public override CalculationInfo Info { get; } = new("channels/hydraulic-jump", "Channels", "HydraulicJump", "sequentDepth",
        "Hydraulic jump: sequent depth, energy loss and length",
        "The depth after a hydraulic jump (the sequent or conjugate depth) from a supercritical depth before it, by the momentum " +
        "equation for a short horizontal reach: M(y) = A ybar + Q^2/(g A) is equal on both sides, where A ybar, the first moment of " +
        "the flow area about the water surface, is the integral of the area over depth (closed forms for the rectangle, trapezoid, " +
        "triangle and part-full circle; exact piecewise integration for a surveyed section). For the rectangle this is Belanger's " +
        "y2/y1 = (sqrt(1 + 8 Fr1^2) - 1)/2. Also the Froude numbers, velocities and specific energies on both sides, the energy " +
        "dissipated, and the jump length 6.1 y2 (Peterka 1958, USBR Engineering Monograph 25, measured on horizontal rectangular " +
        "aprons for upstream Froude numbers 4.5 to 13; warned outside them and for other shapes).\n\n" +
        "An upstream depth that is not supercritical answers 400 naming upstreamDepth (with the critical depth); a sequent depth " +
        "above the top of a pipe or survey answers 422. SI by default; units=us takes and returns ft, ft2, ft3/s, ft/s. Section " +
        "fields as for the normal depth (in a GET at the top level of the query). Gravity is standard gravity, 9.80665 m/s2. Not " +
        "covered: jumps on sloping aprons, forced jumps with baffles, air entrainment, and the design of stilling basins, which " +
        "follows its own standards. sensitivities=true adds d(sequentDepth, energyLoss)/d(flow, upstreamDepth) by implicit " +
        "differentiation of the momentum equation.\n\n" + OpenApiSetup.Cautions);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("shape", "rectangular"), ("bottomWidth", "3"), ("flow", "15"), ("upstreamDepth", "0.6")];

    public override HydraulicJumpRequest BodyExample { get; } =
        new(new SectionInput("trapezoidal", BottomWidth: 2, SideSlope: 1.5), Flow: 10, UpstreamDepth: 0.3);

    public override Outcome<HydraulicJumpResponse> Solve(HydraulicJumpRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        if (request.Section is null) errors.Add("section", "is required: an object with shape and its dimensions");
        return Solve(request.Section is null ? null : SectionFields.From(request.Section), "section.", request.Flow, request.UpstreamDepth,
            request.Units, errors, context);
    }

    protected override Outcome<HydraulicJumpResponse> SolveQuery(HydraulicJumpQuery q, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var fields = new SectionFields(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter,
            ChannelInput.ParsePoints(q.Points, errors));
        return Solve(fields, "", q.Flow, q.UpstreamDepth, q.Units, errors, context);
    }

    protected override HydraulicJumpRequest FromQuery(HydraulicJumpQuery q) =>
        new(ChannelInput.Section(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter, q.Points),
            q.Flow, q.UpstreamDepth, q.Units, q.Trace);

    private static Outcome<HydraulicJumpResponse> Solve(SectionFields? fields, string prefix, double? flow, double? upstreamDepth,
        string? unitsText, FieldErrors errors, in CalculationContext context)
    {
        var units = new ChannelUnits(UnitSystem.Parse(unitsText, errors));
        var assumptions = new List<AssumptionDto>();
        var section = fields is null ? null : ChannelInput.Read(fields, prefix, units, errors, assumptions);
        double q = errors.Required("flow", flow, 0, ChannelInput.MaximumFlow(units), minExclusive: true, unit: units.FlowUnit);
        double y1 = errors.Required("upstreamDepth", upstreamDepth, 0, ChannelInput.MaximumLength(units), minExclusive: true, unit: units.LengthUnit);
        if (section is not null && !errors.Has("upstreamDepth") && units.LengthToSi(y1) > section.MaximumDepth)
            errors.Add("upstreamDepth", string.Create(System.Globalization.CultureInfo.InvariantCulture,
                $"must lie within the section (at most {units.Length(section.MaximumDepth):G6} {units.LengthUnit} above the invert)"));
        if (errors.Any || section is null) return ProblemResults.BadInput(errors);

        double qSi = units.FlowToSi(q), y1Si = units.LengthToSi(y1);
        var trace = context.Trace ? new SolverTrace() : null;
        var r = HydraulicJump.Solve(section, qSi, y1Si, trace);
        double yc = CriticalFlow.CriticalDepth(section, qSi).CriticalDepth;
        if (r.Status == JumpStatus.NotSupercritical)
            return ProblemResults.BadInput("upstreamDepth", string.Create(System.Globalization.CultureInfo.InvariantCulture,
                $"is not supercritical: its Froude number is {r.UpstreamFroudeNumber:G4} (a jump forms only from a depth below the critical depth, {units.Length(yc):G6} {units.LengthUnit} here)"));
        if (r.Status == JumpStatus.AboveSection)
            return ProblemResults.NoAnswer("No sequent depth in the section.", string.Create(System.Globalization.CultureInfo.InvariantCulture,
                $"The depth after the jump would lie above the top of the section ({units.Length(section.MaximumDepth):G6} {units.LengthUnit}): a pipe would run full (a surcharged jump, outside the open-channel momentum balance) or the survey would overtop."));

        if (unitsText is null) assumptions.Add(new("units", "si", "SI units (default)"));
        assumptions.Add(new("gravity", "9.80665 m/s2", "standard gravity"));
        assumptions.Add(new("momentumCoefficient", "1", "uniform velocity over the section, hydrostatic pressure, no bed friction or slope over the jump (common practice)"));
        double volume = units.Length(1.0) * units.Length(1.0) * units.Length(1.0);
        var validity = r.Validity.Select(v => ValidityDto.From(v)).ToArray();
        var warnings = r.Warnings.Select(WarningDto.From).ToArray();
        var response = new HydraulicJumpResponse(
            units.Length(r.SequentDepth), y1, units.Length(yc), r.UpstreamFroudeNumber, r.DownstreamFroudeNumber,
            units.Velocity(r.UpstreamVelocity), units.Velocity(r.DownstreamVelocity),
            units.Length(r.UpstreamSpecificEnergy), units.Length(r.DownstreamSpecificEnergy), units.Length(r.EnergyLoss),
            r.MomentumFunction * volume, units.Length(r.JumpLength), section.Shape.ToString().ToLowerInvariant(), units.System.Code,
            r.Iterations, r.Converged, r.Residual, r.SolverStatus.Code(), Method, validity, warnings, assumptions)
        {
            Trace = TraceStepDto.From(trace),
        };
        if (context.Sensitivities && r.Converged)
        {
            var d = HydraulicJump.Sensitivities(section, qSi, y1Si, r.SequentDepth);
            var b = new SensitivityBuilder();
            b.Add("sequentDepth", r.SequentDepth, "flow", qSi, d.SequentByFlow);
            b.Add("sequentDepth", r.SequentDepth, "upstreamDepth", y1Si, d.SequentByUpstreamDepth);
            b.Add("energyLoss", r.EnergyLoss, "flow", qSi, d.LossByFlow);
            b.Add("energyLoss", r.EnergyLoss, "upstreamDepth", y1Si, d.LossByUpstreamDepth);
            response = response with { Sensitivities = b.Build() };
        }
        return response;
    }
}
