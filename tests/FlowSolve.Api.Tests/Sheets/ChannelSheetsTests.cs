namespace FlowSolve.Api.Tests.Sheets;

/// <summary>The channel sheets: the section to scale with the response's depths as water lines.</summary>
public sealed class ChannelSheetsTests(ApiFixture api)
{
    [Fact]
    public async Task NormalDepth_Trapezoid_WaterLinesAreTheResponsesDepths_AndSpanTheTopWidth()
    {
        const string query = "/v1/channels/normal-depth?shape=trapezoidal&bottomWidth=3&sideSlope=2&manningN=0.025&slope=0.001&flow=10";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var lines = page.Cases("plot-section").ToDictionary(e => e.GetAttribute("data-name")!);
        var normal = lines["normal depth"];
        Assert.Equal(json.Body.GetProperty("normalDepth").GetDouble(), SheetPage.Attr(normal, "data-y"));
        Assert.Equal(json.Body.GetProperty("criticalDepth").GetDouble(), SheetPage.Attr(lines["critical depth"], "data-y"));
        // The drawn surface width is the top width T = b + 2 z y of the response (a property of the trapezoid).
        double width = SheetPage.Attr(normal, "data-x2") - SheetPage.Attr(normal, "data-x1");
        Assert.Equal(json.Body.GetProperty("topWidth").GetDouble(), width, 1e-12);
        // To scale: both axes of the view box carry the same data units per unit.
        Assert.Equal("linear", page.Document.QuerySelector("svg#plot-section")!.GetAttribute("data-x-scale"));
    }

    [Fact]
    public async Task NormalDepth_CircleWithTwoDepths_BothWaterLinesDrawn()
    {
        // A flow between the full-pipe discharge and the peak (at about 0.938 D) has two normal depths.
        const string capacity = "/v1/channels/normal-depth?shape=circular&diameter=1&manningN=0.013&slope=0.01&flow=0.1";
        var cap = (await api.GetJson(capacity)).Body.GetProperty("capacity");
        double flow = 0.5 * (cap.GetProperty("fullFlow").GetDouble() + cap.GetProperty("maximumFlow").GetDouble());
        string query = FormattableString.Invariant($"/v1/channels/normal-depth?shape=circular&diameter=1&manningN=0.013&slope=0.01&flow={flow:R}");
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var lines = page.Cases("plot-section").ToDictionary(e => e.GetAttribute("data-name")!);
        Assert.Equal(json.Body.GetProperty("normalDepth").GetDouble(), SheetPage.Attr(lines["normal depth"], "data-y"));
        Assert.Equal(json.Body.GetProperty("alternateNormalDepth").GetDouble(), SheetPage.Attr(lines["alternate normal depth"], "data-y"));
        // Chord of a circle of radius r at height y above the invert: 2 sqrt(r^2 - (y - r)^2) = T.
        var normal = lines["normal depth"];
        Assert.Equal(json.Body.GetProperty("topWidth").GetDouble(), SheetPage.Attr(normal, "data-x2") - SheetPage.Attr(normal, "data-x1"), 1e-12);
    }

    [Fact]
    public async Task CriticalDepth_Rectangle_LineAtTheClosedForm()
    {
        var page = await SheetPage.Get(api, "/v1/channels/critical-depth?shape=rectangular&bottomWidth=4&flow=12&format=html");

        // Rectangular channel: y_c = (q^2/g)^(1/3), q = Q/b (closed form; Chow 1959, chapter 4, from memory).
        double yc = Math.Cbrt(9.0 / 9.80665);
        var line = Assert.Single(page.Cases("plot-section"));
        Assert.Equal(yc, SheetPage.Attr(line, "data-y"), 1e-12);
        // The record is the answer's own solve: as many rows as the JSON answer's trace, ending at ln yc.
        var traced = await api.GetJson("/v1/channels/critical-depth?shape=rectangular&bottomWidth=4&flow=12&trace=true");
        var trace = traced.Body.GetProperty("trace");
        var rows = page.Document.QuerySelectorAll("#iterations tbody tr");
        Assert.Equal(trace.GetArrayLength(), rows.Length);
        // One row per iteration, and one for the start itself when it already met the tolerance (the closed form here).
        Assert.InRange(rows.Length, 1, traced.Body.GetProperty("iterations").GetInt32() + 1);
        Assert.Equal(Math.Log(yc), trace[trace.GetArrayLength() - 1].GetProperty("x").GetDouble(), 1e-9);
        Assert.NotEmpty(page.Cases("plot-convergence"));
    }

    [Fact]
    public async Task NormalDepth_Surveyed_RecordIsTheAnswersOwnSolve()
    {
        const string query = "/v1/channels/normal-depth?shape=surveyed&points=0:2,4:0,7:0,11:2&manningN=0.03&slope=0.001&flow=5";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var normal = page.Cases("plot-section").Single(e => e.GetAttribute("data-name") == "normal depth");
        double y = json.Body.GetProperty("normalDepth").GetDouble();
        Assert.Equal(y, SheetPage.Attr(normal, "data-y"));
        // The survey's walls run 4 across per 2 up: the water edges lie at 4 - 2y and 7 + 2y.
        Assert.Equal(4 - 2 * y, SheetPage.Attr(normal, "data-x1"), 1e-12);
        Assert.Equal(7 + 2 * y, SheetPage.Attr(normal, "data-x2"), 1e-12);
        // A surveyed section is solved in y itself: the record's last iterate is the reported depth, and the record has
        // as many rows as the JSON answer's own trace.
        var rows = page.Document.QuerySelectorAll("#iterations tbody tr");
        var trace = (await api.GetJson(query + "&trace=true")).Body.GetProperty("trace");
        Assert.Equal(trace.GetArrayLength(), rows.Length);
        Assert.InRange(rows.Length, 1, json.Body.GetProperty("iterations").GetInt32() + 1);
        double lastY = double.Parse(rows[^1].Children[1].TextContent, System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal(y, lastY, y * 1e-10);
    }
}
