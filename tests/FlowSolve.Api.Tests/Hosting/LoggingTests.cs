using System.Diagnostics;
using FlowSolve.Api.Hosting;
using Serilog.Events;
using Serilog.Formatting.Compact;
using Serilog.Parsing;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>The request log line: our field-by-field JSON against Serilog's own compact JSON formatter (the reference
/// for the CLEF shape), and the background sink's ordering and draining.</summary>
public class LoggingTests
{
    private static LogEvent RequestEvent(LogEventLevel level, string path, int status, double elapsed, string? route,
        Exception? exception = null, ActivityTraceId trace = default, ActivitySpanId span = default) =>
        new(new DateTimeOffset(2026, 12, 1, 20, 15, 3, 123, TimeSpan.Zero).AddTicks(4567), level, exception, RequestLog.Template,
        [
            new LogEventProperty("RequestMethod", new ScalarValue("GET")),
            new LogEventProperty("RequestPath", new ScalarValue(path)),
            new LogEventProperty("StatusCode", new ScalarValue(status)),
            new LogEventProperty("Elapsed", new ScalarValue(elapsed)),
            new LogEventProperty("Route", new ScalarValue(route)),
        ], trace, span);

    private static string Format(Serilog.Formatting.ITextFormatter formatter, LogEvent e)
    {
        var writer = new StringWriter();
        formatter.Format(e, writer);
        return writer.ToString();
    }

    public static TheoryData<string> Cases() =>
    [
        "plain", "error", "exception", "traced", "odd-path", "no-route", "tiny-elapsed",
    ];

    [Theory]
    [MemberData(nameof(Cases))]
    public void Request_events_are_written_exactly_as_the_compact_JSON_formatter_writes_them(string kind)
    {
        var e = kind switch
        {
            "plain" => RequestEvent(LogEventLevel.Information, "/v1/friction-factor", 200, 0.8765432, "/v1/friction-factor"),
            "error" => RequestEvent(LogEventLevel.Error, "/v1/pipes/flow", 503, 30012.5, "/v1/pipes/flow"),
            "exception" => RequestEvent(LogEventLevel.Error, "/v1/pipes/flow", 500, 3.25, "/v1/pipes/flow", new InvalidOperationException("boom \"quoted\"")),
            "traced" => RequestEvent(LogEventLevel.Information, "/v1/batch/pipes/head-loss", 200, 12, "/v1/batch/{**calculation}",
                trace: ActivityTraceId.CreateRandom(), span: ActivitySpanId.CreateRandom()),
            "odd-path" => RequestEvent(LogEventLevel.Warning, "/v1/\"q\"\\\u00e9\u0001\n", 404, 0.01, null),
            "no-route" => RequestEvent(LogEventLevel.Information, "/nowhere", 404, 0.2, null),
            _ => RequestEvent(LogEventLevel.Information, "/v1/fluids/water", 200, 1e-7, "/v1/fluids/water"),
        };
        Assert.Equal(Format(new CompactJsonFormatter(), e), Format(new RequestJsonFormatter(), e));
    }

    [Fact]
    public void Other_events_go_to_the_compact_JSON_formatter()
    {
        var template = new MessageTemplateParser().Parse("Batch row failed in {Calculation}");
        var e = new LogEvent(DateTimeOffset.UnixEpoch, LogEventLevel.Error, new Exception("x"), template,
            [new LogEventProperty("Calculation", new ScalarValue("pipes/flow"))]);
        Assert.Equal(Format(new CompactJsonFormatter(), e), Format(new RequestJsonFormatter(), e));
    }

    [Fact]
    public void The_sink_writes_every_event_in_order_and_drains_on_dispose()
    {
        var output = new StringWriter();
        var sink = new BufferedStdoutSink(new PlainLineFormatter(), output);
        for (int i = 0; i < 2_000; i++)
            sink.Emit(RequestEvent(LogEventLevel.Information, "/v1/case/" + i, 200, i, null));
        sink.Dispose();
        var lines = output.ToString().Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(2_000, lines.Length);
        for (int i = 0; i < lines.Length; i++) Assert.Contains($"GET /v1/case/{i} 200 ", lines[i]);
        Assert.Equal(0, sink.Dropped);
    }
}
