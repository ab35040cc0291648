using System.Text;

namespace FlowSolve.Api.Tests.Samples;

/// <summary>Every request in samples/scenario/*.http, sent to a real FlowSolve process as an editor would send it.</summary>
public sealed class HttpRequestFilesTests(LiveService service) : IClassFixture<LiveService>
{
    private static string Folder => Path.Combine(LiveService.RepositoryRoot, "samples", "scenario");

    public static TheoryData<string> Files() => [.. Directory.GetFiles(Folder, "*.http").Select(f => Path.GetFileName(f)).Order()];

    private sealed record Request(string Method, string Url, Dictionary<string, string> Headers, string? Body);

    /// <summary>The .http format as the common editors read it: @name = value variables, requests separated by ###,
    /// a request line, headers up to a blank line, then the body (a line "&lt; ./file" sends that file).</summary>
    private static List<Request> Parse(string path, string baseUrl)
    {
        var variables = new Dictionary<string, string>();
        var requests = new List<Request>();
        var blocks = new List<List<string>> { new() };
        foreach (string line in File.ReadAllLines(path))
        {
            if (line.StartsWith("###", StringComparison.Ordinal)) { blocks.Add([]); continue; }
            blocks[^1].Add(line);
        }
        foreach (var block in blocks)
        {
            var lines = block.Where(l => !l.TrimStart().StartsWith('#')).ToList();
            foreach (var v in lines.Where(l => l.StartsWith('@')))
            {
                var parts = v[1..].Split('=', 2);
                variables[parts[0].Trim()] = parts[1].Trim();
            }
            lines = lines.Where(l => !l.StartsWith('@')).SkipWhile(string.IsNullOrWhiteSpace).ToList();
            if (lines.Count == 0) continue;
            string Expand(string s) => variables.Aggregate(s, (acc, v) => acc.Replace("{{" + v.Key + "}}", v.Key == "base" ? baseUrl : v.Value));
            var first = lines[0].Split(' ', 2);
            var headers = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
            int i = 1;
            for (; i < lines.Count && lines[i].Trim().Length > 0; i++)
            {
                var h = lines[i].Split(':', 2);
                headers[h[0].Trim()] = h[1].Trim();
            }
            string body = string.Join("\n", lines.Skip(i + 1)).Trim();
            if (body.StartsWith("< ", StringComparison.Ordinal))
                body = File.ReadAllText(Path.Combine(Path.GetDirectoryName(path)!, body[2..].Trim()));
            requests.Add(new Request(first[0], Expand(first[1].Trim()), headers, body.Length > 0 ? body : null));
        }
        return requests;
    }

    [Theory]
    [MemberData(nameof(Files))]
    public async Task Send_EveryRequest_Answers(string file)
    {
        var requests = Parse(Path.Combine(Folder, file), service.BaseUrl);
        Assert.NotEmpty(requests);
        foreach (var r in requests)
        {
            using var message = new HttpRequestMessage(new HttpMethod(r.Method), r.Url);
            if (r.Body is not null)
                message.Content = new StringContent(r.Body, Encoding.UTF8, r.Headers.GetValueOrDefault("Content-Type", "application/json"));
            using var response = await service.Client.SendAsync(message, TestContext.Current.CancellationToken);
            string answer = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
            Assert.True(response.IsSuccessStatusCode, $"{file}: {r.Method} {r.Url} answered {(int)response.StatusCode}: {answer}");
            if (response.Content.Headers.ContentType?.MediaType == "text/csv")
            {
                var rows = answer.Split('\n', StringSplitOptions.RemoveEmptyEntries).Skip(1).ToList();
                Assert.NotEmpty(rows);
                Assert.All(rows, row => Assert.True(row.Split(',')[1] == "200", $"{file}: {r.Url}: {row}"));
            }
            else if (r.Url.Contains("/v1/batch/", StringComparison.Ordinal))
            {
                using var json = System.Text.Json.JsonDocument.Parse(answer);
                Assert.All(json.RootElement.EnumerateArray(), row => Assert.Equal(200, row.GetProperty("status").GetInt32()));
            }
        }
    }
}
