namespace FlowSolve.Samples.Workbook;

/// <summary>Writes the Vandrel Vale demo workbook (all data invented for the demo).</summary>
/// <remarks>Usage: <c>dotnet run --project samples/Workbook [-- OUTPUT.xlsx [SERVICE_URL]]</c>; by default
/// samples/Workbook/out/vandrel-vale.xlsx calling http://localhost:5080.</remarks>
public static class WorkbookProgram
{
    public static int Main(string[] args)
    {
        string output = args.Length > 0 ? args[0]
            : Path.Combine(VandrelWorkbook.ProjectFolder(), "out", "vandrel-vale.xlsx");
        string service = args.Length > 1 ? args[1] : VandrelWorkbook.DefaultServiceUrl;

        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(output))!);
        using var workbook = VandrelWorkbook.Build(service);
        workbook.SaveAs(output);
        Console.WriteLine($"wrote {Path.GetFullPath(output)}: {VandrelWorkbook.Results.Count} WEBSERVICE cells calling {service}");
        Console.WriteLine("Open it in a spreadsheet application that supports WEBSERVICE, with FlowSolve running at that address.");
        return 0;
    }
}
