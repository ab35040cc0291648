using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text;
using CsCheck;
using FlowSolve.Api.Tests.Reliability;
using FlowSolve.Api.Tests.Sheets;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Api.Tests.Networks;

/// <summary>
/// POST /v1/networks/solve with demandModel: the law of Wagner, Shamir and Marks (1988, from memory) written out here
/// and checked at every junction of every case, continuity recomputed from the reported flows and deliveries, MathNet's
/// Brent on the one-pipe equation (Darcy-Weisbach with Brent's Colebrook-White), units=us against SI, the demand-driven
/// answer unchanged, every bad field of demandModel a 400 naming it, and the sheet's delivered-against-requested table.
/// </summary>
public sealed class NetworkPressureDrivenEndpointsTests(ApiFixture api)
{
    private const string Route = "/v1/networks/solve";
    private const double Water = 1.004e-6; // m2/s, water at 20 degrees C (from memory)

    private static JsonObject Sample() => JsonNode.Parse(File.ReadAllText(
        Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json")))!.AsObject();

    private async Task<(int Status, string? ContentType, JsonElement Body)> Post(JsonNode body) =>
        await api.PostRaw(Route, body.ToJsonString(), "application/json");

    private static JsonObject Law(double? min, double? req, double? e, string type = "pressure-driven")
    {
        var o = new JsonObject { ["type"] = type };
        if (min is double a) o["minimumPressureHead"] = a;
        if (req is double b) o["requiredPressureHead"] = b;
        if (e is double c) o["exponent"] = c;
        return o;
    }

    /// <summary>The law, written out (the test's own).</summary>
    private static double Delivered(double demand, double p, double min, double req, double e) =>
        !(demand > 0) ? demand : p <= min ? 0 : p >= req ? demand : demand * Math.Pow((p - min) / (req - min), e);

    [Fact]
    public async Task Solve_VandrelSampleUnderPressureDrivenDemand_LawContinuityAndTotalsHoldInEveryCase()
    {
        // The Vandrel Vale sample with a 20 m required pressure head and heavier loads: the Zemmit Rise zone above the
        // booster falls short first.
        var body = Sample();
        body["demandModel"] = Law(0, 20, 0.5);
        body["demandMultipliers"] = new JsonArray(1.0, 1.8, 2.5);
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.Equal("pressure-driven", r.Body.GetProperty("demandModel").GetString());
        Assert.Contains("Wagner, Shamir and Marks 1988", r.Body.GetProperty("method").GetString());
        var pipesIn = body["pipes"]!.AsArray().Select(p => p!.AsObject()).ToArray();
        var pumpsIn = body["pumps"]!.AsArray().Select(p => p!.AsObject()).ToArray();
        int shortCases = 0;
        foreach (var c in r.Body.GetProperty("cases").EnumerateArray())
        {
            Assert.True(c.GetProperty("converged").GetBoolean());
            var net = new Dictionary<string, double>();
            double delivered = 0, shortfall = 0;
            int shortJunctions = 0;
            foreach (var j in c.GetProperty("junctions").EnumerateArray())
            {
                double d = j.GetProperty("demand").GetDouble(), q = j.GetProperty("deliveredDemand").GetDouble();
                double expected = Delivered(d, j.GetProperty("pressureHead").GetDouble(), 0, 20, 0.5);
                Assert.True(Math.Abs(q - expected) <= 1e-9 * Math.Abs(d), $"law at {j.GetProperty("id")}: {q} vs {expected}");
                net[j.GetProperty("id").GetString()!] = -q;
                delivered += q;
                shortfall += d - q;
                if (q < d) shortJunctions++;
            }
            void Flow(JsonObject link, double q)
            {
                string from = link["from"]!.GetValue<string>(), to = link["to"]!.GetValue<string>();
                if (net.ContainsKey(from)) net[from] -= q;
                if (net.ContainsKey(to)) net[to] += q;
            }
            var pipes = c.GetProperty("pipes").EnumerateArray().ToArray();
            var pumps = c.GetProperty("pumps").EnumerateArray().ToArray();
            for (int i = 0; i < pipes.Length; i++) Flow(pipesIn[i], pipes[i].GetProperty("flow").GetDouble());
            for (int i = 0; i < pumps.Length; i++) Flow(pumpsIn[i], pumps[i].GetProperty("flow").GetDouble());
            foreach (var (id, error) in net) Assert.True(Math.Abs(error) <= 1e-9, $"continuity at {id}: {error}");
            Assert.Equal(delivered, c.GetProperty("totalDeliveredDemand").GetDouble(), 1e-12);
            Assert.Equal(shortfall, c.GetProperty("demandShortfall").GetDouble(), 1e-12);
            Assert.Equal(delivered, c.GetProperty("totalSupply").GetDouble(), 1e-9);
            var warnings = c.GetProperty("warnings").EnumerateArray().Where(w => w.GetProperty("code").GetString() == "demand-shortfall").ToArray();
            if (shortJunctions == 0) Assert.Empty(warnings);
            else
            {
                shortCases++;
                var w = Assert.Single(warnings);
                Assert.False(w.TryGetProperty("element", out var element) && element.ValueKind != JsonValueKind.Null);
                string message = w.GetProperty("message").GetString()!;
                Assert.Contains(shortJunctions.ToString(CultureInfo.InvariantCulture) + " junction", message);
                Assert.Contains(shortfall.ToString("G4", CultureInfo.InvariantCulture), message);
            }
        }
        Assert.Equal(2, shortCases);
        // In the heaviest case the two junctions of the high zone are short and the village below is not.
        var heavy = r.Body.GetProperty("cases")[2].GetProperty("junctions").EnumerateArray().ToDictionary(j => j.GetProperty("id").GetString()!);
        Assert.True(heavy["zemmit-top"].GetProperty("deliveredDemand").GetDouble() < heavy["zemmit-top"].GetProperty("demand").GetDouble());
        Assert.Equal(heavy["green"].GetProperty("demand").GetDouble(), heavy["green"].GetProperty("deliveredDemand").GetDouble());
    }

    [Theory]
    [InlineData(20.0, 0.03, 0.5)]   // partial delivery
    [InlineData(20.0, 0.03, 2.0)]
    [InlineData(10.0, 0.005, 0.5)]  // full delivery
    [InlineData(55.0, 0.01, 0.5)]   // nothing: the reservoir stands below the junction
    public async Task Solve_OneReservoirOnePipeOneJunction_MatchesBrentOnTheScalarEquation(double z, double demand, double e)
    {
        // Reference: Brent on g(p) = 50 - z - hf(d r(p)) - p = 0, hf by Darcy-Weisbach with Brent's Colebrook-White.
        var body = JsonNode.Parse("""
            {"junctions": [{"id": "j", "elevation": 0, "demand": 0}],
             "reservoirs": [{"id": "r", "head": 50}],
             "pipes": [{"id": "p", "from": "r", "to": "j", "length": 1000, "diameter": 0.1, "roughness": 0.0001}],
             "kinematicViscosity": 1.004e-6,
             "demandModel": {"type": "pressure-driven", "minimumPressureHead": 0, "requiredPressureHead": 20}}
            """)!;
        body["junctions"]![0]!["elevation"] = z;
        body["junctions"]![0]!["demand"] = demand;
        body["demandModel"]!["exponent"] = e;
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        double Hf(double q) => q == 0 ? 0 : NetworkEndpointsTests.DarcyHeadLoss(q, 1000, 0.1, 0.0001, 0, Water);
        double pressure = Brent.FindRoot(p => 50 - z - Hf(Delivered(demand, p, 0, 20, e)) - p, -10, 50 - z + 1, 1e-14, 500);
        var c = r.Body.GetProperty("cases")[0];
        var j = c.GetProperty("junctions")[0];
        Assert.Equal(pressure, j.GetProperty("pressureHead").GetDouble(), 1e-9);
        Assert.Equal(Delivered(demand, pressure, 0, 20, e), j.GetProperty("deliveredDemand").GetDouble(), 1e-9 * demand);
        Assert.Equal(demand, j.GetProperty("demand").GetDouble());
        Assert.Equal(demand - Delivered(demand, pressure, 0, 20, e), c.GetProperty("demandShortfall").GetDouble(), 1e-9 * demand);
        Assert.True(c.GetProperty("converged").GetBoolean());
        Assert.InRange(c.GetProperty("iterations").GetInt32(), 1, 40);
    }

    [Fact]
    public async Task Solve_WithoutDemandModel_TheDemandDrivenAnswerIsUnchangedAndSaysSo()
    {
        // demandModel absent and demandModel demand-driven give the same answer; every junction is delivered its demand;
        // the default is echoed in the assumptions.
        var plain = await Post(Sample());
        var explicitly = Sample();
        explicitly["demandModel"] = new JsonObject { ["type"] = "demand-driven" };
        var dd = await Post(explicitly);
        Assert.Equal(200, plain.Status);
        Assert.Equal(200, dd.Status);
        Assert.Equal("demand-driven", plain.Body.GetProperty("demandModel").GetString());
        var assumption = Assert.Single(plain.Body.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("field").GetString() == "demandModel");
        Assert.Equal("demand-driven", assumption.GetProperty("value").GetString());
        Assert.DoesNotContain(dd.Body.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("field").GetString() == "demandModel");
        Assert.Equal(plain.Body.GetProperty("cases").GetRawText(), dd.Body.GetProperty("cases").GetRawText());
        foreach (var c in plain.Body.GetProperty("cases").EnumerateArray())
        {
            foreach (var j in c.GetProperty("junctions").EnumerateArray())
                Assert.Equal(j.GetProperty("demand").GetDouble(), j.GetProperty("deliveredDemand").GetDouble());
            Assert.Equal(c.GetProperty("totalDemand").GetDouble(), c.GetProperty("totalDeliveredDemand").GetDouble());
            Assert.Equal(0.0, c.GetProperty("demandShortfall").GetDouble());
            Assert.DoesNotContain(c.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "demand-shortfall");
        }
    }

    [Fact]
    public async Task Solve_DemandDrivenNegativePressure_WarningPointsToThePressureDrivenModel()
    {
        // A junction on a hill above its reservoir: demand-driven, it is still delivered its demand and warned about
        // with a pointer to demandModel; pressure-driven, it gets nothing and the case says how much falls short.
        var body = JsonNode.Parse("""
            {"junctions": [{"id": "hill", "elevation": 60, "demand": 0.002}, {"id": "valley", "elevation": 0, "demand": 0.01}],
             "reservoirs": [{"id": "tank", "head": 50}],
             "pipes": [{"id": "a", "from": "tank", "to": "valley", "length": 500, "diameter": 0.15, "roughness": 0.0001},
                       {"id": "b", "from": "valley", "to": "hill", "length": 400, "diameter": 0.1, "roughness": 0.0001}]}
            """)!.AsObject();
        var dd = await Post(body);
        Assert.Equal(200, dd.Status);
        var warning = Assert.Single(dd.Body.GetProperty("cases")[0].GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "negative-pressure");
        Assert.Equal("hill", warning.GetProperty("element").GetString());
        Assert.Contains("pressure-driven", warning.GetProperty("message").GetString());
        Assert.Contains("demandModel", warning.GetProperty("message").GetString());

        body["demandModel"] = Law(0, 20, null);
        var pdd = await Post(body);
        Assert.Equal(200, pdd.Status);
        var c = pdd.Body.GetProperty("cases")[0];
        Assert.Equal(0.0, c.GetProperty("junctions")[0].GetProperty("deliveredDemand").GetDouble());
        Assert.Equal(0.002, c.GetProperty("demandShortfall").GetDouble(), 1e-15);
        Assert.Contains(c.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "demand-shortfall");
        // The defaults (minimum as given, exponent 0.5) are echoed.
        Assert.Contains(pdd.Body.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("field").GetString() == "demandModel.exponent" && a.GetProperty("value").GetString() == "0.5");
    }

    [Fact]
    public async Task Solve_UsUnits_PressureHeadsInFeet_GiveTheSiAnswerConverted()
    {
        // The law's heads in ft (exact 0.3048, NIST SP 811) with the network in ft and ft3/s: the SI answer converted.
        const double ft = 0.3048, ft3 = ft * ft * ft;
        var si = JsonNode.Parse("""
            {"junctions": [{"id": "j1", "elevation": 5, "demand": 0.03}, {"id": "j2", "elevation": 30, "demand": 0.03}],
             "reservoirs": [{"id": "r", "head": 60}],
             "pipes": [{"id": "p1", "from": "r", "to": "j1", "length": 1000, "diameter": 0.2, "roughness": 0.0001},
                       {"id": "p2", "from": "j1", "to": "j2", "length": 800, "diameter": 0.15, "roughness": 0.0001}],
             "temperature": 15, "demandMultipliers": [1, 2]}
            """)!.AsObject();
        si["demandModel"] = Law(2, 20, 0.5);
        var us = JsonNode.Parse(si.ToJsonString())!.AsObject();
        us["units"] = "us";
        us["temperature"] = 15 * 9.0 / 5 + 32;
        foreach (var j in us["junctions"]!.AsArray()) { j!["elevation"] = j["elevation"]!.GetValue<double>() / ft; j["demand"] = j["demand"]!.GetValue<double>() / ft3; }
        us["reservoirs"]![0]!["head"] = 60 / ft;
        foreach (var p in us["pipes"]!.AsArray())
        {
            p!["length"] = p["length"]!.GetValue<double>() / ft;
            p["diameter"] = p["diameter"]!.GetValue<double>() / ft;
            p["roughness"] = p["roughness"]!.GetValue<double>() / ft;
        }
        us["demandModel"] = Law(2 / ft, 20 / ft, 0.5);
        var a = await Post(si);
        var b = await Post(us);
        Assert.Equal(200, a.Status);
        Assert.Equal(200, b.Status);
        bool partial = false;
        for (int c = 0; c < 2; c++)
        {
            var ja = a.Body.GetProperty("cases")[c].GetProperty("junctions").EnumerateArray().ToArray();
            var jb = b.Body.GetProperty("cases")[c].GetProperty("junctions").EnumerateArray().ToArray();
            for (int k = 0; k < ja.Length; k++)
            {
                Assert.Equal(ja[k].GetProperty("pressureHead").GetDouble(), jb[k].GetProperty("pressureHead").GetDouble() * ft, 1e-8);
                double q = ja[k].GetProperty("deliveredDemand").GetDouble();
                Assert.Equal(q, jb[k].GetProperty("deliveredDemand").GetDouble() * ft3, 1e-10);
                if (q < ja[k].GetProperty("demand").GetDouble()) partial = true;
            }
            Assert.Equal(a.Body.GetProperty("cases")[c].GetProperty("demandShortfall").GetDouble(),
                b.Body.GetProperty("cases")[c].GetProperty("demandShortfall").GetDouble() * ft3, 1e-10);
        }
        Assert.True(partial, "some junction is short, so the law's heads matter");
    }

    public static TheoryData<string, string, string> BadDemandModels => new()
    {
        // demandModel as sent, the errors key, what the message says
        { """{"type": "pressure-driven", "minimumPressureHead": 20, "requiredPressureHead": 10}""", "demandModel.requiredPressureHead", "must exceed minimumPressureHead" },
        { """{"type": "pressure-driven", "minimumPressureHead": 5, "requiredPressureHead": 5}""", "demandModel.requiredPressureHead", "must exceed minimumPressureHead" },
        { """{"type": "pressure-driven", "requiredPressureHead": 0.005}""", "demandModel.requiredPressureHead", "at least 0.01 m" },
        { """{"type": "pressure-driven"}""", "demandModel.requiredPressureHead", "required" },
        { """{"type": "pressure-driven", "requiredPressureHead": 20, "exponent": 0}""", "demandModel.exponent", "at least 0.1" },
        { """{"type": "pressure-driven", "requiredPressureHead": 20, "exponent": -0.5}""", "demandModel.exponent", "at least 0.1" },
        { """{"type": "pressure-driven", "requiredPressureHead": 20, "exponent": 5}""", "demandModel.exponent", "at most 3" },
        { """{"type": "pressure-driven", "minimumPressureHead": -1e6, "requiredPressureHead": 20}""", "demandModel.minimumPressureHead", "at least -10000" },
        { """{"type": "pressure-driven", "requiredPressureHead": 1e300}""", "demandModel.requiredPressureHead", "at most 10000" },
        { """{"type": "pressure-dependent", "requiredPressureHead": 20}""", "demandModel.type", "must be demand-driven or pressure-driven" },
        { """{"requiredPressureHead": 20}""", "demandModel.type", "required" },
        { """{"type": "demand-driven", "requiredPressureHead": 20}""", "demandModel.requiredPressureHead", "only to type pressure-driven" },
        { """{"type": "pressure-driven", "requiredPresureHead": 20}""", "demandModel.requiredPresureHead", "did you mean 'requiredPressureHead'" },
        { """{"type": 3, "requiredPressureHead": 20}""", "demandModel.type", "" },
        { """{"type": "pressure-driven", "requiredPressureHead": "twenty"}""", "demandModel.requiredPressureHead", "" },
        { "\"pressure-driven\"", "demandModel", "" },
    };

    [Theory]
    [MemberData(nameof(BadDemandModels))]
    public async Task Solve_BadDemandModel_400NamesTheField(string demandModel, string field, string says)
    {
        var body = Sample();
        body["demandModel"] = JsonNode.Parse(demandModel);
        var r = await Post(body);
        ProblemAssert.NamesField(r, 400, field);
        string message = string.Join(" ", r.Body.GetProperty("errors").GetProperty(field).EnumerateArray().Select(m => m.GetString()));
        Assert.Contains(says, message);
    }

    [Fact]
    public async Task Solve_UsUnits_TooNarrowABandIsNamedInFeet()
    {
        var body = Sample();
        body["units"] = "us";
        body["demandModel"] = Law(10, 10.02, 0.5);
        var r = await Post(body);
        ProblemAssert.NamesField(r, 400, "demandModel.requiredPressureHead");
        Assert.Contains("ft", r.Body.GetProperty("errors").GetProperty("demandModel.requiredPressureHead")[0].GetString());
    }

    [Fact]
    public async Task Sheet_PressureDriven_ShowsDeliveredAgainstRequestedPerJunction()
    {
        var body = Sample();
        body["demandModel"] = Law(0, 20, 0.5);
        body["demandMultipliers"] = new JsonArray(1.0, 2.5);
        var page = await SheetPage.Post(api, Route + "?format=html", body);
        var json = await Post(body);
        Assert.Equal(200, page.Status);
        Assert.Equal(200, json.Status);
        string method = page.Document.GetElementById("method")!.TextContent;
        Assert.Contains("Wagner", method);
        int c = 0;
        foreach (var k in json.Body.GetProperty("cases").EnumerateArray())
        {
            c++;
            var header = page.Document.QuerySelectorAll($"#table-junctions-{c} th").Select(h => h.TextContent).ToList();
            Assert.Contains("Delivered / requested (%)", header);
            var rows = page.Document.QuerySelectorAll($"#table-junctions-{c} tbody tr").ToList();
            var junctions = k.GetProperty("junctions").EnumerateArray().ToArray();
            Assert.Equal(junctions.Length, rows.Count);
            for (int i = 0; i < junctions.Length; i++)
            {
                var cells = rows[i].QuerySelectorAll("td").Select(td => td.TextContent).ToArray();
                Assert.Equal(junctions[i].GetProperty("id").GetString(), cells[0]);
                double d = junctions[i].GetProperty("demand").GetDouble(), q = junctions[i].GetProperty("deliveredDemand").GetDouble();
                Assert.Equal(d, double.Parse(cells[3], CultureInfo.InvariantCulture), Math.Abs(d) * 1e-7 + 1e-300);
                Assert.Equal(q, double.Parse(cells[4], CultureInfo.InvariantCulture), Math.Abs(q) * 1e-7 + 1e-300);
                if (d != 0) Assert.Equal(100 * q / d, double.Parse(cells[5], CultureInfo.InvariantCulture), 0.051);
                else Assert.Equal("-", cells[5]);
            }
        }
        string results = page.Document.GetElementById("results")!.TextContent;
        Assert.Contains("total delivered demand", results);
        Assert.Contains("demand shortfall", results);
        string inputs = page.Document.GetElementById("inputs")!.TextContent;
        Assert.Contains("pressure-driven", inputs);
        Assert.Contains("Required pressure head", inputs);

        // A demand-driven sheet keeps its four-column junction table.
        var plain = await SheetPage.Post(api, Route + "?format=html", Sample());
        var plainHeader = plain.Document.QuerySelectorAll("#table-junctions-1 th").Select(h => h.TextContent).ToList();
        Assert.Equal(4, plainHeader.Count);
    }

    [Fact]
    public async Task Solve_HostileLawsAndValues_NeverBreakTheService()
    {
        // The sample under pressure-driven demand with hostile numbers in the law and in one element: every answer a 2xx
        // with finite numbers and bounded iterations, or a problem naming a field; never a 5xx.
        double[] hostile = [0, -0.0, -1, 1e-300, 1e-12, 1e15, 1e300, -1e300, 1e4, -1e4, 0.01, 0.1, 3, 20, 100];
        string sample = File.ReadAllText(Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json"));
        (string List, string Field)[] numbers = [("junctions", "elevation"), ("junctions", "demand"), ("reservoirs", "head"), ("pipes", "diameter"), ("demandMultipliers", "")];
        var gen = Gen.Select(Gen.OneOf(Gen.OneOf(hostile), Gen.Double[-50, 50]), Gen.OneOf(Gen.OneOf(hostile), Gen.Double[-50, 150]),
                Gen.OneOf(Gen.OneOf(hostile), Gen.Double[0, 4]), Gen.Int[0, numbers.Length], Gen.OneOf(Gen.OneOf(hostile), Gen.Double), Gen.Int[0, 12])
            .Select((min, req, e, which, value, index) =>
            {
                var doc = JsonNode.Parse(sample)!.AsObject();
                doc["demandModel"] = Law(min, req, e);
                if (!double.IsFinite(value)) value = 1e308;
                if (which < numbers.Length)
                {
                    var (list, field) = numbers[which];
                    if (field.Length == 0) doc[list] = new JsonArray(Math.Abs(value) <= 100 ? Math.Abs(value) : 100, 3.0);
                    else
                    {
                        var items = doc[list]!.AsArray();
                        items[index % items.Count]![field] = value;
                    }
                }
                return doc.ToJsonString();
            });
        await gen.SampleAsync(async body =>
        {
            using var content = new StringContent(body, Encoding.UTF8, "application/json");
            using var response = await api.Client.PostAsync(Route, content, TestContext.Current.CancellationToken);
            await FuzzTests.CheckAnswer(response, "POST /v1/networks/solve " + body[^Math.Min(300, body.Length)..]);
        }, iter: 200, threads: 1);
    }
}
