using System.Globalization;
using System.Net.Http.Json;
using System.Text.Json;
using AngleSharp.Dom;
using AngleSharp.Html.Dom;
using AngleSharp.Html.Parser;

namespace FlowSolve.Api.Tests.Sheets;

/// <summary>A calculation sheet fetched from the in-memory service and parsed strictly (a parse error throws).</summary>
public sealed record SheetPage(int Status, string? ContentType, string Html, IHtmlDocument Document)
{

    public static async Task<SheetPage> Get(ApiFixture api, string url)
    {
        using var response = await api.Client.GetAsync(url, TestContext.Current.CancellationToken);
        return await Read(response);
    }

    public static async Task<SheetPage> Post(ApiFixture api, string url, object body)
    {
        using var response = await api.Client.PostAsJsonAsync(url, body, TestContext.Current.CancellationToken);
        return await Read(response);
    }

    private static async Task<SheetPage> Read(HttpResponseMessage response)
    {
        string html = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        // Every HTML5 parse error is collected and fails the test with its position.
        var parser = new HtmlParser();
        var errors = new List<string>();
        parser.Error += (_, e) => errors.Add(e is AngleSharp.Html.Dom.Events.HtmlErrorEvent h ? $"{h.Message} at line {h.Position.Line}, column {h.Position.Column}" : e.ToString()!);
        var document = parser.ParseDocument(html);
        Assert.True(errors.Count == 0, "HTML parse errors: " + string.Join("; ", errors.Take(5)));
        return new SheetPage((int)response.StatusCode, response.Content.Headers.ContentType?.MediaType, html, document);
    }

    /// <summary>The elements of one plot marked as the case (data-role="case").</summary>
    public IReadOnlyList<IElement> Cases(string plotId) => Document.QuerySelectorAll($"svg#{plotId} [data-role=case]").ToList();

    /// <summary>The [x, y] pairs a curve was drawn from.</summary>
    public static (double X, double Y)[] Points(IElement curve)
    {
        using var json = JsonDocument.Parse(curve.GetAttribute("data-points")!);
        return json.RootElement.EnumerateArray().Select(p => (p[0].GetDouble(), p[1].GetDouble())).ToArray();
    }

    public static double Attr(IElement e, string name) => double.Parse(e.GetAttribute(name)!, CultureInfo.InvariantCulture);
}
