using System.Buffers;
using System.Diagnostics;
using System.Text;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Http;
using Serilog.Events;
using Serilog.Formatting.Compact;
using Serilog.Formatting.Display;
using Serilog.Parsing;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>The request log line: our field-by-field JSON against Serilog's own compact JSON formatter (the reference
/// for the CLEF shape), the plain line against Serilog's output-template formatter, the request record's UTF-8 lines
/// against both for the event the middleware used to build, and the background sink's ordering, draining and dropping.</summary>
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
    public void The_sink_writes_every_entry_in_order_and_drains_on_dispose()
    {
        // Request records and other events side by side, as the service logs them: the lines keep the order.
        var output = new MemoryStream();
        var sink = new BufferedStdoutSink(new PlainLineFormatter(), output);
        var template = new MessageTemplateParser().Parse("Note {Index}");
        for (int i = 0; i < 3_000; i++)
        {
            if (i % 3 == 2) sink.Emit(new LogEvent(Stamp, LogEventLevel.Information, null, template, [new LogEventProperty("Index", new ScalarValue(i))]));
            else sink.Emit(Record(LogEventLevel.Information, "/v1/case/" + i, 200, i, null));
        }
        sink.Dispose();
        var lines = Encoding.UTF8.GetString(output.ToArray()).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(3_000, lines.Length);
        for (int i = 0; i < lines.Length; i++)
            Assert.EndsWith(i % 3 == 2 ? $"] Note {i}" : $"] GET /v1/case/{i} 200 {i}.000 ms", lines[i]);
        Assert.Equal(0, sink.Dropped);
    }

    [Fact]
    public void Producers_on_several_threads_each_get_every_entry_written_once_and_in_their_own_order()
    {
        // The ring is lock-free: four threads claim slots at once while the writer drains; nothing may be lost,
        // doubled or torn (a record half written when the writer reads it would show a path from one and a status
        // from another).
        const int threads = 4, each = 5_000;
        var output = new MemoryStream();
        var sink = new BufferedStdoutSink(new PlainLineFormatter(), output, capacity: 32_768);
        using var start = new Barrier(threads);
        var producers = Enumerable.Range(0, threads).Select(t => new Thread(() =>
        {
            start.SignalAndWait();
            for (int i = 0; i < each; i++) sink.Emit(Record(LogEventLevel.Information, $"/t{t}/{i}", 200 + t, i, null));
        })).ToList();
        producers.ForEach(p => p.Start());
        producers.ForEach(p => p.Join());
        sink.Dispose();
        var lines = Encoding.UTF8.GetString(output.ToArray()).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(threads * each, lines.Length);
        Assert.Equal(0, sink.Dropped);
        var next = new int[threads];
        foreach (var line in lines)
        {
            var m = System.Text.RegularExpressions.Regex.Match(line, @"\] GET /t(\d)/(\d+) (\d+) (\d+)\.000 ms$");
            Assert.True(m.Success, line);
            int t = int.Parse(m.Groups[1].Value), i = int.Parse(m.Groups[2].Value);
            Assert.Equal(next[t]++, i);
            Assert.Equal(200 + t, int.Parse(m.Groups[3].Value));
            Assert.Equal(i, int.Parse(m.Groups[4].Value));
        }
    }

    [Fact]
    public void A_flood_beyond_the_ring_is_dropped_counted_and_reported_and_the_ring_does_not_grow()
    {
        // The writer is held inside its first write; the ring then takes exactly its capacity and drops the rest.
        var output = new GatedStream();
        var sink = new BufferedStdoutSink(new PlainLineFormatter(), output, capacity: 64);
        Assert.Equal(64, sink.Capacity);
        sink.Emit(Record(LogEventLevel.Information, "/first", 200, 1, null));
        Assert.True(output.Entered.Wait(TimeSpan.FromSeconds(10), TestContext.Current.CancellationToken), "the writer never wrote");
        for (int i = 0; i < 64 + 500; i++) sink.Emit(Record(LogEventLevel.Information, "/flood/" + i, 200, 1, null));
        Assert.Equal(500, sink.Dropped);
        output.Release.Set();
        sink.Dispose();
        var lines = Encoding.UTF8.GetString(output.Written.ToArray()).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(1 + 64 + 1, lines.Length);
        for (int i = 0; i < 64; i++) Assert.EndsWith($"] GET /flood/{i} 200 1.000 ms", lines[1 + i]);
        Assert.Matches(@"^\[\d\d:\d\d:\d\d WRN\] 500 log events were dropped since the last report \(500 in all\): the log writer could not keep up$", lines[^1]);
    }

    [Fact]
    public void A_disposed_sink_takes_no_more_request_records()
    {
        var sink = new BufferedStdoutSink(new PlainLineFormatter(), new MemoryStream()) { MinimumLevel = LogEventLevel.Information };
        Assert.True(sink.IsEnabled(LogEventLevel.Information));
        Assert.False(sink.IsEnabled(LogEventLevel.Debug));
        sink.Dispose();
        Assert.False(sink.IsEnabled(LogEventLevel.Error));
    }

    /// <summary>A stream whose first write waits until the test releases it.</summary>
    private sealed class GatedStream : Stream
    {
        public readonly MemoryStream Written = new();
        public readonly ManualResetEventSlim Entered = new();
        public readonly ManualResetEventSlim Release = new();
        public override void Write(ReadOnlySpan<byte> buffer)
        {
            Entered.Set();
            Release.Wait(TimeSpan.FromSeconds(30));
            Written.Write(buffer);
        }
        public override void Write(byte[] buffer, int offset, int count) => Write(buffer.AsSpan(offset, count));
        public override void Flush() { }
        public override bool CanRead => false;
        public override bool CanSeek => false;
        public override bool CanWrite => true;
        public override long Length => Written.Length;
        public override long Position { get => Written.Position; set => throw new NotSupportedException(); }
        public override int Read(byte[] buffer, int offset, int count) => throw new NotSupportedException();
        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
        public override void SetLength(long value) => throw new NotSupportedException();
    }

    // ---- The request record's UTF-8 lines against Serilog's formatters on the event the middleware used to build ----

    private static readonly DateTimeOffset Stamp = new DateTimeOffset(2026, 12, 1, 20, 15, 3, 123, TimeSpan.Zero).AddTicks(4567);

    private static RequestRecord Record(LogEventLevel level, string? path, int status, double elapsed, string? route,
        Exception? exception = null, ActivityTraceId trace = default, ActivitySpanId span = default,
        string? requestId = "0HNQIADQ86LGO:00000001", string? connectionId = "0HNQIADQ86LGO", string method = "GET") =>
        new(Stamp.UtcDateTime, level, method, path, status, elapsed, route, requestId, connectionId, trace, span, exception);

    /// <summary>The event as the middleware built it before request records (five properties), with the two the log
    /// context added after them (ASP.NET Core's hosting scope gave RequestId, Kestrel's connection scope ConnectionId).</summary>
    private static LogEvent OldEvent(in RequestRecord r)
    {
        var properties = new List<LogEventProperty>
        {
            new("RequestMethod", new ScalarValue(r.Method)),
            new("RequestPath", new ScalarValue(r.Path)),
            new("StatusCode", new ScalarValue(r.StatusCode)),
            new("Elapsed", new ScalarValue(r.Elapsed)),
            new("Route", new ScalarValue(r.Route)),
        };
        if (r.RequestId is not null) properties.Add(new("RequestId", new ScalarValue(r.RequestId)));
        if (r.ConnectionId is not null) properties.Add(new("ConnectionId", new ScalarValue(r.ConnectionId)));
        return new LogEvent(new DateTimeOffset(r.Timestamp), r.Level, r.Exception, RequestLog.Template, properties, r.TraceId, r.SpanId);
    }

    private static string Utf8Line(IRequestLineFormatter formatter, in RequestRecord r)
    {
        var buffer = new ArrayBufferWriter<byte>(16); // small, so every span the formatter asks for is a fresh one
        formatter.Format(r, buffer);
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>What the old path put on standard output: the text formatter's characters through a UTF-8 writer (a lone
    /// surrogate becomes U+FFFD there, as in the new path).</summary>
    private static string Reference(Serilog.Formatting.ITextFormatter formatter, LogEvent e) =>
        Encoding.UTF8.GetString(Encoding.UTF8.GetBytes(Format(formatter, e)));

    // Serilog's own rendering of the plain format's template, the reference for PlainLineFormatter.
    private static readonly MessageTemplateTextFormatter PlainReference =
        new("[{Timestamp:HH:mm:ss} {Level:u3}] {Message:lj}\n{Exception}", System.Globalization.CultureInfo.InvariantCulture);

    public static TheoryData<string> RecordCases() =>
    [
        "plain", "error", "exception", "traced", "odd-path", "no-route", "tiny-elapsed", "no-ids", "null-path", "long-elapsed",
    ];

    private static RequestRecord RecordCase(string kind) => kind switch
    {
        "plain" => Record(LogEventLevel.Information, "/v1/friction-factor", 200, 0.8765432, "/v1/friction-factor"),
        "error" => Record(LogEventLevel.Error, "/v1/pipes/flow", 503, 30012.5, "/v1/pipes/flow"),
        "exception" => Record(LogEventLevel.Error, "/v1/pipes/flow", 500, 3.25, "/v1/pipes/flow", Thrown()),
        "traced" => Record(LogEventLevel.Information, "/v1/batch/pipes/head-loss", 200, 12, "/v1/batch/{**calculation}",
            trace: ActivityTraceId.CreateRandom(), span: ActivitySpanId.CreateRandom()),
        "odd-path" => Record(LogEventLevel.Warning, "/v1/\"q\"\\\u00e9\u0001\n\t\r\f\b\u001f\u007f\u2028\ud83d\ude00\ud800x", 404, 0.01, null),
        "no-route" => Record(LogEventLevel.Information, "/nowhere", 404, 0.2, null),
        "no-ids" => Record(LogEventLevel.Verbose, "/health/live", 200, 0.05, "/health/live", requestId: null, connectionId: null),
        "null-path" => Record(LogEventLevel.Debug, null, 400, 0.5, null, method: "POST"),
        "long-elapsed" => Record(LogEventLevel.Fatal, "/v1/networks/simulate", 504, 1234567.890123, "/v1/networks/simulate"),
        _ => Record(LogEventLevel.Information, "/v1/fluids/water", 200, 1e-7, "/v1/fluids/water"),
    };

    private static Exception Thrown()
    {
        try { throw new InvalidOperationException("boom \"quoted\"\nsecond line \u00e9"); }
        catch (InvalidOperationException e) { return e; }
    }

    [Theory]
    [MemberData(nameof(RecordCases))]
    public void Request_records_are_written_in_JSON_exactly_as_the_compact_JSON_formatter_wrote_the_old_event(string kind)
    {
        var r = RecordCase(kind);
        Assert.Equal(Reference(new CompactJsonFormatter(), OldEvent(r)), Utf8Line(new RequestJsonFormatter(), r));
        // And through the event the record makes for sinks that take only events.
        Assert.Equal(Reference(new CompactJsonFormatter(), OldEvent(r)), Reference(new RequestJsonFormatter(), r.ToLogEvent()));
    }

    [Theory]
    [MemberData(nameof(RecordCases))]
    public void Request_records_are_written_as_plain_lines_exactly_as_Serilogs_template_renders_the_old_event(string kind)
    {
        var r = RecordCase(kind);
        string reference = Reference(PlainReference, OldEvent(r));
        Assert.Equal(reference, Utf8Line(new PlainLineFormatter(), r));
        Assert.Equal(reference, Reference(new PlainLineFormatter(), OldEvent(r)));
    }

    [Fact]
    public void Random_request_records_give_the_old_lines_in_both_formats()
    {
        // Paths of any UTF-16 content (controls, quotes, backslashes, non-ASCII, surrogate pairs and lone halves),
        // statuses, levels, elapsed times from a nanosecond to hours, ids present or not, inside a trace or not.
        var random = new Random(20261204);
        string Text(int maxLength)
        {
            var chars = new char[random.Next(0, maxLength + 1)];
            for (int i = 0; i < chars.Length; i++)
                chars[i] = random.Next(4) switch
                {
                    0 => (char)random.Next(0, 0x80),
                    1 => "\"\\/\n\r\t\f\b\u0000{}:,"[random.Next(12)],
                    2 => (char)random.Next(0xD800, 0xE000),
                    _ => (char)random.Next(0x80, 0x10000),
                };
            return new string(chars);
        }
        for (int n = 0; n < 2_000; n++)
        {
            var r = new RequestRecord(Stamp.UtcDateTime.AddTicks(random.NextInt64(0, TimeSpan.TicksPerDay * 400)),
                (LogEventLevel)random.Next(0, 6), random.Next(5) == 0 ? Text(8) : "GET", random.Next(20) == 0 ? null : "/" + Text(60),
                random.Next(100, 600), Math.Pow(10, random.NextDouble() * 16 - 9),
                random.Next(3) == 0 ? null : "/v1/" + Text(20), random.Next(4) == 0 ? null : Text(24), random.Next(4) == 0 ? null : Text(13),
                random.Next(2) == 0 ? default : ActivityTraceId.CreateRandom(), random.Next(2) == 0 ? default : ActivitySpanId.CreateRandom(),
                random.Next(50) == 0 ? Thrown() : null);
            var old = OldEvent(r);
            Assert.Equal(Reference(new CompactJsonFormatter(), old), Utf8Line(new RequestJsonFormatter(), r));
            Assert.Equal(Reference(PlainReference, old), Utf8Line(new PlainLineFormatter(), r));
        }
    }
}

/// <summary>The middleware: which requests it logs at which level, and what it hands the sink.</summary>
public class RequestLogTests
{
    private static async Task<(string[] Lines, Exception? Thrown)> Run(LogEventLevel minimum, string path, RequestDelegate next, string format = "plain")
    {
        var output = new MemoryStream();
        var sink = new BufferedStdoutSink(format == "json" ? new RequestJsonFormatter() : new PlainLineFormatter(), output) { MinimumLevel = minimum };
        var context = new DefaultHttpContext();
        context.Request.Method = "GET";
        context.Request.Path = path;
        context.TraceIdentifier = "conn-7:00000003";
        context.Connection.Id = "conn-7";
        Exception? thrown = null;
        try
        {
            await new RequestLog(next, sink).InvokeAsync(context);
        }
        catch (Exception e)
        {
            thrown = e;
        }
        sink.Dispose();
        return (Encoding.UTF8.GetString(output.ToArray()).Split('\n', StringSplitOptions.RemoveEmptyEntries), thrown);
    }

    [Fact]
    public async Task A_request_is_one_Information_line_with_its_status()
    {
        var (lines, thrown) = await Run(LogEventLevel.Information, "/v1/friction-factor", c => { c.Response.StatusCode = 422; return Task.CompletedTask; });
        Assert.Null(thrown);
        Assert.Matches(@"^\[\d\d:\d\d:\d\d INF\] GET /v1/friction-factor 422 \d+\.\d{3} ms$", Assert.Single(lines));
    }

    [Fact]
    public async Task Health_probes_are_Verbose_and_left_out_at_Information()
    {
        var (lines, _) = await Run(LogEventLevel.Information, "/health/live", _ => Task.CompletedTask);
        Assert.Empty(lines);
        (lines, _) = await Run(LogEventLevel.Verbose, "/health/live", _ => Task.CompletedTask);
        Assert.Matches(@"^\[\d\d:\d\d:\d\d VRB\] GET /health/live 200 ", Assert.Single(lines));
    }

    [Fact]
    public async Task A_5xx_is_an_Error_and_nothing_below_the_minimum_level_is_written()
    {
        var (lines, _) = await Run(LogEventLevel.Error, "/v1/pipes/flow", c => { c.Response.StatusCode = 503; return Task.CompletedTask; });
        Assert.Matches(@"^\[\d\d:\d\d:\d\d ERR\] GET /v1/pipes/flow 503 ", Assert.Single(lines));
        (lines, _) = await Run(LogEventLevel.Error, "/v1/pipes/flow", c => { c.Response.StatusCode = 404; return Task.CompletedTask; });
        Assert.Empty(lines);
    }

    [Fact]
    public async Task An_exception_thrown_at_once_or_later_is_a_500_Error_with_its_text_and_still_reaches_the_caller()
    {
        var (lines, thrown) = await Run(LogEventLevel.Information, "/v1/x", _ => throw new InvalidOperationException("at once"));
        Assert.IsType<InvalidOperationException>(thrown);
        Assert.Matches(@"^\[\d\d:\d\d:\d\d ERR\] GET /v1/x 500 ", lines[0]);
        Assert.StartsWith("System.InvalidOperationException: at once", lines[1]);
        (lines, thrown) = await Run(LogEventLevel.Information, "/v1/x", async _ => { await Task.Yield(); throw new InvalidOperationException("later"); });
        Assert.IsType<InvalidOperationException>(thrown);
        Assert.Matches(@"^\[\d\d:\d\d:\d\d ERR\] GET /v1/x 500 ", lines[0]);
        Assert.StartsWith("System.InvalidOperationException: later", lines[1]);
    }

    [Fact]
    public async Task The_JSON_line_carries_the_request_and_connection_ids_the_log_context_used_to_add()
    {
        var (lines, _) = await Run(LogEventLevel.Information, "/v1/fluids/water", _ => Task.CompletedTask, "json");
        using var line = System.Text.Json.JsonDocument.Parse(Assert.Single(lines));
        var root = line.RootElement;
        Assert.Equal("GET", root.GetProperty("RequestMethod").GetString());
        Assert.Equal("/v1/fluids/water", root.GetProperty("RequestPath").GetString());
        Assert.Equal(200, root.GetProperty("StatusCode").GetInt32());
        Assert.True(root.GetProperty("Elapsed").GetDouble() >= 0);
        Assert.Equal(System.Text.Json.JsonValueKind.Null, root.GetProperty("Route").ValueKind);
        Assert.Equal("conn-7:00000003", root.GetProperty("RequestId").GetString());
        Assert.Equal("conn-7", root.GetProperty("ConnectionId").GetString());
    }
}
