using System.Globalization;
using System.Text.Json;

namespace FlowSolve.Api.Tests.Gas;

/// <summary><c>/v1/gas/pipe-flow</c> through the service: both directions against the relation solved here by bisection to
/// the last bit, the US customary form of the general flow equation, every 400 field, the 422 of a choked line, the sheet
/// and extreme inputs.</summary>
public sealed class GasPipeFlowTests(ApiFixture api)
{
    private const string Route = "/v1/gas/pipe-flow";
    private const double R = 8.314462618;            // J/(mol K), CODATA 2018
    private const double Psi = 6894.757293168361;     // Pa, exact (NIST SP 811)
    private const double Foot = 0.3048, Pound = 0.45359237; // exact (NIST SP 811)
    private static CancellationToken Cancel => TestContext.Current.CancellationToken;
    private static string S(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    // Vandrel Vale's north feeder (invented): 5 MPa inlet, 50 km of 300 mm pipe, natural gas of specific gravity 0.6.
    private const string Feeder = Route + "?inletPressure=5000000&temperature=15&specificGravity=0.6&compressibilityFactor=0.9" +
                                  "&dynamicViscosity=0.000011&length=50000&diameter=0.3&roughness=0.000045";

    /// <summary>Bisection to the last bit: halves [lo, hi] until the midpoint equals an end (f(lo) and f(hi) of opposite sign).</summary>
    private static double Bisect(Func<double, double> f, double lo, double hi)
    {
        double fLo = f(lo);
        Assert.True(Math.Sign(fLo) != Math.Sign(f(hi)), "no sign change");
        while (true)
        {
            double mid = lo + 0.5 * (hi - lo);
            if (mid <= lo || mid >= hi) return mid;
            double fm = f(mid);
            if (fm == 0) return mid;
            if (Math.Sign(fm) == Math.Sign(fLo)) (lo, fLo) = (mid, fm);
            else hi = mid;
        }
    }

    /// <summary>Colebrook-White (1939) by bisection in x = 1/sqrt(f); 64/Re below Re 2000.</summary>
    private static double Friction(double re, double relativeRoughness) =>
        re < 2000 ? 64 / re : Math.Pow(Bisect(x => x + 2 * Math.Log10(relativeRoughness / 3.7 + 2.51 * x / re), 0.5, 50), -2);

    /// <summary>The relation, over p1^2: (1 - (p2/p1)^2) - C G^2 / p1^2 (f L/D + 2 ln(p1/p2)).</summary>
    private static double Relation(double p1, double p2, double g, double c, double mu, double length, double d, double e) =>
        1 - p2 / p1 * (p2 / p1) - c * g * g / (p1 * p1) * (Friction(g * d / mu, e / d) * length / d + 2 * Math.Log(p1 / p2));

    private static readonly double NaturalGasC = 0.9 * R * 288.15 / (0.6 * 0.0289647);

    [Fact]
    public async Task Get_OutletPressure_MatchesTheRelationSolvedByBisection_AndTheTextCellIsTheResult()
    {
        var r = await api.GetJson(Feeder + "&massFlow=20");
        Assert.Equal(200, r.Status);
        var b = r.Body;
        Assert.Equal("outletPressure", b.GetProperty("solvedFor").GetString());
        double g = 20 / (Math.PI / 4 * 0.09);
        double p2 = Bisect(p => Relation(5e6, p, g, NaturalGasC, 1.1e-5, 50000, 0.3, 4.5e-5), g * Math.Sqrt(NaturalGasC), 5e6);
        Assert.Equal(p2, b.GetProperty("outletPressure").GetDouble(), 1e-10 * 5e6);
        Assert.Equal(b.GetProperty("outletPressure").GetDouble(), b.GetProperty("result").GetDouble());
        Assert.True(b.GetProperty("converged").GetBoolean());
        Assert.InRange(b.GetProperty("iterations").GetInt32(), 1, 12);
        Assert.True(Math.Abs(b.GetProperty("residual").GetDouble()) < 1e-13);
        // Velocities and Mach numbers from their definitions: V = G C / p, a = sqrt(k C) with the default k = 1.3.
        Assert.Equal(g * NaturalGasC / p2, b.GetProperty("outletVelocity").GetDouble(), 1e-9 * g * NaturalGasC / p2);
        Assert.Equal(g * NaturalGasC / 5e6 / Math.Sqrt(1.3 * NaturalGasC), b.GetProperty("inletMachNumber").GetDouble(), 1e-12);
        Assert.Equal(Friction(g * 0.3 / 1.1e-5, 1.5e-4), b.GetProperty("frictionFactor").GetDouble(), 1e-13);
        // Defaults are echoed, never silent.
        var assumed = b.GetProperty("assumptions").EnumerateArray().Select(a => a.GetProperty("field").GetString()).ToArray();
        Assert.Contains("heatCapacityRatio", assumed);
        Assert.Contains("molarMass", assumed);
        Assert.Contains("standardConditions", assumed);

        using var text = await api.Client.GetAsync(Feeder + "&massFlow=20&format=text", Cancel);
        Assert.Equal(b.GetProperty("result").GetRawText(), await text.Content.ReadAsStringAsync(Cancel));
    }

    [Fact]
    public async Task Post_MassFlow_MatchesBisection_AndRoundTripsThroughTheOtherDirection()
    {
        var r = await api.PostJson(Route, new
        {
            inletPressure = 700_000, outletPressure = 550_000, temperature = 10, molarMass = 0.01738, dynamicViscosity = 1.08e-5,
            length = 4200, diameter = 0.2, roughness = 0.00005,
        });
        Assert.Equal(200, r.Status);
        var b = r.Body;
        Assert.Equal("massFlow", b.GetProperty("solvedFor").GetString());
        double c = R * 283.15 / 0.01738, area = Math.PI / 4 * 0.04;
        double lnG = Bisect(s => Relation(7e5, 5.5e5, Math.Exp(s), c, 1.08e-5, 4200, 0.2, 5e-5), Math.Log(1e-3), Math.Log(1e4));
        double massFlow = Math.Exp(lnG) * area;
        Assert.Equal(massFlow, b.GetProperty("massFlow").GetDouble(), 1e-12 * massFlow);
        // Standard volume flow: the ideal-gas density p M / (R T) at 101 325 Pa and 288.15 K.
        Assert.Equal(massFlow / (101325 * 0.01738 / (R * 288.15)), b.GetProperty("standardVolumeFlow").GetDouble(), 1e-11);
        var assumed = b.GetProperty("assumptions").EnumerateArray().Select(a => a.GetProperty("field").GetString()).ToArray();
        Assert.Contains("compressibilityFactor", assumed);

        var back = await api.PostJson(Route, new
        {
            inletPressure = 700_000, massFlow = b.GetProperty("massFlow").GetDouble(), temperature = 10, molarMass = 0.01738,
            dynamicViscosity = 1.08e-5, length = 4200, diameter = 0.2, roughness = 0.00005,
        });
        Assert.Equal(200, back.Status);
        Assert.Equal(550_000, back.Body.GetProperty("outletPressure").GetDouble(), 1e-6);
    }

    [Fact]
    public async Task UsUnits_AgreeWithTheGeneralFlowEquationInUsCustomaryUnits()
    {
        // The general flow equation in US customary units (E. S. Menon 2005, Gas Pipeline Hydraulics, ch. 2, from memory):
        // Q = 77.54 (Tb/Pb) ((P1^2 - P2^2) / (G Tf L Z f))^0.5 D^2.5, Q in standard ft3/day, T in degrees R, P in psia, L in
        // miles, D in inches, f Darcy. It leaves out the 2 ln(p1/p2) term (here 0.45 beside f L/D of about 2500: 1e-4 in Q),
        // and 77.54 carries four digits: agreement within 0.1 percent. Base: 59 degrees F (15 degrees C), 101 325 Pa in psia.
        string url = Route + "?units=us&inletPressure=1000&outletPressure=800&temperature=60&specificGravity=0.6&compressibilityFactor=0.9" +
                     "&dynamicViscosity=" + S(1.1e-5 * Foot * Foot / (Pound * 9.80665)) + "&length=264000&diameter=1&roughness=" + S(0.0007 / 12);
        var r = await api.GetJson(url);
        Assert.Equal(200, r.Status);
        var b = r.Body;
        double f = b.GetProperty("frictionFactor").GetDouble();
        Assert.Equal(Friction(b.GetProperty("reynolds").GetDouble(), 0.0007 / 12), f, 1e-13);
        double tb = 518.67, pb = 101325 / Psi, tf = 519.67, miles = 50, inches = 12;
        double q = 77.54 * (tb / pb) * Math.Sqrt((1000.0 * 1000 - 800.0 * 800) / (0.6 * tf * miles * 0.9 * f)) * Math.Pow(inches, 2.5);
        double ours = b.GetProperty("standardVolumeFlow").GetDouble() * 86400;
        Assert.Equal(q, ours, 1e-3 * q);
        Assert.Equal("us", b.GetProperty("units").GetString());

        // The same line in SI gives the same flow, converted with exact factors.
        string si = Route + "?inletPressure=" + S(1000 * Psi) + "&outletPressure=" + S(800 * Psi) + "&temperature=" + S((60 - 32) / 1.8) +
                    "&specificGravity=0.6&compressibilityFactor=0.9&dynamicViscosity=0.000011&length=" + S(264000 * Foot) +
                    "&diameter=" + S(Foot) + "&roughness=" + S(0.0007 / 12 * Foot);
        var s = await api.GetJson(si);
        Assert.Equal(200, s.Status);
        double kg = s.Body.GetProperty("massFlow").GetDouble();
        Assert.Equal(kg / Pound, b.GetProperty("massFlow").GetDouble(), 1e-9 * kg / Pound);
        Assert.Equal(s.Body.GetProperty("outletVelocity").GetDouble() / Foot, b.GetProperty("outletVelocity").GetDouble(), 1e-9);
        Assert.Equal(s.Body.GetProperty("largestMassFlow").GetDouble() / Pound, b.GetProperty("largestMassFlow").GetDouble(), 1e-9 * kg);
    }

    [Fact]
    public async Task AMassFlowBeyondTheLimit_Is422_WithTheLargestMassFlowInTheBody()
    {
        var ok = await api.GetJson(Feeder + "&massFlow=20");
        double largest = ok.Body.GetProperty("largestMassFlow").GetDouble();
        double pLimit = ok.Body.GetProperty("outletPressureAtLimit").GetDouble();
        // The limit: the outlet velocity sqrt(C) at the outlet pressure G sqrt(C) (the design's definition).
        Assert.Equal(largest / (Math.PI / 4 * 0.09) * Math.Sqrt(NaturalGasC), pLimit, 1e-9 * pLimit);
        // ... where y - 1 - ln y = f L/D, y = p1^2/(C G^2) (isothermal flow with friction; White, Fluid Mechanics, from memory).
        double gMax = largest / (Math.PI / 4 * 0.09), y = 5e6 * 5e6 / (NaturalGasC * gMax * gMax);
        double fLd = Friction(gMax * 0.3 / 1.1e-5, 1.5e-4) * 50000 / 0.3;
        Assert.Equal(fLd, y - 1 - Math.Log(y), 1e-8 * fLd);

        var choked = await api.GetJson(Feeder + "&massFlow=" + S(largest * 1.01));
        Assert.Equal(422, choked.Status);
        Assert.Equal("application/problem+json", choked.ContentType);
        Assert.Equal(largest, choked.Body.GetProperty("largestMassFlow").GetDouble(), 1e-12 * largest);
        Assert.Contains("massFlow exceeds", choked.Body.GetProperty("detail").GetString());

        var below = await api.GetJson(Feeder + "&outletPressure=" + S(pLimit * 0.5));
        Assert.Equal(422, below.Status);
        Assert.Equal(largest, below.Body.GetProperty("largestMassFlow").GetDouble(), 1e-12 * largest);

        var near = await api.GetJson(Feeder + "&massFlow=" + S(largest * 0.95));
        Assert.Equal(200, near.Status);
        Assert.Contains(near.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "near-isothermal-limit");
        Assert.True(near.Body.GetProperty("outletPressure").GetDouble() > pLimit);
        Assert.True(near.Body.GetProperty("outletMachNumber").GetDouble() < 1 / Math.Sqrt(1.3));
    }

    public static TheoryData<string, string> BadInputs() => new()
    {
        { "&massFlow=20&outletPressure=4000000", "outletPressure" },
        { "&massFlow=20&outletPressure=4000000", "massFlow" },
        { "", "massFlow" },
        { "&outletPressure=5000000", "outletPressure" },
        { "&outletPressure=6000000", "outletPressure" },
        { "&outletPressure=-1", "outletPressure" },
        { "&massFlow=0", "massFlow" },
        { "&massFlow=NaN", "massFlow" },
        { "&massFlow=20&molarMass=0.017", "molarMass" },
        { "&massFlow=20&compressibilityFactor=0", "compressibilityFactor" },
        { "&massFlow=20&heatCapacityRatio=0.9", "heatCapacityRatio" },
        { "&massFlow=20&units=imperial", "units" },
    };

    [Theory]
    [MemberData(nameof(BadInputs))]
    public async Task BadInput_Is400NamingTheField(string extra, string field) =>
        ProblemAssert.NamesField(await api.GetJson(Feeder + extra), 400, field);

    [Fact]
    public async Task BadBodies_Are400NamingTheField()
    {
        var neither = await api.PostJson(Route, new { inletPressure = 7e5, massFlow = 1, temperature = 10, dynamicViscosity = 1e-5, length = 10, diameter = 0.1, roughness = 0 });
        ProblemAssert.NamesField(neither, 400, "molarMass");
        ProblemAssert.NamesField(neither, 400, "specificGravity");
        var grams = await api.PostJson(Route, new { inletPressure = 7e5, massFlow = 1, temperature = 10, molarMass = 16.04, dynamicViscosity = 1e-5, length = 10, diameter = 0.1, roughness = 0 });
        ProblemAssert.NamesField(grams, 400, "molarMass");
        Assert.Contains("g/mol", grams.Body.GetProperty("errors").GetProperty("molarMass").ToString());
        var cold = await api.PostJson(Route, new { inletPressure = 7e5, massFlow = 1, temperature = -300, molarMass = 0.016, dynamicViscosity = 1e-5, length = 10, diameter = 0.1, roughness = 0 });
        ProblemAssert.NamesField(cold, 400, "temperature");
        var rough = await api.PostJson(Route, new { inletPressure = 7e5, massFlow = 1, temperature = 10, molarMass = 0.016, dynamicViscosity = 1e-5, length = 10, diameter = 0.1, roughness = 0.1 });
        ProblemAssert.NamesField(rough, 400, "roughness");
        var missing = await api.PostJson(Route, new { massFlow = 1, temperature = 10, molarMass = 0.016, length = 10, diameter = 0.1, roughness = 0 });
        ProblemAssert.NamesField(missing, 400, "inletPressure");
        ProblemAssert.NamesField(missing, 400, "dynamicViscosity");
    }

    [Theory]
    [InlineData("inletPressure=1e308&massFlow=1&length=1000&diameter=0.3")]
    [InlineData("inletPressure=1e308&outletPressure=1e307&length=1000&diameter=0.3")]
    [InlineData("inletPressure=5000000&massFlow=1e308&length=1000&diameter=0.3")]
    [InlineData("inletPressure=5000000&massFlow=1&length=5e-324&diameter=0.3")]
    [InlineData("inletPressure=5000000&outletPressure=4999999.999999999&length=5e-324&diameter=0.3")]
    [InlineData("inletPressure=5e-324&massFlow=5e-324&length=1e308&diameter=1e-300")]
    [InlineData("inletPressure=1e308&outletPressure=5e-324&length=1e308&diameter=1e308")]
    public async Task ExtremeInputs_AnswerWithoutA5xxOrANonFiniteNumber(string query)
    {
        var r = await api.GetJson(Route + "?" + query + "&temperature=15&molarMass=0.016&dynamicViscosity=0.00001&roughness=0");
        Assert.True(r.Status is 200 or 400 or 422, $"{r.Status}: {r.Body}");
        string raw = r.Body.GetRawText();
        Assert.DoesNotContain("NaN", raw);
        Assert.DoesNotContain("Infinity", raw);
        if (r.Status == 200)
        {
            Assert.True(r.Body.GetProperty("outletPressure").GetDouble() > 0);
            Assert.True(r.Body.GetProperty("massFlow").GetDouble() > 0);
        }
    }

    [Fact]
    public async Task Sheet_ShowsTheProfileAndTheLimit()
    {
        using var html = await api.Client.GetAsync(Feeder + "&massFlow=20&format=html", Cancel);
        Assert.Equal(200, (int)html.StatusCode);
        string page = await html.Content.ReadAsStringAsync(Cancel);
        Assert.Contains("Pressure along the line", page);
        Assert.Contains("Largest mass flow (isothermal limit)", page);
        Assert.Contains("Shapiro (1953)", page);
    }

    [Fact]
    public async Task Trace_IsTheSolveOfTheAnswer()
    {
        var r = await api.GetJson(Feeder + "&massFlow=20&trace=true");
        var steps = r.Body.GetProperty("trace");
        Assert.Equal(r.Body.GetProperty("iterations").GetInt32(), steps.GetArrayLength());
        double delta = steps[steps.GetArrayLength() - 1].GetProperty("x").GetDouble();
        Assert.Equal(r.Body.GetProperty("pressureDrop").GetDouble() / 5e6, delta, 1e-15);
    }

    // Outlet pressure from a mass flow (molar mass given); mass flow from an outlet pressure (specific gravity given, through
    // dM/dSG); a laminar line. Each entry against a central difference of the same calculation through the service.
    [Theory]
    [InlineData(false, """{"inletPressure": 5000000.0, "massFlow": 15.0, "temperature": 15.0, "molarMass": 0.01738, "compressibilityFactor": 0.9, "dynamicViscosity": 1.1e-5, "length": 50000.0, "diameter": 0.3, "roughness": 4.5e-5}""", 9)]
    [InlineData(true, """{"inletPressure": 700000.0, "outletPressure": 550000.0, "temperature": 10.0, "specificGravity": 0.6, "dynamicViscosity": 1.08e-5, "length": 4200.0, "diameter": 0.2, "roughness": 5e-5}""", 7)]
    [InlineData(false, """{"inletPressure": 200000.0, "massFlow": 0.002, "temperature": 15.0, "molarMass": 0.01738, "dynamicViscosity": 1.1e-5, "length": 300.0, "diameter": 0.05, "roughness": 4.5e-5}""", 6)]
    public async Task Sensitivities_EveryEntryMatchesCentralDifference(bool post, string json, int atLeast)
    {
        int checks = await new Sensitivities.SensitivityHarness(api, Route, post).CheckAll(System.Text.Json.Nodes.JsonNode.Parse(json)!.AsObject(),
            new Dictionary<string, double> { ["temperature"] = 0.5 });
        Assert.True(checks >= atLeast, $"only {checks} entries checked");
    }
}
