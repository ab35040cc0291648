using System.Globalization;
using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Friction;

namespace FlowSolve.Benchmarks;

/// <summary>
/// The least work a friction row of a CSV batch needs in .NET, without HTTP and without any batch machinery: the row's
/// two cells parsed from UTF-8 with the runtime's correctly rounded parser, the friction factor solved (the span solve,
/// bit-equal to the scalar one), and the answer written with the shortest round-trip formatting a single call answers
/// with. Measured per row over 200 000 rows, one thread, each part alone and all three together, so that the floor of
/// a friction batch can be set beside a vectorised script's time per row (tests/FlowSolve.Benchmarks/scipy).
/// </summary>
[MemoryDiagnoser]
public class CsvCellBenchmarks
{
    private const int Rows = 200_000;
    private byte[] _body = [];
    private int[] _cellStart = [], _cellLength = [];
    private double[] _reynolds = [], _roughness = [], _friction = [];
    private readonly byte[] _out = new byte[64 * Rows];

    [GlobalSetup]
    public void Setup()
    {
        // The rows of the comparison script: Reynolds numbers 1e4 to 1e8 and relative roughness 0 to 0.01, log-spread.
        var random = new Random(20261204);
        var text = new System.Text.StringBuilder();
        var starts = new List<int>();
        var lengths = new List<int>();
        _reynolds = new double[Rows];
        _roughness = new double[Rows];
        _friction = new double[Rows];
        for (int i = 0; i < Rows; i++)
        {
            string re = Math.Pow(10, 4 + 4 * random.NextDouble()).ToString("R", CultureInfo.InvariantCulture);
            string r = (random.NextDouble() < 0.1 ? 0 : Math.Pow(10, -6 + 4 * random.NextDouble())).ToString("R", CultureInfo.InvariantCulture);
            starts.Add(text.Length); lengths.Add(re.Length); text.Append(re).Append(',');
            starts.Add(text.Length); lengths.Add(r.Length); text.Append(r).Append('\n');
        }
        _body = System.Text.Encoding.ASCII.GetBytes(text.ToString());
        _cellStart = starts.ToArray();
        _cellLength = lengths.ToArray();
        Parse();
        Solve();
    }

    /// <summary>Both cells of every row parsed (per row: divide the mean by 200 000).</summary>
    [Benchmark]
    public double Parse()
    {
        var body = _body.AsSpan();
        for (int i = 0; i < Rows; i++)
        {
            _reynolds[i] = double.Parse(body.Slice(_cellStart[2 * i], _cellLength[2 * i]), NumberStyles.Float, CultureInfo.InvariantCulture);
            _roughness[i] = double.Parse(body.Slice(_cellStart[2 * i + 1], _cellLength[2 * i + 1]), NumberStyles.Float, CultureInfo.InvariantCulture);
        }
        return _reynolds[Rows - 1];
    }

    /// <summary>Every row's friction factor by the exact span solve.</summary>
    [Benchmark]
    public double Solve()
    {
        ColebrookWhite.Solve(_reynolds, _roughness, _friction);
        return _friction[Rows - 1];
    }

    /// <summary>Every answer written as UTF-8 with the round-trip format, one per line.</summary>
    [Benchmark]
    public int Format()
    {
        var output = _out.AsSpan();
        int at = 0;
        for (int i = 0; i < Rows; i++)
        {
            _friction[i].TryFormat(output[at..], out int written, "R", CultureInfo.InvariantCulture);
            at += written;
            output[at++] = (byte)'\n';
        }
        return at;
    }

    /// <summary>All three, as one core of a batch would do them.</summary>
    [Benchmark(Baseline = true)]
    public int ParseSolveFormat()
    {
        Parse();
        Solve();
        return Format();
    }
}
