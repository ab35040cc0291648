using System.Globalization;
using System.Text.Json;

namespace FlowSolve.Api.Tests.Pipes;

public sealed class PipeEndpointsTests(ApiFixture api)
{
    // White, Fluid Mechanics, Example 6.7 (text, found): oil, rho 900 kg/m3, nu 1e-5 m2/s, Q 0.2 m3/s, L 500 m,
    // D 200 mm cast iron, e 0.26 mm: V about 6.4 m/s, Re about 128 000, f about 0.0225 from the chart; head loss
    // about 117 m (from memory).
    private const string WhiteQuery = "flow=0.2&diameter=0.2&length=500&roughness=0.00026&kinematicViscosity=1e-5&density=900";
    private static readonly object WhiteBody = new { flow = 0.2, diameter = 0.2, length = 500, roughness = 0.00026, kinematicViscosity = 1e-5, density = 900 };

    // Exact factors, NIST SP 811 (2008), appendix B: 1 ft = 0.3048 m, 1 lb = 0.45359237 kg, standard gravity 9.80665 m/s2,
    // 1 US gal = 231 in3 = 3.785411784e-3 m3; so 1 ft3 = 0.028316846592 m3, 1 ft2 = 0.09290304 m2,
    // 1 lb/ft3 = 16.018463373960138 kg/m3, 1 psi = 6894.757293168361 Pa, 1 gpm = 6.30901964e-5 m3/s.
    private const double Ft = 0.3048, Ft2 = 0.09290304, Ft3 = 0.028316846592, LbPerFt3 = 16.018463373960138,
        Psi = 6894.757293168361, Gpm = 6.30901964e-5;

    private static double D(JsonElement e, string name) => e.GetProperty(name).GetDouble();

    private static string S(JsonElement e, string name) => e.GetProperty(name).GetString()!;

    private static string Q(double x) => x.ToString("R", CultureInfo.InvariantCulture);

    private static void AssertClose(double expected, double actual, double relative) =>
        Assert.True(Math.Abs(actual - expected) <= relative * Math.Abs(expected),
            $"expected {expected:R} within {relative:P6}, got {actual:R}");

    private async Task<JsonElement> Ok(Task<(int Status, string? ContentType, JsonElement Body)> call)
    {
        var r = await call;
        Assert.True(r.Status == 200, $"status {r.Status}: {r.Body}");
        return r.Body;
    }

    [Fact]
    public async Task HeadLoss_WhiteExample6_7_GetAndPostMatchPublished()
    {
        foreach (var body in new[] { await Ok(api.GetJson("/v1/pipes/head-loss?" + WhiteQuery)), await Ok(api.PostJson("/v1/pipes/head-loss", WhiteBody)) })
        {
            AssertClose(6.37, D(body, "velocity"), 0.01);
            AssertClose(127_000, D(body, "reynolds"), 0.01);
            AssertClose(0.0225, D(body, "frictionFactor"), 0.02); // chart precision
            AssertClose(117, D(body, "headLoss"), 0.01);           // from memory
            Assert.Equal("turbulent", S(body, "regime"));
            // Stated property: the pressure drop is rho g h with standard gravity.
            AssertClose(900 * 9.80665 * D(body, "headLoss"), D(body, "pressureDrop"), 1e-12);
            Assert.Equal(D(body, "headLoss"), D(body, "frictionHeadLoss") + D(body, "minorHeadLoss"));
            Assert.True(body.GetProperty("converged").GetBoolean());
            Assert.InRange(body.GetProperty("iterations").GetInt32(), 1, 6);
            Assert.InRange(Math.Abs(D(body, "residual")), 0, 1e-12);
        }
    }

    [Fact]
    public async Task Flow_WhiteReversedExample6_6_UsUnits_MatchesPublishedVelocity()
    {
        // White, Fluid Mechanics, the worked example that reverses Example 6.6 (found; the viscosity from memory):
        // 4.5 ft of head loss over 200 ft of 6-in pipe, e/D = 0.0008, nu = 1.1e-5 ft2/s: V = 6.05 ft/s.
        var body = await Ok(api.GetJson("/v1/pipes/flow?units=us&headLoss=4.5&length=200&diameter=0.5&roughness=0.0004&kinematicViscosity=1.1e-5"));
        AssertClose(6.05, D(body, "velocity"), 0.01);
        Assert.Equal("ft3/s", S(body, "flowUnit"));
        AssertClose(D(body, "velocity") * Math.PI * 0.25 * 0.25, D(body, "flow"), 1e-12); // Q = V pi D^2 / 4
        Assert.True(body.GetProperty("converged").GetBoolean());
        Assert.InRange(body.GetProperty("iterations").GetInt32(), 1, 8);
        Assert.True(body.GetProperty("frictionIterations").GetInt32() >= body.GetProperty("iterations").GetInt32());
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public async Task RoundTrip_HeadLossFlowDiameter_RecoversInputsTo1e9(bool post)
    {
        // Property: /flow and /diameter invert /head-loss, fittings and elevation included.
        const double flow = 0.2, diameter = 0.2, dz = 12.5;
        const string pipe = "length=500&roughness=0.00026&kinematicViscosity=1e-5&density=900&fittings=elbow-90-flanged-regular:3,gate-valve-open:1";
        object Body(params (string, object)[] extra)
        {
            var d = new Dictionary<string, object>
            {
                ["length"] = 500, ["roughness"] = 0.00026, ["kinematicViscosity"] = 1e-5, ["density"] = 900, ["elevationChange"] = dz,
                ["fittings"] = new object[] { new { name = "elbow-90-flanged-regular", count = 3 }, new { name = "gate-valve-open", count = 1 } },
            };
            foreach (var (k, v) in extra) d[k] = v;
            return d;
        }
        var h = post
            ? await Ok(api.PostJson("/v1/pipes/head-loss", Body(("flow", flow), ("diameter", diameter))))
            : await Ok(api.GetJson($"/v1/pipes/head-loss?{pipe}&elevationChange={dz}&flow={flow}&diameter={diameter}"));
        double total = D(h, "totalHead");
        Assert.Equal(D(h, "headLoss") + dz, total);
        Assert.True(D(h, "minorHeadLoss") > 0);

        var q = post
            ? await Ok(api.PostJson("/v1/pipes/flow", Body(("headLoss", total), ("diameter", diameter))))
            : await Ok(api.GetJson($"/v1/pipes/flow?{pipe}&elevationChange={dz}&headLoss={Q(total)}&diameter={diameter}"));
        AssertClose(flow, D(q, "flow"), 1e-9);
        Assert.True(q.GetProperty("converged").GetBoolean());
        Assert.InRange(q.GetProperty("iterations").GetInt32(), 1, 10);

        var d = post
            ? await Ok(api.PostJson("/v1/pipes/diameter", Body(("headLoss", total), ("flow", flow))))
            : await Ok(api.GetJson($"/v1/pipes/diameter?{pipe}&elevationChange={dz}&headLoss={Q(total)}&flow={flow}"));
        AssertClose(diameter, D(d, "diameter"), 1e-9);
        Assert.True(d.GetProperty("converged").GetBoolean());
        Assert.InRange(d.GetProperty("iterations").GetInt32(), 1, 10);
    }

    [Fact]
    public async Task HeadLoss_UsUnits_IsHandConversionOfSi()
    {
        var si = await Ok(api.GetJson("/v1/pipes/head-loss?" + WhiteQuery));
        string us = $"units=us&flow={Q(0.2 / Ft3)}&diameter={Q(0.2 / Ft)}&length={Q(500 / Ft)}&roughness={Q(0.00026 / Ft)}" +
                    $"&kinematicViscosity={Q(1e-5 / Ft2)}&density={Q(900 / LbPerFt3)}";
        var ft = await Ok(api.GetJson("/v1/pipes/head-loss?" + us));
        AssertClose(D(si, "headLoss") / Ft, D(ft, "headLoss"), 1e-9);
        AssertClose(D(si, "velocity") / Ft, D(ft, "velocity"), 1e-9);
        AssertClose(D(si, "pressureDrop") / Psi, D(ft, "pressureDrop"), 1e-9);
        AssertClose(D(si, "reynolds"), D(ft, "reynolds"), 1e-9);
        AssertClose(D(si, "frictionFactor"), D(ft, "frictionFactor"), 1e-9);
        AssertClose(0.2 / Ft3, D(ft, "flow"), 1e-12);
        Assert.Equal("us", S(ft, "units"));

        // The same flow in US gallons per minute, in and out.
        var gpm = await Ok(api.GetJson($"/v1/pipes/head-loss?{us.Replace($"flow={Q(0.2 / Ft3)}", $"flow={Q(0.2 / Gpm)}")}&flowUnit=gpm"));
        AssertClose(D(si, "headLoss") / Ft, D(gpm, "headLoss"), 1e-9);
        AssertClose(0.2 / Gpm, D(gpm, "flow"), 1e-12);
        Assert.Equal("gpm", S(gpm, "flowUnit"));
    }

    [Fact]
    public async Task HeadLoss_DefaultFluid_IsWaterAt20CEchoedInAssumptions()
    {
        var r = await Ok(api.GetJson("/v1/pipes/head-loss?flow=0.01&diameter=0.1&length=100&roughness=0.000045"));
        var water = await Ok(api.GetJson("/v1/fluids/water?temperature=20"));
        Assert.Equal(D(water, "kinematicViscosity"), D(r, "kinematicViscosity"));
        Assert.Equal(D(water, "density"), D(r, "density"));
        var fluid = r.GetProperty("assumptions").EnumerateArray().Single(a => S(a, "field") == "fluid");
        Assert.Contains("20 degrees C", S(fluid, "value"));

        var us = await Ok(api.GetJson("/v1/pipes/head-loss?units=us&flow=0.35&diameter=0.33&length=330&roughness=0.00015"));
        Assert.Contains("68 degrees F", S(us.GetProperty("assumptions").EnumerateArray().Single(a => S(a, "field") == "fluid"), "value"));
    }

    [Fact]
    public async Task HeadLoss_HazenWilliams_ShammasWangExample5_36_WithDarcyWeisbachBeside()
    {
        // Shammas and Wang (2016), Water Engineering (Wiley), Example 5.36 (found; the authors' names from memory):
        // 12-in pipe, 1 MGD, C = 100: 2.07 ft per 1000 ft (chart precision). 1 MGD = 1e6 / 1440 gpm.
        var r = await Ok(api.GetJson($"/v1/pipes/head-loss?units=us&flowUnit=gpm&flow={Q(1e6 / 1440)}&diameter=1&length=1000" +
                                     "&material=cast-iron&temperature=60&method=hazen-williams&hazenWilliamsC=100"));
        Assert.Equal("hazen-williams", S(r, "method"));
        AssertClose(2.07, D(r, "frictionHeadLoss"), 0.02);
        var dw = r.GetProperty("darcyWeisbach");
        var plain = await Ok(api.GetJson($"/v1/pipes/head-loss?units=us&flowUnit=gpm&flow={Q(1e6 / 1440)}&diameter=1&length=1000&material=cast-iron&temperature=60"));
        // Property: the comparison is the Darcy-Weisbach calculation of the same pipe, and the difference is HW - DW.
        Assert.Equal(D(plain, "headLoss"), D(dw, "headLoss"), 1e-12);
        Assert.Equal(D(plain, "frictionFactor"), D(dw, "frictionFactor"), 1e-15);
        AssertClose(D(r, "headLoss") - D(dw, "headLoss"), D(dw, "difference"), 1e-9);
        AssertClose((D(r, "headLoss") / D(dw, "headLoss") - 1) * 100, D(dw, "differencePercent"), 1e-9);
        Assert.Contains(r.GetProperty("validity").EnumerateArray(), v => S(v, "method") == "hazen-williams");
    }

    [Fact]
    public async Task Flow_HazenWilliams_InvertsItsHeadLossAndReportsDarcyWeisbachFlow()
    {
        const string pipe = "diameter=0.3&length=1000&roughness=0.00026&minorLossCoefficient=4&temperature=15&method=hazen-williams&hazenWilliamsC=120";
        var h = await Ok(api.GetJson("/v1/pipes/head-loss?flow=0.1&" + pipe));
        var q = await Ok(api.PostJson("/v1/pipes/flow", new
        {
            headLoss = D(h, "headLoss"), diameter = 0.3, length = 1000, roughness = 0.00026, minorLossCoefficient = 4, temperature = 15,
            method = "hazen-williams", hazenWilliamsC = 120,
        }));
        AssertClose(0.1, D(q, "flow"), 1e-9); // property: round trip
        var dw = q.GetProperty("darcyWeisbach");
        Assert.Equal("flow", S(dw, "quantity"));
        var dwFlow = await Ok(api.GetJson($"/v1/pipes/flow?headLoss={Q(D(h, "headLoss"))}&diameter=0.3&length=1000&roughness=0.00026&minorLossCoefficient=4&temperature=15"));
        Assert.Equal(D(dwFlow, "flow"), D(dw, "flow"), 1e-12);
        AssertClose(D(q, "flow") - D(dw, "flow"), D(dw, "difference"), 1e-9);
    }

    [Fact]
    public async Task Diameter_SizeTable_PicksSmallestListedBoreMeetingTheLoss()
    {
        const string table = "asme-b36.10m-schedule-40";
        const double allowed = 6;
        var r = await Ok(api.GetJson($"/v1/pipes/diameter?flow=0.03&headLoss={allowed}&length=400&material=commercial-steel&minorLossCoefficient=2&sizeTable={table}"));
        var selected = r.GetProperty("selectedSize");
        var sizes = (await Ok(api.GetJson("/v1/pipes/sizes?table=" + table))).GetProperty("tables")[0].GetProperty("sizes").EnumerateArray().ToArray();

        // Independent of the selection code: the head loss of every listed bore from /head-loss, smallest first.
        int expected = -1;
        for (int i = 0; i < sizes.Length && expected < 0; i++)
        {
            var h = await Ok(api.GetJson($"/v1/pipes/head-loss?flow=0.03&diameter={Q(D(sizes[i], "insideDiameter"))}&length=400&material=commercial-steel&minorLossCoefficient=2"));
            if (D(h, "headLoss") <= allowed) expected = i;
        }
        Assert.True(expected > 0, "the case should need more than the smallest size");
        Assert.Equal(S(sizes[expected], "name"), S(selected, "name"));
        Assert.Equal(D(sizes[expected], "insideDiameter"), D(selected, "insideDiameter"));
        Assert.True(D(selected, "headLoss") <= allowed);
        Assert.True(D(sizes[expected - 1], "insideDiameter") < D(r, "diameter"));
        Assert.True(D(r, "diameter") <= D(selected, "insideDiameter"));
        Assert.True(D(selected, "velocity") > 0);
    }

    [Fact]
    public async Task Flow_Trace_ListsEachOuterIteration()
    {
        var r = await Ok(api.GetJson("/v1/pipes/flow?headLoss=20&diameter=0.15&length=800&roughness=0.000045&trace=true"));
        Assert.Equal(r.GetProperty("iterations").GetInt32(), r.GetProperty("trace").GetArrayLength());
        Assert.Equal("ln(Q)", S(r, "solveVariable"));
        var d = await Ok(api.GetJson("/v1/pipes/diameter?flow=0.03&headLoss=6&length=400&roughness=0.000045&trace=true"));
        Assert.Equal(d.GetProperty("iterations").GetInt32(), d.GetProperty("trace").GetArrayLength());
    }

    [Fact]
    public async Task HeadLoss_FittingsAndMaterial_UseTheListedValues()
    {
        var fittings = (await Ok(api.GetJson("/v1/pipes/fittings"))).GetProperty("fittings").EnumerateArray()
            .ToDictionary(f => S(f, "name"), f => D(f, "lossCoefficient"));
        double roughness = D((await Ok(api.GetJson("/v1/pipes/materials?name=galvanized-iron"))).GetProperty("materials")[0], "new");
        var r = await Ok(api.GetJson("/v1/pipes/head-loss?flow=0.02&diameter=0.1&length=50&material=galvanized-iron&fittings=elbow-90-threaded-regular:2.5,globe-valve-open"));
        Assert.Equal(2.5 * fittings["elbow-90-threaded-regular"] + fittings["globe-valve-open"], D(r, "minorLossCoefficient"), 1e-12);
        Assert.Equal(roughness, D(r, "roughness"));
        // Property: hm = K V^2/(2g).
        AssertClose(D(r, "minorLossCoefficient") * D(r, "velocityHead"), D(r, "minorHeadLoss"), 1e-12);
    }

    public static TheoryData<string, string> ContractFields => new()
    {
        { "/v1/pipes/head-loss?" + WhiteQuery, "headLoss,frictionHeadLoss,minorHeadLoss,pressureDrop,flow,diameter,velocity,reynolds,frictionFactor,regime,iterations,converged,residual,status,method,validity,warnings,assumptions" },
        { "/v1/pipes/flow?headLoss=117&diameter=0.2&length=500&roughness=0.00026&kinematicViscosity=1e-5&density=900", "flow,headLoss,frictionHeadLoss,minorHeadLoss,pressureDrop,diameter,velocity,reynolds,frictionFactor,regime,iterations,frictionIterations,converged,residual,status,method,validity,warnings,assumptions" },
        { "/v1/pipes/diameter?flow=0.2&headLoss=117&length=500&roughness=0.00026&temperature=20&sizeTable=asme-b36.10m-schedule-40", "diameter,flow,headLoss,frictionHeadLoss,minorHeadLoss,pressureDrop,velocity,reynolds,frictionFactor,regime,selectedSize,iterations,frictionIterations,converged,residual,status,method,validity,warnings,assumptions" },
        { "/v1/pipes/head-loss?" + WhiteQuery + "&method=hazen-williams&hazenWilliamsC=130", "darcyWeisbach" },
    };

    [Theory]
    [MemberData(nameof(ContractFields))]
    public async Task Get_ResponseHasContractFields(string url, string names)
    {
        var r = await Ok(api.GetJson(url));
        foreach (var name in names.Split(','))
            Assert.True(r.TryGetProperty(name, out _), $"missing {name}");
        if (r.TryGetProperty("selectedSize", out var size))
            foreach (var name in new[] { "name", "insideDiameter", "outsideDiameter", "wallThickness", "headLoss", "velocity" })
                Assert.True(size.TryGetProperty(name, out _), $"selectedSize lacks {name}");
        if (r.TryGetProperty("darcyWeisbach", out var dw))
            foreach (var name in new[] { "headLoss", "frictionFactor", "difference", "differencePercent" })
                Assert.True(dw.TryGetProperty(name, out _), $"darcyWeisbach lacks {name}");
    }

    private const string Base = "length=500&roughness=0.00026&kinematicViscosity=1e-5";

    public static TheoryData<string, string> BadQueries => new()
    {
        { $"/v1/pipes/head-loss?diameter=0.2&{Base}", "flow" },                              // missing
        { $"/v1/pipes/head-loss?flow=0&diameter=0.2&{Base}", "flow" },                       // zero
        { $"/v1/pipes/head-loss?flow=-0.2&diameter=0.2&{Base}", "flow" },                    // negative
        { $"/v1/pipes/head-loss?flow=NaN&diameter=0.2&{Base}", "flow" },                     // NaN
        { $"/v1/pipes/head-loss?flow=Infinity&diameter=0.2&{Base}", "flow" },                // infinite
        { $"/v1/pipes/head-loss?flow=lots&diameter=0.2&{Base}", "flow" },                    // not a number
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0&{Base}", "diameter" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=-1&{Base}", "diameter" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=0&roughness=0.00026", "length" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=-5&roughness=0.00026", "length" },
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&roughness=0.2", "roughness" },      // at the diameter
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&roughness=-0.001", "roughness" },
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500", "roughness" },                     // missing
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&material=cast-iron", "roughness" },      // both
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&material=unobtainium", "material" },
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&material=glass&surfaceCondition=aged", "surfaceCondition" },
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&material=glass&surfaceCondition=rusty", "surfaceCondition" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&fittings=no-such-fitting:2", "fittings[0].name" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&fittings=exit:-1", "fittings[0].count" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&fittings=exit:two", "fittings" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&fittings=exit&minorLossCoefficient=1", "minorLossCoefficient" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&minorLossCoefficient=-1", "minorLossCoefficient" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&elevationChange=NaN", "elevationChange" },
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&roughness=0.00026&kinematicViscosity=0", "kinematicViscosity" },
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&roughness=0.00026&density=900", "kinematicViscosity" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&density=-900", "density" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&temperature=20", "temperature" },          // both fluids
        { "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&roughness=0.00026&temperature=120", "temperature" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&method=manning", "method" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&method=hazen-williams", "hazenWilliamsC" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&hazenWilliamsC=100", "hazenWilliamsC" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&units=imperial", "units" },
        { $"/v1/pipes/head-loss?flow=0.2&diameter=0.2&{Base}&flowUnit=gpm", "flowUnit" },               // gpm needs units=us
        { $"/v1/pipes/flow?diameter=0.2&{Base}", "headLoss" },
        { $"/v1/pipes/flow?headLoss=Infinity&diameter=0.2&{Base}", "headLoss" },
        { $"/v1/pipes/flow?headLoss=10&{Base}", "diameter" },
        { $"/v1/pipes/flow?headLoss=10&diameter=0.2&{Base}&trace=perhaps", "trace" },
        { $"/v1/pipes/diameter?flow=0.2&headLoss=0&{Base}", "headLoss" },
        { $"/v1/pipes/diameter?flow=0.2&headLoss=-3&{Base}", "headLoss" },
        { $"/v1/pipes/diameter?headLoss=10&{Base}", "flow" },
        { $"/v1/pipes/diameter?flow=0.2&headLoss=10&{Base}&sizeTable=schedule-41", "sizeTable" },
        { $"/v1/pipes/diameter?flow=0.2&headLoss=10&{Base}&method=hazen-williams&hazenWilliamsC=100", "method" },
        { "/v1/pipes/sizes?table=schedule-41", "table" },
        { "/v1/pipes/materials?name=unobtainium", "name" },
        { "/v1/pipes/fittings?name=no-such-fitting", "name" },
    };

    [Theory]
    [MemberData(nameof(BadQueries))]
    public async Task Get_BadInput_400NamesField(string url, string field) =>
        ProblemAssert.NamesField(await api.GetJson(url), 400, field);

    [Fact]
    public async Task Post_BadInputs_EveryFieldNamedAtOnce()
    {
        var r = await api.PostJson("/v1/pipes/head-loss", new
        {
            flow = -1.0, diameter = 0.0, length = 0.0, roughness = 0.001, material = "cast-iron", kinematicViscosity = -1.0,
            fittings = new object[] { new { name = "exit", count = 1 }, new { name = "nope" } },
        });
        foreach (var field in new[] { "flow", "diameter", "length", "roughness", "kinematicViscosity", "fittings[1].name" })
            ProblemAssert.NamesField(r, 400, field);
    }

    public static TheoryData<string, string, string> BadBodies => new()
    {
        { "/v1/pipes/head-loss", """{"flow":"abc","diameter":0.2,"length":500,"roughness":0.00026}""", "flow" },
        { "/v1/pipes/head-loss", """{"flow":0.2,"diametre":0.2,"length":500,"roughness":0.00026}""", "diametre" },
        { "/v1/pipes/head-loss", """{"flow":NaN,"diameter":0.2,"length":500,"roughness":0.00026}""", "flow" },
        { "/v1/pipes/flow", """{"headLoss":10,"diameter":0.2,"length":500,"roughness":0.00026,"fittings":[{"name":"exit","count":"x"}]}""", "fittings[0].count" },
        { "/v1/pipes/flow", """{"headLoss":10,"diameter":0.2,"length":500,"roughness":0.00026,"flow":1}""", "flow" },           // not a field of /flow
        { "/v1/pipes/diameter", """{"flow":0.1,"headLoss":10,"length":500,"roughness":0.00026,"diameter":0.2}""", "diameter" }, // not a field of /diameter
        { "/v1/pipes/diameter", "", "body" },
    };

    [Theory]
    [MemberData(nameof(BadBodies))]
    public async Task Post_MalformedBody_400NamesField(string url, string body, string field) =>
        ProblemAssert.NamesField(await api.PostRaw(url, body, "application/json"), 400, field);

    public static TheoryData<string, string> NoAnswers => new()
    {
        // The available head does not exceed the elevation rise.
        { "/v1/pipes/flow?headLoss=5&elevationChange=8&diameter=0.2&length=500&roughness=0.00026", "no-flow" },
        { "/v1/pipes/flow?headLoss=5&elevationChange=8&diameter=0.2&length=500&roughness=0.00026&method=hazen-williams&hazenWilliamsC=120", "no-flow" },
        { "/v1/pipes/diameter?flow=0.1&headLoss=5&elevationChange=8&length=500&roughness=0.00026", "no-flow" },
        // The minor losses alone exceed the allowance at the largest listed bore (K = 500 at 0.5 m3/s).
        { "/v1/pipes/diameter?flow=0.5&headLoss=0.5&length=10&roughness=0&minorLossCoefficient=500&sizeTable=iso-4427-pe-sdr-11", "no-listed-size" },
        // Reynolds number beyond the friction relations' 1e15.
        { "/v1/pipes/head-loss?flow=1e6&diameter=0.001&length=1&roughness=0&kinematicViscosity=1e-9", "outside-range" },
    };

    [Theory]
    [MemberData(nameof(NoAnswers))]
    public async Task Get_WellFormedWithoutAnswer_422SaysWhy(string url, string code)
    {
        var r = await api.GetJson(url);
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal(422, r.Body.GetProperty("status").GetInt32());
        Assert.Equal(code, S(r.Body, "pipeStatus"));
        Assert.False(string.IsNullOrWhiteSpace(S(r.Body, "detail")));
    }
}
