using System.Text.Json;
using System.Text.Json.Nodes;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Api.Tests.Networks;

/// <summary>
/// POST /v1/networks/simulate through the service, its refusals: every bad field of the tanks, patterns, controls and
/// times answers 400 naming its path (and the element ids), as do misspelt fields, duplicate keys, wrong types, comma
/// decimals and non-finite numbers; a junction's pattern is refused by the steady routes; a duration over the
/// configurable limit and an answer over the row limit answer 413 naming the limit; format=text is refused.
/// </summary>
public sealed class NetworkSimulationEndpointsTests(ApiFixture api)
{
    internal const string Route = "/v1/networks/simulate";

    private async Task<(int Status, string? ContentType, JsonElement Body)> Post(JsonNode body, string route = Route) =>
        await api.PostRaw(route, body.ToJsonString(), "application/json");

    /// <summary>A reservoir feeding a tank through one pipe, the tank feeding a junction through another; a pattern on
    /// the junction and a control on the feed pipe (every part of the document present, so each can be spoiled).</summary>
    internal static JsonObject Document() => new()
    {
        ["junctions"] = new JsonArray(new JsonObject { ["id"] = "j", ["elevation"] = 10, ["demand"] = 0.01, ["pattern"] = "day" }),
        ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = "r", ["head"] = 60 }),
        ["tanks"] = new JsonArray(new JsonObject
        {
            ["id"] = "t", ["elevation"] = 40, ["initialLevel"] = 2, ["minimumLevel"] = 0.5, ["maximumLevel"] = 5, ["diameter"] = 10,
        }),
        ["pipes"] = new JsonArray(
            new JsonObject { ["id"] = "feed", ["from"] = "r", ["to"] = "t", ["length"] = 500, ["diameter"] = 0.15, ["roughness"] = 1e-4 },
            new JsonObject { ["id"] = "out", ["from"] = "t", ["to"] = "j", ["length"] = 300, ["diameter"] = 0.15, ["roughness"] = 1e-4 }),
        ["patterns"] = new JsonArray(new JsonObject { ["id"] = "day", ["multipliers"] = new JsonArray(0.5, 1.0, 1.5, 1.0) }),
        ["controls"] = new JsonArray(new JsonObject
        {
            ["link"] = "feed", ["set"] = new JsonObject { ["status"] = "closed" },
            ["when"] = new JsonObject { ["tank"] = "t", ["levelAbove"] = 4.5 },
        }),
        ["duration"] = 14_400,
        ["kinematicViscosity"] = 1.004e-6,
    };

    private static JsonObject With(Action<JsonObject> spoil)
    {
        var d = Document();
        spoil(d);
        return d;
    }

    private static JsonObject Tank(JsonObject d, int i = 0) => d["tanks"]![i]!.AsObject();

    private static JsonObject Control(JsonObject d, int i = 0) => d["controls"]![i]!.AsObject();

    public static TheoryData<string, string> BadFields() => new()
    {
        // (what is spoiled, the field path the 400 must name)
        { "control-unknown-link", "controls[2].link" },
        { "control-unknown-tank", "controls[0].when.tank" },
        { "control-level-without-tank", "controls[0].when.tank" },
        { "control-no-condition", "controls[0].when" },
        { "control-time-and-tank", "controls[0].when.tank" },
        { "control-both-levels", "controls[0].when.levelAbove" },
        { "control-level-above-tank", "controls[0].when.levelAbove" },
        { "control-time-after-end", "controls[0].when.time" },
        { "control-no-set", "controls[0].set" },
        { "control-status-and-speed", "controls[0].set" },
        { "control-bad-status", "controls[0].set.status" },
        { "control-speed-on-pipe", "controls[0].set.speedRatio" },
        { "control-no-link", "controls[0].link" },
        { "valve-at-a-tank", "valves[0].from" },
        { "junction-unknown-pattern", "junctions[0].pattern" },
        { "pattern-named-nowhere", "patterns[1].id" },
        { "pattern-duplicate-id", "patterns[1].id" },
        { "pattern-no-multipliers", "patterns[0].multipliers" },
        { "pattern-missing-multipliers", "patterns[0].multipliers" },
        { "pattern-negative-multiplier", "patterns[0].multipliers[2]" },
        { "patterns-too-many-multipliers", "patterns" },
        { "tank-connected-to-nothing", "tanks[1].id" },
        { "tank-id-of-a-junction", "tanks[0].id" },
        { "tank-negative-diameter", "tanks[0].diameter" },
        { "tank-initial-below-minimum", "tanks[0].initialLevel" },
        { "tank-initial-above-maximum", "tanks[0].initialLevel" },
        { "tank-maximum-below-minimum", "tanks[0].maximumLevel" },
        { "tank-negative-minimum", "tanks[0].minimumLevel" },
        { "tank-missing-elevation", "tanks[0].elevation" },
        { "tank-subnormal-diameter", "tanks[0].diameter" },
        { "pipe-to-unknown-node", "pipes[1].to" },
        { "report-step-zero", "reportStep" },
        { "pattern-step-negative", "patternStep" },
        { "duration-missing", "duration" },
        { "duration-negative", "duration" },
        { "no-reservoir-no-tank", "reservoirs" },
    };

    private static JsonObject Spoiled(string what) => With(d =>
    {
        switch (what)
        {
            case "control-unknown-link":
                var c = d["controls"]!.AsArray();
                c.Add(new JsonObject { ["link"] = "out", ["set"] = new JsonObject { ["status"] = "open" }, ["when"] = new JsonObject { ["time"] = 60 } });
                c.Add(new JsonObject { ["link"] = "nowhere-main", ["set"] = new JsonObject { ["status"] = "open" }, ["when"] = new JsonObject { ["time"] = 60 } });
                break;
            case "control-unknown-tank": Control(d)["when"]!["tank"] = "ghost"; break;
            case "control-level-without-tank": Control(d)["when"]!.AsObject().Remove("tank"); break;
            case "control-no-condition": Control(d)["when"] = new JsonObject(); break;
            case "control-time-and-tank": Control(d)["when"] = new JsonObject { ["tank"] = "t", ["time"] = 60 }; break;
            case "control-both-levels": Control(d)["when"]!["levelBelow"] = 1; break;
            case "control-level-above-tank": Control(d)["when"]!["levelAbove"] = 5.5; break;
            case "control-time-after-end": Control(d)["when"] = new JsonObject { ["time"] = 20_000 }; break;
            case "control-no-set": Control(d).Remove("set"); break;
            case "control-status-and-speed": Control(d)["set"]!["speedRatio"] = 0.9; break;
            case "control-bad-status": Control(d)["set"]!["status"] = "shut"; break;
            case "control-speed-on-pipe": Control(d)["set"] = new JsonObject { ["speedRatio"] = 0.9 }; break;
            case "control-no-link": Control(d).Remove("link"); break;
            case "valve-at-a-tank":
                d["junctions"]!.AsArray().Add(new JsonObject { ["id"] = "k", ["elevation"] = 5, ["demand"] = 0.001 });
                d["valves"] = new JsonArray(new JsonObject { ["id"] = "v", ["from"] = "t", ["to"] = "k", ["diameter"] = 0.1, ["type"] = "throttle", ["setting"] = 2 });
                break;
            case "junction-unknown-pattern": d["junctions"]![0]!["pattern"] = "night"; break;
            case "pattern-named-nowhere": d["patterns"]!.AsArray().Add(new JsonObject { ["id"] = "spare", ["multipliers"] = new JsonArray(1.0) }); break;
            case "pattern-duplicate-id": d["patterns"]!.AsArray().Add(new JsonObject { ["id"] = "day", ["multipliers"] = new JsonArray(1.0) }); break;
            case "pattern-no-multipliers": d["patterns"]![0]!["multipliers"] = new JsonArray(); break;
            case "pattern-missing-multipliers": d["patterns"]![0]!.AsObject().Remove("multipliers"); break;
            case "patterns-too-many-multipliers":
                // 100 001 multipliers over two patterns: over the request's 100 000.
                d["patterns"]![0]!["multipliers"] = new JsonArray(Enumerable.Range(0, 60_000).Select(_ => (JsonNode?)JsonValue.Create(1.0)).ToArray());
                d["patterns"]!.AsArray().Add(new JsonObject { ["id"] = "night", ["multipliers"] = new JsonArray(Enumerable.Range(0, 40_001).Select(_ => (JsonNode?)JsonValue.Create(0.5)).ToArray()) });
                d["junctions"]!.AsArray().Add(new JsonObject { ["id"] = "k", ["elevation"] = 5, ["demand"] = 0.001, ["pattern"] = "night" });
                d["pipes"]!.AsArray().Add(new JsonObject { ["id"] = "k-pipe", ["from"] = "j", ["to"] = "k", ["length"] = 100, ["diameter"] = 0.1, ["roughness"] = 1e-4 });
                break;
            case "pattern-negative-multiplier": d["patterns"]![0]!["multipliers"] = new JsonArray(1.0, 0.5, -0.1, 1.0); break;
            case "tank-connected-to-nothing":
                d["tanks"]!.AsArray().Add(new JsonObject { ["id"] = "lonely", ["elevation"] = 40, ["initialLevel"] = 1, ["maximumLevel"] = 3, ["diameter"] = 5 });
                break;
            case "tank-id-of-a-junction": Tank(d)["id"] = "j"; break;
            case "tank-negative-diameter": Tank(d)["diameter"] = -10; break;
            case "tank-initial-below-minimum": Tank(d)["initialLevel"] = 0.2; break;
            case "tank-initial-above-maximum": Tank(d)["initialLevel"] = 5.2; break;
            case "tank-maximum-below-minimum": Tank(d)["maximumLevel"] = 0.4; break;
            case "tank-negative-minimum": Tank(d)["minimumLevel"] = -1; break;
            case "tank-missing-elevation": Tank(d).Remove("elevation"); break;
            case "tank-subnormal-diameter": Tank(d)["diameter"] = 5e-324; break;
            case "pipe-to-unknown-node": d["pipes"]![1]!["to"] = "tank-two"; break;
            case "report-step-zero": d["reportStep"] = 0; break;
            case "pattern-step-negative": d["patternStep"] = -3600; break;
            case "duration-missing": d.Remove("duration"); break;
            case "duration-negative": d["duration"] = -1; break;
            case "no-reservoir-no-tank":
                d.Remove("tanks");
                d.Remove("controls");
                d["reservoirs"] = new JsonArray();
                d["pipes"] = new JsonArray(new JsonObject { ["id"] = "out", ["from"] = "j", ["to"] = "k", ["length"] = 300, ["diameter"] = 0.15, ["roughness"] = 1e-4 });
                d["junctions"]!.AsArray().Add(new JsonObject { ["id"] = "k", ["elevation"] = 0 });
                break;
            default: throw new ArgumentOutOfRangeException(nameof(what), what, null);
        }
    });

    [Theory]
    [MemberData(nameof(BadFields))]
    public async Task Simulate_BadField_400NamingItsPath(string what, string field)
    {
        var r = await Post(Spoiled(what));
        ProblemAssert.NamesField(r, 400, field);
    }

    [Fact]
    public async Task Simulate_UnknownLink_NamesTheLinkAndTheControl()
    {
        var r = await Post(Spoiled("control-unknown-link"));
        ProblemAssert.NamesField(r, 400, "controls[2].link");
        string message = r.Body.GetProperty("errors").GetProperty("controls[2].link")[0].GetString()!;
        Assert.Contains("'nowhere-main'", message);
        Assert.Contains("control 2", message);
        Assert.Contains("nowhere-main", r.Body.GetProperty("elements").EnumerateArray().Select(e => e.GetString()));
        // Only the spoiled control is named: the good ones before it are not.
        Assert.False(r.Body.GetProperty("errors").TryGetProperty("controls[1].link", out _));
    }

    [Fact]
    public async Task Simulate_TanksOnly_NeedNoReservoir_EvenWhenATankFieldIsBad()
    {
        // A tank is a node of known head: without reservoirs only the tank's own bad field is named.
        var d = With(x =>
        {
            x["reservoirs"] = new JsonArray();
            x["pipes"]!.AsArray().RemoveAt(0);
            x.Remove("controls");
            Tank(x)["diameter"] = -1;
        });
        var r = await Post(d);
        ProblemAssert.NamesField(r, 400, "tanks[0].diameter");
        Assert.False(r.Body.GetProperty("errors").TryGetProperty("reservoirs", out _), r.Body.ToString());
    }

    [Fact]
    public async Task Simulate_EveryBadFieldAtOnce()
    {
        var d = Document();
        Tank(d)["diameter"] = 0;
        d["patterns"]![0]!["multipliers"] = new JsonArray();
        Control(d)["link"] = "ghost";
        d["reportStep"] = 0;
        var r = await Post(d);
        foreach (var field in new[] { "tanks[0].diameter", "patterns[0].multipliers", "controls[0].link", "reportStep" })
            ProblemAssert.NamesField(r, 400, field);
    }

    public static TheoryData<string, string> MalformedBodies() => new()
    {
        // (the body as text, the field path the 400 must name)
        { Replace("\"duration\":14400", "\"duraton\":14400"), "duraton" },
        { Replace("\"diameter\":10", "\"diametre\":10"), "tanks[0].diametre" },
        { Replace("\"levelAbove\":4.5", "\"levelAbove\":4.5,\"levelAbove\":4"), "controls[0].when.levelAbove" },
        { Replace("\"duration\":14400", "\"duration\":\"14400\""), "duration" },
        { Replace("\"multipliers\":[0.5,1,1.5,1]", "\"multipliers\":\"0.5 1 1.5 1\""), "patterns[0].multipliers" },
        { Replace("\"initialLevel\":2", "\"initialLevel\":2,5"), "tanks[0]" },
        { Replace("\"initialLevel\":2", "\"initialLevel\":NaN"), "tanks[0].initialLevel" },
        { Replace("\"maximumLevel\":5", "\"maximumLevel\":1e400"), "tanks[0].maximumLevel" },
        { Replace("\"duration\":14400", "\"duration\":14400,\"demandMultipliers\":[1,2]"), "demandMultipliers" },
    };

    private static string Replace(string what, string with)
    {
        string text = Document().ToJsonString();
        Assert.Contains(what, text);
        return text.Replace(what, with, StringComparison.Ordinal);
    }

    [Theory]
    [MemberData(nameof(MalformedBodies))]
    public async Task Simulate_MalformedBody_400NamingTheField(string body, string field)
    {
        var r = await api.PostRaw(Route, body, "application/json");
        Assert.Equal(400, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        var keys = r.Body.GetProperty("errors").EnumerateObject().Select(p => p.Name).ToArray();
        Assert.True(keys.Any(k => k == field || k.StartsWith(field + ".", StringComparison.Ordinal)),
            $"errors names {string.Join(", ", keys)}, not {field}");
    }

    [Fact]
    public async Task SteadyRoutes_RefuseAJunctionPattern_PointingToSimulate()
    {
        var solve = new JsonObject
        {
            ["junctions"] = new JsonArray(new JsonObject { ["id"] = "j", ["elevation"] = 10, ["demand"] = 0.01, ["pattern"] = "day" }),
            ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = "r", ["head"] = 60 }),
            ["pipes"] = new JsonArray(new JsonObject { ["id"] = "p", ["from"] = "r", ["to"] = "j", ["length"] = 500, ["diameter"] = 0.15, ["roughness"] = 1e-4 }),
        };
        var r = await Post(solve, "/v1/networks/solve");
        ProblemAssert.NamesField(r, 400, "junctions[0].pattern");
        Assert.Contains("/v1/networks/simulate", r.Body.GetProperty("errors").GetProperty("junctions[0].pattern")[0].GetString());

        solve["fireFlow"] = new JsonObject { ["junctions"] = new JsonArray("j") };
        var f = await Post(solve, "/v1/networks/fire-flow");
        ProblemAssert.NamesField(f, 400, "junctions[0].pattern");
    }

    [Fact]
    public async Task Simulate_DurationOverTheDefaultLimit_413NamingIt()
    {
        // The default limit is 7 days (604 800 s); 8 days is over it.
        var r = await Post(With(d => d["duration"] = 8 * 86_400));
        Assert.Equal(413, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal("networkMaxSimulationDuration", r.Body.GetProperty("limit").GetString());
        Assert.Equal(604_800, r.Body.GetProperty("maximum").GetInt64());
        Assert.Equal(8 * 86_400, r.Body.GetProperty("given").GetInt64());
        Assert.Equal("duration", r.Body.GetProperty("field").GetString());
    }

    [Fact]
    public async Task Simulate_DurationLimit_IsConfigurable()
    {
        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b =>
            b.UseSetting("FlowSolve:Limits:NetworkMaxSimulationDuration", "3600"));
        using var client = factory.CreateClient();
        using var content = new StringContent(Document().ToJsonString(), System.Text.Encoding.UTF8, "application/json");
        using var response = await client.PostAsync(Route, content, TestContext.Current.CancellationToken);
        Assert.Equal(413, (int)response.StatusCode);
        var body = JsonDocument.Parse(await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken)).RootElement;
        Assert.Equal("networkMaxSimulationDuration", body.GetProperty("limit").GetString());
        Assert.Equal(3600, body.GetProperty("maximum").GetInt64());
    }

    [Fact]
    public async Task Simulate_TooManyReportRows_413BeforeSolving()
    {
        // A week reported every second: 604 801 report times, each with 5 rows (2 pipes, 1 junction, 1 reservoir and
        // the tank), far over the 100 000 rows of the default limit.
        var r = await Post(With(d => { d["duration"] = 604_800; d["reportStep"] = 1; Control(d)["when"] = new JsonObject { ["time"] = 60 }; }));
        Assert.Equal(413, r.Status);
        Assert.Equal("networkMaxElementCases", r.Body.GetProperty("limit").GetString());
        Assert.True(r.Body.GetProperty("given").GetInt64() > 604_800, r.Body.ToString());
        Assert.Equal("reportStep", r.Body.GetProperty("field").GetString());
    }

    [Fact]
    public async Task Simulate_ReportTimesBeyondTheRunsBound_400OnReportStep_WhenTheRowLimitIsRaised()
    {
        // With the row limit raised out of the way, a week reported every second still exceeds the 100 000 report
        // times one run keeps (each holds a whole network state): refused on reportStep before anything is solved.
        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b =>
            b.UseSetting("FlowSolve:Limits:NetworkMaxElementCases", "100000000"));
        using var client = factory.CreateClient();
        var body = With(d => { d["duration"] = 604_800; d["reportStep"] = 1; });
        using var content = new StringContent(body.ToJsonString(), System.Text.Encoding.UTF8, "application/json");
        using var response = await client.PostAsync(Route, content, TestContext.Current.CancellationToken);
        var json = JsonDocument.Parse(await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken)).RootElement;
        ProblemAssert.NamesField(((int)response.StatusCode, response.Content.Headers.ContentType?.MediaType, json), 400, "reportStep");
    }

    [Fact]
    public async Task Simulate_TooManyHeldStates_413EvenForASummary()
    {
        // 1000 pipes in a chain from the tank, reported every second for 2000 s: the summary lists 2001 tank rows only,
        // but the run keeps 2001 x 2003 element states, over 10 x the 100 000 rows of the default limit.
        var d = Document();
        d.Remove("controls");
        var junctions = d["junctions"]!.AsArray();
        var pipes = d["pipes"]!.AsArray();
        for (int i = 0; i < 999; i++)
        {
            junctions.Add(new JsonObject { ["id"] = $"c{i}", ["elevation"] = 0 });
            pipes.Add(new JsonObject { ["id"] = $"l{i}", ["from"] = i == 0 ? "j" : $"c{i - 1}", ["to"] = $"c{i}", ["length"] = 10, ["diameter"] = 0.1, ["roughness"] = 1e-4 });
        }
        d["output"] = new JsonObject { ["detail"] = "summary" };
        d["duration"] = 2000;
        d["reportStep"] = 1;
        var r = await Post(d);
        Assert.Equal(413, r.Status);
        Assert.Equal("networkMaxElementCases", r.Body.GetProperty("limit").GetString());
        Assert.Equal(1_000_000, r.Body.GetProperty("maximum").GetInt64());
        Assert.Equal(2001L * (1001 + 1000 + 1 + 1), r.Body.GetProperty("given").GetInt64());

        // A report every 10 s keeps 201 x 2003 states: under the bound, so the run is not refused for its size.
        d["reportStep"] = 10;
        var ok = await Post(d);
        Assert.NotEqual(413, ok.Status);
    }

    [Fact]
    public async Task Simulate_FormatText_400()
    {
        var r = await api.PostRaw(Route + "?format=text", Document().ToJsonString(), "application/json");
        ProblemAssert.NamesField(r, 400, "format");
    }
}
