using System.Text.Json;
using System.Text.RegularExpressions;
using Microsoft.AspNetCore.Diagnostics;

namespace FlowSolve.Api.Problems;

/// <summary>
/// Turns request-binding failures (a query value that is not a number, malformed JSON, a JSON value of the wrong
/// type, a missing body) into 400 problems that name the field, and any other exception into a bare 500 with no
/// stack trace or internal detail.
/// </summary>
/// <remarks>
/// Minimal APIs answer binding failures with an empty 400 unless <c>RouteHandlerOptions.ThrowOnBadRequest</c> is
/// set; it is set, and this handler reads the field from the exception: the parameter name in the binder's message
/// for query values, the JSON path of the inner <see cref="JsonException"/> for bodies.
/// </remarks>
public sealed partial class BadRequestProblems(IProblemDetailsService problems, ILogger<BadRequestProblems> logger) : IExceptionHandler
{
    [GeneratedRegex("""^Failed to bind parameter "(?:[^"]*[ .])?(?<name>[A-Za-z_][A-Za-z0-9_]*)" from "(?<value>.*)"\.$""", RegexOptions.Singleline)]
    private static partial Regex BindFailure();

    [GeneratedRegex("""^Required parameter "(?:[^"]*[ .])?(?<name>[A-Za-z_][A-Za-z0-9_]*)" was not provided""")]
    private static partial Regex RequiredMissing();

    /// <inheritdoc />
    public async ValueTask<bool> TryHandleAsync(HttpContext context, Exception exception, CancellationToken cancellationToken)
    {
        if (context.Response.HasStarted) return false;

        if (exception is BadHttpRequestException bad)
        {
            var (field, message) = Describe(bad);
            if (string.Equals(context.Request.Query["format"], "text", StringComparison.OrdinalIgnoreCase))
            {
                // A spreadsheet cell shows the body as it is: one short line, the right status.
                context.Response.StatusCode = bad.StatusCode;
                context.Response.ContentType = "text/plain; charset=utf-8";
                await context.Response.WriteAsync($"error: {field}: {message}", cancellationToken);
                return true;
            }
            var errors = new Dictionary<string, string[]> { [field] = [message] };
            context.Response.StatusCode = bad.StatusCode;
            var details = new HttpValidationProblemDetails(errors)
            {
                Status = bad.StatusCode,
                Title = bad.StatusCode == StatusCodes.Status413PayloadTooLarge ? "The request body is too large." : "The request could not be read.",
                Detail = message,
                Type = "https://flowsolve.example/problems/invalid-input",
            };
            if (bad.StatusCode == StatusCodes.Status413PayloadTooLarge) details.Extensions["limit"] = "maxRequestBodyBytes";
            return await problems.TryWriteAsync(new ProblemDetailsContext { HttpContext = context, ProblemDetails = details, Exception = null });
        }

        if (exception is OperationCanceledException && context.RequestAborted.IsCancellationRequested)
            return true; // the client went away; there is nobody to answer

        logger.LogError(exception, "Unhandled exception on {Path}", context.Request.Path.Value);
        context.Response.StatusCode = StatusCodes.Status500InternalServerError;
        return await problems.TryWriteAsync(new ProblemDetailsContext
        {
            HttpContext = context,
            ProblemDetails = new()
            {
                Status = 500,
                Title = "An internal error occurred.",
                Detail = "The calculation failed unexpectedly; this is a defect in FlowSolve, not in your input. It has been logged.",
            },
            Exception = null,
        });
    }

    private static (string Field, string Message) Describe(BadHttpRequestException bad)
    {
        var m = BindFailure().Match(bad.Message);
        if (m.Success)
        {
            string value = m.Groups["value"].Value;
            if (value.Length > 40) value = value[..40] + "...";
            return (CamelCase(m.Groups["name"].Value), $"'{value}' is not a valid value for this field (expected a number or the documented text)");
        }
        m = RequiredMissing().Match(bad.Message);
        if (m.Success) return (CamelCase(m.Groups["name"].Value), "is required");

        for (Exception? e = bad.InnerException; e is not null; e = e.InnerException)
        {
            if (e is JsonException json) return DescribeJson(json);
        }

        if (bad.StatusCode == StatusCodes.Status413PayloadTooLarge) return ("body", "the request body exceeds the configured size limit");
        if (bad.Message.Contains("body", StringComparison.OrdinalIgnoreCase))
            return ("body", "a JSON body is required (Content-Type: application/json)");
        return ("request", "the request could not be read");
    }

    /// <summary>The field and message for a JSON binding failure; shared with the batch endpoint so a row's error reads
    /// exactly like the single call's.</summary>
    public static (string Field, string Message) DescribeJson(JsonException json)
    {
        string field = JsonPathToField(json.Path ?? "$");
        if (json.Message.Contains("could not be mapped", StringComparison.Ordinal))
        {
            // UnmappedMemberHandling.Disallow: a misspelt or unknown field; the path ends at its name.
            string? near = NearestField(json.Message, field);
            return (field.Length == 0 ? "body" : field, near is null
                ? "is not a field of this request (check the spelling against the documentation)"
                : $"is not a field of this request: did you mean '{near}'?");
        }
        if (json.Message.Contains("uplicate", StringComparison.Ordinal))
        {
            // AllowDuplicateProperties = false: the path ends at the repeated key.
            return (field.Length == 0 ? "body" : field, "is given more than once in the same JSON object; give each key once");
        }
        if (json.InnerException is not null && json.InnerException.GetType().Name == "JsonReaderException")
        {
            // A syntax error. Name the field whose value broke the JSON when there is one (NaN or Infinity
            // typed as a bare word lands here), else the body as a whole.
            string where = $"line {json.LineNumber + 1}, byte {json.BytePositionInLine + 1}";
            return field.Length == 0
                ? ("body", $"is not well-formed JSON ({where})")
                : (field, $"is not well-formed JSON at or after this field ({where}); numbers must be finite JSON numbers, so NaN and Infinity are not allowed");
        }
        return field.Length == 0
            ? ("body", "the body is not valid JSON for this request (it must be a JSON object with the documented fields)")
            : (field, "has a value of the wrong type, or the JSON around it is malformed");
    }

    [GeneratedRegex("""contained in type '(?<type>[^']+)'""")]
    private static partial Regex UnmappedType();

    /// <summary>The known field nearest to an unknown one, from the type the serializer names in its message.</summary>
    private static string? NearestField(string message, string field)
    {
        var m = UnmappedType().Match(message);
        if (!m.Success || field.Length == 0) return null;
        var type = typeof(BadRequestProblems).Assembly.GetType(m.Groups["type"].Value);
        if (type is null) return null;
        string name = field[(field.LastIndexOf('.') + 1)..];
        var known = type.GetProperties().Select(p => JsonNamingPolicy.CamelCase.ConvertName(p.Name));
        return Hosting.StrictQuery.Closest(name, known);
    }

    /// <summary>"$.section.points[2].station" to "section.points[2].station"; "$" to "".</summary>
    private static string JsonPathToField(string path)
    {
        string p = path.StartsWith("$.", StringComparison.Ordinal) ? path[2..] : path.TrimStart('$');
        // System.Text.Json writes odd property names as $['name']; keep them readable.
        p = p.Replace("['", ".", StringComparison.Ordinal).Replace("']", "", StringComparison.Ordinal).TrimStart('.');
        return p;
    }

    private static string CamelCase(string name) =>
        name.Length == 0 || char.IsLower(name[0]) ? name : char.ToLowerInvariant(name[0]) + name[1..];
}
