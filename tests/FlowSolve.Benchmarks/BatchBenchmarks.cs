using System.Text;
using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Pipes;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Benchmarks;

/// <summary>
/// Time per row of a pipe head-loss batch through the in-memory service (CSV in and out, JSON in and out), beside the
/// library's own head-loss call on the same rows, measured side by side in one run. The same CSV with every cell quoted
/// takes the text path (each row written as JSON and bound from it, the only path before the direct row path), so the
/// two paths are compared in one run. A friction-factor batch asking only for frictionFactor stands beside the library's
/// friction call on the same rows.
/// </summary>
/// <remarks><para>Every batch benchmark posts request bytes encoded once, in the setup (UTF-8, with the same content
/// type as a client sends), and reads the answer's bytes as they stream in, into one buffer reused from call to call,
/// answering their count: the client neither re-encodes the request nor decodes the answer to a string on every call,
/// work the floor (<see cref="LibraryPlusCsv"/>) does not do either. The floor stays as it was.</para>
/// <para>The pipe rows share their roughness, loss coefficient and fluid, as a study of one network's pipes does;
/// <see cref="BatchCsvNoRepeats"/> gives every row its own, so what a worker remembers from row to row (a column's last
/// cell, recently formatted numbers) is measured both ways.</para></remarks>
[MemoryDiagnoser]
public class BatchBenchmarks
{
    private const int Rows = 10_000;
    private WebApplicationFactory<global::Program> _factory = null!;
    private HttpClient _client = null!;
    private string _csv = "";
    private string _quoted = "";
    private string _frictionCsv = "";
    private string _variedCsv = "";
    private readonly double[] _reynolds = new double[Rows];
    private readonly double[] _roughness = new double[Rows];
    private string _json = "";
    private byte[] _csvBytes = [], _quotedBytes = [], _frictionBytes = [], _variedBytes = [], _jsonBytes = [];
    /// <summary>Where every batch benchmark reads its answer into (the bytes are counted, not kept).</summary>
    private readonly byte[] _answer = new byte[1 << 16];
    private static readonly System.Net.Http.Headers.MediaTypeHeaderValue CsvType = new("text/csv") { CharSet = "utf-8" };
    private static readonly System.Net.Http.Headers.MediaTypeHeaderValue JsonType = new("application/json") { CharSet = "utf-8" };
    private readonly PipeGeometry[] _pipes = new PipeGeometry[Rows];
    private readonly double[] _flows = new double[Rows];
    private readonly FlowSolve.Api.Pipes.PipeHeadLossRequest[] _requests = new FlowSolve.Api.Pipes.PipeHeadLossRequest[Rows];
    private readonly FlowSolve.Api.Pipes.PipeHeadLossCalculation _headLoss = new();
    private static readonly FluidProperties Water = new(1.0034e-6, 998.2);

    [GlobalSetup]
    public void Setup()
    {
        Environment.SetEnvironmentVariable("FlowSolve__Logging__Level", "Warning");
        _factory = new WebApplicationFactory<global::Program>();
        _client = _factory.CreateClient();
        var random = new Random(7);
        var csv = new StringBuilder("flow,diameter,length,roughness,minorLossCoefficient,kinematicViscosity,density\n");
        var json = new StringBuilder("[");
        for (int i = 0; i < Rows; i++)
        {
            double d = 0.1 + 0.9 * random.NextDouble(), q = 0.02 + 0.5 * random.NextDouble() * d * d, l = 100 + 900 * random.NextDouble();
            _pipes[i] = new PipeGeometry(l, d, 0.00026, 2);
            _flows[i] = q;
            _requests[i] = new FlowSolve.Api.Pipes.PipeHeadLossRequest(q, d, l, Roughness: 0.00026, MinorLossCoefficient: 2,
                KinematicViscosity: 1.0034e-6, Density: 998.2);
            FormattableString row = $"{q},{d},{l},0.00026,2,1.0034e-6,998.2\n";
            csv.Append(row.ToString(System.Globalization.CultureInfo.InvariantCulture));
            json.Append(i == 0 ? "" : ",").Append(System.Globalization.CultureInfo.InvariantCulture,
                $"{{\"flow\":{q},\"diameter\":{d},\"length\":{l},\"roughness\":0.00026,\"minorLossCoefficient\":2,\"kinematicViscosity\":1.0034e-6,\"density\":998.2}}");
        }
        _csv = csv.ToString();
        // The same pipes with a roughness, loss coefficient and fluid of their own: no column repeats a cell.
        var own = new Random(11); // its own generator: the friction rows below stay as they were
        var varied = new StringBuilder("flow,diameter,length,roughness,minorLossCoefficient,kinematicViscosity,density\n");
        foreach (var line in _csv.Split('\n').Skip(1).Where(l => l.Length > 0))
        {
            var cells = line.Split(',');
            FormattableString row = $"{cells[0]},{cells[1]},{cells[2]},{0.00005 + 0.0005 * own.NextDouble():R},{4 * own.NextDouble():R},{(0.8 + 0.6 * own.NextDouble()) * 1e-6:R},{995 + 5 * own.NextDouble():R}\n";
            varied.Append(row.ToString(System.Globalization.CultureInfo.InvariantCulture));
        }
        _variedCsv = varied.ToString();
        _quoted = string.Join("\n", _csv.Split('\n').Select(line => line.Length == 0 ? line : "\"" + line.Replace(",", "\",\"") + "\""));
        var friction = new StringBuilder("reynolds,relativeRoughness\n");
        for (int i = 0; i < Rows; i++)
        {
            // Spread as a study of many pipes is: Re 1e4 to 1e8 log-uniform, e/D 0 to 0.01.
            _reynolds[i] = Math.Pow(10, 4 + 4 * random.NextDouble());
            _roughness[i] = 0.01 * random.NextDouble();
            FormattableString row = $"{_reynolds[i]:R},{_roughness[i]:R}\n";
            friction.Append(row.ToString(System.Globalization.CultureInfo.InvariantCulture));
        }
        _frictionCsv = friction.ToString();
        _json = json.Append(']').ToString();
        (_csvBytes, _quotedBytes, _frictionBytes, _variedBytes, _jsonBytes) = (Encoding.UTF8.GetBytes(_csv), Encoding.UTF8.GetBytes(_quoted),
            Encoding.UTF8.GetBytes(_frictionCsv), Encoding.UTF8.GetBytes(_variedCsv), Encoding.UTF8.GetBytes(_json));
    }

    /// <summary>Posts bytes encoded in the setup and counts the answer's bytes as they arrive.</summary>
    private async Task<int> Post(string route, byte[] body, System.Net.Http.Headers.MediaTypeHeaderValue type)
    {
        using var content = new ByteArrayContent(body);
        content.Headers.ContentType = type;
        using var request = new HttpRequestMessage(HttpMethod.Post, route) { Content = content };
        using var response = await _client.SendAsync(request, HttpCompletionOption.ResponseHeadersRead);
        await using var stream = await response.Content.ReadAsStreamAsync();
        int length = 0;
        for (int read; (read = await stream.ReadAsync(_answer)) > 0;) length += read;
        return length;
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _client.Dispose();
        _factory.Dispose();
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Rows)]
    public double LibraryHeadLoss()
    {
        double sum = 0;
        for (int i = 0; i < Rows; i++) sum += PipeHeadLoss.Compute(_pipes[i], Water, _flows[i]).HeadLoss;
        return sum;
    }

    /// <summary>The endpoint's own handler on bound requests: validation, the Core call and the response record with
    /// its validity, warnings and assumptions, without HTTP, parsing or serialisation.</summary>
    [Benchmark(OperationsPerInvoke = Rows)]
    public int Handler()
    {
        int n = 0;
        for (int i = 0; i < Rows; i++)
            n += _headLoss.Solve(_requests[i], FlowSolve.Api.Hosting.CalculationContext.Plain).Answer is not null ? 1 : 0;
        return n;
    }

    /// <summary>The floor a CSV batch cannot go below: split each row of the same CSV text and parse its seven cells,
    /// call the library, and write a row of 23 round-trip numbers (as many as a head-loss batch row carries: the
    /// library's values and the echoed inputs) with invariant culture. No HTTP, binding, validation or response record.</summary>
    [Benchmark(OperationsPerInvoke = Rows)]
    public int LibraryPlusCsv()
    {
        var line = new StringBuilder(512);
        var culture = System.Globalization.CultureInfo.InvariantCulture;
        int written = 0;
        var text = _csv.AsSpan();
        text = text[(text.IndexOf('\n') + 1)..]; // header
        Span<double> cells = stackalloc double[7];
        while (text.Length > 0)
        {
            int end = text.IndexOf('\n');
            var row = end < 0 ? text : text[..end];
            text = end < 0 ? default : text[(end + 1)..];
            int k = 0;
            foreach (var range in row.Split(','))
                cells[k++] = double.Parse(row[range], System.Globalization.NumberStyles.Float, culture);
            var r = PipeHeadLoss.Compute(new PipeGeometry(cells[2], cells[1], cells[3], cells[4]), new FluidProperties(cells[5], cells[6]), cells[0]);
            var st = r.State;
            line.Clear();
            Span<double> values = [st.HeadLoss, st.FrictionHeadLoss, st.MinorHeadLoss, r.PressureDrop ?? 0, r.ElevationRise, r.TotalHead,
                r.TotalPressureDifference ?? 0, st.Flow, st.Diameter, st.Velocity, st.VelocityHead, st.Reynolds, st.RelativeRoughness,
                st.FrictionFactor, cells[2], cells[3], cells[4], cells[5], cells[6], st.FrictionIterations, 0.0, st.HeadLoss, st.FrictionHeadLoss];
            foreach (double v in values) line.Append(culture, $"{v:R}").Append(',');
            written += line.Length;
        }
        return written;
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public async Task<int> BatchCsv()
    {
        return await Post("/v1/batch/pipes/head-loss", _csvBytes, CsvType);
    }

    /// <summary>The same pipes with every cell of every row its own (no column repeats a value from row to row), so
    /// that nothing a worker remembers from the row before applies.</summary>
    [Benchmark(OperationsPerInvoke = Rows)]
    public async Task<int> BatchCsvNoRepeats()
    {
        return await Post("/v1/batch/pipes/head-loss", _variedBytes, CsvType);
    }

    /// <summary>The same rows with every cell quoted: the text path, each row written as JSON and bound from it.</summary>
    [Benchmark(OperationsPerInvoke = Rows)]
    public async Task<int> BatchCsvTextPath()
    {
        return await Post("/v1/batch/pipes/head-loss", _quotedBytes, CsvType);
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public double LibraryFriction()
    {
        double sum = 0;
        for (int i = 0; i < Rows; i++) sum += FlowSolve.Core.Friction.DarcyFriction.Compute(_reynolds[i], _roughness[i]).FrictionFactor;
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public async Task<int> FrictionBatchCsvSelect()
    {
        return await Post("/v1/batch/friction-factor?select=frictionFactor", _frictionBytes, CsvType);
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public async Task<int> FrictionBatchCsvAll()
    {
        return await Post("/v1/batch/friction-factor", _frictionBytes, CsvType);
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public async Task<int> BatchJson()
    {
        return await Post("/v1/batch/pipes/head-loss", _jsonBytes, JsonType);
    }
}
