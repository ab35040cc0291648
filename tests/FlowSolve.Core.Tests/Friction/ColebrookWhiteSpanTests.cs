using CsCheck;
using FlowSolve.Core.Friction;
using System.Runtime.Intrinsics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Friction;

/// <summary>The span solve of Colebrook-White against the scalar solve (the contract: within 2 units in the last place
/// of f, the same iteration count, for every input) and against independent references.</summary>
public sealed class ColebrookWhiteSpanTests
{
    /// <summary>Units in the last place between two doubles of one sign (0 for two NaNs).</summary>
    private static long UlpDistance(double a, double b)
    {
        if (double.IsNaN(a) && double.IsNaN(b)) return 0;
        if (double.IsNaN(a) || double.IsNaN(b) || Math.Sign(a) != Math.Sign(b)) return long.MaxValue;
        return Math.Abs(BitConverter.DoubleToInt64Bits(a) - BitConverter.DoubleToInt64Bits(b));
    }

    private static bool ScalarAccepts(double re, double r) =>
        re > 0 && double.IsFinite(re) && r >= 0 && r < 1;

    /// <summary>Reynolds numbers over the whole double range: the turbulent range (most draws), log-uniform from 1e-300 to
    /// 1e308, the ends of the known bracket's domain (2000 and 1e25) a few units in the last place either side,
    /// subnormals, and values the scalar refuses (0, negative, NaN, infinities).</summary>
    private static readonly Gen<double> Reynolds = Gen.Frequency(
        (6, Gen.Double[3.3, 15].Select(e => Math.Pow(10, e))),
        (3, Gen.Double[-300, 308].Select(e => Math.Pow(10, e))),
        (1, Gen.Int[-4, 4].SelectMany(k => Gen.OneOf<double>(2000.0, 1e25).Select(v => Step(v, k)))),
        (1, Gen.Long[1, (1L << 52) - 1].Select(BitConverter.Int64BitsToDouble)),
        (1, Gen.OneOf<double>(0.0, -0.0, -1e5, double.NaN, double.PositiveInfinity, double.NegativeInfinity,
            double.MaxValue, double.Epsilon, 1e308)));

    /// <summary>Relative roughness from 0 to just below 1, subnormals included, and values the scalar refuses.</summary>
    private static readonly Gen<double> Roughness = Gen.Frequency(
        (2, Gen.Const(0.0)),
        (6, Gen.Double[-12, 0].Select(e => Math.Min(Math.Pow(10, e), Math.BitDecrement(1.0)))),
        (1, Gen.Double[-320, -12].Select(e => Math.Pow(10, e))),
        (1, Gen.Long[1, (1L << 52) - 1].Select(BitConverter.Int64BitsToDouble)),
        (1, Gen.OneOf<double>(Math.BitDecrement(1.0), 1.0, -1e-6, double.NaN, double.PositiveInfinity, 0.05)));

    private static double Step(double v, int k)
    {
        for (; k > 0; k--) v = Math.BitIncrement(v);
        for (; k < 0; k++) v = Math.BitDecrement(v);
        return v;
    }

    /// <summary>The lane counts this machine can run: 8 (AVX-512), 4 (AVX2), and 1 (element by element).</summary>
    public static TheoryData<int> Widths()
    {
        var data = new TheoryData<int> { 1 };
        if (Vector256.IsHardwareAccelerated) data.Add(4);
        if (Vector512.IsHardwareAccelerated) data.Add(8);
        return data;
    }

    [Theory]
    [MemberData(nameof(Widths))]
    public void Solve_RandomSpansOverWholeDomain_WithinTwoUlpOfScalarWithItsIterations(int lanes)
    {
        // Property: for every element the span solve gives the scalar solve's factor to within 2 ulp (the contract;
        // the kernel repeats the scalar's operations, so it is in fact equal) and its iteration count; an element the
        // scalar refuses with an exception gets NaN and is counted, never thrown; the summary's counts, first indices
        // and worst iteration count are those of the scalar solves. Spans of 0 to 70 elements cover whole packs of lanes
        // and tails.
        var gen = Gen.Select(Reynolds, Roughness).Array[0, 70];
        gen.Sample(pairs =>
        {
            var re = pairs.Select(p => p.Item1).ToArray();
            var r = pairs.Select(p => p.Item2).ToArray();
            var f = new double[pairs.Length];
            var iterations = new int[pairs.Length];
            var summary = ColebrookWhite.Solve(re, r, f, iterations, lanes);

            int worst = 0, notConverged = 0, firstNotConverged = -1, invalid = 0, firstInvalid = -1;
            for (int i = 0; i < pairs.Length; i++)
            {
                if (!ScalarAccepts(re[i], r[i]))
                {
                    Assert.Throws<ArgumentOutOfRangeException>(() => ColebrookWhite.Solve(re[i], r[i]));
                    Assert.True(double.IsNaN(f[i]), $"element {i}: Re {re[i]:R}, e/D {r[i]:R} gave {f[i]:R}, not NaN");
                    Assert.Equal(0, iterations[i]);
                    if (invalid++ == 0) firstInvalid = i;
                    continue;
                }
                var scalar = ColebrookWhite.Solve(re[i], r[i]);
                long ulps = UlpDistance(f[i], scalar.FrictionFactor);
                Assert.True(ulps <= 2, $"element {i}: Re {re[i]:R}, e/D {r[i]:R}: {f[i]:R} against {scalar.FrictionFactor:R} ({ulps} ulp)");
                Assert.Equal(scalar.Iterations, iterations[i]);
                worst = Math.Max(worst, scalar.Iterations);
                if (!scalar.Converged && notConverged++ == 0) firstNotConverged = i;
            }
            Assert.Equal(new ColebrookSpanResult(pairs.Length, worst, notConverged, firstNotConverged, invalid, firstInvalid), summary);
        }, iter: 20_000);
    }

    [Theory]
    [MemberData(nameof(Widths))]
    public void Solve_TurbulentGrid_EqualsScalarBitForBit(int lanes)
    {
        // The design property behind the 2-ulp contract: the same operations in the same order on the same values, so
        // on a dense log grid over Re 4e3 to 1e15 and e/D 0 and 1e-8 to 0.05 the factors are identical.
        var re = new List<double>();
        var r = new List<double>();
        for (int i = 0; i <= 220; i++)
            for (int j = 0; j <= 60; j++)
            {
                re.Add(4e3 * Math.Pow(1e15 / 4e3, i / 220.0));
                r.Add(j == 0 ? 0.0 : 1e-8 * Math.Pow(0.05 / 1e-8, (j - 1) / 59.0));
            }
        var f = new double[re.Count];
        var summary = ColebrookWhite.Solve(re.ToArray(), r.ToArray(), f, default, lanes);
        Assert.True(summary.AllConverged);
        for (int k = 0; k < f.Length; k++)
            Assert.Equal(BitConverter.DoubleToInt64Bits(ColebrookWhite.Solve(re[k], r[k]).FrictionFactor), BitConverter.DoubleToInt64Bits(f[k]));
        Assert.InRange(summary.WorstIterations, 1, 6);
    }

    [Fact]
    public void Solve_SpreadOf4096Pipes_AgreesWithMathNetBrent_To1e13()
    {
        // An independent solver on the same equation (MathNet.Numerics' Brent, in f): Re 4e3 to 1e8 log-uniform and e/D
        // 1e-6 to 0.05 (an eighth smooth), the benchmark's spread.
        var random = new Random(4096);
        var re = new double[4096];
        var r = new double[4096];
        for (int i = 0; i < re.Length; i++)
        {
            re[i] = 4e3 * Math.Pow(1e8 / 4e3, random.NextDouble());
            r[i] = i % 8 == 0 ? 0.0 : 1e-6 * Math.Pow(0.05 / 1e-6, random.NextDouble());
        }
        var f = new double[re.Length];
        var iterations = new int[re.Length];
        var summary = ColebrookWhite.Solve(re, r, f, iterations);
        Assert.True(summary.AllConverged);
        Assert.InRange(summary.WorstIterations, 1, 6);
        for (int i = 0; i < re.Length; i += 7)
        {
            double reynolds = re[i], roughness = r[i];
            double brent = Brent.FindRoot(x => 1 / Math.Sqrt(x) + 2 * Math.Log10(roughness / 3.7 + 2.51 / (reynolds * Math.Sqrt(x))),
                1e-3, 0.2, 1e-17, 500);
            Assert.Equal(brent, f[i], 1e-13 * brent);
            Assert.Equal(summary.WorstIterations, Math.Max(summary.WorstIterations, iterations[i]));
        }
    }

    [Theory]
    [MemberData(nameof(ColebrookWhiteTests.WhiteTable), MemberType = typeof(ColebrookWhiteTests))]
    public void Solve_WhiteTabulationAtRoughness0005_WithinThreeFigures(double re, double published)
    {
        // F. M. White's tabulation at e/D = 0.005 (see ColebrookWhiteTests), each value in every lane of a span of 9
        // (two whole vectors and a tail).
        var reynolds = Enumerable.Repeat(re, 9).ToArray();
        var f = new double[9];
        ColebrookWhite.Solve(reynolds, Enumerable.Repeat(0.005, 9).ToArray(), f);
        Assert.All(f, v => Assert.Equal(published, v, 0.005 * published));
    }

    [Fact]
    public void Solve_EmptySpans_ReportNothing()
    {
        var summary = ColebrookWhite.Solve([], [], []);
        Assert.Equal(new ColebrookSpanResult(0, 0, 0, -1, 0, -1), summary);
        Assert.True(summary.AllConverged);
    }

    [Fact]
    public void Solve_LengthsDiffer_ThrowsArgumentException()
    {
        Assert.Throws<ArgumentException>(() => ColebrookWhite.Solve([1e5, 1e6], [0.0], new double[2]));
        Assert.Throws<ArgumentException>(() => ColebrookWhite.Solve([1e5], [0.0], new double[2]));
        Assert.Throws<ArgumentException>(() => ColebrookWhite.Solve([1e5], [0.0], new double[1], new int[3]));
    }

    [Fact]
    public void Solve_NaNInsideAVector_OnlyThatElementIsNaNAndReported()
    {
        // One NaN Reynolds number among finite ones, in the second lane of the first vector: the others keep the
        // scalar's answers and the summary names the element.
        double[] re = [1e5, double.NaN, 3e6, 4e4, 1e7];
        double[] r = [1e-4, 1e-4, 0.0, 0.01, 0.05];
        var f = new double[5];
        var summary = ColebrookWhite.Solve(re, r, f);
        Assert.Equal(1, summary.Invalid);
        Assert.Equal(1, summary.FirstInvalid);
        Assert.False(summary.AllConverged);
        Assert.True(double.IsNaN(f[1]));
        foreach (int i in new[] { 0, 2, 3, 4 })
            Assert.Equal(ColebrookWhite.Solve(re[i], r[i]).FrictionFactor, f[i]);
    }

    [Fact]
    public void LogNearest_WhereSure_EqualsMathLogBitForBit()
    {
        Assert.SkipUnless(Vector256.IsHardwareAccelerated, "no 256-bit vectors on this machine");
        // The vector logarithm behind the span solve, against the platform's Math.Log over 4 million arguments of the
        // solve's range (log-uniform over [1e-25, 0.5] and uniform over (0, 0.5]): in every lane it calls sure, the two
        // are equal; it declines about 8 percent (the margin of 0.04 ulp either side of a midpoint), never most.
        var random = new Random(20261204);
        long unsure = 0, total = 0;
        var a = new double[4];
        for (int n = 0; n < 1_000_000; n++)
        {
            for (int k = 0; k < 4; k++)
                a[k] = k % 2 == 0 ? Math.Pow(10, -25 + 24.7 * random.NextDouble()) : 0.5 * (1 - random.NextDouble());
            var log = ColebrookWhite.LogNearest256(Vector256.Create<double>(a), out var flags);
            for (int k = 0; k < 4; k++)
            {
                total++;
                if (flags.GetElement(k) != 0) { unsure++; continue; }
                Assert.True(BitConverter.DoubleToInt64Bits(Math.Log(a[k])) == BitConverter.DoubleToInt64Bits(log.GetElement(k)),
                    $"ln {a[k]:R}: {log.GetElement(k):R} against Math.Log {Math.Log(a[k]):R}");
            }
        }
        Assert.InRange(unsure / (double)total, 0.0, 0.12);
    }

    [Fact]
    public void LogNearest512_WhereSure_EqualsMathLogBitForBit()
    {
        // The eight-lane copy of the logarithm, as above over 4 million arguments.
        Assert.SkipUnless(Vector512.IsHardwareAccelerated, "no 512-bit vectors on this machine");
        var random = new Random(512);
        long unsure = 0, total = 0;
        var a = new double[8];
        for (int n = 0; n < 500_000; n++)
        {
            for (int k = 0; k < 8; k++)
                a[k] = k % 2 == 0 ? Math.Pow(10, -25 + 24.7 * random.NextDouble()) : 0.5 * (1 - random.NextDouble());
            var log = ColebrookWhite.LogNearest512(Vector512.Create<double>(a), out var flags);
            for (int k = 0; k < 8; k++)
            {
                total++;
                if (flags.GetElement(k) != 0) { unsure++; continue; }
                Assert.True(BitConverter.DoubleToInt64Bits(Math.Log(a[k])) == BitConverter.DoubleToInt64Bits(log.GetElement(k)),
                    $"ln {a[k]:R}: {log.GetElement(k):R} against Math.Log {Math.Log(a[k]):R}");
            }
        }
        Assert.InRange(unsure / (double)total, 0.0, 0.12);
    }
}
