using System.Globalization;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.NonNewtonian;

namespace FlowSolve.Api.NonNewtonian;

/// <summary>The three non-Newtonian calculation sheets: the fluid as understood, the relations with their sources, the
/// results, the solver's record, validity, warnings, and a friction chart of the fluid with the case marked.</summary>
internal static class NonNewtonianSheets
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>Number of points on each chart curve.</summary>
    public const int CurvePoints = 61;

    public static Sheet Friction(NonNewtonianFrictionRequest request, NonNewtonianFrictionResponse r)
    {
        var (sheet, input) = Start("Friction factor of a non-Newtonian fluid", "non-newtonian/friction-factor", request);
        var u = input.Units;
        sheet.Inputs.Add(new("Mean velocity V", SheetHtml.Fmt(r.Velocity), u.VelocityUnit, "as given"));
        sheet.Inputs.Add(new("Inside diameter D", SheetHtml.Fmt(r.Diameter), u.LengthUnit, "as given"));
        Results(sheet, r.FrictionFactor, r.FanningFrictionFactor, r.Reynolds, r.HedstromNumber, r.CriticalReynolds, r.Regime, r.Method,
            r.PlugRatio, r.WallShearStress, input);
        sheet.Results.Add(new("Laminar part (Fanning)", SheetHtml.Fmt(r.LaminarFanningFrictionFactor), "-", ""));
        if (r.TurbulentFanningFrictionFactor is double t) sheet.Results.Add(new("Turbulent part (Fanning)", SheetHtml.Fmt(t), "-", ""));
        Finish(sheet, r.Iterations, r.Converged, r.Residual, r.Status, r.SolveVariable, r.Trace, FrictionResidual(r.Method),
            r.Validity, r.Warnings, r.Assumptions, input, r.Reynolds, r.FanningFrictionFactor, r.HedstromNumber);
        return sheet;
    }

    public static Sheet HeadLoss(NonNewtonianHeadLossRequest request, NonNewtonianHeadLossResponse r)
    {
        var (sheet, input) = Start("Head loss of a non-Newtonian fluid in a pipe", "non-newtonian/head-loss", request);
        Pipe(sheet, input, r.Diameter, r.Length, r.MinorLossCoefficient, request.MinorLossCoefficient is null);
        sheet.Inputs.Add(new("Flow Q", SheetHtml.Fmt(r.Flow), r.FlowUnit, "as given"));
        Losses(sheet, input, r.HeadLoss, r.FrictionHeadLoss, r.MinorHeadLoss, r.PressureDrop, r.Velocity);
        Results(sheet, r.FrictionFactor, r.FanningFrictionFactor, r.Reynolds, r.HedstromNumber, r.CriticalReynolds, r.Regime, r.Method,
            r.PlugRatio, r.WallShearStress, input);
        Finish(sheet, r.Iterations, r.Converged, r.Residual, r.Status, r.SolveVariable, r.Trace, FrictionResidual(r.Method),
            r.Validity, r.Warnings, r.Assumptions, input, r.Reynolds, r.FanningFrictionFactor, r.HedstromNumber);
        return sheet;
    }

    public static Sheet Flow(NonNewtonianFlowRequest request, NonNewtonianFlowResponse r)
    {
        var (sheet, input) = Start("Flow of a non-Newtonian fluid from a head loss", "non-newtonian/flow", request);
        Pipe(sheet, input, r.Diameter, r.Length, r.MinorLossCoefficient, request.MinorLossCoefficient is null);
        sheet.Inputs.Add(new("Head loss to be met", SheetHtml.Fmt(request.HeadLoss), input.Units.LengthUnit, "as given"));
        sheet.Methods.Add(new("Inverse problem", "ln h(Q) - ln h* = 0, safeguarded Newton in ln Q with the friction factor's own slope",
            "FlowSolve's safeguarded Newton (bracketed Newton-bisection)"));
        sheet.Results.Add(new("Flow Q", SheetHtml.Fmt(r.Flow), r.FlowUnit, ""));
        if (r.YieldHeadLoss is double y) sheet.Results.Add(new("Head that starts flow 4 tau0 L/(rho g D)", SheetHtml.Fmt(y), input.Units.LengthUnit, "below it nothing flows"));
        Losses(sheet, input, r.HeadLoss, r.FrictionHeadLoss, r.MinorHeadLoss, r.PressureDrop, r.Velocity);
        Results(sheet, r.FrictionFactor, r.FanningFrictionFactor, r.Reynolds, r.HedstromNumber, r.CriticalReynolds, r.Regime, r.Method,
            r.PlugRatio, r.WallShearStress, input);
        sheet.Results.Add(new("Friction-factor iterations at this flow", SheetHtml.Fmt(r.FrictionIterations), "", ""));
        Finish(sheet, r.Iterations, r.Converged, r.Residual, r.Status, r.SolveVariable, r.Trace, "ln h(Q) - ln(headLoss) at the returned flow",
            r.Validity, r.Warnings, r.Assumptions, input, r.Reynolds, r.FanningFrictionFactor, r.HedstromNumber);
        return sheet;
    }

    private static string FrictionResidual(string method) => method == NonNewtonianFriction.DodgeMetzner
        ? "Dodge-Metzner in x = 1/sqrt(f) at the returned factor"
        : method == NonNewtonianFriction.DarbyMunBoger ? "Buckingham-Reiner in u = 1 - tau0/tau_w at the returned laminar part" : "none: explicit relation";

    private static (Sheet, NonNewtonianInput) Start(string title, string calculation, INonNewtonianRequest request)
    {
        // The request passed validation already; it is read again for the fluid in SI and its units.
        var input = NonNewtonianInput.Read(request, new FieldErrors());
        var sheet = new Sheet { Title = title, Calculation = calculation };
        var u = input.Units;
        var fluid = input.Fluid;
        string stressUnit = u.IsUs ? "lbf/ft2" : "Pa";
        sheet.Inputs.Add(new("Model", input.ModelCode, "", "as given"));
        sheet.Inputs.Add(new("Density rho", SheetHtml.Fmt(u.Density(fluid.Density)), u.DensityUnit, "as given"));
        if (fluid.Model == RheologyModel.PowerLaw)
        {
            sheet.Inputs.Add(new("Consistency index K", SheetHtml.Fmt(input.Stress(fluid.ConsistencyIndex)), stressUnit + " s^n", "as given: measured on the actual fluid"));
            sheet.Inputs.Add(new("Flow behaviour index n", SheetHtml.Fmt(fluid.FlowBehaviorIndex), "-", "as given: measured on the actual fluid"));
            sheet.Methods.Add(new("Metzner-Reed Reynolds number", "Re_MR = rho V^(2-n) D^n / (K 8^(n-1) ((3n+1)/(4n))^n)", "Metzner and Reed (1955), AIChE J. 1(4), 434-440 (from memory)"));
            sheet.Methods.Add(new("Laminar law", "f = 16/Re_MR below Re_c", "Metzner and Reed (1955), from memory"));
            sheet.Methods.Add(new("Critical Reynolds number", "Re_c = 6464 n (2+n)^((2+n)/(1+n)) / (1+3n)^2", "Ryan and Johnson (1959), AIChE J. 5(4), 433-435 (from memory)"));
            sheet.Methods.Add(new("Dodge-Metzner (smooth pipe)", "1/sqrt(f) = (4.0/n^0.75) log10(Re_MR f^(1-n/2)) - 0.4/n^1.2, solved exactly in 1/sqrt(f)",
                "Dodge and Metzner (1959), AIChE J. 5(2), 189-204 (from memory)"));
        }
        else
        {
            sheet.Inputs.Add(new("Yield stress tau0", SheetHtml.Fmt(input.Stress(fluid.YieldStress)), stressUnit, "as given: measured on the actual fluid"));
            sheet.Inputs.Add(new("Plastic viscosity mu_p", SheetHtml.Fmt(input.Stress(fluid.PlasticViscosity)), stressUnit + " s", "as given: measured on the actual fluid"));
            sheet.Methods.Add(new("Hedstrom and Reynolds numbers", "He = rho D^2 tau0 / mu_p^2; Re = rho V D / mu_p", "Hedstrom (1952), Ind. Eng. Chem. 44(3), 651-656 (from memory)"));
            sheet.Methods.Add(new("Buckingham-Reiner (laminar)", "f_L = (16/Re)(1 + He/(6 Re) - He^4/(3 f_L^3 Re^7)), solved exactly in u = 1 - tau0/tau_w",
                "Buckingham (1921), Proc. ASTM 21, 1154-1156 (from memory)"));
            sheet.Methods.Add(new("Darby (turbulent, all regimes)", "f_T = 10^a Re^-0.193, a = -1.47 (1 + 0.146 exp(-2.9e-5 He)); f = (f_L^m + f_T^m)^(1/m), m = 1.7 + 40000/Re",
                "Darby, Mun and Boger (1992), Chem. Eng. 99(9), 116-119; Darby (2001), Chemical Engineering Fluid Mechanics, 2nd ed. (from memory)"));
        }
        sheet.Inputs.Add(new("Units", u.Code, "", request.Units is null ? "default" : "as given"));
        return (sheet, input);
    }

    private static void Pipe(Sheet sheet, NonNewtonianInput input, double d, double l, double k, bool kDefault)
    {
        var u = input.Units;
        sheet.Inputs.Add(new("Inside diameter D", SheetHtml.Fmt(d), u.LengthUnit, "as given; smooth wall"));
        sheet.Inputs.Add(new("Length L", SheetHtml.Fmt(l), u.LengthUnit, "as given"));
        sheet.Inputs.Add(new("Minor loss coefficient sum K", SheetHtml.Fmt(k), "-", kDefault ? "default" : "as given"));
        sheet.Methods.Add(new("Darcy-Weisbach", "hf = 4 f_Fanning (L/D) V^2/(2g) = 4 tau_w L/(rho g D); hm = K V^2/(2g); g = 9.80665 m/s2",
            "Weisbach (1845) and Darcy (1857), from memory; standard gravity, 3rd CGPM (1901)"));
    }

    private static void Losses(Sheet sheet, NonNewtonianInput input, double h, double hf, double hm, double dp, double v)
    {
        var u = input.Units;
        sheet.Results.Add(new("Head loss hf + hm", SheetHtml.Fmt(h), u.LengthUnit, ""));
        sheet.Results.Add(new("Friction loss hf", SheetHtml.Fmt(hf), u.LengthUnit, ""));
        sheet.Results.Add(new("Minor loss hm", SheetHtml.Fmt(hm), u.LengthUnit, ""));
        sheet.Results.Add(new("Pressure drop rho g (hf + hm)", SheetHtml.Fmt(dp), u.PressureUnit, ""));
        sheet.Results.Add(new("Mean velocity V", SheetHtml.Fmt(v), u.VelocityUnit, ""));
    }

    private static void Results(Sheet sheet, double darcy, double fanning, double re, double? he, double? reC, string regime, string method,
        double? plug, double tau, NonNewtonianInput input)
    {
        sheet.Results.Add(new("Darcy friction factor", SheetHtml.Fmt(darcy), "-", "4 x Fanning"));
        sheet.Results.Add(new("Fanning friction factor", SheetHtml.Fmt(fanning), "-", "by " + method));
        sheet.Results.Add(new("Reynolds number", SheetHtml.Fmt(re), "-", input.Fluid.Model == RheologyModel.PowerLaw ? "Metzner-Reed" : "plastic, rho V D / mu_p"));
        if (he is double h) sheet.Results.Add(new("Hedstrom number", SheetHtml.Fmt(h), "-", ""));
        if (reC is double c) sheet.Results.Add(new("Critical Reynolds number", SheetHtml.Fmt(c), "-", "Ryan and Johnson (1959)"));
        sheet.Results.Add(new("Regime", regime, "", ""));
        if (plug is double p) sheet.Results.Add(new("Plug ratio tau0/tau_w", SheetHtml.Fmt(p), "-", "the unsheared plug's share of the radius"));
        sheet.Results.Add(new("Wall shear stress tau_w", SheetHtml.Fmt(tau), input.Units.IsUs ? "lbf/ft2" : "Pa", ""));
    }

    private static void Finish(Sheet sheet, int iterations, bool converged, double residual, string status, string variable,
        IReadOnlyList<Contracts.TraceStepDto>? trace, string meaning, IReadOnlyList<Contracts.ValidityDto> validity,
        IReadOnlyList<Contracts.WarningDto> warnings, IReadOnlyList<Contracts.AssumptionDto> assumptions, NonNewtonianInput input,
        double re, double fanning, double? he)
    {
        var steps = trace ?? [];
        sheet.Solver = new SolverRecord(iterations, converged, residual, meaning, status, SheetParts.StopReason(status), variable, steps,
            iterations == 0 ? "The relation used is explicit: no iterations." : "Iterations of the solve behind this answer; residuals are at each iterate.");
        sheet.Validity.AddRange(validity);
        sheet.Warnings.AddRange(warnings);
        sheet.Assumptions.AddRange(assumptions);
        sheet.Assumptions.Add(new("rheology", input.ModelCode,
            "the rheological constants must come from measurements of the actual fluid over the pipe's shear rates; published correlations for these fluids scatter by 10 to 30 percent (common practice)"));
        sheet.Figures.Add(new SheetFigure("non-newtonian-friction", Chart(input.Fluid, re, fanning, he ?? 0),
            "Fanning friction factor against Reynolds number, both on log axes, for this fluid: " +
            (input.Fluid.Model == RheologyModel.PowerLaw
                ? "the laminar law 16/Re_MR up to the critical Reynolds number, Dodge-Metzner from it (the band shaded is 0.8 to 1.25 times Re_c)"
                : "Darby's combination at this Hedstrom number, with its laminar (Buckingham-Reiner) and turbulent parts dashed") +
            "; the case is marked."));
        if (steps.Count > 0) sheet.Figures.Add(SheetParts.Convergence(steps, "(" + variable + ")", "Residual at each iteration, log scale; the last iteration is marked."));
    }

    /// <summary>Reynolds numbers of a chart: CurvePoints values equally spaced in log Re from lo to hi.</summary>
    public static double[] Reynolds(double lo, double hi) =>
        Enumerable.Range(0, CurvePoints).Select(i => lo * Math.Pow(hi / lo, i / (double)(CurvePoints - 1))).ToArray();

    private static string Chart(NonNewtonianFluid fluid, double re, double fanning, double he)
    {
        double lo = Math.Pow(10, Math.Floor(Math.Log10(re / 10))), hi = Math.Max(1e5, Math.Pow(10, Math.Ceiling(Math.Log10(re * 10))));
        lo = Math.Min(lo, 100);
        var curves = new List<(string Name, (double, double)[] Points, bool Dashed, string Role)>();
        double? bandLo = null, bandHi = null;
        if (fluid.Model == RheologyModel.PowerLaw)
        {
            double n = fluid.FlowBehaviorIndex, reC = PowerLawFriction.CriticalReynolds(n);
            curves.Add(("laminar", Reynolds(lo, Math.Min(reC, hi)).Select(x => (x, 16 / x)).ToArray(), false, "laminar"));
            if (reC < hi) curves.Add(("dodge-metzner", Reynolds(reC, hi).Select(x => (x, PowerLawFriction.DodgeMetzner(x, n).Fanning)).ToArray(), false, "turbulent"));
            (bandLo, bandHi) = (NonNewtonianFriction.NearCriticalLow * reC, NonNewtonianFriction.NearCriticalHigh * reC);
        }
        else
        {
            var res = Reynolds(lo, hi);
            var laminar = res.Select(x => (x, BinghamFriction.BuckinghamReiner(x, he).Fanning)).ToArray();
            var turbulent = res.Select(x => (x, BinghamFriction.DarbyTurbulent(x, he))).ToArray();
            curves.Add(("combined", laminar.Zip(turbulent, (a, b) => (a.Item1, BinghamFriction.Combine(a.Item2, b.Item2, BinghamFriction.CombinationExponent(a.Item1)))).ToArray(), false, "combined"));
            curves.Add(("buckingham-reiner", laminar, true, "laminar"));
            curves.Add(("darby-turbulent", turbulent, true, "turbulent"));
        }
        var all = curves.SelectMany(c => c.Points).Select(p => p.Item2).Append(fanning).Where(double.IsFinite).ToArray();
        double fMin = Math.Max(all.Min() / 1.5, 1e-6), fMax = Math.Min(all.Max() * 1.5, 1e12);
        var plot = new SvgPlot("plot-non-newtonian", "Friction chart of this fluid", new PlotAxis("Reynolds number", lo, hi, Log: true),
            new PlotAxis("Fanning friction factor", fMin, fMax, Log: true), height: 420);
        if (bandLo is double b1 && bandHi is double b2 && b2 > lo && b1 < hi) plot.Band("near-critical", Math.Max(b1, lo), Math.Min(b2, hi), "near Re_c");
        foreach (var c in curves) plot.Curve(c.Name, c.Points, dashed: c.Dashed, role: c.Role);
        plot.Marker("case", re, fanning, string.Create(C, $"f = {fanning:G5}"));
        return plot.Render();
    }
}
