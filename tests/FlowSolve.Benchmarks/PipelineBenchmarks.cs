using BenchmarkDotNet.Attributes;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Benchmarks;

/// <summary>
/// One request through the whole middleware pipeline and endpoint, in memory (no sockets, no Kestrel): the liveness
/// probe (the load test's ceiling), the friction-factor GET as JSON, and the same GET as a spreadsheet cell
/// (<c>format=text</c>). The differences are the application's own cost per request, which the load test's ratios
/// carry under the shared cost of the server and the network stack. Request logging at Warning (the benchmark's output
/// would otherwise carry every request's line); the load test measures the default level.
/// </summary>
[MemoryDiagnoser]
public class PipelineBenchmarks
{
    private WebApplicationFactory<global::Program> _factory = null!;
    private HttpClient _client = null!;

    [GlobalSetup]
    public void Setup()
    {
        Environment.SetEnvironmentVariable("FlowSolve__Logging__Level", "Warning");
        _factory = new WebApplicationFactory<global::Program>();
        _client = _factory.CreateClient();
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _client.Dispose();
        _factory.Dispose();
    }

    private async Task<int> Get(string url)
    {
        using var response = await _client.GetAsync(url);
        var body = await response.Content.ReadAsByteArrayAsync();
        return body.Length;
    }

    [Benchmark(Baseline = true)]
    public Task<int> HealthLive() => Get("/health/live");

    [Benchmark]
    public Task<int> FrictionJson() => Get("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005");

    [Benchmark]
    public Task<int> FrictionText() => Get("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&format=text");
}
