using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Friction;

public sealed class ColebrookWhiteTests
{
    /// <summary>The same equation solved independently by MathNet.Numerics' Brent method, in f directly.</summary>
    private static double BrentFrictionFactor(double re, double r) =>
        Brent.FindRoot(f => 1 / Math.Sqrt(f) + 2 * Math.Log10(r / 3.7 + 2.51 / (re * Math.Sqrt(f))), 1e-3, 0.2, 1e-17, 500);

    public static TheoryData<double, double> Grid()
    {
        var data = new TheoryData<double, double>();
        foreach (double re in new[] { 4e3, 1e4, 6.3e4, 2.5e5, 1e6, 1.6e7, 1e8 })
        foreach (double r in new[] { 0.0, 1e-6, 1e-5, 1e-4, 1e-3, 5e-3, 0.02, 0.05 })
            data.Add(re, r);
        return data;
    }

    [Theory]
    [MemberData(nameof(Grid))]
    public void Solve_AgreesWithMathNetBrent_To1e13(double re, double r)
    {
        var result = ColebrookWhite.Solve(re, r);
        double brent = BrentFrictionFactor(re, r);
        Assert.True(result.Converged, result.Status.Reason());
        Assert.Equal(brent, result.FrictionFactor, 1e-13 * brent);
    }

    [Fact]
    public void Solve_OverWholeRange_AtMostSixIterationsAndRelativeAccuracy1e14()
    {
        // 1e-14 relative accuracy is checked as a property of the equation: the residual of f in
        // Colebrook-White's own form, divided by its sensitivity, bounds the error of f. Brent (above) agrees to 1e-13.
        int worst = 0;
        for (int i = 0; i <= 100; i++)
        {
            double re = 4e3 * Math.Pow(1e8 / 4e3, i / 100.0);
            for (int j = 0; j <= 40; j++)
            {
                double r = j == 0 ? 0 : 1e-7 * Math.Pow(0.05 / 1e-7, (j - 1) / 39.0);
                var result = ColebrookWhite.Solve(re, r);
                Assert.True(result.Converged);
                worst = Math.Max(worst, result.Iterations);
                double x = 1 / Math.Sqrt(result.FrictionFactor);
                // g'(x) >= 1, so |dx| <= |g(x)|; |df/f| = 2|dx/x|.
                double residual = Math.Abs(ColebrookWhite.Residual(result.FrictionFactor, re, r));
                double bound = 2 * residual / x + 4 * SolverOptions.MachineEpsilon;
                Assert.True(bound <= 1e-14, $"Re {re}, e/D {r}: error bound {bound}");
            }
        }
        Assert.InRange(worst, 1, 6);
    }

    [Fact]
    public void Solve_RandomInputsOverRange_ErrorBoundBelow1e14()
    {
        // 20 000 log-uniform random (Re, e/D) pairs, an eighth of them smooth: the same error bound as above.
        var random = new Random(7);
        for (int i = 0; i < 20_000; i++)
        {
            double re = 4e3 * Math.Pow(1e8 / 4e3, random.NextDouble());
            double r = i % 8 == 0 ? 0.0 : 1e-6 * Math.Pow(0.05 / 1e-6, random.NextDouble());
            var result = ColebrookWhite.Solve(re, r);
            Assert.True(result.Converged);
            Assert.InRange(result.Iterations, 1, 6);
            double x = 1 / Math.Sqrt(result.FrictionFactor);
            double bound = 2 * Math.Abs(ColebrookWhite.Residual(result.FrictionFactor, re, r)) / x + 4 * SolverOptions.MachineEpsilon;
            Assert.True(bound <= 1e-14, $"Re {re}, e/D {r}: error bound {bound}");
        }
    }

    public static TheoryData<double, double> WhiteTable => new()
    {
        // F. M. White, Fluid Mechanics, chapter on dimensional analysis: Moody-type tabulation at e/D = 0.005
        // (three significant figures).
        { 15_000, 0.0356 },
        { 75_000, 0.0316 },
        { 250_000, 0.0308 },
        { 900_000, 0.0305 },
        { 3_330_000, 0.0304 },
    };

    [Theory]
    [MemberData(nameof(WhiteTable))]
    public void Solve_WhiteTabulationAtRoughness0005_WithinThreeFigures(double re, double published)
    {
        var result = ColebrookWhite.Solve(re, 0.005);
        Assert.Equal(published, result.FrictionFactor, 0.005 * published);
    }

    public static TheoryData<double, double, double> MoodyChart => new()
    {
        // Read from the Moody (1944) diagram, Trans. ASME 66: from memory, chart-reading tolerance 2 percent.
        { 1e5, 0.0, 0.0180 },
        { 1e6, 0.0001, 0.0134 },
        { 1e7, 0.001, 0.0200 },
    };

    [Theory]
    [MemberData(nameof(MoodyChart))]
    public void Solve_MoodyDiagramPoints_WithinChartReading(double re, double r, double chart)
    {
        Assert.Equal(chart, ColebrookWhite.Solve(re, r).FrictionFactor, 0.02 * chart);
    }

    [Theory]
    [InlineData(0.01)]
    [InlineData(0.001)]
    [InlineData(0.05)]
    public void Solve_FullyRoughLimit_ApproachesVonKarman(double r)
    {
        // Fully rough limit 1/sqrt(f) = -2 log10((e/D)/3.7), as labelled on a reproduction of Moody (1944).
        double limit = Math.Pow(-2 * Math.Log10(r / 3.7), -2);
        Assert.Equal(limit, ColebrookWhite.Solve(1e12, r).FrictionFactor, 1e-5 * limit);
    }

    [Theory]
    [InlineData(1e4)]
    [InlineData(1e6)]
    [InlineData(1e8)]
    public void Solve_SmoothPipe_AgreesWithPrandtlVonKarman(double re)
    {
        // Smooth-pipe law 1/sqrt(f) = 2 log10(Re sqrt(f)) - 0.8 (Prandtl-von Karman, as labelled on Moody 1944).
        // Colebrook's smooth limit 2 log10(Re sqrt(f)/2.51) differs from it by 2 log10(2.51) - 0.8 = 0.0006 in 1/sqrt(f).
        double f = ColebrookWhite.Solve(re, 0).FrictionFactor;
        double lhs = 1 / Math.Sqrt(f), rhs = 2 * Math.Log10(re * Math.Sqrt(f)) - 0.8;
        Assert.Equal(rhs, lhs, 1e-3);
    }

    [Theory]
    [InlineData(5e3, 0.02)]
    [InlineData(2e5, 1e-4)]
    [InlineData(3e7, 0.0)]
    public void Solve_Derivatives_MatchCentralDifferences(double re, double r)
    {
        var result = ColebrookWhite.Solve(re, r);
        double h = re * 1e-5;
        double dRe = (ColebrookWhite.Solve(re + h, r).FrictionFactor - ColebrookWhite.Solve(re - h, r).FrictionFactor) / (2 * h);
        Assert.Equal(dRe, result.DerivativeReynolds, 1e-6 * Math.Abs(dRe));
        if (r > 0)
        {
            double k = r * 1e-5;
            double dR = (ColebrookWhite.Solve(re, r + k).FrictionFactor - ColebrookWhite.Solve(re, r - k).FrictionFactor) / (2 * k);
            Assert.Equal(dR, result.DerivativeRelativeRoughness, 1e-6 * Math.Abs(dR));
        }
    }

    [Fact]
    public void Solve_WithTrace_RecordsNewtonSteps()
    {
        var trace = new SolverTrace();
        var result = ColebrookWhite.Solve(1e5, 1e-4, trace);
        Assert.Equal(result.Iterations, trace.Steps.Count);
        Assert.All(trace.Steps, s => Assert.Equal(StepKind.Newton, s.Kind));
        // Quadratic convergence: each step at most about the square of the one before (relative to x ~ 7.7).
        Assert.True(Math.Abs(trace.Steps[2].Step) < Math.Abs(trace.Steps[1].Step) * Math.Abs(trace.Steps[1].Step) + 1e-15);
    }

    [Theory]
    [InlineData(double.NaN, 0.0)]
    [InlineData(-1.0, 0.0)]
    [InlineData(1e5, -1e-3)]
    [InlineData(1e5, 1.0)]
    [InlineData(double.PositiveInfinity, 0.0)]
    public void Solve_InvalidArguments_Throw(double re, double r) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => ColebrookWhite.Solve(re, r));
}
