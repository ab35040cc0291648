using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Tests.Batch;

/// <summary>
/// A batch row answers exactly what the single call answers: for every calculation in the catalogue that takes rows,
/// random cases made from its body example (every number scaled by a random factor within 2 percent, seeded) are sent
/// one by one and as one JSON batch and one CSV batch; each JSON row's result equals the single answer (the same fields,
/// every number digit for digit, every string by value), and each CSV row's scalar number cells equal the single
/// answer's numbers as written in JSON. Rows that are refused are refused alike (status and the fields named).
/// </summary>
public sealed class BatchIdentityTests(ApiFixture api)
{
    public static TheoryData<string> RowCalculations()
    {
        var data = new TheoryData<string>();
        foreach (var c in Catalogue.All.Where(c => c.Info.Rows && c.BodyExample is not null)) data.Add(c.Info.Name);
        return data;
    }

    private static JsonNode Perturb(JsonNode node, Random random) => node switch
    {
        JsonObject o => new JsonObject(o.Select(p => KeyValuePair.Create(p.Key, p.Value is null ? null : (JsonNode?)Perturb(p.Value, random)))),
        JsonArray a => new JsonArray(a.Select(v => v is null ? null : (JsonNode?)Perturb(v, random)).ToArray()),
        JsonValue v when v.TryGetValue(out double d) && d != 0 && !(v.TryGetValue(out int _) && Math.Abs(d) < 16) =>
            JsonValue.Create(d * (1 + 0.02 * (2 * random.NextDouble() - 1))),
        _ => node.DeepClone(),
    };

    /// <summary>The leaves of an object as dotted names, or null when it holds a list (a CSV row cannot carry it).</summary>
    private static List<(string Name, string Text)>? Flatten(JsonObject o, string prefix = "")
    {
        var cells = new List<(string, string)>();
        foreach (var (key, value) in o)
        {
            switch (value)
            {
                case null: break;
                case JsonArray: return null;
                case JsonObject inner:
                    if (Flatten(inner, prefix + key + ".") is not { } sub) return null;
                    cells.AddRange(sub);
                    break;
                default:
                    cells.Add((prefix + key, value.GetValueKind() == JsonValueKind.String ? value.GetValue<string>() : value.ToJsonString()));
                    break;
            }
        }
        return cells;
    }

    /// <summary>Equal trees: numbers by their written digits, strings by value (the two writers may escape differently).</summary>
    private static void AssertSame(JsonElement expected, JsonElement actual, string path)
    {
        Assert.True(expected.ValueKind == actual.ValueKind, $"{path}: {expected.ValueKind} against {actual.ValueKind}");
        switch (expected.ValueKind)
        {
            case JsonValueKind.Object:
                var names = expected.EnumerateObject().Select(p => p.Name).ToArray();
                Assert.Equal(names, actual.EnumerateObject().Select(p => p.Name).ToArray());
                foreach (var n in names) AssertSame(expected.GetProperty(n), actual.GetProperty(n), path + "." + n);
                break;
            case JsonValueKind.Array:
                Assert.Equal(expected.GetArrayLength(), actual.GetArrayLength());
                for (int k = 0; k < expected.GetArrayLength(); k++) AssertSame(expected[k], actual[k], $"{path}[{k}]");
                break;
            case JsonValueKind.Number:
                Assert.True(expected.GetRawText() == actual.GetRawText(), $"{path}: {expected.GetRawText()} against {actual.GetRawText()}");
                break;
            case JsonValueKind.String:
                Assert.True(expected.GetString() == actual.GetString(), $"{path}: strings differ");
                break;
        }
    }

    private async Task<string> Post(string url, string body, string contentType)
    {
        using var content = new StringContent(body, Encoding.UTF8, contentType);
        using var response = await api.Client.PostAsync(url, content, TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        return await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
    }

    [Theory]
    [MemberData(nameof(RowCalculations))]
    public async Task Every_batch_row_equals_the_single_call(string name)
    {
        var calculation = Catalogue.All.Single(c => c.Info.Name == name);
        var example = JsonSerializer.SerializeToNode(calculation.BodyExample, JsonSetup.Options)!.AsObject();
        var random = new Random(name.GetHashCode(StringComparison.Ordinal) & 0x7fffffff ^ 20261204);
        var rows = new List<JsonObject> { example };
        for (int i = 0; i < 7; i++) rows.Add(Perturb(example, random).AsObject());

        var singles = new List<(int Status, JsonElement Body)>();
        foreach (var row in rows)
        {
            var single = await api.PostRaw("/v1/" + name, row.ToJsonString(), "application/json");
            singles.Add((single.Status, single.Body));
        }
        Assert.Contains(singles, s => s.Status == 200);

        // JSON rows: the whole result, digit for digit.
        string json = await Post("/v1/batch/" + name, new JsonArray(rows.Select(r => (JsonNode)r.DeepClone()).ToArray()).ToJsonString(), "application/json");
        var answers = JsonDocument.Parse(json).RootElement.EnumerateArray().ToArray();
        Assert.Equal(rows.Count, answers.Length);
        for (int i = 0; i < rows.Count; i++)
        {
            Assert.Equal(singles[i].Status, answers[i].GetProperty("status").GetInt32());
            if (singles[i].Status == 200)
                AssertSame(singles[i].Body, answers[i].GetProperty("result"), $"{name} row {i + 1}");
            else
                Assert.True(JsonElement.DeepEquals(singles[i].Body.GetProperty("errors"), answers[i].GetProperty("problem").GetProperty("errors")));
        }

        // CSV rows, where the request has no list: every scalar number of the single answer, as the cell writes it.
        var flat = rows.Select(r => Flatten(r)).ToList();
        if (flat.Any(f => f is null)) return;
        var names = flat.SelectMany(f => f!.Select(c => c.Name)).Distinct().ToArray();
        var csv = new StringBuilder(string.Join(',', names)).Append("\r\n");
        foreach (var f in flat)
            csv.Append(string.Join(',', names.Select(n => f!.FirstOrDefault(c => c.Name == n).Text ?? ""))).Append("\r\n");
        var lines = (await Post("/v1/batch/" + name, csv.ToString(), "text/csv")).Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        var header = CsvRecord.Cells(lines[0]);
        Assert.Equal(rows.Count + 1, lines.Length);
        int compared = 0;
        for (int i = 0; i < rows.Count; i++)
        {
            var cells = CsvRecord.Cells(lines[i + 1]);
            Assert.Equal(singles[i].Status.ToString(CultureInfo.InvariantCulture), cells[1]);
            if (singles[i].Status != 200) continue;
            foreach (var property in singles[i].Body.EnumerateObject().Where(p => p.Value.ValueKind == JsonValueKind.Number))
            {
                int column = Array.IndexOf(header, property.Name);
                if (column < 0) continue;
                Assert.Equal(property.Value.GetRawText(), cells[column]);
                compared++;
            }
        }
        Assert.True(compared > 0, $"{name}: no number compared in CSV");
    }
}
