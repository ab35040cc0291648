using FlowSolve.Api.Tests.Sheets;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Api.Tests.NonNewtonian;

/// <summary>The non-Newtonian calculation sheets: the case is the answer, and the chart's curves satisfy the published
/// relations they are labelled with.</summary>
public sealed class NonNewtonianSheetTests(ApiFixture api)
{
    private const string PowerLaw = "model=power-law&density=1200&consistencyIndex=0.5&flowBehaviorIndex=0.6";
    private const string Bingham = "model=bingham-plastic&density=1450&yieldStress=25&plasticViscosity=0.06";

    [Fact]
    public async Task FrictionSheet_PowerLaw_LaminarLineIsSixteenOverReAndTurbulentIsDodgeMetzner()
    {
        string url = $"/v1/non-newtonian/friction-factor?{PowerLaw}&velocity=2&diameter=0.1";
        var page = await SheetPage.Get(api, url + "&format=html");
        var json = await api.GetJson(url);
        Assert.Equal(200, page.Status);
        var marker = Assert.Single(page.Cases("plot-non-newtonian"));
        Assert.Equal(json.Body.GetProperty("reynolds").GetDouble(), SheetPage.Attr(marker, "data-x"));
        Assert.Equal(json.Body.GetProperty("fanningFrictionFactor").GetDouble(), SheetPage.Attr(marker, "data-y"));

        var laminar = page.Document.QuerySelector("svg#plot-non-newtonian polyline[data-role=laminar]")!;
        foreach (var (re, f) in SheetPage.Points(laminar)) Assert.Equal(16 / re, f, 1e-14 * f);
        var turbulent = page.Document.QuerySelector("svg#plot-non-newtonian polyline[data-role=turbulent]")!;
        int compared = 0;
        foreach (var (re, f) in SheetPage.Points(turbulent))
        {
            // Dodge-Metzner in its published form, by Brent.
            double brent = Brent.FindRoot(x => 1 / Math.Sqrt(x) - 4.0 / Math.Pow(0.6, 0.75) * Math.Log10(re * Math.Pow(x, 0.7)) + 0.4 / Math.Pow(0.6, 1.2),
                1e-7, 0.5, 1e-18, 1000);
            Assert.Equal(brent, f, 1e-11 * brent);
            compared++;
        }
        Assert.True(compared > 20);
        Assert.Contains("measurements of the actual fluid", page.Html);
        Assert.Contains("qualified engineer", page.Html);
    }

    [Fact]
    public async Task HeadLossAndFlowSheets_Bingham_LaminarPartSatisfiesBuckinghamReiner()
    {
        var page = await SheetPage.Get(api, $"/v1/non-newtonian/head-loss?{Bingham}&flow=0.03&diameter=0.15&length=1200&format=html");
        Assert.Equal(200, page.Status);
        double he = 1450 * 0.15 * 0.15 * 25 / (0.06 * 0.06);
        var laminar = page.Document.QuerySelector("svg#plot-non-newtonian polyline[data-role=laminar]")!;
        foreach (var (re, f) in SheetPage.Points(laminar))
        {
            // The published form's residual, relative to 16/Re, at each plotted point.
            double published = 16 / re * (1 + he / (6 * re) - Math.Pow(he / (re * re), 4) * re / (3 * f * f * f));
            Assert.Equal(published, f, 1e-9 * f);
        }
        var flow = await SheetPage.Get(api, $"/v1/non-newtonian/flow?{Bingham}&headLoss=80&diameter=0.15&length=1200&format=html");
        Assert.Equal(200, flow.Status);
        Assert.Contains("Head that starts flow", flow.Html);
        Assert.Contains("solver", flow.Html, StringComparison.OrdinalIgnoreCase);
    }
}
