using System.Text.Json;

namespace FlowSolve.Api.Tests.Channels;

public sealed class ChannelEndpointsTests(ApiFixture api)
{
    private const string Normal = "/v1/channels/normal-depth";
    private const string Critical = "/v1/channels/critical-depth";
    private const double Foot = 0.3048; // exact (NIST SP 811)

    // ---- published examples ----

    public static TheoryData<double, double, double, double> PonceRectangles => new()
    {
        // V. M. Ponce, San Diego State University CIVE 530 examination solutions (found): rectangular channels, n = 0.015;
        // (bottom width m, slope, published depth m, published flow m3/s, four figures).
        { 5, 0.0025, 0.8, 9.548 },
        { 6, 0.0025, 1.6, 32.91 },
        { 5, 0.003, 1.5, 26.23 },
    };

    [Theory]
    [MemberData(nameof(PonceRectangles))]
    public async Task NormalDepth_PonceRectangle_MatchesPublishedDepth(double width, double slope, double depth, double flow)
    {
        var r = await api.PostJson(Normal, new { section = new { shape = "rectangular", bottomWidth = width }, manningN = 0.015, slope, flow });
        Assert.Equal(200, r.Status);
        // The published flow has four figures, so the depth is good to about 0.1 percent.
        Assert.Equal(depth, r.Body.GetProperty("normalDepth").GetDouble(), 1e-3 * depth);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.InRange(r.Body.GetProperty("iterations").GetInt32(), 1, 8);
        Assert.InRange(Math.Abs(r.Body.GetProperty("residual").GetDouble()), 0, 1e-12);
        Assert.False(r.Body.TryGetProperty("capacity", out _)); // open shapes have no capacity limit
    }

    [Fact]
    public async Task NormalDepth_PonceRectangle_ResponseIsConsistent()
    {
        var r = await api.GetJson($"{Normal}?shape=rectangular&bottomWidth=5&manningN=0.015&slope=0.0025&flow=9.548");
        var b = r.Body;
        foreach (var name in new[] { "normalDepth", "area", "wettedPerimeter", "hydraulicRadius", "topWidth", "velocity", "froudeNumber",
                     "criticalDepth", "criticalSlope", "regime", "specificEnergy", "iterations", "converged", "residual", "status", "method",
                     "validity", "warnings", "assumptions" })
            Assert.True(b.TryGetProperty(name, out _), $"missing {name}");
        double y = b.GetProperty("normalDepth").GetDouble();
        // Rectangle geometry and the definitions of V, Fr and E (common practice), g = 9.80665 m/s2.
        Assert.Equal(5 * y, b.GetProperty("area").GetDouble(), 1e-12);
        Assert.Equal(5 + 2 * y, b.GetProperty("wettedPerimeter").GetDouble(), 1e-12);
        double v = 9.548 / (5 * y);
        Assert.Equal(v, b.GetProperty("velocity").GetDouble(), 1e-12);
        Assert.Equal(v / Math.Sqrt(9.80665 * y), b.GetProperty("froudeNumber").GetDouble(), 1e-12);
        Assert.Equal(y + v * v / (2 * 9.80665), b.GetProperty("specificEnergy").GetDouble(), 1e-12);
        Assert.Equal("subcritical", b.GetProperty("regime").GetString());
        // Critical depth of a rectangle, (q^2/g)^(1/3) (common practice).
        Assert.Equal(Math.Cbrt(Math.Pow(9.548 / 5, 2) / 9.80665), b.GetProperty("criticalDepth").GetDouble(), 1e-12);
    }

    [Fact]
    public async Task CriticalDepth_PonceUnitDischarge50_Is634()
    {
        // Ponce, SDSU CIVE 530 solutions (found): unit discharge 50 m2/s gives a critical depth of 6.34 m (b = 2 m, Q = 100 m3/s).
        var r = await api.PostJson(Critical, new { section = new { shape = "rectangular", bottomWidth = 2 }, flow = 100 });
        Assert.Equal(200, r.Status);
        Assert.Equal(6.34, r.Body.GetProperty("criticalDepth").GetDouble(), 0.005);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.InRange(r.Body.GetProperty("iterations").GetInt32(), 0, 6);
        Assert.False(r.Body.TryGetProperty("criticalSlope", out _)); // no manningN given
    }

    [Fact]
    public async Task CriticalDepth_UsRectangle_MatchesPublishedDepthAndSlope()
    {
        // A published open-channel solution in the style of White, chapter 10 (found): b = 10 ft, Q = 600 ft3/s, n = 0.025:
        // critical depth 4.82 ft, critical slope 0.0132 (three figures; the solution's rounding of g and k explains the last digit).
        var r = await api.GetJson($"{Critical}?shape=rectangular&bottomWidth=10&flow=600&manningN=0.025&units=us");
        Assert.Equal(200, r.Status);
        Assert.Equal(4.82, r.Body.GetProperty("criticalDepth").GetDouble(), 0.005);
        Assert.Equal(0.0132, r.Body.GetProperty("criticalSlope").GetDouble(), 0.01 * 0.0132);
        Assert.Equal("us", r.Body.GetProperty("units").GetString());
    }

    [Fact]
    public async Task NormalDepth_ChowTrapezoidInUsUnits_Is336Feet()
    {
        // Chow 1959, Open-Channel Hydraulics, a normal-depth example (from memory): b = 20 ft, z = 2, S = 0.0016, n = 0.025,
        // Q = 400 ft3/s gives a normal depth of 3.36 ft.
        var r = await api.GetJson($"{Normal}?shape=trapezoidal&bottomWidth=20&sideSlope=2&slope=0.0016&manningN=0.025&flow=400&units=us");
        Assert.Equal(200, r.Status);
        double y = r.Body.GetProperty("normalDepth").GetDouble();
        Assert.Equal(3.36, y, 0.005);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.InRange(r.Body.GetProperty("iterations").GetInt32(), 1, 8);
        // US customary Manning with k = 1.486 (common practice) on the returned depth, in ft, reproduces the flow to the
        // precision of 1.486 itself ((1/0.3048)^(1/3) = 1.48592).
        double area = y * (20 + 2 * y), perimeter = 20 + 2 * y * Math.Sqrt(5);
        double flow = 1.486 / 0.025 * area * Math.Pow(area / perimeter, 2.0 / 3.0) * Math.Sqrt(0.0016);
        Assert.Equal(400, flow, 400 * 1e-4);
        Assert.Equal(area, r.Body.GetProperty("area").GetDouble(), 1e-9 * area);
        Assert.Contains(r.Body.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("message").GetString()!.Contains("1.486"));
    }

    // ---- part-full circle ----

    private const double PipeD = 1.0, PipeN = 0.013, PipeS = 0.001;

    /// <summary>Full-pipe Manning discharge (1/n) (pi D^2/4) (D/4)^(2/3) S^(1/2) (common practice).</summary>
    private static double FullPipeFlow(double d, double n, double s, double k = 1.0) =>
        k / n * Math.PI * d * d / 4 * Math.Pow(d / 4, 2.0 / 3.0) * Math.Sqrt(s);

    /// <summary>Part-full circle: theta = 2 acos(1 - 2y/D), A = D^2 (theta - sin theta)/8, P = D theta/2 (common practice).</summary>
    private static double PartFullFlow(double y, double d, double n, double s)
    {
        double theta = 2 * Math.Acos(1 - 2 * y / d);
        double area = d * d * (theta - Math.Sin(theta)) / 8, perimeter = d * theta / 2;
        return area * Math.Pow(area / perimeter, 2.0 / 3.0) * Math.Sqrt(s) / n;
    }

    [Fact]
    public async Task NormalDepth_CircleBetweenFullAndPeak_ReturnsBothDepthsWithWarning()
    {
        double flow = 1.04 * FullPipeFlow(PipeD, PipeN, PipeS); // between Q_full and about 1.076 Q_full (common practice)
        var r = await api.PostJson(Normal, new { section = new { shape = "circular", diameter = PipeD }, manningN = PipeN, slope = PipeS, flow });
        Assert.Equal(200, r.Status);
        double lower = r.Body.GetProperty("normalDepth").GetDouble();
        double upper = r.Body.GetProperty("alternateNormalDepth").GetDouble();
        // The discharge equals Q_full again at y/D about 0.82 and peaks at about 0.938 (common practice).
        Assert.InRange(lower / PipeD, 0.82, 0.938);
        Assert.InRange(upper / PipeD, 0.938, 1.0);
        Assert.Equal(flow, PartFullFlow(lower, PipeD, PipeN, PipeS), 1e-10 * flow);
        Assert.Equal(flow, PartFullFlow(upper, PipeD, PipeN, PipeS), 1e-10 * flow);
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.InRange(r.Body.GetProperty("iterations").GetInt32(), 2, 40);

        var warning = Assert.Single(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "two-normal-depths");
        Assert.Contains("usual design answer", warning.GetProperty("message").GetString());
        var capacity = r.Body.GetProperty("capacity");
        Assert.Equal(FullPipeFlow(PipeD, PipeN, PipeS), capacity.GetProperty("fullFlow").GetDouble(), 1e-12);
        Assert.Equal(1.076, capacity.GetProperty("maximumFlow").GetDouble() / FullPipeFlow(PipeD, PipeN, PipeS), 0.001);
        Assert.Equal(0.938, capacity.GetProperty("depthAtMaximumFlow").GetDouble() / PipeD, 0.0005);
    }

    [Fact]
    public async Task NormalDepth_CircleAboveFullFlowOnly_UniqueBelowCrown()
    {
        double flow = 0.5 * FullPipeFlow(PipeD, PipeN, PipeS);
        var r = await api.PostJson(Normal, new { section = new { shape = "circular", diameter = PipeD }, manningN = PipeN, slope = PipeS, flow });
        Assert.Equal(200, r.Status);
        Assert.False(r.Body.TryGetProperty("alternateNormalDepth", out _));
        Assert.Equal(flow, PartFullFlow(r.Body.GetProperty("normalDepth").GetDouble(), PipeD, PipeN, PipeS), 1e-10 * flow);
    }

    [Fact]
    public async Task NormalDepth_CircleAbovePeak_422StatesCapacity()
    {
        double full = FullPipeFlow(PipeD, PipeN, PipeS);
        var r = await api.PostJson(Normal, new { section = new { shape = "circular", diameter = PipeD }, manningN = PipeN, slope = PipeS, flow = 1.2 * full });
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        var capacity = r.Body.GetProperty("capacity");
        double peak = capacity.GetProperty("maximumFlow").GetDouble();
        Assert.Equal(1.076 * full, peak, 0.001 * full); // about 1.076 Q_full (common practice)
        Assert.Equal(full, capacity.GetProperty("fullFlow").GetDouble(), 1e-12);
        Assert.Contains(peak.ToString("G6", System.Globalization.CultureInfo.InvariantCulture) + " m3/s", r.Body.GetProperty("detail").GetString());
        Assert.DoesNotContain("NaN", r.Body.ToString());
    }

    [Fact]
    public async Task NormalDepth_CircleAbovePeakInUsUnits_422StatesCapacityInCubicFeet()
    {
        // A 3 ft pipe: the capacity must come back in ft3/s, Q_full by the customary formula with k = 1.486 (common practice).
        double fullUs = FullPipeFlow(3, PipeN, PipeS, 1.486);
        var r = await api.GetJson($"{Normal}?shape=circular&diameter=3&manningN={PipeN}&slope={PipeS}&flow={2 * fullUs}&units=us");
        Assert.Equal(422, r.Status);
        var capacity = r.Body.GetProperty("capacity");
        Assert.Equal(fullUs, capacity.GetProperty("fullFlow").GetDouble(), 1e-4 * fullUs);
        Assert.Equal(1.076 * fullUs, capacity.GetProperty("maximumFlow").GetDouble(), 0.001 * fullUs);
        Assert.Equal(0.938 * 3, capacity.GetProperty("depthAtMaximumFlow").GetDouble(), 0.0005 * 3);
        Assert.Equal("us", r.Body.GetProperty("units").GetString());
        Assert.Contains("ft3/s", r.Body.GetProperty("detail").GetString());
    }

    // ---- surveyed sections ----

    /// <summary>A trapezoid b = 3 m, z = 2, with banks 3 m high, as four survey points.</summary>
    private static object[] TrapezoidPoints =>
        [new { station = 0.0, elevation = 3.0 }, new { station = 6.0, elevation = 0.0 }, new { station = 9.0, elevation = 0.0 }, new { station = 15.0, elevation = 3.0 }];

    [Fact]
    public async Task NormalDepth_SurveyedTrapezoid_EqualsTrapezoid()
    {
        var survey = await api.PostJson(Normal, new { section = new { shape = "surveyed", points = TrapezoidPoints }, manningN = 0.025, slope = 0.001, flow = 12.0 });
        var prismatic = await api.PostJson(Normal, new { section = new { shape = "trapezoidal", bottomWidth = 3.0, sideSlope = 2.0 }, manningN = 0.025, slope = 0.001, flow = 12.0 });
        Assert.Equal(200, survey.Status);
        Assert.Equal(200, prismatic.Status);
        // Same geometry, so the same answer (a stated property), to the solvers' precision.
        foreach (var name in new[] { "normalDepth", "area", "wettedPerimeter", "hydraulicRadius", "topWidth", "velocity", "froudeNumber", "specificEnergy", "criticalDepth", "criticalSlope" })
        {
            double expected = prismatic.Body.GetProperty(name).GetDouble();
            Assert.Equal(expected, survey.Body.GetProperty(name).GetDouble(), 1e-9 * Math.Abs(expected));
        }
        Assert.True(survey.Body.GetProperty("converged").GetBoolean());
        Assert.InRange(survey.Body.GetProperty("iterations").GetInt32(), 1, 30);
        Assert.Equal(3.0, survey.Body.GetProperty("capacity").GetProperty("fullDepth").GetDouble());
    }

    [Fact]
    public async Task NormalDepth_SurveyOvertopped_422StatesBankFullCapacity()
    {
        var r = await api.PostJson(Normal, new { section = new { shape = "surveyed", points = TrapezoidPoints }, manningN = 0.025, slope = 0.001, flow = 500.0 });
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        // A trapezoid's conveyance rises with depth, so its capacity is Manning's discharge at the bank top y = 3 m:
        // A = (b + z y) y, P = b + 2 y sqrt(1 + z^2) (common practice).
        double area = (3 + 2 * 3) * 3.0, perimeter = 3 + 2 * 3 * Math.Sqrt(5);
        double bankFull = area * Math.Pow(area / perimeter, 2.0 / 3.0) * Math.Sqrt(0.001) / 0.025;
        var capacity = r.Body.GetProperty("capacity");
        Assert.Equal(bankFull, capacity.GetProperty("maximumFlow").GetDouble(), 1e-9 * bankFull);
        Assert.Equal(3.0, capacity.GetProperty("depthAtMaximumFlow").GetDouble(), 1e-9);
        Assert.Contains("overtops", r.Body.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task NormalDepth_SurveyWithOwnRoughnessOnEverySegment_NeedsNoManningN()
    {
        var points = new object[]
        {
            new { station = 0.0, elevation = 3.0, manningN = 0.03 }, new { station = 6.0, elevation = 0.0, manningN = 0.03 },
            new { station = 9.0, elevation = 0.0, manningN = 0.03 }, new { station = 15.0, elevation = 3.0 },
        };
        var own = await api.PostJson(Normal, new { section = new { shape = "surveyed", points }, slope = 0.001, flow = 12.0 });
        var single = await api.PostJson(Normal, new { section = new { shape = "surveyed", points = TrapezoidPoints }, manningN = 0.03, slope = 0.001, flow = 12.0 });
        Assert.Equal(200, own.Status);
        // One n on every segment: the Horton-Einstein composite is that n (a stated property of the formula).
        Assert.Equal(0.03, own.Body.GetProperty("effectiveManningN").GetDouble(), 1e-12);
        Assert.Equal(single.Body.GetProperty("normalDepth").GetDouble(), own.Body.GetProperty("normalDepth").GetDouble(), 1e-9);
    }

    // ---- GET and POST agree ----

    [Fact]
    public async Task NormalDepth_GetAndPost_Agree()
    {
        var get = await api.GetJson($"{Normal}?shape=surveyed&points=0:3:0.035,6:0,9:0:0.035,15:3&manningN=0.02&slope=0.001&flow=12");
        var post = await api.PostJson(Normal, new
        {
            section = new
            {
                shape = "surveyed",
                points = new object[]
                {
                    new { station = 0.0, elevation = 3.0, manningN = 0.035 }, new { station = 6.0, elevation = 0.0 },
                    new { station = 9.0, elevation = 0.0, manningN = 0.035 }, new { station = 15.0, elevation = 3.0 },
                },
            },
            manningN = 0.02, slope = 0.001, flow = 12.0,
        });
        Assert.Equal(200, get.Status);
        Assert.Equal(post.Body.ToString(), get.Body.ToString());

        var getTrap = await api.GetJson($"{Normal}?shape=trapezoidal&bottomWidth=3&leftSideSlope=1.5&rightSideSlope=2.5&manningN=0.02&slope=0.001&flow=12&units=us");
        var postTrap = await api.PostJson(Normal, new { section = new { shape = "trapezoidal", bottomWidth = 3.0, leftSideSlope = 1.5, rightSideSlope = 2.5 }, manningN = 0.02, slope = 0.001, flow = 12.0, units = "us" });
        Assert.Equal(200, getTrap.Status);
        Assert.Equal(postTrap.Body.ToString(), getTrap.Body.ToString());
    }

    [Fact]
    public async Task CriticalDepth_GetAndPost_Agree()
    {
        var get = await api.GetJson($"{Critical}?shape=circular&diameter=1.2&flow=0.8&manningN=0.013");
        var post = await api.PostJson(Critical, new { section = new { shape = "circular", diameter = 1.2 }, flow = 0.8, manningN = 0.013 });
        Assert.Equal(200, get.Status);
        Assert.Equal(post.Body.ToString(), get.Body.ToString());
        // Critical flow: Q^2 T = g A^3 at the returned depth, with the returned area and top width (the definition).
        double area = get.Body.GetProperty("area").GetDouble(), top = get.Body.GetProperty("topWidth").GetDouble();
        Assert.Equal(0.8 * 0.8 * top, 9.80665 * area * area * area, 1e-12);
    }

    [Fact]
    public async Task NormalDepth_UsUnits_AreExactConversionsOfSi()
    {
        var si = await api.PostJson(Normal, new { section = new { shape = "triangular", sideSlope = 3.0 }, manningN = 0.016, slope = 0.004, flow = 0.5 });
        var us = await api.PostJson(Normal, new { section = new { shape = "triangular", sideSlope = 3.0 }, manningN = 0.016, slope = 0.004, flow = 0.5 / (Foot * Foot * Foot), units = "us" });
        Assert.Equal(si.Body.GetProperty("normalDepth").GetDouble() / Foot, us.Body.GetProperty("normalDepth").GetDouble(), 1e-12);
        Assert.Equal(si.Body.GetProperty("area").GetDouble() / (Foot * Foot), us.Body.GetProperty("area").GetDouble(), 1e-12);
        Assert.Equal(si.Body.GetProperty("velocity").GetDouble() / Foot, us.Body.GetProperty("velocity").GetDouble(), 1e-12);
        Assert.Equal(si.Body.GetProperty("froudeNumber").GetDouble(), us.Body.GetProperty("froudeNumber").GetDouble(), 1e-12);
    }

    // ---- bad input ----

    public static TheoryData<string, string> BadBodies => new()
    {
        { """{"section":{"shape":"rectangular","bottomWidth":0},"manningN":0.015,"slope":0.001,"flow":5}""", "section.bottomWidth" },    // zero width
        { """{"section":{"shape":"trapezoidal","bottomWidth":-2,"sideSlope":2},"manningN":0.015,"slope":0.001,"flow":5}""", "section.bottomWidth" },
        { """{"section":{"shape":"circular","diameter":0},"manningN":0.015,"slope":0.001,"flow":5}""", "section.diameter" },
        { """{"section":{"shape":"rectangular","bottomWidth":5},"manningN":0.015,"slope":0,"flow":5}""", "slope" },
        { """{"section":{"shape":"rectangular","bottomWidth":5},"manningN":0.015,"slope":-0.001,"flow":5}""", "slope" },
        { """{"section":{"shape":"rectangular","bottomWidth":5},"manningN":0,"slope":0.001,"flow":5}""", "manningN" },
        { """{"section":{"shape":"rectangular","bottomWidth":5},"slope":0.001,"flow":5}""", "manningN" },                               // missing n
        { """{"section":{"shape":"rectangular","bottomWidth":5},"manningN":0.015,"slope":0.001}""", "flow" },                          // missing flow
        { """{"section":{"shape":"rectangular","bottomWidth":5},"manningN":0.015,"slope":0.001,"flow":5,"units":"metric"}""", "units" },
        { """{"manningN":0.015,"slope":0.001,"flow":5}""", "section" },                                                                // missing section
        { """{"section":{"bottomWidth":5},"manningN":0.015,"slope":0.001,"flow":5}""", "section.shape" },                              // missing shape
        { """{"section":{"shape":"oval","bottomWidth":5},"manningN":0.015,"slope":0.001,"flow":5}""", "section.shape" },               // unknown shape
        { """{"section":{"shape":"trapezoidal","bottomWidth":5,"sideSlope":2,"diameter":1},"manningN":0.015,"slope":0.001,"flow":5}""", "section.diameter" }, // foreign dimension
        { """{"section":{"shape":"trapezoidal","bottomWidth":5},"manningN":0.015,"slope":0.001,"flow":5}""", "section.sideSlope" },    // missing side slope
        { """{"section":{"shape":"trapezoidal","bottomWidth":5,"sideSlope":2,"leftSideSlope":1},"manningN":0.015,"slope":0.001,"flow":5}""", "section.sideSlope" },
        { """{"section":{"shape":"triangular","leftSideSlope":0,"rightSideSlope":0},"manningN":0.015,"slope":0.001,"flow":5}""", "section.rightSideSlope" },
        { """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":2},{"station":4,"elevation":0}]},"manningN":0.015,"slope":0.001,"flow":5}""", "section.points" }, // two points
        { """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":2},{"station":4,"elevation":0},{"station":3,"elevation":2}]},"manningN":0.015,"slope":0.001,"flow":5}""", "section.points[2].station" }, // decreasing
        { """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":2},{"elevation":0},{"station":5,"elevation":2}]},"manningN":0.015,"slope":0.001,"flow":5}""", "section.points[1].station" }, // missing station
        { """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":2},{"station":"a","elevation":0},{"station":5,"elevation":2}]},"manningN":0.015,"slope":0.001,"flow":5}""", "section.points[1].station" }, // wrong type
        { """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":0},{"station":4,"elevation":1},{"station":5,"elevation":2}]},"manningN":0.015,"slope":0.001,"flow":5}""", "section.points" }, // an end point is the lowest
        { """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":2},{"station":4,"elevation":0},{"station":5,"elevation":2,"manningN":0.03}]},"manningN":0.015,"slope":0.001,"flow":5}""", "section.points[2].manningN" }, // n on the last point
        { """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":2,"manningN":-1},{"station":4,"elevation":0},{"station":5,"elevation":2}]},"manningN":0.015,"slope":0.001,"flow":5}""", "section.points[0].manningN" },
        { """{"section":{"shape":"rectangular","bottomWidth":5,"depth":1},"manningN":0.015,"slope":0.001,"flow":5}""", "section.depth" }, // unknown field
    };

    [Theory]
    [MemberData(nameof(BadBodies))]
    public async Task NormalDepth_BadBody_400NamesField(string body, string field) =>
        ProblemAssert.NamesField(await api.PostRaw(Normal, body, "application/json"), 400, field);

    public static TheoryData<string, string> BadQueries => new()
    {
        { "bottomWidth=5&manningN=0.015&slope=0.001&flow=5", "shape" },
        { "shape=rectangular&bottomWidth=abc&manningN=0.015&slope=0.001&flow=5", "bottomWidth" },
        { "shape=rectangular&bottomWidth=5&manningN=0.015&slope=0.001&flow=NaN", "flow" },
        { "shape=rectangular&bottomWidth=5&manningN=0.015&slope=1e309&flow=5", "slope" },
        { "shape=circular&diameter=-1&manningN=0.015&slope=0.001&flow=5", "diameter" },
        { "shape=circular&diameter=1&bottomWidth=1&manningN=0.015&slope=0.001&flow=5", "bottomWidth" },
        { "shape=surveyed&points=0:2,4:0&manningN=0.015&slope=0.001&flow=5", "points" },
        { "shape=surveyed&points=0:2,x,8:2&manningN=0.015&slope=0.001&flow=5", "points[1]" },
        { "shape=surveyed&points=0:2,4:q,8:2&manningN=0.015&slope=0.001&flow=5", "points[1].elevation" },
        { "shape=surveyed&points=0:2,4:0,3:2&manningN=0.015&slope=0.001&flow=5", "points[2].station" },
    };

    [Theory]
    [MemberData(nameof(BadQueries))]
    public async Task NormalDepth_BadQuery_400NamesField(string query, string field) =>
        ProblemAssert.NamesField(await api.GetJson($"{Normal}?{query}"), 400, field);

    [Fact]
    public async Task NormalDepth_SeveralBadFields_AllNamedAtOnce()
    {
        var r = await api.PostJson(Normal, new { section = new { shape = "trapezoidal", bottomWidth = 0.0, sideSlope = -1.0 }, manningN = 0.0, slope = -1.0, flow = 0.0 });
        foreach (var field in new[] { "section.bottomWidth", "section.sideSlope", "manningN", "slope", "flow" })
            ProblemAssert.NamesField(r, 400, field);
    }

    [Fact]
    public async Task NormalDepth_SeveralBadPoints_AllNamedAtOnce()
    {
        var r = await api.PostRaw(Normal, """{"section":{"shape":"surveyed","points":[{"station":0,"elevation":2},{"station":4,"elevation":0},{"station":3,"elevation":2,"manningN":0.03}]},"manningN":0.015,"slope":0.001,"flow":5}""", "application/json");
        ProblemAssert.NamesField(r, 400, "section.points[2].station");
        ProblemAssert.NamesField(r, 400, "section.points[2].manningN");
    }

    [Fact]
    public async Task CriticalDepth_BadInput_400NamesField()
    {
        ProblemAssert.NamesField(await api.GetJson($"{Critical}?shape=rectangular&bottomWidth=2&flow=0"), 400, "flow");
        ProblemAssert.NamesField(await api.PostJson(Critical, new { section = new { shape = "circular" }, flow = 1.0 }), 400, "section.diameter");
        // slope is not an input of critical depth: an unknown field in a body is a 400.
        ProblemAssert.NamesField(await api.PostJson(Critical, new { section = new { shape = "rectangular", bottomWidth = 2.0 }, flow = 1.0, slope = 0.01 }), 400, "slope");
    }

    [Fact]
    public async Task CriticalDepth_AboveSurveyedSection_422()
    {
        var r = await api.PostJson(Critical, new { section = new { shape = "surveyed", points = TrapezoidPoints }, flow = 5000.0 });
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal(3.0, r.Body.GetProperty("fullDepth").GetDouble());
    }
}
