using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Tests.Pipes;

public sealed class MinorLossTableTests
{
    [Fact]
    public void Sum_AddsCountTimesK()
    {
        // Munson, Young and Okiishi, Fundamentals of Fluid Mechanics, Table 8.2 (from memory): sharp-edged entrance 0.5,
        // regular flanged 90-degree elbow 0.3, fully open gate valve 0.15, exit 1.0.
        double k = MinorLossTable.Sum([new("entrance-sharp-edged"), new("elbow-90-flanged-regular", 4),
            new("gate-valve-open", 2), new("exit")]);
        Assert.Equal(0.5 + 4 * 0.3 + 2 * 0.15 + 1.0, k, 1e-12);
    }

    [Fact]
    public void TrySum_UnknownFitting_ReturnsFalseWithName()
    {
        Assert.False(MinorLossTable.TrySum([new("exit"), new("flux-capacitor")], out double total, out string? unknown));
        Assert.Equal("flux-capacitor", unknown);
        Assert.Equal(0, total);
        var ex = Assert.Throws<ArgumentException>(() => MinorLossTable.Sum([new("flux-capacitor")]));
        Assert.Contains("flux-capacitor", ex.Message);
        Assert.Equal("fittings", ex.ParamName);
    }

    [Fact]
    public void All_CitesSourceAndProvenance()
    {
        Assert.Contains("Munson", MinorLossTable.Source);
        Assert.Contains("from memory", MinorLossTable.Provenance);
        Assert.All(MinorLossTable.All, f => Assert.True(f.LossCoefficient > 0));
        // Valve throttling raises K (property): open < quarter < half < three-quarters closed.
        double K(string n) { Assert.True(MinorLossTable.TryGet(n, out var f)); return f.LossCoefficient; }
        Assert.True(K("gate-valve-open") < K("gate-valve-quarter-closed"));
        Assert.True(K("gate-valve-quarter-closed") < K("gate-valve-half-closed"));
        Assert.True(K("gate-valve-half-closed") < K("gate-valve-three-quarters-closed"));
    }

    [Fact]
    public void TrySum_NegativeCount_Throws() =>
        Assert.Equal("fittings", Assert.Throws<ArgumentOutOfRangeException>(() =>
            MinorLossTable.TrySum([new("exit", -1)], out _, out _)).ParamName);
}
