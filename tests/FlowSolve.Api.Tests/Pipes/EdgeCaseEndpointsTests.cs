using System.Text.Json;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Api.Tests.Pipes;

/// <summary>
/// Edge cases through the service: finite inputs at the end of double precision answer a 2xx with finite numbers, a 400
/// naming the field or a 422 saying why (never a 500); two flows or diameters near Re 4000 are both reported; a rising
/// pump curve that meets the system is solved at its stable intersection; an efficiency fit that overshoots the
/// catalogue is reported; a closed-form friction factor says so. References: closed forms (the quadratic formula,
/// Hagen-Poiseuille, least-squares normal equations) and MathNet.Numerics' Brent on the published friction relations.
/// </summary>
public sealed class EdgeCaseEndpointsTests(ApiFixture api)
{
    private const double G = 9.80665;
    private const double Nu = 1e-6;

    private static void AssertAllNumbersFinite(JsonElement e)
    {
        switch (e.ValueKind)
        {
            case JsonValueKind.Object: foreach (var p in e.EnumerateObject()) AssertAllNumbersFinite(p.Value); break;
            case JsonValueKind.Array: foreach (var x in e.EnumerateArray()) AssertAllNumbersFinite(x); break;
            case JsonValueKind.Number: Assert.True(double.IsFinite(e.GetDouble())); break;
        }
    }

    private static string[] Codes(JsonElement body) =>
        body.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()!).ToArray();

    [Theory]
    [InlineData("/v1/pipes/head-loss?flow=5e-324&diameter=0.1&length=100&roughness=0.0001", 422)]
    [InlineData("/v1/pipes/head-loss?flow=0.01&diameter=0.1&length=5e-324&roughness=0.0001", 200)]
    [InlineData("/v1/pipes/flow?headLoss=1&diameter=0.1&roughness=0.0001&length=5e-324", 422)]
    [InlineData("/v1/pipes/flow?headLoss=1&diameter=0.1&roughness=0.0001&length=5e-324&method=hazen-williams&hazenWilliamsC=120", 422)]
    [InlineData("/v1/pipes/flow?headLoss=5e-324&diameter=0.1&roughness=0.0001&length=100", 422)]
    [InlineData("/v1/pipes/diameter?headLoss=1&roughness=0.0001&length=100&flow=5e-324", 422)]
    [InlineData("/v1/pipes/diameter?headLoss=1&roughness=0.0001&length=5e-324&flow=0.01", 422)]
    [InlineData("/v1/pumps/duty-point?c0=40&c1=0&c2=-5000&staticHead=15&length=100&diameter=1e308&roughness=0.0001", 200)]
    [InlineData("/v1/channels/normal-depth?shape=circular&diameter=1&slope=0.001&manningN=0.013&flow=5e-324", 200)]
    [InlineData("/v1/channels/normal-depth?shape=rectangular&bottomWidth=2&slope=0.001&manningN=0.013&flow=5e-324", 422)]
    public async Task ExtremeButFiniteInput_AnswersWithFiniteNumbersOrAProblem(string url, int status)
    {
        var r = await api.GetJson(url);
        Assert.Equal(status, r.Status);
        AssertAllNumbersFinite(r.Body);
        if (status == 422) Assert.Equal("application/problem+json", r.ContentType);
    }

    [Fact]
    public async Task HeadLoss_VanishingFlow_Is422BelowTheFrictionRelationsRange()
    {
        var r = await api.GetJson("/v1/pipes/head-loss?flow=5e-324&diameter=0.1&length=100&roughness=0.0001");
        Assert.Equal(422, r.Status);
        Assert.Equal("outside-range", r.Body.GetProperty("pipeStatus").GetString());
        Assert.True(r.Body.GetProperty("reynolds").GetDouble() < 1e-3);
        Assert.Contains("below 0.001", r.Body.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task Diameter_NeededBelowTheRoughness_Is422NamingTheRoughness()
    {
        // 1 L/s through 10 m of pipe with 50 m to spend and 50 mm of wall roughness (metres typed for millimetres, say):
        // a pipe of inside diameter 50 mm loses far less than 50 m (turbulent there, Re about 25 000), so the diameter
        // that uses the allowance is below the roughness, outside the friction relations (e/D < 1). Reference:
        // Darcy-Weisbach with Colebrook (1939) solved by MathNet's Brent at D = e (e/D taken as just below 1).
        const double q = 1e-3, length = 10, allowed = 50, e = 0.05;
        var r = await api.GetJson($"/v1/pipes/diameter?flow={q}&length={length}&headLoss={allowed}&roughness={e}&kinematicViscosity={Nu}");
        Assert.Equal(422, r.Status);
        Assert.Equal("outside-range", r.Body.GetProperty("pipeStatus").GetString());
        string detail = r.Body.GetProperty("detail").GetString()!;
        Assert.Contains("roughness", detail);
        double area = Math.PI * e * e / 4, v = q / area, re = v * e / Nu;
        double x = Brent.FindRoot(x => x + 2 * Math.Log10(1 / (1 + 1e-9) / 3.7 + 2.51 * x / re), 0.1, 40, 1e-14, 200);
        double loss = Math.Pow(x, -2) * length / e * v * v / (2 * G);
        Assert.True(re > 4000 && loss < allowed, $"the reference at D = e: Re {re}, loss {loss} m");
        Assert.Contains(loss.ToString("G6", System.Globalization.CultureInfo.InvariantCulture), detail);

        // With a tenth of that roughness the diameter lies above it and is answered (the case is otherwise the same).
        var ok = await api.GetJson($"/v1/pipes/diameter?flow={q}&length={length}&headLoss={allowed}&roughness={e / 10}&kinematicViscosity={Nu}");
        Assert.Equal(200, ok.Status);
        Assert.True(ok.Body.GetProperty("diameter").GetDouble() > e / 10);
    }

    [Fact]
    public async Task DutyPoint_HugePipeDiameter_IsThePumpAtTheStaticHead()
    {
        // A pipe of 1e308 m loses nothing (Hagen-Poiseuille: 128 nu L Q/(pi g D^4) underflows to 0), so the pump meets
        // the static head: 40 - 5000 Q^2 = 15, Q = sqrt(25/5000).
        var r = await api.GetJson("/v1/pumps/duty-point?c0=40&c1=0&c2=-5000&staticHead=15&length=100&diameter=1e308&roughness=0.0001");
        Assert.Equal(200, r.Status);
        Assert.Equal(Math.Sqrt(25.0 / 5000), r.Body.GetProperty("flow").GetDouble(), 1e-12);
        Assert.Equal(15.0, r.Body.GetProperty("head").GetDouble(), 1e-12);
    }

    [Fact]
    public async Task DutyPoint_CoefficientThatOverflows_Is400NamingIt()
    {
        var r = await api.GetJson("/v1/pumps/duty-point?c0=40&c1=1e308&c2=-5000&staticHead=15&resistance=3000");
        ProblemAssert.NamesField(r, 400, "c1");
        var post = await api.PostJson("/v1/pumps/duty-point", new
        {
            pump = new { coefficients = new[] { 40, 1e308, -5000 } }, system = new { staticHead = 15.0, resistance = 3000.0 },
        });
        ProblemAssert.NamesField(post, 400, "pump.coefficients[1]");
    }

    // ---- Two answers near Re 4000: reference from the published relations, roots by Brent ----

    private static double Colebrook(double re, double r) =>
        Brent.FindRoot(f => 1 / Math.Sqrt(f) + 2 * Math.Log10(r / 3.7 + 2.51 / (re * Math.Sqrt(f))), 1e-3, 0.2, 1e-16, 200);

    /// <summary>Churchill, S. W. (1977), Chem. Eng. 84(24), 91-92.</summary>
    private static double Churchill(double re, double r)
    {
        double a = Math.Pow(-2.457 * Math.Log(Math.Pow(7 / re, 0.9) + 0.27 * r), 16), b = Math.Pow(37530 / re, 16);
        return 8 * Math.Pow(Math.Pow(8 / re, 12) + Math.Pow(a + b, -1.5), 1.0 / 12);
    }

    private static double HeadLoss(double length, double d, double e, double q)
    {
        double v = q / (Math.PI * d * d / 4), re = v * d / Nu;
        double f = re < 2000 ? 64 / re : re < 4000 ? Churchill(re, e / d) : Colebrook(re, e / d);
        return f * length / d * v * v / (2 * G);
    }

    [Fact]
    public async Task Flow_HeadNearRe4000_ReportsTheAlternateFlow()
    {
        double d = 0.1, length = 100, e = 1e-4, q4 = 4000 * Nu * Math.PI * d / 4;
        double top = HeadLoss(length, d, e, q4 * (1 - 1e-9)), bottom = HeadLoss(length, d, e, q4 * (1 + 1e-9));
        double head = bottom + 0.5 * (top - bottom);
        var reference = FlowSolve.Core.Tests.Pipes.RootScan.All(q => HeadLoss(length, d, e, q) - head, 0.5 * q4, 2 * q4, head);
        Assert.Equal(2, reference.Count);
        Assert.True(reference[1] / reference[0] - 1 > 0.005, "the two flows are apart by about 1 percent");

        var r = await api.GetJson(FormattableString.Invariant(
            $"/v1/pipes/flow?headLoss={head:R}&diameter={d}&length={length}&roughness={e}&kinematicViscosity={Nu}&density=1000"));
        Assert.Equal(200, r.Status);
        Assert.Equal(reference[1], r.Body.GetProperty("flow").GetDouble(), reference[1] * 1e-9);
        Assert.Equal(reference[0], r.Body.GetProperty("alternateFlow").GetDouble(), reference[0] * 1e-9);
        Assert.Contains("second-solution", Codes(r.Body));
        Assert.Equal("turbulent", r.Body.GetProperty("regime").GetString());

        // Away from the drop there is one flow and no alternate.
        var one = await api.GetJson(FormattableString.Invariant(
            $"/v1/pipes/flow?headLoss={2 * top:R}&diameter={d}&length={length}&roughness={e}&kinematicViscosity={Nu}&density=1000"));
        Assert.False(one.Body.TryGetProperty("alternateFlow", out var alt) && alt.ValueKind != JsonValueKind.Null);
        Assert.DoesNotContain("second-solution", Codes(one.Body));
    }

    [Fact]
    public async Task Diameter_AllowanceNearRe4000_ReportsTheAlternateDiameter()
    {
        // The allowance of the case: flow 0.00142 m3/s over 1000 m of smooth pipe, nu = 1e-6 m2/s.
        double flow = 0.00142, length = 1000, d4 = 4 * flow / (Math.PI * Nu * 4000);
        double turbulent = HeadLoss(length, d4 * (1 - 1e-9), 0, flow), transitional = HeadLoss(length, d4 * (1 + 1e-9), 0, flow);
        double allowed = turbulent + 0.9 * (transitional - turbulent);
        var reference = FlowSolve.Core.Tests.Pipes.RootScan.All(dd => HeadLoss(length, dd, 0, flow) - allowed, 0.5 * d4, 2 * d4, allowed);
        Assert.Equal(2, reference.Count);

        var r = await api.GetJson(FormattableString.Invariant(
            $"/v1/pipes/diameter?flow={flow}&headLoss={allowed:R}&length={length}&roughness=0&kinematicViscosity={Nu}&density=1000"));
        Assert.Equal(200, r.Status);
        Assert.Equal(reference[0], r.Body.GetProperty("diameter").GetDouble(), reference[0] * 1e-9);
        Assert.Equal(reference[1], r.Body.GetProperty("alternateDiameter").GetDouble(), reference[1] * 1e-9);
        Assert.Contains("second-solution", Codes(r.Body));
    }

    // ---- Rising pump curve: the intersections by the quadratic formula ----

    [Fact]
    public async Task DutyPoint_RisingCurveMeetingTheSystem_IsTheStableIntersection()
    {
        // 40 + 400 Q - 20000 Q^2 = 41: Q = (400 -+ sqrt(400^2 - 4 x 20000 x 1)) / 40000.
        double disc = Math.Sqrt(400.0 * 400 - 4 * 20000.0), low = (400 - disc) / 40000, high = (400 + disc) / 40000;
        var r = await api.GetJson("/v1/pumps/duty-point?c0=40&c1=400&c2=-20000&staticHead=41&resistance=0");
        Assert.Equal(200, r.Status);
        Assert.Equal("solved", r.Body.GetProperty("status").GetString());
        Assert.Equal(high, r.Body.GetProperty("flow").GetDouble(), high * 1e-10);
        Assert.Equal(low, r.Body.GetProperty("unstableFlow").GetDouble(), low * 1e-8);
        Assert.Equal(41.0, r.Body.GetProperty("head").GetDouble(), 1e-9);
        var warning = r.Body.GetProperty("warnings").EnumerateArray().Single(w => w.GetProperty("code").GetString() == "rising-pump-curve");
        Assert.Contains("stable intersection", warning.GetProperty("message").GetString());

        // Out of reach (the curve peaks at 42 m): still the 422 with the shortfall.
        var none = await api.GetJson("/v1/pumps/duty-point?c0=40&c1=400&c2=-20000&staticHead=43&resistance=0");
        Assert.Equal(422, none.Status);
        Assert.Equal("shut-off-below-static-head", none.Body.GetProperty("dutyPointStatus").GetString());
    }

    // ---- The efficiency fit through the origin against the catalogue ----

    [Fact]
    public async Task DutyPoint_EfficiencyFitAboveTheCatalogue_ReportsDeviationsAndWarns()
    {
        // A fictional catalogue (samples/scenario/pumps.http): highest efficiency 0.78. Reference: the fit
        // eta = e1 Q + e2 Q^2 from its normal equations (Cramer's rule).
        double[] q = [0.0, 0.03, 0.06, 0.08, 0.09], h = [98.00, 95.84, 89.36, 82.64, 78.56], e = [0.0, 0.55, 0.76, 0.78, 0.74];
        double s11 = q.Sum(x => x * x), s12 = q.Sum(x => x * x * x), s22 = q.Sum(x => x * x * x * x);
        double b1 = q.Zip(e, (x, y) => x * y).Sum(), b2 = q.Zip(e, (x, y) => x * x * y).Sum(), det = s11 * s22 - s12 * s12;
        double e1 = (b1 * s22 - b2 * s12) / det, e2 = (s11 * b2 - s12 * b1) / det;
        double[] miss = q.Zip(e, (x, y) => e1 * x + e2 * x * x - y).ToArray();
        double rms = Math.Sqrt(miss.Sum(m => m * m) / miss.Length), max = miss.Max(Math.Abs), peak = -e1 * e1 / (4 * e2);

        var body = new
        {
            pump = new { points = q.Select((x, i) => new { flow = x, head = h[i], efficiency = e[i] }).ToArray() },
            system = new { staticHead = 76.5, resistance = 595.5 }, pumpsInParallel = 2, temperature = 12,
        };
        var r = await api.PostJson("/v1/pumps/duty-point", body);
        Assert.Equal(200, r.Status);
        Assert.Equal(rms, r.Body.GetProperty("efficiencyRmsDeviation").GetDouble(), 1e-12);
        Assert.Equal(max, r.Body.GetProperty("efficiencyMaxDeviation").GetDouble(), 1e-12);
        Assert.Equal(peak, r.Body.GetProperty("bestEfficiency").GetDouble(), 1e-12);
        Assert.True(peak > 0.785);
        var warning = r.Body.GetProperty("warnings").EnumerateArray().Single(w => w.GetProperty("code").GetString() == "efficiency-above-data");
        Assert.Contains("0.78", warning.GetProperty("message").GetString());
    }

    [Fact]
    public async Task Friction_Laminar_StatusIsClosedForm()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=1000&relativeRoughness=0");
        Assert.Equal(200, r.Status);
        Assert.Equal(0.064, r.Body.GetProperty("frictionFactor").GetDouble(), 1e-15); // 64/Re, Hagen-Poiseuille
        Assert.Equal(0, r.Body.GetProperty("iterations").GetInt32());
        Assert.Equal("closed-form", r.Body.GetProperty("status").GetString());
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        var turbulent = await api.GetJson("/v1/friction-factor?reynolds=100000&relativeRoughness=0.001");
        Assert.NotEqual("closed-form", turbulent.Body.GetProperty("status").GetString());
    }
}
