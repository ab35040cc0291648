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
}
