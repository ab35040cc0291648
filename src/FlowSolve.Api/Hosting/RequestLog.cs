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
/// <para>Our own small middleware rather than the general one in Serilog.AspNetCore, and cheaper than a Serilog event:
/// when the configured sink (<see cref="Logging.Sink"/>) is ours, the completion is a <see cref="RequestRecord"/>
/// copied into the sink's pre-allocated ring (no event, property or boxed value is allocated on the request thread) and
/// formatted to UTF-8 by the log writer. Serilog's pipeline is skipped for it: its one filter is the minimum level, which
/// the sink applies, and its one enricher (the log context) gave this event only ASP.NET Core's request and connection
/// ids, which are read from the request instead.</para>
/// <para>Without our sink (a host that configured Serilog otherwise) the same completion is written as a Serilog event.</para>
/// </remarks>
public sealed class RequestLog
{
    /// <summary>The event's message template, parsed once; the JSON formatter recognises request events by it.</summary>
    public static readonly MessageTemplate Template =
        new MessageTemplateParser().Parse("{RequestMethod} {RequestPath} {StatusCode} {Elapsed:0.000} ms");

    private readonly RequestDelegate next;
    private readonly BufferedStdoutSink? _sink;
    private readonly Serilog.ILogger _logger = Serilog.Log.Logger;

    /// <summary>The pipeline's: the sink and logger of this host, captured when the pipeline is built (tests run several
    /// hosts in one process).</summary>
    [ActivatorUtilitiesConstructor]
    public RequestLog(RequestDelegate next) : this(next, Logging.Sink)
    {
    }

    /// <summary>With a sink of the caller's; the Serilog logger when it is null.</summary>
    public RequestLog(RequestDelegate next, BufferedStdoutSink? sink)
    {
        this.next = next;
        _sink = sink;
    }

    public Task InvokeAsync(HttpContext context)
    {
        long start = Stopwatch.GetTimestamp();
        Task pending;
        try
        {
            pending = next(context);
        }
        catch (Exception e)
        {
            Write(context, start, 500, e);
            return Task.FromException(e); // as an async method would: a faulted task, not a synchronous throw
        }
        if (!pending.IsCompletedSuccessfully) return Completion(pending, context, start);
        Write(context, start, context.Response.StatusCode, null);
        return Task.CompletedTask;
    }

    private async Task Completion(Task pending, HttpContext context, long start)
    {
        try
        {
            await pending;
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
        var sink = _sink;
        if (sink is not null ? !sink.IsEnabled(level) : !_logger.IsEnabled(level)) return;
        double elapsed = Stopwatch.GetElapsedTime(start).TotalMilliseconds;
        var activity = Activity.Current;
        var record = new RequestRecord(DateTime.UtcNow, level, context.Request.Method, context.Request.Path.Value, status,
            elapsed, (context.GetEndpoint() as RouteEndpoint)?.RoutePattern.RawText, context.TraceIdentifier,
            context.Connection.Id, activity?.TraceId ?? default, activity?.SpanId ?? default, exception);
        if (sink is not null) sink.Emit(record);
        else _logger.Write(record.ToLogEvent());
    }
}
