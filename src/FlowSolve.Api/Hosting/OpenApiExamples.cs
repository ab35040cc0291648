using System.Text.Json;
using System.Text.Json.Nodes;

namespace FlowSolve.Api.Hosting;

/// <summary>An example request attached to an endpoint, rendered into the OpenAPI document by <see cref="OpenApiSetup"/>.</summary>
public sealed record RequestExample(IReadOnlyList<(string Name, string Value)> Query, JsonNode? Body);

public static class OpenApiExampleExtensions
{
    /// <summary>Attaches example query-parameter values to a GET endpoint.</summary>
    public static RouteHandlerBuilder WithQueryExample(this RouteHandlerBuilder builder, params (string Name, string Value)[] values) =>
        builder.WithMetadata(new RequestExample(values, null));

    /// <summary>Attaches an example JSON body (serialised with the API's own JSON options) to a POST endpoint.</summary>
    public static RouteHandlerBuilder WithBodyExample<T>(this RouteHandlerBuilder builder, T body) =>
        builder.WithMetadata(new RequestExample([], JsonSerializer.SerializeToNode(body, JsonSetup.Options)));
}
