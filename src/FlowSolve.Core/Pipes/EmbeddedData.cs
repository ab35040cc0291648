using System.Text.Json;

namespace FlowSolve.Core.Pipes;

/// <summary>Reads the JSON tables embedded under Pipes/Data (JsonDocument: no reflection, so trimming and AOT are safe).</summary>
internal static class EmbeddedData
{
    public static JsonDocument Open(string fileName)
    {
        var assembly = typeof(EmbeddedData).Assembly;
        string resource = "FlowSolve.Core.Pipes.Data." + fileName;
        using var stream = assembly.GetManifestResourceStream(resource)
            ?? throw new InvalidOperationException($"embedded resource {resource} is missing");
        return JsonDocument.Parse(stream);
    }

    public static string String(this JsonElement element, string name) =>
        element.GetProperty(name).GetString() ?? throw new InvalidOperationException($"{name} is null");

    public static string? OptionalString(this JsonElement element, string name) =>
        element.TryGetProperty(name, out var value) && value.ValueKind == JsonValueKind.String ? value.GetString() : null;

    public static double? OptionalDouble(this JsonElement element, string name) =>
        element.TryGetProperty(name, out var value) && value.ValueKind == JsonValueKind.Number ? value.GetDouble() : null;
}
