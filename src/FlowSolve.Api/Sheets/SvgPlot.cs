using System.Globalization;
using System.Text;
using System.Text.Encodings.Web;

namespace FlowSolve.Api.Sheets;

/// <summary>One axis of a plot: its label, its range in data units, and whether it is logarithmic.</summary>
/// <param name="Label">Axis title with its unit, for example "Reynolds number Re".</param>
/// <param name="Minimum">Lower end in data units (greater than 0 on a log axis).</param>
/// <param name="Maximum">Upper end in data units.</param>
/// <param name="Log">True for a base-10 logarithmic axis.</param>
/// <param name="Integer">True for ticks at whole numbers only (iteration counts).</param>
public sealed record PlotAxis(string Label, double Minimum, double Maximum, bool Log = false, bool Integer = false);

/// <summary>
/// A small SVG writer for the calculation sheets: a plot frame with ticks, curves, shaded bands, horizontal reference
/// lines and marked points. Every curve carries the data it was drawn from in <c>data-points</c> (a JSON array of
/// [x, y] pairs in data units, round-trip precision) and every marked point its <c>data-x</c> and <c>data-y</c>, so
/// a reader, or a test, can compare the picture with the engine. Colours are presentation attributes (black, greys
/// and one accent), so the figure draws the same with or without the page's style sheet.
/// </summary>
public sealed class SvgPlot
{
    public const string Accent = "#b4451f";
    private const string Ink = "#111111";
    private const string Grey = "#6b6b6b";
    private const string LightGrey = "#d9d9d9";

    private static readonly CultureInfo C = CultureInfo.InvariantCulture;
    private readonly StringBuilder _body = new();
    private readonly string _id;
    private readonly string _title;
    private readonly PlotAxis _x;
    private readonly PlotAxis _y;
    private readonly double _width;
    private readonly double _height;
    private const double Left = 74, Right = 18, Top = 30, Bottom = 52;

    /// <summary>A plot of <paramref name="width"/> by <paramref name="height"/> view-box units.</summary>
    public SvgPlot(string id, string title, PlotAxis x, PlotAxis y, double width = 640, double height = 400)
    {
        _id = id;
        _title = title;
        _x = x;
        _y = y;
        _width = width;
        _height = height;
    }

    /// <summary>A plot whose two axes share one scale (a cross-section to scale): the ranges are widened to fit.</summary>
    public static SvgPlot EqualScale(string id, string title, string xLabel, string yLabel,
        double xMin, double xMax, double yMin, double yMax, double width = 640, double maxHeight = 420)
    {
        double plotW = width - Left - Right;
        double spanX = xMax - xMin, spanY = yMax - yMin;
        double plotH = Math.Clamp(plotW * spanY / spanX, 120, maxHeight - Top - Bottom);
        double scale = Math.Max(spanX / plotW, spanY / plotH); // data units per view-box unit
        double cx = 0.5 * (xMin + xMax), cy = 0.5 * (yMin + yMax);
        var x = new PlotAxis(xLabel, cx - 0.5 * scale * plotW, cx + 0.5 * scale * plotW);
        var y = new PlotAxis(yLabel, cy - 0.5 * scale * plotH, cy + 0.5 * scale * plotH);
        return new SvgPlot(id, title, x, y, width, plotH + Top + Bottom);
    }

    public PlotAxis X => _x;

    public PlotAxis Y => _y;

    /// <summary>A curve through the points (points outside the axes' ranges are kept in the data and left out of the drawing).</summary>
    public SvgPlot Curve(string name, IReadOnlyList<(double X, double Y)> points, bool accent = false, bool dashed = false, string role = "curve")
    {
        var data = new StringBuilder("[");
        var drawn = new StringBuilder();
        for (int i = 0; i < points.Count; i++)
        {
            var (x, y) = points[i];
            if (i > 0) data.Append(',');
            data.Append('[').Append(Num(x)).Append(',').Append(Num(y)).Append(']');
            if (!Drawable(x, y) || !Inside(x, y)) continue;
            drawn.Append(Px(x).ToString(C)).Append(',').Append(Py(y).ToString(C)).Append(' ');
        }
        data.Append(']');
        _body.Append(C, $"<polyline data-role=\"{Enc(role)}\" data-name=\"{Enc(name)}\" data-points=\"{Enc(data.ToString())}\" points=\"{drawn.ToString().TrimEnd()}\" fill=\"none\" stroke=\"{(accent ? Accent : Grey)}\" stroke-width=\"{(accent ? 2 : 1.2)}\"{(dashed ? " stroke-dasharray=\"5 4\"" : "")}/>");
        return this;
    }

    /// <summary>A closed outline (a channel section), drawn in ink, with its points in data-points.</summary>
    public SvgPlot Outline(string name, IReadOnlyList<(double X, double Y)> points, bool closed)
    {
        var data = new StringBuilder("[");
        var drawn = new StringBuilder();
        for (int i = 0; i < points.Count; i++)
        {
            if (i > 0) data.Append(',');
            data.Append('[').Append(Num(points[i].X)).Append(',').Append(Num(points[i].Y)).Append(']');
            drawn.Append(Px(points[i].X).ToString(C)).Append(',').Append(Py(points[i].Y).ToString(C)).Append(' ');
        }
        data.Append(']');
        string tag = closed ? "polygon" : "polyline";
        _body.Append(C, $"<{tag} data-role=\"outline\" data-name=\"{Enc(name)}\" data-points=\"{Enc(data.ToString())}\" points=\"{drawn.ToString().TrimEnd()}\" fill=\"none\" stroke=\"{Ink}\" stroke-width=\"2\"/>");
        return this;
    }

    /// <summary>A water surface (or any horizontal line) from x1 to x2 at height y, with a label; role "case" marks the answer.</summary>
    public SvgPlot Level(string name, double x1, double x2, double y, string label, bool accent, string role = "case", bool dashed = false)
    {
        _body.Append(C, $"<line data-role=\"{Enc(role)}\" data-name=\"{Enc(name)}\" data-y=\"{Num(y)}\" data-x1=\"{Num(x1)}\" data-x2=\"{Num(x2)}\" x1=\"{Px(x1)}\" y1=\"{Py(y)}\" x2=\"{Px(x2)}\" y2=\"{Py(y)}\" stroke=\"{(accent ? Accent : Grey)}\" stroke-width=\"2\"{(dashed ? " stroke-dasharray=\"6 4\"" : "")}/>");
        _body.Append(C, $"<text x=\"{Px(x2) + 4:0.##}\" y=\"{Py(y) - 3:0.##}\" font-size=\"11\" fill=\"{(accent ? Accent : Grey)}\">{Enc(label)}</text>");
        return this;
    }

    /// <summary>A water area below a level (a filled polygon in light grey).</summary>
    public SvgPlot Fill(IReadOnlyList<(double X, double Y)> points)
    {
        var drawn = new StringBuilder();
        foreach (var (x, y) in points) drawn.Append(Px(x).ToString(C)).Append(',').Append(Py(y).ToString(C)).Append(' ');
        _body.Append(C, $"<polygon data-role=\"fill\" points=\"{drawn.ToString().TrimEnd()}\" fill=\"#ececec\" stroke=\"none\"/>");
        return this;
    }

    /// <summary>A shaded vertical band between two x values (the transition zone).</summary>
    public SvgPlot Band(string name, double x1, double x2, string label)
    {
        double a = Px(Math.Max(x1, _x.Minimum)), b = Px(Math.Min(x2, _x.Maximum));
        if (b <= a) return this;
        _body.Append(C, $"<rect data-role=\"band\" data-name=\"{Enc(name)}\" data-x1=\"{Num(x1)}\" data-x2=\"{Num(x2)}\" x=\"{a:0.##}\" y=\"{Top}\" width=\"{b - a:0.##}\" height=\"{PlotHeight:0.##}\" fill=\"#efefef\" stroke=\"none\"/>");
        _body.Append(C, $"<text x=\"{0.5 * (a + b):0.##}\" y=\"{Top + 14}\" font-size=\"10\" text-anchor=\"middle\" fill=\"{Grey}\">{Enc(label)}</text>");
        return this;
    }

    /// <summary>A horizontal reference line across the plot.</summary>
    public SvgPlot HorizontalLine(string name, double y, string label)
    {
        if (!(y >= Math.Min(_y.Minimum, _y.Maximum) && y <= Math.Max(_y.Minimum, _y.Maximum))) return this;
        _body.Append(C, $"<line data-role=\"reference\" data-name=\"{Enc(name)}\" data-y=\"{Num(y)}\" x1=\"{Left}\" y1=\"{Py(y)}\" x2=\"{_width - Right:0.##}\" y2=\"{Py(y)}\" stroke=\"{Grey}\" stroke-width=\"1\" stroke-dasharray=\"2 3\"/>");
        _body.Append(C, $"<text x=\"{_width - Right - 4:0.##}\" y=\"{Py(y) - 4:0.##}\" font-size=\"10\" text-anchor=\"end\" fill=\"{Grey}\">{Enc(label)}</text>");
        return this;
    }

    /// <summary>A marked point (the case), with its data coordinates in data-x and data-y.</summary>
    public SvgPlot Marker(string name, double x, double y, string label, string role = "case", bool accent = true)
    {
        string colour = accent ? Accent : Ink;
        _body.Append(C, $"<circle data-role=\"{Enc(role)}\" data-name=\"{Enc(name)}\" data-x=\"{Num(x)}\" data-y=\"{Num(y)}\" cx=\"{Px(x)}\" cy=\"{Py(y)}\" r=\"4.5\" fill=\"{colour}\" stroke=\"#ffffff\" stroke-width=\"1\"/>");
        // Near the right edge the label stands to the left of the point, so that it stays inside the drawing.
        bool right = Px(x) > Left + 0.85 * PlotWidth;
        _body.Append(C, $"<text x=\"{(right ? Px(x) - 8 : Px(x) + 8):0.##}\" y=\"{Py(y) - 8:0.##}\" font-size=\"11\"{(right ? " text-anchor=\"end\"" : "")} fill=\"{colour}\">{Enc(label)}</text>");
        return this;
    }

    /// <summary>A data point drawn as a hollow circle without a label (a catalogue point beside a fitted curve), with its
    /// data coordinates in data-x and data-y; left out of the drawing, not the markup, outside the axes' ranges.</summary>
    public SvgPlot Point(string name, double x, double y, string role = "data-point")
    {
        string at = Drawable(x, y) ? string.Create(C, $" cx=\"{Px(x)}\" cy=\"{Py(y)}\"") : " visibility=\"hidden\"";
        _body.Append(C, $"<circle data-role=\"{Enc(role)}\" data-name=\"{Enc(name)}\" data-x=\"{Num(x)}\" data-y=\"{Num(y)}\"{at} r=\"3.5\" fill=\"#ffffff\" stroke=\"{Ink}\" stroke-width=\"1.5\"/>");
        return this;
    }

    /// <summary>A straight link between two points (a pipe or pump on a schematic), with its ends in data units and an
    /// optional label at its middle; dashed for a pump, grey for a closed link.</summary>
    public SvgPlot Segment(string name, double x1, double y1, double x2, double y2, string label, string role = "link", bool dashed = false, bool grey = false)
    {
        string colour = grey ? LightGrey : Ink;
        _body.Append(C, $"<line data-role=\"{Enc(role)}\" data-name=\"{Enc(name)}\" data-x1=\"{Num(x1)}\" data-y1=\"{Num(y1)}\" data-x2=\"{Num(x2)}\" data-y2=\"{Num(y2)}\" x1=\"{Px(x1)}\" y1=\"{Py(y1)}\" x2=\"{Px(x2)}\" y2=\"{Py(y2)}\" stroke=\"{colour}\" stroke-width=\"2\"{(dashed ? " stroke-dasharray=\"6 4\"" : "")}/>");
        if (label.Length > 0)
            _body.Append(C, $"<text x=\"{0.5 * (Px(x1) + Px(x2)):0.##}\" y=\"{0.5 * (Py(y1) + Py(y2)) - 4:0.##}\" font-size=\"9.5\" text-anchor=\"middle\" fill=\"{Grey}\">{Enc(label)}</text>");
        return this;
    }

    /// <summary>A square marker (a reservoir on a schematic) with its data coordinates and a label.</summary>
    public SvgPlot Square(string name, double x, double y, string label, string role = "reservoir")
    {
        _body.Append(C, $"<rect data-role=\"{Enc(role)}\" data-name=\"{Enc(name)}\" data-x=\"{Num(x)}\" data-y=\"{Num(y)}\" x=\"{Px(x) - 6:0.##}\" y=\"{Py(y) - 6:0.##}\" width=\"12\" height=\"12\" fill=\"#ffffff\" stroke=\"{Ink}\" stroke-width=\"2\"/>");
        _body.Append(C, $"<text x=\"{Px(x) + 9:0.##}\" y=\"{Py(y) + 14:0.##}\" font-size=\"10.5\" fill=\"{Ink}\">{Enc(label)}</text>");
        return this;
    }

    /// <summary>A note in the plot's upper left corner (for example "no iterations: explicit relation").</summary>
    public SvgPlot Note(string text)
    {
        _body.Append(C, $"<text x=\"{Left + 8}\" y=\"{Top + 30}\" font-size=\"12\" fill=\"{Grey}\">{Enc(text)}</text>");
        return this;
    }

    /// <summary>A label of a curve at a data position.</summary>
    public SvgPlot Label(double x, double y, string text, string anchor = "start")
    {
        if (!Drawable(x, y)) return this;
        _body.Append(C, $"<text x=\"{Px(x)}\" y=\"{Py(y)}\" font-size=\"9.5\" text-anchor=\"{anchor}\" fill=\"{Grey}\">{Enc(text)}</text>");
        return this;
    }

    /// <summary>The finished SVG element.</summary>
    public string Render()
    {
        var sb = new StringBuilder();
        sb.Append(C, $"<svg id=\"{Enc(_id)}\" class=\"plot\" viewBox=\"0 0 {_width:0.##} {_height:0.##}\" role=\"img\" aria-label=\"{Enc(_title)}\" data-x-scale=\"{(_x.Log ? "log" : "linear")}\" data-y-scale=\"{(_y.Log ? "log" : "linear")}\" font-family=\"Helvetica, Arial, sans-serif\">");
        sb.Append(C, $"<title>{Enc(_title)}</title>");
        sb.Append(C, $"<rect x=\"0\" y=\"0\" width=\"{_width:0.##}\" height=\"{_height:0.##}\" fill=\"#ffffff\"/>");
        Ticks(sb, _x, horizontal: true);
        Ticks(sb, _y, horizontal: false);
        sb.Append(_body);
        sb.Append(C, $"<rect x=\"{Left}\" y=\"{Top}\" width=\"{PlotWidth:0.##}\" height=\"{PlotHeight:0.##}\" fill=\"none\" stroke=\"{Ink}\" stroke-width=\"1\"/>");
        sb.Append(C, $"<text x=\"{Left}\" y=\"18\" font-size=\"13\" font-weight=\"bold\" fill=\"{Ink}\">{Enc(_title)}</text>");
        sb.Append(C, $"<text x=\"{Left + 0.5 * PlotWidth:0.##}\" y=\"{_height - 12:0.##}\" font-size=\"11.5\" text-anchor=\"middle\" fill=\"{Ink}\">{Enc(_x.Label)}</text>");
        sb.Append(C, $"<text transform=\"translate(16 {Top + 0.5 * PlotHeight:0.##}) rotate(-90)\" font-size=\"11.5\" text-anchor=\"middle\" fill=\"{Ink}\">{Enc(_y.Label)}</text>");
        sb.Append("</svg>");
        return sb.ToString();
    }

    private double PlotWidth => _width - Left - Right;

    private double PlotHeight => _height - Top - Bottom;

    private bool Drawable(double x, double y) =>
        double.IsFinite(x) && double.IsFinite(y) && (!_x.Log || x > 0) && (!_y.Log || y > 0);

    private bool Inside(double x, double y) => T(_x, x) is >= -1e-9 and <= 1 + 1e-9 && T(_y, y) is >= -1e-9 and <= 1 + 1e-9;

    private static double T(PlotAxis a, double v) =>
        a.Log ? (Math.Log10(v) - Math.Log10(a.Minimum)) / (Math.Log10(a.Maximum) - Math.Log10(a.Minimum)) : (v - a.Minimum) / (a.Maximum - a.Minimum);

    private double Px(double x) => Math.Round(Left + T(_x, x) * PlotWidth, 2);

    private double Py(double y) => Math.Round(Top + (1 - T(_y, y)) * PlotHeight, 2);

    private void Ticks(StringBuilder sb, PlotAxis a, bool horizontal)
    {
        foreach (var (value, major) in TickValues(a))
        {
            double t = T(a, value);
            if (t < -1e-9 || t > 1 + 1e-9) continue;
            if (horizontal)
            {
                double px = Left + t * PlotWidth;
                if (major) sb.Append(C, $"<line x1=\"{px:0.##}\" y1=\"{Top}\" x2=\"{px:0.##}\" y2=\"{Top + PlotHeight:0.##}\" stroke=\"{LightGrey}\" stroke-width=\"0.8\"/>");
                sb.Append(C, $"<line x1=\"{px:0.##}\" y1=\"{Top + PlotHeight:0.##}\" x2=\"{px:0.##}\" y2=\"{Top + PlotHeight + (major ? 5 : 3):0.##}\" stroke=\"{Ink}\" stroke-width=\"0.8\"/>");
                if (major) sb.Append(C, $"<text x=\"{px:0.##}\" y=\"{Top + PlotHeight + 17:0.##}\" font-size=\"10.5\" text-anchor=\"middle\" fill=\"{Ink}\">{Enc(TickText(value, a))}</text>");
            }
            else
            {
                double py = Top + (1 - t) * PlotHeight;
                if (major) sb.Append(C, $"<line x1=\"{Left}\" y1=\"{py:0.##}\" x2=\"{Left + PlotWidth:0.##}\" y2=\"{py:0.##}\" stroke=\"{LightGrey}\" stroke-width=\"0.8\"/>");
                sb.Append(C, $"<line x1=\"{Left - (major ? 5 : 3)}\" y1=\"{py:0.##}\" x2=\"{Left}\" y2=\"{py:0.##}\" stroke=\"{Ink}\" stroke-width=\"0.8\"/>");
                if (major) sb.Append(C, $"<text x=\"{Left - 8}\" y=\"{py + 3.5:0.##}\" font-size=\"10.5\" text-anchor=\"end\" fill=\"{Ink}\">{Enc(TickText(value, a))}</text>");
            }
        }
    }

    /// <summary>Decades (major) and 2..9 (minor) on a log axis; 1, 2 or 5 times a power of ten on a linear one.</summary>
    private static IEnumerable<(double Value, bool Major)> TickValues(PlotAxis a)
    {
        if (a.Log)
        {
            int lo = (int)Math.Floor(Math.Log10(a.Minimum)), hi = (int)Math.Ceiling(Math.Log10(a.Maximum));
            bool sparse = hi - lo > 8;
            for (int e = lo; e <= hi; e++)
            {
                double d = Math.Pow(10, e);
                yield return (d, !sparse || e % 2 == 0);
                if (hi - lo <= 4)
                    for (int m = 2; m <= 9; m++) yield return (m * d, m is 2 or 5 && hi - lo <= 1);
            }
            yield break;
        }
        double span = a.Maximum - a.Minimum;
        double raw = span / 6;
        double p = Math.Pow(10, Math.Floor(Math.Log10(raw)));
        double step = raw / p < 1.5 ? p : raw / p < 3.5 ? 2 * p : raw / p < 7.5 ? 5 * p : 10 * p;
        if (a.Integer) step = Math.Max(1, Math.Round(step));
        for (double v = Math.Ceiling(a.Minimum / step) * step; v <= a.Maximum + 1e-9 * span; v += step)
            yield return (Math.Abs(v) < 1e-12 * span ? 0 : v, true);
    }

    private static string TickText(double v, PlotAxis a)
    {
        if (a.Log)
        {
            double e = Math.Log10(v);
            if (Math.Abs(e - Math.Round(e)) < 1e-9 && (e < -2 || e > 3)) return "1e" + Math.Round(e).ToString(C);
            return v.ToString("0.####", C);
        }
        return v.ToString("G4", C);
    }

    /// <summary>Round-trip text of a number for data attributes.</summary>
    public static string Num(double v) => double.IsFinite(v) ? v.ToString("R", C) : "null";

    private static string Enc(string s) => HtmlEncoder.Default.Encode(s);
}
