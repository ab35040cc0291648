using Serilog;
using Serilog.Events;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// Serilog: one structured completion event per request (method, route, status, elapsed) from <see cref="RequestLog"/>,
/// framework noise raised to Warning, and a standard-output sink that formats and writes on a background thread in
/// blocks, so that writing logs never blocks a request thread (see <see cref="BufferedStdoutSink"/>).
/// </summary>
/// <remarks>
/// Settings: <c>FlowSolve:Logging:Level</c> (Verbose, Debug, Information (default), Warning, Error) and
/// <c>FlowSolve:Logging:Format</c> (<c>plain</c> (default) or <c>json</c>), from appsettings.json or the
/// environment variables <c>FlowSolve__Logging__Level</c> and <c>FlowSolve__Logging__Format</c>.
/// </remarks>
public static class Logging
{
    /// <summary>The sink of the logger configured last, which <see cref="RequestLog"/> writes request completions to
    /// directly (captured when the pipeline is built, as the logger itself is).</summary>
    public static BufferedStdoutSink? Sink { get; private set; }

    public static void Configure(IConfiguration configuration, LoggerConfiguration logger)
    {
        var level = configuration.GetValue("FlowSolve:Logging:Level", LogEventLevel.Information);
        bool json = string.Equals(configuration["FlowSolve:Logging:Format"], "json", StringComparison.OrdinalIgnoreCase);
        var sink = new BufferedStdoutSink(json ? new RequestJsonFormatter() : new PlainLineFormatter()) { MinimumLevel = level };
        logger.MinimumLevel.Is(level)
            .MinimumLevel.Override("Microsoft.AspNetCore", LogEventLevel.Warning)
            .MinimumLevel.Override("Microsoft.Hosting.Lifetime", LogEventLevel.Information)
            .Enrich.FromLogContext()
            .WriteTo.Sink(sink);
        Sink = sink;
    }

    /// <summary>One completion event per request (see <see cref="RequestLog"/>).</summary>
    public static WebApplication UseFlowSolveRequestLogging(this WebApplication app)
    {
        app.UseMiddleware<RequestLog>();
        return app;
    }
}
