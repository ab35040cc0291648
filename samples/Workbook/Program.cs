namespace FlowSolve.Samples.Workbook;

/// <summary>Writes the Fernbrook Vale demo workbook (all data invented for the demo).</summary>
/// <remarks>Usage: <c>dotnet run --project samples/Workbook [-- OUTPUT.xlsx [SERVICE_URL]]</c>; by default
/// samples/Workbook/out/fernbrook-vale.xlsx calling http://localhost:5080.</remarks>
public static class WorkbookProgram
{
    public static int Main(string[] args)
    {
        string output = args.Length > 0 ? args[0]
            : Path.Combine(FernbrookWorkbook.ProjectFolder(), "out", "fernbrook-vale.xlsx");
        string service = args.Length > 1 ? args[1] : FernbrookWorkbook.DefaultServiceUrl;

        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(output))!);
        using var workbook = FernbrookWorkbook.Build(service);
        workbook.SaveAs(output);
        Console.WriteLine($"wrote {Path.GetFullPath(output)}: {FernbrookWorkbook.Results.Count} WEBSERVICE cells calling {service}");
        Console.WriteLine("Open it in a spreadsheet application that supports WEBSERVICE, with FlowSolve running at that address.");
        return 0;
    }
}
