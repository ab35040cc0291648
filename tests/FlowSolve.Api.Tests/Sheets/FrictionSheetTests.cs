using FlowSolve.Core.Friction;

namespace FlowSolve.Api.Tests.Sheets;

/// <summary>The friction chart: its curves are the engine's values, checked also against published figures.</summary>
public sealed class FrictionSheetTests(ApiFixture api)
{
    private const string Url = "/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&format=html";

    [Fact]
    public async Task Build_ColebrookCurves_EqualTheEngineAtEveryPlottedPoint()
    {
        var page = await SheetPage.Get(api, Url);

        var curves = page.Document.QuerySelectorAll("svg#plot-moody polyline[data-role=colebrook]");
        Assert.True(curves.Length >= 9, "a curve for each relative roughness");
        int compared = 0;
        foreach (var curve in curves)
        {
            double eD = double.Parse(curve.GetAttribute("data-name")!["e/D=".Length..], System.Globalization.CultureInfo.InvariantCulture);
            foreach (var (re, f) in SheetPage.Points(curve))
            {
                var exact = ColebrookWhite.Solve(re, eD);
                Assert.True(exact.Converged);
                Assert.Equal(exact.FrictionFactor, f, 1e-12);
                compared++;
            }
        }
        Assert.True(compared > 500);
    }

    [Fact]
    public async Task Build_LaminarLine_IsHagenPoiseuille()
    {
        var page = await SheetPage.Get(api, Url);

        var laminar = page.Document.QuerySelector("svg#plot-moody polyline[data-role=laminar]")!;
        var points = SheetPage.Points(laminar);
        Assert.NotEmpty(points);
        foreach (var (re, f) in points)
        {
            Assert.True(re <= 2000 * (1 + 1e-12), "laminar line ends at the laminar limit (common practice: 2000)");
            Assert.Equal(64 / re, f, 1e-14); // Hagen-Poiseuille, f = 64/Re
        }
        var band = page.Document.QuerySelector("svg#plot-moody rect[data-role=band]")!;
        Assert.Equal(2000, SheetPage.Attr(band, "data-x1"));
        Assert.Equal(4000, SheetPage.Attr(band, "data-x2"));
    }

    /// <summary>White, Fluid Mechanics, chapter on dimensional analysis, a problem's data table at e/D = 0.005
    /// (three significant figures; shared/reference-values.md).</summary>
    public static TheoryData<double, double> WhiteTable => new()
    {
        { 15_000, 0.0356 }, { 75_000, 0.0316 }, { 250_000, 0.0308 }, { 900_000, 0.0305 }, { 3_330_000, 0.0304 },
    };

    [Theory]
    [MemberData(nameof(WhiteTable))]
    public async Task Build_CurveAtRoughness0005_MatchesWhitesTable(double reynolds, double expected)
    {
        var page = await SheetPage.Get(api, Url);

        var curve = page.Document.QuerySelector("svg#plot-moody polyline[data-name='e/D=0.005']")!;
        double f = LogLogInterpolate(SheetPage.Points(curve), reynolds);
        Assert.Equal(expected, f, expected * 0.005); // three significant figures, plus the chart's interpolation
    }

    [Fact]
    public async Task Build_RoughestCurveAtHighReynolds_MeetsTheFullyRoughLimit()
    {
        var page = await SheetPage.Get(api, Url);

        // Fully rough limit 1/sqrt(f) = -2 log10((e/D)/3.7), as labelled on a reproduction of Moody (1944).
        var curve = page.Document.QuerySelector("svg#plot-moody polyline[data-name='e/D=0.05']")!;
        var (re, f) = SheetPage.Points(curve)[^1];
        Assert.True(re >= 1e8);
        double limit = Math.Pow(-2 * Math.Log10(0.05 / 3.7), -2);
        Assert.Equal(limit, f, limit * 1e-4);
    }

    [Fact]
    public async Task Build_CaseMarker_IsTheResponseValue()
    {
        var page = await SheetPage.Get(api, Url);
        var json = await api.GetJson("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005");

        var marker = Assert.Single(page.Cases("plot-moody"));
        Assert.Equal(75000, SheetPage.Attr(marker, "data-x"));
        Assert.Equal(json.Body.GetProperty("frictionFactor").GetDouble(), SheetPage.Attr(marker, "data-y"));
        Assert.Equal(0.0316, SheetPage.Attr(marker, "data-y"), 0.00005); // White's table, Re 75 000
    }

    [Fact]
    public async Task Build_SolverRecord_ListsEveryIterationOfTheTrace()
    {
        var page = await SheetPage.Get(api, Url);
        var json = await api.GetJson("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&trace=true");

        var trace = json.Body.GetProperty("trace");
        var rows = page.Document.QuerySelectorAll("#iterations tbody tr");
        Assert.Equal(trace.GetArrayLength(), rows.Length);
        Assert.InRange(rows.Length, 1, 8);
        var points = SheetPage.Points(page.Document.QuerySelector("svg#plot-convergence polyline[data-role=residual]")!);
        for (int i = 0; i < points.Length; i++)
            Assert.Equal(Math.Max(Math.Abs(trace[i].GetProperty("residual").GetDouble()), 1e-17), points[i].Y);
        Assert.Contains(json.Body.GetProperty("status").GetString()!, page.Document.GetElementById("solver")!.TextContent);
        var last = Assert.Single(page.Cases("plot-convergence"));
        Assert.Equal(rows.Length, SheetPage.Attr(last, "data-x"));
    }

    [Fact]
    public async Task Build_LaminarCase_NoIterationsSaidSo()
    {
        var page = await SheetPage.Get(api, "/v1/friction-factor?reynolds=1500&relativeRoughness=0.001&format=html");

        var marker = Assert.Single(page.Cases("plot-moody"));
        Assert.Equal(64.0 / 1500, SheetPage.Attr(marker, "data-y"), 1e-15);
        Assert.Contains("explicit", page.Document.GetElementById("solver")!.TextContent);
        Assert.Empty(page.Document.QuerySelectorAll("#iterations"));
    }

    private static double LogLogInterpolate((double X, double Y)[] points, double x)
    {
        for (int i = 1; i < points.Length; i++)
        {
            if (points[i].X < x) continue;
            double t = (Math.Log(x) - Math.Log(points[i - 1].X)) / (Math.Log(points[i].X) - Math.Log(points[i - 1].X));
            return Math.Exp(Math.Log(points[i - 1].Y) + t * (Math.Log(points[i].Y) - Math.Log(points[i - 1].Y)));
        }
        throw new ArgumentOutOfRangeException(nameof(x));
    }
}
