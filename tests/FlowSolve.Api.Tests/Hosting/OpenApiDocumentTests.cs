using System.Text.Json;
using System.Text.Json.Nodes;

namespace FlowSolve.Api.Tests.Hosting;

public sealed class OpenApiDocumentTests(ApiFixture api)
{
    private static string CommittedPath
    {
        get
        {
            var dir = new DirectoryInfo(AppContext.BaseDirectory);
            while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "FlowSolve.sln"))) dir = dir.Parent;
            return Path.Combine(dir?.FullName ?? throw new InvalidOperationException("repository root not found"), "openapi", "flowsolve.v1.json");
        }
    }

    private async Task<JsonNode> Generated()
    {
        string text = await api.Client.GetStringAsync("/openapi/v1.json", TestContext.Current.CancellationToken);
        return JsonNode.Parse(text)!;
    }

    /// <summary>Writes the document the way it is committed: indented, LF line ends, final newline.</summary>
    public static string Render(JsonNode node) =>
        node.ToJsonString(new JsonSerializerOptions { WriteIndented = true }).Replace("\r\n", "\n") + "\n";

    [Fact]
    public async Task CommittedDocument_MatchesGenerated()
    {
        string generated = Render(await Generated());
        if (Environment.GetEnvironmentVariable("FLOWSOLVE_UPDATE_OPENAPI") == "1")
            await File.WriteAllTextAsync(CommittedPath, generated, TestContext.Current.CancellationToken);
        Assert.True(File.Exists(CommittedPath), $"{CommittedPath} is missing; run the tests with FLOWSOLVE_UPDATE_OPENAPI=1");
        string committed = (await File.ReadAllTextAsync(CommittedPath, TestContext.Current.CancellationToken)).Replace("\r\n", "\n");
        Assert.True(committed == generated,
            "openapi/flowsolve.v1.json has drifted from the generated document; regenerate it with FLOWSOLVE_UPDATE_OPENAPI=1 dotnet test");
    }

    [Fact]
    public async Task EveryOperation_HasAnExampleAndDescribedFields()
    {
        var doc = await Generated();
        foreach (var (path, item) in doc["paths"]!.AsObject())
        {
            if (path.StartsWith("/health", StringComparison.Ordinal)) continue;
            foreach (var (method, op) in item!.AsObject())
            {
                var parameters = op!["parameters"]?.AsArray() ?? [];
                foreach (var p in parameters)
                    Assert.False(string.IsNullOrWhiteSpace(p!["description"]?.GetValue<string>()), $"{method} {path}: parameter {p["name"]} has no description");
                bool example = parameters.Any(p => p!["example"] is not null)
                    || op["requestBody"]?["content"]?["application/json"]?["example"] is not null;
                Assert.True(example, $"{method} {path} has no example");
                Assert.False(string.IsNullOrWhiteSpace(op["description"]?.GetValue<string>()), $"{method} {path} has no description");
            }
        }
        foreach (var (name, schema) in doc["components"]!["schemas"]!.AsObject())
        {
            if (name.Contains("Problem", StringComparison.Ordinal)) continue;
            foreach (var (prop, s) in schema!["properties"]?.AsObject() ?? [])
                Assert.False(string.IsNullOrWhiteSpace(s!["description"]?.GetValue<string>()), $"{name}.{prop} has no description");
        }
    }

    [Fact]
    public async Task Document_CarriesTheCautions()
    {
        var doc = await Generated();
        string description = doc["info"]!["description"]!.GetValue<string>();
        Assert.Contains("qualified engineer", description);
        Assert.Contains("water hammer", description);
    }
}
