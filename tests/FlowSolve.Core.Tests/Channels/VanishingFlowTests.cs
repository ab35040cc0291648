using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>A vanishing flow (5e-324 m3/s) in a circular section: the section's capacity, a property of the section,
/// slope and n alone, stays finite and equals what <see cref="ManningSolver.Capacity"/> gives without any flow.</summary>
public sealed class VanishingFlowTests
{
    [Theory]
    [InlineData(5e-324)]
    [InlineData(1e-300)]
    [InlineData(0.1)]
    public void NormalDepth_Circle_CapacityIsFiniteAndIndependentOfTheFlow(double flow)
    {
        double d = 1, n = 0.013, s = 0.001;
        var section = new CircularSection(d);
        var expected = ManningSolver.Capacity(section, s, n)!.Value;
        var capacity = ManningSolver.NormalDepth(section, flow, s, n).Capacity!.Value;
        Assert.True(double.IsFinite(capacity.MaximumFlow) && double.IsFinite(capacity.FullFlow));
        Assert.Equal(expected.MaximumFlow, capacity.MaximumFlow, expected.MaximumFlow * 1e-12);
        Assert.Equal(expected.FullFlow, capacity.FullFlow, expected.FullFlow * 1e-12);
    }
}
