using System.ComponentModel;
using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Channels;

namespace FlowSolve.Api.Channels;

/// <summary>One surveyed cross-section of a reach, at its distance from the downstream end.</summary>
public sealed record ReachSectionInput(
    [property: Description("Distance of the section from the downstream end of the reach, m (ft with units=us), increasing upstream; 0 to 1 000 000 m (3 000 000 ft). Each section's distance must be greater than the one before it.")]
    double? Distance,
    [property: Description("Surveyed points, left to right looking downstream, at least 3 and at most 1000: {station, elevation} in m (ft with units=us), with an optional manningN for the segment that starts at the point, as for a surveyed section of the normal depth. The elevations place the section's bed (its lowest point); the section holds water up to the lower of its two end points.")]
    IReadOnlyList<SurveyPointInput>? Points,
    [property: Description("Manning n of the section's segments without their own, s m^-1/3 (the same number with units=us); greater than 0 and at most 1. Optional only when every segment carries its own manningN.")]
    double? ManningN = null);

/// <summary>Inputs of the surveyed-reach profile as a JSON body.</summary>
public sealed record ReachProfileRequest(
    [property: Description("The cross-sections, downstream end first (increasing distance); at least 2 and at most 1000, with at most 100 000 points in all.")]
    IReadOnlyList<ReachSectionInput>? Sections,
    [property: Description("Discharge Q, m3/s (ft3/s with units=us); 1e-6 m3/s (4e-5 ft3/s) to 1e8 m3/s (3e9 ft3/s); the same at every section.")]
    double? Flow,
    [property: Description("The known water-surface elevation at the start section, m (ft with units=us), on the survey's datum: the first section (downstream end) for startAt=downstream, the last (upstream end) for startAt=upstream. It must lie above that section's lowest point and not above its lower end point.")]
    double? StartElevation,
    [property: Description("Where the known water surface is: downstream (default; subcritical flow, the steps run upstream) or upstream (supercritical flow, the steps run downstream).")]
    string? StartAt = null,
    [property: Description("Loss coefficient applied to the fall of velocity head along the flow (an expansion); 0 to 1; 0.3 when omitted (common practice for gradual transitions).")]
    double? ExpansionCoefficient = null,
    [property: Description("Loss coefficient applied to the rise of velocity head along the flow (a contraction); 0 to 1; 0.1 when omitted (common practice for gradual transitions).")]
    double? ContractionCoefficient = null,
    [property: Description("Unit system of the request and response: si (default) or us (ft, ft2, ft3/s, ft/s).")]
    string? Units = null);

/// <summary>The computed water surface at one section.</summary>
/// <param name="Distance">Distance from the downstream end, m (ft).</param>
/// <param name="BedElevation">The section's lowest surveyed point, m (ft).</param>
/// <param name="Elevation">Water-surface elevation, m (ft).</param>
/// <param name="Depth">Elevation less the lowest point, m (ft).</param>
/// <param name="Area">Flow area, m2 (ft2).</param>
/// <param name="TopWidth">Water-surface width, m (ft).</param>
/// <param name="Velocity">Mean velocity Q/A, m/s (ft/s).</param>
/// <param name="FroudeNumber">Q sqrt(T/(g A^3)), dimensionless.</param>
/// <param name="EnergyGradeLine">Elevation of the energy grade line, elevation + V^2/(2g), m (ft); energy coefficient 1.</param>
/// <param name="FrictionSlope">Manning's friction slope (Q/K)^2, m/m (Horton-Einstein composite n where segments carry their own).</param>
/// <param name="CriticalElevation">The lowest point plus the (lowest) critical depth, m (ft); absent where the section cannot pass the flow at critical depth below its top.</param>
/// <param name="FrictionLoss">Friction loss of the step that reached this section: the distance times the mean of the two friction slopes, m (ft); 0 at the start section.</param>
/// <param name="TransitionLoss">Expansion or contraction loss of that step: the coefficient times the change of velocity head, m (ft); 0 at the start section.</param>
/// <param name="Iterations">Newton steps of this section's energy equation; 0 at the start section and where critical depth was taken.</param>
/// <param name="Residual">The energy equation at the elevation returned, m (ft); 0 at the start section.</param>
/// <param name="CriticalDepthTaken">True where the energy equation had no root of the regime asked and the section took its critical depth (warning no-subcritical-solution or no-supercritical-solution).</param>
public sealed record ReachStationDto(
    double Distance, double BedElevation, double Elevation, double Depth, double Area, double TopWidth, double Velocity,
    double FroudeNumber, double EnergyGradeLine, double FrictionSlope, double? CriticalElevation, double FrictionLoss,
    double TransitionLoss, int Iterations, double Residual, bool CriticalDepthTaken);

/// <summary>Water-surface elevations along a surveyed reach by the standard step method.</summary>
/// <param name="Sections">One entry per section of the request, in the same order (downstream end first).</param>
/// <param name="StartAt">downstream or upstream: the end the computation started from.</param>
/// <param name="Units">si or us.</param>
/// <param name="Iterations">Newton steps over all sections.</param>
/// <param name="Converged">True when every section's energy equation met its tolerance.</param>
/// <param name="Residual">The largest |energy equation| over the sections, m (ft).</param>
/// <param name="Status">converged or not-converged.</param>
/// <param name="Method">The relations used.</param>
/// <param name="Validity">The Manning n used beside the range of tabulated values (the smallest and the largest over the sections).</param>
/// <param name="Warnings">Warnings with stable codes (no-subcritical-solution, no-supercritical-solution, not-converged).</param>
/// <param name="Assumptions">Defaults and interpretations that were applied.</param>
public sealed record ReachProfileResponse(
    IReadOnlyList<ReachStationDto> Sections, string StartAt, string Units, int Iterations, bool Converged, double Residual, string Status,
    string Method, IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : ISolveSummary;

/// <summary>The water surface along a surveyed reach by the standard step method: <c>POST /v1/channels/reach-profile</c>.</summary>
/// <remarks>Not a row calculation: POST only (it takes arrays), no batch or check, format=text answers 400.</remarks>
public sealed class ReachProfileCalculation : Calculation<ReachProfileRequest, ReachProfileResponse>
{
    public const int MaximumSections = 1000;
    public const int MaximumTotalPoints = 100_000;

    /// <summary>The smallest flow taken, 1e-6 m3/s (4e-5 ft3/s, a little more): below it the critical-depth solve
    /// meets depths too close to the bed to resolve in double precision on sections of ordinary size.</summary>
    private static double MinimumFlow(ChannelUnits u) => u.IsUs ? 4e-5 : 1e-6;

    private const string Method =
        "standard step: the energy equation between neighbouring sections, z_u + V_u^2/2g = z_d + V_d^2/2g + L (Sf_u + Sf_d)/2 + " +
        "C |V_d^2/2g - V_u^2/2g| (Sf from Manning, energy coefficient 1, C the contraction coefficient where the velocity head grows " +
        "along the flow and the expansion coefficient where it falls), each section's elevation by safeguarded Newton in a scanned bracket";

    public override CalculationInfo Info { get; } = new("channels/reach-profile", "Channels", "ReachProfile", "converged",
        "Water-surface profile along a surveyed reach (standard step)",
        "Water-surface elevations along a natural reach described by surveyed cross-sections at distances from its downstream end, " +
        "by the standard step method (Chow 1959, Open-Channel Hydraulics, section 10-4; Henderson 1966, Open Channel Flow, section " +
        "4.8; both from memory). From the known water surface at one end, each next section's elevation solves the energy equation " +
        "z_u + V_u^2/2g = z_d + V_d^2/2g + hf + ht between neighbouring sections: the friction loss hf is the distance times the mean " +
        "of the two sections' Manning friction slopes, and the transition loss ht is a coefficient times the change of velocity head " +
        "(expansionCoefficient, 0.3 by default, where it falls along the flow; contractionCoefficient, 0.1 by default, where it " +
        "rises; common practice for gradual transitions). The energy coefficient is 1 (uniform velocity over each section). The " +
        "equation is solved in the elevation by safeguarded Newton inside a bracket found by scanning the section's depth range. It " +
        "has two roots at most sections: startAt=downstream (default) steps upstream and takes the subcritical root, " +
        "startAt=upstream steps downstream and takes the supercritical one. Where no root of that regime exists, the section takes " +
        "its critical depth and the answer warns (no-subcritical-solution or no-supercritical-solution): the flow passes through " +
        "critical depth there, and elevations next to it are estimates only. Each section's points and manningN are as for a " +
        "surveyed section of the normal depth (segments may carry their own n: Horton-Einstein composite). A water surface that " +
        "would rise above a section's lower end point answers 422 naming the section (extend the survey). On a prismatic channel " +
        "without transition losses the method converges to the gradually-varied-flow profile with the square of the spacing. " +
        "Bad input answers 400 naming the field path (sections[3].distance, sections[1].points[2].station, startElevation). The " +
        "answer is a table: format=text is not offered, and batches do not take it; format=html gives the calculation sheet.\n\n" +
        "SI by default; units=us takes and returns ft, ft2, ft3/s, ft/s. Flood design follows local standards; results do not " +
        "replace a hydraulic model of the site.\n\n" + OpenApiSetup.Cautions)
    {
        Text = false,
        Rows = false,
        Options = [],
    };

    /// <summary>The Vandrel Vale mill leat below the weir: three surveyed sections over 400 m (invented data).</summary>
    public override ReachProfileRequest BodyExample { get; } = new(
        [
            new ReachSectionInput(0, [new(0, 12.4), new(3, 10.6), new(5, 10.1), new(9, 10.2), new(11, 11.0), new(18, 11.3), new(20, 12.5)], 0.035),
            new ReachSectionInput(180, [new(0, 12.6), new(2.5, 10.9), new(4.5, 10.35), new(8.5, 10.4), new(10, 11.1), new(19, 11.5), new(21, 12.7)], 0.035),
            new ReachSectionInput(400, [new(0, 12.9, 0.05), new(3, 11.2, 0.035), new(5, 10.6, 0.035), new(8, 10.7, 0.035), new(9.5, 11.4, 0.06), new(17, 11.7, 0.06), new(19, 13.0)]),
        ],
        Flow: 18, StartElevation: 11.6);

    public override Outcome<ReachProfileResponse> Solve(ReachProfileRequest r, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var units = new ChannelUnits(UnitSystem.Parse(r.Units, errors));
        var assumptions = new List<AssumptionDto>();
        var sections = ReadSections(r.Sections, units, errors, assumptions);
        double q = errors.Required("flow", r.Flow, MinimumFlow(units), ChannelInput.MaximumFlow(units), unit: units.FlowUnit);
        double limit = ChannelInput.MaximumCoordinate(units);
        double z0 = errors.Required("startElevation", r.StartElevation, -limit, limit, unit: units.LengthUnit);
        var start = ReachStart.Downstream;
        if (r.StartAt is { } at)
        {
            if (at.Equals("upstream", StringComparison.OrdinalIgnoreCase)) start = ReachStart.Upstream;
            else if (!at.Equals("downstream", StringComparison.OrdinalIgnoreCase)) errors.Add("startAt", "must be downstream or upstream");
        }
        double ce = errors.Optional("expansionCoefficient", r.ExpansionCoefficient, 0, 1) ?? StandardStep.DefaultExpansionCoefficient;
        double cc = errors.Optional("contractionCoefficient", r.ContractionCoefficient, 0, 1) ?? StandardStep.DefaultContractionCoefficient;
        if (errors.Any || sections is null) return ProblemResults.BadInput(errors);

        double qSi = units.FlowToSi(q), z0Si = units.LengthToSi(z0);
        int first = start == ReachStart.Downstream ? 0 : sections.Length - 1;
        var (problem, critical) = StandardStep.CheckStart(sections[first], qSi, z0Si, start);
        if (problem != ReachStartProblem.None) return StartRefused(problem, sections[first], first, critical, units);

        var p = StandardStep.Solve(sections, qSi, z0Si, start, ce, cc);
        if (p.OvertopsSection is int k) return Overtops(k, sections, units);

        if (r.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));
        if (r.StartAt is null) assumptions.Add(new("startAt", "downstream", "the known water surface is at the downstream end (subcritical flow; default)"));
        if (r.ExpansionCoefficient is null) assumptions.Add(new("expansionCoefficient", "0.3", "expansion loss coefficient for gradual transitions (common practice; default)"));
        if (r.ContractionCoefficient is null) assumptions.Add(new("contractionCoefficient", "0.1", "contraction loss coefficient for gradual transitions (common practice; default)"));
        assumptions.Add(new("energyCoefficient", "1", "uniform velocity over each section (common practice)"));
        assumptions.Add(new("gravity", "9.80665 m/s2", "standard gravity"));
        var stations = p.Stations.Select(s => new ReachStationDto(
            units.Length(s.Distance), units.Length(s.BedElevation), units.Length(s.Elevation), units.Length(s.Depth), units.Area(s.Area),
            units.Length(s.TopWidth), units.Velocity(s.Velocity), s.FroudeNumber, units.Length(s.EnergyElevation), s.FrictionSlope,
            double.IsNaN(s.CriticalElevation) ? null : units.Length(s.CriticalElevation), units.Length(s.FrictionLoss),
            units.Length(s.TransitionLoss), s.Iterations, units.Length(s.Residual), s.AtCriticalDepth)).ToArray();
        return new ReachProfileResponse(stations, start == ReachStart.Downstream ? "downstream" : "upstream", units.System.Code,
            p.Iterations, p.Converged, units.Length(p.Residual), p.Converged ? "converged" : "not-converged", Method,
            Validity(sections), p.Warnings.Select(WarningDto.From).ToArray(), assumptions);
    }

    public override Sheet Sheet(ReachProfileRequest request, ReachProfileResponse answer) => ReachSheet.Build(request, answer);

    /// <summary>The sections in SI, or null when any field is bad (every bad field is named, with its path).</summary>
    private static ReachSection[]? ReadSections(IReadOnlyList<ReachSectionInput>? input, ChannelUnits units, FieldErrors errors, List<AssumptionDto> assumptions)
    {
        if (input is null || input.Count < 2)
        {
            errors.Add("sections", $"a reach needs at least 2 sections; {input?.Count ?? 0} were given");
            return null;
        }
        if (input.Count > MaximumSections)
        {
            errors.Add("sections", $"at most {MaximumSections} sections; {input.Count} were given");
            return null;
        }
        long points = input.Sum(s => (long)(s?.Points?.Count ?? 0));
        if (points > MaximumTotalPoints)
        {
            errors.Add("sections", $"at most {MaximumTotalPoints} points over all sections; {points} were given");
            return null;
        }

        double limit = ChannelInput.MaximumCoordinate(units);
        var result = new ReachSection[input.Count];
        bool ok = true, composite = false;
        double previous = double.NaN;
        for (int i = 0; i < input.Count; i++)
        {
            string path = $"sections[{i}]";
            var s = input[i];
            if (s is null)
            {
                errors.Add(path, "must be an object with distance, points and manningN");
                ok = false;
                previous = double.NaN;
                continue;
            }
            double distance = errors.Required(path + ".distance", s.Distance, 0, limit, unit: units.LengthUnit);
            if (!double.IsNaN(distance) && !double.IsNaN(previous) && !(distance > previous))
                errors.Add(path + ".distance", string.Create(CultureInfo.InvariantCulture,
                    $"must be greater than sections[{i - 1}].distance ({previous:G6} {units.LengthUnit}): sections run from the downstream end upstream, in increasing distance"));
            previous = distance;

            var fields = new SectionFields("surveyed", null, null, null, null, null, s.Points);
            var section = ChannelInput.Read(fields, path + ".", units, errors, []) as SurveyedSection;
            // Every segment (every point but the last) with its own n; null points are reported by the section reader.
            bool own = s.Points is { Count: >= 2 } pts && pts.Take(pts.Count - 1).All(p => p?.ManningN is not null);
            composite |= s.Points?.Any(p => p?.ManningN is not null) == true;
            double n = 0;
            if (s.ManningN is null)
            {
                if (!own) errors.Add(path + ".manningN", "is required (s m^-1/3; optional only when every segment of the section has its own manningN)");
            }
            else n = errors.Optional(path + ".manningN", s.ManningN, 0, ChannelInput.MaximumManningN, minExclusive: true) ?? double.NaN;
            if (section is null || double.IsNaN(distance) || double.IsNaN(n)) ok = false;
            else result[i] = new ReachSection(units.LengthToSi(distance), section, n);
        }
        if (composite)
            assumptions.Add(new("sections[].points[].manningN", "given on some segments",
                "Horton-Einstein composite roughness n = [sum(P_i n_i^1.5)/P]^(2/3) over each section's wetted segments (Chow 1959, Open-Channel Hydraulics, section 6-5; from memory); segments without their own n take their section's manningN"));
        return ok && !errors.Any ? result : null;
    }

    private static ValidityDto[] Validity(ReachSection[] sections)
    {
        var given = sections.Select(s => s.ManningN).Where(n => n > 0).ToArray();
        if (given.Length == 0) return [];
        double lo = given.Min(), hi = given.Max();
        var list = new List<ValidityDto> { ValidityDto.From(new ManningValidity(lo, lo >= ManningValidity.TypicalLowestN && lo <= ManningValidity.TypicalHighestN).Check) };
        if (hi != lo) list.Add(ValidityDto.From(new ManningValidity(hi, hi >= ManningValidity.TypicalLowestN && hi <= ManningValidity.TypicalHighestN).Check));
        return [.. list];
    }

    private static Outcome<ReachProfileResponse> StartRefused(ReachStartProblem problem, ReachSection start, int index, double critical, ChannelUnits u)
    {
        var s = start.Section;
        string lu = u.LengthUnit;
        string lowest = string.Create(CultureInfo.InvariantCulture, $"{u.Length(s.InvertElevation):G6} {lu}");
        string top = string.Create(CultureInfo.InvariantCulture, $"{u.Length(s.InvertElevation + s.MaximumDepth):G6} {lu}");
        string yc = double.IsNaN(critical) ? "above the section's lower end point" : string.Create(CultureInfo.InvariantCulture, $"{u.Length(critical):G6} {lu}");
        return ProblemResults.BadInput("startElevation", problem switch
        {
            ReachStartProblem.BelowBed => $"must lie above the lowest point of sections[{index}] ({lowest}), the start section",
            ReachStartProblem.AboveSection => $"must not lie above the lower end point of sections[{index}] ({top}), the start section: extend its survey",
            ReachStartProblem.DownstreamStartSupercritical => $"is below the critical elevation of sections[{index}] ({yc}): supercritical flow is controlled from upstream; give startAt=upstream with the elevation at the upstream end",
            _ => $"is above the critical elevation of sections[{index}] ({yc}): subcritical flow is controlled from downstream; give startAt=downstream with the elevation at the downstream end",
        });
    }

    private static Outcome<ReachProfileResponse> Overtops(int k, ReachSection[] sections, ChannelUnits u)
    {
        var s = sections[k].Section;
        string detail = string.Create(CultureInfo.InvariantCulture,
            $"At sections[{k}] (distance {u.Length(sections[k].Distance):G6} {u.LengthUnit}) the water surface would rise above the section's lower end point ({u.Length(s.InvertElevation + s.MaximumDepth):G6} {u.LengthUnit}): the flow spills beyond the survey, or the section cannot pass it at critical depth below its top. Extend the survey to higher ground on both banks.");
        return ProblemResults.NoAnswer("The water would rise above a surveyed section.", detail,
            new Dictionary<string, object?> { ["field"] = $"sections[{k}].points", ["section"] = k });
    }
}
