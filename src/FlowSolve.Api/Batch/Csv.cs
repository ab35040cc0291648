using System.Text;
using System.Text.Json.Nodes;

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
    /// Builds a request object from a header and a row: dotted names nest (section.shape), empty cells are omitted,
    /// numbers become JSON numbers, true/false booleans, anything else a string (so a non-number in a numeric field is
    /// reported by the field's own binding error).
    /// </summary>
    public static JsonObject ToJson(IReadOnlyList<string> header, IReadOnlyList<string> row)
    {
        var root = new JsonObject();
        for (int i = 0; i < header.Count && i < row.Count; i++)
        {
            string cell = row[i].Trim();
            if (cell.Length == 0 || header[i].Length == 0) continue;
            var parts = header[i].Split('.');
            var target = root;
            for (int p = 0; p < parts.Length - 1; p++)
            {
                if (target[parts[p]] is not JsonObject next) target[parts[p]] = next = new JsonObject();
                target = next;
            }
            target[parts[^1]] = Value(cell);
        }
        return root;
    }

    private static JsonNode Value(string cell)
    {
        if (double.TryParse(cell, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double d)
            && double.IsFinite(d))
            return JsonValue.Create(d);
        if (cell.Equals("true", StringComparison.OrdinalIgnoreCase)) return JsonValue.Create(true);
        if (cell.Equals("false", StringComparison.OrdinalIgnoreCase)) return JsonValue.Create(false);
        return JsonValue.Create(cell);
    }
}
