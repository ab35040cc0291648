using System.Globalization;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Channels;

/// <summary>The water-surface profile's sheet: inputs, the long section (bed, water surface, normal- and critical-depth
/// lines, the jump), the station table, and the solver's summary, all from the one solve's answer.</summary>
public static class ChannelProfileSheet
{
    private const string Name = "channels/profile";
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public static Sheet Build(ChannelProfileRequest request, ChannelProfileResponse r)
    {
        var read = ChannelSheetParts.ReadRequest(request);
        var u = read.Units;
        string lu = u.LengthUnit, vu = u.IsUs ? "ft/s" : "m/s";
        var sheet = new Sheet { Title = "Water-surface profile in a prismatic channel", Calculation = Name };
        ChannelSheetParts.Inputs(sheet, read, r.Shape);
        sheet.Inputs.Add(new("Reach length L", SheetHtml.Fmt(request.Length), lu, "as given"));
        if (request.ControlDepth is double y0)
            sheet.Inputs.Add(new("Control depth", SheetHtml.Fmt(y0), lu, (request.ControlAt ?? "downstream") + " end"));
        if (request.UpstreamControlDepth is double yu) sheet.Inputs.Add(new("Upstream control depth", SheetHtml.Fmt(yu), lu, "supercritical, as given"));
        if (request.DownstreamControlDepth is double yd) sheet.Inputs.Add(new("Downstream control depth", SheetHtml.Fmt(yd), lu, "subcritical, as given"));
        sheet.Assumptions.AddRange(r.Assumptions);

        sheet.Methods.Add(new("Gradually varied flow", "dy/dx = (S0 - Sf)/(1 - Fr^2), Fr^2 = Q^2 T/(g A^3), Sf = Q^2 n^2/(A^2 R^(4/3)) (SI); energy coefficient 1",
            "Chow (1959), Open-Channel Hydraulics, chapter 9 (from memory)"));
        sheet.Methods.Add(new("Exact integration", "x(y) = integral of dx/dy by adaptive Gauss-Kronrod (7-15 points) to about 1e-13 relative; the depth at a station is the root of x(y) - x by safeguarded Newton",
            "Kronrod (1965) nodes and weights, as in QUADPACK (Piessens et al. 1983)"));
        if (r.Jump is not null)
        {
            sheet.Methods.Add(new("Hydraulic jump", "equal momentum function A ybar + Q^2/(g A) on both sides; the jump stands where the supercritical profile's sequent depth equals the subcritical profile's depth (a root in distance, safeguarded Newton)",
                "Belanger (1828); Chow (1959), chapter 15 (from memory)"));
            sheet.Methods.Add(new("Jump length", "L = 6.1 y2 (horizontal rectangular apron, upstream Froude number 4.5 to 13)", "Peterka (1958), USBR Engineering Monograph 25 (from memory)"));
        }

        sheet.Results.Add(new("Slope class", r.SlopeClass, "", ""));
        sheet.Results.Add(new("Profile type", r.ProfileType, "", r.Jump is null ? "" : "upstream profile + downstream profile"));
        sheet.Results.Add(new("Normal depth yn", r.NormalDepth is double yn ? SheetHtml.Fmt(yn) : "none", lu, r.NormalDepth is null ? "horizontal or adverse bed, or above a closed section's capacity" : ""));
        sheet.Results.Add(new("Critical depth yc", SheetHtml.Fmt(r.CriticalDepth), lu, ""));
        if (r.CriticalDepthDistance is double xc)
            sheet.Results.Add(new("Reaches critical depth at", SheetHtml.Fmt(xc), lu, "from the downstream end; no stations past it"));
        if (r.Jump is { } j)
        {
            sheet.Results.Add(new("Jump at", SheetHtml.Fmt(j.Distance), lu, "from the downstream end"));
            sheet.Results.Add(new("Depth before the jump y1", SheetHtml.Fmt(j.UpstreamDepth), lu, string.Create(C, $"Froude number {j.UpstreamFroudeNumber:G4}")));
            sheet.Results.Add(new("Sequent depth y2", SheetHtml.Fmt(j.SequentDepth), lu, ""));
            sheet.Results.Add(new("Energy lost in the jump", SheetHtml.Fmt(j.EnergyLoss), lu, ""));
            sheet.Results.Add(new("Jump length (indication)", SheetHtml.Fmt(j.JumpLength), lu, "6.1 y2"));
        }

        sheet.Tables.Add(new SheetTable("stations", "Stations",
            [$"Distance ({lu})", $"Depth ({lu})", $"Velocity ({vu})", "Froude number", $"Specific energy ({lu})", "Friction slope (m/m)"],
            r.Stations.Select(s => new[] { SheetHtml.Fmt(s.Distance), SheetHtml.Fmt(s.Depth), SheetHtml.Fmt(s.Velocity), SheetHtml.Fmt(s.FroudeNumber),
                SheetHtml.Fmt(s.SpecificEnergy), SheetHtml.Fmt(s.FrictionSlope) }).ToArray(),
            "Distance runs from the downstream end (0) upstream." + (r.Jump is null ? "" : " The jump appears as two rows at one distance: the sequent depth (downstream side) and the supercritical depth (upstream side).")));

        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual,
            "the largest |x(y) - x| over the stations, relative to the reach length" + (r.Jump is null ? "" : ", or the jump's relative depth mismatch if larger"),
            r.Status, SheetParts.StopReason(r.Status), "the depth at each station (m)", [],
            string.Create(C, $"Newton steps over all stations{(r.Jump is null ? "" : " and the jump's distance")}: {r.Iterations}. Each station is its own root; the per-station iterations are not listed."));
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);
        sheet.Figures.Add(LongSection(r, request.Slope ?? 0, lu));
        return sheet;
    }

    /// <summary>The long section: elevations above the bed at the downstream end (the bed rises S0 x upstream).</summary>
    private static SheetFigure LongSection(ChannelProfileResponse r, double slope, string lu)
    {
        var st = r.Stations;
        double xMax = st.Max(s => s.Distance), xMin = st.Min(s => s.Distance);
        double length = Math.Max(xMax, 1e-300);
        double Bed(double x) => slope * x;
        var bed = new List<(double X, double Y)> { (0, Bed(0)), (length, Bed(length)) };
        double top = st.Max(s => Bed(s.Distance) + s.Depth);
        foreach (double? d in new[] { r.NormalDepth, r.CriticalDepth }) if (d is double v) top = Math.Max(top, Math.Max(Bed(0), Bed(length)) + v);
        double bottom = Math.Min(Bed(0), Bed(length));
        double pad = 0.08 * (top - bottom);
        var plot = new SvgPlot("plot-profile", "Long section", new PlotAxis($"distance from the downstream end ({lu})", 0, length),
            new PlotAxis($"elevation above the downstream bed ({lu})", bottom - pad, top + pad), height: 380);
        plot.Curve("bed", bed, accent: false, role: "bed");
        if (r.NormalDepth is double yn) plot.Curve("normal depth", bed.Select(p => (p.X, p.Y + yn)).ToList(), dashed: true, role: "normal-depth");
        plot.Curve("critical depth", bed.Select(p => (p.X, p.Y + r.CriticalDepth)).ToList(), dashed: true, role: "critical-depth");
        if (r.Jump is { } j)
        {
            var below = st.Where(s => s.Distance <= j.Distance).ToList();
            var above = st.Where(s => s.Distance >= j.Distance).ToList();
            // At the jump's distance the downstream side's row (the sequent depth) comes first.
            below = below.Take(below.Count - 1).ToList();
            above = above.Skip(1).ToList();
            plot.Curve("water surface (subcritical)", below.Select(s => (s.Distance, Bed(s.Distance) + s.Depth)).ToList(), accent: true, role: "water-surface");
            plot.Curve("water surface (supercritical)", above.Select(s => (s.Distance, Bed(s.Distance) + s.Depth)).ToList(), accent: true, role: "water-surface");
            plot.Segment("jump", j.Distance, Bed(j.Distance) + j.UpstreamDepth, j.Distance, Bed(j.Distance) + j.SequentDepth,
                string.Create(C, $"jump at {j.Distance:G5} {lu}"), role: "jump");
        }
        else
        {
            plot.Curve("water surface", st.Select(s => (s.Distance, Bed(s.Distance) + s.Depth)).ToList(), accent: true, role: "water-surface");
        }
        return new SheetFigure("profile", plot.Render(),
            "The long section: bed (grey), water surface (accent), normal-depth and critical-depth lines (dashed)" + (r.Jump is null ? "." : ", and the jump.") +
            " Vertical and horizontal scales differ.");
    }
}
