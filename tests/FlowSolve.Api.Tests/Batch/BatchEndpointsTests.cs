using System.Net.Http.Json;
using System.Text;
using System.Text.Json;

namespace FlowSolve.Api.Tests.Batch;

public sealed class BatchEndpointsTests(ApiFixture api)
{
    private async Task<(int Status, string? ContentType, string Text)> Post(string url, string body, string contentType)
    {
        using var content = new StringContent(body, Encoding.UTF8, contentType);
        using var response = await api.Client.PostAsync(url, content, TestContext.Current.CancellationToken);
        return ((int)response.StatusCode, response.Content.Headers.ContentType?.MediaType,
            await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
    }

    [Fact]
    public async Task Json_MixedRows_GoodRowsIdenticalToSingleCalls_BadRowsExplained()
    {
        object[] rows =
        [
            new { reynolds = 75000, relativeRoughness = 0.005 },
            new { reynolds = -3, relativeRoughness = 0.005 },
            new { reynolds = 1e6, roughness = 0.00026, diameter = 0.3, method = "haaland" },
            new { reynolds = 2e5, relativeRoughnes = 0.001 },
            new { reynolds = 1500, relativeRoughness = 0.0 },
        ];
        var r = await Post("/v1/batch/friction-factor", JsonSerializer.Serialize(rows), "application/json");
        Assert.Equal(200, r.Status);
        var answers = JsonDocument.Parse(r.Text).RootElement.EnumerateArray().ToArray();
        Assert.Equal(rows.Length, answers.Length);
        for (int i = 0; i < rows.Length; i++)
        {
            Assert.Equal(i + 1, answers[i].GetProperty("row").GetInt32());
            var single = await api.PostJson("/v1/friction-factor", rows[i]);
            Assert.Equal(single.Status, answers[i].GetProperty("status").GetInt32());
            if (single.Status == 200)
                Assert.True(JsonElement.DeepEquals(single.Body, answers[i].GetProperty("result")), $"row {i + 1}: {single.Body} vs {answers[i].GetProperty("result")}");
            else
                Assert.True(JsonElement.DeepEquals(single.Body.GetProperty("errors"), answers[i].GetProperty("problem").GetProperty("errors")), $"row {i + 1}: {single.Body} vs {answers[i]}");
        }
        Assert.Contains("reynolds", answers[1].GetProperty("error").GetString());
        Assert.Contains("relativeRoughnes", answers[3].GetProperty("error").GetString());
    }

    [Fact]
    public async Task Csv_MixedRows_KeepOrderAndMatchSingleCalls()
    {
        const string csv = "reynolds,relativeRoughness,method\r\n75000,0.005,\r\nabc,0.01,\r\n1e6,0,serghides\r\n\r\n3000,0.001,\r\n";
        var r = await Post("/v1/batch/friction-factor", csv, "text/csv");
        Assert.Equal(200, r.Status);
        Assert.Equal("text/csv", r.ContentType);
        var lines = r.Text.Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        var header = lines[0].Split(',');
        Assert.Equal(["row", "httpStatus", "error"], header[..3]);
        int ff = Array.IndexOf(header, "frictionFactor");
        Assert.Equal(5, lines.Length); // header + 4 cases; the blank line is skipped

        var expected = new[] { "reynolds=75000&relativeRoughness=0.005", null, "reynolds=1e6&relativeRoughness=0&method=serghides", "reynolds=3000&relativeRoughness=0.001" };
        for (int i = 0; i < expected.Length; i++)
        {
            var cells = lines[i + 1].Split(',');
            Assert.Equal((i + 1).ToString(), cells[0]);
            if (expected[i] is null)
            {
                Assert.Equal("400", cells[1]);
                Assert.StartsWith("reynolds:", cells[2].TrimStart('"')); // quoted: the message holds a comma
                continue;
            }
            var single = await api.GetJson("/v1/friction-factor?" + expected[i]);
            Assert.Equal("200", cells[1]);
            Assert.Equal(single.Body.GetProperty("frictionFactor").GetRawText(), cells[ff]);
        }
        Assert.Contains("transitional-flow", lines[4]);
    }

    [Fact]
    public async Task UnknownCalculation_404Problem()
    {
        var r = await api.PostRaw("/v1/batch/no-such-thing", "[]", "application/json");
        Assert.Equal(404, r.Status);
        Assert.Equal("application/problem+json", r.ContentType);
    }

    [Fact]
    public async Task NotAnArray_400NamesBody() =>
        ProblemAssert.NamesField(await api.PostRaw("/v1/batch/friction-factor", """{"reynolds":1}""", "application/json"), 400, "body");

    [Fact]
    public async Task WrongContentType_415()
    {
        var r = await api.PostRaw("/v1/batch/friction-factor", "x", "text/plain");
        Assert.Equal(415, r.Status);
    }
}
