using System.Text;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Sheets;

/// <summary>
/// <c>format=html</c>: the calculation sheet, a self-contained printable HTML page of the inputs as understood, the
/// method with its sources, the results, the solver record, validity, warnings, cautions and plots as inline SVG.
/// The handler runs as usual; a successful result goes to the calculation's <see cref="ISheetBuilder"/>; an error is
/// a small page that states the problem, with the same HTTP status.
/// </summary>
public sealed class HtmlFormatFilter : IEndpointFilter
{
    public const string ContentType = "text/html";

    public async ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        // Reached only for format=html: AsCalculation's filter sends the other formats elsewhere.
        var http = context.HttpContext;

        var metadata = http.GetEndpoint()?.Metadata.GetMetadata<CalculationMetadata>();
        object? result = await next(context);
        if (result is not IResult typed || metadata is null) return result;
        var (status, value) = typed.Unwrap();
        var now = (http.RequestServices.GetService<TimeProvider>() ?? TimeProvider.System).GetUtcNow();

        if (status is >= 200 and < 300 && value is not null && SheetBuilders.TryGet(metadata.Name, out var builder)
            && Request(context) is { } request)
        {
            var sheet = builder.Build(new SheetContext(request, value, http.RequestServices));
            // Every response that carries sensitivities names them alike, so one table serves every sheet.
            var type = value.GetType();
            sheet.Sensitivities ??= type.GetProperty("Sensitivities")?.GetValue(value)
                as IReadOnlyDictionary<string, IReadOnlyDictionary<string, Contracts.SensitivityDto>>;
            sheet.RoughnessSpread ??= type.GetProperty("RoughnessSpread")?.GetValue(value) as Contracts.RoughnessSpreadDto;
            return TypedResults.Text(SheetHtml.Render(sheet, now), ContentType, Encoding.UTF8, status);
        }
        if (status is >= 200 and < 300)
        {
            var none = new ProblemDetails { Title = "No calculation sheet.", Detail = $"{metadata.Name} has no calculation sheet; use format=json." };
            return TypedResults.Text(SheetHtml.Problem(metadata.Name, 400, none, now), ContentType, Encoding.UTF8, 400);
        }
        return TypedResults.Text(SheetHtml.Problem(metadata.Name, status, value, now), ContentType, Encoding.UTF8, status);
    }

    /// <summary>The request record among the handler's arguments (the others are services such as a logger factory).</summary>
    private static object? Request(EndpointFilterInvocationContext context) =>
        context.Arguments.FirstOrDefault(a => a is not null && a is not ILoggerFactory && a is not HttpContext && a is not CancellationToken);
}
