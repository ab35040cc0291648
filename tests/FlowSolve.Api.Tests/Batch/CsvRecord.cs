using System.Text;

namespace FlowSolve.Api.Tests.Batch;

/// <summary>The test side's reading of a CSV answer, written independently of the service's own reader.</summary>
internal static class CsvRecord
{
    /// <summary>One CSV record's cells (RFC 4180: a quoted cell may hold commas and doubled quotes; no line breaks
    /// inside).</summary>
    public static string[] Cells(string line)
    {
        var cells = new List<string>();
        var cell = new StringBuilder();
        bool quoted = false;
        for (int k = 0; k < line.Length; k++)
        {
            char ch = line[k];
            if (quoted)
            {
                if (ch == '"' && k + 1 < line.Length && line[k + 1] == '"') { cell.Append('"'); k++; }
                else if (ch == '"') quoted = false;
                else cell.Append(ch);
            }
            else if (ch == '"') quoted = true;
            else if (ch == ',') { cells.Add(cell.ToString()); cell.Clear(); }
            else cell.Append(ch);
        }
        cells.Add(cell.ToString());
        return cells.ToArray();
    }
}
