using FlowSolve.Core.Fluids;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Api.Tests.Sheets;

/// <summary>The pipe sheets: the head-loss curve is the engine's, and the marked point is the response's.</summary>
public sealed class PipeSheetsTests(ApiFixture api)
{
    [Fact]
    public async Task FlowAndDiameter_NearRe4000_ShowTheAlternateAsTheResponseDoes()
    {
        // Inside the drop of the head loss at Re 4000 (Churchill above Colebrook-White): the response carries a second
        // root, and the sheet lists it beside the answer, as the channel sheet lists a second normal depth.
        const string flowQuery = "/v1/pipes/flow?headLoss=0.0033706&diameter=0.1&length=100&roughness=0.0001&kinematicViscosity=1e-6&density=1000";
        const string diameterQuery = "/v1/pipes/diameter?flow=0.00142&headLoss=0.00035555127&length=1000&roughness=0&kinematicViscosity=1e-6&density=1000";
        foreach (var (query, field, row) in new[] { (flowQuery, "alternateFlow", "Alternate flow"), (diameterQuery, "alternateDiameter", "Alternate diameter") })
        {
            var json = await api.GetJson(query);
            var page = await SheetPage.Get(api, query + "&format=html");
            Assert.Equal(200, page.Status);
            var results = page.Document.GetElementById("results")!.QuerySelectorAll("tr").Where(r => r.Children.Length > 1)
                .ToDictionary(r => r.Children[0].TextContent, r => r.Children[1].TextContent);
            double alternate = json.Body.GetProperty(field).GetDouble();
            Assert.Equal(alternate, double.Parse(results[row], System.Globalization.CultureInfo.InvariantCulture), alternate * 1e-7);
            Assert.Contains("second-solution", page.Document.GetElementById("warnings")!.TextContent);
        }
    }

    [Fact]
    public async Task HeadLoss_Curve_EqualsTheEngineAtEveryPlottedFlow()
    {
        const string query = "/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=1200&roughness=0.00026&minorLossCoefficient=3&kinematicViscosity=1.1e-6";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var curve = page.Document.QuerySelector("svg#plot-head-loss polyline[data-role=head-loss]")!;
        var pipe = new PipeGeometry(1200, 0.2, 0.00026, 3);
        var fluid = new FluidProperties(1.1e-6);
        var points = SheetPage.Points(curve);
        Assert.Equal(80, points.Length);
        foreach (var (q, h) in points)
            Assert.Equal(PipeHeadLoss.Compute(pipe, fluid, q).HeadLoss, h, 1e-12 * h);
        // Darcy-Weisbach by hand at the case's own flow: h = (f L/D + K) V^2/(2g), f from the response.
        double f = json.Body.GetProperty("frictionFactor").GetDouble();
        double v = 0.05 / (Math.PI * 0.01);
        double byHand = (f * 1200 / 0.2 + 3) * v * v / (2 * 9.80665);
        var marker = Assert.Single(page.Cases("plot-head-loss"));
        Assert.Equal(json.Body.GetProperty("headLoss").GetDouble(), SheetPage.Attr(marker, "data-y"));
        Assert.Equal(0.05, SheetPage.Attr(marker, "data-x"));
        Assert.Equal(byHand, SheetPage.Attr(marker, "data-y"), byHand * 1e-12);
        Assert.Contains(points, p => Math.Abs(p.X - 0.05) < 1e-15 && Math.Abs(p.Y - byHand) < byHand * 1e-12);
    }

    [Fact]
    public async Task HeadLoss_UsUnits_CurveAndMarkerInTheResponsesUnits()
    {
        const string query = "/v1/pipes/head-loss?flow=500&flowUnit=gpm&diameter=0.5&length=1000&roughness=0.00015&units=us&temperature=68";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var marker = Assert.Single(page.Cases("plot-head-loss"));
        Assert.Equal(500, SheetPage.Attr(marker, "data-x"));
        Assert.Equal(json.Body.GetProperty("headLoss").GetDouble(), SheetPage.Attr(marker, "data-y"));
        // The curve at 500 gpm, converted back to SI by the exact factors (NIST SP 811: 1 ft = 0.3048 m, 1 gal = 231 in3).
        double gpm = 231 * Math.Pow(0.0254, 3) / 60;
        var curve = SheetPage.Points(page.Document.QuerySelector("svg#plot-head-loss polyline")!);
        var (q, h) = curve.Single(p => Math.Abs(p.X - 500) < 1e-9);
        var si = PipeHeadLoss.Compute(new PipeGeometry(1000 * 0.3048, 0.5 * 0.3048, 0.00015 * 0.3048), new FluidProperties(Water.At((68 - 32) / 1.8).KinematicViscosity), q * gpm);
        Assert.Equal(si.HeadLoss / 0.3048, h, h * 1e-9);
    }

    [Fact]
    public async Task Flow_MarkerIsTheFlowFound_AndTheCurveMeetsTheDrivingHeadThere()
    {
        const string query = "/v1/pipes/flow?headLoss=20&diameter=0.15&length=800&roughness=0.000045&elevationChange=5&temperature=10";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var marker = Assert.Single(page.Cases("plot-head-loss"));
        Assert.Equal(json.Body.GetProperty("flow").GetDouble(), SheetPage.Attr(marker, "data-x"));
        Assert.Equal(15, SheetPage.Attr(marker, "data-y"), 1e-9); // 20 m available - 5 m rise
        var reference = page.Document.QuerySelector("svg#plot-head-loss [data-role=reference]")!;
        Assert.Equal(json.Body.GetProperty("drivingHead").GetDouble(), SheetPage.Attr(reference, "data-y"));
        var trace = (await api.GetJson(query + "&trace=true")).Body.GetProperty("trace");
        Assert.Equal(trace.GetArrayLength(), page.Document.QuerySelectorAll("#iterations tbody tr").Length);
        Assert.InRange(trace.GetArrayLength(), 1, 20);
    }

    [Fact]
    public async Task Diameter_MarkerIsTheAllowedLossAtTheFlow_AtTheMinimumDiameter()
    {
        const string query = "/v1/pipes/diameter?flow=0.03&headLoss=6&length=400&material=commercial-steel&sizeTable=asme-b36.10m-schedule-40";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var marker = Assert.Single(page.Cases("plot-head-loss"));
        Assert.Equal(0.03, SheetPage.Attr(marker, "data-x"));
        Assert.Equal(6, SheetPage.Attr(marker, "data-y"), 1e-9);
        Assert.Contains(json.Body.GetProperty("selectedSize").GetProperty("name").GetString()!, page.Document.GetElementById("results")!.TextContent);
        Assert.NotEmpty(page.Cases("plot-convergence"));
    }
}
