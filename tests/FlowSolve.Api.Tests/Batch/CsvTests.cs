using System.Buffers;
using System.Globalization;
using System.Text;
using System.Text.Json;
using CsCheck;
using FlowSolve.Api.Batch;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Tests.Batch;

/// <summary>The CSV row binder's pieces against independent references: System.Text.Json's own reader for JSON's number
/// grammar, and the values a cell stood for.</summary>
public class CsvTests
{
    /// <summary>Number-like text: digits, signs, points and exponents in any order, so that both valid and malformed
    /// numbers are drawn.</summary>
    private static readonly Gen<string> NumberLike = Gen.Char["0123456789+-.eE"].Array[1, 12].Select(c => new string(c));

    /// <summary>The reference: Utf8JsonReader accepts the text as exactly one JSON number token (RFC 8259 section 6).</summary>
    private static bool ReaderAcceptsNumber(string text)
    {
        try
        {
            var reader = new Utf8JsonReader(Encoding.UTF8.GetBytes(text), isFinalBlock: true, state: default);
            return reader.Read() && reader.TokenType == JsonTokenType.Number && !reader.Read();
        }
        catch (JsonException)
        {
            return false;
        }
    }

    [Fact]
    public void IsJsonNumber_agrees_with_the_JSON_reader_on_random_number_like_text() =>
        NumberLike.Sample(s => Assert.Equal(ReaderAcceptsNumber(s), Csv.IsJsonNumber(s)), iter: 20_000);

    [Theory]
    [InlineData("0.00026"), InlineData("1.0034e-6"), InlineData("-12.5E+3"), InlineData(".5"), InlineData("+1"),
     InlineData("1."), InlineData("5.0"), InlineData("5e0"), InlineData("1e5"), InlineData("00.5"), InlineData("-0")]
    public void A_numeric_cell_binds_to_the_value_it_was_parsed_as(string cell)
    {
        // Every form that double.Parse accepts reaches the binder as the same double.
        var buffer = new ArrayBufferWriter<byte>();
        using (var writer = new Utf8JsonWriter(buffer))
            Csv.WriteJson(writer, new Csv.HeaderPlan(["flow", "section.width"]), [cell, cell]);
        using var doc = JsonDocument.Parse(buffer.WrittenMemory);
        double expected = double.Parse(cell, NumberStyles.Float, CultureInfo.InvariantCulture);
        Assert.Equal(expected, doc.RootElement.GetProperty("flow").GetDouble());
        Assert.Equal(expected, doc.RootElement.GetProperty("section").GetProperty("width").GetDouble());
    }

    [Theory]
    [InlineData("5.0", 5), InlineData("5e0", 5), InlineData("1e5", 100000), InlineData("2.", 2)]
    public void A_whole_number_reaches_the_binder_in_integer_form(string cell, int expected)
    {
        // An integer request field must accept a whole number however the spreadsheet wrote it.
        var buffer = new ArrayBufferWriter<byte>();
        using (var writer = new Utf8JsonWriter(buffer))
            Csv.WriteJson(writer, new Csv.HeaderPlan(["n"]), [cell]);
        using var doc = JsonDocument.Parse(buffer.WrittenMemory);
        Assert.True(doc.RootElement.GetProperty("n").TryGetInt32(out int n));
        Assert.Equal(expected, n);
    }

    public sealed record Row(double Flow, double? Diameter, int Count, bool? Flag, string? Label);

    /// <summary>Cells of every kind, drawn from a small pool so that a column repeats its cell row after row, changes
    /// it, and comes back to it; hostile cells and spaces included.</summary>
    private static readonly Gen<string> PoolCell = Gen.Int[0, 14].Select(i => new[]
        { "0.00026", " 0.00026", "0.00026 ", "1.0034e-6", "1.0034E-6", "998.2", "2", "2.0", "", "abc", "1e400", "true", "-0", "+5", ".5" }[i]);

    [Fact]
    public void A_row_binds_alike_after_any_earlier_rows_of_the_batch()
    {
        // Property: a worker's values, reused across rows (and remembering the cells each column read before), bind
        // every row exactly as fresh values bind that row alone.
        var plan = CsvRowBinder.For(typeof(Row))!.Plan(["flow", "diameter", "count", "flag", "label"])!;
        PoolCell.Array[5].Array[1, 40].Sample(rows =>
        {
            var reused = plan.NewValues();
            foreach (var cells in rows)
            {
                var line = Encoding.ASCII.GetBytes(string.Join(',', cells));
                bool alone = plan.TryBind(line, plan.NewValues(), out var expected);
                bool after = plan.TryBind(line, reused, out var actual);
                Assert.Equal(alone, after);
                Assert.Equal(expected, actual);
            }
        }, iter: 3_000);
    }

    private sealed record Inner(double? Value, string? Note);

    private sealed record Sample(double Flow, bool Converged, int Iterations, string Label, Inner? Nested);

    [Fact]
    public void Compiled_cell_writers_format_as_invariant_round_trip_text()
    {
        // Property under test: every cell reads back (double.Parse, RFC 4180 unquoting) to the value it came from.
        var columns = typeof(Sample).GetProperties()
            .Where(p => p.PropertyType != typeof(Inner))
            .Select(p => new ResponseColumn(p.Name, [p]))
            .Concat(typeof(Inner).GetProperties().Select(p => new ResponseColumn("nested." + p.Name, [typeof(Sample).GetProperty("Nested")!, p])))
            .ToDictionary(c => c.Name);
        Gen.Select(Gen.Double, Gen.Bool, Gen.Int, Gen.String, Gen.Double.Select(d => d > 0 ? (double?)null : d))
            .Where(t => double.IsFinite(t.Item1) && (t.Item5 is not { } v || double.IsFinite(v)))
            .Sample(t =>
            {
                var (flow, converged, iterations, label, inner) = t;
                var sample = new Sample(flow, converged, iterations, label, new Inner(inner, label));
                Assert.Equal(flow, double.Parse(columns["Flow"].Read(sample), CultureInfo.InvariantCulture));
                Assert.Equal(converged ? "TRUE" : "FALSE", columns["Converged"].Read(sample));
                Assert.Equal(iterations, int.Parse(columns["Iterations"].Read(sample), CultureInfo.InvariantCulture));
                Assert.Equal(label, Unquote(columns["Label"].Read(sample)));
                string nested = columns["nested.Value"].Read(sample);
                Assert.Equal(inner, nested.Length == 0 ? (double?)null : double.Parse(nested, CultureInfo.InvariantCulture));
                Assert.Equal("", columns["nested.Note"].Read(sample with { Nested = null }));
            }, iter: 2_000);
    }

    private static string Unquote(string cell) =>
        cell.Length >= 2 && cell[0] == '"' && cell[^1] == '"' ? cell[1..^1].Replace("\"\"", "\"") : cell;
}
