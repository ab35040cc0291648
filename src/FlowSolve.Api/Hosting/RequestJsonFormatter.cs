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
/// (<c>@l</c> only when not Information, <c>@x</c> only with an exception, <c>@tr</c>/<c>@sp</c> only inside a trace).</remarks>
public sealed class RequestJsonFormatter : ITextFormatter
{
    private readonly CompactJsonFormatter _general = new();
    private static readonly JsonValueFormatter Values = new(typeTagName: "$type");
    private static readonly string QuotedTemplate = Quote(RequestLog.Template.Text);

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
