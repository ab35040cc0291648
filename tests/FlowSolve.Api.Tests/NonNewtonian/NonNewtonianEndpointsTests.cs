using System.Text.Json;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Api.Tests.NonNewtonian;

public sealed class NonNewtonianEndpointsTests(ApiFixture api)
{
    private const double G = 9.80665;
    private const string PowerLaw = "model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6";
    private const string Bingham = "model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06";

    /// <summary>Dodge-Metzner in its published Fanning form, solved by MathNet's Brent.</summary>
    private static double BrentDodgeMetzner(double re, double n) =>
        Brent.FindRoot(f => 1 / Math.Sqrt(f) - 4.0 / Math.Pow(n, 0.75) * Math.Log10(re * Math.Pow(f, 1 - n / 2)) + 0.4 / Math.Pow(n, 1.2),
            1e-7, 0.5, 1e-18, 1000);

    private static double MetznerReed(double rho, double k, double n, double v, double d) =>
        rho * Math.Pow(v, 2 - n) * Math.Pow(d, n) / (k * Math.Pow(8, n - 1) * Math.Pow((3 * n + 1) / (4 * n), n));

    [Fact]
    public async Task FrictionFactor_PowerLawTurbulent_IsDodgeMetznerByBrent()
    {
        var r = await api.GetJson($"/v1/non-newtonian/friction-factor?{PowerLaw}&velocity=4&diameter=0.1");
        Assert.Equal(200, r.Status);
        double re = MetznerReed(1200, 0.5, 0.6, 4, 0.1);
        Assert.Equal(re, r.Body.GetProperty("reynolds").GetDouble(), 1e-12 * re);
        double fanning = BrentDodgeMetzner(re, 0.6);
        Assert.Equal(fanning, r.Body.GetProperty("fanningFrictionFactor").GetDouble(), 1e-12 * fanning);
        Assert.Equal(4 * fanning, r.Body.GetProperty("frictionFactor").GetDouble(), 4e-12 * fanning);
        Assert.Equal("turbulent", r.Body.GetProperty("regime").GetString());
        Assert.Equal("dodge-metzner", r.Body.GetProperty("method").GetString());
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.InRange(r.Body.GetProperty("iterations").GetInt32(), 1, 12);
        double reC = 6464 * 0.6 * Math.Pow(2.6, 2.6 / 1.6) / Math.Pow(2.8, 2);
        Assert.Equal(reC, r.Body.GetProperty("criticalReynolds").GetDouble(), 1e-12 * reC);
        Assert.False(r.Body.TryGetProperty("hedstromNumber", out _));
        foreach (var name in new[] { "validity", "warnings", "assumptions", "residual", "status", "solveVariable" })
            Assert.True(r.Body.TryGetProperty(name, out _), $"missing {name}");
    }

    [Fact]
    public async Task FrictionFactor_PowerLawLaminar_IsSixteenOverRe()
    {
        var r = await api.GetJson($"/v1/non-newtonian/friction-factor?{PowerLaw}&velocity=0.5&diameter=0.05");
        Assert.Equal(200, r.Status);
        double re = MetznerReed(1200, 0.5, 0.6, 0.5, 0.05);
        Assert.Equal(16 / re, r.Body.GetProperty("fanningFrictionFactor").GetDouble(), 1e-12 * 16 / re);
        Assert.Equal("laminar", r.Body.GetProperty("regime").GetString());
        Assert.Equal("closed-form", r.Body.GetProperty("status").GetString());
    }

    [Fact]
    public async Task FrictionFactor_NearCriticalReynolds_WarnsNamingTheBand()
    {
        // Choose the velocity that puts Re_MR at 1.1 Re_c (Re grows as V^(2-n)).
        double n = 0.6, reC = 6464 * n * Math.Pow(2 + n, (2 + n) / (1 + n)) / Math.Pow(1 + 3 * n, 2);
        double v = Math.Pow(1.1 * reC / MetznerReed(1200, 0.5, n, 1, 0.1), 1 / (2 - n));
        var r = await api.GetJson($"/v1/non-newtonian/friction-factor?{PowerLaw}&velocity={v:R}&diameter=0.1");
        Assert.Equal(200, r.Status);
        var w = r.Body.GetProperty("warnings").EnumerateArray().Single(x => x.GetProperty("code").GetString() == "near-critical-reynolds");
        Assert.Contains("0.8 to 1.25 times", w.GetProperty("message").GetString());
    }

    [Fact]
    public async Task FrictionFactor_Bingham_HedstromAndReynoldsInClosedForm_NoYieldIsNewtonian()
    {
        var r = await api.PostJson("/v1/non-newtonian/friction-factor",
            new { model = "bingham-plastic", density = 1450, yieldStress = 25, plasticViscosity = 0.06, velocity = 1.5, diameter = 0.15 });
        Assert.Equal(200, r.Status);
        Assert.Equal(1450 * 0.15 * 0.15 * 25 / (0.06 * 0.06), r.Body.GetProperty("hedstromNumber").GetDouble(), 1e-9);
        Assert.Equal(1450 * 1.5 * 0.15 / 0.06, r.Body.GetProperty("reynolds").GetDouble(), 1e-9);
        Assert.Equal("darby-mun-boger", r.Body.GetProperty("method").GetString());
        Assert.False(r.Body.TryGetProperty("criticalReynolds", out _));
        // Buckingham-Reiner part, checked in its published form at the returned value.
        double re = 1450 * 1.5 * 0.15 / 0.06, he = 1450 * 0.15 * 0.15 * 25 / (0.06 * 0.06);
        double fl = r.Body.GetProperty("laminarFanningFrictionFactor").GetDouble();
        double published = 16 / re * (1 + he / (6 * re) - Math.Pow(he, 4) / (3 * Math.Pow(fl, 3) * Math.Pow(re, 7)));
        Assert.Equal(published, fl, 1e-12 * fl);

        // He = 0: the Newtonian laminar law 16/Re (Re = 300 here, far below transition).
        var n = await api.PostJson("/v1/non-newtonian/friction-factor",
            new { model = "bingham-plastic", density = 1000, yieldStress = 0, plasticViscosity = 0.05, velocity = 0.1, diameter = 0.15 });
        Assert.Equal(200, n.Status);
        Assert.Equal(16 / 300.0, n.Body.GetProperty("fanningFrictionFactor").GetDouble(), 1e-14);
        Assert.Equal(0, n.Body.GetProperty("hedstromNumber").GetDouble());
    }

    [Fact]
    public async Task HeadLoss_PowerLawAtNOne_IsHagenPoiseuille()
    {
        double d = 0.05, l = 120, q = 1e-4, v = q / (Math.PI * d * d / 4);
        var r = await api.GetJson($"/v1/non-newtonian/head-loss?model=power-law&density=1000&consistencyIndex=0.05&flowBehaviorIndex=1&flow={q}&diameter={d}&length={l}");
        Assert.Equal(200, r.Status);
        double expected = 32 * 0.05 * l * v / (1000 * G * d * d);
        Assert.Equal(expected, r.Body.GetProperty("headLoss").GetDouble(), 1e-13 * expected);
        Assert.Equal(v, r.Body.GetProperty("velocity").GetDouble(), 1e-14 * v);
        Assert.Equal(1000 * G * expected, r.Body.GetProperty("pressureDrop").GetDouble(), 1e-12 * 1000 * G * expected);
    }

    [Fact]
    public async Task HeadLoss_DarcyFormWithMinorLoss_AddsUp()
    {
        var r = await api.GetJson($"/v1/non-newtonian/head-loss?{Bingham}&flow=30&flowUnit=l/s&diameter=0.15&length=1200&minorLossCoefficient=4.5");
        Assert.Equal(200, r.Status);
        Assert.Equal("l/s", r.Body.GetProperty("flowUnit").GetString());
        double v = 0.03 / (Math.PI * 0.15 * 0.15 / 4), vh = v * v / (2 * G);
        double f = r.Body.GetProperty("frictionFactor").GetDouble();
        Assert.Equal(f * 1200 / 0.15 * vh, r.Body.GetProperty("frictionHeadLoss").GetDouble(), 1e-12 * f * 1200 / 0.15 * vh);
        Assert.Equal(4.5 * vh, r.Body.GetProperty("minorHeadLoss").GetDouble(), 1e-12);
        Assert.Equal(r.Body.GetProperty("frictionHeadLoss").GetDouble() + 4.5 * vh, r.Body.GetProperty("headLoss").GetDouble(), 1e-10);
    }

    [Theory]
    [InlineData(PowerLaw, 0.004)]
    [InlineData(PowerLaw, 0.05)]
    [InlineData(Bingham, 0.002)]
    [InlineData(Bingham, 0.08)]
    public async Task Flow_RoundTripsHeadLoss(string fluid, double q)
    {
        var h = await api.GetJson($"/v1/non-newtonian/head-loss?{fluid}&flow={q}&diameter=0.12&length=700&minorLossCoefficient=3");
        Assert.Equal(200, h.Status);
        double head = h.Body.GetProperty("headLoss").GetDouble();
        var r = await api.GetJson($"/v1/non-newtonian/flow?{fluid}&headLoss={head:R}&diameter=0.12&length=700&minorLossCoefficient=3");
        Assert.Equal(200, r.Status);
        Assert.Equal(q, r.Body.GetProperty("flow").GetDouble(), 1e-10 * q);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.Equal("ln(Q)", r.Body.GetProperty("solveVariable").GetString());
        Assert.InRange(r.Body.GetProperty("iterations").GetInt32(), 1, 30);
        Assert.True(Math.Abs(r.Body.GetProperty("residual").GetDouble()) <= 1e-9);
    }

    [Fact]
    public async Task Flow_BinghamBelowYieldHead_Is422WithTheYieldHead()
    {
        double yield = 4 * 25 * 1200 / (1450 * G * 0.15);
        var r = await api.GetJson($"/v1/non-newtonian/flow?{Bingham}&headLoss={0.95 * yield:R}&diameter=0.15&length=1200");
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal("below-yield", r.Body.GetProperty("flowStatus").GetString());
        Assert.Equal(yield, r.Body.GetProperty("yieldHeadLoss").GetDouble(), 1e-12 * yield);
        Assert.Contains("yield stress", r.Body.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task Flow_PowerLawHeadInsideTheJumpAtReC_Is422WithBothEnds()
    {
        var probe = await api.GetJson($"/v1/non-newtonian/flow?{PowerLaw}&headLoss=1e-3&diameter=0.1&length=300");
        Assert.Equal(200, probe.Status);
        // The jump's ends, from the laminar law and Dodge-Metzner (by Brent) at Re_c.
        double n = 0.6, reC = 6464 * n * Math.Pow(2 + n, (2 + n) / (1 + n)) / Math.Pow(1 + 3 * n, 2);
        double vc = Math.Pow(reC / MetznerReed(1200, 0.5, n, 1, 0.1), 1 / (2 - n));
        double dyn = 1200 * vc * vc / 2, scale = 4 * 300 / (1200 * G * 0.1);
        double low = 16 / reC * dyn * scale, high = BrentDodgeMetzner(reC, n) * dyn * scale;
        var r = await api.GetJson($"/v1/non-newtonian/flow?{PowerLaw}&headLoss={0.5 * (low + high):R}&diameter=0.1&length=300");
        Assert.Equal(422, r.Status);
        Assert.Equal("in-transition-gap", r.Body.GetProperty("flowStatus").GetString());
        Assert.Equal(low, r.Body.GetProperty("laminarHeadLossAtCritical").GetDouble(), 1e-9 * low);
        Assert.Equal(high, r.Body.GetProperty("turbulentHeadLossAtCritical").GetDouble(), 1e-9 * high);
    }

    [Fact]
    public async Task Flow_PowerLawSmallIndex_TwoFlowsMeetTheHead_BothReported()
    {
        // n = 0.15: Dodge-Metzner at Re_c (by Brent) lies below 16/Re_c, so a head between the two is met twice.
        double n = 0.15, rho = 1100, k = 2.0, d = 0.1, l = 200;
        double reC = 6464 * n * Math.Pow(2 + n, (2 + n) / (1 + n)) / Math.Pow(1 + 3 * n, 2);
        double vc = Math.Pow(reC / MetznerReed(rho, k, n, 1, d), 1 / (2 - n));
        double scale = 4 * l / (rho * G * d) * rho * vc * vc / 2;
        double low = BrentDodgeMetzner(reC, n) * scale, high = 16 / reC * scale;
        Assert.True(low < high);
        string fluid = $"model=power-law&density={rho}&consistencyIndex={k}&flowBehaviorIndex={n}&diameter={d}&length={l}";
        var r = await api.GetJson($"/v1/non-newtonian/flow?{fluid}&headLoss={0.5 * (low + high):R}");
        Assert.Equal(200, r.Status);
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "second-solution");
        double qc = vc * Math.PI * d * d / 4;
        double turbulent = r.Body.GetProperty("flow").GetDouble(), laminar = r.Body.GetProperty("alternateFlow").GetDouble();
        Assert.True(laminar < qc && qc < turbulent);
        foreach (double q in new[] { turbulent, laminar })
        {
            var h = await api.GetJson($"/v1/non-newtonian/head-loss?{fluid}&flow={q:R}");
            Assert.Equal(0.5 * (low + high), h.Body.GetProperty("headLoss").GetDouble(), 1e-8 * (low + high));
        }
    }

    [Fact]
    public async Task UsUnits_MatchSiWithExactFactors()
    {
        const double ft = 0.3048, lbf = 0.45359237 * G, lbPerFt3 = 0.45359237 / (ft * ft * ft), psf = lbf / (ft * ft);
        var si = await api.GetJson($"/v1/non-newtonian/head-loss?{Bingham}&flow=0.03&diameter=0.15&length=1200");
        string us = $"model=bingham-plastic&units=us&density={1450 / lbPerFt3:R}&yieldStress={25 / psf:R}&plasticViscosity={0.06 / psf:R}" +
                    $"&flow={0.03 / (ft * ft * ft):R}&diameter={0.15 / ft:R}&length={1200 / ft:R}";
        var r = await api.GetJson("/v1/non-newtonian/head-loss?" + us);
        Assert.Equal(200, r.Status);
        double h = si.Body.GetProperty("headLoss").GetDouble();
        Assert.Equal(h / ft, r.Body.GetProperty("headLoss").GetDouble(), 1e-10 * h / ft);
        double tau = si.Body.GetProperty("wallShearStress").GetDouble();
        Assert.Equal(tau / psf, r.Body.GetProperty("wallShearStress").GetDouble(), 1e-10 * tau / psf);
        Assert.Equal(si.Body.GetProperty("reynolds").GetDouble(), r.Body.GetProperty("reynolds").GetDouble(), 1e-10 * si.Body.GetProperty("reynolds").GetDouble());
        Assert.Equal("ft3/s", r.Body.GetProperty("flowUnit").GetString());
    }

    [Theory]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0&velocity=2&diameter=0.1", "flowBehaviorIndex")]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=-0.5&velocity=2&diameter=0.1", "flowBehaviorIndex")]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=3&velocity=2&diameter=0.1", "flowBehaviorIndex")]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=1200&consistencyIndex=0&flowBehaviorIndex=0.5&velocity=2&diameter=0.1", "consistencyIndex")]
    [InlineData("/v1/non-newtonian/friction-factor?model=bingham-plastic&density=1450&yieldStress=-1&plasticViscosity=0.06&velocity=2&diameter=0.1", "yieldStress")]
    [InlineData("/v1/non-newtonian/friction-factor?model=bingham-plastic&density=1450&yieldStress=5&plasticViscosity=0&velocity=2&diameter=0.1", "plasticViscosity")]
    [InlineData("/v1/non-newtonian/friction-factor?model=bingham-plastic&density=1450&yieldStress=5&plasticViscosity=0.06&flowBehaviorIndex=0.5&velocity=2&diameter=0.1", "flowBehaviorIndex")]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6&yieldStress=3&velocity=2&diameter=0.1", "yieldStress")]
    [InlineData("/v1/non-newtonian/friction-factor?model=casson&density=1200&velocity=2&diameter=0.1", "model")]
    [InlineData("/v1/non-newtonian/friction-factor?density=1200&velocity=2&diameter=0.1", "model")]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=-1&consistencyIndex=0.5&flowBehaviorIndex=0.6&velocity=2&diameter=0.1", "density")]
    [InlineData("/v1/non-newtonian/friction-factor?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6&velocity=1e308&diameter=0.1", "velocity")]
    [InlineData("/v1/non-newtonian/head-loss?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6&flow=0&diameter=0.1&length=10", "flow")]
    [InlineData("/v1/non-newtonian/head-loss?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6&flow=1&diameter=0.1&length=10&minorLossCoefficient=-1", "minorLossCoefficient")]
    [InlineData("/v1/non-newtonian/head-loss?model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6&flow=1&flowUnit=gpm&diameter=0.1&length=10", "flowUnit")]
    [InlineData("/v1/non-newtonian/flow?model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06&headLoss=-3&diameter=0.1&length=10", "headLoss")]
    [InlineData("/v1/non-newtonian/flow?model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06&headLoss=3&diameter=0.1&length=0", "length")]
    public async Task BadInput_Is400NamingTheField(string url, string field)
    {
        ProblemAssert.NamesField(await api.GetJson(url), 400, field);
    }

    [Fact]
    public async Task Post_FieldOfTheOtherModel_Is400NamingIt()
    {
        var r = await api.PostJson("/v1/non-newtonian/head-loss",
            new { model = "bingham-plastic", density = 1450, yieldStress = 25, plasticViscosity = 0.06, consistencyIndex = 0.5, flow = 0.02, diameter = 0.1, length = 100 });
        ProblemAssert.NamesField(r, 400, "consistencyIndex");
    }

    [Theory]
    [InlineData("model=power-law&density=1e5&consistencyIndex=1e-300&flowBehaviorIndex=0.01&velocity=1e4&diameter=100")]
    [InlineData("model=bingham-plastic&density=1e-300&yieldStress=1e6&plasticViscosity=1e-300&velocity=1e-300&diameter=1e-6")]
    [InlineData("model=bingham-plastic&density=1e5&yieldStress=1e6&plasticViscosity=5e-324&velocity=1e4&diameter=100")]
    [InlineData("model=power-law&density=5e-324&consistencyIndex=1e6&flowBehaviorIndex=2&velocity=5e-324&diameter=1e-6")]
    public async Task Extremes_AnswerWithFiniteNumbersOrAProblem_NeverA5xx(string query)
    {
        var r = await api.GetJson("/v1/non-newtonian/friction-factor?" + query);
        Assert.True(r.Status is 200 or 400 or 422, $"{r.Status}: {r.Body}");
        if (r.Status == 200) Assert.DoesNotContain("NaN", r.Body.ToString());
        var flow = await api.GetJson("/v1/non-newtonian/flow?" + query.Replace("velocity", "headLoss") + "&length=1e7");
        Assert.True(flow.Status is 200 or 400 or 422, $"{flow.Status}: {flow.Body}");
    }

    [Fact]
    public async Task Text_Batch_And_Check_Reach_The_Calculation()
    {
        string text = await api.Client.GetStringAsync($"/v1/non-newtonian/head-loss?{Bingham}&flow=0.03&diameter=0.15&length=1200&format=text",
            TestContext.Current.CancellationToken);
        var json = await api.GetJson($"/v1/non-newtonian/head-loss?{Bingham}&flow=0.03&diameter=0.15&length=1200");
        Assert.Equal(json.Body.GetProperty("headLoss").GetDouble(), double.Parse(text, System.Globalization.CultureInfo.InvariantCulture));

        object[] rows =
        [
            new { model = "power-law", density = 1200, consistencyIndex = 0.5, flowBehaviorIndex = 0.6, headLoss = 25, diameter = 0.1, length = 350 },
            new { model = "power-law", density = 1200, consistencyIndex = 0.5, flowBehaviorIndex = -1, headLoss = 25, diameter = 0.1, length = 350 },
        ];
        var batch = await api.PostRaw("/v1/batch/non-newtonian/flow", JsonSerializer.Serialize(rows), "application/json");
        Assert.Equal(200, batch.Status);
        var answers = batch.Body.EnumerateArray().ToArray();
        Assert.Equal(2, answers.Length);
        var single = await api.PostJson("/v1/non-newtonian/flow", rows[0]);
        Assert.True(JsonElement.DeepEquals(single.Body, answers[0].GetProperty("result")));
        Assert.Equal(400, answers[1].GetProperty("status").GetInt32());
        Assert.Contains("flowBehaviorIndex", answers[1].GetProperty("error").GetString());

        double claimed = single.Body.GetProperty("flow").GetDouble() * 1.02;
        var check = await api.PostJson("/v1/check/non-newtonian/flow", new
        {
            model = "power-law", density = 1200, consistencyIndex = 0.5, flowBehaviorIndex = 0.6, headLoss = 25, diameter = 0.1, length = 350,
            claimed = new { flow = claimed },
        });
        Assert.Equal(200, check.Status);
        Assert.False(check.Body.GetProperty("passed").GetBoolean());
    }
}
