using System.Globalization;
using System.Text;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Api.Tests.Samples;

/// <summary>samples/scenario/pipe-sizing-study.csv sent to <c>POST /v1/batch/pipes/diameter</c> as text/csv.</summary>
public sealed class PipeSizingStudyTests(ApiFixture api)
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;
    private const double G = 9.80665; // standard gravity, as FlowSolve's conventions state

    private static string StudyPath => Path.Combine(LiveService.RepositoryRoot, "samples", "scenario", "pipe-sizing-study.csv");

    [Fact]
    public async Task Batch_SizingStudy_AnswersOneRowPerCaseEachMeetingTheAllowance()
    {
        string study = await File.ReadAllTextAsync(StudyPath, TestContext.Current.CancellationToken);
        var cases = ReadCsv(study);
        using var content = new StringContent(study, Encoding.UTF8, "text/csv");
        using var response = await api.Client.PostAsync("/v1/batch/pipes/diameter", content, TestContext.Current.CancellationToken);
        string answer = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
        var rows = ReadCsv(answer);

        Assert.Equal(200, (int)response.StatusCode);
        Assert.Equal("text/csv", response.Content.Headers.ContentType?.MediaType);
        Assert.True(cases.Count >= 20, $"the study has {cases.Count} cases; it is meant to have tens");
        Assert.Equal(cases.Count, rows.Count);
        for (int i = 0; i < rows.Count; i++)
        {
            var (input, row) = (cases[i], rows[i]);
            Assert.True(row["httpStatus"] == "200", $"row {i + 1}: {row["httpStatus"]} {row["error"]}");
            Assert.Equal((i + 1).ToString(C), row["row"]);
            Assert.Equal(Num(input, "flow"), Num(row, "flow"), 1e-15);
            Assert.Equal(Num(input, "length"), Num(row, "length"), 1e-12);
            Assert.Equal("turbulent", row["regime"]);

            // Property of the minimum diameter: there, the Darcy-Weisbach loss uses exactly the allowance. Checked with an
            // independent Colebrook-White root (MathNet.Numerics' Brent) on the answer's own D, Re-defining inputs.
            double d = Num(row, "diameter"), q = Num(row, "flow"), e = Num(row, "roughness"), k = Num(row, "minorLossCoefficient");
            double nu = Num(row, "kinematicViscosity"), length = Num(row, "length");
            double v = 4 * q / (Math.PI * d * d), re = v * d / nu;
            double f = Brent.FindRoot(x => 1 / Math.Sqrt(x) + 2 * Math.Log10(e / d / 3.7 + 2.51 / (re * Math.Sqrt(x))), 0.005, 0.1, 1e-15, 200);
            double loss = (f * length / d + k) * v * v / (2 * G);
            Assert.Equal(Num(input, "headLoss"), loss, 1e-9 * loss);

            if (input["sizeTable"].Length > 0)
            {
                Assert.True(Num(row, "selectedSize.insideDiameter") >= d, $"row {i + 1}: chosen bore below the minimum");
                Assert.True(Num(row, "selectedSize.headLoss") <= Num(input, "headLoss") * (1 + 1e-12), $"row {i + 1}: chosen size exceeds the allowance");
            }
        }
    }

    private static double Num(IReadOnlyDictionary<string, string> row, string column) => double.Parse(row[column], C);

    /// <summary>A small RFC 4180 reader: header row, quoted fields with doubled quotes.</summary>
    private static List<Dictionary<string, string>> ReadCsv(string text)
    {
        var records = new List<List<string>>();
        var field = new StringBuilder();
        var record = new List<string>();
        bool quoted = false;
        for (int i = 0; i < text.Length; i++)
        {
            char c = text[i];
            if (quoted)
            {
                if (c == '"' && i + 1 < text.Length && text[i + 1] == '"') { field.Append('"'); i++; }
                else if (c == '"') quoted = false;
                else field.Append(c);
            }
            else if (c == '"') quoted = true;
            else if (c == ',') { record.Add(field.ToString()); field.Clear(); }
            else if (c == '\n' || c == '\r')
            {
                if (c == '\r' && i + 1 < text.Length && text[i + 1] == '\n') i++;
                record.Add(field.ToString()); field.Clear();
                if (record.Any(f => f.Length > 0)) records.Add(record);
                record = [];
            }
            else field.Append(c);
        }
        if (field.Length > 0 || record.Count > 0) { record.Add(field.ToString()); records.Add(record); }
        var header = records[0];
        return records.Skip(1).Select(r => header.Select((h, j) => (h, v: j < r.Count ? r[j] : "")).ToDictionary(p => p.h, p => p.v)).ToList();
    }
}
