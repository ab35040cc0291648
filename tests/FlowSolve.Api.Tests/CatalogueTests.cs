using System.Text.Json;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Tests;

/// <summary>
/// Every calculation declared in <see cref="Catalogue"/> is complete: it has a description and at least one example,
/// each example answers 200 through the service, its route is in the README's table and in a reference page under
/// docs/, a test file of its own area exercises the route, and the routes the service maps are exactly the catalogue's
/// (nothing mapped beside it). Declaring a calculation without these fails here; DEVELOPERS.md gives the checklist.
/// </summary>
public sealed class CatalogueTests(ApiFixture api)
{
    private static string Root => Samples.LiveService.RepositoryRoot;

    public static TheoryData<string> Names()
    {
        var names = new TheoryData<string>();
        foreach (var c in Catalogue.All) names.Add(c.Info.Name);
        return names;
    }

    private static ICalculation Find(string name) => Catalogue.All.Single(c => c.Info.Name == name);

    [Fact]
    public void Names_are_unique_and_operation_names_too()
    {
        Assert.Equal(Catalogue.All.Count, Catalogue.All.Select(c => c.Info.Name).Distinct().Count());
        Assert.Equal(Catalogue.All.Count, Catalogue.All.Select(c => c.Info.OperationName).Distinct().Count());
    }

    [Theory]
    [MemberData(nameof(Names))]
    public void It_is_described_and_has_an_example(string name)
    {
        var c = Find(name);
        Assert.False(string.IsNullOrWhiteSpace(c.Info.Summary));
        Assert.True(c.Info.Description.Length >= 200, $"{name}: the OpenAPI description is {c.Info.Description.Length} characters; say what it computes, by which method and source, in which units");
        Assert.True(c.QueryExample is not null || c.BodyExample is not null, $"{name}: no example (a GET query or a POST body)");
        Assert.False(string.IsNullOrWhiteSpace(c.Info.PrimaryOutput));
        // The primary output is a field of the answer (text cells read it).
        string first = c.Info.PrimaryOutput.Split('.')[0];
        Assert.Contains(c.ResponseType.GetProperties(), p => JsonNamingPolicy.CamelCase.ConvertName(p.Name) == first);
    }

    [Theory]
    [MemberData(nameof(Names))]
    public async Task Its_examples_answer_200_through_the_service(string name)
    {
        var c = Find(name);
        if (c.QueryExample is { } query)
        {
            string url = "/v1/" + name + "?" + string.Join("&", query.Select(p => p.Name + "=" + Uri.EscapeDataString(p.Value)));
            var r = await api.GetJson(url);
            Assert.True(r.Status == 200, $"GET {url}: {r.Status} {r.Body}");
        }
        if (c.BodyExample is { } body)
        {
            var r = await api.PostRaw("/v1/" + name, JsonSerializer.Serialize(body, c.RequestType, JsonSetup.Options), "application/json");
            Assert.True(r.Status == 200, $"POST /v1/{name}: {r.Status} {r.Body}");
        }
    }

    [Theory]
    [MemberData(nameof(Names))]
    public void Its_route_is_documented_in_the_readme_and_a_reference_page(string name)
    {
        string route = "/v1/" + name;
        string readme = File.ReadAllText(Path.Combine(Root, "README.md"));
        Assert.True(readme.Contains(route + "`", StringComparison.Ordinal) || readme.Contains(route + " ", StringComparison.Ordinal)
            || readme.Contains(route + ",", StringComparison.Ordinal), $"README.md's table does not name {route}");
        var pages = Directory.EnumerateFiles(Path.Combine(Root, "docs"), "*.md")
            .Where(f => File.ReadAllText(f).Contains(route, StringComparison.Ordinal)).ToArray();
        Assert.True(pages.Length > 0, $"no page under docs/ documents {route}");
    }

    [Theory]
    [MemberData(nameof(Names))]
    public void Its_area_has_tests_that_call_it(string name)
    {
        string route = "/v1/" + name;
        // Tests of its own: not counting the generic suites that walk every calculation of the catalogue.
        string[] generic = ["Hosting", "Reliability", "OpenApi", "Docs"];
        string tests = Path.Combine(Root, "tests", "FlowSolve.Api.Tests");
        var files = Directory.EnumerateFiles(tests, "*.cs", SearchOption.AllDirectories)
            .Where(f => !f.Contains(Path.DirectorySeparatorChar + "obj" + Path.DirectorySeparatorChar)
                        && !f.Contains(Path.DirectorySeparatorChar + "bin" + Path.DirectorySeparatorChar))
            .Where(f => !generic.Any(g => Path.GetRelativePath(tests, f).StartsWith(g + Path.DirectorySeparatorChar, StringComparison.Ordinal)))
            .Where(f => Path.GetFileName(f) != nameof(CatalogueTests) + ".cs")
            .Where(f => File.ReadAllText(f).Contains(route, StringComparison.Ordinal))
            .ToArray();
        Assert.True(files.Length > 0, $"no test file of its own calls {route}");
    }

    [Fact]
    public async Task The_service_maps_exactly_the_catalogue_calculations()
    {
        // Every calculation route in the served OpenAPI document (operations that take format) is a catalogue entry's.
        var doc = await api.GetJson("/openapi/v1.json");
        var served = new SortedSet<string>(StringComparer.Ordinal);
        foreach (var path in doc.Body.GetProperty("paths").EnumerateObject())
            foreach (var op in path.Value.EnumerateObject())
                if (op.Value.TryGetProperty("parameters", out var ps) && ps.EnumerateArray().Any(p => p.GetProperty("name").GetString() == "format"))
                    served.Add(path.Name + " " + op.Name);
        var declared = new SortedSet<string>(StringComparer.Ordinal);
        foreach (var c in Catalogue.All)
        {
            if (c.QueryExample is not null) declared.Add("/v1/" + c.Info.Name + " get");
            if (c.BodyExample is not null) declared.Add("/v1/" + c.Info.Name + " post");
        }
        Assert.Equal(declared, served);
    }
}
