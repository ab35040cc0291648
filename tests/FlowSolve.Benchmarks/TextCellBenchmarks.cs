using System.Net;
using System.Reflection;
using BenchmarkDotNet.Attributes;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Http.Features;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.AspNetCore.TestHost;

namespace FlowSolve.Benchmarks;

/// <summary>
/// A spreadsheet cell's GET (<c>format=text</c>), the same GET's JSON answer and <c>/health/live</c> through the
/// in-memory service's whole pipeline (request log, security headers, protection, the strict query, metrics, routing,
/// binding, the solve, the answer), health as the baseline, so the ratios of one run give each answer's per-request
/// work beyond the ceiling's, in CPU time and bytes allocated.
/// </summary>
/// <remarks>
/// <para>Each request is handed to the host's application as a server hands it (create the context, process it, fire
/// the response's OnStarting callbacks, dispose the context) on the benchmark's own thread. The test server's own
/// <c>SendAsync</c> moves every request to the thread pool and back, which costs several times the difference being
/// measured and made the first runs' ratios noise (health 84 us, the cell 434 us, error bars wider than the means).</para>
/// <para>The service logs at Warning here, as <see cref="BatchBenchmarks"/> does: the request log's lines would go to
/// standard output, which the benchmark runner reads.</para>
/// </remarks>
[MemoryDiagnoser]
public class TextCellBenchmarks
{
    private const string Friction = "?reynolds=75000&relativeRoughness=0.005";
    private WebApplicationFactory<global::Program> _factory = null!;
    private Func<IFeatureCollection, Task> _application = null!;
    private readonly HttpConnectionFeature _connection = new()
    {
        ConnectionId = "0HNBENCH00001", LocalIpAddress = IPAddress.Loopback, RemoteIpAddress = IPAddress.Loopback, LocalPort = 80, RemotePort = 50000,
    };

    [GlobalSetup]
    public void Setup()
    {
        Environment.SetEnvironmentVariable("FlowSolve__Logging__Level", "Warning");
        // Production, as the load test runs it (Development adds the developer exception page and other work).
        _factory = new WebApplicationFactory<global::Program>().WithWebHostBuilder(b => b.UseEnvironment("Production"));
        _application = Application(_factory.Server);
        // Every case must answer 200 with a body, or the run measures a refusal.
        foreach (var (path, query) in new[]
                 {
                     ("/health/live", ""), ("/v1/friction-factor", Friction + "&format=text"),
                     ("/v1/friction-factor", Friction + "&format=text&select=iterations"), ("/v1/friction-factor", Friction),
                 })
        {
            var (status, body) = SendAndRead(path, query);
            if (status != 200 || body.Length == 0) throw new InvalidOperationException($"{path}{query} answered {status}: {body}");
        }
    }

    [GlobalCleanup]
    public void Cleanup() => _factory.Dispose();

    [Benchmark(Baseline = true)]
    public Task HealthLive() => Send("/health/live", "", Stream.Null);

    [Benchmark]
    public Task TextCell() => Send("/v1/friction-factor", Friction + "&format=text", Stream.Null);

    /// <summary>A cell of a field without a row shortcut (the iteration count): the whole answer is built and the field
    /// read from it, as every cell was before the shortcut.</summary>
    [Benchmark]
    public Task TextCellWholeAnswer() => Send("/v1/friction-factor", Friction + "&format=text&select=iterations", Stream.Null);

    [Benchmark]
    public Task Json() => Send("/v1/friction-factor", Friction, Stream.Null);

    private (int Status, string Body) SendAndRead(string path, string query)
    {
        var body = new MemoryStream();
        var response = new ResponseFeature();
        Send(path, query, body, response).GetAwaiter().GetResult();
        return (response.StatusCode, System.Text.Encoding.UTF8.GetString(body.ToArray()));
    }

    private Task Send(string path, string query, Stream body) => Send(path, query, body, new ResponseFeature());

    private Task Send(string path, string query, Stream body, ResponseFeature response)
    {
        var features = new FeatureCollection();
        features.Set<IHttpRequestFeature>(new HttpRequestFeature
        {
            Protocol = "HTTP/1.1", Scheme = "http", Method = HttpMethods.Get, Path = path, QueryString = query,
            Headers = new HeaderDictionary { ["Host"] = "localhost" },
        });
        features.Set<IHttpResponseFeature>(response);
        features.Set<IHttpResponseBodyFeature>(new StreamResponseBodyFeature(body));
        features.Set<IHttpConnectionFeature>(_connection);
        return _application(features);
    }

    /// <summary>The host's application as the test server received it when the host started.</summary>
    private static Func<IFeatureCollection, Task> Application(TestServer server)
    {
        var application = typeof(TestServer).GetField("_application", BindingFlags.NonPublic | BindingFlags.Instance)?.GetValue(server)
            ?? throw new InvalidOperationException("the test server holds no application (TestHost changed?)");
        var contract = application.GetType().GetInterfaces().Single(i => i.IsGenericType && i.GetGenericTypeDefinition() == typeof(IHttpApplication<>));
        var bind = typeof(TextCellBenchmarks).GetMethod(nameof(Bind), BindingFlags.NonPublic | BindingFlags.Static)!
            .MakeGenericMethod(contract.GetGenericArguments()[0]);
        return (Func<IFeatureCollection, Task>)bind.Invoke(null, [application])!;
    }

    private static Func<IFeatureCollection, Task> Bind<TContext>(IHttpApplication<TContext> application) where TContext : notnull =>
        features =>
        {
            var context = application.CreateContext(features);
            var pending = application.ProcessRequestAsync(context);
            if (!pending.IsCompletedSuccessfully) return Finish(application, context, pending, features);
            var ended = End(features);
            if (!ended.IsCompletedSuccessfully) return Finish(application, context, ended, features);
            application.DisposeContext(context, null);
            return Task.CompletedTask;
        };

    private static async Task Finish<TContext>(IHttpApplication<TContext> application, TContext context, Task pending, IFeatureCollection features)
        where TContext : notnull
    {
        Exception? error = null;
        try
        {
            await pending;
            await End(features);
        }
        catch (Exception e)
        {
            error = e;
            throw;
        }
        finally
        {
            application.DisposeContext(context, error);
        }
    }

    /// <summary>What a server does when the application is done: start the response, then complete its body (the bytes
    /// written but not flushed go out here).</summary>
    private static Task End(IFeatureCollection features)
    {
        var started = ((ResponseFeature)features.Get<IHttpResponseFeature>()!).Start();
        if (!started.IsCompletedSuccessfully) return started;
        return features.Get<IHttpResponseBodyFeature>()!.CompleteAsync();
    }

    /// <summary>A response that runs its OnStarting callbacks when the request ends, as a server does for an answer that
    /// was not flushed before (the security headers are set there).</summary>
    private sealed class ResponseFeature : HttpResponseFeature
    {
        // Room for every header an answer carries, so setting one never grows the dictionary (Kestrel keeps the common
        // response headers in fields of their own, and grows nothing for them).
        public ResponseFeature() => Headers = new HeaderDictionary(16);

        private List<(Func<object, Task> Callback, object State)>? _starting;
        private bool _started;

        public override bool HasStarted => _started;

        public override void OnStarting(Func<object, Task> callback, object state) => (_starting ??= []).Add((callback, state));

        public Task Start()
        {
            if (_started) return Task.CompletedTask;
            _started = true;
            if (_starting is null) return Task.CompletedTask;
            // Last registered runs first, as Kestrel runs them.
            for (int i = _starting.Count - 1; i >= 0; i--)
            {
                var task = _starting[i].Callback(_starting[i].State);
                if (!task.IsCompletedSuccessfully) task.GetAwaiter().GetResult();
            }
            return Task.CompletedTask;
        }
    }
}
