using System.Net;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>
/// GET calculation answers (JSON and text) carry a strong ETag of the canonical request and the build, and
/// Cache-Control: public, max-age=N; If-None-Match with the tag answers 304 with no body; POST answers, problems and
/// sheets carry neither (RFC 9110 sections 8.8.3 and 13.1.2; RFC 9111 section 5.2.2.9 for public, 5.2.2.1 for max-age).
/// </summary>
public sealed class AnswerCacheTests(ApiFixture api)
{
    private const string Friction = "/v1/friction-factor?reynolds=75000&relativeRoughness=0.005";

    private static CancellationToken Cancel => TestContext.Current.CancellationToken;

    private async Task<HttpResponseMessage> Get(string url, string? ifNoneMatch = null, HttpClient? client = null)
    {
        using var request = new HttpRequestMessage(HttpMethod.Get, url);
        if (ifNoneMatch is not null) request.Headers.TryAddWithoutValidation("If-None-Match", ifNoneMatch);
        return await (client ?? api.Client).SendAsync(request, Cancel);
    }

    private static string? Tag(HttpResponseMessage r) => r.Headers.ETag?.ToString();

    [Theory]
    [InlineData(Friction)]
    [InlineData(Friction + "&format=text")]
    [InlineData(Friction + "&format=text&select=warnings")]
    [InlineData("/v1/channels/normal-depth?shape=trapezoidal&bottomWidth=3&sideSlope=2&manningN=0.025&slope=0.001&flow=10")]
    public async Task A_GET_answer_carries_a_strong_tag_and_public_max_age_and_revalidates_to_304(string url)
    {
        using var first = await Get(url);
        Assert.Equal(HttpStatusCode.OK, first.StatusCode);
        string? tag = Tag(first);
        Assert.NotNull(tag);
        Assert.False(first.Headers.ETag!.IsWeak);
        Assert.Equal("public, max-age=86400", first.Headers.CacheControl?.ToString());

        using var again = await Get(url, tag);
        Assert.Equal(HttpStatusCode.NotModified, again.StatusCode);
        Assert.Empty(await again.Content.ReadAsByteArrayAsync(Cancel));
        Assert.Equal(tag, Tag(again));
        Assert.Equal("public, max-age=86400", again.Headers.CacheControl?.ToString());

        // The same request asked again answers the same tag (deterministic), and a list or a weak form matches too.
        using var third = await Get(url, "\"other\", W/" + tag);
        Assert.Equal(HttpStatusCode.NotModified, third.StatusCode);
        using var star = await Get(url, "*");
        Assert.Equal(HttpStatusCode.NotModified, star.StatusCode);
    }

    [Fact]
    public async Task The_tag_names_the_request_its_format_and_nothing_else()
    {
        using var a = await Get(Friction);
        using var reordered = await Get("/v1/friction-factor?relativeRoughness=0.005&reynolds=75000");
        using var otherInput = await Get("/v1/friction-factor?reynolds=75001&relativeRoughness=0.005");
        using var text = await Get(Friction + "&format=text");
        Assert.Equal(Tag(a), Tag(reordered));
        Assert.NotEqual(Tag(a), Tag(otherInput));
        Assert.NotEqual(Tag(a), Tag(text));

        // A tag for another request does not stand for this answer.
        using var stale = await Get("/v1/friction-factor?reynolds=75001&relativeRoughness=0.005", Tag(a));
        Assert.Equal(HttpStatusCode.OK, stale.StatusCode);
        Assert.Equal(Tag(otherInput), Tag(stale));
    }

    [Fact]
    public async Task Posts_problems_and_sheets_are_not_cached()
    {
        using var content = new StringContent("""{"reynolds": 75000, "relativeRoughness": 0.005}""", System.Text.Encoding.UTF8, "application/json");
        using var post = await api.Client.PostAsync("/v1/friction-factor", content, Cancel);
        Assert.Equal(HttpStatusCode.OK, post.StatusCode);
        Assert.Null(post.Headers.ETag);
        Assert.Null(post.Headers.CacheControl);

        using var bad = await Get("/v1/friction-factor?reynolds=0,5&relativeRoughness=0.005");
        Assert.Equal(HttpStatusCode.BadRequest, bad.StatusCode);
        Assert.Null(bad.Headers.ETag);

        using var strict = await Get("/v1/pipes/head-loss?flow=80&diameter=0.3&length=100&roughness=0.00026&strict=true");
        Assert.Equal(HttpStatusCode.UnprocessableEntity, strict.StatusCode);
        Assert.Null(strict.Headers.ETag);

        using var sheet = await Get(Friction + "&format=html");
        Assert.Equal(HttpStatusCode.OK, sheet.StatusCode);
        Assert.Null(sheet.Headers.ETag);
    }

    [Fact]
    public async Task A_new_build_or_generation_changes_the_tag_and_max_age_is_configurable()
    {
        using var first = await Get(Friction);
        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b =>
        {
            b.UseSetting("FlowSolve:Cache:Generation", "after-a-table-update");
            b.UseSetting("FlowSolve:Cache:MaxAgeSeconds", "600");
        });
        using var client = factory.CreateClient();
        using var second = await Get(Friction, Tag(first), client);
        Assert.Equal(HttpStatusCode.OK, second.StatusCode);
        Assert.NotEqual(Tag(first), Tag(second));
        Assert.Equal("public, max-age=600", second.Headers.CacheControl?.ToString());

        // The build itself: two builds' identities give two tags for one request.
        var request = new DefaultHttpContext().Request;
        request.Path = "/v1/friction-factor";
        request.QueryString = new QueryString("?reynolds=75000&relativeRoughness=0.005");
        Assert.NotEqual(new AnswerCache("build-1/", 60).Tag(request), new AnswerCache("build-2/", 60).Tag(request));
        Assert.Equal(new AnswerCache("build-1/", 60).Tag(request), new AnswerCache("build-1/", 999).Tag(request));
        // The service's build identity is the module version ids of its assemblies, which every compilation renews.
        Assert.Contains(typeof(AnswerCache).Assembly.ManifestModule.ModuleVersionId.ToString("N"), AnswerCache.BuildOf(typeof(AnswerCache)));
    }

    /// <summary>The tag is the quoted lower-case hexadecimal XXH128 (System.IO.Hashing) of the canonical request, built
    /// here on its own from its definition: the build, the path, then every parameter as name=value, names lower-cased,
    /// sorted by name (case-insensitive) and value, one per line. Queries with repeats, empty and non-ASCII values, more
    /// pairs than a cell has, and a value long enough to leave the stack buffer.</summary>
    [Theory]
    [InlineData("?reynolds=75000&relativeRoughness=0.005&format=text")]
    [InlineData("?relativeRoughness=0.005&Reynolds=75000&format=text&select=frictionFactor")]
    [InlineData("?b=2&a=1&a=0&c=&d")]
    [InlineData("?name=%C3%A9t%C3%A9&Z=%E2%82%AC")]
    [InlineData("?p01=1&p02=2&p03=3&p04=4&p05=5&p06=6&p07=7&p08=8&p09=9&p10=10&p11=11&p12=12&p13=13&p14=14&p15=15&p16=16&p17=17&P18=18&p19=19&a=0")]
    [InlineData("LONG")]
    public void The_tag_is_the_XXH128_of_the_canonical_request(string query)
    {
        if (query == "LONG") query = "?select=" + new string('x', 3000) + "&format=text";
        const string build = "build-1/generation";
        var request = new DefaultHttpContext().Request;
        request.Path = "/v1/friction-factor";
        request.QueryString = new QueryString(query);
        var pairs = new List<(string Name, string Value)>();
        foreach (var (name, values) in Microsoft.AspNetCore.WebUtilities.QueryHelpers.ParseQuery(query))
        {
            if (values.Count == 0) pairs.Add((name, ""));
            foreach (var value in values) pairs.Add((name, value ?? ""));
        }
        pairs.Sort((a, b) => string.Compare(a.Name, b.Name, StringComparison.OrdinalIgnoreCase) is var c && c != 0 ? c : string.CompareOrdinal(a.Value, b.Value));
        var canonical = new System.Text.StringBuilder(build).Append('\n').Append("/v1/friction-factor").Append('\n');
        foreach (var (name, value) in pairs) canonical.Append(name.ToLowerInvariant()).Append('=').Append(value).Append('\n');
        var hash = System.IO.Hashing.XxHash128.Hash(System.Text.Encoding.UTF8.GetBytes(canonical.ToString()));
        // XxHash128.Hash gives the big-endian bytes of the 128-bit value: their hexadecimal is the value's, most significant first.
        string expected = "\"" + Convert.ToHexStringLower(hash) + "\"";
        Assert.Equal(expected, new AnswerCache(build, 60).Tag(request));
    }
}
