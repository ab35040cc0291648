using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using FlowSolve.Api.Tests.Sheets;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Api.Tests.Networks;

/// <summary>
/// Network edge cases through the service: series networks at the edge of double precision against Brent on
/// Darcy-Weisbach with friction relations written out here; the transition zone against /v1/pipes/flow; the method and
/// the sheet naming the head solver that ran; and the answer's bound (413 naming the limit, summary and chosen elements).
/// </summary>
public sealed class NetworkEdgeCaseEndpointsTests(ApiFixture api)
{
    private const string Route = "/v1/networks/solve";
    private const double Nu = 1e-6;
    private const double G = 9.80665; // standard gravity, m/s2 (3rd CGPM, 1901)

    private async Task<(int Status, string? ContentType, JsonElement Body)> Post(JsonNode body) =>
        await api.PostRaw(Route, body.ToJsonString(), "application/json");

    private static JsonObject Sample() => JsonNode.Parse(File.ReadAllText(
        Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json")))!.AsObject();

    /// <summary>Darcy friction factor: 64/Re; Churchill (1977) from 2000; Colebrook-White (1939) by Brent from 4000.</summary>
    private static double Friction(double re, double r)
    {
        if (re < 2000) return 64 / re;
        if (re < 4000)
        {
            double a = Math.Pow(-2.457 * Math.Log(Math.Pow(7 / re, 0.9) + 0.27 * r), 16), b = Math.Pow(37530 / re, 16);
            return 8 * Math.Pow(Math.Pow(8 / re, 12) + Math.Pow(a + b, -1.5), 1.0 / 12);
        }
        double x = Brent.FindRoot(x => x + 2 * Math.Log10(r / 3.7 + 2.51 * x / re), 1, 100, 1e-14, 200);
        return 1 / (x * x);
    }

    private static double HeadLoss(double l, double d, double q)
    {
        double v = q / (Math.PI * d * d / 4);
        return Friction(v * d / Nu, 0) * l / d * v * v / (2 * G);
    }

    private static JsonObject Series(double upper, double wideLength) => JsonNode.Parse(string.Create(CultureInfo.InvariantCulture, $$"""
        {"junctions": [{"id": "j", "elevation": 0}],
         "reservoirs": [{"id": "upper", "head": {{upper}}}, {"id": "lower", "head": 10}],
         "pipes": [{"id": "narrow", "from": "upper", "to": "j", "length": 100, "diameter": 0.05, "roughness": 0},
                   {"id": "wide", "from": "j", "to": "lower", "length": {{wideLength:R}}, "diameter": 1, "roughness": 0}],
         "kinematicViscosity": 1e-6}
        """))!.AsObject();

    [Theory]
    [InlineData(1.0)]
    [InlineData(1e-3)]
    [InlineData(1e-6)]
    public async Task Solve_SeriesWithWideLaminarPipe_SolvesToTheExactFlow(double wideLength)
    {
        // Reservoir at 11 m, 100 m x 50 mm pipe, junction, a 1 m wide pipe (1 m, 1 mm or 1 um long), reservoir at 10 m.
        // Before: iteration-cap-reached after 100 iterations, continuity stalled at 1.9e-10 (1 m) and 1.3e-6 m3/s (1 um).
        var r = await Post(Series(11, wideLength));
        Assert.Equal(200, r.Status);
        var c = r.Body.GetProperty("cases")[0];
        Assert.Equal("solved", c.GetProperty("status").GetString());
        Assert.InRange(c.GetProperty("iterations").GetInt32(), 1, 20);

        double exact = Brent.FindRoot(q => HeadLoss(100, 0.05, q) + HeadLoss(wideLength, 1, q) - 1, 1e-6, 0.1, 1e-19, 500);
        foreach (var p in c.GetProperty("pipes").EnumerateArray())
            Assert.Equal(exact, p.GetProperty("flow").GetDouble(), exact * 1e-9);
        Assert.Equal(10 + HeadLoss(wideLength, 1, exact), c.GetProperty("junctions")[0].GetProperty("head").GetDouble(), 1e-12);
    }

    [Theory]
    [InlineData(0.01)]
    [InlineData(0.014)]
    [InlineData(0.018)]
    public async Task Solve_TransitionalPipe_CarriesWhatPipesFlowGives(double head)
    {
        // 100 m of 50 mm smooth pipe with 10 to 18 mm of head: Re 2600 to 3200. Before: 9 to 10.5 % more flow in the
        // network than /v1/pipes/flow gave, and no warning.
        var network = JsonNode.Parse(string.Create(CultureInfo.InvariantCulture, $$"""
            {"reservoirs": [{"id": "a", "head": {{10 + head:R}}}, {"id": "b", "head": 10}],
             "pipes": [{"id": "p", "from": "a", "to": "b", "length": 100, "diameter": 0.05, "roughness": 0}],
             "kinematicViscosity": 1e-6}
            """))!;
        var r = await Post(network);
        var single = await api.GetJson(string.Create(CultureInfo.InvariantCulture,
            $"/v1/pipes/flow?headLoss={head:R}&diameter=0.05&length=100&roughness=0&kinematicViscosity=1e-6"));
        Assert.Equal(200, r.Status);
        Assert.Equal(200, single.Status);

        var c = r.Body.GetProperty("cases")[0];
        var pipe = c.GetProperty("pipes")[0];
        double q = pipe.GetProperty("flow").GetDouble(), expected = single.Body.GetProperty("flow").GetDouble();
        Assert.Equal(expected, q, expected * 1e-8);
        // And both are Brent's answer on the written-out relations.
        double exact = Brent.FindRoot(x => HeadLoss(100, 0.05, x) - head, 1e-6, 0.01, 1e-19, 500);
        Assert.Equal(exact, q, exact * 1e-8);
        double re = pipe.GetProperty("reynolds").GetDouble();
        Assert.InRange(re, 2100, 3800);
        var warning = Assert.Single(c.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "transitional-flow");
        Assert.Equal("p", warning.GetProperty("element").GetString());
        Assert.Contains("Churchill", warning.GetProperty("message").GetString());
        Assert.Equal(1, c.GetProperty("summary").GetProperty("transitionalPipes").GetInt32());
        Assert.Contains("Churchill", r.Body.GetProperty("method").GetString());
    }

    [Fact]
    public async Task Solve_MethodAndSheet_NameTheSparseCholeskySolverThatRan()
    {
        var r = await Post(Sample());
        Assert.Equal(200, r.Status);
        string method = r.Body.GetProperty("method").GetString()!;
        Assert.Equal("sparse-cholesky", r.Body.GetProperty("headSolver").GetString());
        Assert.Contains("sparse Cholesky", method);
        Assert.DoesNotContain("conjugate gradient", method);
        // Property: the direct solve takes 1 triangular solve, plus one per refinement step (at most 4).
        foreach (var c in r.Body.GetProperty("cases").EnumerateArray())
            foreach (var t in c.GetProperty("convergence").EnumerateArray())
                Assert.InRange(t.GetProperty("linearIterations").GetInt32(), 1, 5);

        var page = await SheetPage.Post(api, Route + "?format=html", Sample());
        Assert.Equal(200, page.Status);
        string sheetMethod = page.Document.GetElementById("method")!.TextContent;
        Assert.Contains("sparse Cholesky", sheetMethod);
        Assert.DoesNotContain("conjugate gradients", sheetMethod);
        Assert.Contains("Churchill", sheetMethod);
        Assert.DoesNotContain("Dunlop", sheetMethod);
        var header = page.Document.GetElementById("table-convergence-1")!.QuerySelectorAll("th").Select(h => h.TextContent).ToList();
        Assert.Contains("Triangular solves", header);
    }

    /// <summary>A square grid of n x n junctions drawing 0.04 L/s each, 100 m of 150 mm pipe between neighbours, fed from
    /// a reservoir at one corner through 100 m of 1 m pipe (70 x 70: 9 661 pipes; invented).</summary>
    internal static JsonObject Grid(int n, int cases, JsonObject? output = null)
    {
        var junctions = new JsonArray();
        var pipes = new JsonArray();
        for (int i = 0; i < n; i++)
            for (int k = 0; k < n; k++)
            {
                junctions.Add(new JsonObject { ["id"] = $"n{i}_{k}", ["elevation"] = 0, ["demand"] = 0.00004 });
                if (k + 1 < n) pipes.Add(new JsonObject { ["id"] = $"h{i}_{k}", ["from"] = $"n{i}_{k}", ["to"] = $"n{i}_{k + 1}", ["length"] = 100, ["diameter"] = 0.15, ["roughness"] = 0.0001 });
                if (i + 1 < n) pipes.Add(new JsonObject { ["id"] = $"v{i}_{k}", ["from"] = $"n{i}_{k}", ["to"] = $"n{i + 1}_{k}", ["length"] = 100, ["diameter"] = 0.15, ["roughness"] = 0.0001 });
            }
        pipes.Add(new JsonObject { ["id"] = "feed", ["from"] = "src", ["to"] = "n0_0", ["length"] = 100, ["diameter"] = 1.0, ["roughness"] = 0.0001 });
        var multipliers = new JsonArray();
        for (int c = 0; c < cases; c++) multipliers.Add(0.3 + 0.05 * c);
        var body = new JsonObject
        {
            ["junctions"] = junctions, ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = "src", ["head"] = 200 }),
            ["pipes"] = pipes, ["demandMultipliers"] = multipliers,
        };
        if (output is not null) body["output"] = output;
        return body;
    }

    [Fact]
    public async Task Solve_GridWithTwentyFourCasesInFull_Answers413NamingTheLimit()
    {
        // The 9 661-pipe grid with 24 load cases: before, a 56 MB answer. Its rows: (9 661 + 4 900 + 1) x 24.
        var r = await Post(Grid(70, 24));
        Assert.Equal(413, r.Status);
        Assert.Equal("networkMaxElementCases", r.Body.GetProperty("limit").GetString());
        Assert.Equal(100_000, r.Body.GetProperty("maximum").GetInt64());
        Assert.Equal((9661L + 4900 + 1) * 24, r.Body.GetProperty("given").GetInt64());
        string detail = r.Body.GetProperty("detail").GetString()!;
        Assert.Contains("FlowSolve:Limits:NetworkMaxElementCases", detail);
        Assert.Contains("summary", detail);
    }

    [Fact]
    public async Task Solve_GridWithTwentyFourCasesAsSummary_AnswersEveryCaseWithoutRows()
    {
        var r = await Post(Grid(70, 24, new JsonObject { ["detail"] = "summary" }));
        Assert.Equal(200, r.Status);
        Assert.Equal("summary", r.Body.GetProperty("detail").GetString());
        var cases = r.Body.GetProperty("cases").EnumerateArray().ToArray();
        Assert.Equal(24, cases.Length);
        foreach (var c in cases)
        {
            Assert.True(c.GetProperty("converged").GetBoolean());
            foreach (var table in new[] { "pipes", "junctions", "pumps", "reservoirs" })
                Assert.Equal(0, c.GetProperty(table).GetArrayLength());
            // Property: the demand is 4900 x 0.04 L/s times the multiplier, and the supply meets it.
            double demand = 4900 * 0.00004 * c.GetProperty("demandMultiplier").GetDouble();
            Assert.Equal(demand, c.GetProperty("totalDemand").GetDouble(), 1e-9);
            Assert.Equal(demand, c.GetProperty("totalSupply").GetDouble(), 1e-7);
            // The corner farthest from the feed has the lowest pressure; one of the two pipes that leave the fed corner
            // is the fastest, and (sharing the whole demand but the fed corner's own) at least half of it flows in that one.
            var s = c.GetProperty("summary");
            double leaving = demand * 4899 / 4900;
            Assert.Equal("n69_69", s.GetProperty("lowestPressureHead").GetProperty("element").GetString());
            Assert.Contains(s.GetProperty("highestVelocity").GetProperty("element").GetString(), new[] { "h0_0", "v0_0" });
            Assert.True(s.GetProperty("highestVelocity").GetProperty("value").GetDouble() >= leaving / 2 / (Math.PI * 0.15 * 0.15 / 4) * (1 - 1e-9));
        }
    }

    [Fact]
    public async Task Solve_ChosenElements_ListsThoseRowsAsTheFullAnswerHasThem()
    {
        var full = await Post(Sample());
        var body = Sample();
        body["output"] = new JsonObject { ["elements"] = new JsonArray("p4", "school", "orvex", "zemmit-booster") };
        var chosen = await Post(body);
        Assert.Equal(200, full.Status);
        Assert.Equal(200, chosen.Status);
        Assert.Equal("elements", chosen.Body.GetProperty("detail").GetString());
        var fullCases = full.Body.GetProperty("cases").EnumerateArray().ToArray();
        var chosenCases = chosen.Body.GetProperty("cases").EnumerateArray().ToArray();
        Assert.Equal(fullCases.Length, chosenCases.Length);
        for (int i = 0; i < fullCases.Length; i++)
        {
            foreach (var (table, id) in new[] { ("pipes", "p4"), ("junctions", "school"), ("reservoirs", "orvex"), ("pumps", "zemmit-booster") })
            {
                var row = Assert.Single(chosenCases[i].GetProperty(table).EnumerateArray());
                var expected = fullCases[i].GetProperty(table).EnumerateArray().Single(x => x.GetProperty("id").GetString() == id);
                Assert.Equal(expected.GetRawText(), row.GetRawText());
            }
            // The summary covers every element, listed or not: the same in both answers, and the extremes of the full tables.
            Assert.Equal(fullCases[i].GetProperty("summary").GetRawText(), chosenCases[i].GetProperty("summary").GetRawText());
            var junctions = fullCases[i].GetProperty("junctions").EnumerateArray().ToArray();
            var lowest = junctions.MinBy(j => j.GetProperty("pressureHead").GetDouble());
            var s = fullCases[i].GetProperty("summary");
            Assert.Equal(lowest.GetProperty("id").GetString(), s.GetProperty("lowestPressureHead").GetProperty("element").GetString());
            Assert.Equal(lowest.GetProperty("pressureHead").GetDouble(), s.GetProperty("lowestPressureHead").GetProperty("value").GetDouble());
            double fastest = fullCases[i].GetProperty("pipes").EnumerateArray().Max(p => Math.Abs(p.GetProperty("velocity").GetDouble()));
            Assert.Equal(fastest, s.GetProperty("highestVelocity").GetProperty("value").GetDouble());
        }
        // The calculation sheet of a chosen-elements answer builds too (the schematic draws the unlisted pipes bare).
        var page = await SheetPage.Post(api, Route + "?format=html", body);
        Assert.Equal(200, page.Status);
        Assert.NotNull(page.Document.GetElementById("table-pipes-1"));
    }

    [Theory]
    [InlineData("""{"detail": "everything"}""", "output.detail")]
    [InlineData("""{"elements": ["no-such-pipe"]}""", "output.elements[0]")]
    [InlineData("""{"elements": ["p4", "p4"]}""", "output.elements[1]")]
    [InlineData("""{"elements": []}""", "output.elements")]
    [InlineData("""{"detail": "summary", "elements": ["p4"]}""", "output.elements")]
    public async Task Solve_BadOutput_Answers400NamingTheField(string output, string field)
    {
        var body = Sample();
        body["output"] = JsonNode.Parse(output);
        ProblemAssert.NamesField(await Post(body), 400, field);
    }

    [Fact]
    public async Task Solve_SummaryOfTheSample_BuildsItsSheetWithoutElementTables()
    {
        var body = Sample();
        body["output"] = new JsonObject { ["detail"] = "summary" };
        var page = await SheetPage.Post(api, Route + "?format=html", body);
        Assert.Equal(200, page.Status);
        Assert.Null(page.Document.GetElementById("table-pipes-1"));
        Assert.NotNull(page.Document.GetElementById("table-convergence-1"));
        Assert.Contains("lowest pressure head", page.Document.GetElementById("results")!.TextContent);
    }
}
