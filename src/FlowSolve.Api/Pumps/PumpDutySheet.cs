using FlowSolve.Api.Friction;
using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Api.Pumps;

/// <summary>
/// The duty-point sheet: the pump, the pump set and the system as understood, the relations with their sources, the
/// duty point with efficiency, power and suction margin, the Newton iterations, and the curves with the duty point and
/// the best-efficiency point marked. Plotted in the response's units (SI, or US customary with units=us).
/// </summary>
public static class PumpDutySheet
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>Points per plotted curve: 81 equal steps of flow from 0 (twice the endpoint's default density).</summary>
    public const int CurvePoints = 81;

    private const string Name = "pumps/duty-point";

    /// <summary>The sheet of an answer solved with the trace on (the iterations behind it are in <c>r.Trace</c>).</summary>
    public static Sheet Build(DutyPointRequest request, DutyPointResponse r)
    {
        // The request passed validation when the response was made, so it reads again without errors.
        var input = PumpInputReader.Read(request, new FieldErrors(), null)
            ?? throw new InvalidOperationException("the duty-point request did not read again");
        var u = input.Units;
        var sheet = new Sheet { Title = "Pump duty point", Calculation = Name };

        Inputs(sheet, request, r);
        sheet.Assumptions.AddRange(r.Assumptions);
        Methods(sheet, request, input);
        Results(sheet, r);

        var steps = r.Trace ?? [];
        sheet.Solver = new SolverRecord(r.Iterations, r.Converged, r.Residual,
            $"pump-set head minus system head at the flow found, {r.HeadUnit}", r.SolverStatus,
            SheetParts.StopReason(r.SolverStatus) + "; duty status " + r.Status, r.SolveVariable, steps,
            "The iterations of the duty-point solve behind this answer"
            + "; each value is the set flow in m3/s and each residual the head difference in m (the solver works in SI whatever the request's units).");
        sheet.Validity.AddRange(r.Validity);
        sheet.Warnings.AddRange(r.Warnings);

        var curves = OperatingCurves.Sample(input.Curve, input.System, input.Arrangement, u.FlowToSi(r.Flow), CurvePoints,
            input.Data.Efficiency, input.Data.NpshRequired);
        sheet.Figures.Add(HeadPlot(r, input, curves, request.Pump?.Points));
        if (curves.Efficiency is not null && r.BestEfficiencyFlow is not null) sheet.Figures.Add(EfficiencyPlot(r, input, curves, request.Pump?.Points));
        sheet.Figures.Add(SheetParts.Convergence(steps, "(m)",
            "Pump-set head minus system head at each Newton iteration, in m, log scale; the last iteration is marked."));
        return sheet;
    }

    private static void Inputs(Sheet sheet, DutyPointRequest request, DutyPointResponse r)
    {
        string qu = r.FlowUnit, hu = r.HeadUnit;
        bool us = r.Units == "us";
        var pump = request.Pump!;
        if (pump.Points is { } points)
        {
            for (int i = 0; i < points.Count; i++)
            {
                var pt = points[i];
                var extra = new List<string>();
                if (pt.Efficiency is double e) extra.Add(string.Create(C, $"efficiency {e:G6}"));
                if (pt.NpshRequired is double n) extra.Add(string.Create(C, $"NPSH required {n:G6} {hu}"));
                sheet.Inputs.Add(new($"Pump point {i + 1}: flow, head", SheetHtml.Fmt(pt.Flow) + ", " + SheetHtml.Fmt(pt.Head),
                    qu + ", " + hu, extra.Count == 0 ? "one pump at rated speed" : string.Join("; ", extra)));
            }
            sheet.Inputs.Add(new("Curve degree", pump.CurveDegree ?? "quadratic", "", pump.CurveDegree is null ? "default" : "as given"));
        }
        else if (pump.Coefficients is { } c)
        {
            string[] units = [hu, $"{hu} per {qu}", $"{hu} per ({qu})^2", $"{hu} per ({qu})^3"];
            for (int i = 0; i < c.Count; i++)
                sheet.Inputs.Add(new($"Pump coefficient c{i}", SheetHtml.Fmt(c[i]), units[i],
                    i == 0 ? "shut-off head of one pump at rated speed" : "as given"));
            if (pump.MaximumFlow is double qmax) sheet.Inputs.Add(new("Largest flow of the curve's range", SheetHtml.Fmt(qmax), qu, "as given"));
        }

        var system = request.System!;
        sheet.Inputs.Add(new("Static head Hs", SheetHtml.Fmt(system.StaticHead), hu, "as given"));
        if (system.Resistance is double k) sheet.Inputs.Add(new("Lumped resistance K", SheetHtml.Fmt(k), $"{hu} per ({qu})^2", "as given"));
        if (system.Pipes is { } pipes)
            for (int i = 0; i < pipes.Count; i++)
            {
                var p = pipes[i];
                sheet.Inputs.Add(new($"Pipe {i + 1}: length, diameter, roughness",
                    SheetHtml.Fmt(p.Length) + ", " + SheetHtml.Fmt(p.Diameter) + ", " + SheetHtml.Fmt(p.Roughness), hu,
                    string.Create(C, $"minor loss coefficient sum {p.MinorLossCoefficient ?? 0:G6}{(p.MinorLossCoefficient is null ? " (default)" : "")}")));
            }

        sheet.Inputs.Add(new("Pumps in parallel", r.PumpsInParallel.ToString(C), "", request.PumpsInParallel is null ? "default" : "as given"));
        sheet.Inputs.Add(new("Pumps in series", r.PumpsInSeries.ToString(C), "", request.PumpsInSeries is null ? "default" : "as given"));
        sheet.Inputs.Add(new("Speed ratio s = n / n_rated", SheetHtml.Fmt(r.SpeedRatio), "-", request.SpeedRatio is null ? "default" : "as given"));

        if (request.KinematicViscosity is not null || request.Density is not null)
        {
            sheet.Inputs.Add(new("Kinematic viscosity nu", SheetHtml.Fmt(request.KinematicViscosity), us ? "ft2/s" : "m2/s", "as given"));
            sheet.Inputs.Add(new("Density rho", SheetHtml.Fmt(request.Density), us ? "lb/ft3" : "kg/m3", "as given"));
        }
        else
            sheet.Inputs.Add(new("Water temperature", SheetHtml.Fmt(request.Temperature ?? (us ? 68 : 20)), us ? "degrees F" : "degrees C",
                request.Temperature is null ? "default fluid" : "as given"));

        if (request.Suction is { } s)
        {
            sheet.Inputs.Add(new("Static suction head z_s", SheetHtml.Fmt(s.StaticSuctionHead), hu, "level above the pump; negative for a lift"));
            sheet.Inputs.Add(new("Suction losses h_losses", SheetHtml.Fmt(s.LossHead ?? 0), hu, s.LossHead is null ? "default" : "as given"));
            sheet.Inputs.Add(new("Surface pressure p_surface (absolute)", SheetHtml.Fmt(s.SurfacePressure ?? (us ? 14.695948775513449 : 101325)),
                us ? "psi" : "Pa", s.SurfacePressure is null ? "default: 1 standard atmosphere" : "as given"));
            sheet.Inputs.Add(new("Vapour pressure p_vapour", s.VapourPressure is double pv ? SheetHtml.Fmt(pv) : "from the water temperature",
                us ? "psi" : "Pa", s.VapourPressure is null ? "IAPWS-IF97 region 4 (see defaults)" : "as given"));
        }
        sheet.Inputs.Add(new("Units", r.Units + ", flows in " + r.FlowUnit + ", heads in " + r.HeadUnit + ", power in " + r.PowerUnit, "",
            request.Units is null ? "default" : "as given"));
    }

    private static void Methods(Sheet sheet, DutyPointRequest request, PumpProblem input)
    {
        if (input.Fit is not null)
            sheet.Methods.Add(new("Pump curve: least-squares polynomial fit",
                "H(Q) = c0 + c1 Q + c2 Q^2 (+ c3 Q^3) for one pump at rated speed, minimising the sum of squared head deviations at the points; Householder QR of the scaled Vandermonde system",
                "least squares: Legendre (1805) and Gauss (1809); QR: Householder (1958), from memory; solved with MathNet.Numerics"));
        else
            sheet.Methods.Add(new("Pump curve: given polynomial", "H(Q) = c0 + c1 Q + c2 Q^2 (+ c3 Q^3) for one pump at rated speed", "the coefficients as given"));
        sheet.Methods.Add(new("Affinity laws and the pump set",
            "one pump at speed ratio s: Hs(Q) = s^2 H(Q/s); Np in parallel (shared flow, common head) or Ns in series (heads add): Hset(Q) = Ns s^2 H(Q / (Np s))",
            "common practice"));
        sheet.Methods.Add(new("System curve", "Hsys(Q) = Hs + K Q^2" + (input.System.HasPipes ? " + the pipes' losses hf + hm at Q" : ""), "common practice"));
        if (input.System.HasPipes)
        {
            sheet.Methods.Add(new("Darcy-Weisbach, pipes in series", "hf = f (L/D) V^2/(2g), hm = K V^2/(2g) per pipe; V = 4Q/(pi D^2); g = 9.80665 m/s2",
                "Weisbach (1845) and Darcy (1857), from memory; standard gravity, 3rd CGPM (1901)"));
            FrictionSheet.AddMethods(sheet.Methods, FrictionMethodInfo.ColebrookWhite.Code);
        }
        sheet.Methods.Add(new("Duty point", "Hset(Q) - Hsys(Q) = 0, safeguarded Newton in the set flow Q on [0, the set's zero-head flow], started by regula falsi",
            "FlowSolve's bracketed Newton-bisection (after Press et al., Numerical Recipes, rtsafe)"));
        if (input.Data.Efficiency is not null)
        {
            sheet.Methods.Add(new("Efficiency curve", "eta(Q) = e1 Q + e2 Q^2 (+ e3 Q^3), least squares through the origin; read at the rated-speed flow Q_pump / s; best efficiency at its maximum, at speed s Q_BEP",
                "least squares as above; through the origin and the affinity laws: common practice"));
            sheet.Methods.Add(new("Power", "hydraulic rho g Q H; shaft rho g Q H / eta; g = 9.80665 m/s2", "common practice"));
            sheet.Methods.Add(new("Preferred operating region", "0.70 to 1.20 of the best-efficiency flow", "common practice"));
        }
        if (input.Data.Suction is not null)
            sheet.Methods.Add(new("NPSH available", "NPSHa = (p_surface - p_vapour)/(rho g) + z_s - h_losses; g = 9.80665 m/s2", "common practice"));
        if (input.Data.NpshRequired is not null)
            sheet.Methods.Add(new("NPSH required", "s^2 NPSHr(Q_pump / s), linear between the points; margin NPSHa - NPSHr at least 1.0 m and ratio at least 1.1",
                "common practice"));
        if (request.KinematicViscosity is null && request.Density is null)
            sheet.Methods.Add(new("Water properties", "density, viscosity and vapour pressure of liquid water", "IAPWS-IF97 (1997); IAPWS R12-08 (2008)"));
    }

    private static void Results(Sheet sheet, DutyPointResponse r)
    {
        string qu = r.FlowUnit, hu = r.HeadUnit, pu = r.PowerUnit;
        sheet.Results.Add(new("Flow of the pump set Q", SheetHtml.Fmt(r.Flow), qu, "where the pump-set head meets the system head"));
        sheet.Results.Add(new("Head H", SheetHtml.Fmt(r.Head), hu, "pump-set head = system head"));
        sheet.Results.Add(new("Flow per pump", SheetHtml.Fmt(r.FlowPerPump), qu, "Q / pumps in parallel"));
        sheet.Results.Add(new("Head per pump", SheetHtml.Fmt(r.HeadPerPump), hu, "H / pumps in series"));
        sheet.Results.Add(new("Flow per pump at rated speed", SheetHtml.Fmt(r.RatedSpeedFlow), qu, "flow per pump / s: where the catalogue curves are read"));
        sheet.Results.Add(new("Shut-off head of the set", SheetHtml.Fmt(r.ShutOffHead), hu, "Ns s^2 c0"));
        sheet.Results.Add(new("Static head", SheetHtml.Fmt(r.StaticHead), hu, ""));
        var c = r.PumpCurve;
        sheet.Results.Add(new("Pump curve used, c0 .. c3", string.Join(", ", c.Coefficients.Select(SheetHtml.Fmt)), $"{hu}, {qu}",
            $"{c.FitStatus}, degree {c.Degree.ToString(C)}"));
        if (c.ZeroHeadFlow is double z) sheet.Results.Add(new("Zero-head flow of one pump at rated speed", SheetHtml.Fmt(z), qu, ""));
        if (r.RmsDeviation is double rms) sheet.Results.Add(new("Fit: root-mean-square deviation", SheetHtml.Fmt(rms), hu, "from the points"));
        if (r.MaxDeviation is double max) sheet.Results.Add(new("Fit: largest deviation", SheetHtml.Fmt(max), hu, "from a point"));
        if (r.UnstableFlow is double low) sheet.Results.Add(new("Unstable intersection", SheetHtml.Fmt(low), qu,
            "where the rising pump curve climbs through the system curve; not a duty point"));
        if (r.BestEfficiency is double best) sheet.Results.Add(new("Best efficiency of the fitted curve", SheetHtml.Fmt(best), "-", "fraction, at the best-efficiency flow"));
        if (r.EfficiencyRmsDeviation is double erms) sheet.Results.Add(new("Efficiency fit: root-mean-square deviation", SheetHtml.Fmt(erms), "-", "from the points, fraction"));
        if (r.EfficiencyMaxDeviation is double emax) sheet.Results.Add(new("Efficiency fit: largest deviation", SheetHtml.Fmt(emax), "-", "from a point, fraction"));
        if (r.Efficiency is double eta) sheet.Results.Add(new("Efficiency of each pump", SheetHtml.Fmt(eta), "-", "fraction"));
        if (r.HydraulicPower is double ph) sheet.Results.Add(new("Hydraulic power of the set", SheetHtml.Fmt(ph), pu, "rho g Q H"));
        if (r.ShaftPower is double ps) sheet.Results.Add(new("Shaft power of the set", SheetHtml.Fmt(ps), pu, "rho g Q H / eta"));
        if (r.ShaftPowerPerPump is double pp) sheet.Results.Add(new("Shaft power per pump", SheetHtml.Fmt(pp), pu, ""));
        if (r.BestEfficiencyFlow is double qb) sheet.Results.Add(new("Best-efficiency flow of one pump at speed", SheetHtml.Fmt(qb), qu, "s Q_BEP"));
        if (r.BestEfficiencyRatio is double ratio) sheet.Results.Add(new("Flow per pump / best-efficiency flow (BEP ratio)", SheetHtml.Fmt(ratio), "-",
            "preferred 0.70 to 1.20 (common practice)"));
        if (r.NpshAvailable is double na) sheet.Results.Add(new("NPSH available", SheetHtml.Fmt(na), hu, "at each pump's suction"));
        if (r.SuctionLoss is double sl) sheet.Results.Add(new("Suction loss used", SheetHtml.Fmt(sl), hu, ""));
        if (r.NpshRequired is double nr) sheet.Results.Add(new("NPSH required", SheetHtml.Fmt(nr), hu, "s^2 NPSHr at the rated-speed flow"));
        if (r.NpshMargin is double nm) sheet.Results.Add(new("NPSH margin NPSHa - NPSHr", SheetHtml.Fmt(nm), hu, "at least 1.0 m usual (common practice)"));
        if (r.NpshRatio is double nq) sheet.Results.Add(new("NPSH ratio NPSHa / NPSHr", SheetHtml.Fmt(nq), "-", "at least 1.1 usual (common practice)"));
    }

    /// <summary>One pump at speed, the pump set and the system against the set flow, the duty point and (with
    /// efficiency data) the best-efficiency points marked; in the response's units.</summary>
    private static SheetFigure HeadPlot(DutyPointResponse r, PumpProblem input, OperatingCurves curves, IReadOnlyList<PumpPointInput>? catalogue)
    {
        var u = input.Units;
        var a = input.Arrangement;
        var flows = curves.Flow.Select(u.Flow).ToArray();
        var pump = flows.Select((q, i) => (q, u.Head(curves.PumpHead[i]))).ToArray();
        var set = flows.Select((q, i) => (q, u.Head(curves.SetHead[i]))).ToArray();
        var system = flows.Select((q, i) => (q, u.Head(curves.SystemHead[i]))).ToArray();

        double top = Math.Max(Math.Max(set.Max(p => p.Item2), pump.Max(p => p.Item2)), Math.Max(r.Head, r.StaticHead));
        double bottom = Math.Min(0, r.StaticHead);
        var plot = new SvgPlot("plot-duty-point", "Pump, pump-set and system curves",
            new PlotAxis($"flow Q ({r.FlowUnit})", 0, flows[^1]), new PlotAxis($"head H ({r.HeadUnit})", bottom, bottom + 1.1 * (top - bottom)), height: 420);
        bool single = a.Parallel == 1 && a.Series == 1;
        plot.Curve("one pump at speed", pump, accent: false, dashed: !single, role: "pump");
        plot.Curve("pump set", set, accent: true, role: "pump-set");
        plot.Curve("system", system, accent: false, role: "system");
        if (!single) plot.Label(pump[flows.Length / 4].Item1, pump[flows.Length / 4].Item2 - 0.03 * (top - bottom), "one pump", "end");
        plot.Label(system[^1].Item1 * 0.97, Math.Min(system[^1].Item2, top) - 0.03 * (top - bottom), "system", "end");
        plot.Marker("duty point", r.Flow, r.Head, string.Create(C, $"Q = {r.Flow:G5}, H = {r.Head:G5}"));
        // The catalogue points the curve was fitted to, carried to the running speed by the affinity laws (q s, H s^2),
        // beside the one-pump curve they belong to.
        double sr = a.SpeedRatio;
        foreach (var pt in catalogue ?? [])
            if (pt is { Flow: double cq, Head: double ch }) plot.Point("catalogue point", cq * sr, ch * sr * sr, "catalogue");

        if (r.BestEfficiencyFlow is double qb)
        {
            // The best-efficiency point of one pump at speed, on its own curve, and where the set delivers it.
            double s = a.SpeedRatio;
            double onePump = u.Head(s * s * input.Curve.Head(u.FlowToSi(qb) / s));
            plot.Marker("best efficiency, one pump", qb, onePump, "BEP", role: "bep", accent: false);
            if (!single)
                plot.Marker("best efficiency, pump set", a.Parallel * qb, a.Series * onePump, "BEP of the set", role: "bep", accent: false);
        }
        string arrangement = single ? "one pump" : a.Parallel > 1 ? $"{a.Parallel.ToString(C)} identical pumps in parallel" : $"{a.Series.ToString(C)} identical pumps in series";
        return new SheetFigure("duty-point", plot.Render(),
            $"Head against flow for {arrangement} at speed ratio {SheetHtml.Fmt(a.SpeedRatio)}, computed by FlowSolve at {CurvePoints.ToString(C)} flows: "
            + (single ? "the pump (accent line)" : "one pump at speed (dashed), the pump set (accent line)")
            + " and the system; the duty point is marked" + (r.BestEfficiencyFlow is null ? "." : ", and the best-efficiency points (BEP) in ink.")
            + (catalogue is { Count: > 0 } ? " Hollow circles: the catalogue points the pump curve was fitted to" + (a.SpeedRatio == 1 ? "." : ", carried to the running speed by the affinity laws.") : "")
            + " Heads below the axis (beyond the zero-head flow) are left out of the drawing.");
    }

    /// <summary>The efficiency of each pump against the set flow, the duty and best-efficiency points marked.</summary>
    private static SheetFigure EfficiencyPlot(DutyPointResponse r, PumpProblem input, OperatingCurves curves, IReadOnlyList<PumpPointInput>? catalogue)
    {
        var u = input.Units;
        var eff = input.Data.Efficiency!.Value;
        var points = curves.Flow.Select((q, i) => (u.Flow(q), curves.Efficiency![i])).ToArray();
        var plot = new SvgPlot("plot-efficiency", "Efficiency of each pump", new PlotAxis($"flow of the set Q ({r.FlowUnit})", 0, points[^1].Item1),
            new PlotAxis("efficiency eta (fraction)", 0, Math.Min(1, Math.Ceiling(eff.BestEfficiency * 11) / 10)), height: 300);
        plot.Curve("efficiency", points, accent: false, role: "efficiency");
        if (r.Efficiency is double eta)
            plot.Marker("duty point", r.Flow, eta, string.Create(C, $"eta = {eta:G4}"));
        plot.Marker("best efficiency", input.Arrangement.Parallel * r.BestEfficiencyFlow!.Value, eff.BestEfficiency,
            string.Create(C, $"BEP {eff.BestEfficiency:G4}"), role: "bep", accent: false);
        // The catalogue efficiencies at the set flow where each pump runs at the point's rated-speed flow: Q = Np s q.
        double setPerRated = input.Arrangement.Parallel * input.Arrangement.SpeedRatio;
        foreach (var pt in catalogue ?? [])
            if (pt is { Flow: double cq, Efficiency: double ce }) plot.Point("catalogue point", cq * setPerRated, ce, "catalogue");
        return new SheetFigure("efficiency", plot.Render(),
            "Efficiency of each pump while the set delivers Q (the fitted curve read at each pump's rated-speed flow), computed by FlowSolve; "
            + "the duty point and the best-efficiency point are marked; hollow circles are the catalogue points the curve was fitted to.");
    }
}
