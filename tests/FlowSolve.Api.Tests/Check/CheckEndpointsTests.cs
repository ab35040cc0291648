using System.Text;
using System.Text.Json;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Friction;

namespace FlowSolve.Api.Tests.Check;

public sealed class CheckEndpointsTests(ApiFixture api)
{
    [Fact]
    public async Task FrictionFactor_SwameeJainClaim_FailsAndIsIdentified()
    {
        // A spreadsheet that used Swamee-Jain in its low-Reynolds, high-roughness corner (2.8 percent off there).
        double claim = ExplicitFriction.SwameeJain(5000, 0.01);
        var r = await api.PostJson("/v1/check/friction-factor", new { reynolds = 5000, relativeRoughness = 0.01, claimed = new { frictionFactor = claim } });
        Assert.Equal(200, r.Status);
        var check = r.Body.GetProperty("checks")[0];
        double exact = ColebrookWhite.Solve(5000, 0.01).FrictionFactor;
        Assert.Equal(exact, check.GetProperty("exact").GetDouble(), 1e-15);
        Assert.Equal((claim / exact - 1) * 100, check.GetProperty("deviationPercent").GetDouble(), 1e-9);
        Assert.False(check.GetProperty("pass").GetBoolean());
        Assert.False(r.Body.GetProperty("passed").GetBoolean());
        Assert.Contains("swamee-jain", check.GetProperty("likelyCause").GetString());
    }

    [Fact]
    public async Task FrictionFactor_ClaimOfThreeDigits_IsMatchedToItsOwnPrecision()
    {
        // The README's example: 0.0486 claimed at Re 5000, e/D 0.01. Three significant digits stand for anything from
        // 0.04855 to 0.04865, so the likely cause is the approximation inside that interval (computed independently here
        // from the explicit formulae), not none as with a fixed 0.01 percent.
        var r = await api.PostJson("/v1/check/friction-factor", new { reynolds = 5000, relativeRoughness = 0.01, claimed = new { frictionFactor = 0.0486 } });
        Assert.Equal(200, r.Status);
        var candidates = new (string Code, double F)[]
        {
            ("swamee-jain", ExplicitFriction.SwameeJain(5000, 0.01)), ("haaland", ExplicitFriction.Haaland(5000, 0.01)),
            ("churchill", ExplicitFriction.Churchill(5000, 0.01)), ("serghides", ExplicitFriction.Serghides(5000, 0.01)),
        }.Where(c => Math.Abs(c.F - 0.0486) <= 0.00005).ToArray();
        Assert.NotEmpty(candidates);
        string cause = r.Body.GetProperty("checks")[0].GetProperty("likelyCause").GetString()!;
        Assert.Contains(candidates, c => cause.Contains(c.Code, StringComparison.Ordinal));
    }

    [Theory]
    [InlineData("\"NaN\"")]
    [InlineData("\"abc\"")]
    [InlineData("\"0.0486\"")]
    [InlineData("true")]
    [InlineData("null")]
    [InlineData("1e309")]
    [InlineData("-1e309")]
    public async Task Claim_NotAFiniteNumber_400NamesTheClaim(string claim)
    {
        var r = await api.PostRaw("/v1/check/friction-factor", "{\"reynolds\": 5000, \"relativeRoughness\": 0.01, \"claimed\": {\"frictionFactor\": " + claim + "}}", "application/json");
        ProblemAssert.NamesField(r, 400, "claimed.frictionFactor");
    }

    [Theory]
    [InlineData(1e308)]
    [InlineData(-1e308)]
    [InlineData(5e-324)]
    public async Task Claim_AtTheExtremes_FailsWithFiniteNumbers(double claim)
    {
        var r = await api.PostJson("/v1/check/friction-factor", new { reynolds = 5000, relativeRoughness = 0.01, claimed = new { frictionFactor = claim } });
        Assert.Equal(200, r.Status);
        var check = r.Body.GetProperty("checks")[0];
        Assert.False(check.GetProperty("pass").GetBoolean());
        Assert.True(double.IsFinite(check.GetProperty("deviation").GetDouble()));
    }

    [Theory]
    [InlineData("""{"reynolds": 5000, "reynolds": 6000, "relativeRoughness": 0.01, "claimed": {"frictionFactor": 0.05}}""", "reynolds")]
    [InlineData("""{"reynolds": 5000, "relativeRoughness": 0.01, "claimed": {"frictionFactor": 0.05, "frictionFactor": 0.04}}""", "claimed.frictionFactor")]
    public async Task DuplicateKey_400NamesIt(string body, string field) =>
        ProblemAssert.NamesField(await api.PostRaw("/v1/check/friction-factor", body, "application/json"), 400, field);

    [Theory]
    [InlineData("text/plain")]
    [InlineData("application/x-www-form-urlencoded")]
    public async Task NotJson_415(string contentType)
    {
        var r = await api.PostRaw("/v1/check/friction-factor", """{"reynolds": 5000, "relativeRoughness": 0.01, "claimed": {"frictionFactor": 0.05}}""", contentType);
        Assert.Equal(415, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
    }

    [Fact]
    public async Task FrictionFactor_ClaimWithinTolerance_Passes()
    {
        double exact = ColebrookWhite.Solve(2e5, 1e-4).FrictionFactor;
        var r = await api.PostJson("/v1/check/friction-factor",
            new { reynolds = 2e5, relativeRoughness = 1e-4, claimed = new { frictionFactor = exact * 1.003, regime = "turbulent" } });
        Assert.True(r.Body.GetProperty("passed").GetBoolean());
        Assert.Equal(2, r.Body.GetProperty("checks").GetArrayLength());
    }

    [Fact]
    public async Task Tolerance_IsSettable()
    {
        double exact = ColebrookWhite.Solve(2e5, 1e-4).FrictionFactor;
        var r = await api.PostJson("/v1/check/friction-factor",
            new { reynolds = 2e5, relativeRoughness = 1e-4, tolerancePercent = 0.1, claimed = new { frictionFactor = exact * 1.003 } });
        Assert.False(r.Body.GetProperty("passed").GetBoolean());
        Assert.Equal(0.1, r.Body.GetProperty("tolerancePercent").GetDouble());
    }

    [Fact]
    public async Task Water_ViscosityAtWrongTemperature_IsIdentified()
    {
        // The stated temperature is 20 C; the claim is IAPWS water at 10 C (a common table-row slip).
        double claim = Water.KinematicViscosity(10);
        var r = await api.PostJson("/v1/check/fluids/water", new { temperature = 20, claimed = new { kinematicViscosity = claim } });
        var check = r.Body.GetProperty("checks")[0];
        Assert.False(check.GetProperty("pass").GetBoolean());
        Assert.Equal(Water.KinematicViscosity(20), check.GetProperty("exact").GetDouble(), 1e-18);
        Assert.Contains("10 degrees C", check.GetProperty("likelyCause").GetString());
    }

    [Fact]
    public async Task PipeHeadLoss_WrongTemperature_IsIdentified()
    {
        var inputs = new { flow = 0.05, diameter = 0.2, length = 1200, roughness = 0.00026, temperature = 15 };
        var at5 = await api.PostJson("/v1/pipes/head-loss", new { flow = 0.05, diameter = 0.2, length = 1200, roughness = 0.00026, temperature = 5 });
        double claim = at5.Body.GetProperty("headLoss").GetDouble();
        var r = await api.PostJson("/v1/check/pipes/head-loss", new { inputs.flow, inputs.diameter, inputs.length, inputs.roughness, inputs.temperature, claimed = new { headLoss = claim } });
        Assert.Equal(200, r.Status);
        var check = r.Body.GetProperty("checks")[0];
        Assert.False(check.GetProperty("pass").GetBoolean());
        Assert.Contains("5 degrees C", check.GetProperty("likelyCause").GetString());
    }

    [Fact]
    public async Task UnknownClaimedField_400NamesIt() =>
        ProblemAssert.NamesField(await api.PostJson("/v1/check/friction-factor",
            new { reynolds = 2e5, relativeRoughness = 1e-4, claimed = new { headLoss = 3.0 } }), 400, "claimed.headLoss");

    [Fact]
    public async Task MissingClaims_400() =>
        ProblemAssert.NamesField(await api.PostJson("/v1/check/friction-factor", new { reynolds = 2e5, relativeRoughness = 1e-4 }), 400, "claimed");

    [Fact]
    public async Task BadInputs_400NamesTheInputField() =>
        ProblemAssert.NamesField(await api.PostJson("/v1/check/friction-factor",
            new { reynolds = -2, relativeRoughness = 1e-4, claimed = new { frictionFactor = 0.02 } }), 400, "reynolds");

    [Fact]
    public async Task UnknownCalculation_404()
    {
        var r = await api.PostJson("/v1/check/no-such", new { claimed = new { x = 1 } });
        Assert.Equal(404, r.Status);
    }

    [Fact]
    public async Task CsvBatch_TakesAColumnOfClaims()
    {
        double sj = ExplicitFriction.SwameeJain(5000, 0.01);
        double exact = ColebrookWhite.Solve(75000, 0.005).FrictionFactor;
        string csv = FormattableString.Invariant($"reynolds,relativeRoughness,claimed.frictionFactor\n5000,0.01,{sj}\n75000,0.005,{exact}\n");
        using var content = new StringContent(csv, Encoding.UTF8, "text/csv");
        using var response = await api.Client.PostAsync("/v1/batch/check/friction-factor", content, TestContext.Current.CancellationToken);
        string text = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        var lines = text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        var header = lines[0].Split(',');
        int passed = Array.IndexOf(header, "passed");
        Assert.Equal("FALSE", lines[1].Split(',')[passed]);
        Assert.Equal("TRUE", lines[2].Split(',')[passed]);
    }
}
