using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

public class SurveyedSectionTests
{
    // A trapezoid b = 6 m, left side 1.5 : 1, right side 2 : 1, banks 4 m high, drawn as four survey points on an
    // arbitrary datum (elevation 100 m at the invert).
    internal static SurveyedSection DrawnTrapezoid() =>
        new([10.0, 16.0, 22.0, 30.0], [104.0, 100.0, 100.0, 104.0]);

    [Theory]
    [InlineData(0.0)]
    [InlineData(0.35)]
    [InlineData(2.0)]
    [InlineData(4.0)]
    public void At_TrapezoidDrawnAsSurvey_MatchesTrapezoidalSection(double depth)
    {
        var trapezoid = new TrapezoidalSection(6.0, 1.5, 2.0).At(depth);
        var surveyed = DrawnTrapezoid().At(depth);
        Assert.Equal(trapezoid.Area, surveyed.Area, 1e-12);
        Assert.Equal(trapezoid.WettedPerimeter, surveyed.WettedPerimeter, 1e-12);
        Assert.Equal(trapezoid.TopWidth, surveyed.TopWidth, 1e-12);
        // At the bank top the derivatives are those from below.
        Assert.Equal(trapezoid.TopWidthDerivative, surveyed.TopWidthDerivative, 1e-12);
        Assert.Equal(trapezoid.WettedPerimeterDerivative, surveyed.WettedPerimeterDerivative, 1e-12);
    }

    [Fact]
    public void Properties_DrawnTrapezoid_ReportInvertAndBankTop()
    {
        var section = DrawnTrapezoid();
        Assert.Equal(100.0, section.InvertElevation);
        Assert.Equal(4.0, section.MaximumDepth);
        Assert.Equal(4, section.PointCount);
        Assert.False(section.HasCompositeRoughness);
        Assert.True(double.IsNaN(section.SegmentManningN(1)));
    }

    [Fact]
    public void At_IrregularSection_MatchesPolygonClip()
    {
        // Independent: the shoelace area and clipped edges of the wetted polygon.
        double[] x = [0, 3, 5, 6, 9, 12, 20];
        double[] z = [5, 2.5, 0.4, 0, 0.8, 2.6, 4.2];
        var points = x.Zip(z, (a, b) => (a, b)).ToList();
        var section = new SurveyedSection(x, z);
        foreach (double depth in new[] { 0.3, 1.7, 3.9 })
        {
            var reference = ChannelReference.Polygon(points, depth);
            var g = section.At(depth);
            Assert.Equal(reference.A, g.Area, 1e-12 * reference.A);
            Assert.Equal(reference.P, g.WettedPerimeter, 1e-12 * reference.P);
            Assert.Equal(reference.T, g.TopWidth, 1e-12 * reference.T);
        }
    }

    [Fact]
    public void At_VerticalWalls_GiveRectangle()
    {
        // Equal consecutive stations draw vertical walls: a 3 m wide rectangle.
        var g = new SurveyedSection([0.0, 0.0, 3.0, 3.0], [2.0, 0.0, 0.0, 2.0]).At(1.2);
        var rectangle = new RectangularSection(3.0).At(1.2);
        Assert.Equal(rectangle.Area, g.Area, 1e-14);
        Assert.Equal(rectangle.WettedPerimeter, g.WettedPerimeter, 1e-14);
        Assert.Equal(rectangle.WettedPerimeterDerivative, g.WettedPerimeterDerivative, 1e-14);
    }

    [Fact]
    public void EffectiveManningN_SegmentRoughness_IsHortonEinstein()
    {
        // Rectangle 4 m wide, walls n = 0.013 (concrete), bed n = 0.030 (gravel); depth 1.5 m.
        // Horton-Einstein (Chow 1959, section 6-5, from memory): n = [(2 y nw^1.5 + b nb^1.5) / (b + 2 y)]^(2/3).
        var section = new SurveyedSection([0.0, 0.0, 4.0, 4.0], [3.0, 0.0, 0.0, 3.0], [0.013, 0.030, 0.013]);
        var g = section.At(1.5);
        double expected = Math.Pow((2 * 1.5 * Math.Pow(0.013, 1.5) + 4 * Math.Pow(0.030, 1.5)) / (4 + 2 * 1.5), 2.0 / 3.0);
        Assert.True(section.HasOwnRoughness);
        Assert.Equal(expected, g.EffectiveManningN(0.0), 1e-15);
        // K = A R^(2/3) / n with that n.
        Assert.Equal(6.0 * Math.Pow(6.0 / 7.0, 2.0 / 3.0) / expected, g.Conveyance(0.0), 1e-12);
    }

    [Fact]
    public void EffectiveManningN_PartlyGiven_UsesDefaultForTheRest()
    {
        var section = new SurveyedSection([0.0, 0.0, 4.0, 4.0], [3.0, 0.0, 0.0, 3.0], [double.NaN, 0.030, double.NaN]);
        double expected = Math.Pow((2 * 1.5 * Math.Pow(0.013, 1.5) + 4 * Math.Pow(0.030, 1.5)) / 7.0, 2.0 / 3.0);
        Assert.True(section.HasCompositeRoughness);
        Assert.False(section.HasOwnRoughness);
        Assert.Equal(expected, section.At(1.5).EffectiveManningN(0.013), 1e-15);
    }

    [Fact]
    public void At_FlatOverbankAtTheSurface_IsFloodedFromAbove()
    {
        // Main channel 2 m deep, horizontal overbank on the right at elevation 2: at depth 2 exactly the public At
        // reports the overbank wetted (the value just above); just below, it is dry.
        var section = new SurveyedSection([0, 0, 4, 4, 40, 40], [5, 0, 0, 2, 2, 5]);
        Assert.Equal(2 + 4 + 2 + 36, section.At(2.0).WettedPerimeter, 1e-12);
        Assert.Equal(8.0, section.At(2.0 - 1e-9).WettedPerimeter, 1e-8);
    }

    [Fact]
    public void Constructor_TooFewPoints_ThrowsNamingStations()
    {
        Assert.Equal("stations", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([0.0, 1.0], [1.0, 0.0])).ParamName);
    }

    [Fact]
    public void Constructor_DecreasingStation_ThrowsNamingStations()
    {
        Assert.Equal("stations", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([0.0, 2.0, 1.5, 4.0], [3.0, 0.0, 0.5, 3.0])).ParamName);
    }

    [Fact]
    public void Constructor_OtherBadInput_ThrowsNamingTheParameter()
    {
        Assert.Equal("elevations", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([0.0, 1.0, 2.0], [1.0, 0.0])).ParamName);
        Assert.Equal("elevations", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([0.0, 1.0, 2.0], [0.0, 1.0, 2.0])).ParamName);
        Assert.Equal("elevations", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([0.0, 1.0, 2.0], [1.0, double.NaN, 1.0])).ParamName);
        Assert.Equal("stations", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([1.0, 1.0, 1.0], [1.0, 0.0, 1.0])).ParamName);
        Assert.Equal("segmentManningN", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([0.0, 1.0, 2.0], [1.0, 0.0, 1.0], [0.03])).ParamName);
        Assert.Equal("segmentManningN", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection([0.0, 1.0, 2.0], [1.0, 0.0, 1.0], [0.03, -0.01])).ParamName);
        Assert.Equal("stations", Assert.ThrowsAny<ArgumentException>(() => new SurveyedSection(null!, [1.0, 0.0, 1.0])).ParamName);
    }
}
