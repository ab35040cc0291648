using System.Globalization;

namespace FlowSolve.Api.Tests.Sheets;

/// <summary>
/// The duty-point sheet against closed forms: a quadratic pump H = 40 - 5000 Q^2 on a quadratic system
/// H = 15 + 3000 Q^2 meets it where 25 = 8000 Q^2 (one pump) or 25 = 4250 Q^2 (two in parallel, each carrying Q/2);
/// the plotted curves are those polynomials at every plotted flow, and the marked points are the response's.
/// </summary>
public sealed class PumpSheetsTests(ApiFixture api)
{
    private const string Quadratic = "/v1/pumps/duty-point?c0=40&c1=0&c2=-5000&staticHead=15&resistance=3000";

    private static double PumpHead(double q) => 40 - 5000 * q * q;

    private static double SystemHead(double q) => 15 + 3000 * q * q;

    private static void AssertRelative(double expected, double actual, double tolerance) =>
        Assert.True(Math.Abs(actual - expected) <= tolerance * Math.Max(Math.Abs(expected), 1e-300), $"expected {expected:R}, got {actual:R}");

    [Fact]
    public async Task Build_QuadraticPumpOnQuadraticSystem_SelfContainedSheetWithEveryPart()
    {
        var page = await SheetPage.Get(api, Quadratic + "&format=html");

        Assert.Equal(200, page.Status);
        Assert.Equal("text/html", page.ContentType);
        foreach (var id in new[] { "inputs", "defaults", "method", "results", "solver", "validity", "warnings", "cautions" })
            Assert.NotNull(page.Document.GetElementById(id));
        string cautions = page.Document.GetElementById("cautions")!.TextContent;
        Assert.Contains("qualified engineer", cautions);
        Assert.Contains("water hammer", cautions);
        Assert.NotNull(page.Document.QuerySelector("svg#plot-duty-point"));
        Assert.NotNull(page.Document.QuerySelector("svg#plot-convergence"));
        // Every default the response applied is listed (the fluid, the units, the arrangement, the speed).
        var json = await api.GetJson(Quadratic);
        string defaults = page.Document.GetElementById("defaults")!.TextContent;
        foreach (var a in json.Body.GetProperty("assumptions").EnumerateArray())
            Assert.Contains(a.GetProperty("field").GetString()!, defaults);
        Assert.Contains("Affinity laws", page.Document.GetElementById("method")!.TextContent);
        HtmlFormatFilterTests.AssertSelfContained(page);
    }

    [Fact]
    public async Task Build_OnePump_CurvesAreTheClosedFormsAndTheMarkerIsTheDutyPoint()
    {
        var page = await SheetPage.Get(api, Quadratic + "&format=html");
        var json = await api.GetJson(Quadratic);

        var set = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=pump-set]")!);
        var system = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=system]")!);
        Assert.Equal(81, set.Length);
        Assert.Equal(set.Select(p => p.X), system.Select(p => p.X));
        foreach (var (q, h) in set) AssertRelative(PumpHead(q), h, 1e-12);
        foreach (var (q, h) in system) AssertRelative(SystemHead(q), h, 1e-12);
        Assert.Equal(0, set[0].X);

        var marker = Assert.Single(page.Cases("plot-duty-point"));
        double flow = json.Body.GetProperty("flow").GetDouble();
        Assert.Equal(flow, SheetPage.Attr(marker, "data-x"));
        Assert.Equal(json.Body.GetProperty("head").GetDouble(), SheetPage.Attr(marker, "data-y"));
        // Closed form: 40 - 5000 Q^2 = 15 + 3000 Q^2 gives Q = sqrt(25/8000), H = 15 + 3000 (25/8000) = 24.375.
        AssertRelative(Math.Sqrt(25.0 / 8000.0), SheetPage.Attr(marker, "data-x"), 1e-12);
        AssertRelative(24.375, SheetPage.Attr(marker, "data-y"), 1e-12);
        Assert.Empty(page.Document.QuerySelectorAll("svg#plot-duty-point [data-role=bep]"));
    }

    [Fact]
    public async Task Build_TwoPumpsInParallel_SetCurveIsTheSharedFlowClosedForm()
    {
        string query = Quadratic + "&pumpsInParallel=2";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        var pump = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=pump]")!);
        var set = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=pump-set]")!);
        var system = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=system]")!);
        foreach (var (q, h) in pump) AssertRelative(PumpHead(q), h, 1e-12);
        foreach (var (q, h) in set) AssertRelative(PumpHead(q / 2), h, 1e-12); // each of two carries Q/2 at the common head
        foreach (var (q, h) in system) AssertRelative(SystemHead(q), h, 1e-12);
        // The plot reaches past the set's zero-head flow, 2 sqrt(40/5000).
        Assert.True(set[^1].X > 2 * Math.Sqrt(40.0 / 5000.0));

        var marker = Assert.Single(page.Cases("plot-duty-point"));
        Assert.Equal(json.Body.GetProperty("flow").GetDouble(), SheetPage.Attr(marker, "data-x"));
        Assert.Equal(json.Body.GetProperty("head").GetDouble(), SheetPage.Attr(marker, "data-y"));
        // Closed form: 40 - 1250 Q^2 = 15 + 3000 Q^2 gives Q = sqrt(25/4250).
        AssertRelative(Math.Sqrt(25.0 / 4250.0), SheetPage.Attr(marker, "data-x"), 1e-12);
        AssertRelative(SystemHead(Math.Sqrt(25.0 / 4250.0)), SheetPage.Attr(marker, "data-y"), 1e-12);
    }

    [Fact]
    public async Task Build_UsUnits_PlottedInTheResponsesUnits()
    {
        // The same polynomials read in ft and ft3/s: the closed forms hold in those units.
        string query = Quadratic + "&units=us";
        var page = await SheetPage.Get(api, query + "&format=html");
        var json = await api.GetJson(query);

        Assert.Equal("ft", json.Body.GetProperty("headUnit").GetString());
        var set = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=pump-set]")!);
        var system = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=system]")!);
        foreach (var (q, h) in set) AssertRelative(PumpHead(q), h, 1e-12);
        foreach (var (q, h) in system) AssertRelative(SystemHead(q), h, 1e-12);
        var marker = Assert.Single(page.Cases("plot-duty-point"));
        Assert.Equal(json.Body.GetProperty("flow").GetDouble(), SheetPage.Attr(marker, "data-x"));
        AssertRelative(Math.Sqrt(25.0 / 8000.0), SheetPage.Attr(marker, "data-x"), 1e-12);
        AssertRelative(24.375, SheetPage.Attr(marker, "data-y"), 1e-12);
        Assert.Contains("flow Q (ft3/s)", page.Document.QuerySelector("svg#plot-duty-point")!.TextContent);
    }

    [Fact]
    public async Task Build_EfficiencyPoints_BestEfficiencyMarkerIsTheResponsesBestEfficiencyFlow()
    {
        // Points on H = 40 - 5000 Q^2 and on eta = 20 Q - 200 Q^2 (both exact, so the least-squares fits recover them):
        // the efficiency peaks where d(eta)/dQ = 20 - 400 Q = 0, at Q = 0.05 m3/s with eta = 0.5.
        double[] flows = [0.01, 0.02, 0.04, 0.06, 0.08];
        var body = new
        {
            pump = new { points = flows.Select(q => new { flow = q, head = PumpHead(q), efficiency = 20 * q - 200 * q * q }).ToArray() },
            system = new { staticHead = 15.0, resistance = 3000.0 },
            pumpsInParallel = 2,
        };
        var page = await SheetPage.Post(api, "/v1/pumps/duty-point?format=html", body);
        var json = await api.PostJson("/v1/pumps/duty-point", body);

        Assert.Equal(200, page.Status);
        double bep = json.Body.GetProperty("bestEfficiencyFlow").GetDouble();
        AssertRelative(0.05, bep, 1e-9);
        var markers = page.Document.QuerySelectorAll("svg#plot-duty-point [data-role=bep]").ToDictionary(e => e.GetAttribute("data-name")!);
        var one = markers["best efficiency, one pump"];
        Assert.Equal(bep, SheetPage.Attr(one, "data-x"));
        AssertRelative(PumpHead(0.05), SheetPage.Attr(one, "data-y"), 1e-9);
        var ofSet = markers["best efficiency, pump set"];
        Assert.Equal(2 * bep, SheetPage.Attr(ofSet, "data-x"));
        AssertRelative(PumpHead(0.05), SheetPage.Attr(ofSet, "data-y"), 1e-9);

        var duty = Assert.Single(page.Cases("plot-duty-point"));
        Assert.Equal(json.Body.GetProperty("flow").GetDouble(), SheetPage.Attr(duty, "data-x"));
        AssertRelative(Math.Sqrt(25.0 / 4250.0), SheetPage.Attr(duty, "data-x"), 1e-9);

        // The efficiency plot: the curve read per pump at Q/2, the best efficiency 0.5 at the set flow 0.1.
        var eff = SheetPage.Points(page.Document.QuerySelector("svg#plot-efficiency polyline[data-role=efficiency]")!);
        foreach (var (q, e) in eff) Assert.Equal(20 * (q / 2) - 200 * (q / 2) * (q / 2), e, 1e-9);
        var effBep = page.Document.QuerySelector("svg#plot-efficiency [data-role=bep]")!;
        Assert.Equal(2 * bep, SheetPage.Attr(effBep, "data-x"));
        Assert.Equal(0.5, SheetPage.Attr(effBep, "data-y"), 1e-9);
        var effDuty = Assert.Single(page.Cases("plot-efficiency"));
        Assert.Equal(json.Body.GetProperty("efficiency").GetDouble(), SheetPage.Attr(effDuty, "data-y"));
        Assert.Contains("least-squares", page.Document.GetElementById("method")!.TextContent);
        HtmlFormatFilterTests.AssertSelfContained(page);
    }

    [Fact]
    public async Task Build_CataloguePoints_AreDrawnBesideTheFittedCurves()
    {
        // Points on H = 40 - 5000 Q^2 and eta = 20 Q - 200 Q^2, two pumps in parallel at speed ratio 0.9: by the affinity
        // laws each point sits on the one-pump curve at (s q, s^2 H), and its efficiency at the set flow Np s q.
        double[] flows = [0.01, 0.02, 0.04, 0.06, 0.08];
        double s = 0.9;
        var body = new
        {
            pump = new { points = flows.Select(q => new { flow = q, head = PumpHead(q), efficiency = 20 * q - 200 * q * q }).ToArray() },
            system = new { staticHead = 5.0, resistance = 1000.0 },
            pumpsInParallel = 2,
            speedRatio = s,
        };
        var page = await SheetPage.Post(api, "/v1/pumps/duty-point?format=html", body);
        Assert.Equal(200, page.Status);
        var head = page.Document.QuerySelectorAll("svg#plot-duty-point [data-role=catalogue]").ToList();
        Assert.Equal(flows.Length, head.Count);
        for (int i = 0; i < flows.Length; i++)
        {
            AssertRelative(s * flows[i], SheetPage.Attr(head[i], "data-x"), 1e-12);
            AssertRelative(s * s * PumpHead(flows[i]), SheetPage.Attr(head[i], "data-y"), 1e-12);
        }
        var eff = page.Document.QuerySelectorAll("svg#plot-efficiency [data-role=catalogue]").ToList();
        Assert.Equal(flows.Length, eff.Count);
        for (int i = 0; i < flows.Length; i++)
        {
            AssertRelative(2 * s * flows[i], SheetPage.Attr(eff[i], "data-x"), 1e-12);
            AssertRelative(20 * flows[i] - 200 * flows[i] * flows[i], SheetPage.Attr(eff[i], "data-y"), 1e-12);
        }
        var results = page.Document.GetElementById("results")!.TextContent;
        Assert.Contains("Efficiency fit: largest deviation", results);
    }

    [Fact]
    public async Task Build_PipesSuctionAndNpshData_ShowsTheMarginAndThePipeRelations()
    {
        // The OpenAPI example (a fictional pump and rising main): points with efficiency and NPSH required, two pipes, suction data.
        var body = FlowSolve.Api.Pumps.PumpDocs.Example;
        var page = await SheetPage.Post(api, "/v1/pumps/duty-point?format=html", body);
        var json = await api.PostJson("/v1/pumps/duty-point", body);

        Assert.Equal(200, page.Status);
        var results = page.Document.GetElementById("results")!.QuerySelectorAll("tr").ToDictionary(r => r.Children[0].TextContent, r => r.Children[1].TextContent);
        Assert.Equal(json.Body.GetProperty("npshMargin").GetDouble().ToString("G8", CultureInfo.InvariantCulture), results["NPSH margin NPSHa - NPSHr"]);
        Assert.Equal(json.Body.GetProperty("bestEfficiencyRatio").GetDouble().ToString("G8", CultureInfo.InvariantCulture), results["Flow per pump / best-efficiency flow (BEP ratio)"]);
        string method = page.Document.GetElementById("method")!.TextContent;
        Assert.Contains("Colebrook-White", method);
        Assert.Contains("Darcy-Weisbach", method);
        Assert.Contains("NPSHa = (p_surface - p_vapour)/(rho g) + z_s - h_losses", method);
        // The system curve here comes from the pipes: at zero flow it is the static head, 12 m, and it rises with flow.
        var system = SheetPage.Points(page.Document.QuerySelector("svg#plot-duty-point polyline[data-role=system]")!);
        Assert.Equal(12, system[0].Y, 1e-12);
        Assert.All(system.Zip(system.Skip(1)), p => Assert.True(p.Second.Y > p.First.Y));
        var duty = Assert.Single(page.Cases("plot-duty-point"));
        Assert.Equal(json.Body.GetProperty("head").GetDouble(), SheetPage.Attr(duty, "data-y"));
        HtmlFormatFilterTests.AssertSelfContained(page);
    }

    [Fact]
    public async Task Build_SolverRecord_EveryIterationOfTheTrace()
    {
        var page = await SheetPage.Get(api, Quadratic + "&format=html");
        var traced = await api.GetJson(Quadratic + "&trace=true");

        Assert.True(traced.Body.GetProperty("converged").GetBoolean());
        var trace = traced.Body.GetProperty("trace");
        var rows = page.Document.QuerySelectorAll("#iterations tbody tr");
        Assert.Equal(trace.GetArrayLength(), rows.Length);
        Assert.InRange(rows.Length, 1, 12);
        for (int i = 0; i < rows.Length; i++)
        {
            var cells = rows[i].QuerySelectorAll("td");
            Assert.Equal(trace[i].GetProperty("x").GetDouble(), double.Parse(cells[1].TextContent, CultureInfo.InvariantCulture));
            Assert.Equal(trace[i].GetProperty("kind").GetString(), cells[4].TextContent.Split(' ')[0]);
        }
        // The last iterate plus its step is the duty flow (SI here): the closed form sqrt(25/8000).
        var last = trace[trace.GetArrayLength() - 1];
        AssertRelative(Math.Sqrt(25.0 / 8000.0), last.GetProperty("x").GetDouble() + last.GetProperty("step").GetDouble(), 1e-12);
        Assert.NotEmpty(page.Cases("plot-convergence"));
        Assert.Contains(traced.Body.GetProperty("solverStatus").GetString()!, page.Document.GetElementById("solver")!.TextContent);
    }
}
