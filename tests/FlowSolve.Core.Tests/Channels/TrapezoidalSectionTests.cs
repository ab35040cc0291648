using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

public class TrapezoidalSectionTests
{
    public static TheoryData<double, double, double, double> Cases => new()
    {
        { 6.0, 1.5, 2.0, 0.7 },
        { 6.0, 0.0, 3.0, 2.4 },
        { 0.5, 4.0, 4.0, 1.1 },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void At_AnyDepth_MatchesPolygonOfTheSection(double b, double z1, double z2, double depth)
    {
        // Independent: shoelace area and clipped edge lengths of the polygon drawn from the bank tops.
        double h = 3 * depth;
        var reference = ChannelReference.Polygon([(0, h), (z1 * h, 0), (z1 * h + b, 0), (z1 * h + b + z2 * h, h)], depth);
        var g = new TrapezoidalSection(b, z1, z2).At(depth);
        Assert.Equal(reference.A, g.Area, 1e-12 * reference.A);
        Assert.Equal(reference.P, g.WettedPerimeter, 1e-12 * reference.P);
        Assert.Equal(reference.T, g.TopWidth, 1e-12 * reference.T);
    }

    [Fact]
    public void At_Derivatives_MatchCentralDifferences()
    {
        var section = new TrapezoidalSection(3.0, 1.0, 2.5);
        const double y = 0.9, h = 1e-5;
        var g = section.At(y);
        Assert.Equal((section.At(y + h).Area - section.At(y - h).Area) / (2 * h), g.AreaDerivative, 1e-8);
        Assert.Equal((section.At(y + h).WettedPerimeter - section.At(y - h).WettedPerimeter) / (2 * h), g.WettedPerimeterDerivative, 1e-8);
        Assert.Equal((section.At(y + h).TopWidth - section.At(y - h).TopWidth) / (2 * h), g.TopWidthDerivative, 1e-8);
    }

    [Fact]
    public void Constructor_BadArguments_ThrowNamingTheParameter()
    {
        Assert.Equal("bottomWidth", Assert.ThrowsAny<ArgumentException>(() => new TrapezoidalSection(0.0, 1.0)).ParamName);
        Assert.Equal("bottomWidth", Assert.ThrowsAny<ArgumentException>(() => new TrapezoidalSection(double.NaN, 1.0)).ParamName);
        Assert.Equal("leftSideSlope", Assert.ThrowsAny<ArgumentException>(() => new TrapezoidalSection(2.0, -1.0, 1.0)).ParamName);
        Assert.Equal("rightSideSlope", Assert.ThrowsAny<ArgumentException>(() => new TrapezoidalSection(2.0, 1.0, double.PositiveInfinity)).ParamName);
    }
}
