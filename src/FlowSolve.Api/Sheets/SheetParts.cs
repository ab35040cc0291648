using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Api.Sheets;

/// <summary>Pieces every sheet shares: the convergence plot and the stop reasons.</summary>
public static class SheetParts
{
    /// <summary>Residuals of exactly zero are drawn at this floor on the log axis (and said so in the caption).</summary>
    public const double ResidualFloor = 1e-17;

    /// <summary>The reason in words for a solver status code (converged-on-step, ...).</summary>
    public static string StopReason(string code)
    {
        foreach (var s in Enum.GetValues<SolveStatus>())
            if (s.Code() == code) return s.Reason();
        return code;
    }

    /// <summary>The residual per iteration on a log scale, with the final iteration marked; a note when there were none.</summary>
    public static SheetFigure Convergence(IReadOnlyList<TraceStepDto> steps, string residualLabel, string caption)
    {
        if (steps.Count == 0)
        {
            var empty = new SvgPlot("plot-convergence", "Convergence history", new PlotAxis("iteration", 0, 1),
                new PlotAxis("|residual| " + residualLabel, 1e-16, 1, Log: true), height: 260);
            empty.Note("No iterations: the relation used is explicit.");
            return new SheetFigure("convergence", empty.Render(), caption);
        }
        var points = steps.Select(s => ((double)s.Iteration, Math.Max(Math.Abs(s.Residual), ResidualFloor))).ToArray();
        double yMax = Math.Pow(10, Math.Ceiling(Math.Log10(points.Max(p => p.Item2)) + 0.01));
        double yMin = Math.Pow(10, Math.Floor(Math.Log10(points.Min(p => p.Item2)) - 0.01));
        if (yMax / yMin < 100) yMin = yMax / 100;
        var plot = new SvgPlot("plot-convergence", "Convergence history",
            new PlotAxis("iteration", 0.5, steps.Count + 0.5, Integer: true), new PlotAxis("|residual| " + residualLabel, yMin, yMax, Log: true), height: 280);
        plot.Curve("residual", points, accent: false, role: "residual");
        foreach (var (x, y) in points.Take(points.Length - 1)) plot.Marker("iteration", x, y, "", role: "iterate", accent: false);
        var last = points[^1];
        plot.Marker("final iteration", last.Item1, last.Item2, "final", role: "case");
        bool floored = steps.Any(s => Math.Abs(s.Residual) < ResidualFloor);
        return new SheetFigure("convergence", plot.Render(),
            caption + (floored ? " Residuals below 1e-17 (including exact zeros) are drawn at 1e-17." : ""));
    }
}
