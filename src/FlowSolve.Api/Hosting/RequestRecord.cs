using System.Diagnostics;
using Serilog.Events;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// One request's completion, as <see cref="RequestLog"/> hands it to <see cref="BufferedStdoutSink"/>: a struct copied
/// into the sink's pre-allocated ring, formatted to UTF-8 by the log writer. Its fields are the event's properties in
/// the order the JSON line writes them.
/// </summary>
/// <param name="Timestamp">When the request completed, UTC.</param>
/// <param name="Level">Error for an exception or a 5xx, Verbose for health probes, Information otherwise.</param>
/// <param name="Method">The HTTP method (RequestMethod).</param>
/// <param name="Path">The request path (RequestPath).</param>
/// <param name="StatusCode">The status the client got (StatusCode).</param>
/// <param name="Elapsed">Milliseconds from the middleware's start to the request's end (Elapsed).</param>
/// <param name="Route">The matched route template, or null (Route).</param>
/// <param name="RequestId">ASP.NET Core's request id (RequestId), as its hosting log scope gave it; null leaves it out.</param>
/// <param name="ConnectionId">Kestrel's connection id (ConnectionId), as its connection log scope gave it; null leaves it out.</param>
/// <param name="TraceId">The current activity's trace id, default when there is none.</param>
/// <param name="SpanId">The current activity's span id, default when there is none.</param>
/// <param name="Exception">The exception that ended the request, if any.</param>
public readonly record struct RequestRecord(
    DateTime Timestamp, LogEventLevel Level, string Method, string? Path, int StatusCode, double Elapsed, string? Route,
    string? RequestId, string? ConnectionId, ActivityTraceId TraceId, ActivitySpanId SpanId, Exception? Exception)
{
    /// <summary>The same completion as a Serilog event (the message template of <see cref="RequestLog.Template"/>),
    /// for a sink or formatter that only takes events.</summary>
    public LogEvent ToLogEvent()
    {
        var properties = new List<LogEventProperty>(7)
        {
            new("RequestMethod", new ScalarValue(Method)),
            new("RequestPath", new ScalarValue(Path)),
            new("StatusCode", new ScalarValue(StatusCode)),
            new("Elapsed", new ScalarValue(Elapsed)),
            new("Route", new ScalarValue(Route)),
        };
        if (RequestId is not null) properties.Add(new("RequestId", new ScalarValue(RequestId)));
        if (ConnectionId is not null) properties.Add(new("ConnectionId", new ScalarValue(ConnectionId)));
        return new LogEvent(new DateTimeOffset(Timestamp, TimeSpan.Zero), Level, Exception, RequestLog.Template, properties,
            TraceId, SpanId);
    }
}

/// <summary>A formatter that writes a <see cref="RequestRecord"/> straight to UTF-8, exactly as its
/// <see cref="Serilog.Formatting.ITextFormatter"/> writes the record's <see cref="RequestRecord.ToLogEvent"/>.</summary>
public interface IRequestLineFormatter
{
    void Format(in RequestRecord record, System.Buffers.IBufferWriter<byte> output);
}

/// <summary>The small UTF-8 writing helpers the request line formatters share.</summary>
internal static class Utf8Text
{
    private static ReadOnlySpan<byte> Hex => "0123456789abcdef"u8;

    /// <summary>Bytes enough for <paramref name="text"/> as a quoted, escaped JSON string or as plain UTF-8.</summary>
    public static int Bound(string? text) => 2 + 6 * (text?.Length ?? 4);

    /// <summary>Plain UTF-8 (a lone surrogate becomes U+FFFD, as the UTF-8 stream writer before it wrote it).</summary>
    public static int Plain(ReadOnlySpan<char> text, Span<byte> output) => System.Text.Encoding.UTF8.GetBytes(text, output);

    public static int Literal(ReadOnlySpan<byte> text, Span<byte> output)
    {
        text.CopyTo(output);
        return text.Length;
    }

    /// <summary>A JSON string as Serilog's <c>JsonValueFormatter.WriteQuotedJsonString</c> writes it: quote and
    /// backslash escaped, control characters as \n, \r, \t, \f or \uXXXX, everything else as UTF-8.</summary>
    public static int Quoted(string text, Span<byte> output)
    {
        int at = 0;
        output[at++] = (byte)'"';
        int run = 0;
        for (int i = 0; i < text.Length; i++)
        {
            char c = text[i];
            if (c >= 0x20 && c != '"' && c != '\\') continue;
            at += Plain(text.AsSpan(run, i - run), output[at..]);
            run = i + 1;
            output[at++] = (byte)'\\';
            switch (c)
            {
                case '"': output[at++] = (byte)'"'; break;
                case '\\': output[at++] = (byte)'\\'; break;
                case '\n': output[at++] = (byte)'n'; break;
                case '\r': output[at++] = (byte)'r'; break;
                case '\t': output[at++] = (byte)'t'; break;
                case '\f': output[at++] = (byte)'f'; break;
                default:
                    output[at++] = (byte)'u';
                    output[at++] = (byte)'0';
                    output[at++] = (byte)'0';
                    output[at++] = "0123456789ABCDEF"u8[c >> 4];
                    output[at++] = "0123456789ABCDEF"u8[c & 0xF];
                    break;
            }
        }
        at += Plain(text.AsSpan(run), output[at..]);
        output[at++] = (byte)'"';
        return at;
    }

    /// <summary>Lower-case hexadecimal of a trace or span id's bytes.</summary>
    public static int LowerHex(ReadOnlySpan<byte> bytes, Span<byte> output)
    {
        for (int i = 0; i < bytes.Length; i++)
        {
            output[2 * i] = Hex[bytes[i] >> 4];
            output[2 * i + 1] = Hex[bytes[i] & 0xF];
        }
        return 2 * bytes.Length;
    }
}
