using System.Diagnostics;
using System.Net.Http.Headers;
using System.Text;
using System.Text.Json.Nodes;
using FlowSolve.Api.Tests.Samples;

namespace FlowSolve.Api.Tests.Networks;

/// <summary>
/// The built service as a child process under a 384 MiB GC heap (DOTNET_GCHeapHardLimit=0x18000000: what .NET takes
/// under the manifests' 512 Mi container limit), sent four large network requests at once. Before the answer was
/// bounded, four 9 661-pipe grids with 24 load cases (56 MB answers) made three of them answer 500 (OutOfMemory).
/// </summary>
public sealed class NetworkMemoryTests
{
    [Fact]
    public async Task Solve_FourLargeNetworksAtOnceUnder384MiBHeap_AnswerWithoutServerErrors()
    {
        string dll = Path.Combine(AppContext.BaseDirectory, "FlowSolve.Api.dll");
        Assert.True(File.Exists(dll), $"{dll} is missing");
        string baseUrl = $"http://127.0.0.1:{LiveService.FreePort()}";
        var start = new ProcessStartInfo("dotnet") { WorkingDirectory = AppContext.BaseDirectory, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { dll, "--urls", baseUrl }) start.ArgumentList.Add(a);
        start.Environment["DOTNET_ENVIRONMENT"] = "Production";
        start.Environment["ASPNETCORE_ENVIRONMENT"] = "Production";
        start.Environment["DOTNET_GCHeapHardLimit"] = "0x18000000";
        // Memory is under test, not time: the machine may be shared, so the time budget is not allowed to cut in.
        start.Environment["FlowSolve__Limits__RequestTimeoutSeconds"] = "600";
        var log = new StringBuilder();
        using var process = Process.Start(start)!;
        process.OutputDataReceived += (_, e) => { lock (log) log.AppendLine(e.Data); };
        process.ErrorDataReceived += (_, e) => { lock (log) log.AppendLine(e.Data); };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        using var client = new HttpClient { Timeout = TimeSpan.FromMinutes(10) };
        try
        {
            var deadline = DateTime.UtcNow.AddSeconds(60);
            while (true)
            {
                Assert.False(process.HasExited, $"the service exited:\n{log}");
                try
                {
                    using var ready = await client.GetAsync(baseUrl + "/health/ready", TestContext.Current.CancellationToken);
                    if (ready.IsSuccessStatusCode) break;
                }
                catch (HttpRequestException) { }
                Assert.True(DateTime.UtcNow < deadline, $"the service did not become ready:\n{log}");
                await Task.Delay(250, TestContext.Current.CancellationToken);
            }
            // Two grids answered in full just under the default bound (14 562 rows x 6 cases = 87 372 of 100 000) and two
            // with all 24 load cases as summaries: the largest answers and the longest solves one request may ask for.
            string full = NetworkEdgeCaseEndpointsTests.Grid(70, 6).ToJsonString();
            string summary = NetworkEdgeCaseEndpointsTests.Grid(70, 24, new JsonObject { ["detail"] = "summary" }).ToJsonString();
            async Task<(int Status, long Length, string Head)> Send(string body)
            {
                using var content = new StringContent(body, Encoding.UTF8);
                content.Headers.ContentType = new MediaTypeHeaderValue("application/json");
                using var response = await client.PostAsync(baseUrl + "/v1/networks/solve", content, TestContext.Current.CancellationToken);
                byte[] bytes = await response.Content.ReadAsByteArrayAsync(TestContext.Current.CancellationToken);
                // A problem is kept whole; of a 200, the start is enough to report.
                int shown = response.IsSuccessStatusCode ? Math.Min(bytes.Length, 400) : bytes.Length;
                return ((int)response.StatusCode, bytes.LongLength, Encoding.UTF8.GetString(bytes, 0, shown));
            }
            var answers = await Task.WhenAll(Send(full), Send(summary), Send(full), Send(summary));

            Assert.All(answers, a => Assert.True(a.Status == 200, $"HTTP {a.Status}: {a.Head}\n{log}"));
            Assert.All(answers, a => Assert.True(a.Length < 20_000_000, $"answer of {a.Length} bytes"));
            // The request that was 56 MB before is refused before it is solved, with the limit named, not a 500.
            var refused = await Send(NetworkEdgeCaseEndpointsTests.Grid(70, 24).ToJsonString());
            Assert.Equal(413, refused.Status);
            Assert.Contains("networkMaxElementCases", refused.Head);
            Assert.False(process.HasExited, $"the service exited:\n{log}");
        }
        finally
        {
            if (!process.HasExited)
            {
                process.Kill(entireProcessTree: true);
                await process.WaitForExitAsync(TestContext.Current.CancellationToken);
            }
        }
    }
}
