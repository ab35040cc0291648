using FlowSolve.Core.Pumps;
using MathNet.Numerics;

namespace FlowSolve.Core.Tests.Pumps;

public sealed class EfficiencyCurveTests
{
    private static readonly double[] Flows = [0.01, 0.02, 0.03, 0.04, 0.05, 0.06, 0.07];

    [Fact]
    public void Fit_ThroughOriginOnKnownParabola_RecoversBep()
    {
        // eta = 32 q - 320 q^2: vertex at q = 32/640 = 0.05 with eta = 0.8 (exact interpolation property).
        double[] eta = Array.ConvertAll(Flows, q => 32 * q - 320 * q * q);
        var fit = EfficiencyCurve.Fit(Flows, eta);
        Assert.Equal(0, fit.Curve.E0);
        Assert.Equal(32, fit.Curve.E1, 1e-10);
        Assert.Equal(-320, fit.Curve.E2, 1e-8);
        Assert.Equal(0.05, fit.Curve.BestEfficiencyFlow, 1e-12);
        Assert.Equal(0.8, fit.Curve.BestEfficiency, 1e-12);
        Assert.True(fit.Curve.HasInteriorMaximum);
        Assert.True(fit.RmsDeviation < 1e-13);
    }

    [Fact]
    public void Fit_ThroughOrigin_AgreesWithMathNetLinearCombination()
    {
        // Cross-check with MathNet.Numerics.Fit.LinearCombination on the basis {q, q^2}.
        double[] eta = [0.29, 0.51, 0.66, 0.76, 0.79, 0.77, 0.70];
        var ours = EfficiencyCurve.Fit(Flows, eta).Curve;
        double[] reference = Fit.LinearCombination(Flows, eta, q => q, q => q * q);
        Assert.Equal(reference[0], ours.E1, 1e-9 * Math.Abs(reference[0]));
        Assert.Equal(reference[1], ours.E2, 1e-9 * Math.Abs(reference[1]));
        Assert.Equal(-reference[0] / (2 * reference[1]), ours.BestEfficiencyFlow, 1e-12);
    }

    [Theory]
    [InlineData(CurveDegree.Quadratic)]
    [InlineData(CurveDegree.Cubic)]
    public void Fit_General_AgreesWithMathNetFitPolynomial(CurveDegree degree)
    {
        double[] eta = [0.29, 0.51, 0.66, 0.76, 0.79, 0.77, 0.70];
        var ours = EfficiencyCurve.Fit(Flows, eta, degree, throughOrigin: false).Curve;
        double[] reference = Fit.Polynomial(Flows, eta, (int)degree);
        Assert.Equal(reference[0], ours.E0, 1e-9);
        Assert.Equal(reference[1], ours.E1, 1e-8 * Math.Abs(reference[1]));
        Assert.Equal(reference[2], ours.E2, 1e-8 * Math.Abs(reference[2]));
        if (degree == CurveDegree.Cubic) Assert.Equal(reference[3], ours.E3, 1e-8 * Math.Abs(reference[3]));
    }

    [Fact]
    public void Fit_StillRisingAtEndOfData_HasNoInteriorMaximum()
    {
        // Stated rule: the BEP is the maximum on [0, Qmax]; rising data put it at Qmax.
        double[] flows = [0.01, 0.02, 0.03];
        double[] eta = Array.ConvertAll(flows, q => 32 * q - 320 * q * q);
        var curve = EfficiencyCurve.Fit(flows, eta).Curve;
        Assert.False(curve.HasInteriorMaximum);
        Assert.Equal(0.03, curve.BestEfficiencyFlow, 1e-15);
    }

    [Theory]
    [InlineData(1.2, "efficiencies")]
    [InlineData(-0.1, "efficiencies")]
    [InlineData(double.NaN, "efficiencies")]
    public void Fit_BadEfficiency_ThrowsNamingParameter(double bad, string name)
    {
        var e = Assert.ThrowsAny<ArgumentException>(() => EfficiencyCurve.Fit([0.01, 0.02, 0.03], [0.3, bad, 0.6]));
        Assert.Equal(name, e.ParamName);
    }
}
