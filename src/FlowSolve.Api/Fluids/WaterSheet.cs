using System.Globalization;
using FlowSolve.Api.Sheets;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core.Fluids;

namespace FlowSolve.Api.Fluids;

/// <summary>The water-properties sheet: explicit formulations, so no iterations; the viscosity curve with the case marked.</summary>
public static class WaterSheet
{
    public static Sheet Build(WaterRequest request, WaterResponse r)
    {
        var units = UnitSystem.Parse(r.Units, new FieldErrors());
        var sheet = new Sheet { Title = "Properties of liquid water", Calculation = "fluids/water" };
        sheet.Inputs.Add(new("Temperature", SheetHtml.Fmt(r.Temperature), units.TemperatureUnit, "as given"));
        sheet.Inputs.Add(new("Pressure", SheetHtml.Fmt(r.Pressure), units.PressureUnit, "1 standard atmosphere"));
        sheet.Inputs.Add(new("Units", r.Units, "", request.Units is null ? "default" : "as given"));
        sheet.Assumptions.AddRange(r.Assumptions);
        sheet.Methods.Add(new("Density", "IAPWS-IF97 region 1 Gibbs free energy", "IAPWS-IF97 (1997), region 1"));
        sheet.Methods.Add(new("Vapour pressure", "IAPWS-IF97 region 4 saturation equation", "IAPWS-IF97 (1997), region 4"));
        sheet.Methods.Add(new("Viscosity", "IAPWS 2008 viscosity correlation, industrial form", "IAPWS R12-08 (2008)"));
        sheet.Results.Add(new("Kinematic viscosity", SheetHtml.Fmt(r.KinematicViscosity), units.KinematicViscosityUnit, "dynamic viscosity / density"));
        sheet.Results.Add(new("Density", SheetHtml.Fmt(r.Density), units.DensityUnit, ""));
        sheet.Results.Add(new("Dynamic viscosity", SheetHtml.Fmt(r.DynamicViscosity), units.IsUs ? "lbf s/ft2" : "Pa s", ""));
        sheet.Results.Add(new("Vapour pressure", SheetHtml.Fmt(r.VapourPressure), units.PressureUnit, ""));
        sheet.Solver = new SolverRecord(0, true, 0, "none", "explicit", "explicit formulations: nothing is solved", "none", [],
            "The IAPWS formulations used here are explicit in temperature at 1 atm: no iterations.");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);

        var points = Enumerable.Range(0, 51).Select(i => 2.0 * i)
            .Select(t => (units.Temperature(t), units.KinematicViscosity(Water.At(t).KinematicViscosity))).ToArray();
        var plot = new SvgPlot("plot-water", "Kinematic viscosity of water at 1 atm",
            new PlotAxis($"temperature ({units.TemperatureUnit})", units.Temperature(0), units.Temperature(100)),
            new PlotAxis($"kinematic viscosity ({units.KinematicViscosityUnit})", 0, points.Max(p => p.Item2) * 1.05));
        plot.Curve("kinematic viscosity", points, role: "property");
        plot.Marker("case", r.Temperature, r.KinematicViscosity, string.Create(CultureInfo.InvariantCulture, $"{r.KinematicViscosity:G5}"));
        sheet.Figures.Add(new SheetFigure("water", plot.Render(), "Kinematic viscosity against temperature from the same formulations, every 2 degrees C; the case is marked."));
        sheet.Figures.Add(SheetParts.Convergence([], "", "No iterative solve: the properties are explicit in temperature."));
        return sheet;
    }
}
