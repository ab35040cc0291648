using FlowSolve.Core.Channels;
using MathNet.Numerics;

namespace FlowSolve.Core.Tests.Channels;

public class CircularSectionTests
{
    [Theory]
    [InlineData(1.2, 1e-3)]
    [InlineData(1.2, 0.003)]
    [InlineData(1.2, 0.45)]
    [InlineData(1.2, 0.6)]
    [InlineData(1.2, 1.1)]
    [InlineData(1.2, 1.2 - 1e-6)]
    public void At_AnyDepth_MatchesChordFormulas(double d, double depth)
    {
        // Independent: segment area r^2 acos((r-h)/r) - (r-h) sqrt(2rh - h^2), arc 2r acos((r-h)/r), chord 2 sqrt(2rh - h^2).
        var reference = ChannelReference.Circle(d, depth);
        var g = new CircularSection(d).At(depth);
        Assert.Equal(reference.A, g.Area, 1e-11 * reference.A);
        Assert.Equal(reference.P, g.WettedPerimeter, 1e-11 * reference.P);
        Assert.Equal(reference.T, g.TopWidth, 1e-9 * reference.T + 1e-15);
    }

    [Theory]
    [InlineData(1e-9)]
    [InlineData(1e-6)]
    [InlineData(1e-3)]
    public void At_TinyDepth_AreaMatchesIntegralOfTopWidth(double ratio)
    {
        // Independent of the chord formula (which cancels at tiny depths): A = integral of T = 2 sqrt(s (D - s)) ds,
        // with s = t^2 so the integrand 4 t^2 sqrt(D - t^2) is smooth, by MathNet's Gauss-Legendre rule.
        const double d = 0.75;
        double y = ratio * d;
        double integral = Integrate.GaussLegendre(t => 4 * t * t * Math.Sqrt(d - t * t), 0.0, Math.Sqrt(y), 32);
        Assert.Equal(integral, new CircularSection(d).At(y).Area, 1e-13 * integral);
    }

    [Fact]
    public void At_HalfAndFull_GiveClosedForms()
    {
        // Closed forms: half full A = pi D^2 / 8, P = pi D / 2, T = D; full A = pi D^2 / 4, P = pi D, T = 0.
        const double d = 0.9;
        var section = new CircularSection(d);
        var half = section.At(0.5 * d);
        Assert.Equal(Math.PI * d * d / 8, half.Area, 1e-14);
        Assert.Equal(Math.PI * d / 2, half.WettedPerimeter, 1e-14);
        Assert.Equal(d, half.TopWidth, 1e-14);
        var full = section.At(d);
        Assert.Equal(Math.PI * d * d / 4, full.Area, 1e-14);
        Assert.Equal(Math.PI * d, full.WettedPerimeter, 1e-14);
        Assert.Equal(0.0, full.TopWidth, 1e-14);
    }

    [Fact]
    public void At_Derivatives_MatchCentralDifferences()
    {
        var section = new CircularSection(1.5);
        const double h = 1e-6;
        foreach (double y in new[] { 0.2, 0.75, 1.3 })
        {
            var g = section.At(y);
            Assert.Equal((section.At(y + h).Area - section.At(y - h).Area) / (2 * h), g.AreaDerivative, 1e-7);
            Assert.Equal((section.At(y + h).WettedPerimeter - section.At(y - h).WettedPerimeter) / (2 * h), g.WettedPerimeterDerivative, 1e-6);
            Assert.Equal((section.At(y + h).TopWidth - section.At(y - h).TopWidth) / (2 * h), g.TopWidthDerivative, 1e-6);
        }
    }

    [Fact]
    public void PeakDischargeDepthRatio_MatchesGoldenSectionMaximumOfManning()
    {
        // Common practice (textbook figures): with constant n the discharge peaks at y/D of about 0.938.
        Assert.Equal(0.938, CircularSection.PeakDischargeDepthRatio, 0.001);
        // Independent: MathNet's golden-section minimiser on -Q(y/D) from the chord formulas.
        double best = FindMinimum.OfScalarFunctionConstrained(
            r => -ChannelReference.Manning(ChannelReference.Circle(1.0, r), 1e-3, 0.013), 0.85, 0.99, 1e-10);
        Assert.Equal(best, CircularSection.PeakDischargeDepthRatio, 1e-6);
    }

    [Fact]
    public void PeakVelocityDepthRatio_MatchesGoldenSectionMaximumOfHydraulicRadius()
    {
        // Common practice (textbook figures): the velocity peaks at y/D of about 0.81.
        Assert.Equal(0.81, CircularSection.PeakVelocityDepthRatio, 0.005);
        double best = FindMinimum.OfScalarFunctionConstrained(
            r => { var s = ChannelReference.Circle(1.0, r); return -s.A / s.P; }, 0.6, 0.95, 1e-10);
        Assert.Equal(best, CircularSection.PeakVelocityDepthRatio, 1e-6);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-0.3)]
    [InlineData(double.NaN)]
    public void Constructor_NonPositiveDiameter_ThrowsNamingDiameter(double diameter)
    {
        Assert.Equal("diameter", Assert.ThrowsAny<ArgumentException>(() => new CircularSection(diameter)).ParamName);
    }

    [Fact]
    public void At_AboveCrown_Throws()
    {
        Assert.Equal("depth", Assert.ThrowsAny<ArgumentException>(() => new CircularSection(1.0).At(1.0001)).ParamName);
    }
}
