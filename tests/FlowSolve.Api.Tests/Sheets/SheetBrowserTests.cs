using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using Microsoft.Playwright;

namespace FlowSolve.Api.Tests.Sheets;

/// <summary>
/// Each kind of calculation sheet opened in a real browser: the system's Chromium (Debian's package, installed by
/// .ci/run) driven headless by Playwright, against the built service on a real port. Playwright never downloads a
/// browser here. Screenshots and A4/Letter prints go to TestResults/sheets/ (not committed).
/// </summary>
public sealed class SheetBrowserTests
{
    private const string Chromium = "/usr/bin/chromium";

    /// <summary>A sheet per kind: its name for the artifacts, the URL, and the plots it must show.</summary>
    public static TheoryData<string, string, string[]> Kinds => new()
    {
        // POST: the browser's navigation is turned into a POST of the sample network (see the route below).
        { "networks-solve", "/v1/networks/solve?format=html", ["plot-schematic", "plot-convergence"] },
        { "networks-simulate", "/v1/networks/simulate?format=html", ["plot-tank-levels", "plot-pump-states"] },
        { "friction-factor", "/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&format=html", ["plot-moody", "plot-convergence"] },
        { "pipes-head-loss", "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&material=cast-iron&fittings=elbow-90-flanged-regular:3&format=html", ["plot-head-loss", "plot-convergence"] },
        { "pipes-flow", "/v1/pipes/flow?headLoss=20&diameter=0.15&length=800&roughness=0.000045&elevationChange=5&temperature=10&format=html", ["plot-head-loss", "plot-convergence"] },
        { "pipes-diameter", "/v1/pipes/diameter?flow=0.03&headLoss=6&length=400&material=commercial-steel&sizeTable=asme-b36.10m-schedule-40&format=html", ["plot-head-loss", "plot-convergence"] },
        { "channels-normal-depth", "/v1/channels/normal-depth?shape=trapezoidal&bottomWidth=3&sideSlope=2&manningN=0.025&slope=0.001&flow=10&format=html", ["plot-section", "plot-convergence"] },
        { "channels-critical-depth", "/v1/channels/critical-depth?shape=surveyed&points=0:2.5,3:1,5:0,9:0,11:1,14:2.2&flow=8&format=html", ["plot-section", "plot-convergence"] },
        { "fluids-water", "/v1/fluids/water?temperature=20&format=html", ["plot-water"] },
        { "pumps-duty-point", "/v1/pumps/duty-point?c0=40&c2=-5000&staticHead=15&resistance=3000&pumpsInParallel=2&format=html", ["plot-duty-point", "plot-convergence"] },
    };

    [Theory]
    [MemberData(nameof(Kinds))]
    public async Task Sheet_InHeadlessChromium_NoConsoleErrorsAndEveryPlotMarked(string kind, string url, string[] plots)
    {
        if (!File.Exists(Chromium))
            Assert.Fail($"{Chromium} is missing: the browser test needs Debian's chromium. Install it with: apt-get update && apt-get install -y chromium");

        await using var app = await RunningService.Start();
        Environment.SetEnvironmentVariable("PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD", "1");
        using var playwright = await Playwright.CreateAsync();
        string profile = Directory.CreateTempSubdirectory("flowsolve-chromium-").FullName;
        try
        {
            // A fresh profile per run (Playwright passes it as --user-data-dir).
            await using var context = await playwright.Chromium.LaunchPersistentContextAsync(profile, new BrowserTypeLaunchPersistentContextOptions
            {
                ExecutablePath = Chromium,
                Headless = true,
                Args = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
                    "--disable-component-update", "--disable-sync"],
                ViewportSize = new ViewportSize { Width = 900, Height = 1200 },
            });
            var page = context.Pages.Count > 0 ? context.Pages[0] : await context.NewPageAsync();
            var errors = new List<string>();
            var requests = new List<string>();
            page.Console += (_, m) => { if (m.Type == "error") errors.Add(m.Text); };
            page.PageError += (_, e) => errors.Add(e);
            page.Request += (_, r) => requests.Add(r.Url);

            if (url.StartsWith("/v1/networks/", StringComparison.Ordinal))
            {
                // A network is POST only: the navigation itself carries the Vandrel sample as its body (for a run, the
                // operation's Vandrel Vale example).
                string body = url.StartsWith("/v1/networks/simulate", StringComparison.Ordinal)
                    ? System.Text.Json.JsonSerializer.Serialize(FlowSolve.Api.Networks.NetworkSimulationDocs.Example, FlowSolve.Api.Hosting.JsonSetup.Options)
                    : File.ReadAllText(Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json"));
                await page.RouteAsync("**/v1/networks/**", route => route.ContinueAsync(new RouteContinueOptions
                {
                    Method = "POST",
                    PostData = System.Text.Encoding.UTF8.GetBytes(body),
                    Headers = new Dictionary<string, string>(route.Request.Headers) { ["content-type"] = "application/json" },
                }));
            }
            var response = await page.GotoAsync(app.BaseAddress + url, new PageGotoOptions { WaitUntil = WaitUntilState.Load });
            Assert.NotNull(response);
            Assert.Equal(200, response.Status);

            foreach (var id in plots)
            {
                var svg = page.Locator($"svg#{id}");
                Assert.Equal(1, await svg.CountAsync());
                var box = await svg.BoundingBoxAsync();
                Assert.True(box is { Width: > 200, Height: > 100 }, $"{id} is laid out");
                var marked = svg.Locator("[data-role=case]");
                Assert.True(await marked.CountAsync() >= 1, $"{id} has its marked point");
                Assert.NotNull(await marked.First.BoundingBoxAsync());
            }

            string artifacts = ArtifactFolder();
            await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(artifacts, kind + ".png"), FullPage = true });
            byte[] a4 = await page.PdfAsync(new PagePdfOptions { Format = "A4", Path = Path.Combine(artifacts, kind + "-a4.pdf") });
            byte[] letter = await page.PdfAsync(new PagePdfOptions { Format = "Letter", Path = Path.Combine(artifacts, kind + "-letter.pdf") });
            Assert.Equal("%PDF"u8.ToArray(), a4[..4]);
            Assert.Equal("%PDF"u8.ToArray(), letter[..4]);

            Assert.Empty(errors);
            Assert.All(requests, r => Assert.StartsWith(app.BaseAddress, r)); // nothing fetched from anywhere else
            Assert.Single(requests); // the page itself, and nothing more
        }
        finally
        {
            try { Directory.Delete(profile, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
        }
    }

    /// <summary>TestResults/sheets/ at the repository root (found by FlowSolve.sln), or beside the test binaries.</summary>
    private static string ArtifactFolder()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "FlowSolve.sln"))) dir = dir.Parent;
        string path = Path.Combine(dir?.FullName ?? AppContext.BaseDirectory, "TestResults", "sheets");
        Directory.CreateDirectory(path);
        return path;
    }

    /// <summary>The built FlowSolve.Api.dll from the test output, run with dotnet on a free loopback port, stopped after.</summary>
    private sealed class RunningService : IAsyncDisposable
    {
        private readonly Process _process;

        private RunningService(Process process, string baseAddress)
        {
            _process = process;
            BaseAddress = baseAddress;
        }

        public string BaseAddress { get; }

        public static async Task<RunningService> Start()
        {
            int port = FreePort();
            string baseAddress = $"http://127.0.0.1:{port}";
            var info = new ProcessStartInfo("dotnet")
            {
                WorkingDirectory = AppContext.BaseDirectory,
                RedirectStandardOutput = true,
                RedirectStandardError = true,
                UseShellExecute = false,
            };
            info.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "FlowSolve.Api.dll"));
            info.ArgumentList.Add("--urls");
            info.ArgumentList.Add(baseAddress);
            var process = Process.Start(info) ?? throw new InvalidOperationException("dotnet did not start");
            process.OutputDataReceived += (_, _) => { };
            process.ErrorDataReceived += (_, _) => { };
            process.BeginOutputReadLine();
            process.BeginErrorReadLine();
            var service = new RunningService(process, baseAddress);

            using var http = new HttpClient { Timeout = TimeSpan.FromSeconds(2) };
            var deadline = Stopwatch.StartNew();
            while (deadline.Elapsed < TimeSpan.FromSeconds(60))
            {
                if (process.HasExited) break;
                try
                {
                    using var r = await http.GetAsync(baseAddress + "/health/live", TestContext.Current.CancellationToken);
                    if (r.IsSuccessStatusCode) return service;
                }
                catch (HttpRequestException) { }
                catch (TaskCanceledException) { }
                await Task.Delay(200, TestContext.Current.CancellationToken);
            }
            await service.DisposeAsync();
            throw new InvalidOperationException($"FlowSolve.Api.dll did not answer on {baseAddress} within 60 s");
        }

        public async ValueTask DisposeAsync()
        {
            if (!_process.HasExited)
            {
                _process.Kill(entireProcessTree: true);
                await _process.WaitForExitAsync();
            }
            _process.Dispose();
        }

        private static int FreePort()
        {
            using var listener = new TcpListener(IPAddress.Loopback, 0);
            listener.Start();
            return ((IPEndPoint)listener.LocalEndpoint).Port;
        }
    }
}
