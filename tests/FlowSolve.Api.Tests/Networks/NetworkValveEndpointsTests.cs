using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using CsCheck;
using FlowSolve.Api.Tests.Reliability;
using FlowSolve.Api.Tests.Sheets;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Api.Tests.Networks;

internal static class JsonNumber
{
    /// <summary>A JSON number node as a double, whether it was written as an integer or not.</summary>
    public static double Num(this JsonNode node) => double.Parse(node.ToJsonString(), System.Globalization.CultureInfo.InvariantCulture);
}

/// <summary>
/// POST /v1/networks/solve with control valves: every type in every state through the service, the held pressure head
/// and flow checked by hand, the flow past an active pressure-reducing valve against MathNet's Brent on the two pipes
/// beyond it (Darcy-Weisbach with Colebrook-White solved by Brent, written out here), continuity recomputed from the
/// reported flows, units=us against SI, summary and chosen output, a cycling search reported not converged, every bad
/// valve field a 400 naming its path, hostile valve values never a 5xx, and the sheet's valve table.
/// </summary>
public sealed class NetworkValveEndpointsTests(ApiFixture api)
{
    private const string Route = "/v1/networks/solve";
    private const double Water = 1.004e-6; // m2/s, water at 20 degrees C (from memory)
    private const double G = 9.80665;

    private async Task<(int Status, string? ContentType, JsonElement Body)> Post(JsonNode body) =>
        await api.PostRaw(Route, body.ToJsonString(), "application/json");

    /// <summary>source - main - up - valve - down - service - town (demand) - outlet - tank, in SI, water by viscosity.</summary>
    private static JsonObject Chain(string type, double setting, double tankHead, double? k = 5)
    {
        var valve = new JsonObject { ["id"] = "v", ["from"] = "up", ["to"] = "down", ["diameter"] = 0.2, ["type"] = type, ["setting"] = setting };
        if (k is double kk) valve["minorLossCoefficient"] = kk;
        return new JsonObject
        {
            ["junctions"] = new JsonArray(
                new JsonObject { ["id"] = "up", ["elevation"] = 5, ["demand"] = 0 },
                new JsonObject { ["id"] = "down", ["elevation"] = 2, ["demand"] = 0 },
                new JsonObject { ["id"] = "town", ["elevation"] = 0, ["demand"] = 0.01 }),
            ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = "source", ["head"] = 100 }, new JsonObject { ["id"] = "tank", ["head"] = tankHead }),
            ["pipes"] = new JsonArray(
                Pipe("main", "source", "up", 500, 0.3), Pipe("service", "down", "town", 300, 0.2), Pipe("outlet", "town", "tank", 200, 0.2)),
            ["valves"] = new JsonArray(valve),
            ["kinematicViscosity"] = Water,
        };
    }

    private static JsonObject Pipe(string id, string from, string to, double length, double diameter) =>
        new() { ["id"] = id, ["from"] = from, ["to"] = to, ["length"] = length, ["diameter"] = diameter, ["roughness"] = 0.05e-3 };

    /// <summary>Darcy-Weisbach with Colebrook-White (1939) by Brent in x = 1/sqrt(f) (turbulent flows only here).</summary>
    private static double Loss(double length, double diameter, double q)
    {
        double a = Math.PI * diameter * diameter / 4, v = Math.Abs(q) / a, re = v * diameter / Water;
        double x = Brent.FindRoot(x => x + 2 * Math.Log10(0.05e-3 / diameter / 3.7 + 2.51 * x / re), 1, 100, 1e-14, 200);
        return Math.CopySign(length / diameter * v * v / (2 * G) / (x * x), q);
    }

    [Theory]
    [InlineData("pressure-reducing", 40, 20, "active")]
    [InlineData("pressure-reducing", 95, 20, "open")]
    [InlineData("pressure-reducing", 40, 60, "closed")]
    [InlineData("pressure-sustaining", 90, 20, "active")]
    [InlineData("pressure-sustaining", 30, 20, "open")]
    [InlineData("pressure-sustaining", 30, 120, "closed")]
    [InlineData("flow-control", 0.02, 20, "active")]
    [InlineData("flow-control", 5, 20, "open")]
    [InlineData("flow-control", 0.02, 120, "closed")]
    [InlineData("throttle", 50, 20, "active")]
    public async Task Solve_EveryTypeInEveryState_StatusAndHandChecks(string type, double setting, double tank, string expected)
    {
        var body = Chain(type, setting, tank, type == "throttle" ? null : 5);
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        var c = r.Body.GetProperty("cases")[0];
        Assert.True(c.GetProperty("converged").GetBoolean(), c.GetProperty("reason").GetString());
        var v = c.GetProperty("valves")[0];
        Assert.Equal("v", v.GetProperty("id").GetString());
        Assert.Equal(expected, v.GetProperty("status").GetString());
        Assert.Contains("control valves", r.Body.GetProperty("method").GetString());
        var states = c.GetProperty("summary").GetProperty("valveStates");
        Assert.Equal(1, states.GetProperty(expected == "active" ? "active" : expected == "open" ? "open" : "closed").GetInt32());

        var heads = c.GetProperty("junctions").EnumerateArray().ToDictionary(j => j.GetProperty("id").GetString()!, j => j.GetProperty("head").GetDouble());
        heads["source"] = 100;
        heads["tank"] = tank;
        var pipes = c.GetProperty("pipes").EnumerateArray().ToDictionary(p => p.GetProperty("id").GetString()!, p => p.GetProperty("flow").GetDouble());
        double q = v.GetProperty("flow").GetDouble();
        // Continuity at the three junctions, from the reported flows.
        Assert.Equal(0, pipes["main"] - q, 9);
        Assert.Equal(0, q - pipes["service"], 9);
        Assert.Equal(0, pipes["service"] - pipes["outlet"] - 0.01, 9);
        Assert.Equal(heads["up"] - heads["down"], v.GetProperty("headLoss").GetDouble(), 9);
        double area = Math.PI * 0.2 * 0.2 / 4, k = type == "throttle" ? setting : 5, open = k * q * Math.Abs(q) / (2 * G * area * area);
        switch (expected)
        {
            case "closed":
                Assert.Equal(0.0, q);
                break;
            case "open":
                Assert.Equal(open, heads["up"] - heads["down"], 7);
                break;
            default:
                Assert.True(heads["up"] - heads["down"] >= open - 1e-7);
                if (type == "pressure-reducing") Assert.Equal(2 + setting, heads["down"], 9);
                if (type == "pressure-sustaining") Assert.Equal(5 + setting, heads["up"], 9);
                if (type == "flow-control") Assert.Equal(setting, q, 12);
                if (type == "throttle") Assert.Equal(open, heads["up"] - heads["down"], 7);
                break;
        }
    }

    [Fact]
    public async Task Solve_ActivePressureReducingValve_FlowMatchesBrentOnThePipesBeyondIt()
    {
        // Held at 2 + 40 = 42 m, the valve passes the flow Q that loses 42 - 20 m in service (Q) and outlet (Q - 0.01).
        var r = await Post(Chain("pressure-reducing", 40, 20));
        double q = r.Body.GetProperty("cases")[0].GetProperty("valves")[0].GetProperty("flow").GetDouble();
        double reference = Brent.FindRoot(x => Loss(300, 0.2, x) + Loss(200, 0.2, x - 0.01) - 22, 0.02, 1, 1e-15, 200);
        Assert.Equal(reference, q, 9);
    }

    [Fact]
    public async Task Solve_UsUnits_SameAnswerConverted()
    {
        const double ft = 0.3048, ft3 = ft * ft * ft;
        var si = await Post(Chain("pressure-reducing", 40, 20));
        var body = Chain("pressure-reducing", 40 / ft, 20); // heads converted below
        body["units"] = "us";
        body["kinematicViscosity"] = Water / (ft * ft);
        foreach (var j in body["junctions"]!.AsArray()) { j!["elevation"] = j["elevation"]!.Num() / ft; j["demand"] = j["demand"]!.Num() / ft3; }
        foreach (var x in body["reservoirs"]!.AsArray()) x!["head"] = x["head"]!.Num() / ft;
        foreach (var p in body["pipes"]!.AsArray()) foreach (var f in new[] { "length", "diameter", "roughness" }) p![f] = p[f]!.Num() / ft;
        body["valves"]![0]!["diameter"] = 0.2 / ft;
        var us = await Post(body);
        Assert.Equal(200, us.Status);
        var a = si.Body.GetProperty("cases")[0].GetProperty("valves")[0];
        var b = us.Body.GetProperty("cases")[0].GetProperty("valves")[0];
        Assert.Equal("active", b.GetProperty("status").GetString());
        Assert.Equal(a.GetProperty("flow").GetDouble(), b.GetProperty("flow").GetDouble() * ft3, 9);
        Assert.Equal(a.GetProperty("headLoss").GetDouble(), b.GetProperty("headLoss").GetDouble() * ft, 7);
    }

    [Fact]
    public async Task Solve_SummaryAndChosenOutput_ValveStatesStillReported()
    {
        var body = Chain("pressure-reducing", 40, 20);
        body["output"] = new JsonObject { ["detail"] = "summary" };
        var summary = await Post(body);
        Assert.Equal(200, summary.Status);
        var c = summary.Body.GetProperty("cases")[0];
        Assert.Equal(0, c.GetProperty("valves").GetArrayLength());
        Assert.Equal(1, c.GetProperty("summary").GetProperty("valveStates").GetProperty("active").GetInt32());

        body["output"] = new JsonObject { ["elements"] = new JsonArray("v", "town") };
        var chosen = await Post(body);
        Assert.Equal(200, chosen.Status);
        var k = chosen.Body.GetProperty("cases")[0];
        Assert.Equal("v", k.GetProperty("valves")[0].GetProperty("id").GetString());
        Assert.Equal(0, k.GetProperty("pipes").GetArrayLength());
    }

    [Fact]
    public async Task Solve_ValvesWithLoadCasesAndPressureDrivenDemand_EveryCaseBalanced()
    {
        var body = Chain("flow-control", 0.05, 20);
        body["demandMultipliers"] = new JsonArray(0.5, 1.0, 8.0);
        body["demandModel"] = new JsonObject { ["type"] = "pressure-driven", ["requiredPressureHead"] = 20 };
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        foreach (var c in r.Body.GetProperty("cases").EnumerateArray())
        {
            Assert.True(c.GetProperty("converged").GetBoolean());
            double q = c.GetProperty("valves")[0].GetProperty("flow").GetDouble();
            var pipes = c.GetProperty("pipes").EnumerateArray().ToDictionary(p => p.GetProperty("id").GetString()!, p => p.GetProperty("flow").GetDouble());
            double delivered = c.GetProperty("junctions")[2].GetProperty("deliveredDemand").GetDouble();
            Assert.Equal(0, q - pipes["service"], 9);
            Assert.Equal(0, pipes["service"] - pipes["outlet"] - delivered, 9);
            Assert.True(q <= 0.05 + 1e-9);
        }
    }

    [Fact]
    public async Task Solve_ValveStatesThatCycle_NotConvergedWithAWarningNamingTheValves()
    {
        // The 3 x 3 grid of the Core's cycle test (NetworkSolverTests.Solve_ValveStatesThatCycle_...), through the service.
        var junctions = new JsonArray();
        var pipes = new JsonArray();
        (string, string)[] valveEdges = [("n11", "n12"), ("n21", "n22"), ("n00", "n01"), ("n10", "n20")];
        for (int row = 0; row < 3; row++)
            for (int col = 0; col < 3; col++)
                junctions.Add(new JsonObject { ["id"] = $"n{row}{col}", ["elevation"] = 2 * row + 2 * col, ["demand"] = 0.005 + 0.001 * (row * 3 + col) });
        void Edge(string a, string b) { if (!valveEdges.Any(e => (e.Item1 == a && e.Item2 == b) || (e.Item1 == b && e.Item2 == a))) pipes.Add(Grid(a, b)); }
        static JsonObject Grid(string a, string b) => new() { ["id"] = $"{a}-{b}", ["from"] = a, ["to"] = b, ["length"] = 400, ["diameter"] = 0.2, ["roughness"] = 0.1e-3 };
        for (int row = 0; row < 3; row++)
            for (int col = 0; col < 3; col++)
            {
                if (col < 2) Edge($"n{row}{col}", $"n{row}{col + 1}");
                if (row < 2) Edge($"n{row}{col}", $"n{row + 1}{col}");
            }
        pipes.Add(new JsonObject { ["id"] = "feed-a", ["from"] = "a", ["to"] = "n00", ["length"] = 100, ["diameter"] = 0.3, ["roughness"] = 0.1e-3 });
        pipes.Add(new JsonObject { ["id"] = "feed-b", ["from"] = "b", ["to"] = "n22", ["length"] = 100, ["diameter"] = 0.3, ["roughness"] = 0.1e-3 });
        JsonObject Valve(string id, string from, string to, string type, double setting) =>
            new() { ["id"] = id, ["from"] = from, ["to"] = to, ["diameter"] = 0.15, ["type"] = type, ["setting"] = setting, ["minorLossCoefficient"] = 3 };
        var body = new JsonObject
        {
            ["junctions"] = junctions,
            ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = "a", ["head"] = 70 }, new JsonObject { ["id"] = "b", ["head"] = 55 }),
            ["pipes"] = pipes,
            ["valves"] = new JsonArray(
                Valve("v0", "n11", "n12", "pressure-sustaining", 69.76893275034098), Valve("v1", "n21", "n22", "pressure-reducing", 57.50235865241958),
                Valve("v2", "n00", "n01", "pressure-sustaining", 32.91512413086143), Valve("v3", "n10", "n20", "pressure-reducing", 33.16194667628126)),
            ["kinematicViscosity"] = Water,
        };
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        Assert.False(r.Body.GetProperty("converged").GetBoolean());
        var c = r.Body.GetProperty("cases")[0];
        Assert.Equal("status-cycle", c.GetProperty("status").GetString());
        Assert.False(c.GetProperty("converged").GetBoolean());
        var warnings = c.GetProperty("warnings").EnumerateArray().ToArray();
        Assert.Contains(warnings, w => w.GetProperty("code").GetString() == "not-converged");
        var named = warnings.Where(w => w.GetProperty("code").GetString() == "valve-state-cycle").Select(w => w.GetProperty("element").GetString()).ToArray();
        Assert.NotEmpty(named);
        Assert.All(named, id => Assert.Contains(id, new[] { "v0", "v1", "v2", "v3" }));
    }

    public static TheoryData<string, string> BadValves => new()
    {
        { """{"id": "v", "from": "up", "to": "up", "diameter": 0.2, "type": "throttle", "setting": 5}""", "valves[0].to" },
        { """{"id": "v", "from": "nowhere", "to": "down", "diameter": 0.2, "type": "throttle", "setting": 5}""", "valves[0].from" },
        { """{"id": "main", "from": "up", "to": "down", "diameter": 0.2, "type": "throttle", "setting": 5}""", "valves[0].id" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "pressure-reducing", "setting": -1, "minorLossCoefficient": 5}""", "valves[0].setting" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "pressure-sustaining", "setting": 1e6, "minorLossCoefficient": 5}""", "valves[0].setting" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "flow-control", "setting": 0, "minorLossCoefficient": 5}""", "valves[0].setting" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "throttle", "setting": 0.001}""", "valves[0].setting" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "throttle"}""", "valves[0].setting" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "throttle", "setting": 5, "minorLossCoefficient": 5}""", "valves[0].minorLossCoefficient" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "flow-control", "setting": 0.01}""", "valves[0].minorLossCoefficient" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0, "type": "throttle", "setting": 5}""", "valves[0].diameter" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "type": "gate", "setting": 5}""", "valves[0].type" },
        { """{"id": "v", "from": "up", "to": "down", "diameter": 0.2, "setting": 5}""", "valves[0].type" },
        { """{"id": "v", "from": "up", "to": "tank", "diameter": 0.2, "type": "pressure-reducing", "setting": 30, "minorLossCoefficient": 5}""", "valves[0].to" },
        { """{"id": "v", "from": "source", "to": "down", "diameter": 0.2, "type": "pressure-sustaining", "setting": 30, "minorLossCoefficient": 5}""", "valves[0].from" },
    };

    [Theory]
    [MemberData(nameof(BadValves))]
    public async Task Solve_BadValve_400NamingTheField(string valve, string field)
    {
        var body = Chain("throttle", 5, 20, null);
        body["valves"] = new JsonArray(JsonNode.Parse(valve));
        var r = await Post(body);
        ProblemAssert.NamesField(r, 400, field);
    }

    [Fact]
    public async Task Solve_TwoValvesOnOneNodeOrTooMany_400NamingTheField()
    {
        var body = Chain("throttle", 5, 20, null);
        body["valves"]!.AsArray().Add(new JsonObject { ["id"] = "w", ["from"] = "down", ["to"] = "town", ["diameter"] = 0.2, ["type"] = "throttle", ["setting"] = 5 });
        ProblemAssert.NamesField(await Post(body), 400, "valves[1].from");

        var many = Chain("throttle", 5, 20, null);
        var list = new JsonArray();
        for (int i = 0; i < 65; i++) list.Add(new JsonObject { ["id"] = $"v{i}", ["from"] = "up", ["to"] = "down", ["diameter"] = 0.2, ["type"] = "throttle", ["setting"] = 5 });
        many["valves"] = list;
        ProblemAssert.NamesField(await Post(many), 400, "valves");
    }

    [Fact]
    public async Task Solve_HostileValveValues_NeverBreakTheService()
    {
        double[] hostile = [0, -0.0, -1, 1e-300, 4.9e-324, 1e-12, 1e15, 1e300, double.MaxValue, -1e300, 1e6, 1e-6, 0.5, 2, 100, 101];
        string[] types = ["pressure-reducing", "pressure-sustaining", "flow-control", "throttle"];
        string[] fields = ["setting", "diameter", "minorLossCoefficient"];
        var gen = Gen.Select(Gen.Int[0, 3], Gen.Int[0, 2], Gen.OneOf(Gen.OneOf(hostile), Gen.Double), Gen.Double[0, 150])
            .Select((type, field, value, tank) =>
            {
                var body = Chain(types[type], type == 2 ? 0.02 : 40, tank, type == 3 ? null : 5);
                body["valves"]![0]![fields[field]] = double.IsFinite(value) ? value : 1e308;
                return body.ToJsonString();
            });
        await gen.SampleAsync(async body =>
        {
            using var content = new StringContent(body, Encoding.UTF8, "application/json");
            using var response = await api.Client.PostAsync(Route, content, TestContext.Current.CancellationToken);
            await FuzzTests.CheckAnswer(response, "POST /v1/networks/solve " + body[..Math.Min(300, body.Length)]);
        }, iter: 200, threads: 1);
    }

    [Fact]
    public async Task Sheet_ShowsEachValveWithItsState()
    {
        var body = Chain("pressure-reducing", 40, 20);
        var page = await SheetPage.Post(api, Route + "?format=html", body);
        Assert.Equal(200, page.Status);
        var table = page.Document.GetElementById("table-valves-1");
        Assert.NotNull(table);
        Assert.Contains("active", table!.TextContent);
        Assert.Contains("pressure-reducing", table.TextContent);
        Assert.Contains("Control valves", page.Document.GetElementById("method")!.TextContent);
        Assert.Contains("1 active, 0 open, 0 closed", page.Html);
    }
}
