using System.ComponentModel;
using System.Reflection;
using Microsoft.Extensions.Options;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace FlowSolve.Api.Pumps;

/// <summary>
/// Gives the pump records' nested-object properties (pump, system, suction, pumpCurve, catalogueRange, dutyPoint) their
/// descriptions in the OpenAPI document.
/// </summary>
/// <remarks>
/// Hosting's description filter writes descriptions only into inline property schemas; a nested record is a
/// <c>$ref</c>, and OpenAPI 3.0 ignores siblings of <c>$ref</c>, so the reference is wrapped in <c>allOf</c> with the
/// description beside it (the form Swashbuckle's own UseAllOfToExtendReferenceSchemas produces). Limited to this area's
/// types; a stop-gap until the general filter in Hosting/OpenApiSetup.cs handles references, after which this file goes.
/// </remarks>
internal sealed class PumpSchemaDescriptions : ISchemaFilter
{
    /// <summary>Adds the filter to the document generator (before the first document is generated).</summary>
    public static void Register(IServiceProvider services) =>
        services.GetService<IOptions<SwaggerGenOptions>>()?.Value.SchemaFilter<PumpSchemaDescriptions>();

    public void Apply(IOpenApiSchema schema, SchemaFilterContext context)
    {
        if (context.Type.Namespace != typeof(PumpSchemaDescriptions).Namespace) return;
        if (schema is not OpenApiSchema concrete || concrete.Properties is null) return;
        foreach (var property in context.Type.GetProperties(BindingFlags.Public | BindingFlags.Instance))
        {
            var description = property.GetCustomAttribute<DescriptionAttribute>()?.Description;
            if (description is null) continue;
            string name = char.ToLowerInvariant(property.Name[0]) + property.Name[1..];
            if (concrete.Properties.TryGetValue(name, out var p) && p is OpenApiSchemaReference reference)
                concrete.Properties[name] = new OpenApiSchema { AllOf = [reference], Description = description };
        }
    }
}
