using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace FlowSolve.Api.Tests.Sensitivities;

/// <summary>
/// Checks every sensitivity entry of a response against a central finite difference of the same calculation, run
/// again through the service with the input perturbed up and down (the stated property: the derivative of the
/// computed function). The difference is Richardson-extrapolated from steps h and h/2 with h = 1e-3 |p|, so its
/// truncation error is O(h^4), about 1e-12 relative, and 1e-6 agreement is a genuine test. A derivative that is zero
/// in exact arithmetic has a difference of pure solver noise and passes when the two differ by less than 1e-9 in
/// elasticity (|error| |p/y| &lt; 1e-9). Requests are in SI so that the response's values and the derivatives share units.
/// </summary>
internal sealed class SensitivityHarness(ApiFixture api, string url, bool post, string outputPrefix = "")
{
    public const double Tolerance = 1e-6;

    /// <summary>Calls with sensitivities=true, then checks every entry; returns how many were checked.</summary>
    public async Task<int> CheckAll(JsonObject request, IReadOnlyDictionary<string, double>? steps = null)
    {
        var body = await Call(request, sensitivities: true);
        var output = Output(body);
        Assert.True(output.TryGetProperty("sensitivities", out var table), $"no sensitivities in {body}");
        int checks = 0;
        var byInput = new Dictionary<string, List<(string Output, double Derivative, double? Elasticity)>>();
        foreach (var o in table.EnumerateObject())
            foreach (var i in o.Value.EnumerateObject())
            {
                if (!byInput.TryGetValue(i.Name, out var list)) byInput[i.Name] = list = [];
                list.Add((o.Name, i.Value.GetProperty("derivative").GetDouble(),
                    i.Value.TryGetProperty("elasticity", out var el) ? el.GetDouble() : null));
            }

        foreach (var (input, entries) in byInput)
        {
            double p = Get(request, input) ?? throw new Xunit.Sdk.XunitException($"entry for input '{input}', which the request does not give");
            double h = steps is not null && steps.TryGetValue(input, out var s) ? s : 1e-3 * Math.Abs(p);
            Assert.True(h > 0, $"no step for {input} = {p}");
            var up = await Outputs(request, input, p + h);
            var down = await Outputs(request, input, p - h);
            var upHalf = await Outputs(request, input, p + 0.5 * h);
            var downHalf = await Outputs(request, input, p - 0.5 * h);
            foreach (var (name, derivative, elasticity) in entries)
            {
                double y = output.GetProperty(name).GetDouble();
                double d1 = (up.GetProperty(name).GetDouble() - down.GetProperty(name).GetDouble()) / (2 * h);
                double d2 = (upHalf.GetProperty(name).GetDouble() - downHalf.GetProperty(name).GetDouble()) / h;
                double fd = (4 * d2 - d1) / 3;
                double error = Math.Abs(derivative - fd);
                Assert.True(error <= Tolerance * Math.Abs(fd) || error * Math.Abs(p / y) < 1e-9,
                    $"{url} d{name}/d{input}: analytic {derivative:R}, central difference {fd:R}, relative error {error / Math.Abs(fd):E2}");
                // Elasticity is derivative x input / output, absent when either is zero.
                if (y == 0 || p == 0) Assert.Null(elasticity);
                else
                {
                    Assert.NotNull(elasticity);
                    Assert.Equal(derivative * p / y, elasticity!.Value, 1e-12 * Math.Max(1, Math.Abs(elasticity.Value)));
                }
                checks++;
            }
        }
        return checks;
    }

    public async Task<JsonElement> Call(JsonObject request, bool sensitivities)
    {
        string suffix = sensitivities ? "sensitivities=true" : "";
        (int Status, string? ContentType, JsonElement Body) r;
        if (post) r = await api.PostRaw(url + (suffix.Length > 0 ? "?" + suffix : ""), request.ToJsonString(), "application/json");
        else r = await api.GetJson(url + "?" + Query(request) + (suffix.Length > 0 ? "&" + suffix : ""));
        Assert.True(r.Status == 200, $"{url}: status {r.Status}: {r.Body}");
        return r.Body;
    }

    public JsonElement Output(JsonElement body) => outputPrefix.Length == 0 ? body : body.GetProperty(outputPrefix);

    private async Task<JsonElement> Outputs(JsonObject request, string input, double value)
    {
        var copy = (JsonObject)request.DeepClone();
        Set(copy, input, value);
        return Output(await Call(copy, sensitivities: false));
    }

    private static string Query(JsonObject request) => string.Join("&", request.Select(p =>
        p.Key + "=" + Uri.EscapeDataString(p.Value is JsonValue v && v.TryGetValue<double>(out var d)
            ? d.ToString("R", CultureInfo.InvariantCulture)
            : p.Value is JsonValue t && t.TryGetValue<string>(out var text) ? text : p.Value!.ToJsonString())));

    /// <summary>The node at a dotted path such as system.pipes[0].length.</summary>
    private static (JsonNode Parent, string? Key, int Index) Locate(JsonObject root, string path)
    {
        JsonNode node = root;
        var parts = path.Split('.');
        for (int k = 0; k < parts.Length; k++)
        {
            string part = parts[k];
            int bracket = part.IndexOf('[');
            string key = bracket < 0 ? part : part[..bracket];
            int index = bracket < 0 ? -1 : int.Parse(part[(bracket + 1)..^1], CultureInfo.InvariantCulture);
            bool last = k == parts.Length - 1;
            if (last && index < 0) return (node, key, -1);
            var child = node[key]!;
            if (last) return (child, null, index);
            node = index < 0 ? child : child[index]!;
        }
        throw new InvalidOperationException(path);
    }

    private static double? Get(JsonObject root, string path)
    {
        var (parent, key, index) = Locate(root, path);
        var node = key is not null ? parent[key] : parent[index];
        return node is JsonValue v && v.TryGetValue<double>(out var d) ? d : null;
    }

    private static void Set(JsonObject root, string path, double value)
    {
        var (parent, key, index) = Locate(root, path);
        if (key is not null) parent[key] = value;
        else parent[index] = value;
    }
}
