using System.Text;
using System.Text.Json;
using System.Text.RegularExpressions;

namespace FlowSolve.Api.Tests.Docs;

/// <summary>
/// The documentation stays usable: every relative link in README.md, DEVELOPERS.md, docs/, samples/README.md and the
/// library's package readme points to a file that exists (and to a heading that exists, for a #anchor); every
/// <c>/v1/...</c> route they mention is in the committed OpenAPI document; README.md and DEVELOPERS.md stay at most
/// 15 KB each (15 360 bytes), so the front door and the guide stay readable.
/// </summary>
public sealed partial class DocumentationTests
{
    /// <summary>The size limit of README.md and DEVELOPERS.md, bytes.</summary>
    public const int MaxBytes = 15 * 1024;

    private static string Root => Samples.LiveService.RepositoryRoot;

    /// <summary>Every Markdown file the checks cover, relative to the repository root.</summary>
    public static TheoryData<string> Pages()
    {
        var pages = new TheoryData<string>();
        foreach (var f in DocumentFiles()) pages.Add(f);
        return pages;
    }

    private static IEnumerable<string> DocumentFiles()
    {
        string root = Root;
        var files = new List<string> { "README.md", "DEVELOPERS.md", "samples/README.md", "src/FlowSolve.Core/README.md" };
        string docs = Path.Combine(root, "docs");
        if (Directory.Exists(docs))
            files.AddRange(Directory.EnumerateFiles(docs, "*.md", SearchOption.AllDirectories)
                .Select(f => Path.GetRelativePath(root, f).Replace('\\', '/')).Order(StringComparer.Ordinal));
        return files;
    }

    [Theory]
    [InlineData("README.md")]
    [InlineData("DEVELOPERS.md")]
    public void Page_IsAtMost15KB(string file)
    {
        long bytes = new FileInfo(Path.Combine(Root, file)).Length;
        Assert.True(bytes <= MaxBytes, $"{file} is {bytes} bytes, more than {MaxBytes}: move detail to a page under docs/");
    }

    [Fact]
    public void EveryArea_HasItsPage()
    {
        string[] pages = ["friction-and-water", "pipes", "pumps", "networks", "channels", "spreadsheets", "audit", "operations",
            "library", "performance"];
        foreach (var page in pages)
            Assert.True(File.Exists(Path.Combine(Root, "docs", page + ".md")), $"docs/{page}.md is missing");
    }

    [Theory]
    [MemberData(nameof(Pages))]
    public void EveryRelativeLink_PointsToAnExistingFileAndHeading(string file)
    {
        string path = Path.Combine(Root, file);
        Assert.True(File.Exists(path), $"{file} is missing");
        var broken = new List<string>();
        foreach (var (line, target) in Links(File.ReadAllText(path)))
        {
            if (IsExternal(target)) continue;
            string[] parts = target.Split('#', 2);
            string linked = parts[0].Length == 0
                ? path
                : Path.GetFullPath(Path.Combine(Path.GetDirectoryName(path)!, Uri.UnescapeDataString(parts[0])));
            if (!File.Exists(linked) && !Directory.Exists(linked))
            {
                broken.Add($"line {line}: {target}: no such file");
                continue;
            }
            if (parts.Length == 2 && parts[1].Length > 0)
            {
                if (!linked.EndsWith(".md", StringComparison.OrdinalIgnoreCase) || !File.Exists(linked))
                    broken.Add($"line {line}: {target}: an anchor into something that is not a Markdown file");
                else if (!Anchors(File.ReadAllText(linked)).Contains(parts[1]))
                    broken.Add($"line {line}: {target}: no heading with the anchor #{parts[1]}");
            }
        }
        Assert.True(broken.Count == 0, $"{file}: broken links:\n" + string.Join("\n", broken));
    }

    [Theory]
    [MemberData(nameof(Pages))]
    public void EveryDocumentedRoute_IsInTheCommittedOpenApiDocument(string file)
    {
        var templates = CommittedPaths();
        var unknown = new List<string>();
        int line = 0;
        foreach (string text in File.ReadAllLines(Path.Combine(Root, file)))
        {
            line++;
            foreach (Match m in RouteRegex().Matches(text))
            {
                string route = m.Value.TrimEnd('.', '/', ',', ':', ';');
                if (!IsDocumented(route, templates)) unknown.Add($"line {line}: {route}");
            }
        }
        Assert.True(unknown.Count == 0, $"{file} names routes that the committed OpenAPI document does not have:\n" + string.Join("\n", unknown));
    }

    /// <summary>The route checker itself: a route that exists passes, a renamed or invented one does not.</summary>
    [Fact]
    public void RouteCheck_TellsKnownFromUnknownRoutes()
    {
        var templates = CommittedPaths();
        Assert.True(IsDocumented("/v1/pipes/head-loss", templates));
        Assert.True(IsDocumented("/v1/batch/pipes/diameter", templates));
        Assert.True(IsDocumented("/v1/batch/check/friction-factor", templates));
        Assert.True(IsDocumented("/v1/check/{calculation}", templates));
        Assert.False(IsDocumented("/v1/pipes/headloss", templates));
        Assert.False(IsDocumented("/v1/batch/pipes/nothing", templates));
        Assert.False(IsDocumented("/v1/check/networks/solve-later", templates));
    }

    /// <summary>The anchor rule itself, on headings of the kinds the docs use.</summary>
    [Fact]
    public void Anchors_FollowTheHeadingText()
    {
        var anchors = Anchors("# Pipes\n## Head loss: `GET|POST /v1/pipes/head-loss`\n```\n# not a heading\n```\n## Pipes\n");
        Assert.Contains("pipes", anchors);
        Assert.Contains("head-loss-getpost-v1pipeshead-loss", anchors);
        Assert.Contains("pipes-1", anchors);
        Assert.DoesNotContain("not-a-heading", anchors);
    }

    private static bool IsExternal(string target) =>
        target.StartsWith("http://", StringComparison.OrdinalIgnoreCase) || target.StartsWith("https://", StringComparison.OrdinalIgnoreCase)
        || target.StartsWith("mailto:", StringComparison.OrdinalIgnoreCase);

    /// <summary>The path templates of the committed document, openapi/flowsolve.v1.json.</summary>
    private static HashSet<string> CommittedPaths()
    {
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(Root, "openapi", "flowsolve.v1.json")));
        return doc.RootElement.GetProperty("paths").EnumerateObject().Select(p => p.Name).ToHashSet(StringComparer.Ordinal);
    }

    /// <summary>A route is documented when it is a path of the document, or a batch or check route
    /// (<c>/v1/batch/{calculation}</c>, <c>/v1/check/{calculation}</c>) whose calculation is itself a path of the document.</summary>
    private static bool IsDocumented(string route, HashSet<string> templates)
    {
        if (templates.Contains(route)) return true;
        foreach (string prefix in (string[])["/v1/batch/", "/v1/check/"])
        {
            if (!route.StartsWith(prefix, StringComparison.Ordinal) || !templates.Contains(prefix + "{calculation}")) continue;
            string rest = route[prefix.Length..];
            if (rest.Length > 0 && !rest.StartsWith('{') && IsDocumented("/v1/" + rest, templates)) return true;
        }
        return false;
    }

    /// <summary>Inline links <c>[text](target)</c> outside fenced code blocks and code spans, with their line numbers.</summary>
    private static IEnumerable<(int Line, string Target)> Links(string markdown)
    {
        int line = 0;
        bool fenced = false;
        foreach (string raw in markdown.Split('\n'))
        {
            line++;
            if (raw.TrimStart().StartsWith("```", StringComparison.Ordinal)) { fenced = !fenced; continue; }
            if (fenced) continue;
            string text = CodeSpanRegex().Replace(raw, "");
            foreach (Match m in LinkRegex().Matches(text)) yield return (line, m.Groups[1].Value);
        }
    }

    /// <summary>The anchors of a Markdown page's headings as GitHub makes them: lower case, punctuation other than
    /// hyphens and underscores dropped, spaces to hyphens, a repeated anchor numbered -1, -2, ...</summary>
    public static HashSet<string> Anchors(string markdown)
    {
        var anchors = new HashSet<string>(StringComparer.Ordinal);
        var seen = new Dictionary<string, int>(StringComparer.Ordinal);
        bool fenced = false;
        foreach (string raw in markdown.Split('\n'))
        {
            string l = raw.TrimEnd('\r');
            if (l.TrimStart().StartsWith("```", StringComparison.Ordinal)) { fenced = !fenced; continue; }
            if (fenced) continue;
            var h = HeadingRegex().Match(l);
            if (!h.Success) continue;
            string title = LinkRegex().Replace(h.Groups[1].Value.Trim(), m => m.Value[1..m.Value.IndexOf(']')]);
            var slug = new StringBuilder();
            foreach (char c in title.ToLowerInvariant())
            {
                if (char.IsLetterOrDigit(c) || c is '-' or '_') slug.Append(c);
                else if (c == ' ') slug.Append('-');
            }
            string anchor = slug.ToString();
            if (seen.TryGetValue(anchor, out int n))
            {
                seen[anchor] = n + 1;
                anchors.Add($"{anchor}-{n + 1}");
            }
            else
            {
                seen[anchor] = 0;
                anchors.Add(anchor);
            }
        }
        return anchors;
    }

    [GeneratedRegex(@"\[[^\]]*\]\(([^)\s]+)\)")]
    private static partial Regex LinkRegex();

    [GeneratedRegex(@"`[^`]*`")]
    private static partial Regex CodeSpanRegex();

    [GeneratedRegex(@"^#{1,6}\s+(.+?)\s*#*\s*$")]
    private static partial Regex HeadingRegex();

    [GeneratedRegex(@"/v1/[A-Za-z0-9_\-/{}*]+")]
    private static partial Regex RouteRegex();
}
