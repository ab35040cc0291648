namespace FlowSolve.Api.Tests.Channels;

/// <summary><c>/v1/channels/profile</c> through the service. The stations' accuracy against an independent solution is
/// checked in the Core's WaterSurfaceProfileTests; here, the service's answer against the equation it claims to solve.</summary>
public sealed class ChannelProfileTests(ApiFixture api)
{
    private const string Profile = "/v1/channels/profile";
    private const double G = 9.80665;

    [Fact]
    public async Task Get_M1_Backwater_FallsTowardNormalDepth_AndSatisfiesTheEquationBetweenStations()
    {
        var r = await api.GetJson($"{Profile}?shape=trapezoidal&bottomWidth=3&sideSlope=2&manningN=0.025&slope=0.001&flow=10&length=2000&controlDepth=2.5");
        Assert.Equal(200, r.Status);
        Assert.Equal("M1", r.Body.GetProperty("profileType").GetString());
        Assert.Equal("mild", r.Body.GetProperty("slopeClass").GetString());
        double yn = r.Body.GetProperty("normalDepth").GetDouble();
        var normal = await api.GetJson("/v1/channels/normal-depth?shape=trapezoidal&bottomWidth=3&sideSlope=2&manningN=0.025&slope=0.001&flow=10");
        Assert.Equal(normal.Body.GetProperty("normalDepth").GetDouble(), yn, 1e-12);
        var st = r.Body.GetProperty("stations").EnumerateArray().ToArray();
        Assert.Equal(21, st.Length);
        Assert.Equal(0, st[0].GetProperty("distance").GetDouble());
        Assert.Equal(2.5, st[0].GetProperty("depth").GetDouble());
        Assert.Equal(2000, st[^1].GetProperty("distance").GetDouble(), 1e-9);
        // Between neighbouring stations the equation holds: (y2 - y1)/(x2 - x1), against the flow, is close to the
        // mean of -(S0 - Sf)/(1 - Fr^2) at the two (a second-order check of the stated equation, not of the digits).
        for (int k = 1; k < st.Length; k++)
        {
            double Rate(System.Text.Json.JsonElement s) =>
                -(0.001 - s.GetProperty("frictionSlope").GetDouble()) / (1 - Math.Pow(s.GetProperty("froudeNumber").GetDouble(), 2));
            double dy = st[k].GetProperty("depth").GetDouble() - st[k - 1].GetProperty("depth").GetDouble();
            double dx = st[k].GetProperty("distance").GetDouble() - st[k - 1].GetProperty("distance").GetDouble();
            double mean = 0.5 * (Rate(st[k]) + Rate(st[k - 1]));
            Assert.Equal(mean, dy / dx, Math.Abs(mean) * 0.05);
            Assert.True(st[k].GetProperty("depth").GetDouble() > yn);
        }
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
    }

    [Fact]
    public async Task Post_M3_BelowAGate_ReachesCriticalDepth_AndSaysWhere()
    {
        var r = await api.PostJson(Profile, new
        {
            section = new { shape = "rectangular", bottomWidth = 4 }, manningN = 0.015, slope = 0.0005, flow = 12, length = 300,
            controlDepth = 0.35, controlAt = "upstream", stations = 11,
        });
        Assert.Equal(200, r.Status);
        Assert.Equal("M3", r.Body.GetProperty("profileType").GetString());
        double yc = Math.Cbrt(9.0 / G); // q = 3 m2/s: yc = (q^2/g)^(1/3)
        Assert.Equal(yc, r.Body.GetProperty("criticalDepth").GetDouble(), 1e-12);
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "reaches-critical-depth");
        double at = r.Body.GetProperty("criticalDepthDistance").GetDouble();
        Assert.InRange(at, 0, 300);
        var st = r.Body.GetProperty("stations").EnumerateArray().ToArray();
        Assert.Equal(300, st[^1].GetProperty("distance").GetDouble());
        Assert.Equal(0.35, st[^1].GetProperty("depth").GetDouble());
        Assert.All(st, s => Assert.InRange(s.GetProperty("distance").GetDouble(), at - 1e-9, 300));
    }

    [Fact]
    public async Task A_control_on_the_wrong_side_of_critical_depth_is_a_400_naming_controlDepth()
    {
        var sub = await api.GetJson($"{Profile}?shape=rectangular&bottomWidth=4&manningN=0.015&slope=0.0005&flow=12&length=300&controlDepth=0.3");
        ProblemAssert.NamesField(sub, 400, "controlDepth");
        var sup = await api.GetJson($"{Profile}?shape=rectangular&bottomWidth=4&manningN=0.015&slope=0.0005&flow=12&length=300&controlDepth=2&controlAt=upstream");
        ProblemAssert.NamesField(sup, 400, "controlDepth");
        var at = await api.GetJson($"{Profile}?shape=rectangular&bottomWidth=4&manningN=0.015&slope=0.0005&flow=12&length=300&controlDepth=2&controlAt=middle");
        ProblemAssert.NamesField(at, 400, "controlAt");
        var text = await api.Client.GetAsync($"{Profile}?shape=rectangular&bottomWidth=4&manningN=0.015&slope=0.0005&flow=12&length=300&controlDepth=2&format=text",
            TestContext.Current.CancellationToken);
        Assert.Equal(System.Net.HttpStatusCode.BadRequest, text.StatusCode);
    }

    private static double Belanger(double y1, double q, double b)
    {
        // Belanger (1828): in a rectangle, y2 / y1 = (sqrt(1 + 8 Fr1^2) - 1) / 2.
        double fr1 = q / (b * y1 * Math.Sqrt(G * y1));
        return y1 * (Math.Sqrt(1 + 8 * fr1 * fr1) - 1) / 2;
    }

    [Fact]
    public async Task Post_TwoControls_LocateTheJump_WithBelangersSequentDepth_AndBothProfilesAroundIt()
    {
        var body = new
        {
            section = new { shape = "rectangular", bottomWidth = 4 }, manningN = 0.015, slope = 0.0005, flow = 12, length = 300,
            upstreamControlDepth = 0.35, downstreamControlDepth = 1.9, stations = 11,
        };
        var r = await api.PostJson(Profile, body);
        Assert.Equal(200, r.Status);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        // Upstream a gate's M3 (below critical depth); downstream M1 above normal depth or M2 between the two.
        string lower = 1.9 > r.Body.GetProperty("normalDepth").GetDouble() ? "M1" : "M2";
        Assert.Equal("M3+" + lower, r.Body.GetProperty("profileType").GetString());
        var jump = r.Body.GetProperty("jump");
        double xj = jump.GetProperty("distance").GetDouble(), y1 = jump.GetProperty("upstreamDepth").GetDouble();
        double y2 = jump.GetProperty("sequentDepth").GetDouble();
        Assert.InRange(xj, 0, 300);
        Assert.Equal(Belanger(y1, 12, 4), y2, 1e-9 * y2);
        double e1 = y1 + Math.Pow(12 / (4 * y1), 2) / (2 * G), e2 = y2 + Math.Pow(12 / (4 * y2), 2) / (2 * G);
        Assert.Equal(e1 - e2, jump.GetProperty("energyLoss").GetDouble(), 1e-9 * (e1 - e2));
        Assert.Equal(6.1 * y2, jump.GetProperty("jumpLength").GetDouble(), 1e-12 * y2);

        // Each side against the single-control profile from its own end, asked at the same stations (the stations of the
        // two-control answer, other than the jump's two rows, lie on the same grid of 11).
        var st = r.Body.GetProperty("stations").EnumerateArray().ToArray();
        Assert.Equal(13, st.Length);
        var below = await api.PostJson(Profile, new
        {
            section = new { shape = "rectangular", bottomWidth = 4 }, manningN = 0.015, slope = 0.0005, flow = 12, length = 300,
            controlDepth = 1.9, stations = 11,
        });
        var above = await api.PostJson(Profile, new
        {
            section = new { shape = "rectangular", bottomWidth = 4 }, manningN = 0.015, slope = 0.0005, flow = 12, length = 300,
            controlDepth = 0.35, controlAt = "upstream", stations = 11,
        });
        var sub = below.Body.GetProperty("stations").EnumerateArray().ToDictionary(s => s.GetProperty("distance").GetDouble(), s => s.GetProperty("depth").GetDouble());
        var sup = above.Body.GetProperty("stations").EnumerateArray().ToDictionary(s => s.GetProperty("distance").GetDouble(), s => s.GetProperty("depth").GetDouble());
        foreach (var s in st)
        {
            double x = s.GetProperty("distance").GetDouble(), y = s.GetProperty("depth").GetDouble();
            if (x == xj) continue;
            double expected = x < xj ? sub[x] : sup[x];
            Assert.Equal(expected, y, 1e-9 * expected);
            Assert.True(x < xj ? s.GetProperty("froudeNumber").GetDouble() < 1 : s.GetProperty("froudeNumber").GetDouble() > 1);
        }
        var atJump = st.Where(s => s.GetProperty("distance").GetDouble() == xj).Select(s => s.GetProperty("depth").GetDouble()).ToArray();
        Assert.Equal([y2, y1], atJump);

        // The same reach in US units answers the same jump, converted exactly.
        var us = await api.PostJson(Profile, new
        {
            section = new { shape = "rectangular", bottomWidth = 4 / 0.3048 }, manningN = 0.015, slope = 0.0005, flow = 12 / Math.Pow(0.3048, 3),
            length = 300 / 0.3048, upstreamControlDepth = 0.35 / 0.3048, downstreamControlDepth = 1.9 / 0.3048, stations = 11, units = "us",
        });
        Assert.Equal(200, us.Status);
        Assert.Equal(xj, us.Body.GetProperty("jump").GetProperty("distance").GetDouble() * 0.3048, 1e-8 * 300);
        Assert.Equal(y2, us.Body.GetProperty("jump").GetProperty("sequentDepth").GetDouble() * 0.3048, 1e-9 * y2);
    }

    [Fact]
    public async Task Get_TwoControls_WithAHighTailwater_DrownsTheJump_AndSaysSo_AndTheSheetDrawsTheLongSection()
    {
        const string Query = "shape=rectangular&bottomWidth=4&manningN=0.015&slope=0.0005&flow=12&length=300&upstreamControlDepth=0.35";
        var drowned = await api.GetJson($"{Profile}?{Query}&downstreamControlDepth=4");
        Assert.Equal(200, drowned.Status);
        Assert.Contains(drowned.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "jump-drowned");
        Assert.Equal(System.Text.Json.JsonValueKind.Null, drowned.Body.TryGetProperty("jump", out var j) ? j.ValueKind : System.Text.Json.JsonValueKind.Null);
        // Drowned: the subcritical depth at the gate stands above the sequent depth of the gate's depth.
        double atGate = drowned.Body.GetProperty("stations").EnumerateArray().Last().GetProperty("depth").GetDouble();
        Assert.True(atGate > Belanger(0.35, 12, 4));

        var html = await api.Client.GetAsync($"{Profile}?{Query}&downstreamControlDepth=1.9&format=html", TestContext.Current.CancellationToken);
        Assert.Equal(System.Net.HttpStatusCode.OK, html.StatusCode);
        string page = await html.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        Assert.Contains("plot-profile", page);
        Assert.Contains("Sequent depth y2", page);
        Assert.Contains("table-stations", page);
    }

    [Fact]
    public async Task Two_controls_refuse_a_wrong_regime_or_a_single_controlDepth_beside_them()
    {
        const string Base = "shape=rectangular&bottomWidth=4&manningN=0.015&slope=0.0005&flow=12&length=300";
        ProblemAssert.NamesField(await api.GetJson($"{Profile}?{Base}&upstreamControlDepth=1.5&downstreamControlDepth=1.9"), 400, "upstreamControlDepth");
        ProblemAssert.NamesField(await api.GetJson($"{Profile}?{Base}&upstreamControlDepth=0.35&downstreamControlDepth=0.5"), 400, "downstreamControlDepth");
        ProblemAssert.NamesField(await api.GetJson($"{Profile}?{Base}&upstreamControlDepth=0.35&downstreamControlDepth=1.9&controlDepth=1.9"), 400, "controlDepth");
        ProblemAssert.NamesField(await api.GetJson($"{Profile}?{Base}&upstreamControlDepth=0.35&downstreamControlDepth=1.9&controlAt=upstream"), 400, "controlAt");
        ProblemAssert.NamesField(await api.GetJson($"{Profile}?{Base}&upstreamControlDepth=-1&downstreamControlDepth=1.9"), 400, "upstreamControlDepth");
        ProblemAssert.NamesField(await api.GetJson($"{Profile}?{Base}"), 400, "controlDepth");
        // One of the two alone is the single control at that end: the same answer as controlDepth with controlAt.
        var one = await api.GetJson($"{Profile}?{Base}&upstreamControlDepth=0.35");
        var single = await api.GetJson($"{Profile}?{Base}&controlDepth=0.35&controlAt=upstream");
        Assert.Equal(200, one.Status);
        Assert.Equal(single.Body.GetProperty("stations").GetRawText(), one.Body.GetProperty("stations").GetRawText());
    }

    [Fact]
    public async Task A_textbook_backwater_curve_behind_a_dam_in_US_units()
    {
        // Chow (1959), Open-Channel Hydraulics, Example 10-1 (from memory): a trapezoidal channel, b = 20 ft, z = 2,
        // S0 = 0.0016, n = 0.025, Q = 400 ft3/s, backed up to 5 ft by a dam; the book gives yn = 3.36 ft (to its two
        // decimals) and an M1 curve. (Its critical depth is not recalled reliably enough to assert.) The book's step
        // method is not exact; the exact profile must rise monotonically from near normal depth upstream to the dam's 5 ft.
        var r = await api.GetJson($"{Profile}?shape=trapezoidal&bottomWidth=20&sideSlope=2&manningN=0.025&slope=0.0016&flow=400&length=3000&controlDepth=5&units=us");
        Assert.Equal(200, r.Status);
        Assert.Equal(3.36, r.Body.GetProperty("normalDepth").GetDouble(), 0.005);
        Assert.Equal("M1", r.Body.GetProperty("profileType").GetString());
        var depths = r.Body.GetProperty("stations").EnumerateArray().Select(s => s.GetProperty("depth").GetDouble()).ToArray();
        for (int k = 1; k < depths.Length; k++) Assert.True(depths[k] < depths[k - 1] && depths[k] > 3.36 - 0.005);
    }
}
