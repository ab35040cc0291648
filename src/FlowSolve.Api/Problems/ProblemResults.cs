using Microsoft.AspNetCore.Http.HttpResults;

namespace FlowSolve.Api.Problems;

/// <summary>The two problem answers every calculation can give besides success.</summary>
public static class ProblemResults
{
    /// <summary>400: the request is malformed or a field is invalid; <c>errors</c> names each bad field.</summary>
    public static ValidationProblem BadInput(FieldErrors errors) =>
        TypedResults.ValidationProblem(errors.ToDictionary(),
            title: "One or more fields are invalid.",
            detail: "See errors: each key is a field name, each value says what is wrong with it.",
            type: "https://flowsolve.example/problems/invalid-input");

    /// <summary>400 for a single field.</summary>
    public static ValidationProblem BadInput(string field, string message)
    {
        var errors = new FieldErrors();
        errors.Add(field, message);
        return BadInput(errors);
    }

    /// <summary>422: the request is well formed but the physics has no answer (the detail says why).</summary>
    public static ProblemHttpResult NoAnswer(string title, string detail, IDictionary<string, object?>? extensions = null) =>
        TypedResults.Problem(detail: detail, statusCode: StatusCodes.Status422UnprocessableEntity, title: title,
            type: "https://flowsolve.example/problems/no-physical-answer", extensions: extensions);
}
