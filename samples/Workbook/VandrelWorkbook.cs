using System.Globalization;
using System.Runtime.CompilerServices;
using ClosedXML.Excel;

namespace FlowSolve.Samples.Workbook;

/// <summary>
/// The Vandrel Vale demo workbook: a sheet of inputs (invented for the demo) and result cells that ask a FlowSolve
/// service for each value with <c>=VALUE(WEBSERVICE(url built from the input cells))</c> and <c>format=text</c>.
/// </summary>
public static class VandrelWorkbook
{
    /// <summary>Where the service runs by default.</summary>
    public const string DefaultServiceUrl = "http://localhost:5080";

    /// <summary>The sheet's name.</summary>
    public const string SheetName = "Vandrel Vale";

    /// <summary>The cell holding the service's base URL; every formula starts from it.</summary>
    public const string ServiceCell = "B8";

    /// <summary>One input: label, value (a number or a text), unit and note.</summary>
    public sealed record Input(string Name, string Label, object Value, string Unit, string Note = "");

    /// <summary>One result cell: label, the calculation's path, the query fields (input names or result names),
    /// the output selected (null for the calculation's primary output), the unit, and whether it is a number.</summary>
    public sealed record Result(string Name, string Label, string Path, (string Field, string Source)[] Query, string? Select,
        string Unit, bool Numeric = true);

    /// <summary>The inputs, in sheet order from row <see cref="FirstInputRow"/>.</summary>
    public static IReadOnlyList<Input> Inputs { get; } =
    [
        new("temperature", "Water temperature (river water at the intake)", 12.0, "degrees C"),
        new("mainFlow", "Pumping main: design flow", 0.12, "m3/s"),
        new("mainDiameter", "Pumping main: inside diameter", 0.35, "m", "welded steel"),
        new("mainLength", "Pumping main: length, intake to Orvex reservoir", 2350.0, "m"),
        new("mainMaterial", "Pumping main: material", "commercial-steel", "", "a name from /v1/pipes/materials"),
        new("mainFittings", "Pumping main: fittings", "elbow-90-flanged-long-radius:8,gate-valve-open:2,swing-check-valve-forward:1,exit:1", "",
            "name:count, names from /v1/pipes/fittings"),
        new("lift", "Static lift: reservoir TWL 118.5 m less wet well 42.0 m", 76.5, "m"),
        new("villageFlow", "Gravity line: Tazmerin village demand", 0.045, "m3/s"),
        new("gravityLength", "Gravity line: length, Orvex to Tazmerin tank", 4800.0, "m"),
        new("levels", "Gravity line: head between tank levels (118.5 - 96.0)", 22.5, "m"),
        new("gravityMaterial", "Gravity line: material", "drawn-plastic-tubing", "", "PE"),
        new("sizeTable", "Gravity line: size table", "iso-4427-pe-sdr-11", "", "a name from /v1/pipes/sizes"),
        new("canalFlow", "Brevix canal: design flow", 1.8, "m3/s"),
        new("canalWidth", "Brevix canal: bottom width", 1.2, "m", "concrete-lined trapezoid"),
        new("canalSideSlope", "Brevix canal: side slope", 1.5, "horizontal per vertical"),
        new("canalN", "Brevix canal: Manning n", 0.015, "s/m^(1/3)"),
        new("canalSlope", "Brevix canal: bed slope", 0.0005, "m/m"),
        new("culvertDiameter", "Pegwhistle Lane culvert: diameter", 1.5, "m", "concrete pipe, part full"),
        new("culvertN", "Pegwhistle Lane culvert: Manning n", 0.013, "s/m^(1/3)"),
        new("culvertSlope", "Pegwhistle Lane culvert: slope", 0.002, "m/m"),
    ];

    private static readonly (string, string)[] Main =
    [
        ("flow", "mainFlow"), ("diameter", "mainDiameter"), ("length", "mainLength"), ("material", "mainMaterial"),
        ("fittings", "mainFittings"), ("temperature", "temperature"), ("elevationChange", "lift"),
    ];

    private static readonly (string, string)[] Gravity =
    [
        ("flow", "villageFlow"), ("headLoss", "levels"), ("length", "gravityLength"), ("material", "gravityMaterial"),
        ("sizeTable", "sizeTable"), ("temperature", "temperature"),
    ];

    private static readonly (string, string)[] Canal =
    [
        ("shape", "'trapezoidal"), ("bottomWidth", "canalWidth"), ("sideSlope", "canalSideSlope"), ("manningN", "canalN"),
        ("flow", "canalFlow"),
    ];

    private static readonly (string, string)[] Culvert =
    [
        ("shape", "'circular"), ("diameter", "culvertDiameter"), ("manningN", "culvertN"), ("slope", "culvertSlope"), ("flow", "canalFlow"),
    ];

    /// <summary>The result cells, in sheet order from row <see cref="FirstResultRow"/>. A source starting with a quote
    /// is a literal; any other source names an input or an earlier result.</summary>
    public static IReadOnlyList<Result> Results { get; } =
    [
        new("nu", "Water: kinematic viscosity", "/v1/fluids/water", [("temperature", "temperature")], "kinematicViscosity", "m2/s"),
        new("mainLoss", "Pumping main: head loss, friction and fittings", "/v1/pipes/head-loss", Main, null, "m"),
        new("mainHead", "Pumping main: head the pumps must supply (with the lift)", "/v1/pipes/head-loss", Main, "totalHead", "m"),
        new("mainVelocity", "Pumping main: velocity", "/v1/pipes/head-loss", Main, "velocity", "m/s"),
        new("mainReynolds", "Pumping main: Reynolds number", "/v1/pipes/head-loss", Main, "reynolds", "-"),
        new("mainRelativeRoughness", "Pumping main: relative roughness e/D", "/v1/pipes/head-loss", Main, "relativeRoughness", "-"),
        new("friction", "Colebrook-White friction factor from the two cells above", "/v1/friction-factor",
            [("reynolds", "mainReynolds"), ("relativeRoughness", "mainRelativeRoughness")], null, "-"),
        new("minimumBore", "Gravity line: minimum bore for the demand", "/v1/pipes/diameter", Gravity, null, "m"),
        new("sizeName", "Gravity line: smallest listed size", "/v1/pipes/diameter", Gravity, "selectedSize.name", "", Numeric: false),
        new("sizeBore", "Gravity line: that size's bore", "/v1/pipes/diameter", Gravity, "selectedSize.insideDiameter", "m"),
        new("gravityFlow", "Gravity line: what that bore carries between the levels", "/v1/pipes/flow",
            [("headLoss", "levels"), ("diameter", "sizeBore"), ("length", "gravityLength"), ("material", "gravityMaterial"),
             ("temperature", "temperature")], null, "m3/s"),
        new("canalDepth", "Brevix canal: normal depth", "/v1/channels/normal-depth", [.. Canal, ("slope", "canalSlope")], null, "m"),
        new("canalFroude", "Brevix canal: Froude number", "/v1/channels/normal-depth", [.. Canal, ("slope", "canalSlope")], "froudeNumber", "-"),
        new("canalCritical", "Brevix canal: critical depth", "/v1/channels/critical-depth", Canal, null, "m"),
        new("culvertDepth", "Pegwhistle Lane culvert: normal depth", "/v1/channels/normal-depth", Culvert, null, "m"),
        new("culvertFull", "Pegwhistle Lane culvert: full-pipe flow", "/v1/channels/normal-depth", Culvert, "capacity.fullFlow", "m3/s"),
    ];

    /// <summary>First row of the inputs table.</summary>
    public const int FirstInputRow = 11;

    /// <summary>First row of the results table.</summary>
    public static int FirstResultRow => FirstInputRow + Inputs.Count + 3;

    /// <summary>The address (column B) of an input or result by name.</summary>
    public static string Address(string name)
    {
        for (int i = 0; i < Inputs.Count; i++) if (Inputs[i].Name == name) return $"B{FirstInputRow + i}";
        for (int i = 0; i < Results.Count; i++) if (Results[i].Name == name) return $"B{FirstResultRow + i}";
        throw new ArgumentException($"no input or result named '{name}'", nameof(name));
    }

    /// <summary>The formula of a result cell, as stored in the file (WEBSERVICE and ENCODEURL carry the _xlfn. prefix that
    /// the file format gives functions added in Excel 2013; a spreadsheet application shows them without it).</summary>
    public static string Formula(Result result)
    {
        var parts = new List<string> { $"{ServiceCell.Insert(1, "$").Insert(0, "$")}" };
        string text = result.Path + "?format=text";
        if (result.Select is not null) text += "&select=" + result.Select;
        foreach (var (field, source) in result.Query)
        {
            if (source.StartsWith('\''))
            {
                text += $"&{field}={source[1..]}";
                continue;
            }
            parts.Add(Quote(text + $"&{field}="));
            text = "";
            bool isText = Inputs.FirstOrDefault(i => i.Name == source)?.Value is string;
            parts.Add(isText ? $"_xlfn.ENCODEURL({Address(source)})" : Address(source));
        }
        if (text.Length > 0) parts.Add(Quote(text));
        string call = $"_xlfn.WEBSERVICE({string.Join("&", parts)})";
        return result.Numeric ? $"VALUE({call})" : call;
    }

    private static string Quote(string s) => "\"" + s.Replace("\"", "\"\"") + "\"";

    /// <summary>Builds the workbook with the service URL in <see cref="ServiceCell"/>.</summary>
    public static XLWorkbook Build(string serviceUrl = DefaultServiceUrl)
    {
        var workbook = new XLWorkbook();
        var sheet = workbook.Worksheets.Add(SheetName);
        sheet.Cell("A1").Value = "Vandrel Vale water scheme: hydraulic estimates from FlowSolve";
        sheet.Cell("A1").Style.Font.SetBold().Font.SetFontSize(14);
        string[] notes =
        [
            "The scheme and all its data are invented for the demo: no real place, firm or person.",
            "The result cells call a FlowSolve service with WEBSERVICE: they need the service running at the address in B8 and a spreadsheet application that supports WEBSERVICE (Excel 2013 or later on Windows; LibreOffice Calc).",
            "Numbers are joined into the URL with the application's decimal separator: in a locale whose decimal separator is a comma, use NUMBERVALUE(...; \".\") in place of VALUE and a point-decimal copy of the inputs.",
            "CAUTION: results are engineering estimates. They must be checked by a qualified engineer before use in design; local codes, standards and licensed practice govern.",
            "Pump duty points need a JSON body (POST /v1/pumps/duty-point), which WEBSERVICE cannot send: see samples/scenario/pumps.http.",
        ];
        for (int i = 0; i < notes.Length; i++)
        {
            sheet.Cell(2 + i, 1).Value = notes[i];
            sheet.Range(2 + i, 1, 2 + i, 4).Merge().Style.Alignment.SetWrapText();
            sheet.Row(2 + i).Height = 30;
        }
        sheet.Cell(5, 1).Style.Font.SetBold().Font.SetFontColor(XLColor.DarkRed);

        sheet.Cell("A8").Value = "FlowSolve service";
        sheet.Cell(ServiceCell).Value = serviceUrl;
        sheet.Cell(ServiceCell).DataType = XLDataType.Text;
        sheet.Cell("D8").Value = "change to where FlowSolve runs";

        Header(sheet, FirstInputRow - 1, "Inputs (invented for the demo)", "value", "unit", "note");
        for (int i = 0; i < Inputs.Count; i++)
        {
            var input = Inputs[i];
            int row = FirstInputRow + i;
            sheet.Cell(row, 1).Value = input.Label;
            var cell = sheet.Cell(row, 2);
            if (input.Value is double d) cell.Value = d;
            else { cell.Value = (string)input.Value; cell.DataType = XLDataType.Text; }
            cell.Style.Fill.SetBackgroundColor(XLColor.LightYellow);
            sheet.Cell(row, 3).Value = input.Unit;
            sheet.Cell(row, 4).Value = input.Note;
        }

        Header(sheet, FirstResultRow - 1, "Results (WEBSERVICE cells: need a running FlowSolve service)", "value", "unit", "calculation");
        for (int i = 0; i < Results.Count; i++)
        {
            var result = Results[i];
            int row = FirstResultRow + i;
            sheet.Cell(row, 1).Value = result.Label;
            sheet.Cell(row, 2).FormulaA1 = Formula(result);
            sheet.Cell(row, 3).Value = result.Unit;
            sheet.Cell(row, 4).Value = result.Path + (result.Select is null ? "" : $" (select={result.Select})");
        }

        sheet.Column(1).Width = 58;
        sheet.Column(2).Width = 24;
        sheet.Column(3).Width = 22;
        sheet.Column(4).Width = 48;
        workbook.CalculateMode = XLCalculateMode.Auto;
        return workbook;
    }

    private static void Header(IXLWorksheet sheet, int row, params string[] titles)
    {
        for (int c = 0; c < titles.Length; c++)
        {
            sheet.Cell(row, c + 1).Value = titles[c];
            sheet.Cell(row, c + 1).Style.Font.SetBold().Fill.SetBackgroundColor(XLColor.LightGray);
        }
    }

    /// <summary>This project's folder (the default output goes to its out/ folder).</summary>
    public static string ProjectFolder([CallerFilePath] string source = "") =>
        Path.GetDirectoryName(source) is { Length: > 0 } folder && Directory.Exists(folder) ? folder : Directory.GetCurrentDirectory();
}
