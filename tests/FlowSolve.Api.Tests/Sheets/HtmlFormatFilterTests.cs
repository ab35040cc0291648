using System.Text.RegularExpressions;

namespace FlowSolve.Api.Tests.Sheets;

/// <summary>format=html on every calculation: a self-contained page with every part the issue asks for.</summary>
public sealed class HtmlFormatFilterTests(ApiFixture api)
{
    /// <summary>One GET per calculation with a sheet; the inputs are the OpenAPI examples' kind of case.</summary>
    public static TheoryData<string> Sheets => new()
    {
        "/v1/friction-factor?reynolds=75000&relativeRoughness=0.005",
        "/v1/friction-factor?reynolds=1500&relativeRoughness=0.001",
        "/v1/pipes/head-loss?flow=0.2&diameter=0.2&length=500&material=cast-iron&kinematicViscosity=1e-5&density=900",
        "/v1/pipes/head-loss?flow=0.05&diameter=0.2&length=1200&roughness=0.00026&method=hazen-williams&hazenWilliamsC=120&units=si",
        "/v1/pipes/flow?headLoss=20&diameter=0.15&length=800&roughness=0.000045&elevationChange=5&temperature=10",
        "/v1/pipes/diameter?flow=0.03&headLoss=6&length=400&material=commercial-steel&sizeTable=asme-b36.10m-schedule-40",
        "/v1/channels/normal-depth?shape=trapezoidal&bottomWidth=3&sideSlope=2&manningN=0.025&slope=0.001&flow=10",
        "/v1/channels/normal-depth?shape=circular&diameter=1&manningN=0.013&slope=0.01&flow=0.8",
        "/v1/channels/critical-depth?shape=rectangular&bottomWidth=4&flow=12&manningN=0.015",
        "/v1/channels/normal-depth?shape=surveyed&points=0:2,4:0,7:0,11:2&manningN=0.03&slope=0.001&flow=5&units=us",
        "/v1/fluids/water?temperature=20",
    };

    [Theory]
    [MemberData(nameof(Sheets))]
    public async Task Get_FormatHtml_SelfContainedSheetWithEveryPart(string url)
    {
        var page = await SheetPage.Get(api, url + "&format=html");

        Assert.Equal(200, page.Status);
        Assert.Equal("text/html", page.ContentType);
        var doc = page.Document;
        Assert.False(string.IsNullOrWhiteSpace(doc.QuerySelector("h1")?.TextContent));
        Assert.Matches(@"FlowSolve \S+ .* prepared \d{4}-\d{2}-\d{2}", doc.QuerySelector("header .meta")!.TextContent);
        foreach (var id in new[] { "inputs", "method", "results", "solver", "validity", "warnings", "cautions" })
            Assert.NotNull(doc.GetElementById(id));
        string cautions = doc.GetElementById("cautions")!.TextContent;
        Assert.Contains("engineering estimate", cautions);
        Assert.Contains("qualified engineer", cautions);
        Assert.Contains("Local codes", cautions);
        Assert.Contains("water hammer", cautions);
        Assert.Contains("structural design", cautions);
        Assert.Contains("@page", doc.QuerySelector("style")!.TextContent);
        Assert.True(doc.QuerySelectorAll("svg").Length >= 2, "a plot and the convergence history");
        AssertSelfContained(page);
    }

    [Fact]
    public async Task Post_FormatHtml_SameSheetAsGet()
    {
        var page = await SheetPage.Post(api, "/v1/pipes/head-loss?format=html",
            new { flow = 0.05, diameter = 0.2, length = 1200, material = "cast-iron", fittings = new[] { new { name = "gate-valve-open", count = 2 } }, temperature = 15 });
        var json = await api.PostJson("/v1/pipes/head-loss",
            new { flow = 0.05, diameter = 0.2, length = 1200, material = "cast-iron", fittings = new[] { new { name = "gate-valve-open", count = 2 } }, temperature = 15 });

        Assert.Equal(200, page.Status);
        var marker = Assert.Single(page.Cases("plot-head-loss"));
        Assert.Equal(json.Body.GetProperty("headLoss").GetDouble(), SheetPage.Attr(marker, "data-y"));
        Assert.Contains("gate-valve-open", page.Document.GetElementById("inputs")!.TextContent);
        AssertSelfContained(page);
    }

    [Fact]
    public async Task Get_FormatHtml_EveryDefaultIsListed()
    {
        var page = await SheetPage.Get(api, "/v1/pipes/head-loss?flow=0.02&diameter=0.1&length=100&roughness=0.000045&format=html");
        var json = await api.GetJson("/v1/pipes/head-loss?flow=0.02&diameter=0.1&length=100&roughness=0.000045");

        string defaults = page.Document.GetElementById("defaults")!.TextContent;
        foreach (var a in json.Body.GetProperty("assumptions").EnumerateArray())
            Assert.Contains(a.GetProperty("field").GetString()!, defaults);
        Assert.Contains("water at 20 degrees C", defaults);
    }

    [Fact]
    public async Task Get_FormatHtmlBadInput_ProblemPageWithSameStatus()
    {
        var page = await SheetPage.Get(api, "/v1/friction-factor?reynolds=-5&relativeRoughness=0.001&format=html");

        Assert.Equal(400, page.Status);
        Assert.Equal("text/html", page.ContentType);
        Assert.Contains("reynolds", page.Document.GetElementById("problem")!.TextContent);
        AssertSelfContained(page);
    }

    [Fact]
    public async Task Get_FormatHtmlNoAnswer_ProblemPageWith422()
    {
        var page = await SheetPage.Get(api, "/v1/pipes/flow?headLoss=2&diameter=0.1&length=100&roughness=0.0001&elevationChange=5&format=html");

        Assert.Equal(422, page.Status);
        Assert.Contains("elevation", page.Document.GetElementById("problem")!.TextContent);
    }

    [Fact]
    public async Task Get_UnknownFormat_ProblemNamesFormatAndHtml()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=1e5&relativeRoughness=0.001&format=pdf");

        ProblemAssert.NamesField(r, 400, "format");
        Assert.Contains("html", r.Body.GetProperty("errors").GetProperty("format")[0].GetString());
    }

    [Fact]
    public async Task Get_FormatHtml_InputsAreEncoded()
    {
        // A fitting name is echoed in the inputs: markup in it must arrive as text. (The name is unknown, so the
        // request fails; the problem page echoes it.)
        var page = await SheetPage.Get(api, "/v1/pipes/head-loss?flow=0.02&diameter=0.1&length=100&roughness=0.000045&fittings=%3Cb%3Ex%3C%2Fb%3E&format=html");

        Assert.Equal(400, page.Status);
        Assert.Empty(page.Document.QuerySelectorAll("#problem b"));
        Assert.Contains("<b>x</b>", page.Document.GetElementById("problem")!.TextContent);
    }

    [Fact]
    public async Task Get_FormatHtml_ContentSecurityPolicyAllowsOnlyInlineStyle()
    {
        using var response = await api.Client.GetAsync("/v1/fluids/water?temperature=20&format=html", TestContext.Current.CancellationToken);

        string csp = string.Join(";", response.Headers.GetValues("Content-Security-Policy"));
        Assert.Contains("default-src 'none'", csp);
        Assert.Contains("style-src 'unsafe-inline'", csp);
        Assert.DoesNotContain("script-src", csp);
    }

    /// <summary>No script at all, no element loading anything from outside, no url() in the style sheet.</summary>
    internal static void AssertSelfContained(SheetPage page)
    {
        var doc = page.Document;
        Assert.Empty(doc.QuerySelectorAll("script"));
        Assert.Empty(doc.QuerySelectorAll("link, iframe, img, object, embed, base"));
        foreach (var e in doc.All)
        {
            foreach (var name in new[] { "src", "href", "xlink:href", "action", "srcset", "poster" })
            {
                string? value = e.GetAttribute(name);
                if (value is null) continue;
                Assert.False(Regex.IsMatch(value, @"^\s*(https?:)?//", RegexOptions.IgnoreCase), $"<{e.LocalName} {name}=\"{value}\">");
            }
        }
        foreach (var style in doc.QuerySelectorAll("style"))
        {
            Assert.DoesNotContain("url(", style.TextContent);
            Assert.DoesNotContain("@import", style.TextContent);
        }
        Assert.DoesNotMatch(@"(?i)(src|href)\s*=\s*[""']?\s*https?:", page.Html);
    }
}
