using System.Globalization;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Channels;

/// <summary>
/// The reach sheet: the inputs as understood (one row per section, the flow, the start and the coefficients), the
/// method with its sources, a table of the computed sections, a long section (bed low points, water surface, energy grade
/// line and critical elevations along the distance), validity, warnings and the cautions. Built from the one solve.
/// </summary>
public static class ReachSheet
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public static Sheet Build(ReachProfileRequest request, ReachProfileResponse r)
    {
        bool us = r.Units == "us";
        string lu = us ? "ft" : "m", qu = us ? "ft3/s" : "m3/s", vu = us ? "ft/s" : "m/s", au = us ? "ft2" : "m2";
        var sheet = new Sheet { Title = "Water surface along a surveyed reach (standard step)", Calculation = "channels/reach-profile" };

        var sections = request.Sections!;
        for (int i = 0; i < sections.Count; i++)
        {
            var s = sections[i];
            int points = s.Points?.Count ?? 0;
            sheet.Inputs.Add(new($"sections[{i}]: distance", F(s.Distance), lu,
                string.Create(C, $"{points} surveyed points; Manning n {(s.ManningN is double n ? n.ToString("G4", C) : "on every segment")}")));
        }
        sheet.Inputs.Add(new("Discharge Q", F(request.Flow), qu, "as given"));
        sheet.Inputs.Add(new("Start elevation", F(request.StartElevation), lu, $"known water surface at the {r.StartAt} end"));
        sheet.Inputs.Add(new("Expansion coefficient", F(request.ExpansionCoefficient ?? 0.3), "", request.ExpansionCoefficient is null ? "default (common practice)" : "as given"));
        sheet.Inputs.Add(new("Contraction coefficient", F(request.ContractionCoefficient ?? 0.1), "", request.ContractionCoefficient is null ? "default (common practice)" : "as given"));
        sheet.Inputs.Add(new("Units", r.Units, "", request.Units is null ? "default" : "as given"));
        sheet.Assumptions.AddRange(r.Assumptions);

        sheet.Methods.Add(new("Standard step",
            "z_u + V_u^2/(2g) = z_d + V_d^2/(2g) + L (Sf_u + Sf_d)/2 + C |V_d^2/(2g) - V_u^2/(2g)|, energy coefficient 1, g = 9.80665 m/s2; " +
            (r.StartAt == "downstream" ? "steps upstream, subcritical root" : "steps downstream, supercritical root") +
            "; critical depth where the regime has no root",
            "Chow 1959, Open-Channel Hydraulics, section 10-4; Henderson 1966, Open Channel Flow, section 4.8 (both from memory)"));
        sheet.Methods.Add(new("Manning friction slope", "Sf = (Q n / (A R^(2/3)))^2 (SI), Horton-Einstein composite n where segments carry their own",
            "Chow 1959, sections 5-6 and 6-5 (from memory)"));
        sheet.Methods.Add(new("Transition losses", "C = contraction coefficient where the velocity head rises along the flow, expansion coefficient where it falls",
            "common practice (0.1 and 0.3 for gradual transitions)"));

        sheet.Results.Add(new("Sections computed", r.Sections.Count.ToString(C), "", $"of {sections.Count}"));
        sheet.Results.Add(new("Newton iterations", r.Iterations.ToString(C), "", r.Converged ? "every section converged" : "not every section converged"));
        sheet.Results.Add(new("Largest energy-equation residual", F(r.Residual), lu, ""));
        sheet.Tables.Add(new SheetTable("sections", "Sections",
            ["Section", $"Distance ({lu})", $"Bed ({lu})", $"Water surface ({lu})", $"Depth ({lu})", $"Velocity ({vu})", "Froude", $"Energy grade line ({lu})",
             $"Critical elevation ({lu})", $"Friction loss ({lu})", $"Transition loss ({lu})", $"Area ({au})", "Iterations"],
            r.Sections.Select((s, i) => new[]
            {
                (s.CriticalDepthTaken ? "* " : "") + i.ToString(C), F(s.Distance), F(s.BedElevation), F(s.Elevation), F(s.Depth), F(s.Velocity),
                F(s.FroudeNumber), F(s.EnergyGradeLine), F(s.CriticalElevation), F(s.FrictionLoss), F(s.TransitionLoss), F(s.Area), s.Iterations.ToString(C),
            }).ToArray(),
            "Losses are those of the step that reached the section. * marks a section at critical depth (no root of the regime asked)."));
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);
        sheet.Figures.Add(LongSection(r, lu));
        return sheet;
    }

    /// <summary>Bed low points, water surface, energy grade line and critical elevations along the distance.</summary>
    private static SheetFigure LongSection(ReachProfileResponse r, string lu)
    {
        var st = r.Sections;
        double xMin = st.Min(s => s.Distance), xMax = st.Max(s => s.Distance);
        double yMin = st.Min(s => s.BedElevation), yMax = st.Max(s => Math.Max(s.EnergyGradeLine, s.Elevation));
        double pad = 0.08 * Math.Max(yMax - yMin, 1e-6);
        var plot = new SvgPlot("plot-reach", "Long section", new PlotAxis($"distance from the downstream end ({lu})", xMin, xMax),
            new PlotAxis($"elevation ({lu})", yMin - pad, yMax + pad));
        plot.Curve("bed low points", st.Select(s => (s.Distance, s.BedElevation)).ToArray(), role: "bed");
        plot.Curve("water surface", st.Select(s => (s.Distance, s.Elevation)).ToArray(), accent: true, role: "water-surface");
        plot.Curve("energy grade line", st.Select(s => (s.Distance, s.EnergyGradeLine)).ToArray(), dashed: true, role: "energy-grade-line");
        var critical = st.Where(s => s.CriticalElevation is not null).Select(s => (s.Distance, s.CriticalElevation!.Value)).ToArray();
        if (critical.Length > 1) plot.Curve("critical elevation", critical, dashed: true, role: "critical");
        return new SheetFigure("reach", plot.Render(),
            "Long section: bed low points (grey), water surface (accent), energy grade line (dashed) and critical elevations (dashed grey); flow from right to left.");
    }

    private static string F(double? v) => SheetHtml.Fmt(v);

    private static string F(double v) => SheetHtml.Fmt(v);
}
