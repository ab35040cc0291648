using System.Diagnostics;
using System.Globalization;
using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using FlowSolve.Api.Hosting;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Friction;
using FlowSolve.Samples.Workbook;

namespace FlowSolve.Api.Tests.Samples;

/// <summary>
/// The LibreOffice extension (clients/libreoffice) in a real Calc: built with its build.sh, installed with
/// <c>unopkg add</c> into a throwaway user profile, and a spreadsheet of FLOWSOLVE and FLOWSOLVE_WARNINGS cells on the
/// Vandrel Vale inputs recalculated by a headless soffice (driven by clients/libreoffice/tests/recalc.py) against a
/// real FlowSolve process. Every cell is compared with the library's own answer (FlowSolve.Core) or the service's JSON
/// answer to the same question sent as a POST body, digit for digit. Another office run recalculates the workbook that
/// samples/Workbook writes (its WEBSERVICE cells, and FLOWSOLVE cells beside them). The client module's own tests (HTTP
/// caching, number text, URL encoding) run with plain python3.
/// </summary>
/// <remarks>
/// Needs Debian's libreoffice-calc-nogui and python3-uno (.ci/run installs them and sets FLOWSOLVE_REQUIRE_CALC=1, so
/// CI fails rather than skips when they are missing); on a developer machine without soffice the Calc tests skip.
/// unopkg refuses a user installation as root, so as root the office runs as the unprivileged user 65534.
/// </remarks>
public sealed class CalcExtensionTests(LiveService service) : IClassFixture<LiveService>
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    /// <summary>Calc's error code for an invalid argument (Err:502): a 4xx answer.</summary>
    private const int InvalidArgument = 502;

    [Fact]
    public async Task ClientModule_OwnTests_Pass()
    {
        var run = await Office.Run(SamplePrograms.Require("python3"),
            ["-m", "unittest", "discover", "-v", "-s", Path.Combine(Office.Client, "tests"), "-p", "test_*.py"],
            new() { ["FLOWSOLVE_EXPECTED_KEY_HEADER"] = Protection.ApiKeyHeader }, TimeSpan.FromSeconds(120), asOfficeUser: false);
        Assert.True(run.ExitCode == 0 && !run.TimedOut, run.ToString());
        Assert.Contains("OK", run.Errors);
    }

    [Fact]
    public async Task Functions_RecalculatedInCalc_AgreeWithTheLibraryAndTheService()
    {
        using var office = await Office.Install();
        var sheet = new SheetBuilder();

        string main = sheet.Pairs(("flow", "mainFlow"), ("diameter", "mainDiameter"), ("length", "mainLength"), ("material", "mainMaterial"),
            ("fittings", "mainFittings"), ("temperature", "temperature"), ("elevationChange", "lift"));
        string gravity = sheet.Pairs(("flow", "villageFlow"), ("headLoss", "levels"), ("length", "gravityLength"),
            ("material", "gravityMaterial"), ("sizeTable", "sizeTable"), ("temperature", "temperature"));
        string canal = sheet.Pairs(("shape", "\"trapezoidal\""), ("bottomWidth", "canalWidth"), ("sideSlope", "canalSideSlope"),
            ("manningN", "canalN"), ("flow", "canalFlow"));
        string culvert = sheet.Pairs(("shape", "\"circular\""), ("diameter", "culvertDiameter"), ("manningN", "culvertN"),
            ("slope", "culvertSlope"), ("flow", "canalFlow"));
        // The canal's slope typed as a percent (0.05 for 0.0005 m/m): a unit slip the service warns about.
        string percentSlope = sheet.At("canalSlope") + "*100";

        // Three identical calls: asked once per recalculation (the only cells on this route).
        string water = "FLOWSOLVE(\"fluids/water\";\"kinematicViscosity\";" + sheet.Pairs(("temperature", "temperature")) + ")";
        sheet.Formula("nu", water);
        sheet.Formula("nuAgain", water);
        sheet.Formula("nuOnceMore", water);
        sheet.Formula("mainLoss", $"FLOWSOLVE(\"pipes/head-loss\";\"\";{main})");
        sheet.Formula("mainHead", $"FLOWSOLVE(\"pipes/head-loss\";\"totalHead\";{main})");
        sheet.Formula("mainReynolds", $"FLOWSOLVE(\"pipes/head-loss\";\"reynolds\";{main})");
        sheet.Formula("mainRelativeRoughness", $"FLOWSOLVE(\"pipes/head-loss\";\"relativeRoughness\";{main})");
        sheet.Formula("mainWarnings", $"FLOWSOLVE_WARNINGS(\"pipes/head-loss\";{main})");
        sheet.Formula("friction", $"FLOWSOLVE(\"friction-factor\";\"\";\"reynolds\";{sheet.At("mainReynolds")};\"relativeRoughness\";{sheet.At("mainRelativeRoughness")})");
        // A pair with an empty name is left out: the same call as the cell above.
        sheet.Formula("frictionEmptyPair", $"FLOWSOLVE(\"friction-factor\";\"\";\"reynolds\";{sheet.At("mainReynolds")};\"relativeRoughness\";{sheet.At("mainRelativeRoughness")};\"\";\"\")");
        sheet.Formula("minimumBore", $"FLOWSOLVE(\"pipes/diameter\";\"\";{gravity})");
        sheet.Formula("sizeName", $"FLOWSOLVE(\"pipes/diameter\";\"selectedSize.name\";{gravity})");
        sheet.Formula("sizeBore", $"FLOWSOLVE(\"pipes/diameter\";\"selectedSize.insideDiameter\";{gravity})");
        sheet.Formula("gravityFlow", $"FLOWSOLVE(\"pipes/flow\";\"\";\"headLoss\";{sheet.At("levels")};\"diameter\";{sheet.At("sizeBore")};" +
            sheet.Pairs(("length", "gravityLength"), ("material", "gravityMaterial"), ("temperature", "temperature")) + ")");
        sheet.Formula("canalDepth", $"FLOWSOLVE(\"channels/normal-depth\";\"\";{canal};\"slope\";{sheet.At("canalSlope")})");
        sheet.Formula("canalFroude", $"FLOWSOLVE(\"channels/normal-depth\";\"froudeNumber\";{canal};\"slope\";{sheet.At("canalSlope")})");
        sheet.Formula("canalWarnings", $"FLOWSOLVE_WARNINGS(\"channels/normal-depth\";{canal};\"slope\";{sheet.At("canalSlope")})");
        sheet.Formula("canalCritical", $"FLOWSOLVE(\"channels/critical-depth\";\"\";{canal})");
        sheet.Formula("culvertFull", $"FLOWSOLVE(\"channels/normal-depth\";\"capacity.fullFlow\";{culvert})");
        // Twelve pairs, the most a call takes; a negative number; the pump curve H = 98 - 2400 Q^2 of the intake.
        sheet.Formula("duty", "FLOWSOLVE(\"pumps/duty-point\";\"\";\"c0\";98;\"c1\";0;\"c2\";-2400;\"pumpsInParallel\";2;\"pumpsInSeries\";1;" +
            "\"speedRatio\";1;\"staticHead\";" + sheet.At("lift") + ";\"length\";" + sheet.At("mainLength") + ";\"diameter\";" +
            sheet.At("mainDiameter") + ";\"roughness\";0.000046;\"minorLossCoefficient\";4.9;\"temperature\";" + sheet.At("temperature") + ")");
        sheet.Formula("percentDepth", $"FLOWSOLVE(\"channels/normal-depth\";\"\";{canal};\"slope\";{percentSlope})");
        sheet.Formula("percentWarnings", $"FLOWSOLVE_WARNINGS(\"channels/normal-depth\";{canal};\"slope\";{percentSlope})");
        sheet.Formula("percentStrict", $"FLOWSOLVE(\"channels/normal-depth\";\"\";{canal};\"slope\";{percentSlope};\"strict\";\"true\")");
        // A decimal comma typed as text, a misspelt name, a route that does not exist, a name without its value.
        sheet.Text("commaFlow", "0,12");
        string commaMain = sheet.Pairs(("flow", "commaFlow"), ("diameter", "mainDiameter"), ("length", "mainLength"), ("material", "mainMaterial"),
            ("fittings", "mainFittings"), ("temperature", "temperature"), ("elevationChange", "lift"));
        sheet.Formula("commaValue", $"FLOWSOLVE(\"pipes/head-loss\";\"\";{commaMain})");
        sheet.Formula("commaWarnings", $"FLOWSOLVE_WARNINGS(\"pipes/head-loss\";{commaMain})");
        string misspelt = $"\"reynolds\";{sheet.At("mainReynolds")};\"relativeRougness\";{sheet.At("mainRelativeRoughness")}";
        sheet.Formula("misspeltValue", $"FLOWSOLVE(\"friction-factor\";\"\";{misspelt})");
        sheet.Formula("misspeltWarnings", $"FLOWSOLVE_WARNINGS(\"friction-factor\";{misspelt})");
        sheet.Formula("noRoute", $"FLOWSOLVE(\"pipes/headloss\";\"\";{main})");
        sheet.Formula("oddArguments", "FLOWSOLVE(\"friction-factor\";\"\";\"reynolds\")");
        // The document's locale writes a decimal comma (the office runs in de-DE): proves the numbers above went out
        // in the invariant grammar although the sheet itself writes 0,5.
        sheet.Formula("localeProbe", "0.5&\"\"");

        // FLOWSOLVE_URL names the service; the extension's own setting names a port where nothing listens, so a cell
        // that answers at all shows that the environment variable wins.
        int waterAsked = WaterRequests();
        var result = await office.Recalculate(new
        {
            settings = new { Url = $"http://127.0.0.1:{LiveService.FreePort()}" },
            // Recalculated twice, the second time past the recalculation window (2 s): the cells read are the second's.
            documents = new[] { new { name = "functions", cells = sheet.Cells, read = sheet.Reads, againAfter = 2.5 } },
        }, new() { ["FLOWSOLVE_URL"] = service.BaseUrl, ["LC_ALL"] = "de_DE.UTF-8", ["LANG"] = "de_DE.UTF-8" });
        var cells = new ReadCells(result, "functions", sheet);
        Assert.Equal("0,5", cells.Text("localeProbe"));

        var mainJson = await Post("/v1/pipes/head-loss", new
        {
            flow = In("mainFlow"), diameter = In("mainDiameter"), length = In("mainLength"), material = In("mainMaterial"),
            temperature = In("temperature"), elevationChange = In("lift"), fittings = Fittings((string)In("mainFittings")),
        });
        Assert.Equal(Water.At((double)In("temperature")).KinematicViscosity, cells.Number("nu"));
        Assert.Equal(cells.Number("nu"), cells.Number("nuAgain"));
        Assert.Equal(cells.Number("nu"), cells.Number("nuOnceMore"));
        // Two recalculations: at most one request each (none the second time once answers carry a max-age).
        waterAsked = WaterRequests() - waterAsked;
        Assert.True(waterAsked is >= 1 and <= 2, $"the three identical cells were asked {waterAsked} times in two recalculations");
        Assert.Equal(mainJson.GetProperty("headLoss").GetDouble(), cells.Number("mainLoss"));
        Assert.Equal(mainJson.GetProperty("totalHead").GetDouble(), cells.Number("mainHead"));
        double reynolds = mainJson.GetProperty("reynolds").GetDouble(), relativeRoughness = mainJson.GetProperty("relativeRoughness").GetDouble();
        Assert.Equal(reynolds, cells.Number("mainReynolds"));
        Assert.Equal(relativeRoughness, cells.Number("mainRelativeRoughness"));
        Assert.Equal(Codes(mainJson), cells.Text("mainWarnings"));
        // The chained cell sent Re and e/D as the shortest texts of those doubles, so the friction factor is the
        // library's for exactly these doubles, to the last digit.
        Assert.Equal(DarcyFriction.Exact(reynolds, relativeRoughness).FrictionFactor, cells.Number("friction"));
        Assert.Equal(cells.Number("friction"), cells.Number("frictionEmptyPair"));

        var sizeJson = await Post("/v1/pipes/diameter", new
        {
            flow = In("villageFlow"), headLoss = In("levels"), length = In("gravityLength"), material = In("gravityMaterial"),
            sizeTable = In("sizeTable"), temperature = In("temperature"),
        });
        Assert.Equal(sizeJson.GetProperty("diameter").GetDouble(), cells.Number("minimumBore"));
        Assert.Equal(sizeJson.GetProperty("selectedSize").GetProperty("name").GetString(), cells.Text("sizeName"));
        double bore = sizeJson.GetProperty("selectedSize").GetProperty("insideDiameter").GetDouble();
        Assert.Equal(bore, cells.Number("sizeBore"));
        var flowJson = await Post("/v1/pipes/flow", new
        {
            headLoss = In("levels"), diameter = bore, length = In("gravityLength"), material = In("gravityMaterial"), temperature = In("temperature"),
        });
        Assert.Equal(flowJson.GetProperty("flow").GetDouble(), cells.Number("gravityFlow"));

        object Canal(double slope) => new
        {
            section = new { shape = "trapezoidal", bottomWidth = In("canalWidth"), sideSlope = In("canalSideSlope") },
            manningN = In("canalN"), slope, flow = In("canalFlow"),
        };
        var canalJson = await Post("/v1/channels/normal-depth", Canal((double)In("canalSlope")));
        Assert.Equal(canalJson.GetProperty("normalDepth").GetDouble(), cells.Number("canalDepth"));
        Assert.Equal(canalJson.GetProperty("froudeNumber").GetDouble(), cells.Number("canalFroude"));
        Assert.Equal(Codes(canalJson), cells.Text("canalWarnings"));
        var criticalJson = await Post("/v1/channels/critical-depth", new
        {
            section = new { shape = "trapezoidal", bottomWidth = In("canalWidth"), sideSlope = In("canalSideSlope") },
            manningN = In("canalN"), flow = In("canalFlow"),
        });
        Assert.Equal(criticalJson.GetProperty("criticalDepth").GetDouble(), cells.Number("canalCritical"));
        var culvertJson = await Post("/v1/channels/normal-depth", new
        {
            section = new { shape = "circular", diameter = In("culvertDiameter") }, manningN = In("culvertN"), slope = In("culvertSlope"),
            flow = In("canalFlow"),
        });
        Assert.Equal(culvertJson.GetProperty("capacity").GetProperty("fullFlow").GetDouble(), cells.Number("culvertFull"));
        var dutyJson = await Post("/v1/pumps/duty-point", new
        {
            pump = new { coefficients = new[] { 98.0, 0, -2400 } }, pumpsInParallel = 2, pumpsInSeries = 1, speedRatio = 1.0,
            system = new { staticHead = In("lift"), pipes = new[] { new { length = In("mainLength"), diameter = In("mainDiameter"), roughness = 0.000046, minorLossCoefficient = 4.9 } } },
            temperature = In("temperature"),
        });
        Assert.Equal(dutyJson.GetProperty("flow").GetDouble(), cells.Number("duty"));

        // A warned input still answers its number; its warning codes are listed; strict=true makes it an error.
        var percentJson = await Post("/v1/channels/normal-depth", Canal((double)In("canalSlope") * 100));
        Assert.Equal(percentJson.GetProperty("normalDepth").GetDouble(), cells.Number("percentDepth"));
        Assert.Contains("froude-above-design-range", Codes(percentJson).Split(','));
        Assert.Equal(Codes(percentJson), cells.Text("percentWarnings"));
        Assert.Equal(InvalidArgument, cells.Error("percentStrict"));

        // Refused inputs are errors in the cell, never a number; FLOWSOLVE_WARNINGS shows the service's own line.
        Assert.Equal(InvalidArgument, cells.Error("commaValue"));
        string commaQuery = string.Join("&", new (string, object)[]
        {
            ("flow", "0,12"), ("diameter", In("mainDiameter")), ("length", In("mainLength")), ("material", In("mainMaterial")),
            ("fittings", In("mainFittings")), ("temperature", In("temperature")), ("elevationChange", In("lift")),
        }.Select(p => p.Item1 + "=" + Uri.EscapeDataString(p.Item2 is double d ? d.ToString("R", C) : (string)p.Item2)));
        using (var refused = await service.Client.GetAsync($"{service.BaseUrl}/v1/pipes/head-loss?{commaQuery}&format=text&select=warnings",
            TestContext.Current.CancellationToken))
        {
            Assert.Equal(HttpStatusCode.BadRequest, refused.StatusCode);
            string line = (await refused.Content.ReadAsStringAsync(TestContext.Current.CancellationToken)).TrimEnd('\r', '\n');
            Assert.StartsWith("error: flow: ", line);
            Assert.Equal(line, cells.Text("commaWarnings"));
        }
        Assert.Equal(InvalidArgument, cells.Error("misspeltValue"));
        Assert.StartsWith("error: relativeRougness: ", cells.Text("misspeltWarnings"));
        Assert.Contains("did you mean 'relativeRoughness'?", cells.Text("misspeltWarnings"));
        Assert.Equal(InvalidArgument, cells.Error("noRoute"));
        Assert.Equal(InvalidArgument, cells.Error("oddArguments"));

        TestContext.Current.TestOutputHelper?.WriteLine(
            $"{result.GetProperty("version").GetString()}: one recalculation of {sheet.Reads.Count} cells ({sheet.FunctionCells} FLOWSOLVE and " +
            $"FLOWSOLVE_WARNINGS cells) took {Seconds(result, "functions"):0.000} s (the first, loading the extension), and " +
            $"{result.GetProperty("documents").GetProperty("functions").GetProperty("againSeconds").GetDouble():0.000} s the second time");
    }

    [Fact]
    public async Task VandrelWorkbook_RecalculatedInCalc_AgreesWithTheService()
    {
        using var office = await Office.Install();
        string workbook = Path.Combine(office.Folder, "vandrel-vale.xlsx");
        using (var built = VandrelWorkbook.Build(service.BaseUrl)) built.SaveAs(workbook);

        // Beside the WEBSERVICE cells, FLOWSOLVE cells on the workbook's own inputs; here no FLOWSOLVE_URL is set, so
        // they find the service through the extension's setting.
        string Pairs(params (string Field, string Source)[] pairs) =>
            string.Join(";", pairs.Select(p => $"\"{p.Field}\";" + (p.Source.StartsWith('"') ? p.Source : VandrelWorkbook.Address(p.Source))));
        string canal = Pairs(("shape", "\"trapezoidal\""), ("bottomWidth", "canalWidth"), ("sideSlope", "canalSideSlope"),
            ("manningN", "canalN"), ("slope", "canalSlope"), ("flow", "canalFlow"));
        string gravity = Pairs(("flow", "villageFlow"), ("headLoss", "levels"), ("length", "gravityLength"), ("material", "gravityMaterial"),
            ("sizeTable", "sizeTable"), ("temperature", "temperature"));
        string depthCell = "F" + VandrelWorkbook.Address("canalDepth")[1..], sizeCell = "F" + VandrelWorkbook.Address("sizeName")[1..];
        var cellsToWrite = new Dictionary<string, object>
        {
            [depthCell] = new { formula = $"=FLOWSOLVE(\"channels/normal-depth\";\"\";{canal})" },
            [sizeCell] = new { formula = $"=FLOWSOLVE(\"pipes/diameter\";\"selectedSize.name\";{gravity})" },
        };
        var reads = VandrelWorkbook.Results.Select(r => VandrelWorkbook.Address(r.Name)).Append(depthCell).Append(sizeCell).ToList();

        var result = await office.Recalculate(new
        {
            settings = new { Url = service.BaseUrl },
            trustedFolder = office.Folder,
            documents = new[] { new { name = "workbook", path = workbook, sheet = VandrelWorkbook.SheetName, cells = cellsToWrite, read = reads } },
        }, new() { ["LANG"] = "C.UTF-8" });
        var cells = result.GetProperty("documents").GetProperty("workbook").GetProperty("cells");
        double Number(string address) => ReadCells.NumberOf(cells, address);
        string Text(string address) => ReadCells.TextOf(cells, address);

        var canalJson = await Post("/v1/channels/normal-depth", new
        {
            section = new { shape = "trapezoidal", bottomWidth = In("canalWidth"), sideSlope = In("canalSideSlope") },
            manningN = In("canalN"), slope = In("canalSlope"), flow = In("canalFlow"),
        });
        var sizeJson = await Post("/v1/pipes/diameter", new
        {
            flow = In("villageFlow"), headLoss = In("levels"), length = In("gravityLength"), material = In("gravityMaterial"),
            sizeTable = In("sizeTable"), temperature = In("temperature"),
        });
        Assert.Equal(canalJson.GetProperty("normalDepth").GetDouble(), Number(depthCell));
        Assert.Equal(sizeJson.GetProperty("selectedSize").GetProperty("name").GetString(), Text(sizeCell));

        // LibreOffice's WEBSERVICE asks OPTIONS and HEAD before its GET, and gives up (#VALUE!) when they are refused.
        using (var options = await service.Client.SendAsync(new HttpRequestMessage(HttpMethod.Options,
            $"{service.BaseUrl}/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&format=text"), TestContext.Current.CancellationToken))
        {
            // A 400 here (the strict query check on the routing's 405 endpoint) would show #VALUE! in every cell.
            Assert.Equal(HttpStatusCode.MethodNotAllowed, options.StatusCode);
        }

        var mainJson = await Post("/v1/pipes/head-loss", new
        {
            flow = In("mainFlow"), diameter = In("mainDiameter"), length = In("mainLength"), material = In("mainMaterial"),
            temperature = In("temperature"), elevationChange = In("lift"), fittings = Fittings((string)In("mainFittings")),
        });
        var culvertJson = await Post("/v1/channels/normal-depth", new
        {
            section = new { shape = "circular", diameter = In("culvertDiameter") }, manningN = In("culvertN"), slope = In("culvertSlope"),
            flow = In("canalFlow"),
        });
        var criticalJson = await Post("/v1/channels/critical-depth", new
        {
            section = new { shape = "trapezoidal", bottomWidth = In("canalWidth"), sideSlope = In("canalSideSlope") },
            manningN = In("canalN"), flow = In("canalFlow"),
        });
        double bore = sizeJson.GetProperty("selectedSize").GetProperty("insideDiameter").GetDouble();
        var flowJson = await Post("/v1/pipes/flow", new
        {
            headLoss = In("levels"), diameter = bore, length = In("gravityLength"), material = In("gravityMaterial"), temperature = In("temperature"),
        });
        var expected = new Dictionary<string, double>
        {
            ["nu"] = Water.At((double)In("temperature")).KinematicViscosity,
            ["mainLoss"] = mainJson.GetProperty("headLoss").GetDouble(),
            ["mainHead"] = mainJson.GetProperty("totalHead").GetDouble(),
            ["mainVelocity"] = mainJson.GetProperty("velocity").GetDouble(),
            ["mainReynolds"] = mainJson.GetProperty("reynolds").GetDouble(),
            ["mainRelativeRoughness"] = mainJson.GetProperty("relativeRoughness").GetDouble(),
            ["friction"] = DarcyFriction.Exact(mainJson.GetProperty("reynolds").GetDouble(), mainJson.GetProperty("relativeRoughness").GetDouble()).FrictionFactor,
            ["minimumBore"] = sizeJson.GetProperty("diameter").GetDouble(),
            ["sizeBore"] = bore,
            ["gravityFlow"] = flowJson.GetProperty("flow").GetDouble(),
            ["canalDepth"] = canalJson.GetProperty("normalDepth").GetDouble(),
            ["canalFroude"] = canalJson.GetProperty("froudeNumber").GetDouble(),
            ["canalCritical"] = criticalJson.GetProperty("criticalDepth").GetDouble(),
            ["culvertDepth"] = culvertJson.GetProperty("normalDepth").GetDouble(),
            ["culvertFull"] = culvertJson.GetProperty("capacity").GetProperty("fullFlow").GetDouble(),
        };
        foreach (var r in VandrelWorkbook.Results)
        {
            string address = VandrelWorkbook.Address(r.Name);
            if (!r.Numeric)
            {
                Assert.Equal(sizeJson.GetProperty("selectedSize").GetProperty("name").GetString(), Text(address));
                continue;
            }
            // Cells whose URL is built from input cells agree exactly (VALUE reads the shortest round-trip text
            // back to the same double). WEBSERVICE joins a number into a URL at 15 significant digits (Calc's
            // general format), so the cells chained on other results (the friction factor on Re and e/D, the flow
            // of the chosen bore) agree to about that precision; FLOWSOLVE sends all 17 and agrees exactly.
            double tolerance = r.Name is "friction" or "gravityFlow" ? 1e-12 : 0;
            double want = expected[r.Name], got = Number(address);
            Assert.True(Math.Abs(got - want) <= tolerance * Math.Abs(want), $"{r.Name} ({address}): Calc {got:R}, expected {want:R}");
        }
        TestContext.Current.TestOutputHelper?.WriteLine(
            $"{result.GetProperty("version").GetString()}: one recalculation of the workbook ({VandrelWorkbook.Results.Count} WEBSERVICE and 2 FLOWSOLVE cells) took {Seconds(result, "workbook"):0.000} s");
    }

    /// <summary>How many requests for /v1/fluids/water the service has logged.</summary>
    private int WaterRequests() =>
        service.Log.Split('\n').Count(l => l.Contains(" GET /v1/fluids/water ", StringComparison.Ordinal));

    private static object In(string name) => VandrelWorkbook.Inputs.Single(i => i.Name == name).Value;

    private static object[] Fittings(string list) =>
        list.Split(',').Select(f => f.Split(':')).Select(p => (object)new { name = p[0], count = int.Parse(p[1], C) }).ToArray();

    private static string Codes(JsonElement answer) =>
        string.Join(",", answer.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()));

    private static double Seconds(JsonElement result, string document) =>
        result.GetProperty("documents").GetProperty(document).GetProperty("seconds").GetDouble();

    private async Task<JsonElement> Post(string path, object body)
    {
        using var response = await service.Client.PostAsJsonAsync(service.BaseUrl + path, body, TestContext.Current.CancellationToken);
        string text = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        Assert.True(response.IsSuccessStatusCode, $"{path}: {(int)response.StatusCode} {text}");
        return JsonDocument.Parse(text).RootElement.Clone();
    }

    /// <summary>The test sheet: the Vandrel Vale inputs in column B (as samples/Workbook has them), named formula cells
    /// in column D, one per row.</summary>
    private sealed class SheetBuilder
    {
        private readonly Dictionary<string, string> _addresses = [];
        private int _row;

        public Dictionary<string, object> Cells { get; } = [];
        public List<string> Reads { get; } = [];
        public int FunctionCells { get; private set; }

        public SheetBuilder()
        {
            for (int i = 0; i < VandrelWorkbook.Inputs.Count; i++)
            {
                var input = VandrelWorkbook.Inputs[i];
                string address = $"B{i + 1}";
                _addresses[input.Name] = address;
                Cells[address] = input.Value is double d ? new { number = d } : new { text = (string)input.Value };
            }
        }

        /// <summary>The address of an input or of a named cell above.</summary>
        public string At(string name) => _addresses[name];

        /// <summary>"name";source pairs; a source is the name of an input or of a cell above, or a literal (quoted text).</summary>
        public string Pairs(params (string Field, string Source)[] pairs) =>
            string.Join(";", pairs.Select(p => $"\"{p.Field}\";" + (_addresses.TryGetValue(p.Source, out var a) ? a : p.Source)));

        public void Formula(string name, string formula)
        {
            string address = Next(name);
            Cells[address] = new { formula = "=" + formula };
            if (formula.StartsWith("FLOWSOLVE", StringComparison.Ordinal)) FunctionCells++;
        }

        public void Text(string name, string text) => Cells[Next(name)] = new { text };

        private string Next(string name)
        {
            string address = $"D{++_row}";
            _addresses[name] = address;
            Reads.Add(address);
            return address;
        }
    }

    /// <summary>The cells the office read back, by the test sheet's names.</summary>
    private sealed class ReadCells(JsonElement result, string document, SheetBuilder sheet)
    {
        private readonly JsonElement _cells = result.GetProperty("documents").GetProperty(document).GetProperty("cells");

        public double Number(string name) => NumberOf(_cells, sheet.At(name));

        public string Text(string name) => TextOf(_cells, sheet.At(name));

        /// <summary>Calc's error code of a formula cell (502 invalid argument, 519 #VALUE!).</summary>
        public int Error(string name)
        {
            var cell = _cells.GetProperty(sheet.At(name));
            int error = cell.GetProperty("error").GetInt32();
            Assert.True(error != 0, $"{name}: expected an error, the cell shows '{cell.GetProperty("string").GetString()}'");
            return error;
        }

        public static double NumberOf(JsonElement cells, string address)
        {
            var cell = cells.GetProperty(address);
            Assert.True(cell.GetProperty("error").GetInt32() == 0 && cell.GetProperty("result").GetString() == "VALUE", $"{address} is not a number: {cell}");
            return cell.GetProperty("value").GetDouble();
        }

        public static string TextOf(JsonElement cells, string address)
        {
            var cell = cells.GetProperty(address);
            Assert.True(cell.GetProperty("error").GetInt32() == 0 && cell.GetProperty("result").GetString() == "TEXT", $"{address} is not a text: {cell}");
            return cell.GetProperty("string").GetString()!;
        }
    }

    /// <summary>The extension built and installed into a throwaway profile, and the office that recalculates with it.</summary>
    private sealed class Office : IDisposable
    {
        public static string Client => Path.Combine(LiveService.RepositoryRoot, "clients", "libreoffice");

        /// <summary>The unprivileged user the office runs as when the tests run as root (unopkg refuses root).</summary>
        private const string Nobody = "65534";

        private readonly string _soffice, _python;

        private Office(string folder, string soffice, string python) => (Folder, _soffice, _python) = (folder, soffice, python);

        public string Folder { get; }

        private string ProfileUrl => new Uri(Path.Combine(Folder, "profile")).AbsoluteUri;

        public static async Task<Office> Install()
        {
            string soffice = Find("soffice");
            string python = await UnoPython();
            string folder = Path.Combine(Path.GetTempPath(), "flowsolve-calc-" + Guid.NewGuid().ToString("N"));
            Directory.CreateDirectory(folder);
            // Open to the office's user, which may not be ours (see Nobody); set after creation, past the umask.
            if (!OperatingSystem.IsWindows())
                File.SetUnixFileMode(folder, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute
                    | UnixFileMode.GroupRead | UnixFileMode.GroupWrite | UnixFileMode.GroupExecute
                    | UnixFileMode.OtherRead | UnixFileMode.OtherWrite | UnixFileMode.OtherExecute);
            var office = new Office(folder, soffice, python);
            try
            {
                var build = await Run(SamplePrograms.Require("bash"), [Path.Combine(Client, "build.sh"), folder], new(), TimeSpan.FromSeconds(60), asOfficeUser: false);
                Assert.True(build.ExitCode == 0, "build.sh: " + build);
                string oxt = Path.Combine(folder, "flowsolve.oxt");
                Assert.True(File.Exists(oxt), "build.sh wrote no flowsolve.oxt: " + build);
                var add = await Run(Path.Combine(Path.GetDirectoryName(soffice)!, "unopkg"), ["add", "-env:UserInstallation=" + office.ProfileUrl, oxt],
                    office.Environment(new()), TimeSpan.FromSeconds(120), asOfficeUser: true);
                Assert.True(add.ExitCode == 0 && !add.TimedOut, "unopkg add: " + add);
                return office;
            }
            catch
            {
                office.Dispose();
                throw;
            }
        }

        /// <summary>Runs recalc.py on a spec (the profile and soffice filled in) and returns its result.</summary>
        public async Task<JsonElement> Recalculate(object spec, Dictionary<string, string?> environment)
        {
            var full = JsonSerializer.SerializeToNode(spec)!.AsObject();
            full["soffice"] = _soffice;
            full["profile"] = ProfileUrl;
            string specPath = Path.Combine(Folder, "spec.json"), resultPath = Path.Combine(Folder, "result.json");
            await File.WriteAllTextAsync(specPath, full.ToJsonString());
            var run = await Run(_python, [Path.Combine(Client, "tests", "recalc.py"), specPath, resultPath], Environment(environment),
                TimeSpan.FromSeconds(240), asOfficeUser: true);
            Assert.True(run.ExitCode == 0 && !run.TimedOut && File.Exists(resultPath), "recalc.py: " + run);
            return JsonDocument.Parse(await File.ReadAllTextAsync(resultPath)).RootElement.Clone();
        }

        /// <summary>The office's environment: its own home in the work folder, no FlowSolve settings from the caller's.</summary>
        private Dictionary<string, string?> Environment(Dictionary<string, string?> extra)
        {
            var environment = new Dictionary<string, string?>
            {
                ["HOME"] = Folder, ["FLOWSOLVE_URL"] = null, ["FLOWSOLVE_API_KEY"] = null, ["LC_ALL"] = null, ["SAL_USE_VCLPLUGIN"] = "svp",
            };
            foreach (var (k, v) in extra) environment[k] = v;
            return environment;
        }

        public static async Task<ProgramRun> Run(string program, string[] arguments, Dictionary<string, string?> environment, TimeSpan limit, bool asOfficeUser)
        {
            var start = new ProcessStartInfo(program) { WorkingDirectory = LiveService.RepositoryRoot, RedirectStandardOutput = true, RedirectStandardError = true };
            if (asOfficeUser && System.Environment.IsPrivilegedProcess)
            {
                start.FileName = Find("setpriv");
                foreach (var a in new[] { "--reuid=" + Nobody, "--regid=" + Nobody, "--clear-groups", "--", program }) start.ArgumentList.Add(a);
            }
            foreach (var a in arguments) start.ArgumentList.Add(a);
            foreach (var (k, v) in environment)
            {
                if (v is null) start.Environment.Remove(k);
                else start.Environment[k] = v;
            }
            return await SamplePrograms.Run(start, limit);
        }

        /// <summary>A program on PATH, or /usr/bin; soffice missing skips the test on a developer machine and fails it
        /// where FLOWSOLVE_REQUIRE_CALC=1 (CI).</summary>
        private static string Find(string program)
        {
            var dirs = (System.Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator).Append("/usr/bin").Append("/usr/sbin");
            foreach (string dir in dirs.Where(d => d.Length > 0))
            {
                string candidate = Path.Combine(dir, program);
                if (File.Exists(candidate)) return Path.GetFullPath(candidate);
            }
            const string install = "apt-get install -y libreoffice-calc-nogui python3-uno";
            bool required = System.Environment.GetEnvironmentVariable("FLOWSOLVE_REQUIRE_CALC") == "1";
            if (program == "soffice" && !required)
                Assert.Skip($"LibreOffice (soffice) is not installed, so the Calc extension is not tried in a real Calc ({install} to run it)");
            Assert.Fail($"'{program}' is not installed: the Calc extension tests need it ({install})" +
                (required ? "; FLOWSOLVE_REQUIRE_CALC=1 (set by .ci/run) forbids skipping them" : ""));
            return "";
        }

        /// <summary>A Python that has LibreOffice's uno module: the office's own, or Debian's python3 with python3-uno.</summary>
        private static async Task<string> UnoPython()
        {
            foreach (string candidate in new[] { "/usr/lib/libreoffice/program/python", "/usr/bin/python3" })
            {
                if (!File.Exists(candidate)) continue;
                var probe = await Run(candidate, ["-c", "import uno"], new(), TimeSpan.FromSeconds(30), asOfficeUser: false);
                if (probe.ExitCode == 0) return candidate;
            }
            Assert.Fail("no Python here can import uno (LibreOffice's Python-UNO bridge): apt-get install -y python3-uno");
            return "";
        }

        public void Dispose()
        {
            try { Directory.Delete(Folder, recursive: true); }
            catch (IOException) { }
            catch (UnauthorizedAccessException) { }
        }
    }
}
