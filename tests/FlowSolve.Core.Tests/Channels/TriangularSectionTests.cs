using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

public class TriangularSectionTests
{
    [Theory]
    [InlineData(2.0, 2.0, 0.4)]
    [InlineData(0.0, 12.0, 0.15)]
    public void At_AnyDepth_MatchesPolygonOfTheSection(double z1, double z2, double depth)
    {
        double h = 2 * depth;
        var reference = ChannelReference.Polygon([(0, h), (z1 * h, 0), (z1 * h + z2 * h, h)], depth);
        var g = new TriangularSection(z1, z2).At(depth);
        Assert.Equal(reference.A, g.Area, 1e-12 * reference.A);
        Assert.Equal(reference.P, g.WettedPerimeter, 1e-12 * reference.P);
        Assert.Equal(reference.T, g.TopWidth, 1e-12 * reference.T);
    }

    [Fact]
    public void Constructor_BadSlopes_ThrowNamingTheParameter()
    {
        Assert.Equal("sideSlope", Assert.ThrowsAny<ArgumentException>(() => new TriangularSection(0.0)).ParamName);
        Assert.Equal("leftSideSlope", Assert.ThrowsAny<ArgumentException>(() => new TriangularSection(-1.0, 2.0)).ParamName);
        Assert.Equal("rightSideSlope", Assert.ThrowsAny<ArgumentException>(() => new TriangularSection(0.0, 0.0)).ParamName);
    }
}
