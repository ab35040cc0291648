using System.Globalization;
using System.Text;
using System.Text.Json;
using FlowSolve.Core.Fluids;

namespace FlowSolve.Api.Tests.Pumps;

/// <summary>
/// The pump endpoints against closed forms (a quadratic pump on a quadratic system), the affinity laws, a handbook
/// NPSH example, and the contract for bad input, no-answer problems, text answers and batches.
/// </summary>
public sealed class PumpEndpointsTests(ApiFixture api)
{
    private const double G = 9.80665;             // standard gravity, m/s2 (exact)
    private const double Foot = 0.3048;           // m (exact)
    private const double Psi = 6894.757293168361; // Pa (1 lbf/in2)

    // H = 40 - 5000 Q^2 (one pump) on H = 15 + 3000 Q^2: 25 = 8000 Q^2, Q = sqrt(25/8000) (closed form).
    private static readonly double ClosedFormFlow = Math.Sqrt(25.0 / 8000.0);

    private static object Pump(params double[] coefficients) => new { coefficients };

    private static object QuadraticCase() => new
    {
        pump = Pump(40, 0, -5000), system = new { staticHead = 15.0, resistance = 3000.0 },
        kinematicViscosity = 1e-6, density = 998.2,
    };

    private static void AssertRelative(double expected, double actual, double tolerance) =>
        Assert.True(Math.Abs(actual - expected) <= tolerance * Math.Abs(expected), $"expected {expected:R}, got {actual:R}");

    private static void AssertSolved(JsonElement body, int maxIterations = 12)
    {
        Assert.True(body.GetProperty("converged").GetBoolean());
        Assert.Equal("solved", body.GetProperty("status").GetString());
        Assert.InRange(body.GetProperty("iterations").GetInt32(), 1, maxIterations);
    }

    [Fact]
    public async Task PostDutyPoint_QuadraticPumpOnQuadraticSystem_MatchesClosedForm()
    {
        var r = await api.PostJson("/v1/pumps/duty-point", QuadraticCase());
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body);
        AssertRelative(ClosedFormFlow, r.Body.GetProperty("flow").GetDouble(), 1e-12);
        AssertRelative(15 + 3000 * ClosedFormFlow * ClosedFormFlow, r.Body.GetProperty("head").GetDouble(), 1e-12);
        AssertRelative(ClosedFormFlow, r.Body.GetProperty("flowPerPump").GetDouble(), 1e-12);
        Assert.True(Math.Abs(r.Body.GetProperty("residual").GetDouble()) < 1e-12);
        foreach (var name in new[] { "headPerPump", "method", "validity", "warnings", "assumptions", "solverStatus" })
            Assert.True(r.Body.TryGetProperty(name, out _), $"missing {name}");
    }

    [Fact]
    public async Task GetDutyPoint_CompactForm_MatchesClosedForm()
    {
        var r = await api.GetJson("/v1/pumps/duty-point?c0=40&c1=0&c2=-5000&staticHead=15&resistance=3000");
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body);
        AssertRelative(ClosedFormFlow, r.Body.GetProperty("flow").GetDouble(), 1e-12);
        // No fluid given: water at 20 degrees C is assumed and said so.
        Assert.Contains(r.Body.GetProperty("assumptions").EnumerateArray(), a => a.GetProperty("field").GetString() == "temperature");
    }

    public static TheoryData<int, int> Arrangements => new()
    {
        // (pumps in parallel, pumps in series)
        { 2, 1 }, { 3, 1 }, { 1, 2 }, { 1, 3 },
    };

    [Theory]
    [MemberData(nameof(Arrangements))]
    public async Task PostDutyPoint_ParallelOrSeries_MatchesClosedForm(int parallel, int series)
    {
        // Parallel: 40 - 5000 (Q/N)^2 = 15 + 3000 Q^2. Series: N (40 - 5000 Q^2) = 15 + 3000 Q^2 (closed forms).
        double q = parallel > 1
            ? Math.Sqrt(25.0 / (5000.0 / (parallel * parallel) + 3000.0))
            : Math.Sqrt((40.0 * series - 15.0) / (5000.0 * series + 3000.0));
        var r = await api.PostJson("/v1/pumps/duty-point", new
        {
            pump = Pump(40, 0, -5000), system = new { staticHead = 15.0, resistance = 3000.0 },
            pumpsInParallel = parallel, pumpsInSeries = series,
        });
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body);
        double head = 15 + 3000 * q * q;
        AssertRelative(q, r.Body.GetProperty("flow").GetDouble(), 1e-12);
        AssertRelative(head, r.Body.GetProperty("head").GetDouble(), 1e-12);
        AssertRelative(q / parallel, r.Body.GetProperty("flowPerPump").GetDouble(), 1e-12);
        AssertRelative(head / series, r.Body.GetProperty("headPerPump").GetDouble(), 1e-12);
    }

    [Theory]
    [InlineData(0.7)]
    [InlineData(0.9)]
    [InlineData(1.25)]
    public async Task GetDutyPoint_SpeedRatio_MatchesAffinityLawClosedForm(double s)
    {
        // Affinity laws (common practice): H_s(Q) = s^2 H(Q/s) = 40 s^2 - 5000 Q^2, so 40 s^2 - 15 = 8000 Q^2.
        double q = Math.Sqrt((40 * s * s - 15) / 8000);
        var r = await api.GetJson(string.Create(CultureInfo.InvariantCulture,
            $"/v1/pumps/duty-point?c0=40&c2=-5000&staticHead=15&resistance=3000&speedRatio={s}"));
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body);
        AssertRelative(q, r.Body.GetProperty("flow").GetDouble(), 1e-12);
        AssertRelative(q / s, r.Body.GetProperty("ratedSpeedFlow").GetDouble(), 1e-12);
        AssertRelative(40 * s * s, r.Body.GetProperty("shutOffHead").GetDouble(), 1e-14);
    }

    // Catalogue points read off H = 40 - 5000 Q^2 (exact), with efficiency 28 Q - 250 Q^2 (best 0.784 at 0.056 m3/s)
    // and NPSH required 2 + 50 Q (a straight line, so linear interpolation is exact); invented data for a closed form.
    private static readonly double[] PointFlows = [0.0, 0.02, 0.04, 0.06, 0.08];

    private static object[] Points(bool efficiency, bool npsh) => PointFlows.Select(q => (object)new
    {
        flow = q, head = 40 - 5000 * q * q,
        efficiency = efficiency ? 28 * q - 250 * q * q : (double?)null,
        npshRequired = npsh ? 2 + 50 * q : (double?)null,
    }).ToArray();

    [Fact]
    public async Task PostDutyPoint_PointsOnKnownQuadratic_FitRecoversClosedForm()
    {
        var r = await api.PostJson("/v1/pumps/duty-point", new
        {
            pump = new { points = Points(false, false) }, system = new { staticHead = 15.0, resistance = 3000.0 },
        });
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body);
        AssertRelative(ClosedFormFlow, r.Body.GetProperty("flow").GetDouble(), 1e-10);
        Assert.True(r.Body.GetProperty("rmsDeviation").GetDouble() < 1e-10);
        Assert.True(r.Body.GetProperty("maxDeviation").GetDouble() < 1e-10);
        var c = r.Body.GetProperty("pumpCurve").GetProperty("coefficients").EnumerateArray().Select(x => x.GetDouble()).ToArray();
        Assert.Equal(40, c[0], 1e-9);
        Assert.Equal(0, c[1], 1e-7);
        AssertRelative(-5000, c[2], 1e-9);
        Assert.Equal("fitted", r.Body.GetProperty("pumpCurve").GetProperty("fitStatus").GetString());
        var range = r.Body.GetProperty("catalogueRange");
        Assert.Equal(0.0, range.GetProperty("minimumFlow").GetDouble());
        Assert.Equal(0.08, range.GetProperty("maximumFlow").GetDouble());
    }

    [Fact]
    public async Task PostDutyPoint_Efficiency_ShaftPowerIsRhoGQHOverEta()
    {
        const double rho = 998.2;
        var r = await api.PostJson("/v1/pumps/duty-point", new
        {
            pump = new { points = Points(true, false) }, system = new { staticHead = 15.0, resistance = 3000.0 },
            kinematicViscosity = 1e-6, density = rho,
        });
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body);
        double q = ClosedFormFlow, h = 15 + 3000 * q * q;
        double eta = 28 * q - 250 * q * q;
        AssertRelative(eta, r.Body.GetProperty("efficiency").GetDouble(), 1e-9);
        AssertRelative(rho * G * q * h / eta, r.Body.GetProperty("shaftPower").GetDouble(), 1e-9);
        AssertRelative(0.056, r.Body.GetProperty("bestEfficiencyFlow").GetDouble(), 1e-9);   // d(eta)/dQ = 0 at 28/500
        AssertRelative(q / 0.056, r.Body.GetProperty("bestEfficiencyRatio").GetDouble(), 1e-9);
        Assert.Equal("W", r.Body.GetProperty("powerUnit").GetString());
    }

    [Fact]
    public async Task PostDutyPoint_UsUnitsInGpm_MatchesClosedFormAndPowerInHorsepower()
    {
        // H = 120 - 2e-5 Q^2 (ft, US gal/min) on H = 40 + 3e-5 Q^2: 80 = 5e-5 Q^2, Q = 1264.9 gpm (closed form).
        double q = Math.Sqrt(80 / 5e-5), h = 40 + 3e-5 * q * q;
        var r = await api.PostJson("/v1/pumps/duty-point", new
        {
            pump = Pump(120, 0, -2e-5), system = new { staticHead = 40.0, resistance = 3e-5 },
            units = "us", flowUnit = "gpm", kinematicViscosity = 1.1e-5, density = 62.3,
        });
        Assert.Equal(200, r.Status);
        AssertRelative(q, r.Body.GetProperty("flow").GetDouble(), 1e-12);
        AssertRelative(h, r.Body.GetProperty("head").GetDouble(), 1e-12);
        // rho g Q H in W from exact conversions (NIST SP 811), then 1 hp = 550 ft lbf/s = 745.69987158227022 W.
        double rhoSi = 62.3 * 0.45359237 / (Foot * Foot * Foot);
        double watts = rhoSi * G * (q * 231 * 0.0254 * 0.0254 * 0.0254 / 60) * (h * Foot);
        AssertRelative(watts / 745.69987158227022, r.Body.GetProperty("hydraulicPower").GetDouble(), 1e-12);
        Assert.Equal("hp", r.Body.GetProperty("powerUnit").GetString());
    }

    // A wastewater-treatment handbook's worked example (found): open tank of water at 60 degrees F, atmospheric head
    // 34 ft, vapour pressure head 0.6 ft, entrance loss 0.4 ft, friction 2 ft; the level 15 ft above the pump gives
    // NPSHa = 46 ft, a suction lift of 20 ft gives 11 ft.
    public static TheoryData<double, double> HandbookNpsh => new() { { 15.0, 46.0 }, { -20.0, 11.0 } };

    private static object HandbookRequest(object suction) => new
    {
        pump = Pump(120, 0, -2000), system = new { staticHead = 40.0, resistance = 1000.0 },
        units = "us", temperature = 60.0, suction,
    };

    [Theory]
    [MemberData(nameof(HandbookNpsh))]
    public async Task PostDutyPoint_HandbookHeads_NpshAvailableAsPublished(double staticSuctionFeet, double expectedFeet)
    {
        // The handbook's own heads, 34 ft and 0.6 ft, given as pressures in water at 60 degrees F.
        double rhoG = Water.Density((60 - 32) / 1.8) * G;
        var r = await api.PostJson("/v1/pumps/duty-point", HandbookRequest(new
        {
            staticSuctionHead = staticSuctionFeet, lossHead = 0.4 + 2.0,
            surfacePressure = 34 * Foot * rhoG / Psi, vapourPressure = 0.6 * Foot * rhoG / Psi,
        }));
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body);
        Assert.Equal(expectedFeet, r.Body.GetProperty("npshAvailable").GetDouble(), 1e-9);
    }

    [Theory]
    [MemberData(nameof(HandbookNpsh))]
    public async Task PostDutyPoint_HandbookCaseWithDefaults_WithinTheHandbooksRounding(double staticSuctionFeet, double expectedFeet)
    {
        // With the defaults, 1 standard atmosphere (101325 Pa) in water at 60 degrees F (999.0 kg/m3, IAPWS-IF97) is a head of
        // 33.93 ft, which the handbook rounds to 34 ft, and the IAPWS-IF97 vapour pressure head is 0.59 ft against its 0.6 ft:
        // the published 46 and 11 ft come out about 0.06 ft lower, so the check allows 0.1 ft.
        var r = await api.PostJson("/v1/pumps/duty-point", HandbookRequest(new
        {
            staticSuctionHead = staticSuctionFeet, lossHead = 2.4,
        }));
        Assert.Equal(200, r.Status);
        double npsha = r.Body.GetProperty("npshAvailable").GetDouble();
        Assert.Equal(expectedFeet, npsha, 0.1);
        Assert.True(npsha < expectedFeet, "1 atm is a little less than the handbook's 34 ft of water at 60 F");
        var fields = r.Body.GetProperty("assumptions").EnumerateArray().Select(a => a.GetProperty("field").GetString()).ToArray();
        Assert.Contains("suction.surfacePressure", fields);
        Assert.Contains("suction.vapourPressure", fields);
    }

    [Fact]
    public async Task PostDutyPoint_NpshRequiredOnPoints_MarginIsAvailableMinusRequired()
    {
        var r = await api.PostJson("/v1/pumps/duty-point", new
        {
            pump = new { points = Points(true, true) }, system = new { staticHead = 15.0, resistance = 3000.0 },
            temperature = 20.0, suction = new { staticSuctionHead = 1.5, lossHead = 0.5, vapourPressure = 2339.0 },
        });
        Assert.Equal(200, r.Status);
        double rho = Water.Density(20);
        double available = (101325 - 2339.0) / (rho * G) + 1.5 - 0.5;
        double required = 2 + 50 * ClosedFormFlow;   // the straight line the points lie on
        Assert.Equal(available, r.Body.GetProperty("npshAvailable").GetDouble(), 1e-9);
        Assert.Equal(required, r.Body.GetProperty("npshRequired").GetDouble(), 1e-9);
        Assert.Equal(available - required, r.Body.GetProperty("npshMargin").GetDouble(), 1e-9);
        Assert.Equal(available / required, r.Body.GetProperty("npshRatio").GetDouble(), 1e-9);
    }

    [Fact]
    public async Task PostDutyPoint_TwoPipeSystem_HeadEqualsPumpHeadAtTheFlow()
    {
        var r = await api.PostJson("/v1/pumps/duty-point", new
        {
            pump = Pump(40, 0, -5000),
            system = new { staticHead = 15.0, pipes = new[] { new { length = 300.0, diameter = 0.2, roughness = 5e-5, minorLossCoefficient = 4.0 }, new { length = 50.0, diameter = 0.15, roughness = 5e-5, minorLossCoefficient = 1.0 } } },
        });
        Assert.Equal(200, r.Status);
        AssertSolved(r.Body, 20);
        // At the duty point the pump's own polynomial gives the reported head (a stated property of the solution).
        double q = r.Body.GetProperty("flow").GetDouble();
        Assert.Equal(40 - 5000 * q * q, r.Body.GetProperty("head").GetDouble(), 1e-9);
        Assert.Equal(4, r.Body.GetProperty("validity").EnumerateArray().Count(v => v.GetProperty("method").GetString() == "colebrook-white"));
    }

    [Fact]
    public async Task PostDutyPoint_ShutOffBelowStaticHead_422WithShortfall()
    {
        var r = await api.PostJson("/v1/pumps/duty-point", new { pump = Pump(10, 0, -5000), system = new { staticHead = 15.0, resistance = 3000.0 } });
        Assert.Equal(422, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal("shut-off-below-static-head", r.Body.GetProperty("dutyPointStatus").GetString());
        Assert.Equal(5.0, r.Body.GetProperty("headShortfall").GetDouble(), 1e-12);   // 15 - 10
        Assert.Equal(10.0, r.Body.GetProperty("shutOffHead").GetDouble(), 1e-12);
        Assert.Equal(-5.0, r.Body.GetProperty("closestApproach").GetDouble(), 1e-12); // at zero flow, where the gap is smallest
        Assert.Contains("5 m below", r.Body.GetProperty("detail").GetString());
    }

    /// <summary>Every property name of the body's top-level object, in order, read token by token so that a key written
    /// twice is seen twice (JsonDocument keeps both but GetProperty returns only one).</summary>
    private static List<string> TopLevelNames(byte[] utf8)
    {
        var names = new List<string>();
        var reader = new Utf8JsonReader(utf8);
        while (reader.Read())
            if (reader.TokenType == JsonTokenType.PropertyName && reader.CurrentDepth == 1) names.Add(reader.GetString()!);
        return names;
    }

    [Theory]
    [InlineData(false, """{"pump": {"coefficients": [10.0, 0.0, -5000.0]}, "system": {"staticHead": 15.0, "resistance": 3000.0}}""", "shut-off-below-static-head")]
    [InlineData(false, """{"pump": {"coefficients": [40.0, 0.0, -5000.0]}, "system": {"staticHead": -50.0, "resistance": 100.0}}""", "curves-do-not-meet")]
    [InlineData(true, "c0=10&c1=0&c2=-5000&staticHead=15&resistance=3000", "shut-off-below-static-head")]
    public async Task DutyPoint_422_HasNumericStatusOnceAndTheCodeInDutyPointStatus(bool get, string input, string code)
    {
        // RFC 9457, section 3.1.2: "status" is a JSON number, the HTTP status code; RFC 8259, section 4: names within an
        // object should be unique.
        using var response = get
            ? await api.Client.GetAsync("/v1/pumps/duty-point?" + input, TestContext.Current.CancellationToken)
            : await api.Client.PostAsync("/v1/pumps/duty-point", new StringContent(input, Encoding.UTF8, "application/json"), TestContext.Current.CancellationToken);
        Assert.Equal(422, (int)response.StatusCode);
        Assert.Equal("application/problem+json", response.Content.Headers.ContentType?.MediaType);
        byte[] utf8 = await response.Content.ReadAsByteArrayAsync(TestContext.Current.CancellationToken);
        var names = TopLevelNames(utf8);
        Assert.Equal(names.Count, names.Distinct(StringComparer.Ordinal).Count());
        using var doc = JsonDocument.Parse(utf8);
        var status = doc.RootElement.GetProperty("status");
        Assert.Equal(JsonValueKind.Number, status.ValueKind);
        Assert.Equal((int)response.StatusCode, status.GetInt32());
        Assert.Equal(code, doc.RootElement.GetProperty("dutyPointStatus").GetString());
    }

    [Fact]
    public async Task PostDutyPoint_SeriesShutOffShort_422ShortfallCountsEveryPump()
    {
        var r = await api.PostJson("/v1/pumps/duty-point", new { pump = Pump(7, 0, -5000), pumpsInSeries = 2, system = new { staticHead = 15.0, resistance = 3000.0 } });
        Assert.Equal(422, r.Status);
        Assert.Equal(1.0, r.Body.GetProperty("headShortfall").GetDouble(), 1e-12);   // 15 - 2 x 7
    }

    [Fact]
    public async Task PostDutyPoint_CurvesDoNotMeet_422WithClosestApproach()
    {
        // Static head -50 m, K = 100: at the pump's zero-head flow Q0 = sqrt(40/5000) the system still needs
        // -50 + 100 Q0^2 = -49.2 m, so the pump stays 49.2 m above it; the gap shrinks all the way to Q0 (closed form).
        var r = await api.PostJson("/v1/pumps/duty-point", new { pump = Pump(40, 0, -5000), system = new { staticHead = -50.0, resistance = 100.0 } });
        Assert.Equal(422, r.Status);
        Assert.Equal("curves-do-not-meet", r.Body.GetProperty("dutyPointStatus").GetString());
        double q0 = Math.Sqrt(40.0 / 5000.0);
        Assert.Equal(50 - 100 * q0 * q0, r.Body.GetProperty("closestApproach").GetDouble(), 1e-9);
        AssertRelative(q0, r.Body.GetProperty("closestApproachFlow").GetDouble(), 1e-9);
        Assert.Equal(-90.0, r.Body.GetProperty("headShortfall").GetDouble(), 1e-12);  // the shut-off head is 90 m above the static head
    }

    public static TheoryData<string, string> BadBodies => new()
    {
        // (body, the field the 400 must name)
        { """{"pump":{"points":[{"flow":0,"head":40},{"flow":0.02,"head":38}]},"system":{"staticHead":15,"resistance":3000}}""", "pump.points" },
        { """{"pump":{"points":[{"flow":0,"head":40},{"flow":0.02,"head":38},{"flow":0.02,"head":30}]},"system":{"staticHead":15,"resistance":3000}}""", "pump.points[2].flow" },
        { """{"pump":{"points":[{"flow":0,"head":40},{"flow":0.02,"head":-1},{"flow":0.04,"head":30}]},"system":{"staticHead":15,"resistance":3000}}""", "pump.points[1].head" },
        { """{"pump":{"points":[{"flow":0,"head":10},{"flow":0.01,"head":20},{"flow":0.02,"head":25}]},"system":{"staticHead":5,"resistance":10}}""", "pump.points" },
        { """{"pump":{"points":[{"flow":0,"head":40,"efficiency":0},{"flow":0.02,"head":38,"efficiency":55},{"flow":0.04,"head":30,"efficiency":70}]},"system":{"staticHead":15,"resistance":3000}}""", "pump.points[1].efficiency" },
        { """{"pump":{"points":[{"flow":0,"head":40},{"flow":0.02,"head":38},{"flow":0.04,"head":30}],"curveDegree":"cubic"},"system":{"staticHead":15,"resistance":3000}}""", "pump.points" },
        { """{"pump":{"coefficients":[40,-5000]},"system":{"staticHead":15,"resistance":3000}}""", "pump.coefficients" },
        { """{"pump":{"coefficients":[0,0,-5000]},"system":{"staticHead":15,"resistance":3000}}""", "pump.coefficients[0]" },
        { """{"pump":{"coefficients":[40,0,5000]},"system":{"staticHead":15,"resistance":3000}}""", "pump.coefficients" },
        { """{"pump":{"coefficients":[1e300,0,-1e-300]},"system":{"staticHead":15,"resistance":3000}}""", "pump.coefficients" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"pipes":[{"length":10,"diameter":1e-300,"roughness":0}]}}""", "system.pipes[0].diameter" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"speedRatio":0}""", "speedRatio" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"speedRatio":1.6}""", "speedRatio" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"pumpsInParallel":2,"pumpsInSeries":2}""", "pumpsInSeries" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"pumpsInParallel":0}""", "pumpsInParallel" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"pipes":[{"length":0,"diameter":0.2,"roughness":0.0001}]}}""", "system.pipes[0].length" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"pipes":[{"length":10,"diameter":0.2,"roughness":0.0001},{"length":10,"diameter":-0.1,"roughness":0}]}}""", "system.pipes[1].diameter" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"pipes":[{"length":10,"diameter":0.1,"roughness":0.1}]}}""", "system.pipes[0].roughness" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15}}""", "system" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"resistance":3000}}""", "system.staticHead" },
        { """{"system":{"staticHead":15,"resistance":3000}}""", "pump" },
        { """{"pump":{"coefficients":[40,0,-5000]}}""", "system" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"units":"imperial"}""", "units" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"flowUnit":"gpm"}""", "flowUnit" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"kinematicViscosity":1e-6,"density":900,"suction":{"staticSuctionHead":2}}""", "suction.vapourPressure" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"density":900}""", "kinematicViscosity" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":3000},"speedRatio":"abc"}""", "speedRatio" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":NaN,"resistance":3000}}""", "system.staticHead" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistance":1e400}}""", "system.resistance" },
        { """{"pump":{"coefficients":[40,0,-5000]},"system":{"staticHead":15,"resistanse":3000}}""", "system.resistanse" },
    };

    [Theory]
    [MemberData(nameof(BadBodies))]
    public async Task PostDutyPoint_BadInput_400NamesField(string body, string field) =>
        ProblemAssert.NamesField(await api.PostRaw("/v1/pumps/duty-point", body, "application/json"), 400, field);

    [Fact]
    public async Task PostDutyPoint_RisingFit_SaysWhereItRises()
    {
        var r = await api.PostRaw("/v1/pumps/duty-point",
            """{"pump":{"points":[{"flow":0,"head":10},{"flow":0.01,"head":20},{"flow":0.02,"head":25}]},"system":{"staticHead":5,"resistance":10}}""", "application/json");
        string message = r.Body.GetProperty("errors").GetProperty("pump.points")[0].GetString()!;
        Assert.Contains("rises with flow", message);
        // The fit through these three points is exact: H = 10 + 1250 Q - 12500 Q^2, whose slope is largest, 1250, at Q = 0.
        Assert.Contains("dH/dQ = 1250", message);
        Assert.Contains("at 0 m3/s", message);
    }

    [Fact]
    public async Task PostDutyPoint_ManyBadFields_AllNamedAtOnce()
    {
        var r = await api.PostRaw("/v1/pumps/duty-point",
            """{"pump":{"points":[{"flow":0,"head":10},{"flow":0.01,"head":-2},{"flow":0.01,"head":5}]},"system":{"staticHead":5,"pipes":[{"length":-1,"diameter":0.1,"roughness":0.2}]},"speedRatio":2,"pumpsInParallel":2,"pumpsInSeries":3}""",
            "application/json");
        foreach (var field in new[] { "pump.points[1].head", "pump.points[2].flow", "system.pipes[0].length", "system.pipes[0].roughness", "speedRatio", "pumpsInSeries", "pumpsInParallel" })
            ProblemAssert.NamesField(r, 400, field);
    }

    public static TheoryData<string, string> BadQueries => new()
    {
        { "c2=-5000&staticHead=15&resistance=3000", "c0" },
        { "c0=abc&c2=-5000&staticHead=15&resistance=3000", "c0" },
        { "c0=NaN&c2=-5000&staticHead=15&resistance=3000", "c0" },
        { "c0=40&c2=Infinity&staticHead=15&resistance=3000", "c2" },
        { "c0=40&c2=-5000&resistance=3000", "staticHead" },
        { "c0=40&c2=-5000", "staticHead" },
        { "c0=40&c2=-5000&staticHead=15&resistance=3000&speedRatio=2", "speedRatio" },
        { "c0=40&c2=-5000&staticHead=15&resistance=3000&pumpsInParallel=2.5", "pumpsInParallel" },
        { "c0=40&c2=-5000&staticHead=15&length=100&diameter=0&roughness=0", "diameter" },
        { "c0=40&c2=-5000&staticHead=15&length=100&diameter=0.1&roughness=0.2", "roughness" },
        { "c0=40&c2=-5000&staticHead=15&length=100&roughness=0.0001", "diameter" },
        { "c0=40&c2=-5000&staticHead=15&resistance=3000&staticSuctionHead=2&suctionLossHead=-1", "suctionLossHead" },
    };

    [Theory]
    [MemberData(nameof(BadQueries))]
    public async Task GetDutyPoint_BadInput_400NamesTheQueryParameter(string query, string field) =>
        ProblemAssert.NamesField(await api.GetJson("/v1/pumps/duty-point?" + query), 400, field);

    [Fact]
    public async Task GetDutyPoint_FormatText_ReturnsFlowDigitForDigit()
    {
        const string url = "/v1/pumps/duty-point?c0=40&c2=-5000&staticHead=15&resistance=3000";
        var json = await api.GetJson(url);
        using var response = await api.Client.GetAsync(url + "&format=text", TestContext.Current.CancellationToken);
        string text = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        Assert.Equal("text/plain", response.Content.Headers.ContentType?.MediaType);
        Assert.Equal(json.Body.GetProperty("flow").GetRawText(), text);
        AssertRelative(ClosedFormFlow, double.Parse(text, CultureInfo.InvariantCulture), 1e-12);
    }

    [Fact]
    public async Task GetDutyPoint_FormatTextNoAnswer_OneLineWith422()
    {
        using var response = await api.Client.GetAsync("/v1/pumps/duty-point?c0=10&c2=-5000&staticHead=15&resistance=3000&format=text",
            TestContext.Current.CancellationToken);
        string text = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        Assert.Equal(422, (int)response.StatusCode);
        Assert.StartsWith("error: ", text);
        Assert.DoesNotContain('\n', text);
    }

    [Fact]
    public async Task Batch_TwoRows_EachEqualsItsSingleCall()
    {
        object[] rows =
        [
            new { pump = Pump(40, 0, -5000), system = new { staticHead = 15.0, resistance = 3000.0 } },
            new { pump = Pump(40, 0, -5000), system = new { staticHead = 15.0, resistance = 3000.0 }, pumpsInParallel = 2 },
        ];
        using var content = new StringContent(JsonSerializer.Serialize(rows), Encoding.UTF8, "application/json");
        using var response = await api.Client.PostAsync("/v1/batch/pumps/duty-point", content, TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        var answers = JsonDocument.Parse(await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken)).RootElement.EnumerateArray().ToArray();
        Assert.Equal(2, answers.Length);
        for (int i = 0; i < rows.Length; i++)
        {
            Assert.Equal(200, answers[i].GetProperty("status").GetInt32());
            var single = await api.PostJson("/v1/pumps/duty-point", rows[i]);
            Assert.True(JsonElement.DeepEquals(single.Body, answers[i].GetProperty("result")), $"row {i + 1} differs from its single call");
        }
        AssertRelative(ClosedFormFlow, answers[0].GetProperty("result").GetProperty("flow").GetDouble(), 1e-12);
        AssertRelative(Math.Sqrt(25.0 / (5000.0 / 4 + 3000.0)), answers[1].GetProperty("result").GetProperty("flow").GetDouble(), 1e-12);
    }

    [Fact]
    public async Task PostCurves_ParallelPair_ArraysFollowTheirClosedForms()
    {
        var r = await api.PostJson("/v1/pumps/curves?samplePoints=21", new
        {
            pump = Pump(40, 0, -5000), system = new { staticHead = 15.0, resistance = 3000.0 }, pumpsInParallel = 2,
        });
        Assert.Equal(200, r.Status);
        double[] Read(string name) => r.Body.GetProperty(name).EnumerateArray().Select(x => x.GetDouble()).ToArray();
        double[] q = Read("flow"), pump = Read("pumpHead"), set = Read("setHead"), system = Read("systemHead");
        Assert.Equal(21, q.Length);
        Assert.All(new[] { pump, set, system }, a => Assert.Equal(21, a.Length));
        for (int i = 0; i < q.Length; i++)
        {
            Assert.Equal(40 - 5000 * q[i] * q[i], pump[i], 1e-9);
            Assert.Equal(40 - 5000 * (q[i] / 2) * (q[i] / 2), set[i], 1e-9);   // two pumps share the flow at one head
            Assert.Equal(15 + 3000 * q[i] * q[i], system[i], 1e-9);
        }
        // The plot runs to 1.2 x the pair's zero-head flow, 2 sqrt(40/5000).
        AssertRelative(1.2 * 2 * Math.Sqrt(40.0 / 5000.0), q[^1], 1e-12);
        var duty = r.Body.GetProperty("dutyPoint");
        AssertRelative(Math.Sqrt(25.0 / (5000.0 / 4 + 3000.0)), duty.GetProperty("flow").GetDouble(), 1e-12);
        Assert.Equal("solved", r.Body.GetProperty("status").GetString());
    }

    [Fact]
    public async Task PostCurves_NoDutyPoint_CurvesStillReturnedWithTheReason()
    {
        var r = await api.PostJson("/v1/pumps/curves", new { pump = Pump(10, 0, -5000), system = new { staticHead = 15.0, resistance = 3000.0 } });
        Assert.Equal(200, r.Status);
        Assert.Equal("shut-off-below-static-head", r.Body.GetProperty("status").GetString());
        Assert.False(r.Body.TryGetProperty("dutyPoint", out _));
        Assert.False(r.Body.GetProperty("converged").GetBoolean());
        Assert.Equal(41, r.Body.GetProperty("flow").GetArrayLength());
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "shut-off-below-static-head");
    }

    [Theory]
    [InlineData("samplePoints=1", "samplePoints")]
    [InlineData("samplePoints=abc", "samplePoints")]
    public async Task PostCurves_BadSamplePoints_400NamesField(string query, string field) =>
        ProblemAssert.NamesField(await api.PostJson("/v1/pumps/curves?" + query, QuadraticCase()), 400, field);
}
