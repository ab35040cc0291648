using System.Text;
using System.Text.Json.Nodes;

namespace FlowSolve.Api.Tests.Reliability;

public sealed class ConcurrencyTests(ApiFixture api)
{
    [Fact]
    public async Task ParallelIdenticalRequests_GiveBitIdenticalAnswers()
    {
        var doc = JsonNode.Parse(await api.Client.GetStringAsync("/openapi/v1.json", TestContext.Current.CancellationToken))!;
        foreach (var op in OperationCatalog.Read(doc))
        {
            Func<Task<string>> call = op.Method == "GET"
                ? async () =>
                {
                    string url = op.Path + "?" + string.Join("&", op.QueryExample.Select(kv => kv.Key + "=" + Uri.EscapeDataString(kv.Value)));
                    using var r = await api.Client.GetAsync(url, TestContext.Current.CancellationToken);
                    return (int)r.StatusCode + " " + await r.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
                }
                : async () =>
                {
                    using var content = new StringContent(op.BodyExample?.ToJsonString() ?? "{}", Encoding.UTF8, "application/json");
                    using var r = await api.Client.PostAsync(op.Path, content, TestContext.Current.CancellationToken);
                    return (int)r.StatusCode + " " + await r.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
                };
            var answers = await Task.WhenAll(Enumerable.Range(0, 64).Select(_ => Task.Run(call)));
            Assert.StartsWith("200 ", answers[0]);
            // Bit-identical: the whole body, every digit (problem trace ids would differ, so only successes qualify).
            Assert.All(answers, a => Assert.Equal(answers[0], a));
        }
    }
}
