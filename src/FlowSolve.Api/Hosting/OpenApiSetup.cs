using System.ComponentModel;
using System.Reflection;
using System.Text.Json.Nodes;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace FlowSolve.Api.Hosting;

/// <summary>Swashbuckle configuration: the document at /openapi/v1.json, the UI at /docs, descriptions and examples.</summary>
public static class OpenApiSetup
{
    public const string DocumentName = "v1";
    public const string DocumentPath = "/openapi/v1.json";

    public const string Cautions =
        "Results are engineering estimates to be checked by a qualified engineer before they are used in design; local codes, " +
        "standards and licensed practice govern. FlowSolve does not cover water hammer and surge (transients), structural design " +
        "of pipes or channels, or any safety-critical decision on its own.";

    public static IServiceCollection AddFlowSolveOpenApi(this IServiceCollection services)
    {
        services.AddEndpointsApiExplorer();
        services.AddSwaggerGen(c =>
        {
            c.SwaggerDoc(DocumentName, new OpenApiInfo
            {
                Title = "FlowSolve",
                Version = "v1",
                Description =
                    "Hydraulic relations solved to full precision by safeguarded Newton iteration. Every value comes with its " +
                    "iteration count, residual, the published validity range of each correlation used, warnings, and the defaults " +
                    "that were applied. SI units by default (m, m/s, m3/s, m2/s, Pa, Pa s, kg/m3, degrees C); units=us switches " +
                    "a request and its response to US customary. Gravity is standard gravity, 9.80665 m/s2. Bad input answers 400 " +
                    "with an RFC 9457 problem whose errors map names each bad field; a well-formed request with no physical answer " +
                    "answers 422.\n\n" + Cautions,
                License = new OpenApiLicense { Name = "MIT", Url = new Uri("https://opensource.org/licenses/MIT") },
            });
            // Relative: the API is on the host that serves this document, so "Try it out" on /docs works on any host and port.
            c.AddServer(new OpenApiServer { Url = "/", Description = "The host serving this document" });
            c.CustomSchemaIds(OpenApiLint.SchemaId);
            string xml = Path.Combine(AppContext.BaseDirectory, "FlowSolve.Api.xml");
            if (File.Exists(xml)) c.IncludeXmlComments(xml);
            c.SchemaFilter<DescriptionSchemaFilter>();
            c.OperationFilter<ParsableQueryParameterFilter>();
            c.OperationFilter<ParameterAndExampleFilter>();
            c.DocumentFilter<NullableWithoutTypeDocumentFilter>();
            c.DocumentFilter<SecurityAndTagsDocumentFilter>();
            c.SupportNonNullableReferenceTypes();
            // OpenAPI 3.0 ignores siblings of $ref: wrap references in allOf so a nested object property keeps its description.
            c.UseAllOfToExtendReferenceSchemas();
        });
        return services;
    }

    public static WebApplication UseFlowSolveOpenApi(this WebApplication app)
    {
        // Only requests for the document or the reference pages meet these middlewares: the UI's matches its path with a
        // regular expression on every request it sees, which a calculation (a spreadsheet cell) should not pay for.
        app.UseWhen(static ctx => ctx.Request.Path.StartsWithSegments("/openapi") || ctx.Request.Path.StartsWithSegments("/docs"), branch =>
        {
            branch.UseSwagger(o => o.RouteTemplate = "openapi/{documentName}.json");
            branch.UseSwaggerUI(o =>
            {
                o.RoutePrefix = "docs";
                o.SwaggerEndpoint(DocumentPath, "FlowSolve v1");
                o.DocumentTitle = "FlowSolve API";
            });
        });
        return app;
    }

    /// <summary>Puts each <see cref="DescriptionAttribute"/> on a record property into the schema of that property.</summary>
    private sealed class DescriptionSchemaFilter : ISchemaFilter
    {
        public void Apply(IOpenApiSchema schema, SchemaFilterContext context)
        {
            if (schema is not OpenApiSchema concrete) return;
            // A check body carries the calculation's own input fields beside claimed and tolerancePercent: any further
            // property is allowed, and said so explicitly (an empty schema) rather than by leaving additionalProperties out.
            if (context.Type == typeof(FlowSolve.Api.Check.CheckRequestShape))
            {
                concrete.AdditionalPropertiesAllowed = true;
                concrete.AdditionalProperties = new OpenApiSchema();
            }
            if (concrete.Properties is null) return;
            foreach (var property in context.Type.GetProperties(BindingFlags.Public | BindingFlags.Instance))
            {
                var description = property.GetCustomAttribute<DescriptionAttribute>()?.Description;
                if (description is null) continue;
                string name = char.ToLowerInvariant(property.Name[0]) + property.Name[1..];
                if (concrete.Properties.TryGetValue(name, out var p) && p is OpenApiSchema ps) ps.Description = description;
            }
        }
    }

    /// <summary>Describes query parameters from their record properties' descriptions, and attaches examples.</summary>
    private sealed class ParameterAndExampleFilter : IOperationFilter
    {
        public void Apply(OpenApiOperation operation, OperationFilterContext context)
        {
            foreach (var parameter in operation.Parameters ?? [])
            {
                if (parameter is not OpenApiParameter p) continue;
                var description = context.ApiDescription.ParameterDescriptions
                    .FirstOrDefault(d => string.Equals(d.Name, p.Name, StringComparison.OrdinalIgnoreCase))?
                    .PropertyInfo()?.GetCustomAttribute<DescriptionAttribute>()?.Description;
                description ??= (context.ApiDescription.ParameterDescriptions
                    .FirstOrDefault(d => string.Equals(d.Name, p.Name, StringComparison.OrdinalIgnoreCase))?.ParameterDescriptor
                    as Microsoft.AspNetCore.Mvc.Infrastructure.IParameterInfoParameterDescriptor)?.ParameterInfo.GetCustomAttribute<DescriptionAttribute>()?.Description;
                if (description is not null) p.Description = description;
            }

            if (context.ApiDescription.ActionDescriptor.EndpointMetadata.OfType<CalculationMetadata>().FirstOrDefault() is { } calc)
            {
                operation.Parameters ??= [];
                foreach (var option in calc.Options)
                {
                    if (operation.Parameters.Any(p => p.Name == option.Name)) continue;
                    operation.Parameters.Add(new OpenApiParameter
                    {
                        Name = option.Name, In = ParameterLocation.Query, Description = option.Description,
                        Schema = option.Kind == QueryOptionKind.Boolean
                            ? new OpenApiSchema { Type = JsonSchemaType.Boolean, Description = option.Description }
                            : new OpenApiSchema { Type = JsonSchemaType.Integer, Format = "int32", Description = option.Description },
                    });
                }
                operation.Parameters.Add(new OpenApiParameter
                {
                    Name = "format", In = ParameterLocation.Query,
                    Description = (calc.Text
                        ? "json (default), text or html. text returns only the primary output (" + calc.PrimaryOutput +
                          ") as plain text, invariant culture, full precision, for a spreadsheet cell; an error is one line 'error: ...' with the same status. "
                        : "json (default) or html; text is not offered (the answer is tables, not one value) and answers 400. ") +
                        "html returns the calculation sheet: a self-contained printable page (no scripts or external files; A4 and Letter) with the inputs " +
                        "as understood and every default applied, the method and its published sources, the results, the solver record, the validity " +
                        "table, the warnings, the cautions, and inline SVG plots; an error is a small page stating the problem, with the same status.",
                    Schema = new OpenApiSchema { Type = JsonSchemaType.String },
                });
                if (calc.Text) operation.Parameters.Add(new OpenApiParameter
                {
                    Name = "select", In = ParameterLocation.Query,
                    Description = "With format=text: the output field to return instead of " + calc.PrimaryOutput + " (dotted for nested fields). " +
                        "select=warnings returns the answer's warning codes separated by commas (empty when there are none), so a cell beside " +
                        "the number can show every doubt.",
                    Schema = new OpenApiSchema { Type = JsonSchemaType.String },
                });
                operation.Parameters.Add(new OpenApiParameter
                {
                    Name = "strict", In = ParameterLocation.Query,
                    Description = "When true, an answer that carries any warning is refused with 422 whose body names the warning codes " +
                        "(one line 'error: strict: ...' with format=text), so a spreadsheet cell shows an error instead of a doubtful number.",
                    Schema = new OpenApiSchema { Type = JsonSchemaType.Boolean },
                });
                if (context.ApiDescription.HttpMethod == "POST" && operation.RequestBody is not null
                    && context.ApiDescription.ParameterDescriptions.Any(d => d.Source.Id == "Body" && typeof(ITraceable).IsAssignableFrom(d.Type)))
                    operation.Parameters.Add(new OpenApiParameter
                    {
                        Name = "trace", In = ParameterLocation.Query,
                        Description = "When true, include the solver's per-iteration record, as the body's own trace field does. Every other input of a POST belongs in the body: any other query parameter answers 400.",
                        Schema = new OpenApiSchema { Type = JsonSchemaType.Boolean },
                    });
                bool cacheable = context.ApiDescription.HttpMethod == "GET";
                if (cacheable)
                {
                    operation.Parameters.Add(new OpenApiParameter
                    {
                        Name = "If-None-Match", In = ParameterLocation.Header,
                        Description = "The ETag of an answer the client holds: when it names this request's answer (same request, same build), the " +
                            "answer is 304 Not Modified with no body.",
                        Schema = new OpenApiSchema { Type = JsonSchemaType.String },
                    });
                    operation.Responses ??= new OpenApiResponses();
                    operation.Responses["304"] = new OpenApiResponse
                    {
                        Description = "Not Modified: If-None-Match named this answer's ETag; the client's copy is the answer.",
                        Headers = CacheHeaders(),
                    };
                }
                if (operation.Responses?.TryGetValue("200", out var ok) == true && ok is OpenApiResponse okResponse)
                {
                    if (cacheable && calc.Text) okResponse.Headers = CacheHeaders();
                    okResponse.Content ??= new Dictionary<string, IOpenApiMediaType>();
                    if (calc.Text) okResponse.Content["text/plain"] = new OpenApiMediaType { Schema = new OpenApiSchema { Type = JsonSchemaType.String } };
                    okResponse.Content["text/html"] = new OpenApiMediaType { Schema = new OpenApiSchema { Type = JsonSchemaType.String } };
                }
            }

            var example = context.ApiDescription.ActionDescriptor.EndpointMetadata.OfType<RequestExample>().FirstOrDefault();
            if (example is null) return;
            foreach (var (name, value) in example.Query)
            {
                var p = operation.Parameters?.OfType<OpenApiParameter>().FirstOrDefault(x => x.Name == name);
                if (p is null) continue;
                bool numeric = p.Schema?.Type is { } t && (t & (JsonSchemaType.Number | JsonSchemaType.Integer)) != 0;
                bool boolean = p.Schema?.Type is { } u && u.HasFlag(JsonSchemaType.Boolean);
                // The example takes the parameter's own type, so it validates against the parameter's schema.
                p.Example = numeric && double.TryParse(value, System.Globalization.CultureInfo.InvariantCulture, out var d) ? JsonValue.Create(d)
                    : boolean && bool.TryParse(value, out var b) ? JsonValue.Create(b)
                    : JsonValue.Create(value);
            }
            if (example.Body is not null && operation.RequestBody?.Content is { } content)
            {
                foreach (var media in content.Values)
                    if (media is OpenApiMediaType m) m.Example = example.Body.DeepClone();
            }
        }
    }

    /// <summary>The headers of a cacheable GET answer (JSON or text; not the sheet, format=html, which carries neither).</summary>
    private static Dictionary<string, IOpenApiHeader> CacheHeaders() => new()
    {
        ["ETag"] = new OpenApiHeader
        {
            Description = "Strong entity tag of the canonical request (path and query parameters, names sorted, values as sent) and the " +
                "service's build; JSON and text answers only.",
            Schema = new OpenApiSchema { Type = JsonSchemaType.String },
        },
        ["Cache-Control"] = new OpenApiHeader
        {
            Description = "public, max-age=N (FlowSolve:Cache:MaxAgeSeconds, default 86400): an answer is deterministic for a given build.",
            Schema = new OpenApiSchema { Type = JsonSchemaType.String },
        },
    };

    private static PropertyInfo? PropertyInfo(this Microsoft.AspNetCore.Mvc.ApiExplorer.ApiParameterDescription d) =>
        d.ParameterDescriptor is { } pd && d.ModelMetadata?.ContainerType is { } container
            ? container.GetProperty(d.ModelMetadata.PropertyName ?? pd.Name, BindingFlags.Public | BindingFlags.Instance | BindingFlags.IgnoreCase)
            : null;
}
