using System.Text.Json.Nodes;

namespace FlowSolve.Api.Tests.Reliability;

/// <summary>One documented operation, read from the service's own OpenAPI document, so every endpoint that lands is
/// fuzzed without a test change.</summary>
public sealed record Operation(string Method, string Path, IReadOnlyList<Field> Query, IReadOnlyList<Field>? Body,
    IReadOnlyDictionary<string, string> QueryExample, JsonNode? BodyExample)
{
    public override string ToString() => $"{Method} {Path}";
}

/// <summary>A field and its JSON schema kind; objects carry their own fields, arrays their item field.</summary>
public sealed record Field(string Name, string Kind, IReadOnlyList<Field>? Properties = null, Field? Items = null);

public static class OperationCatalog
{
    public static IReadOnlyList<Operation> Read(JsonNode doc)
    {
        var list = new List<Operation>();
        foreach (var (path, item) in doc["paths"]!.AsObject())
        {
            if (!path.StartsWith("/v1/", StringComparison.Ordinal) || path.Contains('{')) continue;
            foreach (var (method, op) in item!.AsObject())
            {
                var query = new List<Field>();
                var example = new Dictionary<string, string>();
                foreach (var p in op!["parameters"]?.AsArray() ?? [])
                {
                    string name = p!["name"]!.GetValue<string>();
                    query.Add(new Field(name, Kind(doc, p["schema"])));
                    if (p["example"] is { } e) example[name] = e.ToJsonString().Trim('"');
                }
                var content = op["requestBody"]?["content"]?["application/json"];
                var body = content?["schema"] is { } schema ? Fields(doc, schema, 0) : null;
                list.Add(new Operation(method.ToUpperInvariant(), path, query, body, example, content?["example"]?.DeepClone()));
            }
        }
        return list;
    }

    private static JsonNode Resolve(JsonNode doc, JsonNode schema)
    {
        while (schema["$ref"] is { } r)
            schema = doc["components"]!["schemas"]![r.GetValue<string>().Split('/')[^1]]!;
        return schema;
    }

    private static string Kind(JsonNode doc, JsonNode? schema)
    {
        if (schema is null) return "string";
        schema = Resolve(doc, schema);
        return schema["type"]?.ToJsonString().Trim('"', '[', ']').Split(',')[0].Trim('"') ?? (schema["properties"] is not null ? "object" : "string");
    }

    private static IReadOnlyList<Field> Fields(JsonNode doc, JsonNode schema, int depth)
    {
        schema = Resolve(doc, schema);
        var fields = new List<Field>();
        foreach (var (name, s) in schema["properties"]?.AsObject() ?? [])
            fields.Add(ToField(doc, name, s!, depth));
        return fields;
    }

    private static Field ToField(JsonNode doc, string name, JsonNode schema, int depth)
    {
        var resolved = Resolve(doc, schema);
        string kind = Kind(doc, resolved);
        return kind switch
        {
            "object" when depth < 4 => new Field(name, kind, Fields(doc, resolved, depth + 1)),
            "array" when depth < 4 && resolved["items"] is { } items => new Field(name, kind, Items: ToField(doc, "item", items, depth + 1)),
            _ => new Field(name, kind),
        };
    }
}
