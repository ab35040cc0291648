using System.Globalization;
using System.Text.Json;
using FlowSolve.Api.Tests.Sheets;

namespace FlowSolve.Api.Tests.Channels;

/// <summary>
/// <c>/v1/channels/culvert</c> through the service, against FHWA HDS-5 (Schall et al. 2012, Hydraulic Design of Highway
/// Culverts, 3rd ed.: Appendix A's inlet-control equations and the outlet-control energy balance, from memory) written
/// out here; the Core's CulvertTests check the circle's depths against MathNet's Brent.
/// </summary>
public sealed class CulvertEndpointsTests(ApiFixture api)
{
    private const string Route = "/v1/channels/culvert";
    private const double G = 9.80665;
    private const double Foot = 0.3048; // exact (NIST SP 811)

    private static CancellationToken Cancel => TestContext.Current.CancellationToken;

    private static string Inv(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    /// <summary>Critical depth of a circle by bisection to the last bit on Q^2 T - g A^3 (A = D^2 (t - sin t)/8, T = D sin(t/2)).</summary>
    private static double CircleCritical(double d, double q)
    {
        double F(double y)
        {
            double t = 2 * Math.Acos(1 - 2 * y / d), a = d * d * (t - Math.Sin(t)) / 8;
            return q * q * d * Math.Sin(t / 2) - G * a * a * a;
        }
        double lo = 0, hi = d;
        while (true)
        {
            double mid = 0.5 * (lo + hi);
            if (mid <= lo || mid >= hi) return mid;
            if (F(mid) > 0) lo = mid; else hi = mid;
        }
    }

    private static double CircleArea(double d, double y)
    {
        double t = 2 * Math.Acos(1 - 2 * y / d);
        return d * d * (t - Math.Sin(t)) / 8;
    }

    [Fact]
    public async Task Get_Circle_InletControl_IsTheUnsubmergedEquation_AndOutletControlTheEnergyBalance()
    {
        // The catalogue's GET example: a 1.2 m concrete pipe with a square-edged headwall (HDS-5 Table A.1: form 1,
        // K 0.0098, M 2.0; ke 0.5; from memory).
        double d = 1.2, q = 1.5, len = 40, s = 0.01, n = 0.013, tw = 0.5, ke = 0.5;
        var r = await api.GetJson($"{Route}?diameter=1.2&length=40&slope=0.01&manningN=0.013&inletType=circular-concrete-square-edge-headwall&flow=1.5&tailwaterDepth=0.5");
        Assert.Equal(200, r.Status);

        double area = Math.PI * d * d / 4;
        double x = (q / (Foot * Foot * Foot)) / (area / (Foot * Foot) * Math.Sqrt(d / Foot)); // in feet, where Ku = 1
        double dc = CircleCritical(d, q);
        double hc = dc + Math.Pow(q / CircleArea(d, dc), 2) / (2 * G);
        double inlet = d * (hc / d + 0.0098 * x * x - 0.5 * s);
        double v = q / area, hv = v * v / (2 * G);
        double outlet = Math.Max(tw, (dc + d) / 2) + ke * hv + n * n * len * v * v / Math.Pow(d / 4, 4.0 / 3.0) + hv - s * len;

        var b = r.Body;
        Assert.Equal(x, b.GetProperty("flowParameter").GetDouble(), 1e-12);
        Assert.Equal("unsubmerged", b.GetProperty("inletRegime").GetString());
        Assert.Equal(inlet, b.GetProperty("inletControlHeadwater").GetDouble(), 1e-9);
        Assert.Equal(outlet, b.GetProperty("outletControlHeadwater").GetDouble(), 1e-9);
        Assert.Equal(Math.Max(inlet, outlet), b.GetProperty("headwater").GetDouble(), 1e-9);
        Assert.Equal(inlet >= outlet ? "inlet" : "outlet", b.GetProperty("control").GetString());
        Assert.Equal(0.5, b.GetProperty("coefficients").GetProperty("entranceLossCoefficient").GetDouble());
        Assert.Equal(1.0, b.GetProperty("coefficients").GetProperty("exitLossCoefficient").GetDouble());
        Assert.Equal(1.0 / Math.Sqrt(Foot), b.GetProperty("coefficients").GetProperty("ku").GetDouble(), 1e-15);
        Assert.Contains(b.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("field").GetString() == "entranceLossCoefficient");
        Assert.True(b.GetProperty("converged").GetBoolean());

        using var text = await api.Client.GetAsync($"{Route}?diameter=1.2&length=40&slope=0.01&manningN=0.013&inletType=circular-concrete-square-edge-headwall&flow=1.5&tailwaterDepth=0.5&format=text", Cancel);
        Assert.Equal(b.GetProperty("headwater").GetRawText(), await text.Content.ReadAsStringAsync(Cancel));
    }

    [Fact]
    public async Task Post_Box_OutletControl_ByHand_WithTheRectanglesCriticalDepth()
    {
        // Vandrel Vale (invented): a 2.4 x 1.5 m box under the valley road, 28 m long, tailwater 1.1 m, with 30 to 75 degree
        // wingwall flares (HDS-5 Table A.1: form 1, K 0.026, M 1.0, c 0.0347, Y 0.81; ke 0.4; from memory).
        double span = 2.4, rise = 1.5, q = 6.5, len = 28, s = 0.004, n = 0.015, tw = 1.1, ke = 0.4;
        var r = await api.PostJson(Route, new { flow = q, span, rise, length = len, slope = s, manningN = n, tailwaterDepth = tw, inletType = "box-wingwall-flare-30-to-75" });
        Assert.Equal(200, r.Status);

        double area = span * rise, radius = area / (2 * (span + rise));
        double dc = Math.Cbrt(q * q / (span * span * G));
        double v = q / area, hv = v * v / (2 * G);
        double outlet = Math.Max(tw, (dc + rise) / 2) + ke * hv + n * n * len * v * v / Math.Pow(radius, 4.0 / 3.0) + hv - s * len;
        double x = (q / (Foot * Foot * Foot)) / (area / (Foot * Foot) * Math.Sqrt(rise / Foot));
        double hc = dc + Math.Pow(q / (span * dc), 2) / (2 * G);
        double inlet = rise * (hc / rise + 0.026 * x - 0.5 * s);

        var b = r.Body;
        Assert.Equal(dc, b.GetProperty("criticalDepth").GetDouble(), 1e-12);
        Assert.Equal(outlet, b.GetProperty("outletControlHeadwater").GetDouble(), 1e-12);
        Assert.Equal(inlet, b.GetProperty("inletControlHeadwater").GetDouble(), 1e-12);
        Assert.Equal(Math.Max(tw, (dc + rise) / 2), b.GetProperty("outletControlTailwater").GetDouble(), 1e-12);
        Assert.Equal(Math.Max(inlet, outlet), b.GetProperty("headwater").GetDouble(), 1e-12);
        Assert.Equal("box", b.GetProperty("shape").GetString());
    }

    [Fact]
    public async Task UsUnits_GiveTheSameCulvertInFeet()
    {
        var si = await api.GetJson($"{Route}?span=2.4&rise=1.5&length=28&slope=0.004&manningN=0.015&flow=6.5&tailwaterDepth=1.1&inletType=box-headwall-bevel-45");
        string us = $"{Route}?span={Inv(2.4 / Foot)}&rise={Inv(1.5 / Foot)}&length={Inv(28 / Foot)}&slope=0.004&manningN=0.015" +
                    $"&flow={Inv(6.5 / (Foot * Foot * Foot))}&tailwaterDepth={Inv(1.1 / Foot)}&inletType=box-headwall-bevel-45&units=us";
        var ft = await api.GetJson(us);
        Assert.Equal(200, ft.Status);
        foreach (string f in new[] { "headwater", "inletControlHeadwater", "outletControlHeadwater", "criticalDepth" })
            Assert.Equal(si.Body.GetProperty(f).GetDouble() / Foot, ft.Body.GetProperty(f).GetDouble(), 1e-9);
        Assert.Equal(si.Body.GetProperty("outletVelocity").GetDouble() / Foot, ft.Body.GetProperty("outletVelocity").GetDouble(), 1e-9);
        Assert.Equal(si.Body.GetProperty("flowParameter").GetDouble(), ft.Body.GetProperty("flowParameter").GetDouble(), 1e-12);
    }

    [Fact]
    public async Task ExplicitCoefficients_StandInForTheRow_AndSubmergedFlowIsTheOrificeEquation()
    {
        // Submerged: X above 4; HW/D = c X^2 + Y + Ks S with the square-edged concrete row's c and Y (HDS-5 Table A.1, from memory).
        double d = 1.2, q = 3.5, s = 0.01, area = Math.PI * d * d / 4;
        string common = "diameter=1.2&length=40&slope=0.01&manningN=0.013&flow=3.5&tailwaterDepth=0.5";
        var named = await api.GetJson($"{Route}?{common}&inletType=circular-concrete-square-edge-headwall");
        var given = await api.GetJson($"{Route}?{common}&inletForm=1&inletK=0.0098&inletM=2&inletC=0.0398&inletY=0.67&entranceLossCoefficient=0.5");
        Assert.Equal(200, given.Status);
        double x = (q / (Foot * Foot * Foot)) / (area / (Foot * Foot) * Math.Sqrt(d / Foot));
        Assert.Equal(d * (0.0398 * x * x + 0.67 - 0.5 * s), given.Body.GetProperty("inletControlHeadwater").GetDouble(), 1e-12);
        Assert.Equal("submerged", given.Body.GetProperty("inletRegime").GetString());
        Assert.Equal(named.Body.GetProperty("headwater").GetDouble(), given.Body.GetProperty("headwater").GetDouble());
        Assert.Equal(JsonValueKind.Null, given.Body.GetProperty("coefficients").TryGetProperty("inletType", out var t) ? t.ValueKind : JsonValueKind.Null);
        Assert.Contains(given.Body.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("field").GetString() == "inletKs");
        Assert.Contains(given.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "headwater-ratio-high");
    }

    [Fact]
    public async Task Transition_IsWarned_AndLiesBetweenItsEndValues()
    {
        double d = 1.2, area = Math.PI * d * d / 4;
        double q = 3.75 * area * Math.Sqrt(d) * Math.Sqrt(Foot); // X = 3.75 in foot units
        var r = await api.GetJson($"{Route}?diameter=1.2&length=40&slope=0.01&manningN=0.013&flow={Inv(q)}&tailwaterDepth=0.5&inletType=circular-concrete-square-edge-headwall");
        Assert.Equal(200, r.Status);
        Assert.Equal("transition", r.Body.GetProperty("inletRegime").GetString());
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "inlet-control-transition");
        // Submerged end at X = 4 bounds it above (the headwater rises with the flow).
        double high = d * (0.0398 * 16 + 0.67 - 0.005);
        Assert.True(r.Body.GetProperty("inletControlHeadwater").GetDouble() < high);
    }

    [Fact]
    public async Task Sheet_ShowsBothControls_AtTheAnswersHeadwaters()
    {
        const string query = $"{Route}?diameter=0.9&length=120&slope=0.002&manningN=0.024&inletType=circular-corrugated-metal-headwall&flow=1&tailwaterDepth=1.1";
        var json = await api.GetJson(query);
        var page = await SheetPage.Get(api, query + "&format=html");
        Assert.Equal(200, page.Status);
        var levels = page.Cases("plot-culvert").ToDictionary(e => e.GetAttribute("data-name")!);
        Assert.Equal(json.Body.GetProperty("inletControlHeadwater").GetDouble(), SheetPage.Attr(levels["inlet-control headwater"], "data-y"));
        Assert.Equal(json.Body.GetProperty("outletControlHeadwater").GetDouble(), SheetPage.Attr(levels["outlet-control headwater"], "data-y"));
        var rows = page.Document.QuerySelectorAll("#table-controls tbody tr");
        Assert.Equal(2, rows.Length);
        Assert.Equal("outlet", json.Body.GetProperty("control").GetString());
        Assert.Contains("governs", rows[1].TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Trace_Batch_And_Check_Come_With_The_Declaration()
    {
        var traced = await api.GetJson($"{Route}?span=2&rise=1.5&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=box-headwall-bevel-45&trace=true");
        Assert.Equal(200, traced.Status);
        Assert.True(traced.Body.GetProperty("trace").GetArrayLength() >= 1);

        using var csv = new StringContent("span,rise,length,slope,manningN,flow,tailwaterDepth,inletType\n2,1.5,30,0.005,0.015,4,0.4,box-headwall-bevel-45\n2,1.5,30,0.005,0.015,4,0.4,no-such-inlet\n",
            System.Text.Encoding.UTF8, "text/csv");
        using var batch = await api.Client.PostAsync("/v1/batch/channels/culvert", csv, Cancel);
        Assert.Equal(System.Net.HttpStatusCode.OK, batch.StatusCode);
        var lines = (await batch.Content.ReadAsStringAsync(Cancel)).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        var header = lines[0].Split(',');
        int status = Array.IndexOf(header, "httpStatus"), hw = Array.IndexOf(header, "headwater");
        Assert.Equal("200", lines[1].Split(',')[status]);
        // Form 2: HW = D K X^M with the bevelled box row (HDS-5 Table A.1: K 0.495, M 0.667; from memory).
        double x = (4 / (Foot * Foot * Foot)) / (3 / (Foot * Foot) * Math.Sqrt(1.5 / Foot));
        double inlet = 1.5 * 0.495 * Math.Pow(x, 0.667);
        Assert.True(double.Parse(lines[1].Split(',')[hw], CultureInfo.InvariantCulture) >= inlet - 1e-12);
        Assert.Equal("400", lines[2].Split(',')[status]);

        var check = await api.PostJson("/v1/check/channels/culvert", new
        {
            span = 2, rise = 1.5, length = 30, slope = 0.005, manningN = 0.015, flow = 4, tailwaterDepth = 0.4, inletType = "box-headwall-bevel-45",
            claimed = new { inletControlHeadwater = Math.Round(inlet, 3) },
        });
        Assert.Equal(200, check.Status);
        Assert.True(check.Body.GetProperty("passed").GetBoolean());
    }

    [Theory]
    [InlineData("span=2&rise=1.5&diameter=1&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=box-headwall-bevel-45", "diameter")]
    [InlineData("length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=box-headwall-bevel-45", "diameter")]
    [InlineData("span=2&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=box-headwall-bevel-45", "rise")]
    [InlineData("span=2&rise=1.5&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4", "inletType")]
    [InlineData("span=2&rise=1.5&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=no-such-inlet", "inletType")]
    [InlineData("span=2&rise=1.5&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=box-headwall-bevel-45&inletK=0.5", "inletType")]
    [InlineData("diameter=1&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=box-headwall-bevel-45", "inletType")]
    [InlineData("diameter=1&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletForm=3&inletK=0.5&inletM=0.667&inletC=0.03&inletY=0.8&entranceLossCoefficient=0.5", "inletForm")]
    [InlineData("diameter=1&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletForm=2&inletK=0.5&inletM=0.667&inletY=0.8&entranceLossCoefficient=0.5", "inletC")]
    [InlineData("diameter=1&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletForm=2&inletK=0.5&inletM=0.667&inletC=0.03&inletY=0.8", "entranceLossCoefficient")]
    [InlineData("diameter=1&length=30&slope=0.005&manningN=0.015&flow=4&tailwaterDepth=0.4&inletForm=1.5&inletK=0.5&inletM=0.667&inletC=0.03&inletY=0.8&entranceLossCoefficient=0.5", "inletForm")]
    [InlineData("diameter=1&length=30&slope=1&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=circular-beveled-ring-45", "slope")]
    [InlineData("diameter=1&length=30&slope=0.01&manningN=0.015&flow=-4&tailwaterDepth=0.4&inletType=circular-beveled-ring-45", "flow")]
    [InlineData("diameter=1&length=0&slope=0.01&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=circular-beveled-ring-45", "length")]
    [InlineData("diameter=1&length=30&slope=0.01&flow=4&tailwaterDepth=0.4&inletType=circular-beveled-ring-45", "manningN")]
    [InlineData("diameter=1&length=30&slope=0.01&manningN=0.015&flow=4&tailwaterDepth=NaN&inletType=circular-beveled-ring-45", "tailwaterDepth")]
    [InlineData("diameter=1&length=30&slope=0.01&manningN=0.015&flow=4&inletType=circular-beveled-ring-45", "tailwaterDepth")]
    [InlineData("diameter=1&length=30&slope=0.01&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=circular-beveled-ring-45&entranceLossCoefficient=-0.1", "entranceLossCoefficient")]
    [InlineData("diameter=1e400&length=30&slope=0.01&manningN=0.015&flow=4&tailwaterDepth=0.4&inletType=circular-beveled-ring-45", "diameter")]
    public async Task BadInput_IsA400NamingTheField(string query, string field) =>
        ProblemAssert.NamesField(await api.GetJson($"{Route}?{query}"), 400, field);

    [Fact]
    public async Task BadBody_IsA400NamingTheField()
    {
        ProblemAssert.NamesField(await api.PostRaw(Route, "{\"diameter\":1,\"length\":30,\"slope\":0.01,\"manningN\":0.015,\"flow\":4,\"tailwaterDepth\":0.4,\"inletType\":\"circular-beveled-ring-45\",\"inletForm\":\"one\"}", "application/json"), 400, "inletForm");
        ProblemAssert.NamesField(await api.PostJson(Route, new { diameter = 1, length = 30, slope = 0.01, manningN = 0.015, flow = 4, tailwaterDepth = 0.4 }), 400, "inletType");
    }

    [Theory]
    [InlineData("diameter=1e-300&length=1e5&slope=0.999&manningN=1&flow=1e8&tailwaterDepth=1e5&inletForm=1&inletK=10&inletM=5&inletC=1&inletY=5&entranceLossCoefficient=5")]
    [InlineData("diameter=1e5&length=1e-300&slope=-0.999&manningN=1e-300&flow=1e-300&tailwaterDepth=0&inletType=circular-corrugated-metal-mitered")]
    [InlineData("span=1e5&rise=1e-300&length=1&slope=0&manningN=0.01&flow=1e8&tailwaterDepth=0&inletType=box-wingwall-flare-0")]
    [InlineData("span=1e-300&rise=1e5&length=1&slope=0.5&manningN=0.01&flow=5e-324&tailwaterDepth=0&inletType=box-wingwall-flare-0")]
    public async Task ExtremeInputs_AnswerWithFiniteNumbers_OrA4xx(string query)
    {
        var r = await api.GetJson($"{Route}?{query}");
        Assert.InRange(r.Status, 200, 499);
        if (r.Status == 200)
        {
            foreach (string f in new[] { "headwater", "inletControlHeadwater", "outletControlHeadwater", "outletVelocity", "residual" })
                Assert.True(double.IsFinite(r.Body.GetProperty(f).GetDouble()), f);
        }
    }
}
