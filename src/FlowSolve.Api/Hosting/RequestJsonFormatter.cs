using System.Buffers;
using System.Globalization;
using Serilog.Events;
using Serilog.Formatting;
using Serilog.Formatting.Compact;
using Serilog.Formatting.Json;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// The JSON log format: Serilog's compact JSON (CLEF), with request events (<see cref="RequestLog"/>) written field by
/// field in the same shape, since they are nearly every line; every other event goes to <see cref="CompactJsonFormatter"/>.
/// </summary>
/// <remarks>Shape: <c>{"@t":"...","@mt":"...","@r":["0.123"],"@l":"Error","@x":"...","@tr":"...","@sp":"...",
/// "RequestMethod":"GET","RequestPath":"/v1/...","StatusCode":200,"Elapsed":0.1234,"Route":"..."}</c>
/// (<c>@l</c> only when not Information, <c>@x</c> only with an exception, <c>@tr</c>/<c>@sp</c> only inside a trace),
/// then <c>"RequestId"</c> and <c>"ConnectionId"</c>, which the log context used to add. A <see cref="RequestRecord"/> is
/// written straight to UTF-8 in that shape.</remarks>
public sealed class RequestJsonFormatter : ITextFormatter, IRequestLineFormatter
{
    private readonly CompactJsonFormatter _general = new();
    private static readonly JsonValueFormatter Values = new(typeTagName: "$type");
    private static readonly string QuotedTemplate = Quote(RequestLog.Template.Text);
    private static readonly byte[] Head = System.Text.Encoding.UTF8.GetBytes("\",\"@mt\":" + QuotedTemplate + ",\"@r\":[\"");
    private static readonly byte[][] LevelNames =
        [.. Enum.GetValues<LogEventLevel>().Select(l => System.Text.Encoding.ASCII.GetBytes(l.ToString()))];

    public void Format(in RequestRecord record, IBufferWriter<byte> output)
    {
        var span = output.GetSpan(1024 + Utf8Text.Bound(record.Method) + Utf8Text.Bound(record.Path)
            + Utf8Text.Bound(record.Route) + Utf8Text.Bound(record.RequestId) + Utf8Text.Bound(record.ConnectionId));
        int at = Utf8Text.Literal("{\"@t\":\""u8, span);
        record.Timestamp.TryFormat(span[at..], out int n, "O", CultureInfo.InvariantCulture);
        at += n;
        at += Utf8Text.Literal(Head, span[at..]);
        record.Elapsed.TryFormat(span[at..], out n, "0.000", CultureInfo.InvariantCulture);
        at += n;
        at += Utf8Text.Literal("\"]"u8, span[at..]);
        if (record.Level != LogEventLevel.Information)
        {
            at += Utf8Text.Literal(",\"@l\":\""u8, span[at..]);
            at += Utf8Text.Literal(LevelNames[(int)record.Level], span[at..]);
            span[at++] = (byte)'"';
        }
        if (record.Exception is not null)
        {
            // Rare (a request that failed with an exception): the text may be long, so it gets a span of its own.
            at += Utf8Text.Literal(",\"@x\":"u8, span[at..]);
            output.Advance(at);
            string text = record.Exception.ToString();
            at = Utf8Text.Quoted(text, output.GetSpan(Utf8Text.Bound(text)));
            output.Advance(at);
            span = output.GetSpan(1024 + Utf8Text.Bound(record.Method) + Utf8Text.Bound(record.Path)
                + Utf8Text.Bound(record.Route) + Utf8Text.Bound(record.RequestId) + Utf8Text.Bound(record.ConnectionId));
            at = 0;
        }
        Span<byte> id = stackalloc byte[16];
        if (record.TraceId != default)
        {
            at += Utf8Text.Literal(",\"@tr\":\""u8, span[at..]);
            record.TraceId.CopyTo(id);
            at += Utf8Text.LowerHex(id, span[at..]);
            span[at++] = (byte)'"';
        }
        if (record.SpanId != default)
        {
            at += Utf8Text.Literal(",\"@sp\":\""u8, span[at..]);
            record.SpanId.CopyTo(id[..8]);
            at += Utf8Text.LowerHex(id[..8], span[at..]);
            span[at++] = (byte)'"';
        }
        at += Utf8Text.Literal(",\"RequestMethod\":"u8, span[at..]);
        at += Utf8Text.Quoted(record.Method, span[at..]);
        at += Utf8Text.Literal(",\"RequestPath\":"u8, span[at..]);
        at += record.Path is null ? Utf8Text.Literal("null"u8, span[at..]) : Utf8Text.Quoted(record.Path, span[at..]);
        at += Utf8Text.Literal(",\"StatusCode\":"u8, span[at..]);
        record.StatusCode.TryFormat(span[at..], out n, default, CultureInfo.InvariantCulture);
        at += n;
        at += Utf8Text.Literal(",\"Elapsed\":"u8, span[at..]);
        if (double.IsFinite(record.Elapsed))
        {
            record.Elapsed.TryFormat(span[at..], out n, "R", CultureInfo.InvariantCulture);
            at += n;
        }
        else
        {
            // As Serilog writes a non-finite double: its text, quoted (no real request takes forever; kept for the shape).
            at += Utf8Text.Quoted(record.Elapsed.ToString(CultureInfo.InvariantCulture), span[at..]);
        }
        at += Utf8Text.Literal(",\"Route\":"u8, span[at..]);
        at += record.Route is null ? Utf8Text.Literal("null"u8, span[at..]) : Utf8Text.Quoted(record.Route, span[at..]);
        if (record.RequestId is not null)
        {
            at += Utf8Text.Literal(",\"RequestId\":"u8, span[at..]);
            at += Utf8Text.Quoted(record.RequestId, span[at..]);
        }
        if (record.ConnectionId is not null)
        {
            at += Utf8Text.Literal(",\"ConnectionId\":"u8, span[at..]);
            at += Utf8Text.Quoted(record.ConnectionId, span[at..]);
        }
        at += Utf8Text.Literal("}\n"u8, span[at..]);
        output.Advance(at);
    }

    public void Format(LogEvent logEvent, TextWriter output)
    {
        if (!ReferenceEquals(logEvent.MessageTemplate, RequestLog.Template))
        {
            _general.Format(logEvent, output);
            return;
        }
        Span<char> buffer = stackalloc char[40];
        output.Write("{\"@t\":\"");
        logEvent.Timestamp.UtcDateTime.TryFormat(buffer, out int n, "O", CultureInfo.InvariantCulture);
        output.Write(buffer[..n]);
        output.Write("\",\"@mt\":");
        output.Write(QuotedTemplate);
        var properties = logEvent.Properties;
        if (properties.TryGetValue("Elapsed", out var elapsedValue) && elapsedValue is ScalarValue { Value: double elapsed })
        {
            output.Write(",\"@r\":[\"");
            elapsed.TryFormat(buffer, out n, "0.000", CultureInfo.InvariantCulture);
            output.Write(buffer[..n]);
            output.Write("\"]");
        }
        if (logEvent.Level != LogEventLevel.Information)
        {
            output.Write(",\"@l\":\"");
            output.Write(logEvent.Level.ToString());
            output.Write('"');
        }
        if (logEvent.Exception is not null)
        {
            output.Write(",\"@x\":");
            JsonValueFormatter.WriteQuotedJsonString(logEvent.Exception.ToString(), output);
        }
        if (logEvent.TraceId is { } trace)
        {
            output.Write(",\"@tr\":\"");
            output.Write(trace.ToHexString());
            output.Write('"');
        }
        if (logEvent.SpanId is { } span)
        {
            output.Write(",\"@sp\":\"");
            output.Write(span.ToHexString());
            output.Write('"');
        }
        foreach (var (name, value) in properties)
        {
            output.Write(',');
            JsonValueFormatter.WriteQuotedJsonString(name, output);
            output.Write(':');
            switch (value)
            {
                case ScalarValue { Value: null }:
                    output.Write("null");
                    break;
                case ScalarValue { Value: string text }:
                    JsonValueFormatter.WriteQuotedJsonString(text, output);
                    break;
                case ScalarValue { Value: int i }:
                    i.TryFormat(buffer, out n, default, CultureInfo.InvariantCulture);
                    output.Write(buffer[..n]);
                    break;
                case ScalarValue { Value: double d } when double.IsFinite(d):
                    d.TryFormat(buffer, out n, "R", CultureInfo.InvariantCulture);
                    output.Write(buffer[..n]);
                    break;
                default:
                    Values.Format(value, output);
                    break;
            }
        }
        output.Write("}\n");
    }

    private static string Quote(string text)
    {
        var writer = new StringWriter();
        JsonValueFormatter.WriteQuotedJsonString(text, writer);
        return writer.ToString();
    }
}
