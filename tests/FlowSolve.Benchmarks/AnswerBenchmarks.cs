using System.Buffers;
using System.Text.Encodings.Web;
using System.Text.Json;
using BenchmarkDotNet.Attributes;
using FlowSolve.Api.Friction;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Pipes;

namespace FlowSolve.Benchmarks;

/// <summary>
/// Serialising a calculation's 200 answer into a buffer, as <see cref="JsonAnswer"/> does: with options that carry the
/// HTTP pipeline's relaxed encoder (System.Text.Json then walks the generated metadata property by property) against
/// the same options without an encoder (it then runs the generated straight-line writer), the writer keeping the relaxed
/// encoder in both, so the bytes are the same. The friction-factor GET's answer (1.7 KB) and the pipe-flow POST's (2 KB).
/// </summary>
[MemoryDiagnoser]
public class AnswerBenchmarks
{
    private readonly ArrayBufferWriter<byte> _buffer = new(8192);
    private Utf8JsonWriter _writer = null!;
    private JsonSerializerOptions _withEncoder = null!;
    private JsonSerializerOptions _withoutEncoder = null!;
    private object _friction = null!;
    private object _pipeFlow = null!;
    private double[] _frictionNumbers = [];

    [GlobalSetup]
    public void Setup()
    {
        JsonSetup.UseGenerated(FlowSolve.Api.ApiJsonContext.Default);
        _withEncoder = JsonSetup.Configure(new JsonSerializerOptions(JsonSerializerDefaults.Web) { Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping });
        _withEncoder.MakeReadOnly();
        _withoutEncoder = new JsonSerializerOptions(_withEncoder) { Encoder = null };
        _withoutEncoder.MakeReadOnly();
        _writer = new Utf8JsonWriter(_buffer, new JsonWriterOptions { Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping, SkipValidation = true });
        _friction = new FrictionFactorCalculation().Solve(new FrictionFactorRequest(Reynolds: 75000, RelativeRoughness: 0.005), CalculationContext.Plain).Answer!;
        _pipeFlow = PipeFlow.Solve(new PipeFlowRequest(8, 0.3, 1200, Roughness: 0.00026, Temperature: 15), CalculationContext.Plain).Answer!;
        if (!Write(_friction, _withEncoder).SequenceEqual(Write(_friction, _withoutEncoder)) ||
            !Write(_pipeFlow, _withEncoder).SequenceEqual(Write(_pipeFlow, _withoutEncoder)))
            throw new InvalidOperationException("the two option sets wrote different bytes");
        using var answer = JsonDocument.Parse(Write(_friction, _withoutEncoder));
        _frictionNumbers = Numbers(answer.RootElement).ToArray();
    }

    private static IEnumerable<double> Numbers(JsonElement e) => e.ValueKind switch
    {
        JsonValueKind.Number => [e.GetDouble()],
        JsonValueKind.Object => e.EnumerateObject().SelectMany(p => Numbers(p.Value)),
        JsonValueKind.Array => e.EnumerateArray().SelectMany(Numbers),
        _ => [],
    };

    private byte[] Write(object value, JsonSerializerOptions options)
    {
        Serialize(value, options);
        return _buffer.WrittenSpan.ToArray();
    }

    private int Serialize(object value, JsonSerializerOptions options)
    {
        _buffer.ResetWrittenCount();
        _writer.Reset(_buffer);
        JsonSerializer.Serialize(_writer, value, value.GetType(), options);
        _writer.Flush();
        return _buffer.WrittenCount;
    }

    [Benchmark(Baseline = true)]
    public int FrictionWithEncoder() => Serialize(_friction, _withEncoder);

    [Benchmark]
    public int FrictionWithoutEncoder() => Serialize(_friction, _withoutEncoder);

    [Benchmark]
    public int PipeFlowWithEncoder() => Serialize(_pipeFlow, _withEncoder);

    [Benchmark]
    public int PipeFlowWithoutEncoder() => Serialize(_pipeFlow, _withoutEncoder);

    /// <summary>Only the friction answer's numbers (every JSON number in it, as doubles), written as a JSON array: the
    /// share of the serialisation that is shortest round-trip number formatting.</summary>
    [Benchmark]
    public int FrictionNumbersOnly()
    {
        _buffer.ResetWrittenCount();
        _writer.Reset(_buffer);
        _writer.WriteStartArray();
        foreach (double x in _frictionNumbers) _writer.WriteNumberValue(x);
        _writer.WriteEndArray();
        _writer.Flush();
        return _buffer.WrittenCount;
    }

    /// <summary>The handlers that build those answers (validation, solve, validity, warnings, assumptions), for scale.</summary>
    [Benchmark]
    public object FrictionHandler() => Friction.Solve(new FrictionFactorRequest(Reynolds: 75000, RelativeRoughness: 0.005), CalculationContext.Plain).Answer!;

    private static readonly FrictionFactorCalculation Friction = new();

    private static readonly PipeFlowCalculation PipeFlow = new();

    [Benchmark]
    public object PipeFlowHandler() => PipeFlow.Solve(new PipeFlowRequest(8, 0.3, 1200, Roughness: 0.00026, Temperature: 15), CalculationContext.Plain).Answer!;

    /// <summary>The guard every answer passes (finite numbers, warnings for strict=true): a walk over the whole answer.</summary>
    [Benchmark]
    public object? FrictionReview() => CalculationGuard.Review("friction-factor", _friction, strict: false);

    /// <summary>A spreadsheet cell's text from the answer: the compiled column reader of the primary output.</summary>
    [Benchmark]
    public string FrictionTextCell()
    {
        var cell = new System.Text.StringBuilder(24);
        FrictionColumn.WriteText(_friction, cell);
        return cell.ToString();
    }

    private static readonly ResponseColumn FrictionColumn = new CalculationDescriptor("friction-factor", "frictionFactor", typeof(FrictionFactorRequest),
        typeof(FrictionFactorResponse), _ => null!).Columns.Single(c => c.Name == "frictionFactor");

    /// <summary>The ETag of a GET (canonical request hashed with the build), computed on every cacheable GET.</summary>
    [Benchmark]
    public string CacheTag() => Cache.Tag(TagRequest);

    private static readonly AnswerCache Cache = new("build/", 86400);

    private static readonly Microsoft.AspNetCore.Http.HttpRequest TagRequest = MakeRequest();

    private static Microsoft.AspNetCore.Http.HttpRequest MakeRequest()
    {
        var request = new Microsoft.AspNetCore.Http.DefaultHttpContext().Request;
        request.Path = "/v1/friction-factor";
        request.QueryString = new Microsoft.AspNetCore.Http.QueryString("?reynolds=75000&relativeRoughness=0.005&format=text");
        return request;
    }
}
