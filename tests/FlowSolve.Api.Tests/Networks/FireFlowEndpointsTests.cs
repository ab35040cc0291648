using System.Text.Json;
using System.Text.Json.Nodes;
using FlowSolve.Api.Tests.Sheets;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Api.Tests.Networks;

/// <summary>
/// POST /v1/networks/fire-flow through the service: the closed form of Colebrook and White (1939) for one reservoir,
/// one pipe and one junction (SI and units=us); on the Vandrel Vale sample, the stated property behind every answer
/// checked by separate solves of /v1/networks/solve with the fire flow added as a demand (the limiting junction at its
/// limit, every other limit met); a junction with no answer reported in its row; every 400 naming its field, the 413
/// of the new limit, format=text refused, and the sheet's table.
/// </summary>
public sealed class FireFlowEndpointsTests(ApiFixture api)
{
    private const string Route = "/v1/networks/fire-flow";
    private const double Water = 1.004e-6; // m2/s, water at 20 degrees C (from memory)

    private static JsonObject Sample() => JsonNode.Parse(File.ReadAllText(
        Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json")))!.AsObject();

    private async Task<(int Status, string? ContentType, JsonElement Body)> Post(JsonNode body, string route = Route) =>
        await api.PostRaw(route, body.ToJsonString(), "application/json");

    private static JsonObject OnePipe(double head, double z, double length, double diameter, double roughness, double demand, JsonObject? fire = null) =>
        new()
        {
            ["junctions"] = new JsonArray(new JsonObject { ["id"] = "j", ["elevation"] = z, ["demand"] = demand }),
            ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = "r", ["head"] = head }),
            ["pipes"] = new JsonArray(new JsonObject
            {
                ["id"] = "p", ["from"] = "r", ["to"] = "j", ["length"] = length, ["diameter"] = diameter, ["roughness"] = roughness,
            }),
            ["kinematicViscosity"] = Water,
            ["fireFlow"] = fire ?? new JsonObject { ["junctions"] = new JsonArray("j"), ["residualPressureHead"] = 14 },
        };

    [Fact]
    public async Task FireFlow_OneReservoirOnePipeOneJunction_MatchesTheClosedFormOfColebrookWhite()
    {
        // Colebrook and White (1939) solved exactly for the velocity at a known slope S = hf/L:
        // V = -2 sqrt(2 g D S) log10(e/(3.7 D) + 2.51 nu/(D sqrt(2 g D S))); hf = H - z - 14 at the fire flow.
        const double head = 60, z = 5, length = 1000, diameter = 0.2, roughness = 1e-4, demand = 0.01;
        double s = (head - z - 14) / length, root = Math.Sqrt(2 * 9.80665 * diameter * s);
        double v = -2 * root * Math.Log10(roughness / (3.7 * diameter) + 2.51 * Water / (diameter * root));
        double expected = Math.PI * diameter * diameter / 4 * v - demand;

        var r = await Post(OnePipe(head, z, length, diameter, roughness, demand));
        Assert.Equal(200, r.Status);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        var row = Assert.Single(r.Body.GetProperty("junctions").EnumerateArray().ToArray());
        Assert.Equal("j", row.GetProperty("id").GetString());
        Assert.Equal(expected, row.GetProperty("availableFlow").GetDouble(), 1e-7 * expected);
        Assert.Equal(14, row.GetProperty("pressureHead").GetDouble(), 1e-6);
        Assert.Equal("j", row.GetProperty("limitingJunction").GetString());
        Assert.True(row.GetProperty("converged").GetBoolean());
        Assert.Equal("solved", row.GetProperty("status").GetString());
        Assert.InRange(row.GetProperty("iterations").GetInt32(), 1, 8);
        Assert.Contains("safeguarded Newton", r.Body.GetProperty("method").GetString());

        // The same network in US units (ft, gpm): the same flow once converted (exact NIST SP 811 factors: 0.3048 m a
        // foot, 3.785411784e-3 m3 a US gallon).
        const double foot = 0.3048, gpm = 3.785411784e-3 / 60;
        var us = OnePipe(head / foot, z / foot, length / foot, diameter / foot, roughness / foot, demand / gpm,
            new JsonObject { ["junctions"] = new JsonArray("j"), ["residualPressureHead"] = 14 / foot });
        us["units"] = "us";
        us["flowUnit"] = "gpm";
        us["kinematicViscosity"] = Water / (foot * foot);
        var u = await Post(us);
        Assert.Equal(200, u.Status);
        Assert.Equal("gpm", u.Body.GetProperty("flowUnit").GetString());
        var urow = u.Body.GetProperty("junctions")[0];
        Assert.Equal(expected, urow.GetProperty("availableFlow").GetDouble() * gpm, 1e-7 * expected);
        Assert.Equal(14 / foot, urow.GetProperty("pressureHead").GetDouble(), 1e-5);
    }

    [Fact]
    public async Task FireFlow_VandrelSample_EachAnswerPutsItsLimitingJunctionAtItsLimit()
    {
        // The property that defines the answer, checked by solving the network again through /v1/networks/solve with the
        // fire flow added to the junction's demand (demand-driven, the draw-off is a demand like any other): the limiting
        // junction stands at its limit and no limited pressure head is below its limit.
        var body = Sample();
        body["demandMultipliers"] = new JsonArray(1.0);
        body["fireFlow"] = new JsonObject { ["junctions"] = new JsonArray("green", "school", "ombrix-row", "zemmit-rise"), ["residualPressureHead"] = 14, ["minimumPressureHead"] = 10 };
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        Assert.True(r.Body.GetProperty("converged").GetBoolean(), r.Body.ToString());
        Assert.Equal("m3/s", r.Body.GetProperty("flowUnit").GetString());
        foreach (var row in r.Body.GetProperty("junctions").EnumerateArray())
        {
            string id = row.GetProperty("id").GetString()!, limiting = row.GetProperty("limitingJunction").GetString()!;
            double q = row.GetProperty("availableFlow").GetDouble();
            Assert.True(q > 0, id);
            var check = Sample();
            check["demandMultipliers"] = new JsonArray(1.0);
            foreach (var j in check["junctions"]!.AsArray())
                if (j!["id"]!.GetValue<string>() == id) j["demand"] = (j["demand"]?.GetValue<double>() ?? 0) + q;
            var solved = await Post(check, "/v1/networks/solve");
            Assert.Equal(200, solved.Status);
            var pressures = solved.Body.GetProperty("cases")[0].GetProperty("junctions").EnumerateArray()
                .ToDictionary(j => j.GetProperty("id").GetString()!, j => j.GetProperty("pressureHead").GetDouble());
            Assert.Equal(pressures[id], row.GetProperty("pressureHead").GetDouble(), 1e-6);
            Assert.Equal(limiting == id ? 14 : 10, pressures[limiting], 2e-6);
            Assert.True(pressures[id] >= 14 - 2e-6, $"{id} at {pressures[id]}");
            foreach (var (other, p) in pressures)
                if (other != id) Assert.True(p >= 10 - 2e-6, $"fire at {id}: {other} at {p}");
        }
    }

    [Fact]
    public async Task FireFlow_JunctionBelowTheResidualWithNoDrawOff_IsReportedInItsRowWithAWarning()
    {
        // zemmit-top stands at 110 m and green at 69 m, fed from 118.5 m: with 60 m asked neither can have it even with
        // no draw-off. Each row says so, with a warning naming it; the answer is a 200, not an error.
        var body = Sample();
        body["fireFlow"] = new JsonObject { ["junctions"] = new JsonArray("zemmit-top", "green"), ["residualPressureHead"] = 60 };
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        Assert.False(r.Body.GetProperty("converged").GetBoolean());
        var warnings = r.Body.GetProperty("warnings").EnumerateArray()
            .Where(w => w.GetProperty("code").GetString() == "residual-not-met-at-zero-draw-off").ToArray();
        foreach (var row in r.Body.GetProperty("junctions").EnumerateArray())
        {
            string id = row.GetProperty("id").GetString()!;
            Assert.False(row.GetProperty("converged").GetBoolean());
            Assert.Equal("residual-not-met-at-zero-draw-off", row.GetProperty("status").GetString());
            Assert.Equal(0, row.GetProperty("availableFlow").GetDouble());
            Assert.True(row.GetProperty("pressureHead").GetDouble() < 60);
            Assert.Single(warnings, w => w.GetProperty("message").GetString()!.Contains($"'{id}'"));
        }
    }

    [Fact]
    public async Task FireFlow_Defaults_EveryJunctionWithADemandAt14Metres_EchoedAsAssumptions()
    {
        var body = Sample();
        body.Remove("fireFlow");
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        var expected = body["junctions"]!.AsArray().Where(j => (j!["demand"]?.GetValue<double>() ?? 0) > 0).Select(j => j!["id"]!.GetValue<string>());
        Assert.Equal(expected, r.Body.GetProperty("junctions").EnumerateArray().Select(j => j.GetProperty("id").GetString()));
        Assert.Equal(14, r.Body.GetProperty("residualPressureHead").GetDouble());
        Assert.False(r.Body.TryGetProperty("minimumPressureHead", out _));
        var fields = r.Body.GetProperty("assumptions").EnumerateArray().Select(a => a.GetProperty("field").GetString()).ToArray();
        Assert.Contains("fireFlow.residualPressureHead", fields);
        Assert.Contains("fireFlow.junctions", fields);
    }

    public static TheoryData<string, string> BadFireFlow => new()
    {
        { """{"junctions": ["green", "nowhere"]}""", "fireFlow.junctions[1]" },
        { """{"junctions": ["green", "green"]}""", "fireFlow.junctions[1]" },
        { """{"junctions": ["orvex"]}""", "fireFlow.junctions[0]" },
        { """{"junctions": []}""", "fireFlow.junctions" },
        { """{"junctions": [""]}""", "fireFlow.junctions[0]" },
        { """{"residualPressureHead": -1}""", "fireFlow.residualPressureHead" },
        { """{"residualPressureHead": 1e308}""", "fireFlow.residualPressureHead" },
        { """{"minimumPressureHead": 20000}""", "fireFlow.minimumPressureHead" },
        { """{"minimumPressureHead": -5}""", "fireFlow.minimumPressureHead" },
    };

    [Theory]
    [MemberData(nameof(BadFireFlow))]
    public async Task FireFlow_BadQuestion_400NamesTheField(string fire, string field)
    {
        var body = Sample();
        body["fireFlow"] = JsonNode.Parse(fire);
        ProblemAssert.NamesField(await Post(body), 400, field);
    }

    [Fact]
    public async Task FireFlow_BadNetwork_400NamesTheDocumentPath()
    {
        var body = Sample();
        body["pipes"]![2]!["length"] = -4;
        body["fireFlow"] = new JsonObject { ["residualPressureHead"] = -1 };
        var r = await Post(body);
        ProblemAssert.NamesField(r, 400, "pipes[2].length");
        ProblemAssert.NamesField(r, 400, "fireFlow.residualPressureHead");
    }

    [Fact]
    public async Task FireFlow_MoreJunctionsThanTheConfiguredLimit_413NamesTheLimit()
    {
        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b => b.UseSetting("FlowSolve:Limits:NetworkMaxFireFlowJunctions", "2"));
        using var client = factory.CreateClient();
        var body = Sample();
        body["fireFlow"] = new JsonObject { ["junctions"] = new JsonArray("green", "school", "ombrix-row") };
        using var response = await client.PostAsync(Route, new StringContent(body.ToJsonString(), System.Text.Encoding.UTF8, "application/json"),
            TestContext.Current.CancellationToken);
        Assert.Equal(413, (int)response.StatusCode);
        using var json = JsonDocument.Parse(await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
        Assert.Equal("networkMaxFireFlowJunctions", json.RootElement.GetProperty("limit").GetString());
        Assert.Equal(2, json.RootElement.GetProperty("maximum").GetInt32());
        Assert.Equal(3, json.RootElement.GetProperty("given").GetInt32());
        Assert.Equal("fireFlow.junctions", json.RootElement.GetProperty("field").GetString());

        // The default (every junction with a demand: 7 in the sample) counts too.
        body.Remove("fireFlow");
        using var all = await client.PostAsync(Route, new StringContent(body.ToJsonString(), System.Text.Encoding.UTF8, "application/json"),
            TestContext.Current.CancellationToken);
        Assert.Equal(413, (int)all.StatusCode);
    }

    [Fact]
    public async Task FireFlow_FormatText_400NamesFormat()
    {
        var r = await api.PostRaw(Route + "?format=text", Sample().ToJsonString(), "application/json");
        ProblemAssert.NamesField(r, 400, "format");
    }

    [Fact]
    public async Task Sheet_ShowsTheFireFlowTableAndTheCautions()
    {
        var body = Sample();
        body["fireFlow"] = new JsonObject { ["junctions"] = new JsonArray("green", "school"), ["minimumPressureHead"] = 10 };
        var page = await SheetPage.Post(api, Route + "?format=html", body);
        var json = await Post(body);
        Assert.Equal(200, page.Status);
        Assert.Equal(200, json.Status);
        var table = page.Document.GetElementById("table-fire-flow");
        Assert.NotNull(table);
        var rows = table!.QuerySelectorAll("tbody tr").ToArray();
        Assert.Equal(2, rows.Length);
        for (int i = 0; i < rows.Length; i++)
        {
            var cells = rows[i].QuerySelectorAll("td").Select(c => c.TextContent.Trim()).ToArray();
            var answer = json.Body.GetProperty("junctions")[i];
            Assert.Equal(answer.GetProperty("id").GetString(), cells[0]);
            Assert.Equal(answer.GetProperty("availableFlow").GetDouble(), double.Parse(cells[1], System.Globalization.CultureInfo.InvariantCulture), 1e-5 * answer.GetProperty("availableFlow").GetDouble());
            Assert.Equal(answer.GetProperty("limitingJunction").GetString(), cells[3]);
        }
        Assert.Contains("hydrant flow test", page.Html);
        Assert.Contains("qualified engineer", page.Html);
    }
}
