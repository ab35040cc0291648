using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

public class RectangularSectionTests
{
    [Theory]
    [InlineData(5.0, 0.8)]
    [InlineData(0.3, 12.0)]
    public void At_AnyDepth_MatchesPolygonOfTheSection(double width, double depth)
    {
        // Independent: shoelace area and clipped edge lengths of the polygon (0, H) (0, 0) (b, 0) (b, H).
        double h = 2 * depth;
        var reference = ChannelReference.Polygon([(0, h), (0, 0), (width, 0), (width, h)], depth);
        var g = new RectangularSection(width).At(depth);
        Assert.Equal(reference.A, g.Area, 1e-12 * reference.A);
        Assert.Equal(reference.P, g.WettedPerimeter, 1e-12 * reference.P);
        Assert.Equal(reference.T, g.TopWidth, 1e-12 * reference.T);
        Assert.Equal(g.Area / g.WettedPerimeter, g.HydraulicRadius, 1e-15);
    }

    [Fact]
    public void At_Derivatives_MatchCentralDifferences()
    {
        var section = new RectangularSection(4.0);
        const double y = 1.3, h = 1e-5;
        var g = section.At(y);
        Assert.Equal((section.At(y + h).Area - section.At(y - h).Area) / (2 * h), g.AreaDerivative, 1e-8);
        Assert.Equal((section.At(y + h).WettedPerimeter - section.At(y - h).WettedPerimeter) / (2 * h), g.WettedPerimeterDerivative, 1e-8);
        Assert.Equal(0.0, g.TopWidthDerivative);
        Assert.Equal(double.PositiveInfinity, section.MaximumDepth);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-2.0)]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    public void Constructor_NonPositiveWidth_ThrowsNamingWidth(double width)
    {
        var error = Assert.ThrowsAny<ArgumentException>(() => new RectangularSection(width));
        Assert.Equal("width", error.ParamName);
    }

    [Fact]
    public void At_NegativeDepth_ThrowsNamingDepth()
    {
        var error = Assert.ThrowsAny<ArgumentException>(() => new RectangularSection(2.0).At(-0.1));
        Assert.Equal("depth", error.ParamName);
    }
}
