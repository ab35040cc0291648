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
    /// <remarks>Computed on every cacheable GET, so it allocates only the tag: the pairs are gathered in one pass over the
    /// query into the thread's own array and put in order by insertion (a cell's query has a handful), the canonical
    /// bytes written on the stack (pooled when long), the names lower-cased in place (they are the routes' ASCII names),
    /// and the hash written as hexadecimal digits straight into the tag.</remarks>
    public string Tag(HttpRequest request)
    {
        var query = request.Query;
        string path = request.Path.Value ?? "";
        var pairs = t_pairs ??= new KeyValuePair<string, string>[16];
        int n = 0, length = _build.Length + 2 + Encoding.UTF8.GetMaxByteCount(path.Length);
        foreach (var (name, values) in query)
        {
            if (values.Count == 0)
            {
                Add(ref pairs, ref n, name, "");
                length += Encoding.UTF8.GetMaxByteCount(name.Length) + 2;
                continue;
            }
            for (int i = 0; i < values.Count; i++)
            {
                string value = values[i] ?? "";
                Add(ref pairs, ref n, name, value);
                length += Encoding.UTF8.GetMaxByteCount(name.Length + value.Length) + 2;
            }
        }
        byte[]? rented = null;
        try
        {
            var span = pairs.AsSpan(0, n);
            if (n <= 16)
            {
                for (int i = 1; i < n; i++)
                {
                    var pair = span[i];
                    int j = i - 1;
                    for (; j >= 0 && Compare(span[j], pair) > 0; j--) span[j + 1] = span[j];
                    span[j + 1] = pair;
                }
            }
            else
            {
                span.Sort(static (a, b) => Compare(a, b));
            }
            Span<byte> buffer = length <= 1024 ? stackalloc byte[1024] : (rented = ArrayPool<byte>.Shared.Rent(length));
            int at = Encoding.UTF8.GetBytes(_build, buffer);
            buffer[at++] = (byte)'\n';
            at += Encoding.UTF8.GetBytes(path, buffer[at..]);
            buffer[at++] = (byte)'\n';
            foreach (var (name, value) in span)
            {
                int start = at;
                at += Encoding.UTF8.GetBytes(name, buffer[at..]);
                for (int i = start; i < at; i++) if (buffer[i] is >= (byte)'A' and <= (byte)'Z') buffer[i] |= 0x20;
                buffer[at++] = (byte)'=';
                at += Encoding.UTF8.GetBytes(value, buffer[at..]);
                buffer[at++] = (byte)'\n';
            }
            // XXH128: a 128-bit non-cryptographic hash, deterministic across processes and machines (unlike string hash
            // codes), so every replica of a build gives a request the same tag; a tag names, it does not protect.
            UInt128 hash = XxHash128.HashToUInt128(buffer[..at]);
            return string.Create(34, hash, static (chars, h) =>
            {
                chars[0] = chars[^1] = '"';
                for (int i = 32; i >= 1; i--, h >>= 4) chars[i] = "0123456789abcdef"[(int)(h & 0xF)];
            });
        }
        finally
        {
            Array.Clear(pairs, 0, n); // hold no request's strings past the request
            if (rented is not null) ArrayPool<byte>.Shared.Return(rented);
        }
    }

    [ThreadStatic] private static KeyValuePair<string, string>[]? t_pairs;

    private static void Add(ref KeyValuePair<string, string>[] pairs, ref int n, string name, string value)
    {
        if (n == pairs.Length)
        {
            Array.Resize(ref pairs, 2 * n);
            t_pairs = pairs.Length <= 256 ? pairs : null; // a long query's array is not kept per thread
        }
        pairs[n++] = new(name, value);
    }

    /// <summary>Names case-insensitively, then values ordinally: the canonical order of the pairs.</summary>
    private static int Compare(in KeyValuePair<string, string> a, in KeyValuePair<string, string> b) =>
        string.Compare(a.Key, b.Key, StringComparison.OrdinalIgnoreCase) is var c && c != 0 ? c : string.CompareOrdinal(a.Value, b.Value);

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
