using System.Text.Json;

namespace FlowSolve.Api.Tests.Batch;

public sealed class TextFormatTests(ApiFixture api)
{
    private async Task<(int Status, string? ContentType, string Text)> GetText(string url)
    {
        using var response = await api.Client.GetAsync(url, TestContext.Current.CancellationToken);
        return ((int)response.StatusCode, response.Content.Headers.ContentType?.MediaType,
            await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
    }

    public static TheoryData<string, string> Calculations => new()
    {
        // (query of a calculation, its primary output field)
        { "/v1/friction-factor?reynolds=75000&relativeRoughness=0.005", "frictionFactor" },
        { "/v1/friction-factor?reynolds=3000&relativeRoughness=0.001", "frictionFactor" },
        { "/v1/fluids/water?temperature=37.5", "kinematicViscosity" },
    };

    [Theory]
    [MemberData(nameof(Calculations))]
    public async Task FormatText_EqualsJsonFieldToTheLastDigit(string url, string field)
    {
        var json = await api.GetJson(url);
        var text = await GetText(url + "&format=text");
        Assert.Equal(200, text.Status);
        Assert.Equal("text/plain", text.ContentType);
        Assert.Equal(json.Body.GetProperty(field).GetRawText(), text.Text);
        Assert.Equal(json.Body.GetProperty(field).GetDouble(), double.Parse(text.Text, System.Globalization.CultureInfo.InvariantCulture));
    }

    [Fact]
    public async Task FormatText_SelectReturnsAnotherField()
    {
        const string url = "/v1/friction-factor?reynolds=75000&relativeRoughness=0.005";
        var json = await api.GetJson(url);
        Assert.Equal(json.Body.GetProperty("iterations").GetInt32().ToString(System.Globalization.CultureInfo.InvariantCulture),
            (await GetText(url + "&format=text&select=iterations")).Text);
        Assert.Equal("turbulent", (await GetText(url + "&format=text&select=regime")).Text);
    }

    [Fact]
    public async Task FormatText_UnknownSelect_400Line()
    {
        var r = await GetText("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&format=text&select=nothing");
        Assert.Equal(400, r.Status);
        Assert.StartsWith("error: select:", r.Text);
    }

    [Theory]
    [InlineData("/v1/friction-factor?reynolds=-1&relativeRoughness=0.005&format=text", "reynolds")]
    [InlineData("/v1/friction-factor?reynolds=abc&relativeRoughness=0.005&format=text", "reynolds")]
    [InlineData("/v1/fluids/water?temperature=150&format=text", "temperature")]
    public async Task FormatText_Error_IsOneReadableLineWithStatus(string url, string field)
    {
        var r = await GetText(url);
        Assert.Equal(400, r.Status);
        Assert.Equal("text/plain", r.ContentType);
        Assert.StartsWith($"error: {field}:", r.Text);
        Assert.DoesNotContain('\n', r.Text);
    }

    [Fact]
    public async Task FormatUnknown_400NamesFormat() =>
        ProblemAssert.NamesField(await api.GetJson("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&format=xml"), 400, "format");
}
