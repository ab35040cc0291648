using System.Reflection;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// What keeps the generated document acceptable to an independent OpenAPI linter (openapi/lint.sh): schema names that
/// are the wire names, a type beside every nullable, the server, the optional API key, and described tags.
/// </summary>
public static class OpenApiLint
{
    public const string ApiKeySchemeName = "ApiKey";

    /// <summary>
    /// The schema name of a type: its C# name without a trailing <c>Dto</c> (a C# naming convention, not part of the
    /// wire), generic arguments first as Swashbuckle's default does. Two types that end up with the same name make
    /// Swashbuckle refuse to build the document ("Conflicting schemaIds"), so a collision cannot pass unnoticed.
    /// </summary>
    public static string SchemaId(Type type)
    {
        if (type.IsArray) return SchemaId(type.GetElementType()!) + "Array";
        string name = type.Name;
        int tick = name.IndexOf('`');
        if (tick >= 0) name = name[..tick];
        if (name.EndsWith("Dto", StringComparison.Ordinal) && name.Length > 3) name = name[..^3];
        return type.IsConstructedGenericType ? string.Concat(type.GetGenericArguments().Select(SchemaId)) + name : name;
    }

    /// <summary>Tag descriptions, by the tag names the endpoints use.</summary>
    public static readonly IReadOnlyDictionary<string, string> TagDescriptions = new Dictionary<string, string>
    {
        ["Batch"] = "Many cases of one calculation in one request, as a JSON array or CSV.",
        ["Channels"] = "Open channels: normal depth by Manning's equation, and critical depth.",
        ["Check"] = "Claimed outputs of a calculation compared with the exact values, with the likely cause of a deviation.",
        ["Fluids"] = "Properties of liquid water at atmospheric pressure.",
        ["Gas"] = "Gas lines: steady isothermal flow of a gas in a horizontal pipe, with the largest mass flow the line passes.",
        ["Friction factor"] = "The Darcy friction factor from the Reynolds number and relative roughness.",
        ["Networks"] = "Steady flows and heads of a looped pipe network with pumps, junctions and reservoirs, for one or more load cases.",
        ["Non-Newtonian fluids"] = "Friction factor, head loss and flow of power-law fluids and Bingham plastics in smooth pipes.",
        ["Pipes"] = "Head loss, flow and diameter of a single pipe, and the tables of sizes, materials and fittings behind them.",
        ["Pumps"] = "The duty point of a pump or pump set on a system curve, and the curves for plotting.",
    };
}

/// <summary>
/// Leaves no <c>nullable: true</c> without a <c>type</c> beside it. Swashbuckle wraps a reference to a nullable property's
/// type in <c>allOf</c> (UseAllOfToExtendReferenceSchemas, so the property keeps its description) and writes only
/// <c>nullable</c> beside it. OpenAPI 3.0.3 and later say nullable adds null only to a type given in the same schema and
/// leaves the other keywords (here the allOf) free to refuse null, so that nullable never admitted null: it is dropped.
/// Adding <c>type: object</c> instead would keep the linter quiet but make client generators (NSwag among them) see a new
/// inline class per property instead of the referenced one. Such a property stays optional (not in <c>required</c>),
/// and answers never carry null (null members are left out).
/// </summary>
internal sealed class NullableWithoutTypeDocumentFilter : IDocumentFilter
{
    public void Apply(OpenApiDocument document, DocumentFilterContext context)
    {
        var seen = new HashSet<IOpenApiSchema>(ReferenceEqualityComparer.Instance);
        foreach (var schema in document.Components?.Schemas?.Values.AsEnumerable() ?? []) Visit(schema, seen);
        foreach (var item in document.Paths.Values)
        {
            foreach (var operation in item.Operations?.Values.AsEnumerable() ?? [])
            {
                foreach (var parameter in operation.Parameters ?? []) Visit(parameter.Schema, seen);
                foreach (var media in operation.RequestBody?.Content?.Values ?? []) Visit(media.Schema, seen);
                foreach (var response in operation.Responses?.Values.AsEnumerable() ?? [])
                    foreach (var media in response.Content?.Values ?? []) Visit(media.Schema, seen);
            }
        }
    }

    private static void Visit(IOpenApiSchema? schema, HashSet<IOpenApiSchema> seen)
    {
        // References are not followed: their targets are visited among the components.
        if (schema is not OpenApiSchema s || !seen.Add(s)) return;
        // In the object model null is a type flag; a schema whose only type is null is written as a bare nullable: true.
        if (s.Type == JsonSchemaType.Null) s.Type = null;
        foreach (var p in s.Properties?.Values ?? []) Visit(p, seen);
        Visit(s.Items, seen);
        Visit(s.AdditionalProperties, seen);
        Visit(s.Not, seen);
        foreach (var x in s.AllOf ?? []) Visit(x, seen);
        foreach (var x in s.OneOf ?? []) Visit(x, seen);
        foreach (var x in s.AnyOf ?? []) Visit(x, seen);
    }
}

/// <summary>
/// The optional API key (<see cref="Protection.ApiKeyHeader"/>): declared as an apiKey scheme, and required as one of two
/// alternatives, none or the key, because a service asks for it only when FlowSolve:ApiKey is set (and then only on /v1).
/// Operations outside /v1 are never checked and say so with an empty requirement alone. Tags get their descriptions.
/// </summary>
internal sealed class SecurityAndTagsDocumentFilter : IDocumentFilter
{
    public void Apply(OpenApiDocument document, DocumentFilterContext context)
    {
        document.Components ??= new OpenApiComponents();
        document.Components.SecuritySchemes ??= new Dictionary<string, IOpenApiSecurityScheme>();
        document.Components.SecuritySchemes[OpenApiLint.ApiKeySchemeName] = new OpenApiSecurityScheme
        {
            Type = SecuritySchemeType.ApiKey,
            In = ParameterLocation.Header,
            Name = Protection.ApiKeyHeader,
            Description =
                "Optional. A service configured with FlowSolve:ApiKey answers 401 on every /v1 route unless the header " +
                Protection.ApiKeyHeader + " carries that key; a service without it needs no key. Health, metrics and these docs stay open.",
        };
        // Said once for the document; an operation outside /v1 (never checked) overrides it with "no key".
        document.Security =
        [
            new OpenApiSecurityRequirement(),
            new OpenApiSecurityRequirement { [new OpenApiSecuritySchemeReference(OpenApiLint.ApiKeySchemeName, document)] = [] },
        ];
        foreach (var (path, item) in document.Paths)
        {
            if (path.StartsWith("/v1/", StringComparison.Ordinal) || path == "/v1") continue;
            foreach (var operation in item.Operations?.Values.AsEnumerable() ?? []) operation.Security = [new OpenApiSecurityRequirement()];
        }
        foreach (var tag in document.Tags ?? new HashSet<OpenApiTag>())
            if (tag.Name is { } name && tag.Description is null && OpenApiLint.TagDescriptions.TryGetValue(name, out var description))
                tag.Description = description;
    }
}

/// <summary>
/// A query parameter whose type binds from one string through its own <c>TryParse</c> (for example the fittings list,
/// <c>name:count,name:count</c>) is a string on the wire, whatever shape the type has in a JSON body.
/// </summary>
internal sealed class ParsableQueryParameterFilter : IOperationFilter
{
    public void Apply(OpenApiOperation operation, OperationFilterContext context)
    {
        foreach (var parameter in operation.Parameters ?? [])
        {
            if (parameter is not OpenApiParameter p || p.In != ParameterLocation.Query || p.Schema is null) continue;
            if (p.Schema is OpenApiSchema { Type: { } t } && (t & (JsonSchemaType.Array | JsonSchemaType.Object)) == 0) continue;
            var type = context.ApiDescription.ParameterDescriptions
                .FirstOrDefault(d => string.Equals(d.Name, p.Name, StringComparison.OrdinalIgnoreCase))?.Type;
            if (type is null || !HasTryParse(type)) continue;
            p.Schema = new OpenApiSchema { Type = JsonSchemaType.String, Description = p.Schema.Description };
        }
    }

    private static bool HasTryParse(Type type) =>
        type.GetMethods(BindingFlags.Public | BindingFlags.Static).Any(m => m.Name == "TryParse" && m.ReturnType == typeof(bool)
            && m.GetParameters() is { Length: >= 2 } ps && ps[0].ParameterType == typeof(string) && ps[^1].IsOut);
}
