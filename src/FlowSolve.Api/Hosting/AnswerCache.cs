using System.Security.Cryptography;
using System.Text;
using Microsoft.Extensions.Options;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// HTTP caching of GET calculation answers (JSON and text; not the sheet, which is stamped with the time it was made):
/// a strong <c>ETag</c> from the canonical request and the build, and <c>Cache-Control: public, max-age=N</c>. A request
/// whose <c>If-None-Match</c> holds the tag answers 304 with no body before anything is solved: an answer is
/// deterministic for a given build and request, so the tag a client holds names the answer it holds.
/// </summary>
/// <remarks>The canonical request is the path and every query parameter, names lower-cased and sorted, values exactly
/// as sent (the strict-query rules have accepted them; <c>0.5</c> and <c>0.50</c> are different requests with the same
/// answer, and get different tags). The build is the module version ids of the service and library assemblies (new with
/// every compilation) and the configured generation (<c>FlowSolve:Cache:Generation</c>).</remarks>
public sealed class AnswerCache
{
    private readonly string _build;

    public AnswerCache(IOptions<FlowSolveOptions> options)
        : this(BuildOf(typeof(AnswerCache), typeof(Core.Numerics.SafeguardedNewton)) + "/" + options.Value.Cache.Generation,
            options.Value.Cache.MaxAgeSeconds)
    {
    }

    /// <param name="build">What identifies the build (and generation) in every tag.</param>
    /// <param name="maxAgeSeconds">The max-age of Cache-Control, seconds; negative values count as 0.</param>
    public AnswerCache(string build, int maxAgeSeconds)
    {
        _build = build;
        CacheControl = "public, max-age=" + Math.Max(0, maxAgeSeconds).ToString(System.Globalization.CultureInfo.InvariantCulture);
    }

    /// <summary>The Cache-Control value of every cacheable answer.</summary>
    public string CacheControl { get; }

    /// <summary>The module version ids of the given types' assemblies: they change with every compilation.</summary>
    public static string BuildOf(params Type[] types) => string.Join("+", types.Select(t => t.Assembly.ManifestModule.ModuleVersionId.ToString("N")));

    /// <summary>The strong entity tag of a GET request's answer (quoted, as the header carries it).</summary>
    public string Tag(HttpRequest request)
    {
        var query = request.Query;
        var pairs = new List<(string Name, string Value)>(query.Count);
        foreach (var (name, values) in query)
            foreach (var value in values) pairs.Add((name.ToLowerInvariant(), value ?? ""));
        pairs.Sort(static (a, b) => string.CompareOrdinal(a.Name, b.Name) is var c && c != 0 ? c : string.CompareOrdinal(a.Value, b.Value));
        var canonical = new StringBuilder(_build.Length + 128).Append(_build).Append('\n').Append(request.Path.Value).Append('\n');
        foreach (var (name, value) in pairs) canonical.Append(name).Append('=').Append(value).Append('\n');
        Span<byte> hash = stackalloc byte[32];
        SHA256.HashData(Encoding.UTF8.GetBytes(canonical.ToString()), hash);
        return "\"" + Convert.ToHexStringLower(hash[..16]) + "\"";
    }

    /// <summary>True when an <c>If-None-Match</c> header names <paramref name="tag"/> (or is <c>*</c>), by the weak
    /// comparison RFC 9110 section 13.1.2 prescribes for it.</summary>
    public static bool Matches(string? ifNoneMatch, string tag)
    {
        if (string.IsNullOrEmpty(ifNoneMatch)) return false;
        foreach (var part in ifNoneMatch.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries))
        {
            if (part == "*") return true;
            var candidate = part.StartsWith("W/", StringComparison.Ordinal) ? part[2..] : part;
            if (string.Equals(candidate, tag, StringComparison.Ordinal)) return true;
        }
        return false;
    }

    /// <summary>Puts the tag and Cache-Control on a response.</summary>
    public void Stamp(HttpResponse response, string tag)
    {
        response.Headers.ETag = tag;
        response.Headers.CacheControl = CacheControl;
    }
}

/// <summary>304 Not Modified: the client's copy (named by its tag) is the answer; no body.</summary>
internal sealed class NotModified(AnswerCache cache, string tag) : IResult, IStatusCodeHttpResult
{
    public int? StatusCode => StatusCodes.Status304NotModified;

    public Task ExecuteAsync(HttpContext httpContext)
    {
        httpContext.Response.StatusCode = StatusCodes.Status304NotModified;
        cache.Stamp(httpContext.Response, tag);
        return Task.CompletedTask;
    }
}
