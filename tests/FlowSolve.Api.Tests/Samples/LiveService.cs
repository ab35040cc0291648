using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using System.Text;

namespace FlowSolve.Api.Tests.Samples;

/// <summary>
/// The built FlowSolve.Api.dll (copied into this test's output by the project reference) started as a real process on
/// a free loopback port, for the samples that need a real address: the curl tour, the Python client, the workbook's URLs.
/// </summary>
public sealed class LiveService : IAsyncLifetime
{
    private Process? _process;
    private readonly StringBuilder _log = new();

    public string BaseUrl { get; private set; } = "";

    public HttpClient Client { get; } = new() { Timeout = TimeSpan.FromSeconds(30) };

    public static string RepositoryRoot
    {
        get
        {
            var dir = new DirectoryInfo(AppContext.BaseDirectory);
            while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "FlowSolve.sln"))) dir = dir.Parent;
            return dir?.FullName ?? throw new InvalidOperationException("repository root not found");
        }
    }

    public string Log { get { lock (_log) return _log.ToString(); } }

    public async ValueTask InitializeAsync()
    {
        string dll = Path.Combine(AppContext.BaseDirectory, "FlowSolve.Api.dll");
        if (!File.Exists(dll)) throw new InvalidOperationException($"{dll} is missing: the test project references FlowSolve.Api");
        int port = FreePort();
        BaseUrl = $"http://127.0.0.1:{port}";
        var start = new ProcessStartInfo("dotnet") { WorkingDirectory = AppContext.BaseDirectory, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { dll, "--urls", BaseUrl }) start.ArgumentList.Add(a);
        start.Environment["DOTNET_ENVIRONMENT"] = "Production";
        start.Environment["ASPNETCORE_ENVIRONMENT"] = "Production";
        _process = Process.Start(start) ?? throw new InvalidOperationException("dotnet did not start");
        _process.OutputDataReceived += (_, e) => { lock (_log) _log.AppendLine(e.Data); };
        _process.ErrorDataReceived += (_, e) => { lock (_log) _log.AppendLine(e.Data); };
        _process.BeginOutputReadLine();
        _process.BeginErrorReadLine();

        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (DateTime.UtcNow < deadline)
        {
            if (_process.HasExited) throw new InvalidOperationException($"FlowSolve.Api exited with {_process.ExitCode}:\n{Log}");
            try
            {
                using var ready = await Client.GetAsync(BaseUrl + "/health/ready");
                if (ready.StatusCode == HttpStatusCode.OK) return;
            }
            catch (HttpRequestException) { }
            await Task.Delay(250);
        }
        throw new TimeoutException($"FlowSolve.Api did not become ready at {BaseUrl} within 60 s:\n{Log}");
    }

    public async ValueTask DisposeAsync()
    {
        Client.Dispose();
        if (_process is { HasExited: false })
        {
            _process.Kill(entireProcessTree: true);
            await _process.WaitForExitAsync();
        }
        _process?.Dispose();
    }

    /// <summary>A loopback port nobody listens on (asked of the OS, then released).</summary>
    public static int FreePort()
    {
        var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        int port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        return port;
    }
}

/// <summary>The result of a sample program run to its end (or killed at its time limit).</summary>
public sealed record ProgramRun(int ExitCode, string Output, string Errors, bool TimedOut)
{
    public override string ToString() => $"exit {ExitCode}{(TimedOut ? " (timed out)" : "")}\n--- stdout ---\n{Output}\n--- stderr ---\n{Errors}";
}

public static class SamplePrograms
{
    /// <summary>The full path of a program on PATH; the test fails with a clear message when it is missing.</summary>
    public static string Require(string program)
    {
        foreach (var dir in (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator))
        {
            if (dir.Length == 0) continue;
            string candidate = Path.Combine(dir, program);
            if (File.Exists(candidate)) return candidate;
        }
        Assert.Fail($"'{program}' is not on PATH: the sample tests need python3, bash and curl (CI has them; install them to run these tests)");
        return "";
    }

    /// <summary>Runs a program with FLOWSOLVE_URL set, bounded in time.</summary>
    public static async Task<ProgramRun> Run(string program, string[] arguments, string flowSolveUrl, TimeSpan limit)
    {
        var start = new ProcessStartInfo(Require(program))
        {
            WorkingDirectory = LiveService.RepositoryRoot,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var a in arguments) start.ArgumentList.Add(a);
        start.Environment["FLOWSOLVE_URL"] = flowSolveUrl;
        return await Run(start, limit);
    }

    /// <summary>Runs a prepared process (output and errors redirected), killed with its children past the limit.</summary>
    public static async Task<ProgramRun> Run(ProcessStartInfo start, TimeSpan limit)
    {
        using var process = Process.Start(start)!;
        var output = process.StandardOutput.ReadToEndAsync();
        var errors = process.StandardError.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(limit);
        bool timedOut = false;
        try { await process.WaitForExitAsync(timeout.Token); }
        catch (OperationCanceledException)
        {
            timedOut = true;
            process.Kill(entireProcessTree: true);
            await process.WaitForExitAsync();
        }
        return new ProgramRun(process.ExitCode, await output, await errors, timedOut);
    }
}
