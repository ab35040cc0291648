using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>Normal- and critical-depth sensitivities against central differences of the solvers (a stated property).</summary>
public sealed class ChannelSensitivityTests
{
    // shape, b, z1, z2, D, Q, S, n
    public static TheoryData<string, double, double, double, double, double, double, double> Cases => new()
    {
        { "rectangular", 4, 0, 0, 0, 12, 0.001, 0.015 },
        { "trapezoidal", 3, 2, 1.5, 0, 10, 0.001, 0.025 },
        { "triangular", 0, 1, 2, 0, 0.5, 0.01, 0.02 },
        { "circular", 0, 0, 0, 1.2, 0.4, 0.002, 0.013 },   // part full, y/D about 0.4
        { "circular", 0, 0, 0, 1.2, 1.1, 0.002, 0.013 },   // part full, y/D about 0.75
    };

    private static ChannelSection Section(string shape, double b, double z1, double z2, double d) => shape switch
    {
        "rectangular" => new RectangularSection(b),
        "trapezoidal" => new TrapezoidalSection(b, z1, z2),
        "triangular" => new TriangularSection(z1, z2),
        _ => new CircularSection(d),
    };

    private static IEnumerable<(string Name, ChannelOutputDerivatives D, int Index)> Entries(ChannelSensitivities s) =>
    [
        ("flow", s.Flow, 5), ("slope", s.Slope, 6), ("manningN", s.ManningN, 7), ("bottomWidth", s.BottomWidth, 1),
        ("leftSideSlope", s.LeftSideSlope, 2), ("rightSideSlope", s.RightSideSlope, 3), ("diameter", s.Diameter, 4),
    ];

    [Theory]
    [MemberData(nameof(Cases))]
    public void NormalDepth_MatchesCentralDifferences(string shape, double b, double z1, double z2, double d, double q, double slope, double n)
    {
        double[] x = [0, b, z1, z2, d, q, slope, n];
        NormalDepthResult Run(double[] v) => ManningSolver.NormalDepth(Section(shape, v[1], v[2], v[3], v[4]), v[5], v[6], v[7]);
        var r = Run(x);
        Assert.True(r.Converged);
        var s = ChannelSensitivity.NormalDepth(Section(shape, b, z1, z2, d), r.NormalDepth, q, slope, n);
        int checks = 0;
        foreach (var (name, der, i) in Entries(s))
        {
            if (double.IsNaN(der.Depth)) { Assert.Equal(0.0, x[i]); continue; } // not a dimension of this shape
            double F(int index, double v, Func<NormalDepthResult, double> read) { var y = (double[])x.Clone(); y[index] = v; return read(Run(y)); }
            CentralDifference.Check("dy/d" + name, der.Depth, v => F(i, v, r2 => r2.NormalDepth), x[i]);
            CentralDifference.Check("dV/d" + name, der.Velocity, v => F(i, v, r2 => r2.Velocity), x[i]);
            CentralDifference.Check("dFr/d" + name, der.FroudeNumber, v => F(i, v, r2 => r2.FroudeNumber), x[i]);
            checks++;
        }
        Assert.True(checks >= 4);
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void CriticalDepth_MatchesCentralDifferences(string shape, double b, double z1, double z2, double d, double q, double slope, double n)
    {
        _ = slope; _ = n;
        double[] x = [0, b, z1, z2, d, q, 0, 0];
        CriticalDepthResult Run(double[] v) => CriticalFlow.CriticalDepth(Section(shape, v[1], v[2], v[3], v[4]), v[5]);
        var r = Run(x);
        Assert.True(r.Converged);
        var s = ChannelSensitivity.CriticalDepth(Section(shape, b, z1, z2, d), r.CriticalDepth, q);
        Assert.True(double.IsNaN(s.Slope.Depth) && double.IsNaN(s.ManningN.Depth)); // the critical depth depends on neither
        foreach (var (name, der, i) in Entries(s))
        {
            if (double.IsNaN(der.Depth)) continue;
            double F(int index, double v, Func<CriticalDepthResult, double> read) { var y = (double[])x.Clone(); y[index] = v; return read(Run(y)); }
            CentralDifference.Check("dyc/d" + name, der.Depth, v => F(i, v, r2 => r2.CriticalDepth), x[i]);
            CentralDifference.Check("dVc/d" + name, der.Velocity, v => F(i, v, r2 => r2.Velocity), x[i]);
        }
    }

    [Theory]
    [InlineData(double.NaN)]   // one n for the whole surveyed section
    [InlineData(0.035)]        // composite: the overbank segments carry their own n (Horton-Einstein), the rest the default
    public void NormalDepth_Surveyed_FlowSlopeAndDefaultNMatchCentralDifferences(double overbankN)
    {
        double[] x = [0, 4, 7, 11], z = [2, 0, 0, 2];
        double[]? own = double.IsNaN(overbankN) ? null : [overbankN, double.NaN, overbankN];
        var section = new SurveyedSection(x, z, own);
        double q = 3, slope = 0.001, n = 0.02;
        NormalDepthResult Run(double qq, double ss, double nn) => ManningSolver.NormalDepth(section, qq, ss, nn);
        var r = Run(q, slope, n);
        Assert.True(r.Converged);
        var s = ChannelSensitivity.NormalDepth(section, r.NormalDepth, q, slope, n);
        CentralDifference.Check("dy/dQ", s.Flow.Depth, v => Run(v, slope, n).NormalDepth, q);
        CentralDifference.Check("dy/dS", s.Slope.Depth, v => Run(q, v, n).NormalDepth, slope);
        CentralDifference.Check("dy/dn", s.ManningN.Depth, v => Run(q, slope, v).NormalDepth, n);
        CentralDifference.Check("dV/dn", s.ManningN.Velocity, v => Run(q, slope, v).Velocity, n);
        CentralDifference.Check("dFr/dQ", s.Flow.FroudeNumber, v => Run(v, slope, n).FroudeNumber, q);
        Assert.True(double.IsNaN(s.BottomWidth.Depth) && double.IsNaN(s.Diameter.Depth)); // points are not differentiated
    }

    [Fact]
    public void NormalDepth_WideRectangle_FlowElasticityApproachesThreeFifths()
    {
        // A very wide rectangle has R -> y, so Q ~ y^(5/3) and dy/dQ Q/y -> 3/5 (Manning; a closed form).
        var section = new RectangularSection(1e4);
        var r = ManningSolver.NormalDepth(section, 100, 0.001, 0.03);
        var s = ChannelSensitivity.NormalDepth(section, r.NormalDepth, 100, 0.001, 0.03);
        Assert.Equal(0.6, s.Flow.Depth * 100 / r.NormalDepth, 3);
    }
}
