using System.Text.Json;

namespace FlowSolve.Api.Hosting;

/// <summary>Finds a key given twice in one JSON object, for the bodies read as a JSON tree rather than bound to a
/// request record (whose binding refuses duplicates itself through <see cref="JsonSerializerOptions.AllowDuplicateProperties"/>).</summary>
public static class JsonDuplicates
{
    /// <summary>The dotted path of the first repeated key (for example <c>claimed.frictionFactor</c>), or null.
    /// Malformed JSON is left to the parser that follows, which names it.</summary>
    public static string? Find(ReadOnlySpan<byte> utf8Json)
    {
        var reader = new Utf8JsonReader(utf8Json, new JsonReaderOptions { MaxDepth = 64 });
        var keys = new Stack<HashSet<string>?>();
        var path = new Stack<string>();
        string? pending = null;
        try
        {
            while (reader.Read())
            {
                switch (reader.TokenType)
                {
                    case JsonTokenType.StartObject:
                        keys.Push(new HashSet<string>(StringComparer.Ordinal));
                        path.Push(pending ?? "");
                        pending = null;
                        break;
                    case JsonTokenType.StartArray:
                        keys.Push(null);
                        path.Push(pending ?? "");
                        pending = null;
                        break;
                    case JsonTokenType.EndObject or JsonTokenType.EndArray:
                        keys.Pop();
                        path.Pop();
                        break;
                    case JsonTokenType.PropertyName:
                        string name = reader.GetString()!;
                        if (keys.Peek() is { } seen && !seen.Add(name))
                            return string.Join(".", path.Reverse().Where(p => p.Length > 0).Append(name));
                        pending = name;
                        break;
                    default:
                        pending = null;
                        break;
                }
            }
        }
        catch (JsonException)
        {
            return null;
        }
        return null;
    }
}
