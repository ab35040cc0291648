using System.Buffers;
using System.IO.Hashing;
using System.Text;
using Microsoft.Extensions.Options;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// HTTP caching of GET calculation answers (JSON and text; not the sheet, which is stamped with the time it was made):
/// a strong <c>ETag</c> (XXH128) of the canonical request and the build, and <c>Cache-Control: public, max-age=N</c>. A request
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
    /// <remarks>Computed on every cacheable GET, so it allocates only the tag: the pairs are sorted in a pooled array and
    /// the canonical bytes written into a pooled buffer (names lower-cased in place: they are the routes' ASCII names).</remarks>
    public string Tag(HttpRequest request)
    {
        var query = request.Query;
        int count = 0;
        foreach (var (_, values) in query) count += Math.Max(values.Count, 1);
        var pairs = ArrayPool<KeyValuePair<string, string>>.Shared.Rent(Math.Max(count, 1));
        byte[]? buffer = null;
        try
        {
            int n = 0, length = _build.Length + 2 + Encoding.UTF8.GetMaxByteCount(request.Path.Value?.Length ?? 0);
            foreach (var (name, values) in query)
            {
                if (values.Count == 0) { pairs[n++] = new(name, ""); length += Encoding.UTF8.GetMaxByteCount(name.Length) + 2; continue; }
                foreach (var value in values)
                {
                    pairs[n++] = new(name, value ?? "");
                    length += Encoding.UTF8.GetMaxByteCount(name.Length + (value?.Length ?? 0)) + 2;
                }
            }
            var span = pairs.AsSpan(0, n);
            span.Sort(static (a, b) => string.Compare(a.Key, b.Key, StringComparison.OrdinalIgnoreCase) is var c && c != 0 ? c : string.CompareOrdinal(a.Value, b.Value));
            buffer = ArrayPool<byte>.Shared.Rent(length);
            int at = Encoding.UTF8.GetBytes(_build, buffer);
            buffer[at++] = (byte)'\n';
            at += Encoding.UTF8.GetBytes(request.Path.Value ?? "", buffer.AsSpan(at));
            buffer[at++] = (byte)'\n';
            foreach (var (name, value) in span)
            {
                int start = at;
                at += Encoding.UTF8.GetBytes(name, buffer.AsSpan(at));
                for (int i = start; i < at; i++) if (buffer[i] is >= (byte)'A' and <= (byte)'Z') buffer[i] |= 0x20;
                buffer[at++] = (byte)'=';
                at += Encoding.UTF8.GetBytes(value, buffer.AsSpan(at));
                buffer[at++] = (byte)'\n';
            }
            // XXH128: a 128-bit non-cryptographic hash, deterministic across processes and machines (unlike string hash
            // codes), so every replica of a build gives a request the same tag; a tag names, it does not protect.
            UInt128 hash = XxHash128.HashToUInt128(buffer.AsSpan(0, at));
            return string.Create(34, hash, static (chars, h) =>
            {
                chars[0] = chars[^1] = '"';
                h.TryFormat(chars[1..^1], out _, "x32", System.Globalization.CultureInfo.InvariantCulture);
            });
        }
        finally
        {
            ArrayPool<KeyValuePair<string, string>>.Shared.Return(pairs, clearArray: true);
            if (buffer is not null) ArrayPool<byte>.Shared.Return(buffer);
        }
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
