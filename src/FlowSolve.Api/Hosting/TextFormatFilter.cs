using System.Globalization;
using System.Text;
using System.Text.Json;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// <c>format=text</c> for spreadsheet cells: the calculation's primary output (or the field named by <c>select</c>)
/// as plain text in invariant culture with round-trip precision; an error as one short readable line with the
/// same HTTP status.
/// </summary>
public sealed class TextFormatFilter : IEndpointFilter
{
    public async ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        // Reached only for format=text or an unknown format: AsCalculation's filter sends json and html elsewhere.
        var http = context.HttpContext;
        string? format = http.Request.Query["format"];
        if (!string.Equals(format, "text", StringComparison.OrdinalIgnoreCase))
        {
            return TypedResults.ValidationProblem(new Dictionary<string, string[]> { ["format"] = ["must be json, text or html"] },
                title: "One or more fields are invalid.", type: "https://flowsolve.example/problems/invalid-input");
        }

        var metadata = http.GetEndpoint()?.Metadata.GetMetadata<CalculationMetadata>();
        if (metadata is { Text: false })
        {
            return TypedResults.ValidationProblem(new Dictionary<string, string[]>
                {
                    ["format"] = [$"must be json or html for {metadata.Name}: its answer is tables (one row per element and load case), not one value for a cell"],
                },
                title: "One or more fields are invalid.", type: "https://flowsolve.example/problems/invalid-input");
        }
        object? result = await next(context);
        if (result is not IResult typed || metadata is null) return result;
        var (status, value) = typed.Unwrap();
        string field = http.Request.Query["select"].FirstOrDefault() ?? metadata.PrimaryOutput;

        if (status is >= 200 and < 300 && value is not null)
        {
            // Read straight from the answer through the compiled column readers the batch uses: no serialisation of the
            // whole answer for one cell, and the same digits as the JSON answer and a CSV row.
            if (field.Equals("warnings", StringComparison.OrdinalIgnoreCase))
                return TypedResults.Text(value is IWarned w ? string.Join(",", w.WarningCodes()) : "", "text/plain", Encoding.UTF8, status);
            var columns = ResponseColumns.ByName(value.GetType());
            if (columns.TryGetValue(field, out var column))
            {
                var cell = new StringBuilder(24);
                column.WriteText(value, cell);
                return TypedResults.Text(cell.ToString(), "text/plain", Encoding.UTF8, status);
            }
            // Fields that are not columns (an entry of sensitivities, say) are read from the answer's JSON.
            var json = JsonSerializer.SerializeToElement(value, value.GetType(), JsonSetup.Options);
            if (TryRead(json, field, out string? text)) return TypedResults.Text(text, "text/plain", Encoding.UTF8, status);
            string? near = StrictQuery.Closest(field, columns.Keys);
            return TypedResults.Text($"error: select: no output field named '{field}'" + (near is null ? "" : $"; did you mean '{near}'?") +
                $" (fields: {string.Join(", ", columns.Keys)})", "text/plain", Encoding.UTF8, 400);
        }
        return TypedResults.Text(ErrorLine(value), "text/plain", Encoding.UTF8, status);
    }

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
