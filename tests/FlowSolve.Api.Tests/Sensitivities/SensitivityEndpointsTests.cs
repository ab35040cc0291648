using System.Text.Json;
using System.Text.Json.Nodes;

namespace FlowSolve.Api.Tests.Sensitivities;

/// <summary>
/// sensitivities=true on every calculation: each entry against a central difference of the same calculation through
/// the service (<see cref="SensitivityHarness"/>), over several cases per calculation; the elasticities as
/// derivative x input / output; the roughness spread against direct calls at the ends of its range (new and aged, the
/// table's stated uncertainty, or the caller's agedRoughness).
/// </summary>
public sealed class SensitivityEndpointsTests(ApiFixture api)
{
    private static JsonObject J(string json) => JsonNode.Parse(json)!.AsObject();

    private async Task Check(string url, bool post, string json, int atLeast, string prefix = "", IReadOnlyDictionary<string, double>? steps = null)
    {
        int checks = await new SensitivityHarness(api, url, post, prefix).CheckAll(J(json), steps);
        Assert.True(checks >= atLeast, $"{url}: only {checks} entries checked");
    }

    public static TheoryData<bool, string> Friction => new()
    {
        { false, """{"reynolds": 100000.0, "relativeRoughness": 0.001}""" },   // Colebrook-White
        { true, """{"reynolds": 1500.0, "relativeRoughness": 0.01}""" },       // laminar
        { false, """{"reynolds": 3000.0, "relativeRoughness": 0.002}""" },     // transition (Churchill)
        { true, """{"reynolds": 250000.0, "roughness": 0.00026, "diameter": 0.3, "method": "haaland"}""" },
        { false, """{"reynolds": 250000.0, "relativeRoughness": 0.0005, "method": "serghides"}""" },
        { false, """{"reynolds": 250000.0, "relativeRoughness": 0.0005, "method": "swamee-jain"}""" },
    };

    [Theory]
    [MemberData(nameof(Friction))]
    public Task FrictionFactor_EveryEntryMatchesCentralDifference(bool post, string json) =>
        Check("/v1/friction-factor", post, json, 2);

    [Theory]
    [InlineData(5.0)]
    [InlineData(20.0)]
    [InlineData(65.0)]
    [InlineData(99.99)]
    public Task Water_EveryEntryMatchesCentralDifference(double celsius) =>
        Check("/v1/fluids/water", false, $$"""{"temperature": {{celsius.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}}}""", 4,
            steps: new Dictionary<string, double> { ["temperature"] = 1e-3 });

    // Turbulent with fittings and water by temperature; turbulent with a given viscosity; transitional; laminar oil.
    public static TheoryData<bool, string> HeadLoss => new()
    {
        { false, """{"flow": 0.05, "diameter": 0.2, "length": 500.0, "roughness": 0.00026, "minorLossCoefficient": 2.5, "temperature": 15.0}""" },
        { true, """{"flow": 0.2, "diameter": 0.2, "length": 500.0, "roughness": 0.00026, "minorLossCoefficient": 1.0, "kinematicViscosity": 1e-5, "density": 900.0}""" },
        { false, """{"flow": 0.00024, "diameter": 0.1, "length": 50.0, "roughness": 0.00001, "minorLossCoefficient": 1.0, "kinematicViscosity": 1e-6}""" },
        { true, """{"flow": 0.0002, "diameter": 0.05, "length": 30.0, "roughness": 0.00005, "minorLossCoefficient": 0.5, "kinematicViscosity": 1e-4}""" },
    };

    [Theory]
    [MemberData(nameof(HeadLoss))]
    public Task PipeHeadLoss_EveryEntryMatchesCentralDifference(bool post, string json) =>
        Check("/v1/pipes/head-loss", post, json, 24);

    public static TheoryData<bool, string> Flow => new()
    {
        { false, """{"headLoss": 20.0, "diameter": 0.15, "length": 800.0, "roughness": 0.000045, "minorLossCoefficient": 3.0, "elevationChange": 5.0, "temperature": 10.0}""" },
        { true, """{"headLoss": 30.0, "diameter": 0.5, "length": 3000.0, "roughness": 0.0003, "minorLossCoefficient": 2.5, "elevationChange": -4.0, "kinematicViscosity": 1.2e-6}""" },
        { false, """{"headLoss": 0.5, "diameter": 0.05, "length": 30.0, "roughness": 0.00005, "minorLossCoefficient": 0.5, "elevationChange": 0.1, "kinematicViscosity": 1e-4}""" },
    };

    [Theory]
    [MemberData(nameof(Flow))]
    public Task PipeFlow_EveryEntryMatchesCentralDifference(bool post, string json) =>
        Check("/v1/pipes/flow", post, json, 28);

    public static TheoryData<bool, string> Diameter => new()
    {
        { false, """{"flow": 0.03, "headLoss": 6.0, "length": 400.0, "roughness": 0.000046, "minorLossCoefficient": 2.0, "elevationChange": 1.5, "temperature": 25.0}""" },
        { true, """{"flow": 0.3, "headLoss": 12.0, "length": 2000.0, "roughness": 0.00026, "minorLossCoefficient": 4.0, "elevationChange": -2.0, "kinematicViscosity": 1.1e-6}""" },
        { false, """{"flow": 0.0002, "headLoss": 0.5, "length": 30.0, "roughness": 0.00005, "minorLossCoefficient": 0.5, "elevationChange": 0.1, "kinematicViscosity": 1e-4}""" },
    };

    [Theory]
    [MemberData(nameof(Diameter))]
    public Task PipeDiameter_EveryEntryMatchesCentralDifference(bool post, string json) =>
        Check("/v1/pipes/diameter", post, json, 28);

    public static TheoryData<bool, string, int> Normal => new()
    {
        { false, """{"shape": "trapezoidal", "bottomWidth": 3.0, "sideSlope": 2.0, "manningN": 0.025, "slope": 0.001, "flow": 10.0}""", 15 },
        { false, """{"shape": "trapezoidal", "bottomWidth": 3.0, "leftSideSlope": 2.0, "rightSideSlope": 1.5, "manningN": 0.025, "slope": 0.001, "flow": 10.0}""", 18 },
        { true, """{"section": {"shape": "circular", "diameter": 1.2}, "manningN": 0.013, "slope": 0.002, "flow": 1.1}""", 12 },
        { false, """{"shape": "circular", "diameter": 1.2, "manningN": 0.013, "slope": 0.002, "flow": 0.3}""", 12 },
        { true, """{"section": {"shape": "rectangular", "bottomWidth": 4.0}, "manningN": 0.015, "slope": 0.0005, "flow": 12.0}""", 12 },
        { false, """{"shape": "triangular", "sideSlope": 1.5, "manningN": 0.02, "slope": 0.01, "flow": 0.5}""", 12 },
        { false, """{"shape": "surveyed", "points": "0:2,4:0,7:0,11:2", "manningN": 0.03, "slope": 0.001, "flow": 3.0}""", 9 },
    };

    [Theory]
    [MemberData(nameof(Normal))]
    public Task NormalDepth_EveryEntryMatchesCentralDifference(bool post, string json, int atLeast) =>
        Check("/v1/channels/normal-depth", post, json, atLeast);

    public static TheoryData<bool, string, int> Critical => new()
    {
        { false, """{"shape": "rectangular", "bottomWidth": 4.0, "flow": 12.0}""", 4 },
        { true, """{"section": {"shape": "trapezoidal", "bottomWidth": 2.0, "leftSideSlope": 1.0, "rightSideSlope": 3.0}, "flow": 8.0}""", 8 },
        { false, """{"shape": "circular", "diameter": 1.0, "flow": 0.6}""", 4 },
        { true, """{"section": {"shape": "triangular", "sideSlope": 2.0}, "flow": 1.5}""", 4 },
    };

    [Theory]
    [MemberData(nameof(Critical))]
    public Task CriticalDepth_EveryEntryMatchesCentralDifference(bool post, string json, int atLeast) =>
        Check("/v1/channels/critical-depth", post, json, atLeast);

    public static TheoryData<bool, string, int> Jump => new()
    {
        { false, """{"shape": "rectangular", "bottomWidth": 3.0, "flow": 15.0, "upstreamDepth": 0.6}""", 4 },
        { true, """{"section": {"shape": "trapezoidal", "bottomWidth": 2.0, "sideSlope": 1.5}, "flow": 10.0, "upstreamDepth": 0.3}""", 4 },
        { false, """{"shape": "circular", "diameter": 1.5, "flow": 1.2, "upstreamDepth": 0.3}""", 4 },
    };

    [Theory]
    [MemberData(nameof(Jump))]
    public Task HydraulicJump_EveryEntryMatchesCentralDifference(bool post, string json, int atLeast) =>
        Check("/v1/channels/hydraulic-jump", post, json, atLeast);

    public static TheoryData<bool, string, int> Duty => new()
    {
        { false, """{"c0": 40.0, "c1": 10.0, "c2": -5000.0, "staticHead": 15.0, "resistance": 3000.0, "speedRatio": 0.95, "kinematicViscosity": 1e-6, "density": 998.0}""", 12 },
        { false, """{"c0": 45.0, "c1": 20.0, "c2": -900.0, "c3": -2000.0, "staticHead": 12.0, "length": 400.0, "diameter": 0.2, "roughness": 0.000046, "minorLossCoefficient": 3.0, "speedRatio": 1.05, "temperature": 15.0}""", 20 },
        { true, """{"pump": {"coefficients": [45.0, 20.0, -900.0]}, "system": {"staticHead": 12.0, "resistance": 50.0, "pipes": [{"length": 400.0, "diameter": 0.2, "roughness": 0.000046, "minorLossCoefficient": 3.0}, {"length": 150.0, "diameter": 0.15, "roughness": 0.00015, "minorLossCoefficient": 1.0}]}, "pumpsInParallel": 2, "speedRatio": 0.9, "kinematicViscosity": 1.3e-6, "density": 998.0}""", 30 },
    };

    [Theory]
    [MemberData(nameof(Duty))]
    public Task DutyPoint_EveryEntryMatchesCentralDifference(bool post, string json, int atLeast) =>
        Check("/v1/pumps/duty-point", post, json, atLeast);

    [Fact]
    public Task PumpCurves_DutyPointEntriesMatchCentralDifference() =>
        Check("/v1/pumps/curves", true, """{"pump": {"coefficients": [40.0, 0.0, -5000.0]}, "system": {"staticHead": 15.0, "resistance": 3000.0}, "speedRatio": 1.1, "kinematicViscosity": 1e-6, "density": 998.0}""",
            8, prefix: "dutyPoint", steps: new Dictionary<string, double> { ["pump.coefficients[1]"] = 1e-4 });

    [Theory]
    [InlineData("/v1/pipes/head-loss", "flow=0.05&diameter=0.2&length=500&material=commercial-steel", "headLoss")]
    [InlineData("/v1/pipes/flow", "headLoss=20&diameter=0.15&length=800&material=commercial-steel", "flow")]
    [InlineData("/v1/pipes/diameter", "flow=0.03&headLoss=6&length=400&material=commercial-steel", "diameter")]
    [InlineData("/v1/pipes/head-loss", "flow=0.05&diameter=0.2&length=500&material=commercial-steel&surfaceCondition=aged", "headLoss")]
    public async Task RoughnessSpread_EndsEqualDirectCallsAtNewAndAgedRoughness(string url, string query, string output)
    {
        var (status, _, body) = await api.GetJson(url + "?" + query + "&sensitivities=true");
        Assert.Equal(200, status);
        var spread = body.GetProperty("roughnessSpread");
        Assert.Equal(output, spread.GetProperty("output").GetString());
        double low = spread.GetProperty("low").GetDouble(), high = spread.GetProperty("high").GetDouble();
        double answer = body.GetProperty(output).GetDouble();
        Assert.True(low <= answer && answer <= high, $"{low} <= {answer} <= {high}");
        // The table's values (commercial steel new 0.046 mm, rusted 2.0 mm: roughness.json, White Table 6.1, from memory).
        Assert.Equal(0.046e-3, spread.GetProperty("newRoughness").GetDouble(), 1e-15);
        Assert.Equal(2.0e-3, spread.GetProperty("agedRoughness").GetDouble(), 1e-15);
        string baseQuery = string.Join("&", query.Split('&').Where(p => !p.StartsWith("material=") && !p.StartsWith("surfaceCondition=")));
        foreach (var (e, key) in new[] { (0.046e-3, "atNew"), (2.0e-3, "atAged") })
        {
            var (s2, _, direct) = await api.GetJson(url + "?" + baseQuery + "&roughness=" + e.ToString("R", System.Globalization.CultureInfo.InvariantCulture));
            Assert.Equal(200, s2);
            double value = direct.GetProperty(output).GetDouble();
            Assert.Equal(value, spread.GetProperty(key).GetDouble(), Math.Abs(value) * 1e-12);
        }
        Assert.Equal(Math.Min(spread.GetProperty("atNew").GetDouble(), spread.GetProperty("atAged").GetDouble()), low);
        Assert.Equal(Math.Max(spread.GetProperty("atNew").GetDouble(), spread.GetProperty("atAged").GetDouble()), high);
        Assert.Equal("new-to-aged", spread.GetProperty("basis").GetString());
        Assert.Equal(0.046e-3, spread.GetProperty("lowRoughness").GetDouble(), 1e-15);
        Assert.Equal(2.0e-3, spread.GetProperty("highRoughness").GetDouble(), 1e-15);
    }

    [Fact]
    public async Task RoughnessSpread_MaterialWithNeitherAgedValueNorUncertainty_IsOmittedWithAWarning()
    {
        // Smooth glass: the table states neither an aged value nor an uncertainty (White, Table 6.1, from memory).
        var (status, _, body) = await api.GetJson("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=glass&sensitivities=true");
        Assert.Equal(200, status);
        Assert.False(body.TryGetProperty("roughnessSpread", out _));
        Assert.True(body.TryGetProperty("sensitivities", out _));
        Assert.Contains(body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "roughness-spread-unavailable");
    }

    private static string Q(double x) => x.ToString("R", System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>The same request with the roughness given directly instead of by material (and agedRoughness dropped).</summary>
    private async Task<double> Direct(string url, string query, string output, double roughness)
    {
        string baseQuery = string.Join("&", query.Split('&').Where(p =>
            !p.StartsWith("material=") && !p.StartsWith("surfaceCondition=") && !p.StartsWith("roughness=") && !p.StartsWith("agedRoughness=")));
        var (status, _, direct) = await api.GetJson(url + "?" + baseQuery + "&roughness=" + Q(roughness));
        Assert.Equal(200, status);
        return direct.GetProperty(output).GetDouble();
    }

    private static void AssertBand(JsonElement body, JsonElement spread, string output, double atLow, double atHigh)
    {
        double low = spread.GetProperty("low").GetDouble(), high = spread.GetProperty("high").GetDouble();
        double answer = body.GetProperty(output).GetDouble();
        Assert.Equal(atLow, spread.GetProperty("atLowRoughness").GetDouble(), Math.Abs(atLow) * 1e-12);
        Assert.Equal(atHigh, spread.GetProperty("atHighRoughness").GetDouble(), Math.Abs(atHigh) * 1e-12);
        Assert.Equal(Math.Min(atLow, atHigh), low, Math.Abs(low) * 1e-12);
        Assert.Equal(Math.Max(atLow, atHigh), high, Math.Abs(high) * 1e-12);
        // The answer is monotonic in the roughness, so it lies inside the band whose end or interior it was computed at.
        Assert.True(low <= answer && answer <= high, $"{low} <= {answer} <= {high}");
    }

    [Theory]
    // White, Fluid Mechanics, Table 6.1 (from memory): cast iron, new, 0.26 mm plus or minus 50 percent; wrought iron,
    // new, 0.046 mm plus or minus 20 percent; concrete, rough, 2.0 mm plus or minus 50 percent.
    [InlineData("/v1/pipes/head-loss", "flow=0.05&diameter=0.2&length=500&material=cast-iron", "headLoss", 0.26e-3, 50.0)]
    [InlineData("/v1/pipes/flow", "headLoss=20&diameter=0.15&length=800&material=wrought-iron", "flow", 0.046e-3, 20.0)]
    [InlineData("/v1/pipes/diameter", "flow=0.03&headLoss=6&length=400&material=cast-iron", "diameter", 0.26e-3, 50.0)]
    [InlineData("/v1/pipes/flow", "headLoss=3&diameter=0.6&length=200&material=rough-concrete", "flow", 2.0e-3, 50.0)]
    public async Task RoughnessSpread_NoAgedValue_SpansTheTablesStatedUncertainty(string url, string query, string output,
        double tableNew, double percent)
    {
        var (status, _, body) = await api.GetJson(url + "?" + query + "&sensitivities=true");
        Assert.Equal(200, status);
        var spread = body.GetProperty("roughnessSpread");
        Assert.Equal("stated-uncertainty", spread.GetProperty("basis").GetString());
        Assert.Equal(percent, spread.GetProperty("uncertaintyPercent").GetDouble());
        double eLow = tableNew * (1 - percent / 100), eHigh = tableNew * (1 + percent / 100);
        Assert.Equal(eLow, spread.GetProperty("lowRoughness").GetDouble(), 1e-15);
        Assert.Equal(eHigh, spread.GetProperty("highRoughness").GetDouble(), 1e-15);
        Assert.Equal(tableNew, spread.GetProperty("newRoughness").GetDouble(), 1e-15);
        Assert.True(!spread.TryGetProperty("agedRoughness", out var aged) || aged.ValueKind == JsonValueKind.Null);
        double atNew = await Direct(url, query, output, tableNew);
        Assert.Equal(atNew, spread.GetProperty("atNew").GetDouble(), Math.Abs(atNew) * 1e-12);
        AssertBand(body, spread, output, await Direct(url, query, output, eLow), await Direct(url, query, output, eHigh));
        Assert.Contains(body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "roughness-spread-table-uncertainty");
    }

    [Theory]
    [InlineData("/v1/pipes/head-loss", "flow=0.05&diameter=0.2&length=500&material=cast-iron&agedRoughness=0.0015", "headLoss", 0.26e-3, 1.5e-3)]
    [InlineData("/v1/pipes/flow", "headLoss=20&diameter=0.15&length=800&roughness=0.0001&agedRoughness=0.0008", "flow", 1e-4, 8e-4)]
    [InlineData("/v1/pipes/diameter", "flow=0.03&headLoss=6&length=400&material=commercial-steel&agedRoughness=0.0005", "diameter", 0.046e-3, 5e-4)]
    [InlineData("/v1/pipes/head-loss", "flow=0.05&diameter=0.2&length=500&material=glass&agedRoughness=0.00002", "headLoss", 0.0, 2e-5)]
    public async Task RoughnessSpread_CallerAged_RunsFromTheRoughnessUsedToTheGivenValue(string url, string query, string output,
        double start, double aged)
    {
        // The start is the roughness the answer used: the table's new value (cast iron 0.26 mm, commercial steel
        // 0.046 mm, glass 0: White, Table 6.1, from memory) or the given roughness.
        var (status, _, body) = await api.GetJson(url + "?" + query + "&sensitivities=true");
        Assert.Equal(200, status);
        var spread = body.GetProperty("roughnessSpread");
        Assert.Equal("caller-aged", spread.GetProperty("basis").GetString());
        Assert.Equal(start, spread.GetProperty("newRoughness").GetDouble(), 1e-15);
        Assert.Equal(aged, spread.GetProperty("agedRoughness").GetDouble(), 1e-15);
        double atStart = await Direct(url, query, output, start), atAged = await Direct(url, query, output, aged);
        Assert.Equal(atStart, spread.GetProperty("atNew").GetDouble(), Math.Abs(atStart) * 1e-12);
        Assert.Equal(atAged, spread.GetProperty("atAged").GetDouble(), Math.Abs(atAged) * 1e-12);
        AssertBand(body, spread, output, atStart, atAged);
        Assert.DoesNotContain(body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString()!.StartsWith("roughness-spread"));
    }

    [Fact]
    public async Task RoughnessSpread_CallerAgedInUsUnits_IsInFeet()
    {
        // The same pipe in SI and in US units (exact foot, NIST SP 811): the aged end converts, the answers agree.
        const double ft = 0.3048;
        var si = await api.GetJson("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=cast-iron&agedRoughness=0.0015&sensitivities=true");
        var us = await api.GetJson(FormattableString.Invariant(
            $"/v1/pipes/head-loss?units=us&flow={0.05 / (ft * ft * ft):R}&diameter={0.2 / ft:R}&length={500 / ft:R}&material=cast-iron&agedRoughness={0.0015 / ft:R}&sensitivities=true"));
        Assert.Equal(200, us.Status);
        var a = si.Body.GetProperty("roughnessSpread");
        var b = us.Body.GetProperty("roughnessSpread");
        Assert.Equal(0.0015 / ft, b.GetProperty("agedRoughness").GetDouble(), 1e-12);
        Assert.Equal(a.GetProperty("atAged").GetDouble() / ft, b.GetProperty("atAged").GetDouble(), a.GetProperty("atAged").GetDouble() / ft * 1e-9);
    }

    [Theory]
    [InlineData("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=cast-iron&agedRoughness=NaN")]
    [InlineData("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=cast-iron&agedRoughness=Infinity")]
    [InlineData("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=cast-iron&agedRoughness=1e309")]
    [InlineData("/v1/pipes/flow?headLoss=20&diameter=0.15&length=800&roughness=0.0001&agedRoughness=-0.001")]
    [InlineData("/v1/pipes/flow?headLoss=20&diameter=0.15&length=800&roughness=0.0001&agedRoughness=0.15")]
    [InlineData("/v1/pipes/diameter?flow=0.03&headLoss=6&length=400&material=cast-iron&agedRoughness=2")]
    [InlineData("/v1/pipes/diameter?flow=0.03&headLoss=6&length=400&material=cast-iron&agedRoughness=abc")]
    public async Task AgedRoughness_Invalid_Is400NamingTheField(string url)
    {
        var (status, type, body) = await api.GetJson(url + "&sensitivities=true");
        Assert.Equal(400, status);
        Assert.Equal("application/problem+json", type);
        Assert.True(body.GetProperty("errors").TryGetProperty("agedRoughness", out _), body.ToString());
    }

    [Fact]
    public async Task AgedRoughness_NegativeInJsonBody_Is400NamingTheField()
    {
        var (status, _, body) = await api.PostRaw("/v1/pipes/head-loss?sensitivities=true",
            """{"flow": 0.05, "diameter": 0.2, "length": 500, "material": "cast-iron", "agedRoughness": -1e-4}""", "application/json");
        Assert.Equal(400, status);
        Assert.True(body.GetProperty("errors").TryGetProperty("agedRoughness", out _), body.ToString());
    }

    [Theory]
    [InlineData("/v1/friction-factor?reynolds=1e5&relativeRoughness=0.001")]
    [InlineData("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=commercial-steel")]
    [InlineData("/v1/channels/normal-depth?shape=rectangular&bottomWidth=4&manningN=0.015&slope=0.001&flow=12")]
    [InlineData("/v1/fluids/water?temperature=20")]
    [InlineData("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=commercial-steel&sensitivities=false")]
    public async Task Sensitivities_NotAskedFor_AreOmitted(string url)
    {
        var (status, _, body) = await api.GetJson(url);
        Assert.Equal(200, status);
        Assert.False(body.TryGetProperty("sensitivities", out _));
        Assert.False(body.TryGetProperty("roughnessSpread", out _));
    }

    [Fact]
    public async Task Sensitivities_NotABoolean_Is400NamingTheParameter()
    {
        var (status, type, body) = await api.GetJson("/v1/friction-factor?reynolds=1e5&relativeRoughness=0.001&sensitivities=maybe");
        Assert.Equal(400, status);
        Assert.Equal("application/problem+json", type);
        Assert.True(body.GetProperty("errors").TryGetProperty("sensitivities", out _), body.ToString());
    }

    [Fact]
    public async Task Sensitivities_HazenWilliams_AreLeftOutWithAWarning()
    {
        var (status, _, body) = await api.GetJson("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&roughness=0.0001&method=hazen-williams&hazenWilliamsC=120&sensitivities=true");
        Assert.Equal(200, status);
        Assert.False(body.TryGetProperty("sensitivities", out _));
        Assert.Contains(body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "sensitivities-unavailable");
    }

    [Fact]
    public async Task Sensitivities_UsUnits_StaySi()
    {
        // The same pipe in SI and in US units: the derivative entries are equal (SI in both), the headLoss field is not.
        var si = await api.GetJson("/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&roughness=0.00026&kinematicViscosity=1e-6&sensitivities=true");
        const double ft = 0.3048;
        string us = FormattableString.Invariant($"/v1/pipes/head-loss?units=us&flow={0.05 / (ft * ft * ft):R}&diameter={0.2 / ft:R}&length={500 / ft:R}&roughness={0.00026 / ft:R}&kinematicViscosity={1e-6 / (ft * ft):R}&sensitivities=true");
        var u = await api.GetJson(us);
        double a = si.Body.GetProperty("sensitivities").GetProperty("headLoss").GetProperty("flow").GetProperty("derivative").GetDouble();
        double b = u.Body.GetProperty("sensitivities").GetProperty("headLoss").GetProperty("flow").GetProperty("derivative").GetDouble();
        Assert.Equal(a, b, Math.Abs(a) * 1e-9);
    }

    [Fact]
    public async Task Sensitivities_TextFormatSelectsOneEntry_AndTheSheetShowsTheTable()
    {
        const string url = "/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=500&material=commercial-steel&sensitivities=true";
        var json = await api.GetJson(url);
        double expected = json.Body.GetProperty("sensitivities").GetProperty("headLoss").GetProperty("flow").GetProperty("derivative").GetDouble();
        string text = await api.Client.GetStringAsync(url + "&format=text&select=sensitivities.headLoss.flow.derivative", TestContext.Current.CancellationToken);
        Assert.Equal(expected, double.Parse(text, System.Globalization.CultureInfo.InvariantCulture));
        string html = await api.Client.GetStringAsync(url + "&format=html", TestContext.Current.CancellationToken);
        Assert.Contains("id=\"sensitivities\"", html);
        Assert.Contains("id=\"roughness-spread\"", html);
        Assert.Contains("<td>headLoss</td><td>flow</td>", html);
    }

    [Fact]
    public async Task Sensitivities_BatchCsv_NoColumnsAndNoObjects()
    {
        // Batches never ask for sensitivities: asking is refused (not silently ignored), the CSV header has no sensitivity or
        // spread column, and JSON rows carry neither.
        var refused = await api.PostRaw("/v1/batch/pipes/head-loss?sensitivities=true", "flow,diameter,length,material\r\n0.05,0.2,500,commercial-steel\r\n", "text/csv");
        ProblemAssert.NamesField(refused, 400, "sensitivities");
        using var content = new StringContent("flow,diameter,length,material\r\n0.05,0.2,500,commercial-steel\r\n", System.Text.Encoding.UTF8, "text/csv");
        using var response = await api.Client.PostAsync("/v1/batch/pipes/head-loss", content, TestContext.Current.CancellationToken);
        string csv = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        string header = csv.Split("\r\n")[0];
        Assert.Contains("headLoss", header.Split(','));
        Assert.DoesNotContain("sensitivities", header);
        Assert.DoesNotContain("roughnessSpread", header);
        var (status, _, json) = await api.PostRaw("/v1/batch/pipes/head-loss",
            """[{"flow": 0.05, "diameter": 0.2, "length": 500, "material": "commercial-steel"}]""", "application/json");
        Assert.Equal(200, status);
        Assert.False(json[0].GetProperty("result").TryGetProperty("sensitivities", out _));
    }
}
