using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Problems;
using FlowSolve.Core.Channels;

namespace FlowSolve.Api.Channels;

/// <summary>A section as it arrived, from a JSON object or from flattened query parameters.</summary>
internal sealed record SectionFields(
    string? Shape, double? BottomWidth, double? SideSlope, double? LeftSideSlope, double? RightSideSlope, double? Diameter,
    IReadOnlyList<SurveyPointInput>? Points)
{
    public static SectionFields From(SectionInput s) =>
        new(s.Shape, s.BottomWidth, s.SideSlope, s.LeftSideSlope, s.RightSideSlope, s.Diameter, s.Points);

    /// <summary>True for a surveyed section whose every segment (every point but the last) carries its own n.</summary>
    public bool HasOwnRoughness =>
        Points is { Count: >= 2 } p && string.Equals(Shape, "surveyed", StringComparison.OrdinalIgnoreCase)
        && p.Take(p.Count - 1).All(x => x.ManningN is not null);
}

/// <summary>
/// Reads and validates a section into a Core <see cref="ChannelSection"/> (SI), naming every bad field at once under
/// its wire name: dotted (<c>section.bottomWidth</c>, <c>section.points[1].station</c>) for a JSON body, bare
/// (<c>bottomWidth</c>, <c>points[1].station</c>) for query parameters. Everything the Core constructors would throw
/// for is checked here first, so a bad section is a 400 and never an exception.
/// </summary>
internal static class ChannelInput
{
    public const int MaximumPoints = 1000;

    /// <summary>Manning n: above 0, at most 1 (tabulated values run to about 0.2).</summary>
    public const double MaximumManningN = 1.0;

    /// <summary>Side slopes up to 1000 horizontal per vertical (beyond that the "side" is a flat bed).</summary>
    private const double MaximumSideSlope = 1000;

    private static readonly string[] Shapes = ["rectangular", "trapezoidal", "triangular", "circular", "surveyed"];

    // Size limits in each system's own round numbers, so that a message quotes a range the caller can act on; they keep
    // A^(5/3) and Q^2 far from overflow.
    public static double MaximumLength(ChannelUnits u) => u.IsUs ? 300_000 : 100_000;

    public static double MaximumCoordinate(ChannelUnits u) => u.IsUs ? 3_000_000 : 1_000_000;

    public static double MaximumFlow(ChannelUnits u) => u.IsUs ? 3e9 : 1e8;

    /// <summary>Parses <c>points=station:elevation[:manningN],...</c> from a query string.</summary>
    /// <summary>A query's top-level section fields as the body's section object (for the calculation sheet: the query
    /// has been read without errors already).</summary>
    public static SectionInput Section(string? shape, double? bottomWidth, double? sideSlope, double? leftSideSlope,
        double? rightSideSlope, double? diameter, string? points) =>
        new(shape, bottomWidth, sideSlope, leftSideSlope, rightSideSlope, diameter, ParsePoints(points, new FieldErrors()));

    public static IReadOnlyList<SurveyPointInput>? ParsePoints(string? text, FieldErrors errors)
    {
        if (text is null) return null;
        var parts = text.Split(',', StringSplitOptions.TrimEntries);
        var points = new List<SurveyPointInput>(parts.Length);
        for (int i = 0; i < parts.Length; i++)
        {
            var fields = parts[i].Split(':', StringSplitOptions.TrimEntries);
            if (fields.Length is < 2 or > 3)
            {
                errors.Add($"points[{i}]", $"'{Clip(parts[i])}' must be station:elevation or station:elevation:manningN");
                points.Add(new SurveyPointInput(null, null)); // keep the later points' indices
                continue;
            }
            points.Add(new SurveyPointInput(
                Number(fields[0], $"points[{i}].station", errors),
                Number(fields[1], $"points[{i}].elevation", errors),
                fields.Length == 3 ? Number(fields[2], $"points[{i}].manningN", errors) : null));
        }
        return points;
    }

    /// <summary>The section in SI, or null when a field is bad (the errors say which).</summary>
    public static ChannelSection? Read(SectionFields f, string prefix, ChannelUnits units, FieldErrors errors, List<AssumptionDto> assumptions)
    {
        if (f.Shape is null)
        {
            errors.Add(prefix + "shape", "is required: one of " + string.Join(", ", Shapes));
            return null;
        }
        string shape = f.Shape.ToLowerInvariant();
        if (Array.IndexOf(Shapes, shape) < 0)
        {
            errors.Add(prefix + "shape", $"'{Clip(f.Shape)}' is not a known shape; use one of " + string.Join(", ", Shapes));
            return null;
        }

        RejectForeign(f, shape, prefix, errors);
        double maxLength = MaximumLength(units);
        string lu = units.LengthUnit;
        ChannelSection? section = null;
        switch (shape)
        {
            case "rectangular":
            {
                double b = errors.Required(prefix + "bottomWidth", f.BottomWidth, 0, maxLength, minExclusive: true, unit: lu);
                if (!errors.Any) section = new RectangularSection(units.LengthToSi(b));
                break;
            }
            case "trapezoidal":
            {
                double b = errors.Required(prefix + "bottomWidth", f.BottomWidth, 0, maxLength, minExclusive: true, unit: lu);
                var (left, right) = Sides(f, prefix, errors, triangle: false);
                if (!errors.Any) section = new TrapezoidalSection(units.LengthToSi(b), left, right);
                break;
            }
            case "triangular":
            {
                var (left, right) = Sides(f, prefix, errors, triangle: true);
                if (!errors.Any) section = new TriangularSection(left, right);
                break;
            }
            case "circular":
            {
                double d = errors.Required(prefix + "diameter", f.Diameter, 0, maxLength, minExclusive: true, unit: lu);
                if (!errors.Any) section = new CircularSection(units.LengthToSi(d));
                break;
            }
            default:
                section = Surveyed(f.Points, prefix, units, errors, assumptions);
                break;
        }
        return errors.Any ? null : section;
    }

    /// <summary>Manning n: required unless every surveyed segment carries its own.</summary>
    public static double? ManningN(double? value, bool required, FieldErrors errors)
    {
        if (value is null)
        {
            if (required) errors.Add("manningN", "is required (s m^-1/3; optional only for a surveyed section whose every segment has its own manningN)");
            return null;
        }
        return errors.Optional("manningN", value, 0, MaximumManningN, minExclusive: true);
    }

    private static void RejectForeign(SectionFields f, string shape, string prefix, FieldErrors errors)
    {
        string takes = shape switch
        {
            "rectangular" => "bottomWidth",
            "trapezoidal" => "bottomWidth and sideSlope (or leftSideSlope and rightSideSlope)",
            "triangular" => "sideSlope (or leftSideSlope and rightSideSlope)",
            "circular" => "diameter",
            _ => "points",
        };
        bool widthOk = shape is "rectangular" or "trapezoidal";
        bool sidesOk = shape is "trapezoidal" or "triangular";
        void Foreign(string name, bool given, bool allowed)
        {
            if (given && !allowed) errors.Add(prefix + name, $"does not apply to a {shape} section, which takes {takes}");
        }
        Foreign("bottomWidth", f.BottomWidth is not null, widthOk);
        Foreign("sideSlope", f.SideSlope is not null, sidesOk);
        Foreign("leftSideSlope", f.LeftSideSlope is not null, sidesOk);
        Foreign("rightSideSlope", f.RightSideSlope is not null, sidesOk);
        Foreign("diameter", f.Diameter is not null, shape == "circular");
        Foreign("points", f.Points is not null, shape == "surveyed");
    }

    private static (double Left, double Right) Sides(SectionFields f, string prefix, FieldErrors errors, bool triangle)
    {
        if (f.SideSlope is not null)
        {
            if (f.LeftSideSlope is not null || f.RightSideSlope is not null)
                errors.Add(prefix + "sideSlope", "give sideSlope, or leftSideSlope and rightSideSlope, not both");
            double z = errors.Required(prefix + "sideSlope", f.SideSlope, 0, MaximumSideSlope, minExclusive: triangle);
            return (z, z);
        }
        if (f.LeftSideSlope is null && f.RightSideSlope is null)
        {
            errors.Add(prefix + "sideSlope", "is required (horizontal per vertical), or give leftSideSlope and rightSideSlope");
            return (double.NaN, double.NaN);
        }
        double left = errors.Required(prefix + "leftSideSlope", f.LeftSideSlope, 0, MaximumSideSlope);
        double right = errors.Required(prefix + "rightSideSlope", f.RightSideSlope, 0, MaximumSideSlope);
        if (triangle && left == 0 && right == 0)
            errors.Add(prefix + "rightSideSlope", "a triangular section needs at least one sloping side; both side slopes are 0");
        return (left, right);
    }

    private static SurveyedSection? Surveyed(IReadOnlyList<SurveyPointInput>? points, string prefix, ChannelUnits units, FieldErrors errors,
        List<AssumptionDto> assumptions)
    {
        string field = prefix + "points";
        if (points is null || points.Count < 3)
        {
            errors.Add(field, $"a surveyed section needs at least 3 points; {points?.Count ?? 0} were given");
            return null;
        }
        if (points.Count > MaximumPoints)
        {
            errors.Add(field, $"at most {MaximumPoints} points; {points.Count} were given");
            return null;
        }

        int before = Count(errors);
        int count = points.Count;
        double limit = MaximumCoordinate(units);
        string lu = units.LengthUnit;
        var stations = new double[count];
        var elevations = new double[count];
        double[]? segmentN = null;
        for (int i = 0; i < count; i++)
        {
            var p = points[i];
            if (p is null)
            {
                errors.Add($"{field}[{i}]", "must be an object with station and elevation");
                continue;
            }
            // A query value that did not parse is already reported under this name; do not add "is required" to it.
            stations[i] = Unreported(field, i, "station", errors) ? errors.Required($"{field}[{i}].station", p.Station, -limit, limit, unit: lu) : double.NaN;
            elevations[i] = Unreported(field, i, "elevation", errors) ? errors.Required($"{field}[{i}].elevation", p.Elevation, -limit, limit, unit: lu) : double.NaN;
            if (p.ManningN is not null && i == count - 1)
            {
                errors.Add($"{field}[{i}].manningN", "the last point starts no segment; give each segment's n on the point where the segment starts");
            }
            else if (p.ManningN is not null)
            {
                segmentN ??= Enumerable.Repeat(double.NaN, count - 1).ToArray();
                segmentN[i] = errors.Optional($"{field}[{i}].manningN", p.ManningN, 0, MaximumManningN, minExclusive: true) ?? double.NaN;
            }
            if (i > 0 && double.IsFinite(stations[i]) && double.IsFinite(stations[i - 1]) && stations[i] < stations[i - 1])
                errors.Add($"{field}[{i}].station", string.Create(CultureInfo.InvariantCulture,
                    $"must not be less than the station before it ({stations[i - 1]:G6} {lu} at points[{i - 1}]): stations run from left to right"));
        }
        if (Count(errors) != before || stations.Any(double.IsNaN) || elevations.Any(double.IsNaN)) return null;

        if (!(stations[count - 1] > stations[0]))
        {
            errors.Add(field, "the section has no width: the first and last stations are equal");
            return null;
        }
        double lowest = elevations.Min();
        if (!(Math.Min(elevations[0], elevations[count - 1]) > lowest))
        {
            errors.Add(field, "both end points must lie above the lowest point of the section (the survey should reach the bank tops on both sides)");
            return null;
        }

        if (segmentN is not null)
        {
            int own = segmentN.Count(n => !double.IsNaN(n));
            // One name for both request forms, so that a GET and the equivalent POST answer the same document.
            assumptions.Add(new("section.points[].manningN", own == count - 1 ? "every segment" : $"{own} of {count - 1} segments",
                "Horton-Einstein composite roughness n = [sum(P_i n_i^1.5)/P]^(2/3) over the wetted segments (Chow 1959, Open-Channel Hydraulics, section 6-5; from memory)" +
                (own == count - 1 ? "" : "; segments without their own n take the request's manningN")));
        }
        var si = new double[count];
        var siZ = new double[count];
        for (int i = 0; i < count; i++)
        {
            si[i] = units.LengthToSi(stations[i]);
            siZ[i] = units.LengthToSi(elevations[i]);
        }
        return new SurveyedSection(si, siZ, segmentN);
    }

    private static double? Number(string text, string field, FieldErrors errors)
    {
        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out double value)) return value;
        errors.Add(field, $"'{Clip(text)}' is not a number");
        return null;
    }

    private static bool Unreported(string field, int index, string name, FieldErrors errors) =>
        !errors.Has($"{field}[{index}]") && !errors.Has($"{field}[{index}].{name}");

    private static int Count(FieldErrors errors) => errors.ToDictionary().Sum(e => e.Value.Length);

    private static string Clip(string text) => text.Length > 40 ? text[..40] + "..." : text;
}
