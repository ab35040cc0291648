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
        string[] open = [];
        foreach (int i in plan.Order)
        {
            if (i >= row.Count) continue;
            string cell = row[i].Trim();
            if (cell.Length == 0) continue;
            var parts = plan.Parts[i];
            int common = 0;
            while (common < open.Length && common < parts.Length - 1 && open[common] == parts[common]) common++;
            for (int k = open.Length; k > common; k--) writer.WriteEndObject();
            for (int k = common; k < parts.Length - 1; k++) writer.WriteStartObject(parts[k]);
            open = parts[..^1];
            writer.WritePropertyName(parts[^1]);
            if (double.TryParse(cell, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double d)
                && double.IsFinite(d))
                writer.WriteNumberValue(d);
            else if (cell.Equals("true", StringComparison.OrdinalIgnoreCase)) writer.WriteBooleanValue(true);
            else if (cell.Equals("false", StringComparison.OrdinalIgnoreCase)) writer.WriteBooleanValue(false);
            else writer.WriteStringValue(cell);
        }
        for (int k = open.Length; k > 0; k--) writer.WriteEndObject();
        writer.WriteEndObject();
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
