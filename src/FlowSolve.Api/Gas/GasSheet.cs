using System.Globalization;
using FlowSolve.Api.Friction;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Gas;

/// <summary>The gas-line sheet: the inputs, the relation, the answer with the isothermal limit, the solve, and the pressure
/// along the line.</summary>
public static class GasSheet
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public static Sheet Build(GasPipeFlowRequest q, GasPipeFlowResponse r)
    {
        var u = UnitSystem.Parse(r.Units, new FieldErrors());
        string p = u.IsUs ? "psi (absolute)" : "Pa (absolute)", m = u.IsUs ? "lb/s" : "kg/s";
        var sheet = new Sheet { Title = "Gas line: isothermal flow in a horizontal pipe", Calculation = "gas/pipe-flow" };
        string given(object? v) => v is null ? "default" : "as given";
        sheet.Inputs.Add(new("Inlet pressure p1", SheetHtml.Fmt(q.InletPressure), p, "as given"));
        if (q.OutletPressure is not null) sheet.Inputs.Add(new("Outlet pressure p2", SheetHtml.Fmt(q.OutletPressure), p, "as given"));
        if (q.MassFlow is not null) sheet.Inputs.Add(new("Mass flow", SheetHtml.Fmt(q.MassFlow), m, "as given"));
        sheet.Inputs.Add(new("Temperature T", SheetHtml.Fmt(q.Temperature), u.TemperatureUnit, "constant along the line"));
        sheet.Inputs.Add(new("Molar mass M", SheetHtml.Fmt(r.MolarMass), "kg/mol",
            q.SpecificGravity is { } sg ? string.Create(C, $"specific gravity {sg:G6} x 0.0289647 kg/mol") : "as given"));
        sheet.Inputs.Add(new("Compressibility factor Z", SheetHtml.Fmt(q.CompressibilityFactor ?? 1), "-", given(q.CompressibilityFactor)));
        sheet.Inputs.Add(new("Dynamic viscosity mu", SheetHtml.Fmt(q.DynamicViscosity), u.IsUs ? "lbf s/ft2" : "Pa s", "as given"));
        sheet.Inputs.Add(new("Heat capacity ratio k", SheetHtml.Fmt(q.HeatCapacityRatio ?? 1.3), "-", given(q.HeatCapacityRatio)));
        sheet.Inputs.Add(new("Length L", SheetHtml.Fmt(q.Length), u.LengthUnit, "as given"));
        sheet.Inputs.Add(new("Inside diameter D", SheetHtml.Fmt(q.Diameter), u.LengthUnit, "as given"));
        sheet.Inputs.Add(new("Absolute roughness e", SheetHtml.Fmt(q.Roughness), u.LengthUnit, "as given"));
        sheet.Inputs.Add(new("Units", r.Units, "", given(q.Units)));
        sheet.Assumptions.AddRange(r.Assumptions);

        sheet.Methods.Add(new("Isothermal flow", "p1^2 - p2^2 = (Z R T G^2 / M) (f L/D + 2 ln(p1/p2)), G = mass flow / area, R = 8.314462618 J/(mol K)",
            "Shapiro (1953), The Dynamics and Thermodynamics of Compressible Fluid Flow, vol. 1, ch. 6 (from memory); R: CODATA 2018"));
        sheet.Methods.Add(new("Isothermal limit", "outlet velocity sqrt(Z R T / M), outlet Mach number 1/sqrt(k); at the largest flow y - 1 - ln y = f L/D, y = p1^2 / (Z R T G^2 / M)",
            "the same relation at the maximum of the mass flow over the outlet pressure"));
        FrictionSheet.AddMethods(sheet.Methods, r.FrictionRelation);
        sheet.Methods.Add(new("Standard volume flow", "mass flow / (101325 M / (R 288.15 K)), the gas ideal at standard conditions", "15 degrees C and 101 325 Pa (common practice)"));

        sheet.Results.Add(new(r.SolvedFor == "massFlow" ? "Mass flow (solved)" : "Mass flow", SheetHtml.Fmt(r.MassFlow), m, ""));
        sheet.Results.Add(new(r.SolvedFor == "outletPressure" ? "Outlet pressure p2 (solved)" : "Outlet pressure p2", SheetHtml.Fmt(r.OutletPressure), p, ""));
        sheet.Results.Add(new("Pressure drop p1 - p2", SheetHtml.Fmt(r.PressureDrop), u.IsUs ? "psi" : "Pa", ""));
        sheet.Results.Add(new("Largest mass flow (isothermal limit)", SheetHtml.Fmt(r.LargestMassFlow), m,
            r.LargestMassFlow is double big ? string.Create(C, $"this flow is {r.MassFlow / big * 100:0.##} % of it") : "outside the friction relations' range"));
        sheet.Results.Add(new("Outlet pressure at the limit", SheetHtml.Fmt(r.OutletPressureAtLimit), p, ""));
        sheet.Results.Add(new("Standard volume flow", SheetHtml.Fmt(r.StandardVolumeFlow), u.IsUs ? "ft3/s" : "m3/s", "at 15 degrees C and 101 325 Pa, Z = 1"));
        sheet.Results.Add(new("Inlet velocity / Mach number", SheetHtml.Fmt(r.InletVelocity) + " / " + SheetHtml.Fmt(r.InletMachNumber), u.VelocityUnit + " / -", ""));
        sheet.Results.Add(new("Outlet velocity / Mach number", SheetHtml.Fmt(r.OutletVelocity) + " / " + SheetHtml.Fmt(r.OutletMachNumber), u.VelocityUnit + " / -",
            string.Create(C, $"limit velocity {r.LimitVelocity:G5} {u.VelocityUnit}, Mach number {1 / Math.Sqrt(q.HeatCapacityRatio ?? 1.3):G4}")));
        sheet.Results.Add(new("Inlet / outlet density", SheetHtml.Fmt(r.InletDensity) + " / " + SheetHtml.Fmt(r.OutletDensity), u.DensityUnit, ""));
        sheet.Results.Add(new("Reynolds number", SheetHtml.Fmt(r.Reynolds), "-", "G D / mu, the same all along the line"));
        sheet.Results.Add(new("Darcy friction factor f", SheetHtml.Fmt(r.FrictionFactor), "-", "by " + r.FrictionRelation));

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual, "the relation's residual divided by p1^2", r.Status,
            SheetParts.StopReason(r.Status), r.SolveVariable, steps,
            r.Iterations == 0 ? "No iteration was needed (the drop is below double precision, or the flow is exactly at the limit)." : "The iterations of this answer's own solve.");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);
        if (Profile(q, r) is { } profile) sheet.Figures.Add(profile);
        sheet.Figures.Add(SheetParts.Convergence(steps, "(solve residual)", "Residual of the main solve per iteration."));
        return sheet;
    }

    /// <summary>Pressure along the line from the relation itself, explicit in the distance: with ratio = p/p1,
    /// x/L = ((1 - ratio^2)/beta + 2 ln ratio) / (f L/D), beta = (inlet velocity / limit velocity)^2. No solve is needed.</summary>
    private static SheetFigure? Profile(GasPipeFlowRequest q, GasPipeFlowResponse r)
    {
        if (q.Length is not double length || q.Diameter is not double diameter) return null;
        double beta = r.InletVelocity / r.LimitVelocity * (r.InletVelocity / r.LimitVelocity);
        double f = r.FrictionFactor * length / diameter, end = r.OutletPressure / r.InletPressure;
        if (!(beta > 0) || !(f > 0) || !(end < 1) || !double.IsFinite(beta + f)) return null;
        var points = new List<(double X, double Y)>();
        for (int i = 0; i <= 40; i++)
        {
            double ratio = 1 - (1 - end) * i / 40.0;
            double x = Math.Clamp(((1 - ratio * ratio) / beta + 2 * Math.Log(ratio)) / f, 0, 1);
            points.Add((x * length, ratio * r.InletPressure));
        }
        var u = UnitSystem.Parse(r.Units, new FieldErrors());
        string pUnit = u.IsUs ? "psi" : "Pa";
        var plot = new SvgPlot("plot-gas-profile", "Pressure along the line",
            new PlotAxis($"distance from the inlet ({u.LengthUnit})", 0, length),
            new PlotAxis($"absolute pressure ({pUnit})", 0, r.InletPressure * 1.05));
        plot.Curve("pressure", points, role: "property");
        if (r.OutletPressureAtLimit is double limit) plot.HorizontalLine("choking pressure", limit, "outlet pressure at the largest flow");
        plot.Marker("outlet", length, r.OutletPressure, string.Create(C, $"{r.OutletPressure:G5}"));
        return new SheetFigure("gas-profile", plot.Render(),
            "Absolute pressure against distance, from the relation written for a part of the line (explicit in the distance); the outlet is marked, and the line is the outlet pressure at which this inlet pressure's largest flow would choke.");
    }
}
