using System.Globalization;
using System.Text.Json;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// <c>format=text</c> for spreadsheet cells: the calculation's primary output (or the field named by <c>select</c>)
/// as plain text in invariant culture with round-trip precision (written by <see cref="Calculation{TQuery, TRequest, TResponse}"/>
/// through the answer's compiled column readers); an error as one short readable line with the same HTTP status.
/// </summary>
public static class TextFormat
{
    /// <summary>One line for a problem: "error: field: message; field: message" or "error: title: detail".</summary>
    public static string ErrorLine(object? problem)
    {
        if (problem is HttpValidationProblemDetails v && v.Errors.Count > 0)
            return "error: " + string.Join("; ", v.Errors.Select(e => e.Key + ": " + string.Join(", ", e.Value)));
        if (problem is ProblemDetails p) return "error: " + (p.Detail ?? p.Title ?? "the request failed");
        return "error: the request failed";
    }

    /// <summary>Reads a (dotted) scalar field of a JSON answer as cell text: numbers as the JSON writer wrote them.</summary>
    internal static bool TryRead(JsonElement json, string path, out string text)
    {
        var e = json;
        text = "";
        foreach (var part in path.Split('.'))
            if (e.ValueKind != JsonValueKind.Object || !e.TryGetProperty(part, out e)) return false;
        text = e.ValueKind switch
        {
            JsonValueKind.Number => e.GetRawText(),
            JsonValueKind.String => e.GetString() ?? "",
            JsonValueKind.True => "TRUE",
            JsonValueKind.False => "FALSE",
            _ => "",
        };
        return e.ValueKind is not (JsonValueKind.Array or JsonValueKind.Object or JsonValueKind.Null);
    }
}
