using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace FlowSolve.Api.Tests.Sheets;

/// <summary>
/// The network sheet against the JSON answer for the same request and the request itself: every part present, the
/// schematic's links drawn between their nodes' coordinates, the marked junction the one of lowest pressure head,
/// the convergence curves the response's record, and the tables the response's figures.
/// </summary>
public sealed class NetworkSheetTests(ApiFixture api)
{
    private const string Route = "/v1/networks/solve";

    private static JsonObject Sample() => JsonNode.Parse(File.ReadAllText(
        Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json")))!.AsObject();

    private async Task<(SheetPage Page, JsonElement Json)> Both(JsonObject body)
    {
        var page = await SheetPage.Post(api, Route + "?format=html", body);
        var json = await api.PostRaw(Route, body.ToJsonString(), "application/json");
        Assert.Equal(200, json.Status);
        return (page, json.Body);
    }

    [Fact]
    public async Task Build_Sample_SelfContainedSheetWithEveryPart()
    {
        var (page, json) = await Both(Sample());

        Assert.Equal(200, page.Status);
        Assert.Equal("text/html", page.ContentType);
        foreach (var id in new[] { "inputs", "defaults", "method", "results", "solver", "validity", "warnings", "cautions", "table-nodes", "table-links" })
            Assert.NotNull(page.Document.GetElementById(id));
        int cases = json.GetProperty("cases").GetArrayLength();
        for (int c = 1; c <= cases; c++)
            foreach (var t in new[] { "pipes", "junctions", "pumps", "reservoirs", "convergence" })
                Assert.NotNull(page.Document.GetElementById($"table-{t}-{c}"));
        Assert.Contains("Quellix village network", page.Document.QuerySelector("h1")!.TextContent);
        string method = page.Document.GetElementById("method")!.TextContent;
        Assert.Contains("Todini", method);
        Assert.Contains("Colebrook", method);
        Assert.Contains("Hazen-Williams", method);
        string cautions = page.Document.GetElementById("cautions")!.TextContent;
        Assert.Contains("qualified engineer", cautions);
        Assert.Contains("water hammer", cautions);
        // Every warning of every case appears, with its code.
        string warnings = page.Document.GetElementById("warnings")!.TextContent;
        foreach (var c in json.GetProperty("cases").EnumerateArray())
            foreach (var w in c.GetProperty("warnings").EnumerateArray())
                Assert.Contains(w.GetProperty("message").GetString()!, warnings);
        HtmlFormatFilterTests.AssertSelfContained(page);
    }

    [Fact]
    public async Task Build_Sample_SchematicLinksJoinTheirNodesAndTheLowestPressureIsMarked()
    {
        var body = Sample();
        var (page, json) = await Both(body);
        var at = new Dictionary<string, (double X, double Y)>();
        foreach (var n in body["junctions"]!.AsArray().Concat(body["reservoirs"]!.AsArray()))
            at[n!["id"]!.GetValue<string>()] = (n["x"]!.GetValue<double>(), n["y"]!.GetValue<double>());

        var links = page.Document.QuerySelectorAll("svg#plot-schematic line[data-role=pipe], svg#plot-schematic line[data-role=pump]").ToList();
        Assert.Equal(body["pipes"]!.AsArray().Count + body["pumps"]!.AsArray().Count, links.Count);
        foreach (var link in body["pipes"]!.AsArray().Concat(body["pumps"]!.AsArray()))
        {
            var line = links.Single(l => l.GetAttribute("data-name") == link!["id"]!.GetValue<string>());
            var (from, to) = (at[link!["from"]!.GetValue<string>()], at[link["to"]!.GetValue<string>()]);
            Assert.Equal(from.X, SheetPage.Attr(line, "data-x1"));
            Assert.Equal(from.Y, SheetPage.Attr(line, "data-y1"));
            Assert.Equal(to.X, SheetPage.Attr(line, "data-x2"));
            Assert.Equal(to.Y, SheetPage.Attr(line, "data-y2"));
        }
        Assert.Equal(body["reservoirs"]!.AsArray().Count, page.Document.QuerySelectorAll("svg#plot-schematic rect[data-role=reservoir]").Length);

        // The design case is the one with multiplier 1; its junction of lowest pressure head is the marked one.
        var design = json.GetProperty("cases").EnumerateArray().Single(c => c.GetProperty("demandMultiplier").GetDouble() == 1);
        var lowest = design.GetProperty("junctions").EnumerateArray().MinBy(j => j.GetProperty("pressureHead").GetDouble());
        var marked = Assert.Single(page.Cases("plot-schematic"));
        Assert.Equal(lowest.GetProperty("id").GetString(), marked.GetAttribute("data-name"));
        Assert.Equal(at[lowest.GetProperty("id").GetString()!].X, SheetPage.Attr(marked, "data-x"));
    }

    [Fact]
    public async Task Build_Sample_ConvergenceCurvesAndTablesAreTheResponses()
    {
        var (page, json) = await Both(Sample());
        int most = json.GetProperty("iterations").GetInt32();
        var slowest = json.GetProperty("cases").EnumerateArray().First(c => c.GetProperty("iterations").GetInt32() == most);
        var record = slowest.GetProperty("convergence").EnumerateArray().ToArray();
        var curve = SheetPage.Points(page.Document.QuerySelector("svg#plot-convergence polyline[data-role=head-imbalance]")!);
        Assert.Equal(record.Length, curve.Length);
        for (int i = 0; i < record.Length; i++)
        {
            Assert.Equal(record[i].GetProperty("iteration").GetInt32(), curve[i].X);
            Assert.Equal(Math.Max(Math.Abs(record[i].GetProperty("maxHeadImbalance").GetDouble()), 1e-17), curve[i].Y);
        }
        var final = Assert.Single(page.Cases("plot-convergence"));
        Assert.Equal(record[^1].GetProperty("iteration").GetInt32(), SheetPage.Attr(final, "data-x"));

        // The pipe table of each case holds the response's flows (to the table's 8 significant figures).
        int c = 0;
        foreach (var k in json.GetProperty("cases").EnumerateArray())
        {
            c++;
            var rows = page.Document.QuerySelectorAll($"#table-pipes-{c} tbody tr").ToList();
            var pipes = k.GetProperty("pipes").EnumerateArray().ToArray();
            Assert.Equal(pipes.Length, rows.Count);
            for (int i = 0; i < pipes.Length; i++)
            {
                var cells = rows[i].QuerySelectorAll("td").Select(td => td.TextContent).ToArray();
                Assert.Equal(pipes[i].GetProperty("id").GetString(), cells[0]);
                double flow = pipes[i].GetProperty("flow").GetDouble();
                Assert.Equal(flow, double.Parse(cells[1], CultureInfo.InvariantCulture), Math.Abs(flow) * 1e-7 + 1e-300);
                Assert.Equal(pipes[i].GetProperty("status").GetString(), cells[^1]);
            }
        }
    }

    [Fact]
    public async Task Build_NoCoordinates_NoSchematicButTheConvergencePlot()
    {
        var body = Sample();
        foreach (var n in body["junctions"]!.AsArray().Concat(body["reservoirs"]!.AsArray())) { n!.AsObject().Remove("x"); n.AsObject().Remove("y"); }
        var (page, _) = await Both(body);
        Assert.Equal(200, page.Status);
        Assert.Null(page.Document.QuerySelector("svg#plot-schematic"));
        Assert.NotNull(page.Document.QuerySelector("svg#plot-convergence"));
    }

    [Fact]
    public async Task Build_BadNetwork_ProblemPageWith400()
    {
        var body = Sample();
        body["pipes"]![0]!["length"] = -1;
        var page = await SheetPage.Post(api, Route + "?format=html", body);
        Assert.Equal(400, page.Status);
        Assert.Contains("pipes[0].length", page.Document.GetElementById("problem")!.TextContent);
    }
}
