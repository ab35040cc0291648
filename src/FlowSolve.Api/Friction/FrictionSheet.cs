using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Sheets;
using FlowSolve.Api.Hosting;
using FlowSolve.Core.Friction;

namespace FlowSolve.Api.Friction;

/// <summary>The friction-factor sheet: inputs, relations, the factor and its approximations, and a friction chart.</summary>
public static class FrictionSheet
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>Relative roughnesses drawn on the friction chart besides the case's own.</summary>
    public static IReadOnlyList<double> ChartRoughnesses { get; } = [0, 1e-5, 1e-4, 5e-4, 1e-3, 5e-3, 0.01, 0.02, 0.05];

    /// <summary>The sheet of an answer solved with the trace on (the iterations behind it are in <c>r.Trace</c>).</summary>
    public static Sheet Build(FrictionFactorRequest request, FrictionFactorResponse r)
    {
        var sheet = new Sheet { Title = "Darcy friction factor", Calculation = "friction-factor" };

        sheet.Inputs.Add(new("Reynolds number Re", SheetHtml.Fmt(r.Reynolds), "-", "as given"));
        sheet.Inputs.Add(new("Relative roughness e/D", SheetHtml.Fmt(r.RelativeRoughness), "-",
            request.RelativeRoughness is null ? "roughness / diameter" : "as given"));
        if (request.Roughness is double e) sheet.Inputs.Add(new("Absolute roughness e", SheetHtml.Fmt(e), "same unit as D", "as given"));
        if (request.Diameter is double d) sheet.Inputs.Add(new("Inside diameter D", SheetHtml.Fmt(d), "same unit as e", "as given"));
        sheet.Inputs.Add(new("Turbulent-flow method", request.Method ?? FrictionMethodInfo.ColebrookWhite.Code, "", request.Method is null ? "default" : "as given"));
        double laminarLimit = request.LaminarLimit ?? FrictionOptions.Default.LaminarLimit;
        sheet.Inputs.Add(new("Laminar limit", SheetHtml.Fmt(laminarLimit), "Re", request.LaminarLimit is null ? "default (common practice)" : "as given"));
        sheet.Assumptions.AddRange(r.Assumptions);

        AddMethods(sheet.Methods, r.Method);

        sheet.Results.Add(new("Darcy friction factor f", SheetHtml.Fmt(r.FrictionFactor), "-", "by " + r.Method));
        sheet.Results.Add(new("Regime", r.Regime, "", ""));
        sheet.Results.Add(new("Exact value for the regime", SheetHtml.Fmt(r.ExactFrictionFactor), "-", "the reference the approximations are compared with"));
        foreach (var a in r.Approximations)
            sheet.Results.Add(new("Approximation: " + a.Method, SheetHtml.Fmt(a.FrictionFactor), "-",
                (a.DeviationPercent is double dev ? string.Create(C, $"{dev:+0.####;-0.####;0} % from exact") : "not evaluable here")
                + (a.InRange ? "; inside its range" : "; outside its range")
                + string.Create(C, $"; at most {a.MaxDeviationPercentOverRange:0.####} % over its range")));

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual,
            "Colebrook-White in x = 1/sqrt(f): x + 2 log10(e/(3.7 D) + 2.51 x / Re), at the returned factor",
            r.Status, SheetParts.StopReason(r.Status), r.SolveVariable, steps,
            r.Iterations == 0
                ? "The relation used is explicit: no iterations."
                : "Iterations of the exact Colebrook-White solve behind this answer; residuals are at each iterate.");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);

        sheet.Figures.Add(new SheetFigure("moody", Chart(r, laminarLimit),
            "Darcy friction factor against Reynolds number, both on log axes: the laminar law 64/Re below the laminar limit, " +
            "the transition band (shaded), and Colebrook-White curves computed by FlowSolve for the relative roughnesses named; " +
            "the case is marked. The curve for the case's own e/D is the accent line."));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(x = 1/sqrt(f))",
            "Residual of Colebrook-White at each iteration, log scale; the last iteration is marked."));
        return sheet;
    }

    internal static void AddMethods(List<SheetMethod> methods, string relation)
    {
        methods.Add(new("Laminar law (Hagen-Poiseuille)", "f = 64 / Re, below the laminar limit",
            "Hagen (1839) and Poiseuille (1840); laminar limit 2000: common practice"));
        methods.Add(new("Colebrook-White", "1/sqrt(f) = -2 log10( (e/D)/3.7 + 2.51 / (Re sqrt(f)) ), solved by safeguarded Newton in 1/sqrt(f)",
            FrictionMethodInfo.ColebrookWhite.Source));
        methods.Add(new("Transition (Churchill)", "Churchill's all-regime formula between Re 2000 and 4000", FrictionMethodInfo.Churchill.Source));
        if (FrictionMethodInfo.TryParse(relation, out var info) && info.Method != FrictionMethod.ColebrookWhite && info.Method != FrictionMethod.Churchill)
            methods.Add(new("Explicit approximation: " + info.Code, "explicit in Re and e/D", info.Source));
    }

    /// <summary>The Reynolds numbers at which the turbulent curves are drawn: 61 per chart, equally spaced in log Re.</summary>
    public static double[] TurbulentReynolds(double maximum)
    {
        double lo = Math.Log10(4000), hi = Math.Log10(maximum);
        return Enumerable.Range(0, 61).Select(i => Math.Pow(10, lo + (hi - lo) * i / 60)).ToArray();
    }

    private static string Chart(FrictionFactorResponse r, double laminarLimit)
    {
        double reMin = Math.Min(500, Math.Pow(10, Math.Floor(Math.Log10(r.Reynolds / 2))));
        double reMax = Math.Max(1e8, Math.Pow(10, Math.Ceiling(Math.Log10(r.Reynolds * 2))));
        double fMin = Math.Min(0.006, r.FrictionFactor / 1.5), fMax = Math.Max(0.13, r.FrictionFactor * 1.5);
        var plot = new SvgPlot("plot-moody", "Friction factor chart", new PlotAxis("Reynolds number Re", reMin, reMax, Log: true),
            new PlotAxis("Darcy friction factor f", fMin, fMax, Log: true), height: 440);

        plot.Band("transition", laminarLimit, FrictionOptions.Default.TurbulentLimit, "transition");
        var laminar = Enumerable.Range(0, 21).Select(i => reMin * Math.Pow(laminarLimit / reMin, i / 20.0))
            .Select(re => (re, 64.0 / re)).ToArray();
        plot.Curve("laminar", laminar, role: "laminar");
        plot.Label(laminar[10].Item1, laminar[10].Item2 * 0.88, "64/Re");

        var reynolds = TurbulentReynolds(reMax);
        var roughnesses = ChartRoughnesses.ToList();
        bool own = !roughnesses.Contains(r.RelativeRoughness) && r.RelativeRoughness <= 0.05;
        foreach (double eD in roughnesses)
        {
            var points = reynolds.Select(re => (re, DarcyFriction.Compute(re, eD, FrictionMethod.ColebrookWhite).FrictionFactor)).ToArray();
            bool isCase = eD == r.RelativeRoughness;
            plot.Curve(string.Create(C, $"e/D={eD:R}"), points, accent: isCase, role: "colebrook");
            plot.Label(points[^1].Item1 / 1.05, points[^1].Item2 * 1.03, eD == 0 ? "smooth" : eD.ToString("G3", C), "end");
        }
        if (own)
        {
            var points = reynolds.Select(re => (re, DarcyFriction.Compute(re, r.RelativeRoughness, FrictionMethod.ColebrookWhite).FrictionFactor)).ToArray();
            plot.Curve(string.Create(C, $"e/D={r.RelativeRoughness:R}"), points, accent: true, role: "colebrook");
        }
        plot.Marker("case", r.Reynolds, r.FrictionFactor, string.Create(C, $"f = {r.FrictionFactor:G5}"));
        return plot.Render();
    }
}
