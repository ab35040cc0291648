namespace FlowSolve.Api.Tests.Pipes;

public sealed class PipeTableEndpointsTests(ApiFixture api)
{
    [Fact]
    public async Task Sizes_ListsTablesWithoutSizes()
    {
        var r = await api.GetJson("/v1/pipes/sizes");
        Assert.Equal(200, r.Status);
        var names = r.Body.GetProperty("tables").EnumerateArray().Select(t => t.GetProperty("name").GetString()).ToArray();
        Assert.Contains("asme-b36.10m-schedule-40", names);
        Assert.Contains("iso-4427-pe-sdr-11", names);
        Assert.All(r.Body.GetProperty("tables").EnumerateArray(), t => Assert.False(t.TryGetProperty("sizes", out _)));
    }

    [Fact]
    public async Task Sizes_OneTable_Nps4Schedule40MatchesAsmeB36_10M()
    {
        // ASME B36.10M, NPS 4 Schedule 40: OD 4.500 in, wall 0.237 in, bore 4.026 in (common practice figures).
        var r = await api.GetJson("/v1/pipes/sizes?table=asme-b36.10m-schedule-40");
        var table = r.Body.GetProperty("tables")[0];
        var sizes = table.GetProperty("sizes").EnumerateArray().ToArray();
        Assert.Equal(table.GetProperty("count").GetInt32(), sizes.Length);
        var nps4 = sizes.Single(s => s.GetProperty("name").GetString() == "NPS 4");
        Assert.Equal(4.026 * 0.0254, nps4.GetProperty("insideDiameter").GetDouble(), 1e-9);
        // Properties: bore = OD - 2 wall; smallest bore first.
        Assert.All(sizes, s => Assert.Equal(s.GetProperty("outsideDiameter").GetDouble() - 2 * s.GetProperty("wallThickness").GetDouble(),
            s.GetProperty("insideDiameter").GetDouble(), 1e-12));
        for (int i = 1; i < sizes.Length; i++)
            Assert.True(sizes[i].GetProperty("insideDiameter").GetDouble() >= sizes[i - 1].GetProperty("insideDiameter").GetDouble());

        var us = await api.GetJson("/v1/pipes/sizes?table=asme-b36.10m-schedule-40&units=us");
        var nps4Us = us.Body.GetProperty("tables")[0].GetProperty("sizes").EnumerateArray().Single(s => s.GetProperty("name").GetString() == "NPS 4");
        Assert.Equal(4.026 / 12, nps4Us.GetProperty("insideDiameter").GetDouble(), 1e-9); // 12 in = 1 ft
    }

    [Fact]
    public async Task Materials_CastIronIs0_26mm()
    {
        // White, Fluid Mechanics, Table 6.1: cast iron, new, 0.26 mm (the same figure as the text of Example 6.7).
        var r = await api.GetJson("/v1/pipes/materials?name=cast-iron");
        Assert.Equal(200, r.Status);
        var m = r.Body.GetProperty("materials").EnumerateArray().Single();
        Assert.Equal(0.26e-3, m.GetProperty("new").GetDouble(), 1e-15);
        Assert.False(string.IsNullOrWhiteSpace(r.Body.GetProperty("source").GetString()));
        var all = await api.GetJson("/v1/pipes/materials");
        Assert.True(all.Body.GetProperty("materials").GetArrayLength() > 5);
    }

    [Fact]
    public async Task Materials_ListTheStatedUncertainty()
    {
        // White, Fluid Mechanics, Table 6.1 (from memory): commercial steel 0.046 mm, plus or minus 30 percent; smooth
        // glass has no stated uncertainty.
        var all = (await api.GetJson("/v1/pipes/materials")).Body.GetProperty("materials").EnumerateArray().ToArray();
        var steel = all.Single(m => m.GetProperty("name").GetString() == "commercial-steel");
        Assert.Equal(30, steel.GetProperty("uncertaintyPercent").GetDouble());
        var glass = all.Single(m => m.GetProperty("name").GetString() == "glass");
        Assert.True(!glass.TryGetProperty("uncertaintyPercent", out var g) || g.ValueKind == System.Text.Json.JsonValueKind.Null);
    }

    [Fact]
    public async Task Fittings_ListsNamesAndCoefficients()
    {
        var r = await api.GetJson("/v1/pipes/fittings");
        Assert.Equal(200, r.Status);
        var fittings = r.Body.GetProperty("fittings").EnumerateArray().ToArray();
        Assert.Contains(fittings, f => f.GetProperty("name").GetString() == "gate-valve-open");
        // Common practice: a fully open gate valve loses far less than a fully open globe valve.
        double gate = fittings.Single(f => f.GetProperty("name").GetString() == "gate-valve-open").GetProperty("lossCoefficient").GetDouble();
        double globe = fittings.Single(f => f.GetProperty("name").GetString() == "globe-valve-open").GetProperty("lossCoefficient").GetDouble();
        Assert.True(gate < globe);
        Assert.All(fittings, f => Assert.True(f.GetProperty("lossCoefficient").GetDouble() >= 0));
    }
}
