using System.Net;
using System.Text.Json;
using System.Text.Json.Nodes;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Api.Tests.OpenApi;

/// <summary>
/// What an OpenAPI linter (openapi/lint.sh runs Redocly CLI's recommended rules in CI) asks of the document, checked on
/// the served document here so a regression shows in the test run too; and the document's claims (the optional API key,
/// the server, the query examples) checked against the service's own behaviour.
/// </summary>
public sealed class DocumentRulesTests(ApiFixture api)
{
    private static CancellationToken Ct => TestContext.Current.CancellationToken;

    private async Task<JsonNode> Served() => JsonNode.Parse(await api.Client.GetStringAsync("/openapi/v1.json", Ct))!;

    /// <summary>Every JSON object in the document with its JSON pointer.</summary>
    private static IEnumerable<(string Pointer, JsonObject Node)> Objects(JsonNode? node, string pointer)
    {
        if (node is JsonObject o)
        {
            yield return (pointer, o);
            foreach (var (key, child) in o)
                foreach (var x in Objects(child, pointer + "/" + key.Replace("~", "~0").Replace("/", "~1"))) yield return x;
        }
        else if (node is JsonArray a)
        {
            for (int i = 0; i < a.Count; i++)
                foreach (var x in Objects(a[i], pointer + "/" + i)) yield return x;
        }
    }

    private static JsonNode? Resolve(JsonNode doc, string reference)
    {
        JsonNode? node = doc;
        foreach (var segment in reference.TrimStart('#').Split('/', StringSplitOptions.RemoveEmptyEntries))
            node = node?[segment.Replace("~1", "/").Replace("~0", "~")];
        return node;
    }

    [Fact]
    public async Task SchemaNames_CarryNoDtoSuffix_AndEveryReferenceResolves()
    {
        var doc = await Served();
        var names = doc["components"]!["schemas"]!.AsObject().Select(p => p.Key).ToList();
        Assert.NotEmpty(names);
        Assert.All(names, n => Assert.False(n.EndsWith("Dto", StringComparison.Ordinal), $"schema {n} keeps the C# suffix Dto"));

        var references = Objects(doc, "#").Where(x => x.Node["$ref"] is JsonValue).ToList();
        Assert.NotEmpty(references);
        foreach (var (pointer, node) in references)
        {
            string target = node["$ref"]!.GetValue<string>();
            Assert.True(Resolve(doc, target) is JsonObject, $"{pointer}: $ref {target} does not resolve");
        }
    }

    /// <summary>
    /// OpenAPI 3.0 lets nullable add null only to a type given beside it, so a bare nullable (what Swashbuckle writes
    /// beside a wrapped reference) says nothing and is refused by the linter.
    /// </summary>
    [Fact]
    public async Task Nullable_AlwaysStandsBesideAType()
    {
        var doc = await Served();
        var nullable = Objects(doc, "#").Where(x => x.Node["nullable"] is JsonValue v && v.GetValueKind() == JsonValueKind.True).ToList();
        Assert.NotEmpty(nullable);
        foreach (var (pointer, node) in nullable)
            Assert.True(node["type"] is JsonValue, $"{pointer}: nullable without type");
        Assert.Contains(Objects(doc, "#"), x => x.Node["allOf"] is JsonArray { Count: 1 } && x.Node["description"] is not null);
    }

    [Fact]
    public async Task ParameterExamples_HaveTheirSchemasType()
    {
        var doc = await Served();
        var parameters = Objects(doc["paths"], "#/paths").Where(x => x.Node["in"] is JsonValue && x.Node["example"] is not null).ToList();
        Assert.NotEmpty(parameters);
        foreach (var (pointer, p) in parameters)
        {
            string? type = p["schema"]?["type"]?.GetValue<string>();
            var kind = p["example"]!.GetValueKind();
            bool fits = type switch
            {
                "string" => kind == JsonValueKind.String,
                "number" or "integer" => kind == JsonValueKind.Number,
                "boolean" => kind is JsonValueKind.True or JsonValueKind.False,
                _ => false,
            };
            Assert.True(fits, $"{pointer}: example of kind {kind} for schema type {type ?? "(none)"}");
        }
    }

    /// <summary>Each GET operation's query examples, sent as the documentation UI would send them, are a valid request.</summary>
    [Fact]
    public async Task QueryExamples_SentAsDocumented_AnswerOk()
    {
        var doc = await Served();
        int sent = 0;
        foreach (var (path, item) in doc["paths"]!.AsObject())
        {
            if (item!["get"] is not JsonObject get || path.Contains('{')) continue;
            var query = (get["parameters"]?.AsArray() ?? [])
                .Where(p => p!["in"]?.GetValue<string>() == "query" && p["example"] is not null)
                .Select(p => Uri.EscapeDataString(p!["name"]!.GetValue<string>()) + "=" + Uri.EscapeDataString(p["example"] switch
                {
                    JsonValue v when v.GetValueKind() == JsonValueKind.String => v.GetValue<string>(),
                    var v => v!.ToJsonString(),
                }));
            string url = path + "?" + string.Join("&", query);
            using var response = await api.Client.GetAsync(url, Ct);
            Assert.True(response.StatusCode == HttpStatusCode.OK, $"GET {url}: {(int)response.StatusCode} {await response.Content.ReadAsStringAsync(Ct)}");
            sent++;
        }
        Assert.True(sent > 0);
    }

    [Fact]
    public async Task Servers_RelativeRoot_ResolvesToTheHostServingTheDocument()
    {
        var doc = await Served();
        string url = doc["servers"]!.AsArray().Single()!["url"]!.GetValue<string>();
        var documentUri = new Uri(api.Client.BaseAddress!, "/openapi/v1.json");
        Assert.False(Uri.IsWellFormedUriString(url, UriKind.Absolute), $"server {url} is tied to one host");
        Assert.Equal(new Uri(documentUri, "/"), new Uri(documentUri, url));
    }

    /// <summary>
    /// The declared scheme is the service's check: with FlowSolve:ApiKey set, a calculation without the header the
    /// document names answers 401 and with it 200; without the setting no key is needed, which the empty requirement
    /// beside the key's says.
    /// </summary>
    [Fact]
    public async Task ApiKeyScheme_DeclaredOptional_IsTheHeaderTheServiceChecks()
    {
        var doc = await Served();
        var (schemeName, scheme) = doc["components"]!["securitySchemes"]!.AsObject().Single(s => s.Value!["type"]!.GetValue<string>() == "apiKey");
        Assert.Equal("header", scheme!["in"]!.GetValue<string>());
        string header = scheme["name"]!.GetValue<string>();

        var requirements = doc["security"]!.AsArray().Select(r => r!.AsObject()).ToList();
        Assert.Contains(requirements, r => r.Count == 0);
        Assert.Contains(requirements, r => r.Count == 1 && r.ContainsKey(schemeName));

        const string url = "/v1/friction-factor?reynolds=1e5&relativeRoughness=0";
        using (var open = await api.Client.GetAsync(url, Ct)) Assert.Equal(HttpStatusCode.OK, open.StatusCode);

        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b => b.UseSetting("FlowSolve:ApiKey", "bench-key-31"));
        using var client = factory.CreateClient();
        using (var missing = await client.GetAsync(url, Ct)) Assert.Equal(HttpStatusCode.Unauthorized, missing.StatusCode);
        using var request = new HttpRequestMessage(HttpMethod.Get, url);
        request.Headers.Add(header, "bench-key-31");
        using var ok = await client.SendAsync(request, Ct);
        Assert.Equal(HttpStatusCode.OK, ok.StatusCode);
    }
}
