using System.Globalization;

namespace FlowSolve.Api.Tests.Channels;

/// <summary><c>/v1/channels/hydraulic-jump</c> through the service.</summary>
public sealed class HydraulicJumpTests(ApiFixture api)
{
    private const string Jump = "/v1/channels/hydraulic-jump";
    private const double G = 9.80665;
    private const double Foot = 0.3048; // exact (NIST SP 811)

    private static CancellationToken Cancel => TestContext.Current.CancellationToken;

    /// <summary>Belanger (1828): y2/y1 = (sqrt(1 + 8 Fr1^2) - 1)/2 in a rectangle (Chow 1959, eq. 15-3, from memory).</summary>
    private static double Belanger(double width, double flow, double y1)
    {
        double fr = flow / (width * y1) / Math.Sqrt(G * y1);
        return y1 * (Math.Sqrt(1 + 8 * fr * fr) - 1) / 2;
    }

    [Fact]
    public async Task Get_Rectangle_MatchesBelanger_AndTheTextCellCarriesTheSameDigits()
    {
        string url = $"{Jump}?shape=rectangular&bottomWidth=3&flow=15&upstreamDepth=0.6";
        var r = await api.GetJson(url);
        Assert.Equal(200, r.Status);
        double y2 = Belanger(3, 15, 0.6);
        Assert.Equal(y2, r.Body.GetProperty("sequentDepth").GetDouble(), 1e-12 * y2);
        // Energy lost in a rectangular jump: (y2 - y1)^3 / (4 y1 y2) (Chow 1959, eq. 15-4, from memory).
        Assert.Equal(Math.Pow(y2 - 0.6, 3) / (4 * 0.6 * y2), r.Body.GetProperty("energyLoss").GetDouble(), 1e-9);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.True(r.Body.GetProperty("downstreamFroudeNumber").GetDouble() < 1);
        Assert.Equal(6.1 * y2, r.Body.GetProperty("jumpLength").GetDouble(), 1e-12);
        Assert.Equal(Math.Cbrt(25.0 / G), r.Body.GetProperty("criticalDepth").GetDouble(), 1e-12); // q = 5 m2/s, yc = (q^2/g)^(1/3)

        using var text = await api.Client.GetAsync(url + "&format=text", Cancel);
        string cell = await text.Content.ReadAsStringAsync(Cancel);
        Assert.Equal(r.Body.GetProperty("sequentDepth").GetRawText(), cell);
    }

    [Fact]
    public async Task Post_Trapezoid_BalancesTheMomentumFunction()
    {
        var r = await api.PostJson(Jump, new { section = new { shape = "trapezoidal", bottomWidth = 2, sideSlope = 1.5 }, flow = 10, upstreamDepth = 0.3 });
        Assert.Equal(200, r.Status);
        // Written out here: A = b y + z y^2 and A ybar = b y^2/2 + z y^3/3 for a symmetric trapezoid.
        static double M(double y) => 2 * y * y / 2 + 1.5 * y * y * y / 3 + 100 / (G * (2 * y + 1.5 * y * y));
        double y2 = r.Body.GetProperty("sequentDepth").GetDouble();
        Assert.Equal(M(0.3), M(y2), 1e-11 * M(0.3));
        Assert.Equal(M(0.3), r.Body.GetProperty("momentumFunction").GetDouble(), 1e-12 * M(0.3));
        Assert.True(y2 > r.Body.GetProperty("criticalDepth").GetDouble());
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "jump-length-rectangular-only");
    }

    [Fact]
    public async Task UsUnits_GiveTheSameJumpInFeet()
    {
        var si = await api.GetJson($"{Jump}?shape=rectangular&bottomWidth=3&flow=15&upstreamDepth=0.6");
        string q = (15 / (Foot * Foot * Foot)).ToString("R", CultureInfo.InvariantCulture);
        string b = (3 / Foot).ToString("R", CultureInfo.InvariantCulture), y = (0.6 / Foot).ToString("R", CultureInfo.InvariantCulture);
        var us = await api.GetJson($"{Jump}?shape=rectangular&bottomWidth={b}&flow={q}&upstreamDepth={y}&units=us");
        Assert.Equal(200, us.Status);
        Assert.Equal(si.Body.GetProperty("sequentDepth").GetDouble() / Foot, us.Body.GetProperty("sequentDepth").GetDouble(), 1e-9);
        Assert.Equal(si.Body.GetProperty("upstreamFroudeNumber").GetDouble(), us.Body.GetProperty("upstreamFroudeNumber").GetDouble(), 1e-9);
    }

    [Fact]
    public async Task A_subcritical_upstream_depth_is_a_400_naming_it_and_a_surcharged_pipe_a_422()
    {
        var sub = await api.GetJson($"{Jump}?shape=rectangular&bottomWidth=3&flow=6&upstreamDepth=1.5");
        ProblemAssert.NamesField(sub, 400, "upstreamDepth");
        var missing = await api.PostJson(Jump, new { flow = 6, upstreamDepth = 0.2 });
        ProblemAssert.NamesField(missing, 400, "section");
        var outside = await api.GetJson($"{Jump}?shape=circular&diameter=0.5&flow=0.1&upstreamDepth=0.6");
        ProblemAssert.NamesField(outside, 400, "upstreamDepth");
        var full = await api.GetJson($"{Jump}?shape=circular&diameter=0.5&flow=0.4&upstreamDepth=0.08");
        Assert.Equal(422, full.Status);
    }

    [Fact]
    public async Task Trace_Batch_And_Check_Come_With_The_Declaration()
    {
        var traced = await api.GetJson($"{Jump}?shape=rectangular&bottomWidth=3&flow=15&upstreamDepth=0.6&trace=true");
        var trace = traced.Body.GetProperty("trace");
        Assert.InRange(trace.GetArrayLength(), 1, traced.Body.GetProperty("iterations").GetInt32() + 1);

        using var csv = new StringContent("section.shape,section.bottomWidth,flow,upstreamDepth\nrectangular,3,15,0.6\nrectangular,3,6,1.5\n",
            System.Text.Encoding.UTF8, "text/csv");
        using var batch = await api.Client.PostAsync("/v1/batch/channels/hydraulic-jump", csv, Cancel);
        Assert.Equal(System.Net.HttpStatusCode.OK, batch.StatusCode);
        var lines = (await batch.Content.ReadAsStringAsync(Cancel)).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        var header = lines[0].Split(',');
        int status = Array.IndexOf(header, "httpStatus"), sequent = Array.IndexOf(header, "sequentDepth");
        Assert.Equal("200", lines[1].Split(',')[status]);
        Assert.Equal(Belanger(3, 15, 0.6), double.Parse(lines[1].Split(',')[sequent], CultureInfo.InvariantCulture), 1e-12);
        Assert.Equal("400", lines[2].Split(',')[status]); // subcritical: that row's error, the others unaffected

        double y2 = Belanger(3, 15, 0.6);
        var check = await api.PostJson("/v1/check/channels/hydraulic-jump", new
        {
            section = new { shape = "rectangular", bottomWidth = 3 }, flow = 15, upstreamDepth = 0.6, claimed = new { sequentDepth = Math.Round(y2, 3) },
        });
        Assert.Equal(200, check.Status);
        Assert.True(check.Body.GetProperty("passed").GetBoolean());
    }
}
