using System.Globalization;
using Serilog.Events;
using Serilog.Formatting;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// The plain log format, "[HH:mm:ss LVL] message", written field by field rather than through a parsed output
/// template: at one line per request the general template renderer was a measurable share of the request's cost.
/// </summary>
public sealed class PlainLineFormatter : ITextFormatter
{
    private static readonly string[] Levels = ["VRB", "DBG", "INF", "WRN", "ERR", "FTL"];

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
