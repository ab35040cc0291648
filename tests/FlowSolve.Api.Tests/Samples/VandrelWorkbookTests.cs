using System.Globalization;
using System.Net.Http.Json;
using System.Text.Json;
using ClosedXML.Excel;
using FlowSolve.Samples.Workbook;

namespace FlowSolve.Api.Tests.Samples;

/// <summary>
/// samples/Workbook's .xlsx: each WEBSERVICE cell's formula, read back from the saved file, is evaluated the way a
/// spreadsheet application would (strings joined with &amp;, numbers as up to 15 significant digits, ENCODEURL) and its
/// URL sent to a real FlowSolve process; the cells must answer, and agree with the same question asked as JSON.
/// </summary>
public sealed class VandrelWorkbookTests(LiveService service) : IClassFixture<LiveService>
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    private sealed class Evaluator(IXLWorksheet sheet, HttpClient http)
    {
        private readonly Dictionary<string, string> _done = [];

        public List<string> Urls { get; } = [];

        /// <summary>The text a cell contributes to a concatenation.</summary>
        public async Task<string> Text(string address)
        {
            address = address.Replace("$", "");
            if (_done.TryGetValue(address, out var known)) return known;
            var cell = sheet.Cell(address);
            string text;
            if (cell.HasFormula) text = await Formula(cell.FormulaA1.TrimStart('='));
            else if (cell.DataType == XLDataType.Number) text = cell.GetDouble().ToString("G15", C); // 15 digits, as a spreadsheet joins numbers
            else text = cell.GetString();
            return _done[address] = text;
        }

        private async Task<string> Formula(string formula)
        {
            bool numeric = Strip(ref formula, "VALUE(");
            Assert.True(Strip(ref formula, "_xlfn.WEBSERVICE("), $"not a WEBSERVICE formula: {formula}");
            var url = new System.Text.StringBuilder();
            foreach (string part in SplitConcatenation(formula))
            {
                if (part.StartsWith('"')) url.Append(part[1..^1].Replace("\"\"", "\""));
                else if (part.StartsWith("_xlfn.ENCODEURL(", StringComparison.Ordinal)) url.Append(Uri.EscapeDataString(await Text(part["_xlfn.ENCODEURL(".Length..^1])));
                else url.Append(await Text(part));
            }
            Urls.Add(url.ToString());
            using var response = await http.GetAsync(url.ToString());
            string body = await response.Content.ReadAsStringAsync();
            Assert.True(response.IsSuccessStatusCode, $"{url}: HTTP {(int)response.StatusCode} {body}");
            Assert.Equal("text/plain", response.Content.Headers.ContentType?.MediaType);
            if (!numeric) return body;
            Assert.True(double.TryParse(body, NumberStyles.Float, C, out double value) && double.IsFinite(value), $"{url}: '{body}' is not a number");
            return value.ToString("G15", C);
        }

        private static bool Strip(ref string formula, string call)
        {
            if (!formula.StartsWith(call, StringComparison.Ordinal) || !formula.EndsWith(')')) return false;
            formula = formula[call.Length..^1];
            return true;
        }

        private static IEnumerable<string> SplitConcatenation(string expression)
        {
            int depth = 0, start = 0;
            bool quoted = false;
            for (int i = 0; i < expression.Length; i++)
            {
                char c = expression[i];
                if (c == '"') quoted = !quoted;
                else if (!quoted && c == '(') depth++;
                else if (!quoted && c == ')') depth--;
                else if (!quoted && depth == 0 && c == '&')
                {
                    yield return expression[start..i];
                    start = i + 1;
                }
            }
            yield return expression[start..];
        }
    }

    private async Task<(Evaluator Evaluator, IXLWorksheet Sheet, XLWorkbook Book)> SavedWorkbook()
    {
        string path = Path.Combine(Path.GetTempPath(), $"vandrel-vale-{Guid.NewGuid():N}.xlsx");
        using (var built = VandrelWorkbook.Build(service.BaseUrl)) built.SaveAs(path);
        var book = new XLWorkbook(path);
        File.Delete(path);
        var sheet = book.Worksheet(VandrelWorkbook.SheetName);
        return (new Evaluator(sheet, service.Client), sheet, await Task.FromResult(book));
    }

    [Fact]
    public async Task Build_EveryResultCell_IsAWebServiceFormulaTheServiceAnswers()
    {
        var (evaluator, sheet, book) = await SavedWorkbook();
        using var _ = book;
        Assert.Equal(service.BaseUrl, sheet.Cell(VandrelWorkbook.ServiceCell).GetString());
        foreach (var result in VandrelWorkbook.Results)
        {
            var cell = sheet.Cell(VandrelWorkbook.Address(result.Name));
            Assert.True(cell.HasFormula, $"{result.Name} has no formula");
            Assert.Contains("_xlfn.WEBSERVICE(", cell.FormulaA1);
            Assert.Contains("format=text", cell.FormulaA1);
            string text = await evaluator.Text(cell.Address.ToString()!);
            Assert.False(string.IsNullOrWhiteSpace(text), result.Name);
        }
        Assert.All(evaluator.Urls, u => Assert.StartsWith(service.BaseUrl + "/v1/", u));
        string notes = string.Join(" ", Enumerable.Range(2, 5).Select(r => sheet.Cell(r, 1).GetString()));
        Assert.Contains("invented for the demo", notes);
        Assert.Contains("qualified engineer", notes);
        Assert.Contains("WEBSERVICE", notes);
    }

    [Fact]
    public async Task Build_ResultCells_AgreeWithTheSameQuestionsAsJson()
    {
        var (evaluator, _, book) = await SavedWorkbook();
        using var __ = book;
        async Task<double> Cell(string name) => double.Parse(await evaluator.Text(VandrelWorkbook.Address(name)), C);
        async Task<JsonElement> Post(string path, object body)
        {
            using var response = await service.Client.PostAsJsonAsync(service.BaseUrl + path, body);
            Assert.True(response.IsSuccessStatusCode, $"{path}: {(int)response.StatusCode}");
            return JsonDocument.Parse(await response.Content.ReadAsStringAsync()).RootElement.Clone();
        }

        var main = await Post("/v1/pipes/head-loss", new
        {
            flow = 0.12, diameter = 0.35, length = 2350, material = "commercial-steel", temperature = 12, elevationChange = 76.5,
            fittings = new object[]
            {
                new { name = "elbow-90-flanged-long-radius", count = 8 }, new { name = "gate-valve-open", count = 2 },
                new { name = "swing-check-valve-forward", count = 1 }, new { name = "exit", count = 1 },
            },
        });
        Assert.Equal(main.GetProperty("headLoss").GetDouble(), await Cell("mainLoss"), 1e-12);
        Assert.Equal(main.GetProperty("totalHead").GetDouble(), await Cell("mainHead"), 1e-12);
        // The chained cell sends Re and e/D at 15 digits, so f agrees to far better than 1e-9 relative.
        var friction = await Post("/v1/friction-factor", new
        {
            reynolds = main.GetProperty("reynolds").GetDouble(), relativeRoughness = main.GetProperty("relativeRoughness").GetDouble(),
        });
        Assert.Equal(friction.GetProperty("frictionFactor").GetDouble(), await Cell("friction"), 1e-9 * await Cell("friction"));

        var size = await Post("/v1/pipes/diameter", new
        {
            flow = 0.045, headLoss = 22.5, length = 4800, material = "drawn-plastic-tubing", sizeTable = "iso-4427-pe-sdr-11", temperature = 12,
        });
        Assert.Equal(size.GetProperty("diameter").GetDouble(), await Cell("minimumBore"), 1e-12);
        Assert.Equal(size.GetProperty("selectedSize").GetProperty("name").GetString(), await evaluator.Text(VandrelWorkbook.Address("sizeName")));

        var canal = await Post("/v1/channels/normal-depth", new
        {
            section = new { shape = "trapezoidal", bottomWidth = 1.2, sideSlope = 1.5 }, manningN = 0.015, slope = 0.0005, flow = 1.8,
        });
        Assert.Equal(canal.GetProperty("normalDepth").GetDouble(), await Cell("canalDepth"), 1e-12);
        Assert.Equal(canal.GetProperty("criticalDepth").GetDouble(), await Cell("canalCritical"), 1e-9);

        var culvert = await Post("/v1/channels/normal-depth", new
        {
            section = new { shape = "circular", diameter = 1.5 }, manningN = 0.013, slope = 0.002, flow = 1.8,
        });
        Assert.Equal(culvert.GetProperty("normalDepth").GetDouble(), await Cell("culvertDepth"), 1e-12);
        Assert.Equal(culvert.GetProperty("capacity").GetProperty("fullFlow").GetDouble(), await Cell("culvertFull"), 1e-12);
    }
}
