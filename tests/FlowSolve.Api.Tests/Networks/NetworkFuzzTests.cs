using System.Globalization;
using System.Text;
using System.Text.Json.Nodes;
using CsCheck;
using FlowSolve.Api.Tests.Reliability;

namespace FlowSolve.Api.Tests.Networks;

/// <summary>
/// The generic fuzz test (Reliability/) replaces top-level fields; this one reaches into the network document: random
/// elements of the Vandrel sample get hostile numbers, ids and ends, and every answer must still be a 2xx with finite
/// numbers and bounded iterations, or a problem that names the field (never a 5xx).
/// </summary>
public sealed class NetworkFuzzTests(ApiFixture api)
{
    private static readonly double[] Hostile =
        [0, -0.0, -1, 1e-300, 4.9e-324, 1e-12, 1e15, 1e300, double.MaxValue, -1e300, 1e6, 1e-6, 0.5, 2, 100, 101];

    private static readonly (string List, string Field)[] Numbers =
    [
        ("junctions", "elevation"), ("junctions", "demand"), ("junctions", "x"), ("reservoirs", "head"), ("pipes", "length"),
        ("pipes", "diameter"), ("pipes", "roughness"), ("pipes", "hazenWilliamsC"), ("pipes", "minorLossCoefficient"),
        ("pumps", "speedRatio"), ("demandMultipliers", ""), ("kinematicViscosity", ""), ("temperature", ""),
    ];

    [Fact]
    public async Task Solve_HostileElementValues_NeverBreakTheService()
    {
        string sample = File.ReadAllText(Path.Combine(Samples.LiveService.RepositoryRoot, "samples", "scenario", "vandrel-network.json"));
        var gen = Gen.Select(Gen.Int[0, Numbers.Length - 1], Gen.Int[0, 12], Gen.OneOf(Gen.OneOf(Hostile), Gen.Double), Gen.Int[0, 5])
            .Select((which, index, value, twist) =>
            {
                var doc = JsonNode.Parse(sample)!.AsObject();
                var (list, field) = Numbers[which];
                if (!double.IsFinite(value)) value = 1e308;
                if (field.Length == 0)
                {
                    if (list == "demandMultipliers") doc[list] = new JsonArray(value, 1.0);
                    else { doc.Remove("temperature"); doc[list] = value; }
                }
                else
                {
                    var items = doc[list]!.AsArray();
                    var item = items[index % items.Count]!.AsObject();
                    item[field] = value;
                    if (field == "hazenWilliamsC") item.Remove("roughness");
                }
                var pipes = doc["pipes"]!.AsArray();
                switch (twist)
                {
                    case 1: pipes[index % pipes.Count]!["to"] = "unknown"; break;
                    case 2: pipes[index % pipes.Count]!["id"] = "p1"; break;
                    case 3: doc["pumps"]![0]!["curve"]!["coefficients"]![2] = value; break;
                }
                return doc.ToJsonString();
            });
        await gen.SampleAsync(async body =>
        {
            using var content = new StringContent(body, Encoding.UTF8, "application/json");
            using var response = await api.Client.PostAsync("/v1/networks/solve", content, TestContext.Current.CancellationToken);
            await FuzzTests.CheckAnswer(response, "POST /v1/networks/solve " + body[..Math.Min(200, body.Length)]);
        }, iter: 300, threads: 1);
    }
}
