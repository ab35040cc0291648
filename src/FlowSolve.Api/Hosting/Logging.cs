using Serilog;
using Serilog.Events;
using Serilog.Formatting.Compact;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// Serilog: one structured completion event per request (method, route, status, elapsed) through
/// <c>UseSerilogRequestLogging</c>, framework noise raised to Warning, and a buffered standard-output sink behind an
/// asynchronous queue so that writing logs never blocks a request thread (see <see cref="BufferedStdoutSink"/>).
/// </summary>
/// <remarks>
/// Settings: <c>FlowSolve:Logging:Level</c> (Verbose, Debug, Information (default), Warning, Error) and
/// <c>FlowSolve:Logging:Format</c> (<c>plain</c> (default) or <c>json</c>), from appsettings.json or the
/// environment variables <c>FlowSolve__Logging__Level</c> and <c>FlowSolve__Logging__Format</c>.
/// </remarks>
public static class Logging
{
    public static void Configure(IConfiguration configuration, LoggerConfiguration logger)
    {
        var level = configuration.GetValue("FlowSolve:Logging:Level", LogEventLevel.Information);
        bool json = string.Equals(configuration["FlowSolve:Logging:Format"], "json", StringComparison.OrdinalIgnoreCase);
        logger.MinimumLevel.Is(level)
            .MinimumLevel.Override("Microsoft.AspNetCore", LogEventLevel.Warning)
            .MinimumLevel.Override("Microsoft.Hosting.Lifetime", LogEventLevel.Information)
            .Enrich.FromLogContext()
            .WriteTo.Async(a => a.Sink(new BufferedStdoutSink(json
                    ? new CompactJsonFormatter()
                    : new PlainLineFormatter())),
                bufferSize: 10_000, blockWhenFull: false);
    }

    public static WebApplication UseFlowSolveRequestLogging(this WebApplication app)
    {
        app.UseSerilogRequestLogging(o =>
        {
            o.MessageTemplate = "{RequestMethod} {RequestPath} {StatusCode} {Elapsed:0.000} ms";
            // Health probes every few seconds would drown the log: keep them at Verbose.
            o.GetLevel = (ctx, _, ex) =>
                ex is not null || ctx.Response.StatusCode >= 500 ? LogEventLevel.Error
                : ctx.Request.Path.StartsWithSegments("/health") ? LogEventLevel.Verbose
                : LogEventLevel.Information;
            o.EnrichDiagnosticContext = (diagnostics, ctx) =>
                diagnostics.Set("Route", (ctx.GetEndpoint() as RouteEndpoint)?.RoutePattern.RawText);
        });
        return app;
    }
}
