using System.Globalization;
using System.Net;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Mvc.Testing;

namespace FlowSolve.Api.Tests.Batch;

/// <summary>
/// A plain CSV batch (no quoted cell) takes the direct row path: rows bound straight into the request record and solved
/// in parallel blocks. Its answer must be the answer of the text path, which every batch with a quoted cell still takes
/// (each row written as JSON and bound from it, the path the single-call identity tests hold to the single calls): the
/// same rows sent plain and with every cell quoted answer byte for byte alike, refused rows and their words included.
/// <c>select=</c> writes only the named columns, each equal to the full answer's column.
/// </summary>
public sealed class BatchRowPathTests(ApiFixture api)
{
    private static CancellationToken Ct => TestContext.Current.CancellationToken;

    public static TheoryData<string> FlatRowCalculations()
    {
        var data = new TheoryData<string>();
        foreach (var c in Catalogue.All.Where(c => c.Info.Rows && c.BodyExample is not null))
        {
            var example = JsonSerializer.SerializeToNode(c.BodyExample, JsonSetup.Options)!.AsObject();
            if (example.All(p => p.Value is not JsonObject and not JsonArray)) data.Add(c.Info.Name);
        }
        return data;
    }

    private async Task<(HttpStatusCode Status, string Text)> PostCsv(string url, string csv)
    {
        using var content = new StringContent(csv, Encoding.UTF8, "text/csv");
        using var response = await api.Client.PostAsync(url, content, Ct);
        return (response.StatusCode, await response.Content.ReadAsStringAsync(Ct));
    }

    private static string Quoted(string csv) => string.Join("\r\n", csv.Split("\r\n").Select(line =>
        line.Length == 0 ? line : string.Join(',', line.Split(',').Select(cell => "\"" + cell + "\""))));

    /// <summary>Cells that are not clean for a number field, each of which the row path must hand to the text path.</summary>
    private static readonly string[] Hostile =
        ["abc", "1e400", "-1e400", "NaN", "Infinity", "true", "FALSE", "0x10", "1.2.3", "1e", "--1", "5 5", "1_000", "\u0001"];

    /// <summary>Cells the number grammar takes but JSON writes differently (whole, signed, bare points, exponents).</summary>
    private static readonly string[] Unusual = ["+2", ".5", "3.", "4e0", "5.0", " 6 ", "\t7", "-0", "1E+2", "1e-320", "2.5e-308"];

    [Theory]
    [MemberData(nameof(FlatRowCalculations))]
    public async Task Plain_and_quoted_batches_answer_byte_for_byte_alike(string name)
    {
        var calculation = Catalogue.All.Single(c => c.Info.Name == name);
        var example = JsonSerializer.SerializeToNode(calculation.BodyExample, JsonSetup.Options)!.AsObject();
        var fields = example.Select(p => p.Key).ToList();
        var random = new Random(name.Length * 7919 + 20261204);
        string Cell(JsonNode? value)
        {
            if (value is null) return "";
            if (value.GetValueKind() == JsonValueKind.String) return value.GetValue<string>();
            if (value.GetValueKind() is JsonValueKind.True or JsonValueKind.False) return value.ToJsonString();
            double d = value.GetValue<double>();
            return random.Next(10) switch
            {
                0 => Hostile[random.Next(Hostile.Length)],
                1 => Unusual[random.Next(Unusual.Length)],
                2 => "",
                3 => d.ToString("R", CultureInfo.InvariantCulture),
                _ => (d * (1 + 0.05 * (2 * random.NextDouble() - 1))).ToString("R", CultureInfo.InvariantCulture),
            };
        }
        var csv = new StringBuilder(string.Join(',', fields)).Append("\r\n");
        for (int i = 0; i < 300; i++)
        {
            if (i % 97 == 5) csv.Append(",,\r\n"); // a blank record, skipped by both paths
            var cells = fields.Select(f => Cell(example[f])).ToList();
            if (i % 41 == 3) cells.Add("extra");
            if (i % 53 == 7) cells.RemoveAt(cells.Count - 1);
            csv.Append(string.Join(',', cells)).Append("\r\n");
        }
        string plain = csv.ToString();
        Assert.DoesNotContain('"', plain);
        var direct = await PostCsv("/v1/batch/" + name, plain);
        var text = await PostCsv("/v1/batch/" + name, Quoted(plain));
        Assert.Equal(HttpStatusCode.OK, text.Status);
        Assert.Equal(text.Status, direct.Status);
        var expected = text.Text.Split("\r\n");
        var actual = direct.Text.Split("\r\n");
        Assert.Equal(expected.Length, actual.Length);
        for (int i = 0; i < expected.Length; i++) Assert.True(expected[i] == actual[i], $"{name} line {i}:\n{expected[i]}\n{actual[i]}");
        Assert.Contains(actual, line => line.Contains(",200,", StringComparison.Ordinal));
        Assert.Contains(actual, line => line.Contains(",400,", StringComparison.Ordinal));
    }

    [Theory]
    [MemberData(nameof(FlatRowCalculations))]
    public void Direct_binding_gives_the_record_json_binding_gives_and_leaves_unclean_cells_to_it(string name)
    {
        var calculation = Catalogue.All.Single(c => c.Info.Name == name);
        var example = JsonSerializer.SerializeToNode(calculation.BodyExample, JsonSetup.Options)!.AsObject();
        var header = example.Select(p => p.Key).ToList();
        var binder = FlowSolve.Api.Batch.CsvRowBinder.For(calculation.RequestType);
        Assert.NotNull(binder);
        var plan = binder.Plan(header);
        Assert.NotNull(plan);
        var values = plan.NewValues();
        var jsonPlan = new FlowSolve.Api.Batch.Csv.HeaderPlan(header);
        var random = new Random(name.Length * 31 + 7);
        int bound = 0;
        for (int i = 0; i < 200; i++)
        {
            bool hostile = i % 4 == 3;
            var cells = header.Select(f => example[f] switch
            {
                null => "",
                var v when v.GetValueKind() == JsonValueKind.String => v.GetValue<string>(),
                var v when v.GetValueKind() is JsonValueKind.True or JsonValueKind.False => v.ToJsonString(),
                var v => random.Next(3) == 0 ? Unusual[random.Next(Unusual.Length)]
                    : (v.GetValue<double>() * (1 + 0.1 * random.NextDouble())).ToString("R", CultureInfo.InvariantCulture),
            }).ToList();
            int numberField = header.FindIndex(f => example[f]?.GetValueKind() == JsonValueKind.Number);
            if (hostile) cells[numberField] = Hostile[random.Next(Hostile.Length)];
            bool taken = plan.TryBind(Encoding.ASCII.GetBytes(string.Join(',', cells)), values, out var direct);
            if (hostile)
            {
                Assert.False(taken, $"{name}: '{cells[numberField]}' in {header[numberField]} was bound directly");
                continue;
            }
            // The text path's reading of the same cells: the row written as JSON, bound by the serializer.
            var buffer = new System.Buffers.ArrayBufferWriter<byte>();
            using (var writer = new Utf8JsonWriter(buffer)) FlowSolve.Api.Batch.Csv.WriteJson(writer, jsonPlan, cells);
            object? viaJson;
            try
            {
                viaJson = JsonSerializer.Deserialize(buffer.WrittenSpan, calculation.RequestType, JsonSetup.Options);
            }
            catch (JsonException)
            {
                Assert.False(taken, $"{name}: row {string.Join(',', cells)} bound directly but refused by JSON binding");
                continue;
            }
            Assert.True(taken, $"{name}: row {string.Join(',', cells)} left to the text path");
            Assert.Equal(viaJson, direct);
            bound++;
        }
        Assert.True(bound > 100, $"{name}: only {bound} rows bound");
    }

    [Fact]
    public async Task Many_blocks_keep_row_order_and_each_rows_own_answer()
    {
        // 5 000 rows span several parallel blocks; every 17th row is refused. Each answered row echoes its own inputs.
        var csv = new StringBuilder("reynolds,relativeRoughness\n");
        for (int i = 0; i < 5000; i++)
            csv.Append(i % 17 == 0 ? "-5" : (3000 + 11 * i).ToString(CultureInfo.InvariantCulture)).Append(',')
                .Append((i % 10 * 1e-4).ToString("R", CultureInfo.InvariantCulture)).Append('\n');
        var (status, text) = await PostCsv("/v1/batch/friction-factor", csv.ToString());
        Assert.Equal(HttpStatusCode.OK, status);
        var lines = text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(5001, lines.Length);
        var header = lines[0].Split(',');
        int reynolds = Array.IndexOf(header, "reynolds"), roughness = Array.IndexOf(header, "relativeRoughness");
        for (int i = 0; i < 5000; i++)
        {
            var cells = lines[i + 1].Split(',');
            Assert.Equal((i + 1).ToString(CultureInfo.InvariantCulture), cells[0]);
            if (i % 17 == 0)
            {
                Assert.Equal("400", cells[1]);
                Assert.StartsWith("reynolds:", cells[2], StringComparison.Ordinal);
                continue;
            }
            Assert.Equal("200", cells[1]);
            Assert.Equal(3000 + 11 * i, double.Parse(cells[reynolds], CultureInfo.InvariantCulture));
            Assert.Equal(i % 10 * 1e-4, double.Parse(cells[roughness], CultureInfo.InvariantCulture));
        }
    }

    [Fact]
    public async Task Many_windows_answer_as_the_text_path_does()
    {
        // 40 000 rows are several windows of parallel blocks, solved while the window before is written.
        string rows = FrictionRows(40_000, 40);
        Assert.DoesNotContain('"', rows);
        var direct = await PostCsv("/v1/batch/friction-factor", rows);
        var text = await PostCsv("/v1/batch/friction-factor", Quoted(rows));
        Assert.Equal(HttpStatusCode.OK, direct.Status);
        Assert.Equal(HttpStatusCode.OK, text.Status);
        var expected = text.Text.Split("\r\n");
        var actual = direct.Text.Split("\r\n");
        Assert.Equal(expected.Length, actual.Length);
        for (int i = 0; i < expected.Length; i++) Assert.True(expected[i] == actual[i], $"line {i}:\n{expected[i]}\n{actual[i]}");
        var selected = (await PostCsv("/v1/batch/friction-factor?select=frictionFactor", rows)).Text.Split("\r\n");
        Assert.Equal(expected.Length, selected.Length);
        int column = Array.IndexOf(expected[0].Split(','), "frictionFactor");
        for (int i = 1; i < expected.Length - 1; i++)
        {
            var f = CsvRecord.Cells(expected[i]);
            Assert.Equal([f[0], f[1], f[2], f[column]], CsvRecord.Cells(selected[i]));
        }
    }

    /// <summary>Friction factor rows across the whole accepted domain and beyond it, with every optional field in play.</summary>
    private static string FrictionRows(int count, int seed)
    {
        var random = new Random(seed);
        var csv = new StringBuilder("reynolds,relativeRoughness,roughness,diameter,method,laminarLimit\r\n");
        string[] edges = ["0.001", "1e15", "2000", "4000", "1999.9999", "4000.0001", "0", "-1", "1e16", "0.0009"];
        string[] roughnesses = ["0", "0.99", "1", "-0.01", "0.05", "1e-12"];
        for (int i = 0; i < count; i++)
        {
            string re = i % 9 == 0 ? edges[random.Next(edges.Length)]
                : Math.Pow(10, -3 + 18 * random.NextDouble()).ToString("R", CultureInfo.InvariantCulture);
            string rr = i % 7 == 0 ? roughnesses[random.Next(roughnesses.Length)]
                : (random.NextDouble() * 0.05).ToString("R", CultureInfo.InvariantCulture);
            string e = "", d = "", method = "", laminar = "";
            switch (i % 23)
            {
                case 1: (rr, e, d) = ("", "0.00026", "0.3"); break;
                case 2: method = "haaland"; break;
                case 3: laminar = "2300"; break;
                case 4: e = "0.0001"; break;
                case 5: rr = ""; break;
            }
            csv.Append(string.Join(',', re, rr, e, d, method, laminar)).Append("\r\n");
        }
        return csv.ToString();
    }

    [Fact]
    public async Task Select_frictionFactor_equals_the_full_answers_column_over_the_whole_domain()
    {
        string rows = FrictionRows(4000, 22);
        var full = (await PostCsv("/v1/batch/friction-factor", rows)).Text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        var (status, text) = await PostCsv("/v1/batch/friction-factor?select=frictionFactor", rows);
        Assert.Equal(HttpStatusCode.OK, status);
        var selected = text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal("row,httpStatus,error,frictionFactor", selected[0]);
        int column = Array.IndexOf(full[0].Split(','), "frictionFactor");
        Assert.Equal(full.Length, selected.Length);
        int answered = 0;
        for (int i = 1; i < full.Length; i++)
        {
            var f = CsvRecord.Cells(full[i]);
            var s = CsvRecord.Cells(selected[i]);
            Assert.Equal(4, s.Length);
            Assert.Equal(f[0], s[0]);
            Assert.Equal(f[1], s[1]);
            Assert.Equal(f[2], s[2]);
            Assert.True(f[column] == s[3], $"row {i}: {f[column]} against {s[3]}");
            if (s[1] == "200") answered++;
        }
        Assert.True(answered > 3000, $"only {answered} rows answered");
    }

    [Theory]
    [InlineData("pipes/head-loss", "headLoss,velocity,warnings")]
    [InlineData("friction-factor", "iterations,frictionFactor,regime")]
    public async Task Select_several_columns_writes_them_in_the_order_named(string name, string select)
    {
        var calculation = Catalogue.All.Single(c => c.Info.Name == name);
        var example = JsonSerializer.SerializeToNode(calculation.BodyExample, JsonSetup.Options)!.AsObject();
        var fields = example.Select(p => p.Key).ToList();
        var csv = new StringBuilder(string.Join(',', fields)).Append("\r\n");
        var random = new Random(5);
        for (int i = 0; i < 40; i++)
            csv.Append(string.Join(',', fields.Select(f => example[f]!.GetValueKind() == JsonValueKind.Number
                ? (example[f]!.GetValue<double>() * (1 + 0.1 * random.NextDouble())).ToString("R", CultureInfo.InvariantCulture)
                : example[f]!.GetValueKind() == JsonValueKind.String ? example[f]!.GetValue<string>() : example[f]!.ToJsonString()))).Append("\r\n");
        var full = (await PostCsv("/v1/batch/" + name, csv.ToString())).Text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        var (status, text) = await PostCsv($"/v1/batch/{name}?select={select}", csv.ToString());
        Assert.Equal(HttpStatusCode.OK, status);
        var selected = text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        var names = select.Split(',');
        Assert.Equal(["row", "httpStatus", "error", .. names], selected[0].Split(','));
        var header = full[0].Split(',');
        for (int i = 1; i < full.Length; i++)
        {
            var f = CsvRecord.Cells(full[i]);
            var s = CsvRecord.Cells(selected[i]);
            Assert.Equal(f[..3], s[..3]);
            for (int k = 0; k < names.Length; k++) Assert.Equal(f[Array.IndexOf(header, names[k])], s[3 + k]);
        }
    }

    [Theory]
    [InlineData("frictionFactr", "did you mean 'frictionFactor'")]
    [InlineData("frictionFactor,frictionFactor", "more than once")]
    [InlineData("frictionFactor,", "empty")]
    public async Task Select_naming_no_column_once_answers_400_naming_select(string select, string words)
    {
        var r = await api.PostRaw("/v1/batch/friction-factor?select=" + Uri.EscapeDataString(select), "reynolds,relativeRoughness\r\n1e5,0\r\n", "text/csv");
        ProblemAssert.NamesField(r, 400, "select");
        Assert.Contains(words, r.Body.GetProperty("errors").GetProperty("select")[0].GetString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Select_on_a_json_batch_answers_400_naming_select()
    {
        var r = await api.PostRaw("/v1/batch/friction-factor?select=frictionFactor", """[{"reynolds":1e5,"relativeRoughness":0}]""", "application/json");
        ProblemAssert.NamesField(r, 400, "select");
    }

    [Fact]
    public async Task Plain_batch_above_the_row_limit_answers_413_before_any_row()
    {
        using var factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b => b.UseSetting("FlowSolve:Limits:BatchRows", "3"));
        using var client = factory.CreateClient();
        // Blank records do not count: three rows pass, four do not.
        using var three = new StringContent("reynolds,relativeRoughness\n1e5,0\n,\n2e5,0\n\n3e5,0\n", Encoding.UTF8, "text/csv");
        using var ok = await client.PostAsync("/v1/batch/friction-factor", three, Ct);
        Assert.Equal(HttpStatusCode.OK, ok.StatusCode);
        using var four = new StringContent("reynolds,relativeRoughness\n1e5,0\n2e5,0\n3e5,0\n4e5,0\n", Encoding.UTF8, "text/csv");
        using var refused = await client.PostAsync("/v1/batch/friction-factor", four, Ct);
        Assert.Equal(HttpStatusCode.RequestEntityTooLarge, refused.StatusCode);
        Assert.Contains("batchRows", await refused.Content.ReadAsStringAsync(Ct), StringComparison.Ordinal);
    }

}
