using System.Globalization;
using System.Text;
using CsCheck;
using FlowSolve.Api.Batch;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Tests.Batch;

/// <summary>A batch row's cells written straight into UTF-8 must be, byte for byte, the UTF-8 of the text cells the
/// columns' own writers produce (the cells the text path, <c>format=text</c> and the single calls' identity tests rest
/// on), for any value, extreme and non-finite numbers included.</summary>
public class Utf8CellsTests
{
    public sealed record Inner(double? Value, string? Note, bool? Flag);

    public sealed record Sample(double Flow, bool Converged, int Iterations, string? Label, int? Count, decimal Price,
        IReadOnlyList<WarningDto> Warnings, Inner? Nested);

    private static readonly ResponseColumn[] Columns =
    [
        Column("flow", "Flow"), Column("converged", "Converged"), Column("iterations", "Iterations"), Column("label", "Label"),
        Column("count", "Count"), Column("price", "Price"), Column("warnings", "Warnings"),
        Column("nested.value", "Nested", "Value"), Column("nested.note", "Nested", "Note"), Column("nested.flag", "Nested", "Flag"),
        // A name that leads to no property: the column's own writer answers for it.
        new("renamed", [typeof(Sample).GetProperty("Flow")!]),
    ];

    private static ResponseColumn Column(string name, params string[] path)
    {
        var properties = new List<System.Reflection.PropertyInfo>();
        var type = typeof(Sample);
        foreach (var part in path)
        {
            var p = type.GetProperty(part)!;
            properties.Add(p);
            type = p.PropertyType;
        }
        return new ResponseColumn(name, [.. properties]);
    }

    private static Gen<T> Pick<T>(params T[] values) => Gen.Int[0, values.Length - 1].Select(i => values[i]);

    private static Gen<T?> Maybe<T>(Gen<T> values) where T : struct =>
        Gen.Select(Gen.Int[0, 4], values, (k, v) => k == 0 ? (T?)null : v);

    /// <summary>Doubles from every part of the range: any bit pattern, and the edges by name.</summary>
    private static readonly Gen<double> AnyDouble = Gen.OneOf(
        Gen.Double, Gen.Long.Select(BitConverter.Int64BitsToDouble),
        Pick(0.0, -0.0, double.Epsilon, -double.Epsilon, double.MaxValue, double.MinValue, 1e308, 1e-320,
            2.2250738585072014E-308, 2.2250738585072009E-308, 0.1, 1.0 / 3, 9007199254740993.0, 1e21, 1e-7, 123456789012345680.0,
            double.NaN, double.PositiveInfinity, double.NegativeInfinity));

    private static readonly Gen<string?> AnyText = Gen.OneOf(Gen.String.Select(s => (string?)s),
        Pick<string?>(null, "", "a,b", "say \"x\"", "two\r\nlines", "caf\u00e9", "\U0001F600", new string('w', 5000)));

    private static readonly Gen<IReadOnlyList<WarningDto>> AnyWarnings =
        Pick("transition-zone", "outside-validity", "low-reynolds").Array[0, 4]
            .Select(codes => (IReadOnlyList<WarningDto>)codes.Select(c => new WarningDto(c, "m")).ToList());

    private static readonly Gen<Sample> AnySample =
        Gen.Select(AnyDouble, Gen.Bool, Gen.Int, AnyText, Maybe(Gen.Int), Gen.Decimal, AnyWarnings,
            Gen.Select(Maybe(AnyDouble), AnyText, Maybe(Gen.Bool)).Select(t => new Inner(t.Item1, t.Item2, t.Item3)).Null())
            .Select((flow, converged, iterations, label, count, price, warnings, nested) =>
                new Sample(flow, converged, iterations, label, count, price, warnings, nested));

    [Fact]
    public void Every_cell_is_the_utf8_of_the_columns_own_text()
    {
        var writers = Utf8Cells.For(typeof(Sample), Columns);
        AnySample.Sample(sample =>
        {
            var lines = new Utf8Lines(); // one per sample: the samples run on several threads
            try
            {
                for (int c = 0; c < Columns.Length; c++)
                {
                    lines.Length = 0;
                    writers[c](sample, lines);
                    byte[] expected = Encoding.UTF8.GetBytes(Columns[c].Read(sample));
                    Assert.True(expected.AsSpan().SequenceEqual(lines.Written.Span),
                        $"{Columns[c].Name}: '{Encoding.UTF8.GetString(lines.Written.Span)}' against '{Columns[c].Read(sample)}'");
                }
            }
            finally
            {
                lines.Release();
            }
        }, iter: 20_000);
    }

    [Fact]
    public void Cells_written_one_after_another_keep_every_earlier_byte_as_the_buffer_grows()
    {
        // Property: the buffer holds the concatenation of every cell written, across any number of growths.
        var writers = Utf8Cells.For(typeof(Sample), Columns);
        Gen.Select(AnySample.Array[1, 400], Gen.Int[0, Columns.Length - 1]).Sample((samples, c) =>
        {
            var lines = new Utf8Lines();
            try
            {
                var expected = new StringBuilder();
                foreach (var sample in samples)
                {
                    writers[c](sample, lines);
                    lines.Byte((byte)',');
                    expected.Append(Columns[c].Read(sample)).Append(',');
                }
                Assert.Equal(expected.ToString(), Encoding.UTF8.GetString(lines.Written.Span));
            }
            finally
            {
                lines.Release();
            }
        }, iter: 300);
    }

    [Fact]
    public void Repeated_numbers_are_written_as_formatting_writes_them()
    {
        // Property: numbers drawn from a small pool (so that values repeat, and share slots of the table of recent
        // numbers) are written as the concatenation of each one's invariant round-trip text.
        var pool = AnyDouble.Array[1, 80];
        Gen.Select(pool, Gen.Int.Array[1, 600]).Sample((values, picks) =>
        {
            var lines = new Utf8Lines();
            try
            {
                var expected = new StringBuilder();
                foreach (int pick in picks)
                {
                    double v = values[(int)((uint)pick % values.Length)];
                    lines.Number(v);
                    lines.Byte((byte)';');
                    expected.Append(v.ToString("R", CultureInfo.InvariantCulture)).Append(';');
                }
                Assert.Equal(expected.ToString(), Encoding.UTF8.GetString(lines.Written.Span));
            }
            finally
            {
                lines.Release();
            }
        }, iter: 500);
    }

    [Theory]
    [InlineData(0.0), InlineData(double.Epsilon), InlineData(double.MaxValue), InlineData(-1.2345678901234567E-308)]
    [InlineData(1.0034e-6), InlineData(998.2), InlineData(302973.93665757566)]
    public void A_number_reads_back_to_itself(double value)
    {
        // Property: the cell is the value's round-trip form (double.Parse gives the same bits back).
        var lines = new Utf8Lines();
        try
        {
            lines.Number(value);
            double back = double.Parse(Encoding.UTF8.GetString(lines.Written.Span), CultureInfo.InvariantCulture);
            Assert.Equal(BitConverter.DoubleToInt64Bits(value), BitConverter.DoubleToInt64Bits(back));
        }
        finally
        {
            lines.Release();
        }
    }
}
