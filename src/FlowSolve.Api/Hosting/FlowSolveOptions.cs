namespace FlowSolve.Api.Hosting;

/// <summary>Operational settings, section <c>FlowSolve</c> of appsettings.json or <c>FlowSolve__...</c> environment variables.</summary>
public sealed class FlowSolveOptions
{
    public const string Section = "FlowSolve";

    /// <summary>When set, every calculation route requires the header <c>X-Api-Key</c> with this value; health, metrics and docs stay open.</summary>
    public string? ApiKey { get; set; }

    public CorsSettings Cors { get; set; } = new();

    public LimitSettings Limits { get; set; } = new();

    public RateLimitSettings RateLimit { get; set; } = new();

    public CacheSettings Cache { get; set; } = new();

    public sealed class CorsSettings
    {
        /// <summary>Origins allowed to call from a browser (comma-separated in one environment variable is accepted). Empty: no CORS.</summary>
        public string[] Origins { get; set; } = [];
    }

    public sealed class LimitSettings
    {
        /// <summary>Largest request body in bytes (default 32 MiB); larger answers 413.</summary>
        public long MaxRequestBodyBytes { get; set; } = 32 * 1024 * 1024;

        /// <summary>Most rows in one batch (default 100 000); more answers 413.</summary>
        public int BatchRows { get; set; } = 100_000;

        /// <summary>Time budget of one request in seconds (default 30); a request over it answers 503, a batch is cut off with a final error row.</summary>
        public double RequestTimeoutSeconds { get; set; } = 30;

        /// <summary>Seconds a client may take to send a request's headers before the connection is dropped (Kestrel's
        /// RequestHeadersTimeout; a header sent one byte a second would otherwise hold a connection for half a minute).</summary>
        public double RequestHeadersTimeoutSeconds { get; set; } = 10;

        /// <summary>Most connections served at once (Kestrel's MaxConcurrentConnections); further ones wait in the
        /// operating system's queue. 0 means no limit.</summary>
        public long MaxConcurrentConnections { get; set; } = 1000;

        /// <summary>Most links (pipes and pumps together), and most nodes (junctions and reservoirs together), in one
        /// network solve (default 10 000; a grid of that size solves in about a quarter of a second); more answers 413.</summary>
        public int NetworkMaxPipes { get; set; } = 10_000;

        /// <summary>Most load cases (demand multipliers) in one network solve (default 24, a day in hours); more answers 413.</summary>
        public int NetworkMaxDemandMultipliers { get; set; } = 24;

        /// <summary>Most warnings of one code listed one by one in a network load case (default 50); beyond it one summary
        /// warning of that code says how many more elements it concerns (the per-element tables still carry every value).
        /// 0 or less lists every warning. A 9 948-pipe grid with 24 load cases and slow pipes almost everywhere answered
        /// 102 MB uncapped, 58 MB (the element tables) with the default.</summary>
        public int NetworkWarningsPerCode { get; set; } = 50;

        /// <summary>Most element rows (pipes, pumps, junctions and reservoirs listed) times load cases in one network
        /// answer (default 100 000); more answers 413 naming this limit before anything is solved. It bounds the answer
        /// and the memory of one request: a 9 661-pipe grid with 24 load cases listed in full (about 350 000 rows) answered
        /// 56 MB, and four at once exhausted a 384 MiB heap. A caller asks for less with output.detail=summary (no rows)
        /// or output.elements (chosen rows).</summary>
        public long NetworkMaxElementCases { get; set; } = 100_000;

        /// <summary>Most junctions asked for in one fire-flow request (default 500); more answers 413. Each costs a few
        /// network solves (see docs/performance.md); the request's time budget still applies.</summary>
        public int NetworkMaxFireFlowJunctions { get; set; } = 500;

        /// <summary>Longest extended-period run in seconds (default 7 days, 604 800 s); a longer duration answers 413
        /// before anything is solved. The report times times the elements listed are bounded by NetworkMaxElementCases.</summary>
        public double NetworkMaxSimulationDuration { get; set; } = 7 * 86_400;
    }

    public sealed class RateLimitSettings
    {
        /// <summary>Requests per client address per minute on calculation routes; 0 (default) turns rate limiting off.</summary>
        public int PermitsPerMinute { get; set; }
    }

    public sealed class CacheSettings
    {
        /// <summary>max-age of <c>Cache-Control: public</c> on GET calculation answers, seconds (default one day: an answer
        /// is deterministic for a given build). 0 makes clients revalidate every time (the ETag still saves the answer).</summary>
        public int MaxAgeSeconds { get; set; } = 86_400;

        /// <summary>An extra component of every ETag; change it to make clients fetch every answer afresh (after a change
        /// of data outside the build, say). Empty by default.</summary>
        public string Generation { get; set; } = "";
    }
}
