using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Tests.Pipes;

public sealed class PipeSizeTablesTests
{
    private const double Inch = 0.0254;

    [Fact]
    public void All_ListsMetricAndUsSeriesWithStandardAndEdition()
    {
        var names = PipeSizeTables.Names.ToList();
        Assert.Equal(["asme-b36.10m-schedule-40", "asme-b36.10m-schedule-80", "iso-4427-pe-sdr-11"], names);
        foreach (var table in PipeSizeTables.All)
        {
            Assert.False(string.IsNullOrWhiteSpace(table.Standard));
            Assert.Matches(@"\d{4}", table.Edition);
            Assert.Contains("from memory", table.Provenance);
            Assert.NotEmpty(table.Sizes);
            for (int i = 1; i < table.Sizes.Count; i++)
                Assert.True(table.Sizes[i].InsideDiameter > table.Sizes[i - 1].InsideDiameter);
        }
    }

    public static TheoryData<string, string, double> InsideDiameters => new()
    {
        // Inside diameters in inches as commonly tabulated for ASME B36.10M steel pipe (from memory).
        { "asme-b36.10m-schedule-40", "NPS 1", 1.049 },
        { "asme-b36.10m-schedule-40", "NPS 4", 4.026 },
        { "asme-b36.10m-schedule-40", "NPS 6", 6.065 },
        { "asme-b36.10m-schedule-40", "NPS 12", 11.938 },
        { "asme-b36.10m-schedule-80", "NPS 2", 1.939 },
        { "asme-b36.10m-schedule-80", "NPS 8", 7.625 },
    };

    [Theory]
    [MemberData(nameof(InsideDiameters))]
    public void TryGetSize_SteelPipe_HasTabulatedBore(string table, string size, double insideInches)
    {
        Assert.True(PipeSizeTables.TryGet(table, out var t));
        Assert.True(t.TryGetSize(size, out var s));
        Assert.Equal(insideInches * Inch, s.InsideDiameter, 1e-9);
    }

    [Fact]
    public void Schedule80_HasThickerWallSameOutsideDiameter()
    {
        // Property of the schedule system (common practice): schedules share the outside diameter of each NPS.
        var s40 = PipeSizeTables.Get("asme-b36.10m-schedule-40");
        var s80 = PipeSizeTables.Get("asme-b36.10m-schedule-80");
        foreach (var size in s40.Sizes)
        {
            Assert.True(s80.TryGetSize(size.Name, out var heavy));
            Assert.Equal(size.OutsideDiameter, heavy.OutsideDiameter);
            Assert.True(heavy.InsideDiameter < size.InsideDiameter);
        }
    }

    [Fact]
    public void PolyethyleneSdr11_WallIsAboutOneEleventhOfOutsideDiameter()
    {
        // SDR = outside diameter / wall thickness (ISO 4065 definition, from memory); walls are rounded to 0.1 mm and
        // small sizes have a minimum wall.
        foreach (var size in PipeSizeTables.Get("iso-4427-pe-sdr-11").Sizes)
        {
            if (size.OutsideDiameter < 0.03) continue;
            Assert.Equal(size.OutsideDiameter / 11, size.WallThickness, 0.00011);
        }
    }

    [Fact]
    public void TryGet_Unknown_ReturnsFalse()
    {
        Assert.False(PipeSizeTables.TryGet("schedule-41", out _));
        Assert.Equal("table", Assert.Throws<ArgumentException>(() => PipeSizeTables.Get("schedule-41")).ParamName);
        Assert.True(PipeSizeTables.TryGet("ASME-B36.10M-SCHEDULE-40", out _)); // case-insensitive
    }
}
