using System.Buffers;
using System.Globalization;
using Serilog.Events;
using Serilog.Formatting;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// The plain log format, "[HH:mm:ss LVL] message", written field by field rather than through a parsed output
/// template: at one line per request the general template renderer was a measurable share of the request's cost.
/// Request completions (<see cref="RequestRecord"/>) are written straight to UTF-8, the same line.
/// </summary>
public sealed class PlainLineFormatter : ITextFormatter, IRequestLineFormatter
{
    private static readonly string[] Levels = ["VRB", "DBG", "INF", "WRN", "ERR", "FTL"];
    private static readonly byte[][] Utf8Levels = [.. Levels.Select(l => System.Text.Encoding.ASCII.GetBytes(l))];

    /// <summary>"[HH:mm:ss LVL] GET /path 200 0.123 ms", then the exception's text on the lines below, if any.</summary>
    public void Format(in RequestRecord record, IBufferWriter<byte> output)
    {
        var span = output.GetSpan(400 + Utf8Text.Bound(record.Method) + Utf8Text.Bound(record.Path));
        int at = 0;
        span[at++] = (byte)'[';
        record.Timestamp.TryFormat(span[at..], out int n, "HH:mm:ss", CultureInfo.InvariantCulture);
        at += n;
        span[at++] = (byte)' ';
        at += Utf8Text.Literal(Utf8Levels[(int)record.Level], span[at..]);
        at += Utf8Text.Literal("] "u8, span[at..]);
        at += Utf8Text.Plain(record.Method, span[at..]);
        span[at++] = (byte)' ';
        at += record.Path is null ? Utf8Text.Literal("null"u8, span[at..]) : Utf8Text.Plain(record.Path, span[at..]);
        span[at++] = (byte)' ';
        record.StatusCode.TryFormat(span[at..], out n, default, CultureInfo.InvariantCulture);
        at += n;
        span[at++] = (byte)' ';
        record.Elapsed.TryFormat(span[at..], out n, "0.000", CultureInfo.InvariantCulture);
        at += n;
        at += Utf8Text.Literal(" ms\n"u8, span[at..]);
        output.Advance(at);
        if (record.Exception is not null)
        {
            string text = record.Exception.ToString();
            span = output.GetSpan(Utf8Text.Bound(text));
            at = Utf8Text.Plain(text, span);
            span[at++] = (byte)'\n';
            output.Advance(at);
        }
    }

    public void Format(LogEvent logEvent, TextWriter output)
    {
        Span<char> time = stackalloc char[8];
        logEvent.Timestamp.TryFormat(time, out int written, "HH:mm:ss", CultureInfo.InvariantCulture);
        output.Write('[');
        output.Write(time[..written]);
        output.Write(' ');
        output.Write(Levels[(int)logEvent.Level]);
        output.Write("] ");
        // Strings unquoted, as the {Message:lj} template renders them.
        foreach (var token in logEvent.MessageTemplate.Tokens)
        {
            if (token is Serilog.Parsing.PropertyToken p && logEvent.Properties.TryGetValue(p.PropertyName, out var value)
                && value is ScalarValue { Value: string text })
                output.Write(text);
            else
                token.Render(logEvent.Properties, output, CultureInfo.InvariantCulture);
        }
        output.Write('\n');
        if (logEvent.Exception is not null)
        {
            output.Write(logEvent.Exception.ToString());
            output.Write('\n');
        }
    }
}
