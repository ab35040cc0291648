using FlowSolve.Core.Pumps;
using MathNet.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Pumps;

public sealed class PumpCurveTests
{
    private static readonly double[] Flows = [0, 0.015, 0.03, 0.045, 0.06, 0.075];

    [Fact]
    public void Fit_PointsOnKnownQuadratic_RecoversItExactly()
    {
        // Exact interpolation property: points lying on H = 48 - 20 Q - 4000 Q^2 are fitted with zero residual.
        double[] heads = Array.ConvertAll(Flows, q => 48 - 20 * q - 4000 * q * q);
        var fit = PumpCurve.Fit(Flows, heads);
        Assert.Equal(CurveFitStatus.Fitted, fit.Status);
        Assert.True(fit.Accepted);
        Assert.Equal(48, fit.Curve.C0, 1e-10);
        Assert.Equal(-20, fit.Curve.C1, 1e-8);
        Assert.Equal(-4000, fit.Curve.C2, 1e-6);
        Assert.Equal(0, fit.Curve.C3);
        Assert.True(fit.RmsDeviation < 1e-12);
        Assert.True(fit.MaxDeviation < 1e-12);
        Assert.Equal(6, fit.PointCount);
        Assert.Equal(0, fit.Curve.DataMinimumFlow);
        Assert.Equal(0.075, fit.Curve.DataMaximumFlow);
    }

    [Theory]
    [InlineData(CurveDegree.Quadratic)]
    [InlineData(CurveDegree.Cubic)]
    public void Fit_ScatteredPoints_AgreesWithMathNetFitPolynomial(CurveDegree degree)
    {
        // Cross-check with MathNet.Numerics.Fit.Polynomial (an independent least-squares implementation).
        double[] heads = [52.1, 51.0, 48.6, 44.1, 37.9, 29.8];
        var ours = PumpCurve.Fit(Flows, heads, degree);
        double[] reference = Fit.Polynomial(Flows, heads, (int)degree);
        Assert.Equal(reference[0], ours.Curve.C0, 1e-9 * Math.Abs(reference[0]));
        Assert.Equal(reference[1], ours.Curve.C1, 1e-7 * Math.Abs(reference[1]) + 1e-9);
        Assert.Equal(reference[2], ours.Curve.C2, 1e-7 * Math.Abs(reference[2]));
        if (degree == CurveDegree.Cubic) Assert.Equal(reference[3], ours.Curve.C3, 1e-7 * Math.Abs(reference[3]));
        // The reported deviations are those of the curve at the points (definition).
        double sum = 0, max = 0;
        for (int i = 0; i < Flows.Length; i++)
        {
            double r = Math.Abs(ours.Curve.Head(Flows[i]) - heads[i]);
            sum += r * r; max = Math.Max(max, r);
        }
        Assert.Equal(Math.Sqrt(sum / Flows.Length), ours.RmsDeviation, 1e-12);
        Assert.Equal(max, ours.MaxDeviation, 1e-12);
    }

    [Fact]
    public void Fit_Residuals_AreOrthogonalToTheBasis()
    {
        // Least-squares property (normal equations): sum r_i Q_i^k = 0 for each basis power k.
        double[] heads = [52.1, 51.0, 48.6, 44.1, 37.9, 29.8];
        var curve = PumpCurve.Fit(Flows, heads).Curve;
        for (int k = 0; k <= 2; k++)
        {
            double dot = 0, scale = 0;
            for (int i = 0; i < Flows.Length; i++)
            {
                double w = Math.Pow(Flows[i], k);
                dot += (heads[i] - curve.Head(Flows[i])) * w;
                scale += Math.Abs(heads[i] * w);
            }
            Assert.True(Math.Abs(dot) < 1e-12 * scale, $"k = {k}: {dot}");
        }
    }

    [Fact]
    public void Fit_HeadRisingFromShutOff_IsRejectedWithWhere()
    {
        // The rule of the issue: dH/dQ > 0 anywhere on [0, Qmax] rejects the points (a status, not an exception).
        double[] flows = [0, 0.02, 0.04, 0.06];
        double[] heads = [30, 32, 31, 26];
        var fit = PumpCurve.Fit(flows, heads);
        Assert.Equal(CurveFitStatus.RisesWithFlow, fit.Status);
        Assert.False(fit.Accepted);
        Assert.True(fit.MaximumSlope > 0);
        Assert.Equal(0, fit.MaximumSlopeFlow); // a downward parabola rises most steeply at its left end
        Assert.Equal(fit.Curve.C1, fit.MaximumSlope, 1e-12); // dH/dQ at Q = 0 is c1
        Assert.Equal("rises-with-flow", fit.Status.Code());
    }

    [Fact]
    public void ZeroHeadFlow_Quadratic_IsPositiveRootOfQuadraticFormula()
    {
        // Quadratic formula: 48 - 20 Q - 4000 Q^2 = 0.
        var curve = PumpCurve.FromCoefficients(48, -20, -4000);
        double expected = (20 - Math.Sqrt(400 + 4 * 4000 * 48)) / (2 * -4000);
        Assert.Equal(expected, curve.ZeroHeadFlow!.Value, 1e-15);
        Assert.Equal(expected, curve.SearchLimit);
        Assert.Null(curve.DataMaximumFlow);
        Assert.False(curve.RisesWithFlow);
    }

    [Fact]
    public void ZeroHeadFlow_Cubic_AgreesWithBrent()
    {
        // Cross-check with MathNet's Brent on the same polynomial; a cubic with a hump after the zero crossing.
        var curve = PumpCurve.FromCoefficients(50, 120, -9000, -40000, maximumFlow: 0.07);
        double brent = Brent.FindRoot(q => curve.Head(q), 0.01, 0.2, 1e-16, 200);
        Assert.Equal(brent, curve.ZeroHeadFlow!.Value, 1e-14);
        Assert.True(curve.RisesWithFlow); // c1 = 120 > 0 at shut-off
    }

    [Fact]
    public void FromCoefficients_NeverZeroWithoutRange_Throws()
    {
        Assert.Equal("maximumFlow", Assert.Throws<ArgumentException>(() => PumpCurve.FromCoefficients(40, -100, 200)).ParamName);
        Assert.Equal("maximumFlow", Assert.Throws<ArgumentException>(() => PumpCurve.FromCoefficients(40, 0, 0)).ParamName);
    }

    public static TheoryData<double[], double[], string> BadPoints => new()
    {
        { [0, 0.01], [40, 38], "flows" }, // fewer than three
        { [0, 0.01, 0.01], [40, 38, 37], "flows" }, // duplicate flows
        { [0, 0.01, 0.02], [40, -1, 30], "heads" }, // negative head
        { [0, double.NaN, 0.02], [40, 38, 30], "flows" },
        { [0, 0.01, 0.02], [40, double.PositiveInfinity, 30], "heads" },
        { [-0.01, 0.01, 0.02], [40, 38, 30], "flows" },
        { [0, 0.01, 0.02], [40, 38], "heads" }, // unpaired
        { [0, 0, 0], [40, 40, 40], "flows" },
    };

    [Theory]
    [MemberData(nameof(BadPoints))]
    public void Fit_BadPoints_ThrowNamingParameter(double[] flows, double[] heads, string name)
    {
        var e = Assert.ThrowsAny<ArgumentException>(() => PumpCurve.Fit(flows, heads));
        Assert.Equal(name, e.ParamName);
    }

    [Fact]
    public void Fit_CubicFromThreePoints_Throws()
    {
        var e = Assert.ThrowsAny<ArgumentException>(() => PumpCurve.Fit([0, 0.01, 0.02], [40, 38, 33], CurveDegree.Cubic));
        Assert.Equal("flows", e.ParamName);
    }

    [Theory]
    [InlineData(0.0, 0.0, -1000.0, 0.0, "c0")]
    [InlineData(-5.0, 0.0, -1000.0, 0.0, "c0")]
    [InlineData(40.0, double.NaN, -1000.0, 0.0, "c1")]
    [InlineData(40.0, 0.0, double.NegativeInfinity, 0.0, "c2")]
    [InlineData(40.0, 0.0, -1000.0, double.NaN, "c3")]
    public void FromCoefficients_BadValues_ThrowNamingParameter(double c0, double c1, double c2, double c3, string name)
    {
        var e = Assert.ThrowsAny<ArgumentException>(() => PumpCurve.FromCoefficients(c0, c1, c2, c3));
        Assert.Equal(name, e.ParamName);
    }
}
