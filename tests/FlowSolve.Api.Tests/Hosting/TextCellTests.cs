using System.Globalization;
using System.Net;
using System.Text.Json;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>
/// A spreadsheet cell's GET (<c>format=text</c>) answered from the calculation's declared row shortcut (the friction
/// factor's, for Reynolds number and relative roughness alone) is the JSON answer's field to the last digit, with the
/// same status and headers, across the whole input range; the options that need the whole answer (strict, select=warnings,
/// sensitivities, trace, a method or laminar limit, roughness and diameter) still see every warning.
/// </summary>
public sealed class TextCellTests(ApiFixture api)
{
    private const string Friction = "/v1/friction-factor";

    private static CancellationToken Cancel => TestContext.Current.CancellationToken;

    private static string Number(double x) => x.ToString("R", CultureInfo.InvariantCulture);

    /// <summary>Reynolds numbers from the bottom of the range (0.001) to its top (1e15) through the laminar limit and the
    /// transition zone, against relative roughness from smooth to 0.999.</summary>
    public static TheoryData<double> Reynolds => [0.001, 1, 500, 1999.9, 2000, 2500, 3999, 4000, 75000, 1e6, 1e8, 1e12, 1e15];

    [Theory]
    [MemberData(nameof(Reynolds))]
    public async Task A_cell_is_the_JSON_answers_field_to_the_last_digit_across_the_range(double reynolds)
    {
        foreach (double relativeRoughness in new[] { 0, 1e-6, 0.005, 0.05, 0.5, 0.999 })
        {
            string query = $"{Friction}?reynolds={Number(reynolds)}&relativeRoughness={Number(relativeRoughness)}";
            var json = await api.GetJson(query);
            Assert.Equal(200, json.Status);
            string field = json.Body.GetProperty("frictionFactor").GetRawText();
            foreach (string select in new[] { "", "&select=frictionFactor", "&select=FRICTIONFACTOR" })
            {
                using var cell = await api.Client.GetAsync(query + "&format=text" + select, Cancel);
                Assert.Equal(HttpStatusCode.OK, cell.StatusCode);
                string text = await cell.Content.ReadAsStringAsync(Cancel);
                Assert.Equal(field, text);
                Assert.Equal("text/plain; charset=utf-8", cell.Content.Headers.ContentType?.ToString());
                Assert.Equal(System.Text.Encoding.UTF8.GetByteCount(text), cell.Content.Headers.ContentLength);
                Assert.NotNull(cell.Headers.ETag);
                Assert.Equal("public, max-age=86400", cell.Headers.CacheControl?.ToString());
                Assert.Equal("nosniff", cell.Headers.GetValues("X-Content-Type-Options").Single());
            }
            // In the turbulent zone the cell's factor satisfies Colebrook-White itself (1939; the form of Moody 1944):
            // 1/sqrt(f) = -2 log10(e/D / 3.7 + 2.51 / (Re sqrt(f))), evaluated here independently of the service.
            if (reynolds >= 4000 && json.Body.GetProperty("method").GetString() == "colebrook-white")
            {
                double f = double.Parse(field, CultureInfo.InvariantCulture);
                double residual = 1 / Math.Sqrt(f) + 2 * Math.Log10(relativeRoughness / 3.7 + 2.51 / (reynolds * Math.Sqrt(f)));
                Assert.True(Math.Abs(residual) * Math.Sqrt(f) < 1e-12, $"Re {reynolds}, e/D {relativeRoughness}: residual {residual}");
            }
        }
    }

    [Theory]
    [InlineData("reynolds=0.0001&relativeRoughness=0.005", "reynolds")]
    [InlineData("reynolds=2e15&relativeRoughness=0.005", "reynolds")]
    [InlineData("reynolds=75000&relativeRoughness=1", "relativeRoughness")]
    [InlineData("reynolds=75000&relativeRoughness=-0.1", "relativeRoughness")]
    [InlineData("reynolds=75000", "relativeRoughness")]
    [InlineData("relativeRoughness=0.005", "reynolds")]
    public async Task Input_outside_the_range_is_the_same_400_line_as_the_full_solve_gives(string query, string field)
    {
        var json = await api.GetJson($"{Friction}?{query}");
        Assert.Equal(400, json.Status);
        Assert.True(json.Body.GetProperty("errors").TryGetProperty(field, out var messages));
        using var cell = await api.Client.GetAsync($"{Friction}?{query}&format=text", Cancel);
        Assert.Equal(HttpStatusCode.BadRequest, cell.StatusCode);
        string line = await cell.Content.ReadAsStringAsync(Cancel);
        Assert.Contains($"{field}: {messages[0].GetString()}", line);
        Assert.Null(cell.Headers.ETag);
    }

    /// <summary>The options and inputs the shortcut does not take go through the full solve; the cell is still the
    /// JSON answer's field (transition-zone inputs, which carry a warning, included).</summary>
    [Theory]
    [InlineData("reynolds=3000&relativeRoughness=0.001&method=haaland")]
    [InlineData("reynolds=75000&relativeRoughness=0.005&laminarLimit=2300")]
    [InlineData("reynolds=75000&roughness=0.00026&diameter=0.3")]
    [InlineData("reynolds=3000&relativeRoughness=0.001&trace=true")]
    [InlineData("reynolds=3000&relativeRoughness=0.001&sensitivities=true")]
    public async Task Requests_the_shortcut_does_not_take_answer_the_JSON_field(string query)
    {
        var json = await api.GetJson($"{Friction}?{query}");
        Assert.Equal(200, json.Status);
        using var cell = await api.Client.GetAsync($"{Friction}?{query}&format=text", Cancel);
        Assert.Equal(HttpStatusCode.OK, cell.StatusCode);
        Assert.Equal(json.Body.GetProperty("frictionFactor").GetRawText(), await cell.Content.ReadAsStringAsync(Cancel));
    }

    [Fact]
    public async Task Warnings_stay_visible_to_a_cell_with_select_and_strict()
    {
        // Re 3000 lies in the transition zone: the answer carries a warning (Churchill 1977 between Re 2000 and 4000).
        const string query = Friction + "?reynolds=3000&relativeRoughness=0.001";
        var json = await api.GetJson(query);
        var codes = json.Body.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()!).ToArray();
        Assert.NotEmpty(codes);

        using var warnings = await api.Client.GetAsync(query + "&format=text&select=warnings", Cancel);
        Assert.Equal(string.Join(",", codes), await warnings.Content.ReadAsStringAsync(Cancel));

        using var strict = await api.Client.GetAsync(query + "&format=text&strict=true", Cancel);
        Assert.Equal(HttpStatusCode.UnprocessableEntity, strict.StatusCode);
        string line = await strict.Content.ReadAsStringAsync(Cancel);
        Assert.All(codes.Distinct(), code => Assert.Contains(code, line));

        // strict=false takes the shortcut and answers the number, as before.
        using var loose = await api.Client.GetAsync(query + "&format=text&strict=false", Cancel);
        Assert.Equal(json.Body.GetProperty("frictionFactor").GetRawText(), await loose.Content.ReadAsStringAsync(Cancel));
    }

    [Fact]
    public async Task A_cell_from_the_shortcut_revalidates_to_304_with_its_tag()
    {
        const string url = Friction + "?reynolds=75000&relativeRoughness=0.005&format=text";
        using var first = await api.Client.GetAsync(url, Cancel);
        using var request = new HttpRequestMessage(HttpMethod.Get, url);
        request.Headers.TryAddWithoutValidation("If-None-Match", first.Headers.ETag!.ToString());
        using var again = await api.Client.SendAsync(request, Cancel);
        Assert.Equal(HttpStatusCode.NotModified, again.StatusCode);
        Assert.Equal(first.Headers.ETag, again.Headers.ETag);
    }
}
