using System.Text;
using System.Text.Json;

namespace FlowSolve.Api.Batch;

/// <summary>Minimal RFC 4180 CSV: comma-separated, optional double quotes with "" as an escaped quote, CRLF or LF.</summary>
public static class Csv
{
    /// <summary>Reads one record, which may span lines inside quotes; null at the end of the input.</summary>
    public static async Task<List<string>?> ReadRecordAsync(TextReader reader, CancellationToken cancellationToken)
    {
        string? line = await reader.ReadLineAsync(cancellationToken);
        if (line is null) return null;
        var fields = new List<string>();
        var field = new StringBuilder();
        bool quoted = false;
        while (true)
        {
            for (int i = 0; i < line.Length; i++)
            {
                char c = line[i];
                if (quoted)
                {
                    if (c == '"' && i + 1 < line.Length && line[i + 1] == '"') { field.Append('"'); i++; }
                    else if (c == '"') quoted = false;
                    else field.Append(c);
                }
                else if (c == '"' && field.Length == 0) quoted = true;
                else if (c == ',') { fields.Add(field.ToString()); field.Clear(); }
                else field.Append(c);
            }
            if (!quoted) break;
            // A quoted field continues on the next line.
            line = await reader.ReadLineAsync(cancellationToken);
            if (line is null) break;
            field.Append('\n');
        }
        fields.Add(field.ToString());
        return fields;
    }

    /// <summary>Quotes a value when it holds a comma, quote or line break.</summary>
    public static string Escape(string value) =>
        value.AsSpan().IndexOfAny(",\"\r\n") >= 0 ? "\"" + value.Replace("\"", "\"\"") + "\"" : value;

    /// <summary>
    /// Writes a request object for one row straight to UTF-8 JSON (no object tree per row): dotted header names nest
    /// (section.shape), empty cells are omitted, numbers become JSON numbers, true/false booleans, anything else a
    /// string (so a non-number in a numeric field is reported by that field's own binding error). The
    /// <see cref="HeaderPlan"/> orders the columns once per batch so each nested object's fields are written together.
    /// </summary>
    public static void WriteJson(Utf8JsonWriter writer, HeaderPlan plan, IReadOnlyList<string> row)
    {
        writer.WriteStartObject();
        // The nested objects open now are the first `depth` names of `open` (a header's parts, never copied).
        string[] open = [];
        int depth = 0;
        foreach (int i in plan.Order)
        {
            if (i >= row.Count) continue;
            ReadOnlySpan<char> cell = row[i].AsSpan().Trim();
            if (cell.Length == 0) continue;
            var parts = plan.Parts[i];
            int common = 0;
            while (common < depth && common < parts.Length - 1 && open[common] == parts[common]) common++;
            for (int k = depth; k > common; k--) writer.WriteEndObject();
            for (int k = common; k < parts.Length - 1; k++) writer.WriteStartObject(parts[k]);
            open = parts;
            depth = parts.Length - 1;
            writer.WritePropertyName(parts[^1]);
            if (double.TryParse(cell, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double d)
                && double.IsFinite(d))
            {
                // A cell already in JSON's number syntax goes through as written (the binder parses it once);
                // anything else the parser accepted (".5", "+1", "1.") is written from its value, and so is a whole
                // number, which is then written without fraction or exponent ("5.0" and "5e0" as 5, as an integer field
                // needs it).
                if (d != Math.Floor(d) && IsJsonNumber(cell)) writer.WriteRawValue(cell, skipInputValidation: true);
                else writer.WriteNumberValue(d);
            }
            else if (cell.Equals("true", StringComparison.OrdinalIgnoreCase)) writer.WriteBooleanValue(true);
            else if (cell.Equals("false", StringComparison.OrdinalIgnoreCase)) writer.WriteBooleanValue(false);
            else writer.WriteStringValue(cell);
        }
        for (int k = depth; k > 0; k--) writer.WriteEndObject();
        writer.WriteEndObject();
    }

    /// <summary>True when the text is a number in JSON's grammar (RFC 8259 section 6):
    /// -? (0 | [1-9][0-9]*) (. [0-9]+)? ([eE] [+-]? [0-9]+)?</summary>
    public static bool IsJsonNumber(ReadOnlySpan<char> text)
    {
        int i = 0, n = text.Length;
        if (i < n && text[i] == '-') i++;
        if (i >= n) return false;
        if (text[i] == '0') i++;
        else if (text[i] is >= '1' and <= '9') { while (i < n && char.IsAsciiDigit(text[i])) i++; }
        else return false;
        if (i < n && text[i] == '.')
        {
            i++;
            int start = i;
            while (i < n && char.IsAsciiDigit(text[i])) i++;
            if (i == start) return false;
        }
        if (i < n && (text[i] == 'e' || text[i] == 'E'))
        {
            i++;
            if (i < n && (text[i] == '+' || text[i] == '-')) i++;
            int start = i;
            while (i < n && char.IsAsciiDigit(text[i])) i++;
            if (i == start) return false;
        }
        return i == n;
    }

    /// <summary>A header's dotted names split once, and an order that keeps each nested object's columns together.</summary>
    public sealed class HeaderPlan
    {
        public string[][] Parts { get; }
        public int[] Order { get; }

        public HeaderPlan(IReadOnlyList<string> header)
        {
            Parts = header.Select(h => h.Split('.')).ToArray();
            Order = Enumerable.Range(0, header.Count).Where(i => header[i].Length > 0)
                .OrderBy(i => Parts[i].Length > 1 ? string.Join('.', Parts[i][..^1]) : "", StringComparer.Ordinal)
                .ThenBy(i => i).ToArray();
        }
    }
}
