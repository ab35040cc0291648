using System.Globalization;
using FlowSolve.Api.Sheets;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core.Channels;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Api.Channels;

/// <summary>What the two channel sheets share: the section read again, its drawing to scale, and the re-solve for the record.</summary>
internal static class ChannelSheetParts
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public sealed record Read(ChannelSection Section, ChannelUnits Units, string? UnitsText, double? ManningN, double Flow,
        double? Slope, SectionFields Fields);

    /// <summary>The body the sheet was drawn for (a GET's query arrives as the body it stands for).</summary>
    public static Read ReadRequest(object request)
    {
        var errors = new FieldErrors();
        (SectionFields fields, string prefix, string? units, double? n, double? flow, double? slope) = request switch
        {
            NormalDepthRequest b => (SectionFields.From(b.Section!), "section.", b.Units, b.ManningN, b.Flow, b.Slope),
            CriticalDepthRequest b => (SectionFields.From(b.Section!), "section.", b.Units, b.ManningN, b.Flow, (double?)null),
            ChannelProfileRequest b => (SectionFields.From(b.Section!), "section.", b.Units, b.ManningN, b.Flow, b.Slope),
            _ => throw new ArgumentException("not a channel request", nameof(request)),
        };
        var u = new ChannelUnits(UnitSystem.Parse(units, errors));
        // The request passed validation when the response was made, so the section reads again without errors.
        var section = ChannelInput.Read(fields, prefix, u, errors, []) ?? throw new InvalidOperationException("the section did not read again");
        return new Read(section, u, units, n, flow!.Value, slope, fields);
    }

    public static void Inputs(Sheet sheet, Read read, string shape)
    {
        var u = read.Units;
        string lu = u.LengthUnit;
        sheet.Inputs.Add(new("Section shape", shape, "", "as given"));
        switch (read.Section)
        {
            case RectangularSection s:
                sheet.Inputs.Add(new("Bottom width b", SheetHtml.Fmt(u.Length(s.Width)), lu, "as given"));
                break;
            case TrapezoidalSection s:
                sheet.Inputs.Add(new("Bottom width b", SheetHtml.Fmt(u.Length(s.BottomWidth)), lu, "as given"));
                sheet.Inputs.Add(new("Left side slope", SheetHtml.Fmt(s.LeftSideSlope), "H per 1 V", "as given"));
                sheet.Inputs.Add(new("Right side slope", SheetHtml.Fmt(s.RightSideSlope), "H per 1 V", "as given"));
                break;
            case TriangularSection s:
                sheet.Inputs.Add(new("Left side slope", SheetHtml.Fmt(s.LeftSideSlope), "H per 1 V", "as given"));
                sheet.Inputs.Add(new("Right side slope", SheetHtml.Fmt(s.RightSideSlope), "H per 1 V", "as given"));
                break;
            case CircularSection s:
                sheet.Inputs.Add(new("Diameter D", SheetHtml.Fmt(u.Length(s.Diameter)), lu, "as given"));
                break;
            case SurveyedSection s:
                for (int i = 0; i < s.PointCount; i++)
                {
                    double n = s.SegmentManningN(i);
                    sheet.Inputs.Add(new($"Point {i + 1}: station, elevation", SheetHtml.Fmt(u.Length(s.Station(i))) + ", " + SheetHtml.Fmt(u.Length(s.Elevation(i))), lu,
                        i < s.PointCount - 1 && double.IsFinite(n) && n > 0 ? string.Create(C, $"segment n {n:G4}") : ""));
                }
                break;
        }
        sheet.Inputs.Add(new("Discharge Q", SheetHtml.Fmt(read.Flow), u.FlowUnit, "as given"));
        if (read.Slope is double slope) sheet.Inputs.Add(new("Bed slope S", SheetHtml.Fmt(slope), "m/m", "as given"));
        sheet.Inputs.Add(new("Manning n", SheetHtml.Fmt(read.ManningN), "s m^-1/3", read.ManningN is null ? "not given" : "as given"));
        sheet.Inputs.Add(new("Units", u.System.Code, "", read.UnitsText is null ? "default" : "as given"));
    }

    /// <summary>The section to scale in the response's length unit (invert at 0) with the water lines given.</summary>
    public static SheetFigure Drawing(ChannelSection section, ChannelUnits u, IReadOnlyList<(string Name, double Depth, bool Accent, bool Dashed)> levels, string caption)
    {
        double top = levels.Max(l => l.Depth);
        double height = section.MaximumDepth is double m && double.IsFinite(m) ? m : 1.35 * top;
        var outline = Outline(section, u, height);
        double xMin = outline.Min(p => p.X), xMax = outline.Max(p => p.X);
        double yMax = outline.Max(p => p.Y);
        double padX = 0.06 * (xMax - xMin), padY = 0.08 * Math.Max(yMax, xMax - xMin);
        var plot = SvgPlot.EqualScale("plot-section", "Cross-section to scale", $"station ({u.LengthUnit})", $"height above invert ({u.LengthUnit})",
            xMin - padX, xMax + padX, -padY, yMax + padY);
        plot.Outline(section.Shape.ToString().ToLowerInvariant(), outline, closed: section is CircularSection);
        foreach (var (name, depth, accent, dashed) in levels)
        {
            var (x1, x2) = Edges(section, u, depth);
            plot.Level(name, x1, x2, depth, string.Create(C, $"{ShortName(name)} = {depth:G5} {u.LengthUnit}"), accent, dashed: dashed);
        }
        return new SheetFigure("section", plot.Render(), caption);
    }

    private static string ShortName(string name) => name switch
    {
        "normal depth" => "yn",
        "alternate normal depth" => "yn'",
        "critical depth" => "yc",
        _ => "yc'",
    };

    /// <summary>The section's outline in the response's length unit, invert at height 0, up to <paramref name="height"/> (display units).</summary>
    public static List<(double X, double Y)> Outline(ChannelSection section, ChannelUnits u, double height)
    {
        switch (section)
        {
            case RectangularSection s:
            {
                double b = u.Length(s.Width);
                return [(0, height), (0, 0), (b, 0), (b, height)];
            }
            case TrapezoidalSection s:
            {
                double b = u.Length(s.BottomWidth);
                return [(-s.LeftSideSlope * height, height), (0, 0), (b, 0), (b + s.RightSideSlope * height, height)];
            }
            case TriangularSection s:
                return [(-s.LeftSideSlope * height, height), (0, 0), (s.RightSideSlope * height, height)];
            case CircularSection s:
            {
                double r = 0.5 * u.Length(s.Diameter);
                return Enumerable.Range(0, 96).Select(i => 2 * Math.PI * i / 96)
                    .Select(a => (r * Math.Sin(a), r - r * Math.Cos(a))).ToList();
            }
            case SurveyedSection s:
                return Enumerable.Range(0, s.PointCount)
                    .Select(i => (u.Length(s.Station(i)), u.Length(s.Elevation(i) - s.InvertElevation))).ToList();
            default:
                return [];
        }
    }

    /// <summary>The two water edges of a level in display units: where the water surface meets the section walls.</summary>
    public static (double Left, double Right) Edges(ChannelSection section, ChannelUnits u, double depth)
    {
        switch (section)
        {
            case RectangularSection s: return (0, u.Length(s.Width));
            case TrapezoidalSection s: return (-s.LeftSideSlope * depth, u.Length(s.BottomWidth) + s.RightSideSlope * depth);
            case TriangularSection s: return (-s.LeftSideSlope * depth, s.RightSideSlope * depth);
            case CircularSection s:
            {
                double r = 0.5 * u.Length(s.Diameter);
                double half = Math.Sqrt(Math.Max(0, r * r - (depth - r) * (depth - r)));
                return (-half, half);
            }
            case SurveyedSection s:
            {
                var pts = Outline(s, u, 0);
                int low = 0;
                for (int i = 1; i < pts.Count; i++) if (pts[i].Y < pts[low].Y) low = i;
                double left = pts[0].X, right = pts[^1].X;
                for (int i = low; i > 0; i--)
                    if (pts[i - 1].Y >= depth) { left = Cross(pts[i], pts[i - 1], depth); break; }
                for (int i = low; i < pts.Count - 1; i++)
                    if (pts[i + 1].Y >= depth) { right = Cross(pts[i], pts[i + 1], depth); break; }
                return (left, right);
            }
            default: return (0, 0);
        }
    }

    private static double Cross((double X, double Y) a, (double X, double Y) b, double y) =>
        b.Y == a.Y ? b.X : a.X + (b.X - a.X) * (y - a.Y) / (b.Y - a.Y);

    /// <summary>The solve variable of the reported depth's record, by section shape (what the trace's x is).</summary>
    public static string SolveVariable(ChannelSection section, bool critical) => section switch
    {
        CircularSection when critical => "x = ln(y/(D - y))",
        CircularSection or SurveyedSection => "y (m)",
        _ => "u = ln y",
    };

    public static string RecordNote(int iterations, string status, int rows, ChannelSection section, bool critical)
    {
        string own = string.Create(C, $"The solve behind this answer took {iterations} iterations and stopped with {status}. ");
        if (rows == 0) return own + "It needed no iterations (the start met the tolerance).";
        return own + "Its iterations are listed as the solver took them, in " + SolveVariable(section, critical) +
            (section is SurveyedSection ? "; a surveyed section is scanned segment by segment, and the record is that of the segment that holds the reported (lowest) depth." : ".");
    }
}

/// <summary>The normal-depth sheet.</summary>
public static class NormalDepthSheet
{
    private const string Name = "channels/normal-depth";

    public static Sheet Build(NormalDepthRequest request, NormalDepthResponse r)
    {
        var read = ChannelSheetParts.ReadRequest(request);
        var u = read.Units;
        var sheet = new Sheet { Title = "Normal depth in an open channel", Calculation = Name };
        ChannelSheetParts.Inputs(sheet, read, r.Shape);
        sheet.Assumptions.AddRange(r.Assumptions);
        Methods(sheet.Methods, read.Section.HasCompositeRoughness);

        string lu = u.LengthUnit;
        sheet.Results.Add(new("Normal depth yn", SheetHtml.Fmt(r.NormalDepth), lu, "the lowest depth that carries the flow"));
        if (r.AlternateNormalDepth is double alt) sheet.Results.Add(new("Alternate normal depth", SheetHtml.Fmt(alt), lu, "a second depth carries the same flow"));
        sheet.Results.Add(new("Critical depth yc", SheetHtml.Fmt(r.CriticalDepth), lu, ""));
        sheet.Results.Add(new("Flow area A", SheetHtml.Fmt(r.Area), u.IsUs ? "ft2" : "m2", ""));
        sheet.Results.Add(new("Wetted perimeter P", SheetHtml.Fmt(r.WettedPerimeter), lu, ""));
        sheet.Results.Add(new("Hydraulic radius R", SheetHtml.Fmt(r.HydraulicRadius), lu, ""));
        sheet.Results.Add(new("Top width T", SheetHtml.Fmt(r.TopWidth), lu, ""));
        sheet.Results.Add(new("Velocity V", SheetHtml.Fmt(r.Velocity), u.IsUs ? "ft/s" : "m/s", ""));
        sheet.Results.Add(new("Froude number", SheetHtml.Fmt(r.FroudeNumber), "-", r.Regime));
        sheet.Results.Add(new("Specific energy", SheetHtml.Fmt(r.SpecificEnergy), lu, ""));
        sheet.Results.Add(new("Effective Manning n", SheetHtml.Fmt(r.EffectiveManningN), "s m^-1/3", ""));
        sheet.Results.Add(new("Critical slope", SheetHtml.Fmt(r.CriticalSlope), "m/m", ""));
        if (r.Capacity is { } cap)
            sheet.Results.Add(new("Greatest discharge of the section", SheetHtml.Fmt(cap.MaximumFlow), u.FlowUnit, string.Create(CultureInfo.InvariantCulture, $"at depth {cap.DepthAtMaximumFlow:G6} {lu}")));

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual, "ln(Q(yn)/Q): the relative discharge mismatch", r.Status,
            SheetParts.StopReason(r.Status), ChannelSheetParts.SolveVariable(read.Section, critical: false), steps,
            ChannelSheetParts.RecordNote(r.Iterations, r.Status, steps.Count, read.Section, critical: false));
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);

        var levels = new List<(string, double, bool, bool)> { ("normal depth", r.NormalDepth, true, false) };
        if (r.AlternateNormalDepth is double alt2) levels.Add(("alternate normal depth", alt2, true, true));
        if (r.CriticalDepth is double yc) levels.Add(("critical depth", yc, false, true));
        sheet.Figures.Add(ChannelSheetParts.Drawing(read.Section, u, levels,
            "The cross-section to scale (both axes in one unit) with the normal-depth water line (accent)"
            + (r.AlternateNormalDepth is null ? "" : ", the alternate normal depth (accent, dashed)")
            + (r.CriticalDepth is null ? "" : " and the critical-depth line (grey, dashed)") + "."));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(ln Q ratio)", "Residual of Manning's equation at each iteration of the solve, log scale; the last iteration is marked."));
        return sheet;
    }

    internal static void Methods(List<SheetMethod> methods, bool composite)
    {
        methods.Add(new("Manning's equation", "Q = (1/n) A R^(2/3) S^(1/2) (SI; k = 1.486 in US units); solved for y in u = ln y by safeguarded Newton",
            "Manning (1891), Trans. ICE Ireland 20, from memory; n values: Chow (1959), Open-Channel Hydraulics, Table 5-6 (from memory)"));
        if (composite)
            methods.Add(new("Horton-Einstein composite roughness", "n = [sum(P_i n_i^1.5) / P]^(2/3)", "Horton (1933); Einstein (1934); as in Chow (1959), section 6-6 (from memory)"));
        methods.Add(new("Critical flow", "Q^2 T = g A^3 (Froude number 1 on the hydraulic depth A/T); g = 9.80665 m/s2",
            "Chow (1959), Open-Channel Hydraulics, chapter 4 (from memory)"));
    }
}

/// <summary>The critical-depth sheet.</summary>
public static class CriticalDepthSheet
{
    private const string Name = "channels/critical-depth";

    public static Sheet Build(CriticalDepthRequest request, CriticalDepthResponse r)
    {
        var read = ChannelSheetParts.ReadRequest(request);
        var u = read.Units;
        var sheet = new Sheet { Title = "Critical depth in an open channel", Calculation = Name };
        ChannelSheetParts.Inputs(sheet, read, r.Shape);
        sheet.Assumptions.AddRange(r.Assumptions);
        NormalDepthSheet.Methods(sheet.Methods, read.Section.HasCompositeRoughness);
        sheet.Methods.RemoveAt(0);
        if (read.ManningN is not null || read.Section.HasOwnRoughness)
            sheet.Methods.Add(new("Critical slope (Manning)", "the bed slope whose normal depth is the critical depth",
                "Manning (1891), from memory; Chow (1959), section 6-3 (from memory)"));

        string lu = u.LengthUnit;
        sheet.Results.Add(new("Critical depth yc", SheetHtml.Fmt(r.CriticalDepth), lu, r.AlternateCriticalDepths is null ? "" : "the lowest of several"));
        foreach (var d in r.AlternateCriticalDepths ?? []) sheet.Results.Add(new("Further critical depth", SheetHtml.Fmt(d), lu, ""));
        sheet.Results.Add(new("Flow area A", SheetHtml.Fmt(r.Area), u.IsUs ? "ft2" : "m2", ""));
        sheet.Results.Add(new("Top width T", SheetHtml.Fmt(r.TopWidth), lu, ""));
        sheet.Results.Add(new("Velocity V", SheetHtml.Fmt(r.Velocity), u.IsUs ? "ft/s" : "m/s", ""));
        sheet.Results.Add(new("Specific energy (least)", SheetHtml.Fmt(r.SpecificEnergy), lu, ""));
        sheet.Results.Add(new("Critical slope", SheetHtml.Fmt(r.CriticalSlope), "m/m", r.CriticalSlope is null ? "needs a Manning n" : ""));

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual, "ln(g A^3 / (Q^2 T)): the relative mismatch of the critical-flow condition",
            r.Status, SheetParts.StopReason(r.Status), ChannelSheetParts.SolveVariable(read.Section, critical: true), steps,
            ChannelSheetParts.RecordNote(r.Iterations, r.Status, steps.Count, read.Section, critical: true));
        sheet.Warnings.AddRange(r.Warnings);

        var levels = new List<(string, double, bool, bool)> { ("critical depth", r.CriticalDepth, true, false) };
        foreach (var d in r.AlternateCriticalDepths ?? []) levels.Add(("further critical depth", d, true, true));
        sheet.Figures.Add(ChannelSheetParts.Drawing(read.Section, u, levels,
            "The cross-section to scale (both axes in one unit) with the critical-depth water line" + (r.AlternateCriticalDepths is null ? "." : "s.")));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(ln ratio)", "Residual of the critical-flow condition at each iteration of the solve, log scale; the last iteration is marked."));
        return sheet;
    }
}
