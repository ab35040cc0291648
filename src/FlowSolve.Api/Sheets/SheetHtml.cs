using System.Globalization;
using System.Reflection;
using System.Text;
using System.Text.Encodings.Web;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Sheets;

/// <summary>
/// Renders a <see cref="Sheet"/> as one self-contained HTML page: no scripts, no external style sheets, fonts or
/// images; figures are inline SVG. Every interpolated string is HTML-encoded. The print rules set A4 and Letter
/// margins that both paper sizes fit (the narrower of the two widths, the shorter of the two heights).
/// </summary>
public static class SheetHtml
{
    /// <summary>The media type of a calculation sheet.</summary>
    public const string ContentType = "text/html";

    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>The FlowSolve version: the API assembly's informational version (as built, with any source revision).</summary>
    public static string Version { get; } =
        typeof(SheetHtml).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion
        ?? typeof(SheetHtml).Assembly.GetName().Version?.ToString() ?? "unknown";

    // A4 is 210 x 297 mm, Letter 215.9 x 279.4 mm: 16 mm side margins leave 178 mm of text on A4 (184 on Letter), and
    // the page is never wider than the narrower sheet. Plain and neutral: black, greys, one accent (SvgPlot.Accent).
    private const string Style = """
        @page { margin: 16mm 16mm 18mm 16mm; }
        html { font-family: "Helvetica Neue", Helvetica, Arial, sans-serif; font-size: 10.5pt; color: #111; background: #fff; }
        body { max-width: 178mm; margin: 12mm auto; padding: 0 4mm; line-height: 1.35; }
        header { border-bottom: 2px solid #111; margin-bottom: 5mm; padding-bottom: 2mm; }
        h1 { font-size: 16pt; margin: 0 0 1mm 0; font-weight: 600; }
        h3 { font-size: 10.5pt; margin: 4mm 0 1mm 0; font-weight: 600; }
        h2 { font-size: 11.5pt; margin: 6mm 0 2mm 0; padding-bottom: 0.8mm; border-bottom: 1px solid #9a9a9a; font-weight: 600; }
        .meta { color: #555; font-size: 9pt; margin: 0; }
        table { border-collapse: collapse; width: 100%; font-size: 9.5pt; margin: 1mm 0 2mm 0; }
        th, td { text-align: left; padding: 1mm 2mm; border-bottom: 1px solid #dedede; vertical-align: top; }
        th { background: #f1f1f1; font-weight: 600; border-bottom: 1px solid #9a9a9a; }
        td.num { font-variant-numeric: tabular-nums; white-space: nowrap; }
        .out { color: #b4451f; font-weight: 600; }
        .note { color: #555; font-size: 8.8pt; }
        figure { margin: 3mm 0 4mm 0; break-inside: avoid; page-break-inside: avoid; }
        figure svg { width: 100%; height: auto; display: block; border: 1px solid #dedede; }
        figcaption { font-size: 8.8pt; color: #444; margin-top: 1mm; }
        ul { margin: 1mm 0 2mm 5mm; padding-left: 3mm; }
        .cautions { border: 1px solid #111; padding: 2mm 3mm; margin-top: 5mm; break-inside: avoid; page-break-inside: avoid; }
        .cautions h2 { border: none; margin-top: 0; }
        section { break-inside: auto; }
        tr { break-inside: avoid; page-break-inside: avoid; }
        @media print { body { margin: 0; padding: 0; max-width: none; } a { color: inherit; text-decoration: none; } }
        """;

    /// <summary>The page for a sheet, dated <paramref name="now"/>.</summary>
    public static string Render(Sheet sheet, DateTimeOffset now)
    {
        var sb = new StringBuilder(32_768);
        sb.Append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
          .Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
          .Append("<title>").Append(E(sheet.Title)).Append(" - FlowSolve calculation sheet</title>\n")
          .Append("<style>\n").Append(Style).Append("\n</style>\n</head>\n<body>\n");

        sb.Append("<header>\n<h1>").Append(E(sheet.Title)).Append("</h1>\n")
          .Append(C, $"<p class=\"meta\">FlowSolve {E(Version)} &middot; calculation <code>/v1/{E(sheet.Calculation)}</code> &middot; prepared {E(now.UtcDateTime.ToString("yyyy-MM-dd HH:mm 'UTC'", C))}</p>\n")
          .Append("</header>\n");

        Section(sb, "inputs", "Inputs as understood", () =>
        {
            Rows(sb, sheet.Inputs, "Input");
            foreach (var t in sheet.Tables.Where(t => t.InInputs))
            {
                sb.Append("<div id=\"table-").Append(E(t.Id)).Append("\">\n<h3>").Append(E(t.Title)).Append("</h3>\n");
                Table(sb, t);
                sb.Append("</div>\n");
            }
        });
        if (sheet.Assumptions.Count > 0)
        {
            Section(sb, "defaults", "Defaults applied", () =>
            {
                sb.Append("<table><thead><tr><th>Field</th><th>Value used</th><th>Why</th></tr></thead><tbody>\n");
                foreach (var a in sheet.Assumptions)
                    sb.Append("<tr><td>").Append(E(a.Field)).Append("</td><td class=\"num\">").Append(E(a.Value)).Append("</td><td>").Append(E(a.Message)).Append("</td></tr>\n");
                sb.Append("</tbody></table>\n");
            });
        }
        Section(sb, "method", "Method", () =>
        {
            sb.Append("<table><thead><tr><th>Relation</th><th>Equation</th><th>Published source</th></tr></thead><tbody>\n");
            foreach (var m in sheet.Methods)
                sb.Append("<tr><td>").Append(E(m.Name)).Append("</td><td>").Append(E(m.Equation)).Append("</td><td>").Append(E(m.Source)).Append("</td></tr>\n");
            sb.Append("</tbody></table>\n");
        });
        Section(sb, "results", "Results", () => Rows(sb, sheet.Results, "Result", highlightFirst: true));
        if (sheet.Sensitivities is { Count: > 0 } || sheet.RoughnessSpread is not null)
            Section(sb, "sensitivities", "Sensitivities", () => Sensitivities(sb, sheet));
        foreach (var t in sheet.Tables.Where(t => !t.InInputs)) Section(sb, "table-" + t.Id, t.Title, () => Table(sb, t));

        foreach (var f in sheet.Figures)
        {
            sb.Append("<figure id=\"figure-").Append(E(f.Id)).Append("\">\n").Append(f.Svg).Append("\n<figcaption>")
              .Append(E(f.Caption)).Append("</figcaption>\n</figure>\n");
        }

        if (sheet.Solver is { } s) Section(sb, "solver", "Solver record", () => Solver(sb, s));

        Section(sb, "validity", "Validity", () =>
        {
            if (sheet.Validity.Count == 0)
            {
                sb.Append("<p class=\"note\">No correlation with a published range applies to this calculation beyond those named under Method.</p>\n");
                return;
            }
            sb.Append("<table><thead><tr><th>Correlation</th><th>Quantity</th><th>Published range</th><th>Value used</th><th>Inside</th><th>Source</th></tr></thead><tbody>\n");
            foreach (var v in sheet.Validity)
            {
                string range = Fmt(v.Minimum) + " to " + (v.Maximum is double max ? Fmt(max) : "no upper limit");
                sb.Append("<tr><td>").Append(E(v.Method)).Append("</td><td>").Append(E(v.Quantity)).Append("</td><td class=\"num\">")
                  .Append(E(range)).Append("</td><td class=\"num\">").Append(E(Fmt(v.Value))).Append("</td><td>")
                  .Append(v.InRange ? "yes" : "<strong>no</strong>").Append("</td><td class=\"note\">").Append(E(v.Source)).Append("</td></tr>\n");
            }
            sb.Append("</tbody></table>\n");
        });

        Section(sb, "warnings", "Warnings", () =>
        {
            if (sheet.Warnings.Count == 0)
            {
                sb.Append("<p>None.</p>\n");
                return;
            }
            sb.Append("<ul>\n");
            foreach (var w in sheet.Warnings)
                sb.Append("<li><strong>").Append(E(w.Code)).Append("</strong>: ").Append(E(w.Message)).Append("</li>\n");
            sb.Append("</ul>\n");
        });

        sb.Append("<section class=\"cautions\" id=\"cautions\">\n<h2>Cautions</h2>\n<ul>\n")
          .Append("<li>These results are an engineering estimate. They must be checked by a qualified engineer before they are used in design.</li>\n")
          .Append("<li>Local codes, standards and licensed practice govern over anything on this sheet.</li>\n")
          .Append("<li>Out of scope: water hammer and surge (transients), and the structural design of pipes, channels and their supports.</li>\n")
          .Append("</ul>\n</section>\n");
        sb.Append("</body>\n</html>\n");
        return sb.ToString();
    }

    /// <summary>A small page for a calculation that did not answer: the status and the problem in words.</summary>
    public static string Problem(string calculation, int status, object? problem, DateTimeOffset now)
    {
        string line = TextFormat.ErrorLine(problem);
        if (line.StartsWith("error: ", StringComparison.Ordinal)) line = line[7..];
        var sb = new StringBuilder();
        sb.Append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>")
          .Append(E(calculation)).Append(" - no calculation sheet</title>\n<style>\n").Append(Style).Append("\n</style>\n</head>\n<body>\n")
          .Append("<header>\n<h1>No calculation sheet</h1>\n")
          .Append(C, $"<p class=\"meta\">FlowSolve {E(Version)} &middot; calculation <code>/v1/{E(calculation)}</code> &middot; {E(now.UtcDateTime.ToString("yyyy-MM-dd HH:mm 'UTC'", C))}</p>\n</header>\n")
          .Append(C, $"<p>The calculation answered HTTP {status}: {E(Title(problem))}</p>\n")
          .Append("<p id=\"problem\">").Append(E(line)).Append("</p>\n")
          .Append("<p class=\"note\">The same request without format=html returns the problem as application/problem+json.</p>\n")
          .Append("</body>\n</html>\n");
        return sb.ToString();
    }

    private static string Title(object? problem) =>
        problem is Microsoft.AspNetCore.Mvc.ProblemDetails p && p.Title is { } t ? t : "the request failed.";

    private static void Section(StringBuilder sb, string id, string title, Action body)
    {
        sb.Append("<section id=\"").Append(id).Append("\">\n<h2>").Append(E(title)).Append("</h2>\n");
        body();
        sb.Append("</section>\n");
    }

    private static void Sensitivities(StringBuilder sb, Sheet sheet)
    {
        if (sheet.Sensitivities is { Count: > 0 } table)
        {
            sb.Append("<p class=\"note\">Derivatives of each output with respect to each input, in SI units (temperature per kelvin), from implicit differentiation of the solved equation; elasticity is the percent change of the output per percent change of the input.</p>\n");
            sb.Append("<table><thead><tr><th>Output</th><th>Input</th><th>Derivative (SI)</th><th>Elasticity</th></tr></thead><tbody>\n");
            foreach (var (output, row) in table)
                foreach (var (input, e) in row)
                    sb.Append("<tr><td>").Append(E(output)).Append("</td><td>").Append(E(input)).Append("</td><td class=\"num\">")
                      .Append(E(Fmt(e.Derivative))).Append("</td><td class=\"num\">").Append(e.Elasticity is double el ? E(Fmt(el)) : "&ndash;")
                      .Append("</td></tr>\n");
            sb.Append("</tbody></table>\n");
        }
        if (sheet.RoughnessSpread is { } r)
            sb.Append("<p id=\"roughness-spread\">").Append(E(string.Create(C,
                $"Across the roughness {SpreadRange(r)}, {r.Output} ranges from {Fmt(r.Low)} to {Fmt(r.High)} (in this sheet's units). Roughness: {r.Source}.")))
              .Append("</p>\n");
    }

    private static string SpreadRange(Contracts.RoughnessSpreadDto r) => r.Basis switch
    {
        "stated-uncertainty" => string.Create(C,
            $"of {r.Material} within the table's stated uncertainty of the new value, plus or minus {r.UncertaintyPercent} percent ({Fmt(r.LowRoughness)} to {Fmt(r.HighRoughness)}; the scatter of new surfaces, not ageing)"),
        "caller-aged" => $"from the value used ({Fmt(r.NewRoughness)}) to the given agedRoughness ({Fmt(r.AgedRoughness ?? r.HighRoughness)})",
        _ => $"of {r.Material} from new ({Fmt(r.NewRoughness)}) to aged ({Fmt(r.AgedRoughness ?? r.HighRoughness)})",
    };

    private static void Rows(StringBuilder sb, List<SheetRow> rows, string head, bool highlightFirst = false)
    {
        sb.Append("<table><thead><tr><th>").Append(head).Append("</th><th>Value</th><th>Unit</th><th>Note</th></tr></thead><tbody>\n");
        for (int i = 0; i < rows.Count; i++)
        {
            var r = rows[i];
            sb.Append("<tr><td>").Append(E(r.Name)).Append("</td><td class=\"num").Append(highlightFirst && i == 0 ? " out" : "").Append("\">")
              .Append(E(r.Value)).Append("</td><td>").Append(E(r.Unit)).Append("</td><td class=\"note\">").Append(E(r.Note)).Append("</td></tr>\n");
        }
        sb.Append("</tbody></table>\n");
    }

    private static void Table(StringBuilder sb, SheetTable t)
    {
        sb.Append("<table><thead><tr>");
        foreach (var c in t.Columns) sb.Append("<th>").Append(E(c)).Append("</th>");
        sb.Append("</tr></thead><tbody>\n");
        foreach (var row in t.Rows)
        {
            sb.Append("<tr>");
            for (int i = 0; i < row.Length; i++) sb.Append(i == 0 ? "<td>" : "<td class=\"num\">").Append(E(row[i])).Append("</td>");
            sb.Append("</tr>\n");
        }
        sb.Append("</tbody></table>\n");
        if (t.Note.Length > 0) sb.Append("<p class=\"note\">").Append(E(t.Note)).Append("</p>\n");
    }

    private static void Solver(StringBuilder sb, SolverRecord s)
    {
        sb.Append("<table><tbody>\n")
          .Append("<tr><th>Iterations</th><td class=\"num\">").Append(s.Iterations.ToString(C)).Append("</td></tr>\n")
          .Append("<tr><th>Converged</th><td>").Append(s.Converged ? "yes" : "<strong>no</strong>").Append("</td></tr>\n")
          .Append("<tr><th>Final residual</th><td class=\"num\">").Append(E(Fmt(s.FinalResidual))).Append(" <span class=\"note\">(").Append(E(s.ResidualMeaning)).Append(")</span></td></tr>\n")
          .Append("<tr><th>Stop reason</th><td>").Append(E(s.Status)).Append(": ").Append(E(s.StopReason)).Append("</td></tr>\n")
          .Append("<tr><th>Solve variable</th><td>").Append(E(s.SolveVariable)).Append("</td></tr>\n")
          .Append("</tbody></table>\n");
        sb.Append("<p class=\"note\">").Append(E(s.Note)).Append("</p>\n");
        if (s.Steps.Count == 0) return;
        sb.Append("<table id=\"iterations\"><thead><tr><th>Iteration</th><th>Value (").Append(E(s.SolveVariable)).Append(")</th><th>Residual</th><th>Step</th><th>Step kind</th></tr></thead><tbody>\n");
        foreach (var t in s.Steps)
        {
            string kind = t.Kind + (t.BisectionReason is { } why ? " (" + why + ")" : "");
            sb.Append("<tr><td class=\"num\">").Append(t.Iteration.ToString(C)).Append("</td><td class=\"num\">").Append(E(t.X.ToString("R", C)))
              .Append("</td><td class=\"num\">").Append(E(t.Residual.ToString("E3", C))).Append("</td><td class=\"num\">").Append(E(t.Step.ToString("E3", C)))
              .Append("</td><td>").Append(E(kind)).Append("</td></tr>\n");
        }
        sb.Append("</tbody></table>\n");
    }

    /// <summary>A number for a table: up to 8 significant digits, invariant culture.</summary>
    public static string Fmt(double v) => double.IsFinite(v) ? v.ToString("G8", C) : "not finite";

    public static string Fmt(double? v) => v is double d ? Fmt(d) : "not given";

    private static string E(string s) => HtmlEncoder.Default.Encode(s);
}
