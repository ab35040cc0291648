using System.Diagnostics;
using Serilog.Events;
using Serilog.Parsing;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// One structured completion event per request: method, path, status, elapsed milliseconds and the matched route
/// template. Errors (an exception or a 5xx) at Error, health probes at Verbose (they would drown the log), the rest at
/// Information.
/// </summary>
/// <remarks>
/// Our own small middleware rather than the general one in Serilog.AspNetCore: it parses its message template once,
/// builds the event's five properties directly, and does nothing at all when the level is off, so that logging every
/// request costs a few percent of a calculation's throughput, not a tenth of it.
/// </remarks>
public sealed class RequestLog(RequestDelegate next)
{
    /// <summary>The event's message template, parsed once; the JSON formatter recognises request events by it.</summary>
    public static readonly MessageTemplate Template =
        new MessageTemplateParser().Parse("{RequestMethod} {RequestPath} {StatusCode} {Elapsed:0.000} ms");

    // Captured when the pipeline is built: the configured logger of this host (tests run several hosts in one process).
    private readonly Serilog.ILogger _logger = Serilog.Log.Logger;

    public async Task InvokeAsync(HttpContext context)
    {
        long start = Stopwatch.GetTimestamp();
        try
        {
            await next(context);
        }
        catch (Exception e)
        {
            Write(context, start, 500, e);
            throw;
        }
        Write(context, start, context.Response.StatusCode, null);
    }

    private void Write(HttpContext context, long start, int status, Exception? exception)
    {
        var level = exception is not null || status >= 500 ? LogEventLevel.Error
            : context.Request.Path.StartsWithSegments("/health") ? LogEventLevel.Verbose
            : LogEventLevel.Information;
        if (!_logger.IsEnabled(level)) return;
        double elapsed = Stopwatch.GetElapsedTime(start).TotalMilliseconds;
        string? route = (context.GetEndpoint() as RouteEndpoint)?.RoutePattern.RawText;
        var properties = new[]
        {
            new LogEventProperty("RequestMethod", new ScalarValue(context.Request.Method)),
            new LogEventProperty("RequestPath", new ScalarValue(context.Request.Path.Value)),
            new LogEventProperty("StatusCode", new ScalarValue(status)),
            new LogEventProperty("Elapsed", new ScalarValue(elapsed)),
            new LogEventProperty("Route", new ScalarValue(route)),
        };
        var activity = Activity.Current;
        _logger.Write(new LogEvent(DateTimeOffset.UtcNow, level, exception, Template, properties,
            activity?.TraceId ?? default, activity?.SpanId ?? default));
    }
}
