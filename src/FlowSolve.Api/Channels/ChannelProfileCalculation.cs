using System.ComponentModel;
using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Channels;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Channels;

/// <summary>Inputs of the water-surface profile as a JSON body.</summary>
public sealed record ChannelProfileRequest(
    [property: Description("The cross-section: an object with shape and its dimensions, as for the normal depth.")]
    SectionInput? Section,
    [property: Description("Manning n, s m^-1/3 (the same number with units=us); greater than 0 and at most 1.")]
    double? ManningN,
    [property: Description("Bed slope S0, m/m, falling along the flow; 0 for a horizontal bed, negative for an adverse one; -1 to 1.")]
    double? Slope,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    double? Flow,
    [property: Description("Reach length, m (ft with units=us); greater than 0.")]
    double? Length,
    [property: Description("The depth held at the control, m (ft with units=us): subcritical for a downstream control (a weir, a lake), supercritical for an upstream one (below a gate). Instead of it, a reach with a control at each end gives upstreamControlDepth and downstreamControlDepth.")]
    double? ControlDepth,
    [property: Description("Where the control is: downstream (default; subcritical flow) or upstream (supercritical flow).")]
    string? ControlAt = null,
    [property: Description("How many equally spaced stations to report, 2 to 1001; 21 when omitted.")]
    int? Stations = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    string? Units = null,
    [property: Description("The supercritical depth held at the upstream end (below a gate), m (ft with units=us); with downstreamControlDepth, the answer locates the hydraulic jump between the two profiles. Not with controlDepth or controlAt.")]
    double? UpstreamControlDepth = null,
    [property: Description("The subcritical depth held at the downstream end (a weir, a lake), m (ft with units=us); see upstreamControlDepth. Not with controlDepth or controlAt.")]
    double? DownstreamControlDepth = null);

/// <summary>Inputs of the water-surface profile as query parameters: the section's fields stand at the top level.</summary>
public sealed record ChannelProfileQuery(
    [property: Description("Shape of the section: rectangular, trapezoidal, triangular, circular or surveyed.")]
    [FromQuery(Name = "shape")] string? Shape,
    [property: Description("Manning n, s m^-1/3; greater than 0 and at most 1.")]
    [FromQuery(Name = "manningN")] double? ManningN,
    [property: Description("Bed slope S0, m/m, falling along the flow; 0 horizontal, negative adverse; -1 to 1.")]
    [FromQuery(Name = "slope")] double? Slope,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); greater than 0.")]
    [FromQuery(Name = "flow")] double? Flow,
    [property: Description("Reach length, m (ft with units=us); greater than 0.")]
    [FromQuery(Name = "length")] double? Length,
    [property: Description("The depth held at the control, m (ft with units=us).")]
    [FromQuery(Name = "controlDepth")] double? ControlDepth = null,
    [property: Description("downstream (default) or upstream.")]
    [FromQuery(Name = "controlAt")] string? ControlAt = null,
    [property: Description("How many equally spaced stations to report, 2 to 1001; 21 when omitted.")]
    [FromQuery(Name = "stations")] int? Stations = null,
    [property: Description("Bottom width b, m (ft with units=us). Rectangular and trapezoidal sections.")]
    [FromQuery(Name = "bottomWidth")] double? BottomWidth = null,
    [property: Description("Side slope z of both sides, horizontal per unit vertical. Trapezoidal and triangular sections.")]
    [FromQuery(Name = "sideSlope")] double? SideSlope = null,
    [property: Description("Left side slope, horizontal per unit vertical; with rightSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "leftSideSlope")] double? LeftSideSlope = null,
    [property: Description("Right side slope, horizontal per unit vertical; with leftSideSlope, instead of sideSlope.")]
    [FromQuery(Name = "rightSideSlope")] double? RightSideSlope = null,
    [property: Description("Inside diameter D, m (ft with units=us). Circular sections.")]
    [FromQuery(Name = "diameter")] double? Diameter = null,
    [property: Description("Surveyed points, left to right, as station:elevation pairs separated by commas; m (ft with units=us).")]
    [FromQuery(Name = "points")] string? Points = null,
    [property: Description("Unit system of the request and response: si (default) or us.")]
    [FromQuery(Name = "units")] string? Units = null,
    [property: Description("The supercritical depth held at the upstream end, m (ft with units=us); with downstreamControlDepth, instead of controlDepth: the answer locates the jump.")]
    [FromQuery(Name = "upstreamControlDepth")] double? UpstreamControlDepth = null,
    [property: Description("The subcritical depth held at the downstream end, m (ft with units=us); with upstreamControlDepth, instead of controlDepth.")]
    [FromQuery(Name = "downstreamControlDepth")] double? DownstreamControlDepth = null);

/// <summary>One station of the profile.</summary>
/// <param name="Distance">Distance from the downstream end, m (ft).</param>
/// <param name="Depth">Flow depth, m (ft).</param>
/// <param name="Velocity">Mean velocity, m/s (ft/s).</param>
/// <param name="FroudeNumber">Q sqrt(T/(g A^3)).</param>
/// <param name="SpecificEnergy">y + V^2/(2g), m (ft).</param>
/// <param name="FrictionSlope">Manning's friction slope, m/m.</param>
public sealed record ProfileStationDto(double Distance, double Depth, double Velocity, double FroudeNumber, double SpecificEnergy, double FrictionSlope);

/// <summary>A hydraulic jump inside the reach, between a supercritical profile from the upstream control and a subcritical one from the downstream control.</summary>
/// <param name="Distance">Where the jump stands, from the downstream end, m (ft).</param>
/// <param name="UpstreamDepth">The supercritical depth just upstream of it, m (ft).</param>
/// <param name="SequentDepth">The sequent depth after it, equal to the subcritical profile's depth there, m (ft).</param>
/// <param name="EnergyLoss">Specific energy lost in the jump, m (ft).</param>
/// <param name="UpstreamFroudeNumber">Froude number just upstream of it.</param>
/// <param name="JumpLength">Length by the rectangular apron relation L = 6.1 y2 (Peterka 1958), m (ft): an indication only in other shapes.</param>
/// <param name="Iterations">Newton steps of the root in distance.</param>
/// <param name="Residual">|sequent depth - subcritical depth| at the distance returned, relative to the sequent depth.</param>
public sealed record ProfileJumpDto(double Distance, double UpstreamDepth, double SequentDepth, double EnergyLoss, double UpstreamFroudeNumber,
    double JumpLength, int Iterations, double Residual);

/// <summary>A gradually varied water-surface profile.</summary>
/// <param name="NormalDepth">Normal depth; absent on a horizontal or adverse bed, or above a closed section's capacity.</param>
/// <param name="CriticalDepth">Critical depth (the lowest, for a survey with several).</param>
/// <param name="SlopeClass">mild, steep, critical, horizontal or adverse.</param>
/// <param name="ProfileType">M1, M2, M3, S1, S2, S3, C1, C3, H2, H3, A2 or A3; uniform when the control is the normal depth; with a jump, the upstream profile's class and the downstream one's joined by + (M3+M1).</param>
/// <param name="Stations">The stations from the downstream end (distance 0) upstream; fewer than asked where the profile stops at critical depth or the section's top.</param>
/// <param name="CriticalDepthDistance">Where the profile reaches critical depth inside the reach (distance from the downstream end); absent otherwise.</param>
/// <param name="Shape">The section's shape.</param>
/// <param name="Units">si or us.</param>
/// <param name="Iterations">Newton steps over all stations.</param>
/// <param name="Converged">True when every station's depth met its tolerance.</param>
/// <param name="Residual">The largest difference between a station's distance and the exact distance to its depth, relative to the reach length.</param>
/// <param name="Status">converged or not-converged.</param>
/// <param name="Method">The relations used.</param>
/// <param name="Validity">The ranges that apply beside the values.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
/// <param name="Jump">The hydraulic jump between the two controls; absent with one control, or when no jump forms inside the reach (a warning says why).</param>
public sealed record ChannelProfileResponse(
    double? NormalDepth, double CriticalDepth, string SlopeClass, string ProfileType, IReadOnlyList<ProfileStationDto> Stations,
    double? CriticalDepthDistance, string Shape, string Units, int Iterations, bool Converged, double Residual, string Status, string Method,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions,
    ProfileJumpDto? Jump = null) : ISolveSummary;

/// <summary>The water-surface profile of a prismatic channel: <c>GET</c> and <c>POST /v1/channels/profile</c>.</summary>
public sealed class ChannelProfileCalculation : Calculation<ChannelProfileQuery, ChannelProfileRequest, ChannelProfileResponse>
{
    private const string Method =
        "gradually varied flow dy/dx = (S0 - Sf)/(1 - Fr^2), Sf from Manning, energy coefficient 1: the distance to each depth by adaptive " +
        "Gauss-Kronrod quadrature of dx/dy (about 1e-13 relative), each station's depth by safeguarded Newton on that distance";

    public override CalculationInfo Info { get; } = new("channels/profile", "Channels", "ChannelProfile", "profileType",
        "Water-surface profile of a prismatic channel (gradually varied flow)",
        "The water surface between a control and the rest of a prismatic reach: dy/dx = (S0 - Sf)/(1 - Fr^2) with Fr^2 = Q^2 T/(g A^3) " +
        "and the friction slope Sf from Manning (energy coefficient 1). Solved exactly rather than by steps: the distance from the " +
        "control to a depth is the integral of dx/dy, evaluated by adaptive Gauss-Kronrod quadrature to about 1e-13 relative, and the " +
        "depth at each station is the root of that distance by safeguarded Newton (dx/dy is its derivative); each station's depth is " +
        "within 1e-9 of the exact solution. Distances run from the downstream end (0) to the upstream end (length). A downstream " +
        "control (a weir, a lake) holds a subcritical depth; an upstream control (below a gate) a supercritical one: the other way " +
        "round answers 400 naming controlDepth. The answer classifies the slope (mild, steep, critical, horizontal, adverse) and the " +
        "profile (M1, M2, M3, S1, S2, S3, C1, C3, H2, H3, A2, A3). Where the profile reaches critical depth inside the reach, the " +
        "answer says where (criticalDepthDistance, warning reaches-critical-depth) and gives no stations past it: a jump or a drop " +
        "forms there.\n\n" +
        "A reach with a control at each end (a gate upstream holding upstreamControlDepth, supercritical; a weir or a lake downstream " +
        "holding downstreamControlDepth, subcritical) gives both profiles and the hydraulic jump between them (jump): it stands where the " +
        "supercritical profile's sequent depth (equal momentum function, as /v1/channels/hydraulic-jump) equals the subcritical profile's " +
        "depth, a root in distance found by safeguarded Newton; the stations list both depths at the jump's distance. A tailwater so high " +
        "that no free jump forms (warning jump-drowned) or so low that the jump is swept out of the reach (jump-beyond-reach) gives the one " +
        "profile that holds. format=html answers a sheet with the long section. The answer is a table: format=text is not offered, and " +
        "batches do not take it.\n\n" +
        "Section fields as for the normal depth. SI by default; units=us takes and returns ft, ft2, ft3/s, ft/s. Flood design follows " +
        "local standards; a profile does not replace a hydraulic model of the site.\n\n" + OpenApiSetup.Cautions)
    {
        Text = false,
        Rows = false,
        Options = [],
    };

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("shape", "trapezoidal"), ("bottomWidth", "3"), ("sideSlope", "2"), ("manningN", "0.025"), ("slope", "0.001"),
         ("flow", "10"), ("length", "2000"), ("controlDepth", "2.5")];

    public override ChannelProfileRequest BodyExample { get; } =
        new(new SectionInput("rectangular", BottomWidth: 4), ManningN: 0.015, Slope: 0.0005, Flow: 12, Length: 300, ControlDepth: 0.35,
            ControlAt: "upstream", Stations: 11);

    public override Outcome<ChannelProfileResponse> Solve(ChannelProfileRequest r, in CalculationContext context)
    {
        var errors = new FieldErrors();
        if (r.Section is null) errors.Add("section", "is required: an object with shape and its dimensions");
        return Solve(r.Section is null ? null : SectionFields.From(r.Section), "section.", r, errors);
    }

    protected override Outcome<ChannelProfileResponse> SolveQuery(ChannelProfileQuery q, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var fields = new SectionFields(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter,
            ChannelInput.ParsePoints(q.Points, errors));
        return Solve(fields, "", FromQuery(q), errors);
    }

    protected override ChannelProfileRequest FromQuery(ChannelProfileQuery q) =>
        new(ChannelInput.Section(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter, q.Points),
            q.ManningN, q.Slope, q.Flow, q.Length, q.ControlDepth, q.ControlAt, q.Stations, q.Units, q.UpstreamControlDepth, q.DownstreamControlDepth);

    public override Sheet Sheet(ChannelProfileRequest request, ChannelProfileResponse answer) => ChannelProfileSheet.Build(request, answer);

    private static Outcome<ChannelProfileResponse> Solve(SectionFields? fields, string prefix, ChannelProfileRequest r, FieldErrors errors)
    {
        var units = new ChannelUnits(UnitSystem.Parse(r.Units, errors));
        var assumptions = new List<AssumptionDto>();
        var section = fields is null ? null : ChannelInput.Read(fields, prefix, units, errors, assumptions);
        double n = errors.Required("manningN", r.ManningN, 0, ChannelInput.MaximumManningN, minExclusive: true, unit: "s m^-1/3");
        double slope = errors.Required("slope", r.Slope, -1, 1, unit: "m/m");
        double q = errors.Required("flow", r.Flow, 0, ChannelInput.MaximumFlow(units), minExclusive: true, unit: units.FlowUnit);
        double length = errors.Required("length", r.Length, 0, ChannelInput.MaximumLength(units), minExclusive: true, unit: units.LengthUnit);
        bool twoControls = r.UpstreamControlDepth is not null || r.DownstreamControlDepth is not null;
        double y0 = 0, yUp = double.NaN, yDown = double.NaN;
        bool downstream = true;
        if (twoControls)
        {
            const string Either = "give either controlDepth (with controlAt) or upstreamControlDepth and downstreamControlDepth, not both";
            if (r.ControlDepth is not null) errors.Add("controlDepth", Either);
            if (r.ControlAt is not null) errors.Add("controlAt", Either);
            yUp = errors.Optional("upstreamControlDepth", r.UpstreamControlDepth, 0, ChannelInput.MaximumLength(units), minExclusive: true, unit: units.LengthUnit) ?? double.NaN;
            yDown = errors.Optional("downstreamControlDepth", r.DownstreamControlDepth, 0, ChannelInput.MaximumLength(units), minExclusive: true, unit: units.LengthUnit) ?? double.NaN;
            // One of the two alone is a single control at that end.
            if (double.IsNaN(yUp) && !errors.Has("upstreamControlDepth")) { y0 = yDown; downstream = true; twoControls = false; }
            else if (double.IsNaN(yDown) && !errors.Has("downstreamControlDepth")) { y0 = yUp; downstream = false; twoControls = false; }
        }
        else
        {
            y0 = errors.Required("controlDepth", r.ControlDepth, 0, ChannelInput.MaximumLength(units), minExclusive: true, unit: units.LengthUnit);
            if (r.ControlAt is { } at)
            {
                if (at.Equals("upstream", StringComparison.OrdinalIgnoreCase)) downstream = false;
                else if (!at.Equals("downstream", StringComparison.OrdinalIgnoreCase)) errors.Add("controlAt", "must be downstream or upstream");
            }
        }
        int count = r.Stations ?? 21;
        if (count is < 2 or > 1001) errors.Add("stations", "must lie in 2 to 1001");
        string controlField = r.ControlDepth is not null ? "controlDepth" : downstream ? "downstreamControlDepth" : "upstreamControlDepth";
        if (section is not null)
        {
            foreach (var (field, depth) in twoControls
                ? new[] { ("upstreamControlDepth", yUp), ("downstreamControlDepth", yDown) }
                : [(controlField, y0)])
            {
                if (!errors.Has(field) && units.LengthToSi(depth) > section.MaximumDepth)
                    errors.Add(field, string.Create(CultureInfo.InvariantCulture,
                        $"must lie within the section (at most {units.Length(section.MaximumDepth):G6} {units.LengthUnit} above the invert)"));
            }
        }
        if (errors.Any || section is null) return ProblemResults.BadInput(errors);

        double qSi = units.FlowToSi(q);
        if (twoControls)
        {
            double yc = units.Length(CriticalFlow.CriticalDepth(section, qSi).CriticalDepth);
            if (GraduallyVariedFlow.Check(section, qSi, units.LengthToSi(yUp), controlDownstream: false) != ProfileProblem.None)
                errors.Add("upstreamControlDepth", string.Create(CultureInfo.InvariantCulture,
                    $"must be supercritical, below the critical depth ({yc:G6} {units.LengthUnit}): the upstream control of a reach with a jump is a gate or a steep inflow"));
            if (GraduallyVariedFlow.Check(section, qSi, units.LengthToSi(yDown), controlDownstream: true) != ProfileProblem.None)
                errors.Add("downstreamControlDepth", string.Create(CultureInfo.InvariantCulture,
                    $"must be subcritical, above the critical depth ({yc:G6} {units.LengthUnit})"));
            if (errors.Any) return ProblemResults.BadInput(errors);
        }
        double y0Si = units.LengthToSi(y0);
        var problem = twoControls ? ProfileProblem.None : GraduallyVariedFlow.Check(section, qSi, y0Si, downstream);
        if (problem != ProfileProblem.None)
        {
            double yc = units.Length(CriticalFlow.CriticalDepth(section, qSi).CriticalDepth);
            return ProblemResults.BadInput(controlField, problem switch
            {
                ProfileProblem.DownstreamControlSupercritical => string.Create(CultureInfo.InvariantCulture,
                    $"is below the critical depth ({yc:G6} {units.LengthUnit}): supercritical flow is controlled from upstream; give controlAt=upstream"),
                ProfileProblem.UpstreamControlSubcritical => string.Create(CultureInfo.InvariantCulture,
                    $"is above the critical depth ({yc:G6} {units.LengthUnit}): subcritical flow is controlled from downstream; give controlAt=downstream"),
                _ => string.Create(CultureInfo.InvariantCulture, $"is the critical depth ({yc:G6} {units.LengthUnit}), where the profile's direction is undefined"),
            });
        }

        var p = twoControls
            ? GraduallyVariedFlow.ProfileBetween(section, qSi, slope, n, units.LengthToSi(length), units.LengthToSi(yUp), units.LengthToSi(yDown), count)
            : GraduallyVariedFlow.Profile(section, qSi, slope, n, units.LengthToSi(length), y0Si, downstream, count);
        if (r.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));
        if (r.ControlAt is null && r.ControlDepth is not null) assumptions.Add(new("controlAt", "downstream", "the control is at the downstream end (subcritical flow; default)"));
        if (r.Stations is null) assumptions.Add(new("stations", "21", "21 equally spaced stations (default)"));
        assumptions.Add(new("energyCoefficient", "1", "uniform velocity over the section (common practice)"));
        assumptions.Add(new("gravity", "9.80665 m/s2", "standard gravity"));
        var manning = new ManningValidity(n, n >= ManningValidity.TypicalLowestN && n <= ManningValidity.TypicalHighestN);
        var stations = p.Stations.Select(s => new ProfileStationDto(units.Length(s.Distance), units.Length(s.Depth), units.Velocity(s.Velocity),
            s.FroudeNumber, units.Length(s.SpecificEnergy), s.FrictionSlope)).ToArray();
        return new ChannelProfileResponse(
            double.IsNaN(p.NormalDepth) ? null : units.Length(p.NormalDepth), units.Length(p.CriticalDepth),
            p.SlopeClass.ToString().ToLowerInvariant(), p.ProfileType, stations,
            p.CriticalDepthDistance is double d ? units.Length(d) : null, section.Shape.ToString().ToLowerInvariant(), units.System.Code,
            p.Iterations, p.Converged, p.Residual, p.Converged ? "converged" : "not-converged", Method,
            [ValidityDto.From(manning.Check)], p.Warnings.Select(WarningDto.From).ToArray(), assumptions,
            p.Jump is { } j
                ? new ProfileJumpDto(units.Length(j.Distance), units.Length(j.UpstreamDepth), units.Length(j.SequentDepth), units.Length(j.EnergyLoss),
                    j.UpstreamFroudeNumber, units.Length(j.JumpLength), j.Iterations, j.Residual)
                : null);
    }
}
