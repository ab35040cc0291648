using System.Text.Json;
using FlowSolve.Core.Friction;

namespace FlowSolve.Api.Tests.Friction;

public sealed class FrictionEndpointsTests(ApiFixture api)
{
    public static TheoryData<double, double> WhiteTable => new()
    {
        // F. M. White, Fluid Mechanics, chapter on dimensional analysis: tabulation at e/D = 0.005 (three figures).
        { 15_000, 0.0356 }, { 75_000, 0.0316 }, { 250_000, 0.0308 }, { 900_000, 0.0305 }, { 3_330_000, 0.0304 },
    };

    [Theory]
    [MemberData(nameof(WhiteTable))]
    public async Task Get_WhiteTabulation_WithinThreeFigures(double re, double published)
    {
        var r = await api.GetJson($"/v1/friction-factor?reynolds={re}&relativeRoughness=0.005");
        Assert.Equal(200, r.Status);
        Assert.Equal(published, r.Body.GetProperty("frictionFactor").GetDouble(), 0.005 * published);
        Assert.Equal("turbulent", r.Body.GetProperty("regime").GetString());
        Assert.True(r.Body.GetProperty("converged").GetBoolean());
        Assert.InRange(r.Body.GetProperty("iterations").GetInt32(), 1, 6);
    }

    [Fact]
    public async Task Get_ResponseHasContractFields()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005");
        foreach (var name in new[] { "frictionFactor", "method", "regime", "iterations", "converged", "residual", "validity", "warnings", "approximations", "assumptions" })
            Assert.True(r.Body.TryGetProperty(name, out _), $"missing {name}");
        var approximations = r.Body.GetProperty("approximations").EnumerateArray().ToArray();
        Assert.Equal(["swamee-jain", "haaland", "churchill", "serghides"], approximations.Select(a => a.GetProperty("method").GetString()));
        double exact = r.Body.GetProperty("frictionFactor").GetDouble();
        foreach (var a in approximations)
        {
            // The deviation is what the published formula gives against the exact value at these inputs.
            double f = a.GetProperty("frictionFactor").GetDouble();
            Assert.Equal((f / exact - 1) * 100, a.GetProperty("deviationPercent").GetDouble(), 1e-9);
            Assert.True(a.GetProperty("inRange").GetBoolean());
        }
        Assert.Equal(ExplicitFriction.Haaland(75000, 0.005), approximations[1].GetProperty("frictionFactor").GetDouble());
    }

    [Fact]
    public async Task Post_RoughnessAndDiameter_SameAsRelativeRoughness()
    {
        var a = await api.PostJson("/v1/friction-factor", new { reynolds = 2.5e5, roughness = 0.00026, diameter = 0.3 });
        var b = await api.PostJson("/v1/friction-factor", new { reynolds = 2.5e5, relativeRoughness = 0.00026 / 0.3 });
        Assert.Equal(200, a.Status);
        Assert.Equal(b.Body.GetProperty("frictionFactor").GetDouble(), a.Body.GetProperty("frictionFactor").GetDouble());
        Assert.Contains(a.Body.GetProperty("assumptions").EnumerateArray(), x => x.GetProperty("field").GetString() == "relativeRoughness");
    }

    [Theory]
    [InlineData("swamee-jain")]
    [InlineData("haaland")]
    [InlineData("churchill")]
    [InlineData("serghides")]
    public async Task Get_ExplicitMethod_ReturnsThatMethodAndExactBeside(string method)
    {
        var r = await api.GetJson($"/v1/friction-factor?reynolds=200000&relativeRoughness=0.0002&method={method}");
        Assert.Equal(200, r.Status);
        Assert.Equal(method, r.Body.GetProperty("method").GetString());
        FrictionMethodInfo.TryParse(method, out var info);
        Assert.Equal(ExplicitFriction.Evaluate(info.Method, 200000, 0.0002), r.Body.GetProperty("frictionFactor").GetDouble());
        Assert.Equal(ColebrookWhite.Solve(200000, 0.0002).FrictionFactor, r.Body.GetProperty("exactFrictionFactor").GetDouble());
    }

    [Fact]
    public async Task Get_Laminar_Is64OverRe()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=1200&relativeRoughness=0.001");
        Assert.Equal(64 / 1200.0, r.Body.GetProperty("frictionFactor").GetDouble(), 1e-15);
        Assert.Equal("laminar", r.Body.GetProperty("regime").GetString());
    }

    [Fact]
    public async Task Get_Transitional_WarnsWithStableCode()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=3000&relativeRoughness=0.001");
        Assert.Equal("transitional", r.Body.GetProperty("regime").GetString());
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "transitional-flow");
    }

    [Fact]
    public async Task Get_OutsideColebrookRange_WarnsAndValidityShowsOutOfRange()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=3e8&relativeRoughness=0.07");
        var codes = r.Body.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()).ToArray();
        Assert.Contains("reynolds-above-range", codes);
        Assert.Contains("relative-roughness-above-range", codes);
        Assert.All(r.Body.GetProperty("validity").EnumerateArray(), v => Assert.False(v.GetProperty("inRange").GetBoolean()));
    }

    [Fact]
    public async Task Get_Trace_ListsEachIteration()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=1e6&relativeRoughness=1e-4&trace=true");
        var trace = r.Body.GetProperty("trace").EnumerateArray().ToArray();
        Assert.Equal(r.Body.GetProperty("iterations").GetInt32(), trace.Length);
        Assert.All(trace, t => Assert.Equal("newton", t.GetProperty("kind").GetString()));
    }

    public static TheoryData<string, string> BadQueries => new()
    {
        { "relativeRoughness=0.005", "reynolds" },                     // missing
        { "reynolds=abc&relativeRoughness=0.005", "reynolds" },        // not a number
        { "reynolds=0&relativeRoughness=0.005", "reynolds" },          // zero
        { "reynolds=-5&relativeRoughness=0.005", "reynolds" },         // negative
        { "reynolds=NaN&relativeRoughness=0.005", "reynolds" },        // NaN
        { "reynolds=Infinity&relativeRoughness=0.005", "reynolds" },   // infinite
        { "reynolds=1e309&relativeRoughness=0.005", "reynolds" },      // overflows to infinity
        { "reynolds=1e16&relativeRoughness=0.005", "reynolds" },       // out of range
        { "reynolds=1e5&relativeRoughness=-0.1", "relativeRoughness" },
        { "reynolds=1e5&relativeRoughness=1", "relativeRoughness" },
        { "reynolds=1e5&relativeRoughness=x1", "relativeRoughness" },
        { "reynolds=1e5", "relativeRoughness" },
        { "reynolds=1e5&roughness=0.5&diameter=0.1", "roughness" },
        { "reynolds=1e5&roughness=0.001&diameter=0", "diameter" },
        { "reynolds=1e5&roughness=0.001", "diameter" },
        { "reynolds=1e5&relativeRoughness=0.001&method=moody", "method" },
        { "reynolds=1e5&relativeRoughness=0.001&laminarLimit=50", "laminarLimit" },
        { "reynolds=1e5&relativeRoughness=0.001&trace=maybe", "trace" },
    };

    [Theory]
    [MemberData(nameof(BadQueries))]
    public async Task Get_BadInput_400NamesField(string query, string field) =>
        ProblemAssert.NamesField(await api.GetJson("/v1/friction-factor?" + query), 400, field);

    [Fact]
    public async Task Post_BadInputs_EachFieldNamed()
    {
        var r = await api.PostJson("/v1/friction-factor", new { reynolds = -1.0, relativeRoughness = 2.0, method = "x" });
        ProblemAssert.NamesField(r, 400, "reynolds");
        ProblemAssert.NamesField(r, 400, "relativeRoughness");
        ProblemAssert.NamesField(r, 400, "method");
    }

    public static TheoryData<string, string> BadBodies => new()
    {
        { """{"reynolds":"abc","relativeRoughness":0.001}""", "reynolds" },    // wrong JSON type
        { """{"reynolds":1e5,"relativeRoughnes":0.001}""", "relativeRoughnes" }, // misspelt field
        { """{"reynolds":1e5,"relativeRoughness":""", "relativeRoughness" },     // truncated JSON, broken at this field
        { """{"reynolds":1e5,""", "body" },                                      // truncated JSON
        { """[1,2,3]""", "body" },                                               // not an object
        { """{"reynolds":NaN,"relativeRoughness":0.001}""", "reynolds" },        // NaN is not JSON
        { """{"reynolds":1e400,"relativeRoughness":0.001}""", "reynolds" },      // overflows
        { "", "body" },
    };

    [Theory]
    [MemberData(nameof(BadBodies))]
    public async Task Post_MalformedBody_400NamesField(string body, string field) =>
        ProblemAssert.NamesField(await api.PostRaw("/v1/friction-factor", body, "application/json"), 400, field);

    [Fact]
    public async Task Post_WrongContentType_415Problem()
    {
        var r = await api.PostRaw("/v1/friction-factor", """{"reynolds":1e5}""", "text/plain");
        Assert.Equal(415, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
    }

    [Fact]
    public async Task Get_UnknownRoute_404Problem()
    {
        var r = await api.GetJson("/v1/no-such-calculation");
        Assert.Equal(404, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
    }
}
