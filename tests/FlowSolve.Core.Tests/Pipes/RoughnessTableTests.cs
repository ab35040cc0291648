using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Tests.Pipes;

public sealed class RoughnessTableTests
{
    [Fact]
    public void Roughness_CastIron_MatchesWhiteExample6_7()
    {
        // White, Fluid Mechanics, Example 6.7 (found) takes 0.26 mm for cast iron, the value of his Table 6.1.
        Assert.Equal(0.26e-3, RoughnessTable.Roughness("cast-iron"), 1e-12);
    }

    [Fact]
    public void All_CitesSourceAndProvenance()
    {
        Assert.Contains("White", RoughnessTable.Source);
        Assert.Contains("from memory", RoughnessTable.Provenance);
        Assert.All(RoughnessTable.All, m => Assert.True(m.New >= 0 && m.New < 0.01));
    }

    [Fact]
    public void TryGet_AgedSteel_IsRougherThanNew()
    {
        Assert.True(RoughnessTable.TryGet("commercial-steel", out var steel));
        Assert.True(steel.TryGet(SurfaceCondition.Aged, out double aged));
        Assert.True(aged > steel.New);
        Assert.True(RoughnessTable.TryGet("glass", out var glass));
        Assert.False(glass.TryGet(SurfaceCondition.Aged, out _));
        Assert.Equal("condition", Assert.Throws<ArgumentException>(() => RoughnessTable.Roughness("glass", SurfaceCondition.Aged)).ParamName);
    }

    [Fact]
    public void Roughness_UnknownMaterial_ThrowsNamingIt()
    {
        Assert.False(RoughnessTable.TryGet("unobtainium", out _));
        var ex = Assert.Throws<ArgumentException>(() => RoughnessTable.Roughness("unobtainium"));
        Assert.Equal("material", ex.ParamName);
        Assert.Contains("unobtainium", ex.Message);
    }

    [Theory]
    // White, Fluid Mechanics, Table 6.1: the uncertainty stated beside each recommended value, in percent (from memory).
    [InlineData("commercial-steel", 0.046, 30.0)]
    [InlineData("cast-iron", 0.26, 50.0)]
    [InlineData("wrought-iron", 0.046, 20.0)]
    [InlineData("riveted-steel", 3.0, 70.0)]
    public void TryGetUncertaintyBand_IsNewTimesOneMinusAndPlusU(string name, double newMillimetres, double percent)
    {
        Assert.True(RoughnessTable.TryGet(name, out var material));
        Assert.Equal(percent, material.UncertaintyPercent);
        Assert.True(material.TryGetUncertaintyBand(out double low, out double high));
        Assert.Equal(newMillimetres * 1e-3 * (1 - percent / 100), low, 1e-15);
        Assert.Equal(newMillimetres * 1e-3 * (1 + percent / 100), high, 1e-15);
    }

    [Fact]
    public void TryGetUncertaintyBand_EveryMaterialButSmoothGlass_HasOne()
    {
        // The table states an uncertainty for every surface but smooth glass (White, Table 6.1, from memory).
        foreach (var m in RoughnessTable.All)
        {
            bool has = m.TryGetUncertaintyBand(out double low, out double high);
            Assert.Equal(m.Name != "glass", has);
            if (has) Assert.True(0 <= low && low < m.New && m.New < high, m.Name);
        }
    }
}
