using System.Globalization;
using System.Text.Json.Nodes;
using FlowSolve.Api.Tests.Sensitivities;

namespace FlowSolve.Api.Tests.NonNewtonian;

/// <summary>
/// sensitivities=true on the three non-Newtonian routes: every entry against a central difference of the same
/// calculation through the service (<see cref="SensitivityHarness"/>), in every regime: the power law laminar, just
/// above the critical Reynolds number (the warned band) and turbulent; Bingham plastics at Hedstrom numbers from 1000
/// to 2e5, near the transition and close to the plug limit. Every case lies at least 1 percent in Re from the power
/// law's jump at Re_c (the harness steps by 0.1 percent), where there is no derivative.
/// </summary>
public sealed class NonNewtonianSensitivityTests(ApiFixture api)
{
    private static JsonObject J(string json) => JsonNode.Parse(json)!.AsObject();

    private const string Mud = "\"model\": \"power-law\", \"density\": 1200.0, \"consistencyIndex\": 0.5, \"flowBehaviorIndex\": 0.6";
    private const string Water = "\"model\": \"bingham-plastic\", \"density\": 1000.0, \"yieldStress\": 0.01, \"plasticViscosity\": 0.005";
    private const string Thin = "\"model\": \"bingham-plastic\", \"density\": 1100.0, \"yieldStress\": 0.2, \"plasticViscosity\": 0.004";
    private const string Slurry = "\"model\": \"bingham-plastic\", \"density\": 1100.0, \"yieldStress\": 0.5, \"plasticViscosity\": 0.01";
    private const string Paste = "\"model\": \"bingham-plastic\", \"density\": 1450.0, \"yieldStress\": 25.0, \"plasticViscosity\": 0.06";

    private async Task<JsonElementAndChecks> Check(string route, bool post, string json, int atLeast)
    {
        var harness = new SensitivityHarness(api, route, post);
        var request = J(json);
        int checks = await harness.CheckAll(request);
        Assert.True(checks >= atLeast, $"{route}: only {checks} entries checked");
        return new(await harness.Call(request, sensitivities: false), checks);
    }

    private sealed record JsonElementAndChecks(System.Text.Json.JsonElement Body, int Checks);

    private static void AssertRegime(System.Text.Json.JsonElement body, string regime, string method)
    {
        Assert.Equal(regime, body.GetProperty("regime").GetString());
        Assert.Equal(method, body.GetProperty("method").GetString());
        if (body.TryGetProperty("criticalReynolds", out var rc) && rc.ValueKind == System.Text.Json.JsonValueKind.Number)
        {
            double ratio = body.GetProperty("reynolds").GetDouble() / rc.GetDouble();
            Assert.True(Math.Abs(ratio - 1) > 0.01, $"Re/Re_c = {ratio}: too close to the jump");
        }
    }

    public static TheoryData<string, bool, string, string, string> FrictionCases() => new()
    {
        { "power-law laminar", false, "{" + Mud + ", \"velocity\": 1.0, \"diameter\": 0.1}", "laminar", "metzner-reed-laminar" },
        { "power-law warned band, turbulent side", true, "{" + Mud + ", \"velocity\": 5.8, \"diameter\": 0.1}", "turbulent", "dodge-metzner" },
        { "power-law turbulent", false, "{" + Mud + ", \"velocity\": 12.0, \"diameter\": 0.1}", "turbulent", "dodge-metzner" },
        { "bingham He 1000, turbulent", true, "{" + Water + ", \"velocity\": 3.0, \"diameter\": 0.05}", "turbulent", "darby-mun-boger" },
        { "bingham He 1000, laminar", false, "{" + Water + ", \"velocity\": 0.1, \"diameter\": 0.05}", "laminar", "darby-mun-boger" },
        { "bingham He 1.4e5, turbulent", true, "{" + Thin + ", \"velocity\": 3.0, \"diameter\": 0.1}", "turbulent", "darby-mun-boger" },
        { "bingham low He, near transition", false, "{" + Slurry + ", \"velocity\": 0.6, \"diameter\": 0.05}", "laminar", "darby-mun-boger" },
        { "bingham high He, laminar", false, "{" + Paste + ", \"velocity\": 1.7, \"diameter\": 0.15}", "laminar", "darby-mun-boger" },
        { "bingham high He, plug-like", true, "{" + Paste + ", \"velocity\": 0.05, \"diameter\": 0.15}", "laminar", "darby-mun-boger" },
    };

    [Theory]
    [MemberData(nameof(FrictionCases))]
    public async Task FrictionFactor_EveryEntryMatchesCentralDifference(string name, bool post, string json, string regime, string method)
    {
        // Two outputs (frictionFactor, reynolds) by five inputs (velocity, diameter, density and two rheology fields).
        var r = await Check("/v1/non-newtonian/friction-factor", post, json, 10);
        Assert.True(r.Checks == 10, $"{name}: {r.Checks}");
        AssertRegime(r.Body, regime, method);
    }

    public static TheoryData<string, bool, string, string> PipeCases() => new()
    {
        { "power-law laminar", false, "{" + Mud + ", \"flow\": 0.005, \"diameter\": 0.1, \"length\": 800.0, \"minorLossCoefficient\": 3.5}", "laminar" },
        { "power-law warned band, turbulent side", true, "{" + Mud + ", \"flow\": 0.047, \"diameter\": 0.1, \"length\": 800.0, \"minorLossCoefficient\": 3.5}", "turbulent" },
        { "power-law turbulent", false, "{" + Mud + ", \"flow\": 0.1, \"diameter\": 0.1, \"length\": 800.0, \"minorLossCoefficient\": 3.5}", "turbulent" },
        { "bingham He 1000, turbulent", true, "{" + Water + ", \"flow\": 0.005, \"diameter\": 0.05, \"length\": 800.0, \"minorLossCoefficient\": 3.5}", "turbulent" },
        { "bingham He 1.4e5", true, "{" + Thin + ", \"flow\": 0.02, \"diameter\": 0.1, \"length\": 800.0, \"minorLossCoefficient\": 3.5}", "turbulent" },
        { "bingham high He, laminar", false, "{" + Paste + ", \"flow\": 0.03, \"diameter\": 0.15, \"length\": 1200.0, \"minorLossCoefficient\": 4.5}", "laminar" },
        { "bingham high He, plug-like", true, "{" + Paste + ", \"flow\": 0.001, \"diameter\": 0.15, \"length\": 1200.0, \"minorLossCoefficient\": 4.5}", "laminar" },
    };

    [Theory]
    [MemberData(nameof(PipeCases))]
    public async Task HeadLoss_EveryEntryMatchesCentralDifference(string name, bool post, string json, string regime)
    {
        // Four outputs (headLoss, frictionFactor, reynolds, velocity) by seven inputs; velocity depends on flow and
        // diameter only, and its other entries are zero (checked as such by the harness).
        var r = await Check("/v1/non-newtonian/head-loss", post, json, 28);
        Assert.True(r.Checks == 28, $"{name}: {r.Checks}");
        Assert.Equal(regime, r.Body.GetProperty("regime").GetString());
    }

    [Theory]
    [MemberData(nameof(PipeCases))]
    public async Task Flow_EveryEntryMatchesCentralDifference(string name, bool post, string json, string regime)
    {
        // The head the head-loss route gives for that flow, then the inverse problem from it.
        var headLoss = J(json);
        var (status, _, body) = await api.GetJson("/v1/non-newtonian/head-loss?" + string.Join("&", headLoss.Select(p =>
            p.Key + "=" + Uri.EscapeDataString(p.Value is JsonValue v && v.TryGetValue<double>(out var d) ? d.ToString("R", CultureInfo.InvariantCulture) : p.Value!.GetValue<string>()))));
        Assert.Equal(200, status);
        var flow = (JsonObject)headLoss.DeepClone();
        flow.Remove("flow");
        flow["headLoss"] = body.GetProperty("headLoss").GetDouble();
        var r = await Check("/v1/non-newtonian/flow", post, flow.ToJsonString(), 28);
        Assert.True(r.Checks == 28, $"{name}: {r.Checks}");
        Assert.Equal(regime, r.Body.GetProperty("regime").GetString());
        Assert.Equal(headLoss["flow"]!.GetValue<double>(), r.Body.GetProperty("flow").GetDouble(), 1e-9 * headLoss["flow"]!.GetValue<double>());
    }

    [Fact]
    public async Task FlowFromHead_DerivativeInTheHeadIsTheReciprocalOfTheHeadLossDerivativeInTheFlow()
    {
        // The inverse function's derivative (a stated property): dQ/dh = 1 / (dh/dQ) at the same point.
        const string q = "model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06&diameter=0.15&length=1200&minorLossCoefficient=4.5";
        var h = await api.GetJson("/v1/non-newtonian/head-loss?" + q + "&flow=0.03&sensitivities=true");
        double head = h.Body.GetProperty("headLoss").GetDouble();
        double dhdq = h.Body.GetProperty("sensitivities").GetProperty("headLoss").GetProperty("flow").GetProperty("derivative").GetDouble();
        var f = await api.GetJson("/v1/non-newtonian/flow?" + q + "&sensitivities=true&headLoss=" + head.ToString("R", CultureInfo.InvariantCulture));
        double dqdh = f.Body.GetProperty("sensitivities").GetProperty("flow").GetProperty("headLoss").GetProperty("derivative").GetDouble();
        Assert.Equal(1 / dhdq, dqdh, 1e-9 / dhdq);
    }

    [Theory]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6&velocity=2&diameter=0.1")]
    [InlineData("/v1/non-newtonian/head-loss?model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06&flow=0.03&diameter=0.15&length=1200")]
    [InlineData("/v1/non-newtonian/flow?model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06&headLoss=80&diameter=0.15&length=1200")]
    public async Task Sensitivities_NotAskedFor_AreOmitted_AndInputsNotGivenAreNotListed(string url)
    {
        var plain = await api.GetJson(url);
        Assert.Equal(200, plain.Status);
        Assert.False(plain.Body.TryGetProperty("sensitivities", out _));
        var asked = await api.GetJson(url + "&sensitivities=true");
        var table = asked.Body.GetProperty("sensitivities");
        foreach (var output in table.EnumerateObject())
        {
            // minorLossCoefficient was not given (its default 0 is an assumption), nor a field of the other model.
            Assert.False(output.Value.TryGetProperty("minorLossCoefficient", out _));
            Assert.False(output.Value.TryGetProperty(url.Contains("power-law") ? "yieldStress" : "flowBehaviorIndex", out _));
        }
    }

    [Fact]
    public async Task Sensitivities_UsUnits_StaySi()
    {
        // The same paste line in SI and in US units (exact factors, NIST SP 811): the derivative entries are equal.
        const double ft = 0.3048, lbf = 0.45359237 * 9.80665, lbPerFt3 = 0.45359237 / (ft * ft * ft), psf = lbf / (ft * ft);
        var si = await api.GetJson("/v1/non-newtonian/head-loss?model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06&flow=0.03&diameter=0.15&length=1200&sensitivities=true");
        string us = FormattableString.Invariant(
            $"/v1/non-newtonian/head-loss?units=us&model=bingham-plastic&density={1450 / lbPerFt3:R}&yieldStress={25 / psf:R}&plasticViscosity={0.06 / psf:R}&flow={0.03 / (ft * ft * ft):R}&diameter={0.15 / ft:R}&length={1200 / ft:R}&sensitivities=true");
        var u = await api.GetJson(us);
        Assert.Equal(200, u.Status);
        foreach (string input in new[] { "flow", "diameter", "yieldStress", "plasticViscosity", "density" })
        {
            double a = si.Body.GetProperty("sensitivities").GetProperty("headLoss").GetProperty(input).GetProperty("derivative").GetDouble();
            double b = u.Body.GetProperty("sensitivities").GetProperty("headLoss").GetProperty(input).GetProperty("derivative").GetDouble();
            Assert.Equal(a, b, Math.Abs(a) * 1e-9);
        }
    }

    [Fact]
    public async Task Sensitivities_TextSelectsOneEntry_AndTheSheetShowsTheTable()
    {
        const string url = "/v1/non-newtonian/flow?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6&headLoss=25&diameter=0.1&length=350&sensitivities=true";
        var json = await api.GetJson(url);
        double expected = json.Body.GetProperty("sensitivities").GetProperty("flow").GetProperty("flowBehaviorIndex").GetProperty("derivative").GetDouble();
        string text = await api.Client.GetStringAsync(url + "&format=text&select=sensitivities.flow.flowBehaviorIndex.derivative", TestContext.Current.CancellationToken);
        Assert.Equal(expected, double.Parse(text, CultureInfo.InvariantCulture));
        string html = await api.Client.GetStringAsync(url + "&format=html", TestContext.Current.CancellationToken);
        Assert.Contains("id=\"sensitivities\"", html);
        Assert.Contains("<td>flow</td><td>flowBehaviorIndex</td>", html);
    }

    [Theory]
    [InlineData("model=power-law&density=1e5&consistencyIndex=1e-300&flowBehaviorIndex=0.01&velocity=1e4&diameter=100")]
    [InlineData("model=bingham-plastic&density=1e-300&yieldStress=1e6&plasticViscosity=1e-300&velocity=1e-300&diameter=1e-6")]
    [InlineData("model=bingham-plastic&density=1e5&yieldStress=1e6&plasticViscosity=5e-324&velocity=1e4&diameter=100")]
    [InlineData("model=power-law&density=5e-324&consistencyIndex=1e6&flowBehaviorIndex=2&velocity=5e-324&diameter=1e-6")]
    [InlineData("model=bingham-plastic&density=1450&yieldStress=0&plasticViscosity=0.06&velocity=2&diameter=0.1")]
    public async Task Sensitivities_Extremes_FiniteNumbersOrAProblem_NeverA5xx(string query)
    {
        foreach (string url in new[]
                 {
                     "/v1/non-newtonian/friction-factor?" + query,
                     "/v1/non-newtonian/head-loss?" + query.Replace("velocity", "flow") + "&length=1e7&minorLossCoefficient=1e6",
                     "/v1/non-newtonian/flow?" + query.Replace("velocity", "headLoss") + "&length=1e7&minorLossCoefficient=1e6",
                 })
        {
            var r = await api.GetJson(url + "&sensitivities=true");
            Assert.True(r.Status is 200 or 400 or 422, $"{url}: {r.Status}: {r.Body}");
            if (r.Status == 200) Assert.DoesNotContain("NaN", r.Body.ToString());
        }
    }

    [Fact]
    public async Task Sensitivities_YieldStressZero_IsTheFirstOrderBuckinghamTerm()
    {
        // A Bingham plastic without yield stress in laminar flow: f = 64/Re (Darcy) and, to first order in He,
        // f_L = (16/Re)(1 + He/(6 Re)), so d(frictionFactor)/d(yieldStress) = f (rho D^2/mu^2) / (6 Re) (Buckingham-Reiner's
        // expansion; the turbulent part of the combination is below 1e-3 of it here).
        double rho = 1000, mu = 0.5, v = 0.5, d = 0.05, re = rho * v * d / mu;
        var r = await api.GetJson(FormattableString.Invariant(
            $"/v1/non-newtonian/friction-factor?model=bingham-plastic&density={rho}&yieldStress=0&plasticViscosity={mu}&velocity={v}&diameter={d}&sensitivities=true"));
        Assert.Equal(200, r.Status);
        double f = r.Body.GetProperty("frictionFactor").GetDouble();
        Assert.Equal(64 / re, f, 1e-3 * f);
        double derivative = r.Body.GetProperty("sensitivities").GetProperty("frictionFactor").GetProperty("yieldStress").GetProperty("derivative").GetDouble();
        double expected = f * (rho * d * d / (mu * mu)) / (6 * re);
        Assert.Equal(expected, derivative, 1e-3 * expected);
        // The elasticity of an input that is zero is absent.
        Assert.False(r.Body.GetProperty("sensitivities").GetProperty("frictionFactor").GetProperty("yieldStress").TryGetProperty("elasticity", out var e)
            && e.ValueKind == System.Text.Json.JsonValueKind.Number);
    }

    [Fact]
    public async Task Sensitivities_Batch_RefusedByName_AndNoColumnInCsv()
    {
        // Batches never carry sensitivities: asking is a 400 naming the option (not silently ignored), and the CSV
        // answer has no sensitivity column.
        const string csvBody = "model,density,yieldStress,plasticViscosity,headLoss,diameter,length\r\nbingham-plastic,1450,25,0.06,80,0.15,1200\r\n";
        var refused = await api.PostRaw("/v1/batch/non-newtonian/flow?sensitivities=true", csvBody, "text/csv");
        ProblemAssert.NamesField(refused, 400, "sensitivities");
        using var content = new StringContent(csvBody, System.Text.Encoding.UTF8, "text/csv");
        using var response = await api.Client.PostAsync("/v1/batch/non-newtonian/flow", content, TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        string header = (await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken)).Split("\r\n")[0];
        Assert.Contains("flow", header.Split(','));
        Assert.DoesNotContain("sensitivities", header);
    }
}
