using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>Limits, API key, CORS, headers and metrics, each on a service configured for the check.</summary>
public sealed class ProtectionTests(ApiFixture api)
{
    private static WebApplicationFactory<Program> With(params (string Key, string Value)[] settings) =>
        new WebApplicationFactory<Program>().WithWebHostBuilder(b =>
        {
            foreach (var (k, v) in settings) b.UseSetting(k, v);
        });

    private static CancellationToken Ct => TestContext.Current.CancellationToken;

    [Fact]
    public async Task ApiKey_WhenConfigured_RequiredOnCalculationsButNotOnHealth()
    {
        using var factory = With(("FlowSolve:ApiKey", "lab-key-7"));
        using var client = factory.CreateClient();
        using var missing = await client.GetAsync("/v1/friction-factor?reynolds=1e5&relativeRoughness=0", Ct);
        Assert.Equal(HttpStatusCode.Unauthorized, missing.StatusCode);
        Assert.Equal("application/problem+json", missing.Content.Headers.ContentType?.MediaType);
        Assert.Contains("apiKey", await missing.Content.ReadAsStringAsync(Ct));

        using var request = new HttpRequestMessage(HttpMethod.Get, "/v1/friction-factor?reynolds=1e5&relativeRoughness=0");
        request.Headers.Add("X-Api-Key", "lab-key-7");
        using var ok = await client.SendAsync(request, Ct);
        Assert.Equal(HttpStatusCode.OK, ok.StatusCode);

        using var health = await client.GetAsync("/health/ready", Ct);
        Assert.Equal(HttpStatusCode.OK, health.StatusCode);
    }

    [Fact]
    public async Task RateLimit_WhenConfigured_Answers429NamingTheLimit()
    {
        using var factory = With(("FlowSolve:RateLimit:PermitsPerMinute", "3"));
        using var client = factory.CreateClient();
        var statuses = new List<HttpStatusCode>();
        for (int i = 0; i < 5; i++)
        {
            using var r = await client.GetAsync("/v1/friction-factor?reynolds=1e5&relativeRoughness=0", Ct);
            statuses.Add(r.StatusCode);
            if (r.StatusCode == HttpStatusCode.TooManyRequests)
            {
                Assert.Equal("application/problem+json", r.Content.Headers.ContentType?.MediaType);
                Assert.Contains("permitsPerMinute", await r.Content.ReadAsStringAsync(Ct));
            }
        }
        Assert.Equal([HttpStatusCode.OK, HttpStatusCode.OK, HttpStatusCode.OK, HttpStatusCode.TooManyRequests, HttpStatusCode.TooManyRequests], statuses);
        using var health = await client.GetAsync("/health/live", Ct);
        Assert.Equal(HttpStatusCode.OK, health.StatusCode); // health is never rate limited
    }

    [Fact]
    public async Task RateLimit_OffByDefault()
    {
        for (int i = 0; i < 30; i++)
        {
            using var r = await api.Client.GetAsync("/v1/friction-factor?reynolds=1e5&relativeRoughness=0", Ct);
            Assert.Equal(HttpStatusCode.OK, r.StatusCode);
        }
    }

    [Fact]
    public async Task BatchRows_AboveLimit_413NamingTheLimit()
    {
        using var factory = With(("FlowSolve:Limits:BatchRows", "3"));
        using var client = factory.CreateClient();
        var rows = Enumerable.Range(0, 4).Select(i => new { reynolds = 1e5 + i, relativeRoughness = 0.0 });
        using var r = await client.PostAsJsonAsync("/v1/batch/friction-factor", rows, Ct);
        Assert.Equal(HttpStatusCode.RequestEntityTooLarge, r.StatusCode);
        Assert.Contains("batchRows", await r.Content.ReadAsStringAsync(Ct));
    }

    [Fact]
    public async Task TimeBudget_LongBatchIsCutOffWithAClearRow()
    {
        const int rows = 400_000;
        using var factory = With(("FlowSolve:Limits:RequestTimeoutSeconds", "0.3"), ("FlowSolve:Limits:BatchRows", $"{rows}"));
        using var client = factory.CreateClient();
        // 400 000 rows take well over the budget even on two quiet cores (about a microsecond a row each); the budget
        // stops them, and the answer says where.
        var sb = new StringBuilder("reynolds,relativeRoughness\n");
        for (int i = 0; i < rows; i++) sb.Append(4000 + i * 37).Append(",0.0001\n");
        using var content = new StringContent(sb.ToString(), Encoding.UTF8, "text/csv");
        using var r = await client.PostAsync("/v1/batch/friction-factor", content, Ct);
        string text = await r.Content.ReadAsStringAsync(Ct);
        if (r.StatusCode == HttpStatusCode.ServiceUnavailable)
        {
            Assert.Contains("requestTimeoutSeconds", text); // stopped before the first row was written
            return;
        }
        var lines = text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        Assert.True(lines.Length < rows + 1, "the batch was not cut off");
        Assert.Contains(",503,", lines[^1]);
        Assert.Contains("time budget", lines[^1]);
    }

    [Fact]
    public async Task BodyLimit_413()
    {
        using var factory = With(("FlowSolve:Limits:MaxRequestBodyBytes", "1000"));
        using var client = factory.CreateClient();
        var big = "[" + string.Join(",", Enumerable.Repeat("""{"reynolds":100000,"relativeRoughness":0}""", 100)) + "]";
        using var content = new StringContent(big, Encoding.UTF8, "application/json");
        using var r = await client.PostAsync("/v1/batch/friction-factor", content, Ct);
        Assert.Equal(HttpStatusCode.RequestEntityTooLarge, r.StatusCode);
        Assert.Equal("application/problem+json", r.Content.Headers.ContentType?.MediaType);
    }

    [Fact]
    public async Task Cors_ConfiguredOrigin_IsAllowedOthersAreNot()
    {
        using var factory = With(("FlowSolve:Cors:Origins:0", "https://calc.example"));
        using var client = factory.CreateClient();
        foreach (var (origin, allowed) in new[] { ("https://calc.example", true), ("https://elsewhere.example", false) })
        {
            using var request = new HttpRequestMessage(HttpMethod.Get, "/v1/friction-factor?reynolds=1e5&relativeRoughness=0");
            request.Headers.Add("Origin", origin);
            using var r = await client.SendAsync(request, Ct);
            Assert.Equal(allowed, r.Headers.Contains("Access-Control-Allow-Origin"));
        }
    }

    [Fact]
    public async Task SecurityHeaders_OnEveryAnswer()
    {
        using var r = await api.Client.GetAsync("/v1/friction-factor?reynolds=abc", Ct);
        Assert.Equal("nosniff", r.Headers.GetValues("X-Content-Type-Options").Single());
        Assert.Equal("DENY", r.Headers.GetValues("X-Frame-Options").Single());
        Assert.Contains("default-src 'none'", r.Headers.GetValues("Content-Security-Policy").Single());
        Assert.False(r.Headers.Contains("Server"));
    }

    [Fact]
    public async Task Metrics_ExposeRequestsAndSolverIterationsInPrometheusFormat()
    {
        using (await api.Client.GetAsync("/v1/friction-factor?reynolds=2e5&relativeRoughness=1e-4", Ct)) { }
        string text = await api.Client.GetStringAsync("/metrics", Ct);
        Assert.Contains("http_request_duration_seconds_bucket", text);
        Assert.Contains("flowsolve_solver_iterations_bucket{calculation=\"friction-factor\"", text);
        Assert.Contains("# TYPE flowsolve_solver_iterations histogram", text);
    }
}
