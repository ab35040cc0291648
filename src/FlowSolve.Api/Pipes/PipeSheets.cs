using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Friction;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Api.Pipes;

/// <summary>What the three pipe sheets share: the pipe's inputs, the relations, and the head-loss curve.</summary>
internal static class PipeSheetParts
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>Flows at which the head-loss curve is drawn: 40 equal steps from 1/40 to 2 times the case's flow (SI).</summary>
    public static double[] CurveFlows(double caseFlowSi) =>
        Enumerable.Range(1, 80).Select(i => caseFlowSi * i / 40.0).ToArray();

    /// <summary>The request's shared fields read again (they passed validation already), in SI.</summary>
    public static PipeProblem Read(IPipeRequest request) => PipeProblem.Read(request, new FieldErrors());

    public static void Inputs(Sheet sheet, IPipeRequest request, PipeProblem input, double length, double roughness, double k,
        double nu, double? rho, double elevation)
    {
        var u = input.Units;
        sheet.Inputs.Add(new("Length L", SheetHtml.Fmt(length), u.LengthUnit, "as given"));
        sheet.Inputs.Add(new("Absolute roughness e", SheetHtml.Fmt(roughness), u.LengthUnit,
            request.Material is { } m ? "from material " + m : "as given"));
        sheet.Inputs.Add(new("Minor loss coefficient sum K", SheetHtml.Fmt(k), "-",
            request.Fittings is not null ? "summed over the fittings" : request.MinorLossCoefficient is null ? "default" : "as given"));
        if (request.Fittings is { } fittings)
            foreach (var f in fittings)
                sheet.Inputs.Add(new("  Fitting " + f.Name, SheetHtml.Fmt(f.Count ?? 1), "count", ""));
        sheet.Inputs.Add(new("Elevation change z2 - z1", SheetHtml.Fmt(elevation), u.LengthUnit, request.ElevationChange is null ? "default" : "as given"));
        sheet.Inputs.Add(new("Kinematic viscosity nu", SheetHtml.Fmt(nu), u.KinematicViscosityUnit,
            request.Temperature is { } t ? string.Create(C, $"water at {t:G6} {u.TemperatureUnit}") : request.KinematicViscosity is null ? "default fluid" : "as given"));
        sheet.Inputs.Add(new("Density rho", SheetHtml.Fmt(rho), u.DensityUnit, rho is null ? "not known: no pressures" : ""));
        sheet.Inputs.Add(new("Method", input.MethodCode, "", request.Method is null ? "default" : "as given"));
        if (input.HazenWilliams) sheet.Inputs.Add(new("Hazen-Williams C", SheetHtml.Fmt(input.HazenWilliamsC), "-", "as given"));
        sheet.Inputs.Add(new("Units", u.Code + ", flows in " + input.FlowUnit.Code, "", request.Units is null ? "default" : "as given"));
    }

    public static void Methods(Sheet sheet, PipeProblem input, string relation, IPipeRequest request)
    {
        sheet.Methods.Add(new("Darcy-Weisbach", "hf = f (L/D) V^2/(2g); V = 4Q/(pi D^2); g = 9.80665 m/s2",
            "Weisbach (1845) and Darcy (1857), from memory; standard gravity, 3rd CGPM (1901)"));
        sheet.Methods.Add(new("Minor losses", "hm = K V^2/(2g), K summed over the fittings",
            request.Fittings is not null ? MinorLossTable.Source : "common practice"));
        FrictionSheet.AddMethods(sheet.Methods, relation);
        if (input.HazenWilliams)
            sheet.Methods.Add(new("Hazen-Williams", "V = 0.849 C R^0.63 S^0.54 (SI), water only", "Williams and Hazen (1905), from memory"));
        if (request.Material is not null)
            sheet.Methods.Add(new("Roughness table", "absolute roughness of the named material", RoughnessTable.Source));
        if (request.Temperature is not null || request.KinematicViscosity is null)
            sheet.Methods.Add(new("Water properties", "density and viscosity of liquid water at 1 atm", "IAPWS-IF97 (1997); IAPWS R12-08 (2008)"));
    }

    /// <summary>Head loss (friction + minor) against flow for the pipe at <paramref name="diameterSi"/>, the case marked.</summary>
    public static SheetFigure Curve(PipeProblem input, double diameterSi, double caseFlow, double caseHeadLoss, string flowUnit,
        double? referenceHead, string caption)
    {
        var u = input.Units;
        var pipe = new PipeGeometry(input.Length, diameterSi, input.Roughness, input.MinorLossCoefficient);
        var points = new List<(double, double)>();
        foreach (double q in CurveFlows(input.FlowUnit.ToSi(caseFlow)))
        {
            try
            {
                double h = input.HazenWilliams
                    ? HazenWilliams.HeadLoss(pipe, input.Fluid, q, input.HazenWilliamsC).HeadLoss
                    : PipeHeadLoss.Compute(pipe, input.Fluid, q).HeadLoss;
                points.Add((input.FlowUnit.FromSi(q), u.Length(h)));
            }
            catch (ArgumentException)
            {
                // Beyond the friction relations' Reynolds range: the curve stops there.
                break;
            }
        }
        double yMax = Math.Max(points.Count > 0 ? points.Max(p => p.Item2) : 0, caseHeadLoss) * 1.08;
        var plot = new SvgPlot("plot-head-loss", "Head loss against flow",
            new PlotAxis($"flow Q ({flowUnit})", 0, 2 * caseFlow * 1.02), new PlotAxis($"head loss hf + hm ({u.LengthUnit})", 0, yMax));
        plot.Curve(input.HazenWilliams ? "hazen-williams" : "darcy-weisbach", points, accent: false, role: "head-loss");
        if (referenceHead is double head) plot.HorizontalLine("driving head", head, string.Create(C, $"head for the losses {head:G5} {u.LengthUnit}"));
        plot.Marker("case", caseFlow, caseHeadLoss, string.Create(C, $"Q = {caseFlow:G5}, h = {caseHeadLoss:G5}"));
        return new SheetFigure("head-loss", plot.Render(), caption);
    }

    public static string UnitOfPressure(PipeProblem input) => input.Units.PressureUnit;
}

/// <summary>The head-loss sheet.</summary>
public static class PipeHeadLossSheet
{
    /// <summary>The sheet of an answer; its sensitivities are added by the hosting layer, its roughness spread here.</summary>
    public static Sheet Build(PipeHeadLossRequest request, PipeHeadLossResponse r)
    {
        var input = PipeSheetParts.Read(request);
        var u = input.Units;
        var sheet = new Sheet { Title = "Head loss of a pipe", Calculation = "pipes/head-loss", RoughnessSpread = r.RoughnessSpread };
        sheet.Inputs.Add(new("Flow Q", SheetHtml.Fmt(r.Flow), r.FlowUnit, "as given"));
        sheet.Inputs.Add(new("Inside diameter D", SheetHtml.Fmt(r.Diameter), u.LengthUnit, "as given"));
        PipeSheetParts.Inputs(sheet, request, input, r.Length, r.Roughness, r.MinorLossCoefficient, r.KinematicViscosity, r.Density, r.ElevationChange);
        sheet.Assumptions.AddRange(r.Assumptions);
        PipeSheetParts.Methods(sheet, input, r.Relation, request);

        sheet.Results.Add(new("Head loss hf + hm", SheetHtml.Fmt(r.HeadLoss), u.LengthUnit, "by " + r.Method));
        sheet.Results.Add(new("Friction loss hf", SheetHtml.Fmt(r.FrictionHeadLoss), u.LengthUnit, ""));
        sheet.Results.Add(new("Minor loss hm", SheetHtml.Fmt(r.MinorHeadLoss), u.LengthUnit, ""));
        sheet.Results.Add(new("Total head (losses + elevation)", SheetHtml.Fmt(r.TotalHead), u.LengthUnit, ""));
        sheet.Results.Add(new("Pressure drop", SheetHtml.Fmt(r.PressureDrop), u.PressureUnit, ""));
        sheet.Results.Add(new("Velocity V", SheetHtml.Fmt(r.Velocity), u.VelocityUnit, ""));
        sheet.Results.Add(new("Reynolds number", SheetHtml.Fmt(r.Reynolds), "-", ""));
        sheet.Results.Add(new("Relative roughness e/D", SheetHtml.Fmt(r.RelativeRoughness), "-", ""));
        sheet.Results.Add(new("Darcy friction factor f", SheetHtml.Fmt(r.FrictionFactor), "-", r.Relation + ", " + r.Regime));
        if (r.DarcyWeisbach is { } dw)
            sheet.Results.Add(new("Darcy-Weisbach head loss (comparison)", SheetHtml.Fmt(dw.HeadLoss), u.LengthUnit,
                string.Create(CultureInfo.InvariantCulture, $"Hazen-Williams differs by {dw.DifferencePercent:+0.##;-0.##;0} %")));

        // The head loss itself is explicit; the iterations are those of the Colebrook-White friction factor of the one
        // solve behind this answer (traced for the sheet).
        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual,
            "Colebrook-White in x = 1/sqrt(f), at the friction factor used", r.Status,
            r.Status == "solved" ? "the friction factor converged; the head loss is explicit" : "the friction factor did not converge",
            "1/sqrt(f)", steps,
            steps.Count == 0 ? "The friction relation used is explicit: no iterations."
                : "Iterations of the Colebrook-White friction factor of this head-loss solve; residuals are at each iterate.");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);

        sheet.Figures.Add(PipeSheetParts.Curve(input, u.LengthToSi(r.Diameter), r.Flow, r.HeadLoss, r.FlowUnit, null,
            "Friction + minor head loss of this pipe against flow, computed by FlowSolve from 1/40 to twice the given flow; the case is marked."));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(x = 1/sqrt(f))", "Residual of Colebrook-White at each iteration, log scale; the last iteration is marked."));
        return sheet;
    }
}

/// <summary>The flow sheet.</summary>
public static class PipeFlowSheet
{
    /// <summary>The sheet of an answer solved with the trace on (the outer iterations behind it are in <c>r.Trace</c>).</summary>
    public static Sheet Build(PipeFlowRequest request, PipeFlowResponse r)
    {
        var input = PipeSheetParts.Read(request);
        var u = input.Units;
        var sheet = new Sheet { Title = "Flow through a pipe from the available head", Calculation = "pipes/flow", RoughnessSpread = r.RoughnessSpread };
        sheet.Inputs.Add(new("Available head (headLoss)", SheetHtml.Fmt(r.AvailableHead), u.LengthUnit, "as given"));
        sheet.Inputs.Add(new("Inside diameter D", SheetHtml.Fmt(r.Diameter), u.LengthUnit, "as given"));
        PipeSheetParts.Inputs(sheet, request, input, r.Length, r.Roughness, r.MinorLossCoefficient, r.KinematicViscosity, r.Density, r.ElevationChange);
        sheet.Assumptions.AddRange(r.Assumptions);
        PipeSheetParts.Methods(sheet, input, r.Relation, request);
        sheet.Methods.Add(new("Flow solve", "ln(hf(Q) + hm(Q)) = ln(available head - elevation change), safeguarded Newton in ln Q",
            "FlowSolve's bracketed Newton-bisection (after Press et al., Numerical Recipes, rtsafe)"));

        sheet.Results.Add(new("Flow Q", SheetHtml.Fmt(r.Flow), r.FlowUnit, "by " + r.Method));
        if (r.AlternateFlow is double altQ) sheet.Results.Add(new("Alternate flow", SheetHtml.Fmt(altQ), r.FlowUnit,
            "a second flow meets the same head: transitional, Churchill (see the second-solution warning)"));
        sheet.Results.Add(new("Velocity V", SheetHtml.Fmt(r.Velocity), u.VelocityUnit, ""));
        sheet.Results.Add(new("Head for the losses (driving head)", SheetHtml.Fmt(r.DrivingHead), u.LengthUnit, "available head - elevation change"));
        sheet.Results.Add(new("Head loss hf + hm at Q", SheetHtml.Fmt(r.HeadLoss), u.LengthUnit, ""));
        sheet.Results.Add(new("Pressure drop", SheetHtml.Fmt(r.PressureDrop), u.PressureUnit, ""));
        sheet.Results.Add(new("Reynolds number", SheetHtml.Fmt(r.Reynolds), "-", ""));
        sheet.Results.Add(new("Darcy friction factor f", SheetHtml.Fmt(r.FrictionFactor), "-", r.Relation + ", " + r.Regime));
        if (r.DarcyWeisbach is { } dw)
            sheet.Results.Add(new("Darcy-Weisbach flow (comparison)", SheetHtml.Fmt(dw.Flow), r.FlowUnit,
                string.Create(CultureInfo.InvariantCulture, $"Hazen-Williams differs by {dw.DifferencePercent:+0.##;-0.##;0} %")));

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual, "ln(hf + hm) - ln(driving head) at the flow found",
            r.SolverStatus, SheetParts.StopReason(r.SolverStatus) + "; pipe status " + r.Status, r.SolveVariable, steps,
            "Outer Darcy-Weisbach iterations in ln Q, as recorded by the solve behind this answer; "
            + r.FrictionIterations.ToString(CultureInfo.InvariantCulture) + " Colebrook-White iterations in all inside them.");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);

        sheet.Figures.Add(PipeSheetParts.Curve(input, u.LengthToSi(r.Diameter), r.Flow, r.HeadLoss, r.FlowUnit, r.DrivingHead,
            "Friction + minor head loss of this pipe against flow, computed by FlowSolve; the flow found is where the curve meets the head left for the losses (dotted)."));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(ln of head ratio)", "Residual of the flow solve at each iteration, log scale; the last iteration is marked."));
        return sheet;
    }
}

/// <summary>The diameter sheet.</summary>
public static class PipeDiameterSheet
{
    /// <summary>The sheet of an answer solved with the trace on (the outer iterations behind it are in <c>r.Trace</c>).</summary>
    public static Sheet Build(PipeDiameterRequest request, PipeDiameterResponse r)
    {
        var input = PipeSheetParts.Read(request);
        var u = input.Units;
        var sheet = new Sheet { Title = "Minimum pipe diameter for an allowed head loss", Calculation = "pipes/diameter", RoughnessSpread = r.RoughnessSpread };
        sheet.Inputs.Add(new("Flow Q", SheetHtml.Fmt(r.Flow), r.FlowUnit, "as given"));
        sheet.Inputs.Add(new("Allowed head loss (headLoss - elevation change)", SheetHtml.Fmt(r.AllowedHeadLoss), u.LengthUnit, ""));
        PipeSheetParts.Inputs(sheet, request, input, r.Length, r.Roughness, r.MinorLossCoefficient, r.KinematicViscosity, r.Density, r.ElevationChange);
        if (request.SizeTable is { } table) sheet.Inputs.Add(new("Size table", table, "", "as given"));
        sheet.Assumptions.AddRange(r.Assumptions);
        PipeSheetParts.Methods(sheet, input, r.Relation, request);
        sheet.Methods.Add(new("Diameter solve", "ln(hf(D) + hm(D)) = ln(allowed head loss), safeguarded Newton in ln D",
            "FlowSolve's bracketed Newton-bisection (after Press et al., Numerical Recipes, rtsafe)"));

        sheet.Results.Add(new("Minimum inside diameter D", SheetHtml.Fmt(r.Diameter), u.LengthUnit, ""));
        if (r.AlternateDiameter is double altD) sheet.Results.Add(new("Alternate diameter", SheetHtml.Fmt(altD), u.LengthUnit,
            "a second diameter gives the same loss: transitional, Churchill; the diameters between the one at Re 4000 and this exceed it"));
        if (r.SelectedSize is { } s)
        {
            sheet.Results.Add(new("Selected size", s.Name, "", s.Table));
            sheet.Results.Add(new("  its inside diameter", SheetHtml.Fmt(s.InsideDiameter), u.LengthUnit, ""));
            sheet.Results.Add(new("  head loss at the selected size", SheetHtml.Fmt(s.HeadLoss), u.LengthUnit, ""));
            sheet.Results.Add(new("  velocity at the selected size", SheetHtml.Fmt(s.Velocity), u.VelocityUnit, ""));
        }
        sheet.Results.Add(new("Velocity at D", SheetHtml.Fmt(r.Velocity), u.VelocityUnit, ""));
        sheet.Results.Add(new("Head loss hf + hm at D", SheetHtml.Fmt(r.HeadLoss), u.LengthUnit, ""));
        sheet.Results.Add(new("Reynolds number", SheetHtml.Fmt(r.Reynolds), "-", ""));
        sheet.Results.Add(new("Darcy friction factor f", SheetHtml.Fmt(r.FrictionFactor), "-", r.Relation + ", " + r.Regime));

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual, "ln(hf + hm) - ln(allowed head loss) at the diameter found",
            r.SolverStatus, SheetParts.StopReason(r.SolverStatus) + "; pipe status " + r.Status, r.SolveVariable, steps,
            "Outer iterations in ln D, as recorded by the solve behind this answer; "
            + r.FrictionIterations.ToString(CultureInfo.InvariantCulture) + " Colebrook-White iterations in all inside them.");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);

        sheet.Figures.Add(PipeSheetParts.Curve(input, u.LengthToSi(r.Diameter), r.Flow, r.HeadLoss, r.FlowUnit, r.AllowedHeadLoss,
            "Friction + minor head loss against flow for a pipe of the minimum diameter, computed by FlowSolve; at the given flow it meets the allowed loss (dotted)."));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(ln of head ratio)", "Residual of the diameter solve at each iteration, log scale; the last iteration is marked."));
        return sheet;
    }
}
