using System.Globalization;
using System.Net;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using CsCheck;

namespace FlowSolve.Api.Tests.Reliability;

/// <summary>
/// Property-based fuzzing of every documented calculation with random and hostile values: every answer must be a 2xx
/// with finite numbers and bounded iterations, or a 4xx problem body that says what is wrong (naming the field for a
/// 400); never a 5xx, never a hang.
/// </summary>
public sealed class FuzzTests(ApiFixture api)
{
    private const int Iterations = 150;

    private static readonly string[] HostileNumbers =
    [
        "NaN", "Infinity", "-Infinity", "1e308", "1e309", "-1e309", "-0", "4.9e-324", "2.2e-308", "0", "-1", "1,5", "abc", "",
        "0x10", " 12 ", "1e-320", "+5", "1_000", "∞", "١٢", "9".PadRight(400, '9'), "1e15", "1e16", "-1e-300",
        "5e-324", "-5e-324", "2.2250738585072014e-308", "1.7976931348623157e308", "-1.7976931348623157e308", "1e-308",
    ];

    /// <summary>The extremes of the double range (subnormals, the largest finite values) and exact powers of ten from
    /// 1e-12 to 1e15, which straddle every validity limit of every calculation (the limits are powers of ten or lie
    /// between two of them).</summary>
    public static readonly double[] Extremes =
    [
        5e-324, -5e-324, 1e-320, 2.2250738585072014e-308, 1e-308, 1e-300, 1e300, 1e307, 1e308, -1e308,
        1.7976931348623157e308, -1.7976931348623157e308, 0, -0.0,
        .. Enumerable.Range(-12, 28).Select(e => double.Parse("1e" + e, CultureInfo.InvariantCulture)),
        .. Enumerable.Range(-12, 28).Select(e => -double.Parse("1e" + e, CultureInfo.InvariantCulture)),
    ];

    private static Gen<string> NumberText =>
        Gen.OneOf(Gen.OneOf(HostileNumbers),
            Gen.Double.Select(d => d.ToString("R", CultureInfo.InvariantCulture)),
            Gen.Double[-1e4, 1e4].Select(d => d.ToString("R", CultureInfo.InvariantCulture)),
            Gen.Int[-6, 9].Select(e => Math.Pow(10, e).ToString("R", CultureInfo.InvariantCulture)));

    private static Gen<string> AnyText => Gen.OneOf(Gen.String[0, 40], Gen.OneOf("", new string('x', 100_000), "\u0000", "\uD800", "<script>", "../../etc/passwd"));

    /// <summary>A JSON value as text: well-typed, wrongly typed, or raw literals JSON does not allow.</summary>
    private static Gen<string> JsonValue(Field field, int depth) => field.Kind switch
    {
        "number" or "integer" => Gen.OneOf(
            NumberText.Select(t => double.TryParse(t, NumberStyles.Float, CultureInfo.InvariantCulture, out var d) && double.IsFinite(d) && t.Length < 400 ? t : JsonSerializer.Serialize(t)),
            Gen.OneOf("NaN", "1e400", "-", "null", "true", "\"12\"", "[]", "{}")),
        "boolean" => Gen.OneOf("true", "false", "\"maybe\"", "1", "null"),
        "object" when field.Properties is not null && depth < 4 => JsonObject(field.Properties, depth + 1),
        "array" when field.Items is not null && depth < 4 => JsonValue(field.Items, depth + 1).Array[0, 6].Select(items => "[" + string.Join(",", items) + "]"),
        _ => Gen.OneOf(AnyText.Select(s => JsonSerializer.Serialize(s)), Gen.OneOf("12", "null", "[]", "{}")),
    };

    private static Gen<string> JsonObject(IReadOnlyList<Field> fields, int depth) =>
        Gen.Select(Gen.Bool.Array[fields.Count], Gen.Int[0, 20], Gen.OneOf(fields.ToArray()).Select(f => JsonValue(f, depth)).SelectMany(g => g).Array[fields.Count])
            .Select((include, extra, values) =>
            {
                var parts = new List<string>();
                for (int i = 0; i < fields.Count; i++)
                    if (include[i]) parts.Add(JsonSerializer.Serialize(fields[i].Name) + ":" + values[i]);
                if (extra == 0) parts.Add("\"unexpectedField\":1");
                return "{" + string.Join(",", parts) + "}";
            });

    /// <summary>The documented example with some fields replaced by hostile values: reaches deep into the physics.</summary>
    private static Gen<string> MutatedExample(JsonNode example, IReadOnlyList<Field> fields) =>
        Gen.Select(Gen.Int[0, fields.Count - 1], Gen.Int[0, fields.Count - 1], NumberText, Gen.Bool).Select((a, b, text, remove) =>
        {
            var node = example.DeepClone().AsObject();
            foreach (var i in new[] { a, b })
            {
                var f = fields[i];
                if (remove) node.Remove(f.Name);
                else if (f.Kind is "number" or "integer" && double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var d) && double.IsFinite(d))
                    node[f.Name] = d;
                else node[f.Name] = text;
            }
            return node.ToJsonString();
        });

    private async Task<IReadOnlyList<Operation>> Operations()
    {
        var doc = JsonNode.Parse(await api.Client.GetStringAsync("/openapi/v1.json", TestContext.Current.CancellationToken))!;
        return OperationCatalog.Read(doc);
    }

    internal static async Task CheckAnswer(HttpResponseMessage response, string what)
    {
        int status = (int)response.StatusCode;
        string text = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        Assert.True(status < 500, $"{what} answered {status}: {text[..Math.Min(400, text.Length)]}");
        Assert.DoesNotContain("   at ", text);                      // no stack trace
        Assert.DoesNotContain("/work/", text);                      // no internal paths
        string? media = response.Content.Headers.ContentType?.MediaType;
        if (status is >= 200 and < 300)
        {
            if (media == "application/json")
            {
                using var json = JsonDocument.Parse(text);          // NaN or Infinity would not parse
                if (json.RootElement.ValueKind == JsonValueKind.Object && json.RootElement.TryGetProperty("iterations", out var it))
                    Assert.InRange(it.GetInt32(), 0, 500);          // every solve ends within its cap
            }
            return;
        }
        if (media == "text/plain")
        {
            Assert.StartsWith("error: ", text);
            return;
        }
        Assert.Equal("application/problem+json", media);
        using var problem = JsonDocument.Parse(text);
        Assert.Equal(status, problem.RootElement.GetProperty("status").GetInt32());
        if (status == 400)
        {
            Assert.True(problem.RootElement.TryGetProperty("errors", out var errors) && errors.EnumerateObject().Any(),
                $"{what}: 400 without a named field: {text}");
        }
        else
        {
            Assert.True(problem.RootElement.TryGetProperty("detail", out _) || problem.RootElement.TryGetProperty("title", out _));
        }
    }

    [Fact]
    public async Task EveryCalculation_EachNumberAtTheExtremesOfTheDoubleRange_AnswersFiniteOr4xx()
    {
        // Every numeric query parameter of every documented example, one at a time, at every extreme.
        foreach (var op in (await Operations()).Where(o => o.Method == "GET" && o.QueryExample.Count > 0))
        {
            var numeric = op.QueryExample.Where(kv => double.TryParse(kv.Value, NumberStyles.Float, CultureInfo.InvariantCulture, out _)).Select(kv => kv.Key).ToArray();
            foreach (var name in numeric)
            foreach (double x in Extremes)
            {
                string url = op.Path + "?" + string.Join("&", op.QueryExample.Select(kv =>
                    kv.Key + "=" + Uri.EscapeDataString(kv.Key == name ? x.ToString("R", CultureInfo.InvariantCulture) : kv.Value)));
                using var response = await api.Client.GetAsync(url, TestContext.Current.CancellationToken);
                await CheckAnswer(response, "GET " + url);
                using var text = await api.Client.GetAsync(url + "&format=text", TestContext.Current.CancellationToken);
                await CheckAnswer(text, "GET " + url + "&format=text");
            }
        }
    }

    [Fact]
    public async Task EveryCalculation_EachNumberOfTheBodyAtTheExtremes_AnswersFiniteOr4xx()
    {
        // Every numeric leaf of every documented POST example (nested ones too, such as a pump system's pipe diameter),
        // one at a time, at the extremes; a network example's many leaves are sampled (seeded, so a failure repeats).
        var random = new Random(20261204);
        double[] extremes = [5e-324, -5e-324, 1e-308, 1e-12, 1e15, 1e300, 1e308, -1e308, 1.7976931348623157e308];
        foreach (var op in (await Operations()).Where(o => o.Method == "POST" && o.BodyExample is JsonObject))
        {
            var leaves = new List<string>();
            Leaves(op.BodyExample!, "", leaves);
            var chosen = leaves.Count <= 40 ? leaves : leaves.OrderBy(_ => random.Next()).Take(40).ToList();
            foreach (var path in chosen)
            foreach (double x in extremes)
            {
                var body = op.BodyExample!.DeepClone();
                Set(body, path, x);
                using var content = new StringContent(body.ToJsonString(), Encoding.UTF8, "application/json");
                using var response = await api.Client.PostAsync(op.Path, content, TestContext.Current.CancellationToken);
                await CheckAnswer(response, $"POST {op.Path} with {path} = {x:R}");
            }
        }
    }

    private static void Leaves(JsonNode node, string path, List<string> leaves)
    {
        switch (node)
        {
            case JsonObject o:
                foreach (var (k, v) in o) if (v is not null) Leaves(v, path + "/" + k, leaves);
                break;
            case JsonArray a:
                for (int i = 0; i < a.Count; i++) if (a[i] is { } v) Leaves(v, path + "/" + i, leaves);
                break;
            case JsonValue v when v.GetValueKind() == JsonValueKind.Number:
                leaves.Add(path);
                break;
        }
    }

    private static void Set(JsonNode root, string path, double value)
    {
        var parts = path.Trim('/').Split('/');
        JsonNode node = root;
        for (int i = 0; i < parts.Length - 1; i++) node = node is JsonArray a ? a[int.Parse(parts[i], CultureInfo.InvariantCulture)]! : node[parts[i]]!;
        if (node is JsonArray array) array[int.Parse(parts[^1], CultureInfo.InvariantCulture)] = value;
        else node[parts[^1]] = value;
    }

    [Fact]
    public async Task QueryParameters_RandomAndHostile_NeverBreakTheService()
    {
        foreach (var op in (await Operations()).Where(o => o.Method == "GET" && o.Query.Count > 0))
        {
            var gen = Gen.Select(Gen.Bool.Array[op.Query.Count], Gen.OneOf(NumberText, AnyText).Array[op.Query.Count], Gen.Bool)
                .Select((include, values, fromExample) =>
                {
                    var parts = new List<string>();
                    for (int i = 0; i < op.Query.Count; i++)
                    {
                        string name = op.Query[i].Name;
                        string value = fromExample && op.QueryExample.TryGetValue(name, out var e) && !include[i] ? e : values[i];
                        if (include[i] || (fromExample && op.QueryExample.ContainsKey(name)))
                            parts.Add(Uri.EscapeDataString(name) + "=" + Uri.EscapeDataString(value.Length > 4000 ? value[..4000] : value));
                    }
                    return op.Path + "?" + string.Join("&", parts);
                });
            await gen.SampleAsync(async url =>
            {
                using var response = await api.Client.GetAsync(url, TestContext.Current.CancellationToken);
                await CheckAnswer(response, "GET " + url);
            }, iter: Iterations, threads: 1);
        }
    }

    [Fact]
    public async Task JsonBodies_RandomAndHostile_NeverBreakTheService()
    {
        foreach (var op in (await Operations()).Where(o => o.Method == "POST" && o.Body is { Count: > 0 }))
        {
            var gen = op.BodyExample is JsonObject example
                ? Gen.OneOf(JsonObject(op.Body!, 0), MutatedExample(example, op.Body!))
                : JsonObject(op.Body!, 0);
            await gen.SampleAsync(async body =>
            {
                using var content = new StringContent(body, Encoding.UTF8, "application/json");
                using var response = await api.Client.PostAsync(op.Path, content, TestContext.Current.CancellationToken);
                await CheckAnswer(response, $"POST {op.Path} {body[..Math.Min(300, body.Length)]}");
            }, iter: Iterations, threads: 1);
        }
    }

    public static TheoryData<string, string> HostileBodies => new()
    {
        { "application/json", new string('[', 5000) + new string(']', 5000) },                     // deeply nested
        { "application/json", "{\"a\":" + new string('{', 100) + new string('}', 100) + "}" },
        { "application/json", "\"just a string\"" },
        { "application/json", "null" },
        { "application/json", "{\"reynolds\": 1e5, \"reynolds\": 2e5}" },                          // duplicate key
        { "application/json", "{}" },
        { "text/plain", "reynolds=1e5" },
        { "application/xml", "<reynolds>1e5</reynolds>" },
        { "application/x-www-form-urlencoded", "reynolds=1e5" },
        { "text/csv", "reynolds\n1e5" },
    };

    [Theory]
    [MemberData(nameof(HostileBodies))]
    public async Task HostileBodiesAndContentTypes_AnswerProblems(string contentType, string body)
    {
        foreach (var op in (await Operations()).Where(o => o.Method == "POST"))
        {
            using var content = new StringContent(body, Encoding.UTF8, contentType);
            using var response = await api.Client.PostAsync(op.Path, content, TestContext.Current.CancellationToken);
            await CheckAnswer(response, $"POST {op.Path} as {contentType}");
            Assert.NotEqual(HttpStatusCode.OK, response.StatusCode == HttpStatusCode.OK && body == "{}" ? HttpStatusCode.OK : HttpStatusCode.Accepted);
        }
    }

    [Fact]
    public async Task InvalidUtf8Body_AnswersProblem()
    {
        foreach (var op in (await Operations()).Where(o => o.Method == "POST"))
        {
            using var content = new ByteArrayContent([0x7B, 0x22, 0xC3, 0x28, 0xFF, 0xFE, 0x22, 0x3A, 0x31, 0x7D]);
            content.Headers.ContentType = new("application/json");
            using var response = await api.Client.PostAsync(op.Path, content, TestContext.Current.CancellationToken);
            await CheckAnswer(response, $"POST {op.Path} invalid UTF-8");
            Assert.Equal(HttpStatusCode.BadRequest, response.StatusCode);
        }
    }

    [Fact]
    public async Task BatchRowsRandomAndHostile_NeverBreakTheService()
    {
        var ops = (await Operations()).Where(o => o.Method == "POST" && o.Body is { Count: > 0 } && !o.Path.Contains("batch")).ToArray();
        foreach (var op in ops)
        {
            string calculation = op.Path["/v1/".Length..];
            await JsonObject(op.Body!, 0).Array[1, 8].SampleAsync(async rows =>
            {
                using var content = new StringContent("[" + string.Join(",", rows) + "]", Encoding.UTF8, "application/json");
                using var response = await api.Client.PostAsync("/v1/batch/" + calculation, content, TestContext.Current.CancellationToken);
                Assert.True((int)response.StatusCode < 500);
                if (response.StatusCode != HttpStatusCode.OK) return; // not a registered calculation, or the whole body refused
                using var json = JsonDocument.Parse(await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
                Assert.Equal(rows.Length, json.RootElement.GetArrayLength());
                foreach (var row in json.RootElement.EnumerateArray())
                    Assert.True(row.GetProperty("status").GetInt32() < 500, row.ToString());
            }, iter: 40, threads: 1);
        }
    }
}
