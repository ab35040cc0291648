using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.AspNetCore.Mvc.Testing;

[assembly: AssemblyFixture(typeof(FlowSolve.Api.Tests.ApiFixture))]

namespace FlowSolve.Api.Tests;

/// <summary>One in-memory FlowSolve service shared by every API test.</summary>
public sealed class ApiFixture : IDisposable
{
    private readonly WebApplicationFactory<Program> _factory = new();

    public HttpClient Client { get; }

    public ApiFixture() => Client = _factory.CreateClient();

    public void Dispose()
    {
        Client.Dispose();
        _factory.Dispose();
    }

    public async Task<(int Status, string? ContentType, JsonElement Body)> GetJson(string url)
    {
        using var response = await Client.GetAsync(url, TestContext.Current.CancellationToken);
        return await Read(response);
    }

    public async Task<(int Status, string? ContentType, JsonElement Body)> PostJson(string url, object body)
    {
        using var response = await Client.PostAsJsonAsync(url, body, TestContext.Current.CancellationToken);
        return await Read(response);
    }

    public async Task<(int Status, string? ContentType, JsonElement Body)> PostRaw(string url, string body, string contentType)
    {
        using var content = new StringContent(body);
        content.Headers.ContentType = new System.Net.Http.Headers.MediaTypeHeaderValue(contentType);
        using var response = await Client.PostAsync(url, content, TestContext.Current.CancellationToken);
        return await Read(response);
    }

    private static async Task<(int, string?, JsonElement)> Read(HttpResponseMessage response)
    {
        string text = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        var body = text.Length == 0 ? default : JsonDocument.Parse(text).RootElement.Clone();
        return ((int)response.StatusCode, response.Content.Headers.ContentType?.MediaType, body);
    }
}

public static class ProblemAssert
{
    /// <summary>Asserts an RFC 9457 problem with the given status whose errors map names the field.</summary>
    public static void NamesField((int Status, string? ContentType, JsonElement Body) r, int status, string field)
    {
        Assert.Equal(status, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
        Assert.Equal(status, r.Body.GetProperty("status").GetInt32());
        Assert.True(r.Body.TryGetProperty("errors", out var errors), "problem has no errors map");
        Assert.True(errors.TryGetProperty(field, out var messages), $"errors does not name '{field}': {errors}");
        Assert.True(messages.GetArrayLength() > 0);
        Assert.DoesNotContain("   at ", r.Body.ToString()); // no stack trace
    }
}
