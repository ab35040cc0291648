using System.Security.Cryptography;
using System.Text;
using System.Threading.RateLimiting;
using Microsoft.AspNetCore.Http.Timeouts;
using Microsoft.AspNetCore.RateLimiting;
using Microsoft.Extensions.Options;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// What keeps one service usable for a whole office: body-size, batch-row and time limits, an optional rate limit,
/// an optional API key, CORS, and security headers. Each limit answers with its own status and a problem that
/// names it (413 body or rows, 429 rate, 503 time budget, 401 key).
/// </summary>
public static class Protection
{
    public const string ApiKeyHeader = "X-Api-Key";
    public const string CorsPolicy = "configured-origins";

    public static IServiceCollection AddFlowSolveProtection(this IServiceCollection services, IConfiguration configuration)
    {
        var settings = configuration.GetSection(FlowSolveOptions.Section).Get<FlowSolveOptions>() ?? new FlowSolveOptions();
        services.AddOptions<FlowSolveOptions>().BindConfiguration(FlowSolveOptions.Section);
        services.Configure<Microsoft.AspNetCore.Server.Kestrel.Core.KestrelServerOptions>(k =>
        {
            k.Limits.MaxRequestBodySize = settings.Limits.MaxRequestBodyBytes;
            k.Limits.RequestHeadersTimeout = TimeSpan.FromSeconds(settings.Limits.RequestHeadersTimeoutSeconds);
            // Idle keep-alive connections are dropped as soon as a slow header would be.
            k.Limits.KeepAliveTimeout = TimeSpan.FromSeconds(Math.Max(settings.Limits.RequestHeadersTimeoutSeconds, 5));
            k.Limits.MaxConcurrentConnections = settings.Limits.MaxConcurrentConnections > 0 ? settings.Limits.MaxConcurrentConnections : null;
            k.AddServerHeader = false;
        });

        services.AddRequestTimeouts(o => o.DefaultPolicy = new RequestTimeoutPolicy
        {
            Timeout = TimeSpan.FromSeconds(settings.Limits.RequestTimeoutSeconds),
            TimeoutStatusCode = StatusCodes.Status503ServiceUnavailable,
            WriteTimeoutResponse = ctx => Write(ctx, 503, "The request ran past its time budget.",
                $"The request took longer than the configured time budget of {settings.Limits.RequestTimeoutSeconds} s (FlowSolve:Limits:RequestTimeoutSeconds) and was stopped.",
                "requestTimeoutSeconds"),
        });

        services.AddRateLimiter(o =>
        {
            o.RejectionStatusCode = StatusCodes.Status429TooManyRequests;
            o.OnRejected = (ctx, ct) =>
            {
                ctx.HttpContext.Response.Headers.RetryAfter = "60";
                return new ValueTask(Write(ctx.HttpContext, 429, "Too many requests.",
                    $"This client has used its {settings.RateLimit.PermitsPerMinute} requests per minute (FlowSolve:RateLimit:PermitsPerMinute). Retry after a minute, or send rows as one batch.",
                    "permitsPerMinute"));
            };
            o.GlobalLimiter = PartitionedRateLimiter.Create<HttpContext, string>(ctx =>
            {
                int permits = settings.RateLimit.PermitsPerMinute;
                if (permits <= 0 || !ctx.Request.Path.StartsWithSegments("/v1")) return RateLimitPartition.GetNoLimiter("open");
                string client = ctx.Connection.RemoteIpAddress?.ToString() ?? "unknown";
                return RateLimitPartition.GetFixedWindowLimiter(client, _ => new FixedWindowRateLimiterOptions
                {
                    PermitLimit = permits,
                    Window = TimeSpan.FromMinutes(1),
                    QueueLimit = 0,
                });
            });
        });

        var origins = settings.Cors.Origins.SelectMany(o => o.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)).ToArray();
        services.AddCors(o => o.AddPolicy(CorsPolicy, p =>
        {
            if (origins.Length > 0) p.WithOrigins(origins).WithMethods("GET", "POST").WithHeaders("Content-Type", ApiKeyHeader);
        }));
        return services;
    }

    /// <summary>Security headers on every answer; first in the pipeline.</summary>
    public static WebApplication UseFlowSolveSecurityHeaders(this WebApplication app)
    {
        app.Use(SecurityHeaders);
        return app;
    }

    public static WebApplication UseFlowSolveProtection(this WebApplication app)
    {
        app.UseCors(CorsPolicy);
        app.Use(CheckBodySize);
        app.Use(CheckApiKey);
        // Without a configured limit no request is limited, so none passes through the limiter's partition lookup (a
        // lock shared by every request).
        if (app.Services.GetRequiredService<IOptions<FlowSolveOptions>>().Value.RateLimit.PermitsPerMinute > 0) app.UseRateLimiter();
        app.UseRequestTimeouts();
        return app;
    }

    private static Task SecurityHeaders(HttpContext ctx, RequestDelegate next)
    {
        // Set when the response starts, so answers rewritten by the exception handler (which clears headers) keep them.
        ctx.Response.OnStarting(static state => { AddSecurityHeaders((HttpContext)state); return Task.CompletedTask; }, ctx);
        return next(ctx);
    }

    private static void AddSecurityHeaders(HttpContext ctx)
    {
        var h = ctx.Response.Headers;
        h.XContentTypeOptions = "nosniff";
        h.XFrameOptions = "DENY";
        h["Referrer-Policy"] = "no-referrer";
        // The documentation UI needs its own scripts and styles; everything else is data and needs nothing.
        h.ContentSecurityPolicy = ctx.Request.Path.StartsWithSegments("/docs")
            ? "default-src 'self'; img-src 'self' data:; style-src 'self' 'unsafe-inline'; script-src 'self' 'unsafe-inline'; frame-ancestors 'none'"
            // A calculation sheet (format=html) carries its own inline style sheet and inline SVG, and nothing else.
            : ctx.Response.ContentType?.StartsWith("text/html", StringComparison.OrdinalIgnoreCase) == true
                ? "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'"
                : "default-src 'none'; frame-ancestors 'none'";
    }

    /// <summary>
    /// Refuses a body whose declared length is over the limit before reading it. Kestrel enforces the same limit on
    /// bodies without a declared length (chunked) while they are read; that failure becomes a 413 problem too.
    /// </summary>
    private static async Task CheckBodySize(HttpContext ctx, RequestDelegate next)
    {
        long limit = ctx.RequestServices.GetRequiredService<IOptions<FlowSolveOptions>>().Value.Limits.MaxRequestBodyBytes;
        if (ctx.Request.ContentLength is long length && length > limit)
        {
            await Write(ctx, 413, "The request body is too large.",
                $"The body is {length} bytes; the configured limit is {limit} bytes (FlowSolve:Limits:MaxRequestBodyBytes). Split the batch.",
                "maxRequestBodyBytes");
            return;
        }
        await next(ctx);
    }

    private static async Task CheckApiKey(HttpContext ctx, RequestDelegate next)
    {
        var key = ctx.RequestServices.GetRequiredService<IOptions<FlowSolveOptions>>().Value.ApiKey;
        if (string.IsNullOrEmpty(key) || !ctx.Request.Path.StartsWithSegments("/v1") || HttpMethods.IsOptions(ctx.Request.Method))
        {
            await next(ctx);
            return;
        }
        string given = ctx.Request.Headers[ApiKeyHeader].ToString();
        // Constant-time comparison, so the key cannot be found a character at a time from response timings.
        if (CryptographicOperations.FixedTimeEquals(Encoding.UTF8.GetBytes(given), Encoding.UTF8.GetBytes(key)))
        {
            await next(ctx);
            return;
        }
        ctx.Response.Headers.WWWAuthenticate = "ApiKey header=\"" + ApiKeyHeader + "\"";
        await Write(ctx, 401, "An API key is required.",
            $"This service requires the header {ApiKeyHeader} on calculation routes (FlowSolve:ApiKey); the key given is missing or wrong.", "apiKey");
    }

    /// <summary>Writes a problem that names the limit or check that stopped the request.</summary>
    private static async Task Write(HttpContext ctx, int status, string title, string detail, string limit)
    {
        if (ctx.Response.HasStarted) return;
        ctx.Response.StatusCode = status;
        var problems = ctx.RequestServices.GetRequiredService<IProblemDetailsService>();
        await problems.WriteAsync(new ProblemDetailsContext
        {
            HttpContext = ctx,
            ProblemDetails = new() { Status = status, Title = title, Detail = detail, Extensions = { ["limit"] = limit } },
        });
    }
}
