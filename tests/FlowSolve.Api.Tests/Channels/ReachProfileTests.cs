using System.Text.Json;
using FlowSolve.Api.Channels;
using FlowSolve.Api.Tests.Sheets;

namespace FlowSolve.Api.Tests.Channels;

/// <summary><c>POST /v1/channels/reach-profile</c> through the service: against the exact prismatic profile of
/// <c>/v1/channels/profile</c> (second-order convergence with the spacing), against the energy equation it states
/// (recomputed here from the answer's own velocities and friction slopes), against the critical-depth route, and every
/// bad field named by its path.</summary>
public sealed class ReachProfileTests(ApiFixture api)
{
    private const string Reach = "/v1/channels/reach-profile";
    private const double G = 9.80665;

    private static object Point(double station, double elevation) => new { station, elevation };

    /// <summary>A trapezoid b = 3 m, sides 2 : 1, banks 6 m high, lowest point at <paramref name="bed"/>.</summary>
    private static object[] Trapezoid(double bed) => [Point(0, bed + 6), Point(12, bed), Point(15, bed), Point(27, bed + 6)];

    private static object[] Rectangle(double width, double bed, double height = 4) =>
        [Point(0, bed + height), Point(0, bed), Point(width, bed), Point(width, bed + height)];

    private static JsonElement[] Sections(JsonElement body) => body.GetProperty("sections").EnumerateArray().ToArray();

    private static double D(JsonElement e, string name) => e.GetProperty(name).GetDouble();

    [Fact]
    public async Task Prismatic_reach_converges_to_the_exact_profile_route_at_second_order()
    {
        // M1 backwater: Q = 10 m3/s, n = 0.025, bed falling 0.001 downstream, 2.5 m deep at the downstream end, 2 km.
        var exact = await api.GetJson("/v1/channels/profile?shape=trapezoidal&bottomWidth=3&sideSlope=2&manningN=0.025&slope=0.001&flow=10&length=2000&controlDepth=2.5&stations=11");
        Assert.Equal(200, exact.Status);
        var reference = exact.Body.GetProperty("stations").EnumerateArray().Select(s => (X: D(s, "distance"), Z: 100 + 0.001 * D(s, "distance") + D(s, "depth"))).ToArray();
        var errors = new List<double>();
        foreach (int cells in new[] { 20, 40, 80 })
        {
            var sections = Enumerable.Range(0, cells + 1).Select(k => 2000.0 * k / cells)
                .Select(x => new { distance = x, points = Trapezoid(100 + 0.001 * x), manningN = 0.025 }).ToArray();
            // No transition losses: the gradually-varied-flow equation has none.
            var r = await api.PostJson(Reach, new { sections, flow = 10, startElevation = 102.5, expansionCoefficient = 0, contractionCoefficient = 0 });
            Assert.Equal(200, r.Status);
            Assert.True(r.Body.GetProperty("converged").GetBoolean());
            var st = Sections(r.Body);
            Assert.Equal(cells + 1, st.Length);
            errors.Add(reference.Max(p => Math.Abs(D(st.Single(s => Math.Abs(D(s, "distance") - p.X) < 1e-6), "elevation") - p.Z)));
        }
        // Observed order near 2 over successive halvings of the spacing (100, 50, 25 m).
        for (int k = 1; k < errors.Count; k++)
            Assert.InRange(Math.Log2(errors[k - 1] / errors[k]), 1.9, 2.1);
    }

    [Fact]
    public async Task Example_satisfies_the_energy_equation_between_sections_and_the_critical_depth_route()
    {
        var example = new ReachProfileCalculation().BodyExample;
        var r = await api.PostJson(Reach, example);
        Assert.Equal(200, r.Status);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        var st = Sections(r.Body);
        Assert.Equal(example.Sections!.Count, st.Length);
        Assert.Equal(11.6, D(st[0], "elevation"));
        double q = example.Flow!.Value;
        for (int i = 0; i < st.Length; i++)
        {
            var points = example.Sections[i].Points!;
            double bed = points.Min(p => p.Elevation!.Value);
            Assert.Equal(bed, D(st[i], "bedElevation"));
            Assert.Equal(D(st[i], "elevation") - bed, D(st[i], "depth"), 1e-12);
            double v = D(st[i], "velocity");
            Assert.Equal(q / D(st[i], "area"), v, 1e-12);
            Assert.Equal(D(st[i], "elevation") + v * v / (2 * G), D(st[i], "energyGradeLine"), 1e-12);
            Assert.True(D(st[i], "froudeNumber") < 1);
            var critical = await api.PostJson("/v1/channels/critical-depth", new
            {
                section = new { shape = "surveyed", points = points.Select(p => new { station = p.Station, elevation = p.Elevation }).ToArray() }, flow = q,
            });
            Assert.Equal(bed + D(critical.Body, "criticalDepth"), D(st[i], "criticalElevation"), 1e-9);
            if (i == 0) continue;
            // The stated equation from the answer's own numbers: the rise of the energy grade line upstream is the
            // distance times the mean friction slope, plus 0.1 (contraction) or 0.3 (expansion) times the change of
            // velocity head, by whether the velocity head grows or falls along the flow (downstream).
            double length = D(st[i], "distance") - D(st[i - 1], "distance");
            double friction = length * (D(st[i], "frictionSlope") + D(st[i - 1], "frictionSlope")) / 2;
            double hvDown = Math.Pow(D(st[i - 1], "velocity"), 2) / (2 * G), hvUp = v * v / (2 * G);
            double transition = (hvDown > hvUp ? 0.1 : 0.3) * Math.Abs(hvDown - hvUp);
            Assert.Equal(friction, D(st[i], "frictionLoss"), 1e-12);
            Assert.Equal(transition, D(st[i], "transitionLoss"), 1e-12);
            Assert.Equal(friction + transition, D(st[i], "energyGradeLine") - D(st[i - 1], "energyGradeLine"), 1e-9);
            Assert.InRange(st[i].GetProperty("iterations").GetInt32(), 1, 12);
        }
        var assumed = r.Body.GetProperty("assumptions").EnumerateArray().Select(a => a.GetProperty("field").GetString()).ToArray();
        Assert.Contains("expansionCoefficient", assumed);
        Assert.Contains("contractionCoefficient", assumed);
        Assert.Contains("startAt", assumed);
        Assert.Contains("energyCoefficient", assumed);
    }

    [Fact]
    public async Task Us_units_give_the_si_answer_in_feet()
    {
        const double ft = 0.3048;
        var example = new ReachProfileCalculation().BodyExample;
        var si = await api.PostJson(Reach, example);
        var us = await api.PostJson(Reach, new
        {
            sections = example.Sections!.Select(s => new
            {
                distance = s.Distance / ft, manningN = s.ManningN,
                points = s.Points!.Select(p => new { station = p.Station / ft, elevation = p.Elevation / ft, manningN = p.ManningN }).ToArray(),
            }).ToArray(),
            flow = example.Flow / (ft * ft * ft), startElevation = example.StartElevation / ft, units = "us",
        });
        Assert.Equal(200, us.Status);
        Assert.Equal("us", us.Body.GetProperty("units").GetString());
        var a = Sections(si.Body);
        var b = Sections(us.Body);
        for (int i = 0; i < a.Length; i++)
        {
            Assert.Equal(D(a[i], "elevation") / ft, D(b[i], "elevation"), 1e-9 * D(b[i], "elevation"));
            Assert.Equal(D(a[i], "velocity") / ft, D(b[i], "velocity"), 1e-9 * D(b[i], "velocity"));
            Assert.Equal(D(a[i], "area") / (ft * ft), D(b[i], "area"), 1e-9 * D(b[i], "area"));
            Assert.Equal(D(a[i], "froudeNumber"), D(b[i], "froudeNumber"), 1e-9);
        }
    }

    [Fact]
    public async Task A_step_up_over_a_high_bed_takes_critical_depth_with_a_warning()
    {
        // Q = 8 m3/s in 4 m rectangles; the upstream bed is 2.5 m above the downstream one, above the downstream energy
        // line: no subcritical root, so critical depth (q^2/g)^(1/3) with q = 2 m2/s.
        var r = await api.PostJson(Reach, new
        {
            sections = new[] { new { distance = 0.0, points = Rectangle(4, 100), manningN = 0.015 }, new { distance = 20.0, points = Rectangle(4, 102.5), manningN = 0.015 } },
            flow = 8, startElevation = 101.2,
        });
        Assert.Equal(200, r.Status);
        var up = Sections(r.Body)[1];
        Assert.True(up.GetProperty("criticalDepthTaken").GetBoolean());
        Assert.Equal(102.5 + Math.Cbrt(4 / G), D(up, "elevation"), 1e-9);
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "no-subcritical-solution");
    }

    [Fact]
    public async Task Supercritical_reach_starts_upstream_and_stays_supercritical()
    {
        // Steep 4 m rectangle (bed falling 0.01), Q = 12 m3/s, 0.4 m deep below a gate at the upstream end.
        var sections = Enumerable.Range(0, 11).Select(k => 20.0 * k)
            .Select(x => new { distance = x, points = Rectangle(4, 100 + 0.01 * x), manningN = 0.015 }).ToArray();
        var r = await api.PostJson(Reach, new { sections, flow = 12, startElevation = 102.4, startAt = "upstream" });
        Assert.Equal(200, r.Status);
        var st = Sections(r.Body);
        Assert.Equal(102.4, D(st[^1], "elevation"));
        Assert.All(st, s => Assert.True(D(s, "froudeNumber") > 1));
        // The energy grade line falls along the flow (downstream, to smaller distances).
        for (int i = 1; i < st.Length; i++) Assert.True(D(st[i], "energyGradeLine") > D(st[i - 1], "energyGradeLine"));
        var wrong = await api.PostJson(Reach, new { sections, flow = 12, startElevation = 103, startAt = "upstream" });
        ProblemAssert.NamesField(wrong, 400, "startElevation");
    }

    [Fact]
    public async Task Every_bad_field_is_a_400_naming_its_path()
    {
        object Section(double distance, double bed, double? n = 0.03) => new { distance, points = Rectangle(4, bed), manningN = n };
        async Task Refused(object body, string field) => ProblemAssert.NamesField(await api.PostJson(Reach, body), 400, field);

        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1), Section(200, 100.2), Section(150, 100.3) }, flow = 5, startElevation = 102 }, "sections[3].distance");
        await Refused(new { sections = new[] { Section(0, 100), Section(0, 100.1) }, flow = 5, startElevation = 102 }, "sections[1].distance");
        await Refused(new { sections = new[] { Section(0, 100) }, flow = 5, startElevation = 102 }, "sections");
        await Refused(new { flow = 5, startElevation = 102 }, "sections");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, flow = 5, startElevation = 99.5 }, "startElevation");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, flow = 5, startElevation = 104.5 }, "startElevation");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1, 1.5) }, flow = 5, startElevation = 102 }, "sections[1].manningN");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1, 0) }, flow = 5, startElevation = 102 }, "sections[1].manningN");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1, null) }, flow = 5, startElevation = 102 }, "sections[1].manningN");
        await Refused(new { sections = new[] { Section(-5, 100), Section(100, 100.1) }, flow = 5, startElevation = 102 }, "sections[0].distance");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, startElevation = 102 }, "flow");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, flow = 5 }, "startElevation");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, flow = 5, startElevation = 102, startAt = "middle" }, "startAt");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, flow = 5, startElevation = 102, expansionCoefficient = 1.5 }, "expansionCoefficient");
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, flow = 5, startElevation = 102, contractionCoefficient = -0.1 }, "contractionCoefficient");
        await Refused(new
        {
            sections = new object[] { Section(0, 100), new { distance = 100.0, points = new[] { Point(0, 103), Point(-1, 100), Point(4, 103) }, manningN = 0.03 } },
            flow = 5, startElevation = 102,
        }, "sections[1].points[1].station");
        await Refused(new { sections = new object[] { Section(0, 100), new { distance = 100.0, points = new[] { Point(0, 103), Point(1, 100) }, manningN = 0.03 } }, flow = 5, startElevation = 102 }, "sections[1].points");
        await Refused(new { sections = new object[] { Section(0, 100), new { distance = 100.0, points = new[] { Point(0, 103), null, Point(1, 100), Point(4, 103) } } }, flow = 5, startElevation = 102 }, "sections[1].points[1]");
        // A downstream start below critical depth: supercritical flow is controlled from upstream.
        await Refused(new { sections = new[] { Section(0, 100), Section(100, 100.1) }, flow = 12, startElevation = 100.5 }, "startElevation");
    }

    [Fact]
    public async Task Water_above_a_survey_is_a_422_naming_the_section()
    {
        var r = await api.PostJson(Reach, new
        {
            sections = new[]
            {
                new { distance = 0.0, points = Rectangle(4, 100), manningN = 0.03 }, new { distance = 100.0, points = Rectangle(4, 100.1), manningN = 0.03 },
                new { distance = 200.0, points = Rectangle(4, 100.2, height: 1), manningN = 0.03 },
            },
            flow = 5, startElevation = 103.5,
        });
        Assert.Equal(422, r.Status);
        Assert.Equal("sections[2].points", r.Body.GetProperty("field").GetString());
        Assert.Contains("sections[2]", r.Body.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task Text_is_refused_and_the_sheet_plots_the_answer()
    {
        var example = new ReachProfileCalculation().BodyExample;
        var text = await api.PostJson(Reach + "?format=text", example);
        ProblemAssert.NamesField(text, 400, "format");

        var json = await api.PostJson(Reach, example);
        var page = await SheetPage.Post(api, Reach + "?format=html", example);
        Assert.Equal(200, page.Status);
        var surface = SheetPage.Points(page.Document.QuerySelector("svg#plot-reach polyline[data-role=water-surface]")!);
        var st = Sections(json.Body);
        Assert.Equal(st.Length, surface.Length);
        for (int i = 0; i < st.Length; i++)
        {
            Assert.Equal(D(st[i], "distance"), surface[i].X);
            Assert.Equal(D(st[i], "elevation"), surface[i].Y);
        }
        var bed = SheetPage.Points(page.Document.QuerySelector("svg#plot-reach polyline[data-role=bed]")!);
        Assert.Equal(example.Sections!.Select(s => s.Points!.Min(p => p.Elevation!.Value)), bed.Select(p => p.Y));
        Assert.NotNull(page.Document.QuerySelector("svg#plot-reach polyline[data-role=energy-grade-line]"));
        Assert.Contains("qualified engineer", page.Html);
    }
}
