using FlowSolve.Api.Problems;
using Microsoft.AspNetCore.Http.Json;
using Microsoft.Extensions.Diagnostics.HealthChecks;

namespace FlowSolve.Api.Hosting;

/// <summary>Registration of the built-in services the API relies on.</summary>
public static class ServiceSetup
{
    public static IServiceCollection AddFlowSolveServices(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddFlowSolveProtection(configuration);
        services.AddProblemDetails(o => o.CustomizeProblemDetails = ctx =>
        {
            // Never leak internals: the exception handler already chose the public text.
            ctx.ProblemDetails.Extensions.Remove("exception");
            ctx.ProblemDetails.Instance ??= ctx.HttpContext.Request.Path;
            // Status-code pages produce bare problems; say what the caller can do about the common ones.
            ctx.ProblemDetails.Detail ??= ctx.ProblemDetails.Status switch
            {
                404 => "There is no resource at this path. The routes are listed in /openapi/v1.json and at /docs.",
                405 => "This route does not answer this HTTP method; see /docs for the methods each route accepts.",
                415 => "The body must be JSON with Content-Type: application/json.",
                _ => null,
            };
        });
        services.AddExceptionHandler<BadRequestProblems>();
        services.Configure<RouteHandlerOptions>(o => o.ThrowOnBadRequest = true);
        services.Configure<JsonOptions>(o => JsonSetup.Configure(o.SerializerOptions));
        services.AddHealthChecks().AddCheck("self", () => HealthCheckResult.Healthy("calculations available"), tags: ["ready"]);
        services.AddFlowSolveOpenApi();
        services.AddSingleton<CalculationCatalog>();
        services.AddSingleton<AnswerCache>();
        return services;
    }

    public static WebApplication UseFlowSolvePipeline(this WebApplication app)
    {
        // Request logging outermost, so it records the status the client actually got (a binding failure turned
        // into a 400 by the exception handler, not the exception itself as a 500).
        app.UseFlowSolveRequestLogging();
        app.UseFlowSolveSecurityHeaders();
        app.UseExceptionHandler(new ExceptionHandlerOptions
        {
            // Bad input is the caller's, not ours: answered as a 400 without an error-level log entry and stack trace.
            SuppressDiagnosticsCallback = c => c.Exception is BadHttpRequestException,
        });
        app.UseStatusCodePages();
        app.UseFlowSolveProtection();
        // After the API key and rate limit, before any binding: a query is understood exactly or refused.
        app.UseMiddleware<StrictQuery>();
        app.UseFlowSolveMetrics();
        app.UseFlowSolveOpenApi();
        app.MapHealthChecks("/health/live", new() { Predicate = _ => false });
        app.MapHealthChecks("/health/ready", new() { Predicate = c => c.Tags.Contains("ready") });
        return app;
    }
}
