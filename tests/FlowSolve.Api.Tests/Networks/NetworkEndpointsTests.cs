using System.Globalization;
using System.Net.Http.Json;
using System.Text.Json;
using System.Text.Json.Nodes;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Networks;
using FlowSolve.Core.Tests.Networks;
using MathNet.Numerics.RootFinding;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Api.Tests.Networks;

/// <summary>
/// POST /v1/networks/solve through the service: closed forms and MathNet's Brent on the single-pipe equations,
/// continuity and energy recomputed from the response with independent formulas, load cases against separate
/// solves, unit round trips, and every 400, 413 and 422 naming what is wrong.
/// </summary>
public sealed class NetworkEndpointsTests(ApiFixture api)
{
    private const string Route = "/v1/networks/solve";
    private const double G = 9.80665;          // standard gravity, m/s2 (3rd CGPM, 1901)
    private const double Water = 1.004e-6;     // m2/s, water at 20 degrees C (from memory)

    private static string SamplePath => Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json");

    private static JsonObject Sample() => JsonNode.Parse(File.ReadAllText(SamplePath))!.AsObject();

    private async Task<(int Status, string? ContentType, JsonElement Body)> Post(JsonNode body) =>
        await api.PostRaw(Route, body.ToJsonString(), "application/json");

    /// <summary>Colebrook-White solved by Brent for f (independent of the Core's solver).</summary>
    internal static double ColebrookBrent(double re, double relativeRoughness) =>
        Brent.FindRoot(f => 1 / Math.Sqrt(f) + 2 * Math.Log10(relativeRoughness / 3.7 + 2.51 / (re * Math.Sqrt(f))), 1e-4, 0.2, 1e-15, 200);

    /// <summary>Darcy-Weisbach head loss of a turbulent pipe with Brent's Colebrook-White f; signed like the flow.</summary>
    internal static double DarcyHeadLoss(double q, double l, double d, double e, double k, double nu)
    {
        double a = Math.PI * d * d / 4, v = Math.Abs(q) / a, re = v * d / nu;
        Assert.True(re > 4000, $"the independent check covers turbulent pipes only (Re {re})");
        double f = ColebrookBrent(re, e / d);
        return Math.CopySign((f * l / d + k) * v * v / (2 * G), q);
    }

    /// <summary>Hazen-Williams, SI velocity form V = 0.849 C R^0.63 S^0.54 (common practice), solved for S.</summary>
    internal static double HazenHeadLoss(double q, double l, double d, double c)
    {
        double v = Math.Abs(q) / (Math.PI * d * d / 4);
        double s = Math.Pow(v / (0.849 * c * Math.Pow(d / 4, 0.63)), 1 / 0.54);
        return Math.CopySign(s * l, q);
    }

    [Fact]
    public async Task Solve_SinglePipeBetweenReservoirs_MatchesBrentOnDarcyWeisbachAndColebrook()
    {
        // 50 m of head over 2 km of 300 mm pipe, e = 0.26 mm, K = 3. Reference: Brent on h(Q) = 50 m, with h from
        // Darcy-Weisbach and f from Brent on the Colebrook-White equation (nothing from FlowSolve).
        var body = JsonNode.Parse("""
            {"reservoirs": [{"id": "high", "head": 150}, {"id": "low", "head": 100}],
             "pipes": [{"id": "main", "from": "high", "to": "low", "length": 2000, "diameter": 0.3, "roughness": 0.00026, "minorLossCoefficient": 3}],
             "kinematicViscosity": 1.004e-6}
            """)!;
        var r = await Post(body);
        Assert.Equal(200, r.Status);

        double q = Brent.FindRoot(x => DarcyHeadLoss(x, 2000, 0.3, 0.26e-3, 3, Water) - 50, 1e-3, 1, 1e-14, 200);
        var c = Assert.Single(r.Body.GetProperty("cases").EnumerateArray());
        var p = Assert.Single(c.GetProperty("pipes").EnumerateArray());
        double area = Math.PI * 0.3 * 0.3 / 4;
        Assert.Equal(q, p.GetProperty("flow").GetDouble(), 1e-10);
        Assert.Equal(q / area, p.GetProperty("velocity").GetDouble(), 1e-9);
        Assert.Equal(50, p.GetProperty("headLoss").GetDouble(), 1e-9);
        Assert.Equal(ColebrookBrent(q / area * 0.3 / Water, 0.26e-3 / 0.3), p.GetProperty("frictionFactor").GetDouble(), 1e-10);
        Assert.Equal(q / area * 0.3 / Water, p.GetProperty("reynolds").GetDouble(), 1e-3);
        Assert.Equal("open", p.GetProperty("status").GetString());
        Assert.True(c.GetProperty("converged").GetBoolean());
        Assert.InRange(c.GetProperty("iterations").GetInt32(), 1, 15);
        // Continuity (property): what leaves one reservoir enters the other.
        var res = c.GetProperty("reservoirs").EnumerateArray().ToArray();
        Assert.Equal(q, res[0].GetProperty("outflow").GetDouble(), 1e-10);
        Assert.Equal(-q, res[1].GetProperty("outflow").GetDouble(), 1e-10);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.Contains("Todini and Pilati 1988", r.Body.GetProperty("method").GetString());
    }

    [Fact]
    public async Task Solve_SingleHazenWilliamsPipe_MatchesTheClosedForm()
    {
        // Hazen-Williams velocity form V = 0.849 C (D/4)^0.63 S^0.54 (SI; common practice) solved for Q in closed form.
        var body = JsonNode.Parse("""
            {"reservoirs": [{"id": "a", "head": 80}, {"id": "b", "head": 60}],
             "pipes": [{"id": "p", "from": "a", "to": "b", "length": 1500, "diameter": 0.25, "hazenWilliamsC": 120}]}
            """)!;
        var r = await Post(body);
        Assert.Equal(200, r.Status);
        double expected = Math.PI * 0.25 * 0.25 / 4 * 0.849 * 120 * Math.Pow(0.25 / 4, 0.63) * Math.Pow(20.0 / 1500, 0.54);
        var p = r.Body.GetProperty("cases")[0].GetProperty("pipes")[0];
        Assert.Equal(expected, p.GetProperty("flow").GetDouble(), 1e-11);
        // The default fluid is echoed.
        Assert.Contains(r.Body.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("field").GetString() == "temperature");
    }

    private static Dictionary<string, double> Heads(JsonElement c, JsonObject request)
    {
        var heads = c.GetProperty("junctions").EnumerateArray().ToDictionary(j => j.GetProperty("id").GetString()!, j => j.GetProperty("head").GetDouble());
        foreach (var res in request["reservoirs"]!.AsArray()) heads[res!["id"]!.GetValue<string>()] = res["head"]!.GetValue<double>();
        return heads;
    }

    [Fact]
    public async Task Solve_VandrelSample_ContinuityAtEveryJunctionAndEnergyOnEveryLinkAndLoop()
    {
        var request = Sample();
        var r = await Post(request);
        Assert.Equal(200, r.Status);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        double nu = r.Body.GetProperty("kinematicViscosity").GetDouble();
        var pipesIn = request["pipes"]!.AsArray().Select(p => p!.AsObject()).ToArray();
        var pumpsIn = request["pumps"]!.AsArray().Select(p => p!.AsObject()).ToArray();
        int caseIndex = 0;
        foreach (var c in r.Body.GetProperty("cases").EnumerateArray())
        {
            caseIndex++;
            var heads = Heads(c, request);
            var pipes = c.GetProperty("pipes").EnumerateArray().ToArray();
            var pumps = c.GetProperty("pumps").EnumerateArray().ToArray();

            // Continuity at every junction (property): inflows - outflows - demand = 0 to 1e-9 m3/s.
            var net = c.GetProperty("junctions").EnumerateArray().ToDictionary(j => j.GetProperty("id").GetString()!, j => -j.GetProperty("demand").GetDouble());
            void Flow(JsonObject link, double q)
            {
                string from = link["from"]!.GetValue<string>(), to = link["to"]!.GetValue<string>();
                if (net.ContainsKey(from)) net[from] -= q;
                if (net.ContainsKey(to)) net[to] += q;
            }
            for (int i = 0; i < pipes.Length; i++) Flow(pipesIn[i], pipes[i].GetProperty("flow").GetDouble());
            for (int i = 0; i < pumps.Length; i++) Flow(pumpsIn[i], pumps[i].GetProperty("flow").GetDouble());
            foreach (var (id, error) in net) Assert.True(Math.Abs(error) <= 1e-9, $"case {caseIndex}: continuity at {id}: {error}");
            Assert.Equal(c.GetProperty("totalDemand").GetDouble(), c.GetProperty("totalSupply").GetDouble(), 1e-9);

            if (c.GetProperty("demandMultiplier").GetDouble() != 1) continue;
            // Energy on every open pipe: H_from - H_to equals the head loss recomputed from the reported flow with
            // Darcy-Weisbach + Brent's Colebrook-White or the Hazen-Williams closed form; so every loop sums to zero.
            var loss = new Dictionary<string, double>();
            for (int i = 0; i < pipes.Length; i++)
            {
                var p = pipesIn[i];
                string id = p["id"]!.GetValue<string>();
                double q = pipes[i].GetProperty("flow").GetDouble();
                double across = heads[p["from"]!.GetValue<string>()] - heads[p["to"]!.GetValue<string>()];
                if (pipes[i].GetProperty("status").GetString() != "open")
                {
                    Assert.Equal(0.0, q);
                    Assert.True(across < 0, $"{id}: a closed check valve holds reverse head");
                    continue;
                }
                double l = p["length"]!.GetValue<double>(), d = p["diameter"]!.GetValue<double>();
                double h = p["hazenWilliamsC"] is { } c0
                    ? HazenHeadLoss(q, l, d, c0.GetValue<double>())
                    : DarcyHeadLoss(q, l, d, p["roughness"]!.GetValue<double>(), p["minorLossCoefficient"]?.GetValue<double>() ?? 0, nu);
                loss[id] = h;
                Assert.True(Math.Abs(across - h) <= 1e-9, $"energy on {id}: {across} vs {h}");
                Assert.Equal(h, pipes[i].GetProperty("headLoss").GetDouble(), 1e-9);
            }
            // The three loops of the sample (pipe id, +1 along the pipe, -1 against it), from the independent losses.
            (string, int)[][] loops =
            [
                [("p1", 1), ("p4", 1), ("p6", -1), ("p3", -1)],
                [("p2", 1), ("p5", 1), ("p7", -1), ("p4", -1)],
                [("p8", 1), ("p9", 1), ("p6", -1)],
            ];
            foreach (var loop in loops)
                Assert.True(Math.Abs(loop.Sum(x => x.Item2 * loss[x.Item1])) <= 1e-9, $"energy around {string.Join(",", loop.Select(x => x.Item1))}");
            // The pump adds c0 + c2 Q^2 (its curve as given, speed 1) between suction and delivery.
            var coeffs = pumpsIn[0]["curve"]!["coefficients"]!.AsArray().Select(x => x!.GetValue<double>()).ToArray();
            double qp = pumps[0].GetProperty("flow").GetDouble();
            double rise = heads[pumpsIn[0]["to"]!.GetValue<string>()] - heads[pumpsIn[0]["from"]!.GetValue<string>()];
            Assert.Equal(coeffs[0] + coeffs[1] * qp + coeffs[2] * qp * qp, rise, 1e-9);
        }
        Assert.Equal(3, caseIndex);
    }

    [Fact]
    public async Task Solve_LoadCases_EqualSeparateSolves()
    {
        var request = Sample();
        var together = await Post(request);
        Assert.Equal(200, together.Status);
        var multipliers = request["demandMultipliers"]!.AsArray().Select(m => m!.GetValue<double>()).ToArray();
        for (int i = 0; i < multipliers.Length; i++)
        {
            var one = Sample();
            one["demandMultipliers"] = new JsonArray(multipliers[i]);
            var alone = await Post(one);
            Assert.Equal(200, alone.Status);
            var a = together.Body.GetProperty("cases")[i];
            var b = alone.Body.GetProperty("cases")[0];
            Assert.Equal(multipliers[i], a.GetProperty("demandMultiplier").GetDouble());
            var pa = a.GetProperty("pipes").EnumerateArray().ToArray();
            var pb = b.GetProperty("pipes").EnumerateArray().ToArray();
            for (int k = 0; k < pa.Length; k++)
            {
                Assert.Equal(pb[k].GetProperty("flow").GetDouble(), pa[k].GetProperty("flow").GetDouble(), 1e-9);
                Assert.Equal(pb[k].GetProperty("status").GetString(), pa[k].GetProperty("status").GetString());
            }
            var ja = a.GetProperty("junctions").EnumerateArray().ToArray();
            var jb = b.GetProperty("junctions").EnumerateArray().ToArray();
            for (int k = 0; k < ja.Length; k++) Assert.Equal(jb[k].GetProperty("head").GetDouble(), ja[k].GetProperty("head").GetDouble(), 1e-8);
            // The demand of each case is the base demand times its multiplier.
            Assert.Equal(0.032 * multipliers[i], a.GetProperty("totalDemand").GetDouble(), 1e-12);
        }
    }

    [Fact]
    public async Task Solve_UsUnits_RoundTripsTheSiAnswer()
    {
        // The same network in ft, ft3/s and degrees F (exact factors, NIST SP 811) gives the SI answer converted.
        const double ft = 0.3048, ft3 = ft * ft * ft;
        var si = Sample();
        var us = Sample();
        us["units"] = "us";
        us["temperature"] = 12 * 9.0 / 5 + 32;
        foreach (var j in us["junctions"]!.AsArray()) { j!["elevation"] = j["elevation"]!.GetValue<double>() / ft; j["demand"] = j["demand"]!.GetValue<double>() / ft3; }
        foreach (var res in us["reservoirs"]!.AsArray()) res!["head"] = res["head"]!.GetValue<double>() / ft;
        foreach (var p in us["pipes"]!.AsArray())
        {
            p!["length"] = p["length"]!.GetValue<double>() / ft;
            p["diameter"] = p["diameter"]!.GetValue<double>() / ft;
            if (p["roughness"] is { } e) p["roughness"] = e.GetValue<double>() / ft;
        }
        var c = us["pumps"]![0]!["curve"]!["coefficients"]!.AsArray();
        // H[ft] = c0/ft + c2 ft3^2/ft Q[ft3/s]^2 from H[m] = c0 + c2 Q[m3/s]^2.
        c[0] = c[0]!.GetValue<double>() / ft;
        c[2] = c[2]!.GetValue<double>() * ft3 * ft3 / ft;
        us["pumps"]![0]!["curve"]!["maximumFlow"] = us["pumps"]![0]!["curve"]!["maximumFlow"]!.GetValue<double>() / ft3;

        var a = await Post(si);
        var b = await Post(us);
        Assert.Equal(200, b.Status);
        Assert.Equal("ft", b.Body.GetProperty("headUnit").GetString());
        Assert.Equal("ft3/s", b.Body.GetProperty("flowUnit").GetString());
        for (int i = 0; i < 3; i++)
        {
            var pa = a.Body.GetProperty("cases")[i].GetProperty("pipes").EnumerateArray().ToArray();
            var pb = b.Body.GetProperty("cases")[i].GetProperty("pipes").EnumerateArray().ToArray();
            for (int k = 0; k < pa.Length; k++)
            {
                Assert.Equal(pa[k].GetProperty("flow").GetDouble(), pb[k].GetProperty("flow").GetDouble() * ft3, 1e-9);
                Assert.Equal(pa[k].GetProperty("velocity").GetDouble(), pb[k].GetProperty("velocity").GetDouble() * ft, 1e-8);
            }
            var ja = a.Body.GetProperty("cases")[i].GetProperty("junctions").EnumerateArray().ToArray();
            var jb = b.Body.GetProperty("cases")[i].GetProperty("junctions").EnumerateArray().ToArray();
            for (int k = 0; k < ja.Length; k++) Assert.Equal(ja[k].GetProperty("pressureHead").GetDouble(), jb[k].GetProperty("pressureHead").GetDouble() * ft, 1e-7);
        }
    }

    [Fact]
    public async Task Solve_AlperovitsShamirTwoLoop_BalancesThroughTheService()
    {
        // The data of the Core's test (AlperovitsShamirData, from memory), as a network document; diameters in inches
        // to m exactly (0.0254). References: the demands sum, 1120 m3/h, leaves the reservoir through pipe 1, and the
        // Hazen-Williams closed form on the reported flows balances both loops and every pipe's head difference.
        const double hour = 3600, inch = 0.0254;
        var doc = new JsonObject
        {
            ["junctions"] = new JsonArray(AlperovitsShamirData.Junctions.Select(j => (JsonNode)new JsonObject
            {
                ["id"] = j.Id, ["elevation"] = j.Elevation, ["demand"] = j.DemandCubicMetresPerHour / hour,
            }).ToArray()),
            ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = AlperovitsShamirData.Reservoir, ["head"] = AlperovitsShamirData.ReservoirHead }),
            ["pipes"] = new JsonArray(AlperovitsShamirData.Pipes.Select(p => (JsonNode)new JsonObject
            {
                ["id"] = p.Id, ["from"] = p.From, ["to"] = p.To, ["length"] = AlperovitsShamirData.PipeLength,
                ["diameter"] = p.Inches * inch, ["hazenWilliamsC"] = AlperovitsShamirData.HazenWilliamsC,
            }).ToArray()),
        };
        var r = await Post(doc);
        Assert.Equal(200, r.Status);
        var c = r.Body.GetProperty("cases")[0];
        Assert.Equal("solved", c.GetProperty("status").GetString());
        Assert.InRange(c.GetProperty("iterations").GetInt32(), 1, 20);
        var flows = c.GetProperty("pipes").EnumerateArray().ToDictionary(p => p.GetProperty("id").GetString()!, p => p.GetProperty("flow").GetDouble());
        Assert.Equal(1120 / hour, flows["1"], 1e-10);
        Assert.Equal(1120 / hour, c.GetProperty("totalSupply").GetDouble(), 1e-10);
        var heads = Heads(c, doc);
        double H(string id)
        {
            var p = AlperovitsShamirData.Pipes.Single(x => x.Id == id);
            return HazenHeadLoss(flows[id], AlperovitsShamirData.PipeLength, p.Inches * inch, AlperovitsShamirData.HazenWilliamsC);
        }
        foreach (var p in AlperovitsShamirData.Pipes)
            Assert.True(Math.Abs(heads[p.From] - heads[p.To] - H(p.Id)) <= 1e-9, $"energy on {p.Id}");
        foreach (var loop in AlperovitsShamirData.Loops)
            Assert.True(Math.Abs(loop.Sum(x => x.Sign * H(x.Pipe))) <= 1e-9);
    }

    public static TheoryData<string, string, string, string> BadNetworks => new()
    {
        // body fragment applied to the sample, errors key, element id the message names, what the message says
        { """{"op": "duplicate-node", "index": 10}""", "junctions[10].id", "trunk-end", "duplicate id" },
        { """{"op": "duplicate-link", "index": 2}""", "pipes[2].id", "p1", "duplicate id" },
        { """{"op": "unknown-node", "index": 3}""", "pipes[3].to", "p3", "unknown node" },
        { """{"op": "self-loop", "index": 4}""", "pipes[4].to", "p4", "to itself" },
        { """{"op": "length", "index": 5}""", "pipes[5].length", "p5", "greater than 0" },
        { """{"op": "diameter", "index": 6}""", "pipes[6].diameter", "p6", "greater than 0" },
        { """{"op": "no-roughness", "index": 7}""", "pipes[7].roughness", "p7", "required" },
        { """{"op": "pump-unknown-node", "index": 0}""", "pumps[0].from", "zemmit-booster", "unknown node" },
        { """{"op": "pump-curve", "index": 0}""", "pumps[0].curve.coefficients[0]", "zemmit-booster", "shut-off head" },
        { """{"op": "pump-speed", "index": 0}""", "pumps[0].speedRatio", "zemmit-booster", "at most 1.5" },
        { """{"op": "elevation", "index": 2}""", "junctions[2].elevation", "brook-end", "required" },
    };

    [Theory]
    [MemberData(nameof(BadNetworks))]
    public async Task Solve_InvalidElement_400NamesTheFieldAndTheElement(string change, string field, string element, string says)
    {
        var body = Sample();
        var op = JsonNode.Parse(change)!;
        int i = op["index"]!.GetValue<int>();
        var pipes = body["pipes"]!.AsArray();
        switch (op["op"]!.GetValue<string>())
        {
            case "duplicate-node": body["junctions"]!.AsArray().Add(new JsonObject { ["id"] = "trunk-end", ["elevation"] = 1 }); break;
            case "duplicate-link": pipes[i]!["id"] = "p1"; break;
            case "unknown-node": pipes[i]!["to"] = "nowhere"; break;
            case "self-loop": pipes[i]!["to"] = pipes[i]!["from"]!.GetValue<string>(); break;
            case "length": pipes[i]!["length"] = -400; break;
            case "diameter": pipes[i]!["diameter"] = 0; break;
            case "no-roughness": pipes[i]!.AsObject().Remove("roughness"); break;
            case "pump-unknown-node": body["pumps"]![i]!["from"] = "nowhere"; break;
            case "pump-curve": body["pumps"]![i]!["curve"]!["coefficients"]![0] = -5; break;
            case "pump-speed": body["pumps"]![i]!["speedRatio"] = 2; break;
            case "elevation": body["junctions"]![i]!.AsObject().Remove("elevation"); break;
        }
        var r = await Post(body);
        ProblemAssert.NamesField(r, 400, field);
        string message = string.Join(" ", r.Body.GetProperty("errors").GetProperty(field).EnumerateArray().Select(m => m.GetString()));
        Assert.Contains($"'{element}'", message);
        Assert.Contains(says, message);
        Assert.Contains(r.Body.GetProperty("elements").EnumerateArray(), e => e.GetString() == element);
        Assert.Single(r.Body.GetProperty("errors").EnumerateObject()); // only the one change is reported
    }

    [Fact]
    public async Task Solve_SeveralErrors_AllReportedAtOnce()
    {
        var body = Sample();
        body["pipes"]![0]!["length"] = 0;
        body["pipes"]![1]!["from"] = "nowhere";
        body["demandMultipliers"] = new JsonArray(1, -2);
        var r = await Post(body);
        Assert.Equal(400, r.Status);
        var keys = r.Body.GetProperty("errors").EnumerateObject().Select(e => e.Name).ToHashSet();
        Assert.Superset(new HashSet<string> { "pipes[0].length", "pipes[1].from", "demandMultipliers[1]" }, keys);
    }

    [Fact]
    public async Task Solve_NoReservoirOrNoPipes_400()
    {
        ProblemAssert.NamesField(await Post(JsonNode.Parse("""{"junctions": [{"id": "a", "elevation": 0}], "pipes": []}""")!), 400, "reservoirs");
        ProblemAssert.NamesField(await Post(JsonNode.Parse("""{"reservoirs": [{"id": "r", "head": 10}]}""")!), 400, "pipes");
    }

    [Fact]
    public async Task Solve_DisconnectedPart_422ListsTheJunctions()
    {
        var body = Sample();
        body["junctions"]!.AsArray().Add(new JsonObject { ["id"] = "island-a", ["elevation"] = 50, ["demand"] = 0.001 });
        body["junctions"]!.AsArray().Add(new JsonObject { ["id"] = "island-b", ["elevation"] = 50 });
        body["pipes"]!.AsArray().Add(new JsonObject { ["id"] = "island-pipe", ["from"] = "island-a", ["to"] = "island-b", ["length"] = 100, ["diameter"] = 0.1, ["roughness"] = 0.0001 });
        var r = await Post(body);
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal(422, r.Body.GetProperty("status").GetInt32());
        Assert.Equal("no-path-to-fixed-head", r.Body.GetProperty("networkStatus").GetString());
        Assert.Equal(["island-a", "island-b"], r.Body.GetProperty("unsuppliedJunctions").EnumerateArray().Select(e => e.GetString()!).Order().ToArray());
        Assert.Contains("island-a", r.Body.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task Solve_PumpBelowTheLift_422NamesThePump()
    {
        // A pump with H = 40 - 5000 Q^2 (shut-off 40 m) between reservoirs 60 m apart: H(Q) <= 40 < 60 for every forward
        // flow, so no duty point exists (the same case as the Core's own test).
        var body = JsonNode.Parse("""
            {"junctions": [{"id": "s", "elevation": 0}, {"id": "d", "elevation": 0}],
             "reservoirs": [{"id": "sump", "head": 0}, {"id": "tank", "head": 60}],
             "pipes": [{"id": "suction", "from": "sump", "to": "s", "length": 10, "diameter": 0.15, "roughness": 0.00005},
                       {"id": "delivery", "from": "d", "to": "tank", "length": 400, "diameter": 0.15, "roughness": 0.00005}],
             "pumps": [{"id": "weak-pump", "from": "s", "to": "d", "curve": {"coefficients": [40, 0, -5000]}}]}
            """)!;
        var r = await Post(body);
        Assert.Equal(422, r.Status);
        Assert.Equal(422, r.Body.GetProperty("status").GetInt32());
        Assert.Equal("pump-cannot-lift", r.Body.GetProperty("networkStatus").GetString());
        Assert.Contains("'weak-pump'", r.Body.GetProperty("detail").GetString());
        var pump = r.Body.GetProperty("cases")[0].GetProperty("pumps")[0];
        Assert.Equal("weak-pump", pump.GetProperty("id").GetString());
        Assert.Equal(60, pump.GetProperty("headAcross").GetDouble(), 1e-6); // the tank's head stands across the stopped pump
    }

    [Theory]
    [InlineData(-5000.0)]
    [InlineData(-500.0)]
    public async Task Solve_PumpOfHalfTheLift_422NamesThePumpInsteadOfDiverging(double c2)
    {
        // Issue 9: shut-off 20 m against a lift of 40 m through 200 mm pipes made the first Newton pass diverge (an
        // out-of-range Reynolds number, or the iteration cap with large reverse flows). H(Q) <= 20 < 40 for every forward
        // flow, so the answer is a stopped pump with the tank's 40 m across it, in every load case.
        var body = JsonNode.Parse("""
            {"junctions": [{"id": "s", "elevation": 0}, {"id": "d", "elevation": 0}],
             "reservoirs": [{"id": "sump", "head": 0}, {"id": "tank", "head": 40}],
             "pipes": [{"id": "suction", "from": "sump", "to": "s", "length": 10, "diameter": 0.2, "roughness": 0.00005},
                       {"id": "delivery", "from": "d", "to": "tank", "length": 400, "diameter": 0.2, "roughness": 0.00005}],
             "pumps": [{"id": "small-pump", "from": "s", "to": "d", "curve": {"coefficients": [20, 0, -5000]}}],
             "demandMultipliers": [1, 2]}
            """)!;
        body["pumps"]![0]!["curve"]!["coefficients"]![2] = c2;
        var r = await Post(body);
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal("pump-cannot-lift", r.Body.GetProperty("networkStatus").GetString());
        Assert.Contains("'small-pump'", r.Body.GetProperty("detail").GetString());
        var cases = r.Body.GetProperty("cases").EnumerateArray().ToArray();
        Assert.Equal(2, cases.Length);
        foreach (var c in cases)
        {
            var pump = c.GetProperty("pumps")[0];
            Assert.Equal("small-pump", pump.GetProperty("id").GetString());
            Assert.Equal(40, pump.GetProperty("headAcross").GetDouble(), 1e-6);
        }
    }

    [Fact]
    public async Task Solve_AbsurdDemand_422FlowsOutOfRange()
    {
        // 1e12 m3/s through a 100 mm pipe: Reynolds 4Q/(pi D nu) near 1e19, beyond the friction relations' 1e15.
        var body = JsonNode.Parse("""
            {"junctions": [{"id": "j", "elevation": 0, "demand": 1e12}], "reservoirs": [{"id": "r", "head": 50}],
             "pipes": [{"id": "p", "from": "r", "to": "j", "length": 100, "diameter": 0.1, "roughness": 0.00005}]}
            """)!;
        var r = await Post(body);
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal("flows-out-of-range", r.Body.GetProperty("networkStatus").GetString());
        Assert.Contains("1e15", r.Body.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task Solve_TooManyDemandMultipliers_413NamesTheLimit()
    {
        var body = Sample();
        body["demandMultipliers"] = new JsonArray(Enumerable.Repeat(1.0, 25).Select(m => (JsonNode)m).ToArray());
        var r = await Post(body);
        Assert.Equal(413, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal("networkMaxDemandMultipliers", r.Body.GetProperty("limit").GetString());
        Assert.Equal(24, r.Body.GetProperty("maximum").GetInt32());
        Assert.Contains("FlowSolve:Limits:NetworkMaxDemandMultipliers", r.Body.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task Solve_AboveTheConfiguredPipeLimit_413NamesTheLimit()
    {
        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b => b.UseSetting("FlowSolve:Limits:NetworkMaxPipes", "10"));
        using var client = factory.CreateClient();
        using var response = await client.PostAsync(Route, new StringContent(Sample().ToJsonString(), System.Text.Encoding.UTF8, "application/json"),
            TestContext.Current.CancellationToken);
        Assert.Equal(413, (int)response.StatusCode);
        using var json = JsonDocument.Parse(await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
        Assert.Equal("networkMaxPipes", json.RootElement.GetProperty("limit").GetString());
        Assert.Equal(10, json.RootElement.GetProperty("maximum").GetInt32());
        Assert.Equal(14, json.RootElement.GetProperty("given").GetInt32()); // 13 pipes and 1 pump in the sample
        Assert.Contains("FlowSolve:Limits:NetworkMaxPipes", json.RootElement.GetProperty("detail").GetString());
    }

    /// <summary>An n x n grid of junctions 100 m apart fed from one reservoir at a corner, with small demands so that
    /// nearly every pipe runs below 0.6 m/s (invented data for the warning cap, not a design).</summary>
    private static JsonObject SlowGrid(int n)
    {
        var junctions = new JsonArray();
        var pipes = new JsonArray();
        for (int i = 0; i < n; i++)
            for (int j = 0; j < n; j++)
            {
                junctions.Add(new JsonObject { ["id"] = $"j{i}-{j}", ["elevation"] = 10.0, ["demand"] = 2e-4 });
                if (i + 1 < n) pipes.Add(new JsonObject { ["id"] = $"v{i}-{j}", ["from"] = $"j{i}-{j}", ["to"] = $"j{i + 1}-{j}", ["length"] = 100.0, ["diameter"] = 0.15, ["roughness"] = 0.0001 });
                if (j + 1 < n) pipes.Add(new JsonObject { ["id"] = $"h{i}-{j}", ["from"] = $"j{i}-{j}", ["to"] = $"j{i}-{j + 1}", ["length"] = 100.0, ["diameter"] = 0.15, ["roughness"] = 0.0001 });
            }
        pipes.Add(new JsonObject { ["id"] = "supply", ["from"] = "source", ["to"] = "j0-0", ["length"] = 50.0, ["diameter"] = 0.3, ["roughness"] = 0.0001 });
        return new JsonObject
        {
            ["junctions"] = junctions, ["pipes"] = pipes,
            ["reservoirs"] = new JsonArray(new JsonObject { ["id"] = "source", ["head"] = 60.0 }),
            ["demandMultipliers"] = new JsonArray(1.0, 3.0),
            ["kinematicViscosity"] = Water,
        };
    }

    private static async Task<JsonElement> PostWith(string? warningsPerCode, JsonNode body)
    {
        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b =>
        {
            if (warningsPerCode is not null) b.UseSetting("FlowSolve:Limits:NetworkWarningsPerCode", warningsPerCode);
        });
        using var client = factory.CreateClient();
        using var response = await client.PostAsync(Route, new StringContent(body.ToJsonString(), System.Text.Encoding.UTF8, "application/json"),
            TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        using var json = JsonDocument.Parse(await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
        return json.RootElement.Clone();
    }

    [Theory]
    [InlineData(null, 50)]   // the default
    [InlineData("7", 7)]
    public async Task Solve_ManyWarningsOfOneCode_CappedPerCaseWithASummaryThatCountsTheRest(string? setting, int cap)
    {
        // The same network answered with the cap and without it (0 turns it off): the capped list is the uncapped one
        // with each code's warnings after the first cap replaced by one summary whose moreElements counts them.
        var grid = SlowGrid(10);   // 100 junctions, 181 pipes
        var capped = await PostWith(setting, grid);
        var full = await PostWith("0", grid);
        for (int c = 0; c < 2; c++)
        {
            var a = capped.GetProperty("cases")[c];
            var b = full.GetProperty("cases")[c];
            // Nothing is lost: the element tables are the same.
            Assert.Equal(b.GetProperty("pipes").GetRawText(), a.GetProperty("pipes").GetRawText());
            Assert.Equal(b.GetProperty("junctions").GetRawText(), a.GetProperty("junctions").GetRawText());

            var all = b.GetProperty("warnings").EnumerateArray().ToArray();
            var listed = a.GetProperty("warnings").EnumerateArray().ToArray();
            Assert.All(all, w => Assert.False(w.TryGetProperty("moreElements", out var m) && m.ValueKind != JsonValueKind.Null));
            bool anyOver = false;
            foreach (var group in all.GroupBy(w => w.GetProperty("code").GetString()!))
            {
                var mine = listed.Where(w => w.GetProperty("code").GetString() == group.Key).ToArray();
                int n = group.Count();
                if (n <= cap)
                {
                    Assert.Equal(group.Select(w => w.GetRawText()), mine.Select(w => w.GetRawText()));
                    continue;
                }
                anyOver = true;
                Assert.Equal(cap + 1, mine.Length);
                Assert.Equal(group.Take(cap).Select(w => w.GetRawText()), mine.Take(cap).Select(w => w.GetRawText()));
                var summary = mine[^1];
                Assert.Equal(n - cap, summary.GetProperty("moreElements").GetInt32());
                Assert.True(!summary.TryGetProperty("element", out var e) || e.ValueKind == JsonValueKind.Null);
                Assert.Contains((n - cap).ToString(CultureInfo.InvariantCulture) + " more elements", summary.GetProperty("message").GetString());
            }
            Assert.True(anyOver, "the grid should give more low-velocity warnings than the cap");

            // The count against the element table: every open pipe slower than 0.6 m/s (the design range, common
            // practice) has a velocity-below-design-range warning, listed or counted in the summary.
            int slow = a.GetProperty("pipes").EnumerateArray().Count(p =>
                p.GetProperty("status").GetString() == "open" && Math.Abs(p.GetProperty("velocity").GetDouble()) < 0.6);
            var low = listed.Where(w => w.GetProperty("code").GetString() == "velocity-below-design-range").ToArray();
            int counted = low.Count(w => w.TryGetProperty("element", out var id) && id.ValueKind == JsonValueKind.String)
                + low.Sum(w => w.TryGetProperty("moreElements", out var m) && m.ValueKind == JsonValueKind.Number ? m.GetInt32() : 0);
            Assert.Equal(slow, counted);
            Assert.True(slow > cap);
        }
    }

    [Fact]
    public async Task Solve_FormatText_400NamesFormat()
    {
        var r = await api.PostRaw(Route + "?format=text", Sample().ToJsonString(), "application/json");
        ProblemAssert.NamesField(r, 400, "format");
    }

    [Fact]
    public async Task Solve_NotABatchCalculation()
    {
        var r = await api.PostRaw("/v1/batch/networks/solve", "[" + Sample().ToJsonString() + "]", "application/json");
        Assert.Equal(404, r.Status);
    }

    [Fact]
    public async Task Sample_IsTheOpenApiExample()
    {
        // The committed sample and the documented example are one document (property: equal JSON trees).
        var example = JsonSerializer.SerializeToNode(NetworkDocs.Example, JsonSetup.Options);
        Assert.True(JsonNode.DeepEquals(example, Sample()), "samples/scenario/vandrel-network.json differs from NetworkDocs.Example");
        var doc = JsonNode.Parse(await api.Client.GetStringAsync("/openapi/v1.json", TestContext.Current.CancellationToken))!;
        var documented = doc["paths"]![Route]!["post"]!["requestBody"]!["content"]!["application/json"]!["example"];
        Assert.True(JsonNode.DeepEquals(documented, Sample()));
    }

    [Fact]
    public async Task Solve_SampleWarnings_HaveStableCodesAndNameTheirElements()
    {
        var r = await Post(Sample());
        var codes = new HashSet<string> { "velocity-below-design-range", "velocity-above-design-range", "negative-pressure", "pump-cannot-lift", "pump-outside-curve-range", "transitional-flow", "not-converged" };
        var ids = Sample()["pipes"]!.AsArray().Select(p => p!["id"]!.GetValue<string>()).ToHashSet();
        foreach (var c in r.Body.GetProperty("cases").EnumerateArray())
            foreach (var w in c.GetProperty("warnings").EnumerateArray())
            {
                Assert.Contains(w.GetProperty("code").GetString()!, codes);
                // A low-velocity warning is about a pipe whose reported |velocity| is below 0.6 m/s (common practice).
                if (w.GetProperty("code").GetString() == "velocity-below-design-range")
                {
                    string id = w.GetProperty("element").GetString()!;
                    Assert.Contains(id, ids);
                    var pipe = c.GetProperty("pipes").EnumerateArray().Single(p => p.GetProperty("id").GetString() == id);
                    Assert.True(Math.Abs(pipe.GetProperty("velocity").GetDouble()) < 0.6);
                }
                // A transitional-flow warning is about a pipe whose reported Reynolds number lies in 2000 to 4000.
                if (w.GetProperty("code").GetString() == "transitional-flow")
                {
                    string id = w.GetProperty("element").GetString()!;
                    var pipe = c.GetProperty("pipes").EnumerateArray().Single(p => p.GetProperty("id").GetString() == id);
                    Assert.InRange(pipe.GetProperty("reynolds").GetDouble(), 2000, 4000);
                }
            }
    }
}
