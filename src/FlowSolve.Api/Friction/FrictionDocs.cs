using System.Globalization;
using System.Text;
using FlowSolve.Core.Friction;

namespace FlowSolve.Api.Friction;

/// <summary>The friction endpoint's OpenAPI description, built from the Core's own method records so the
/// published ranges and measured deviations cannot drift from the code.</summary>
public static class FrictionDocs
{
    public static string Description { get; } = Build();

    private static string Build()
    {
        var sb = new StringBuilder();
        sb.Append("Darcy friction factor f for full pipe flow. Laminar flow (Re below the laminar limit, default 2000) uses ")
          .Append("Hagen-Poiseuille f = 64/Re; the transition zone (2000 to 4000) uses Churchill (1977) with a transitional-flow warning; ")
          .Append("turbulent flow uses the requested method, by default the exact Colebrook-White equation solved by safeguarded Newton ")
          .Append("iteration in 1/sqrt(f) to better than 1e-14 relative. Every response lists each explicit approximation beside the exact ")
          .Append("value with its deviation at these inputs.\n\n")
          .Append("Largest deviation from exact Colebrook-White that FlowSolve measured over each approximation's published range ")
          .Append("(grid of 241 x 121 points):\n");
        foreach (var m in FrictionMethodInfo.Approximations)
        {
            sb.Append(CultureInfo.InvariantCulture,
                $"- {m.Code}: {m.MeasuredMaxDeviationPercent:0.####} percent, at {m.WhereLargest}; range Re {m.ReynoldsMinimum:G3} to {m.ReynoldsMaximum:G3}, e/D {m.RelativeRoughnessMinimum:G3} to {m.RelativeRoughnessMaximum:G3} ({m.RangeProvenance}). {m.Source}.\n");
        }
        sb.Append("\nResults are engineering estimates to be checked by a qualified engineer; local codes and licensed practice govern.");
        return sb.ToString();
    }
}
