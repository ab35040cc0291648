using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

public class CriticalFlowTests
{
    private const double Foot = 0.3048; // exact

    [Theory]
    [InlineData(1.0)]
    [InlineData(8.0)]
    public void CriticalDepth_PonceUnitDischarge50_Is634Metres(double width)
    {
        // Unit discharge 50 m2/s gives a critical depth of 6.34 m. Source: V. M. Ponce, San Diego State University,
        // CIVE 530 examination solutions (found).
        var result = CriticalFlow.CriticalDepth(new RectangularSection(width), 50.0 * width);
        Assert.Equal(6.34, result.CriticalDepth, 0.005);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 0, 3);
    }

    [Fact]
    public void CriticalDepth_RectangleInFeet_MatchesPublishedDepthAndSlope()
    {
        // Rectangle b = 10 ft, Q = 600 ft3/s, n = 0.025: y_c = 4.82 ft, S_c = 0.0132. Source: a published open-channel
        // solution in the style of White, Fluid Mechanics, chapter 10 (found). Converted to SI at 0.3048 m/ft, n unchanged.
        var result = CriticalFlow.CriticalDepth(new RectangularSection(10 * Foot), 600 * Foot * Foot * Foot, 0.025);
        Assert.Equal(4.82, result.CriticalDepth / Foot, 0.005);
        // The exact conversion is Manning with k = (1/0.3048)^(1/3) = 1.4859 in feet and gives S_c = 0.01326; the published
        // 0.0132 matches k = 1.49 (our inference: S_c scales as 1/k^2), so rescale to that k before comparing to its 3 figures.
        double k = Math.Pow(1 / Foot, 1.0 / 3.0);
        Assert.Equal(0.0132, result.CriticalSlope * (k / 1.49) * (k / 1.49), 0.00005);
        Assert.Equal(0.0132, result.CriticalSlope, 0.0132 * 0.006);
    }

    [Theory]
    [InlineData(0.5, 0.01)]
    [InlineData(3.0, 12.0)]
    [InlineData(40.0, 5000.0)]
    public void CriticalDepth_Rectangle_IsClosedForm(double width, double flow)
    {
        // Closed form: y_c = (q^2/g)^(1/3), q = Q/b.
        double q = flow / width;
        var result = CriticalFlow.CriticalDepth(new RectangularSection(width), flow);
        Assert.Equal(Math.Cbrt(q * q / ChannelReference.G), result.CriticalDepth, 1e-13 * result.CriticalDepth);
        Assert.InRange(result.Iterations, 0, 2);
        Assert.True(result.Converged);
        Assert.True(double.IsNaN(result.CriticalSlope));
    }

    [Fact]
    public void CriticalDepth_Triangle_IsClosedForm()
    {
        // Closed form for a V with side slopes z1, z2: A^3/T = m^2 y^5 / 8, m = z1 + z2, so y_c = (8 Q^2 / (g m^2))^(1/5).
        const double flow = 0.4, m = 1.0 + 3.0;
        var result = CriticalFlow.CriticalDepth(new TriangularSection(1.0, 3.0), flow);
        Assert.Equal(Math.Pow(8 * flow * flow / (ChannelReference.G * m * m), 0.2), result.CriticalDepth, 1e-13);
        Assert.InRange(result.Iterations, 0, 2);
    }

    public static TheoryData<string, double> Cases => new()
    {
        { "trapezoid", 0.01 },
        { "trapezoid", 25.0 },
        { "trapezoid", 4000.0 },
        { "circle", 1e-4 },
        { "circle", 0.4 },
        { "circle", 3.0 },
        { "circle", 10.0 },
        { "surveyed", 0.5 },
        { "surveyed", 60.0 },
    };

    private static readonly double[] IrregularX = [0, 3, 5, 6, 9, 12, 20];
    private static readonly double[] IrregularZ = [5, 2.5, 0.4, 0, 0.8, 2.6, 4.2];

    [Theory]
    [MemberData(nameof(Cases))]
    public void CriticalDepth_EveryShape_MatchesBrent(string shape, double flow)
    {
        (ChannelSection section, Func<double, ChannelReference.Shape> reference, double top) = shape switch
        {
            "trapezoid" => ((ChannelSection)new TrapezoidalSection(4.0, 1.5, 2.5), (Func<double, ChannelReference.Shape>)(y => ChannelReference.Trapezoid(4.0, 1.5, 2.5, y)), 1e3),
            "circle" => (new CircularSection(1.2), y => ChannelReference.Circle(1.2, y), 1.2 * (1 - 1e-12)),
            _ => (new SurveyedSection(IrregularX, IrregularZ), y => ChannelReference.Polygon(IrregularX.Zip(IrregularZ, (x, z) => (x, z)).ToList(), y), 4.2),
        };
        // Brent on Q^2 T - g A^3 = 0 with test-side geometry.
        double brent = ChannelReference.Brent(y => { var s = reference(y); return Math.Log(ChannelReference.G * s.A * s.A * s.A / (flow * flow * s.T)); }, 1e-5, top);
        var result = CriticalFlow.CriticalDepth(section, flow);
        Assert.Equal(brent, result.CriticalDepth, 1e-10 * brent + 1e-12);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 0, 20);
        Assert.Equal(DepthSolution.Unique, result.Solution);
    }

    [Fact]
    public void CriticalDepth_FroudeAtResult_IsOne()
    {
        // Stated property: at critical depth V / sqrt(g A/T) = 1.
        foreach (var section in new ChannelSection[] { new CircularSection(0.8), new TrapezoidalSection(2, 0.5, 3), new SurveyedSection(IrregularX, IrregularZ) })
        {
            var r = CriticalFlow.CriticalDepth(section, 0.7);
            Assert.Equal(1.0, r.Velocity / Math.Sqrt(ChannelReference.G * r.HydraulicDepth), 1e-12);
            Assert.Equal(r.CriticalDepth + r.HydraulicDepth / 2, r.SpecificEnergy, 1e-12);
        }
    }

    [Fact]
    public void CriticalSlope_RoundTrip_NormalDepthAtCriticalSlopeIsCritical()
    {
        // Stated property: the normal depth at the critical slope is the critical depth, with Froude number 1.
        var section = new TrapezoidalSection(3.0, 2.0);
        var critical = CriticalFlow.CriticalDepth(section, 14.0, 0.02);
        var normal = ManningSolver.NormalDepth(section, 14.0, critical.CriticalSlope, 0.02);
        Assert.Equal(critical.CriticalDepth, normal.NormalDepth, 1e-11);
        Assert.Equal(1.0, normal.FroudeNumber, 1e-10);
        Assert.Equal(FroudeRegime.Critical, normal.Regime);
        Assert.Contains(normal.Warnings, w => w.Code == ChannelWarningCode.NearCritical);
    }

    [Fact]
    public void CriticalDepth_SurveyedTrapezoid_MatchesTrapezoid()
    {
        var trapezoid = CriticalFlow.CriticalDepth(new TrapezoidalSection(6.0, 1.5, 2.0), 45.0, 0.02);
        var surveyed = CriticalFlow.CriticalDepth(SurveyedSectionTests.DrawnTrapezoid(), 45.0, 0.02);
        Assert.Equal(trapezoid.CriticalDepth, surveyed.CriticalDepth, 1e-11);
        Assert.Equal(trapezoid.CriticalSlope, surveyed.CriticalSlope, 1e-12);
    }

    [Fact]
    public void CriticalDepth_CompoundSection_FindsEveryCriticalDepth()
    {
        // Compound section (fictional): main channel 10 m wide, 2 m deep, 1 : 1 sides; overbanks 1 in 500, 100 m wide.
        double[] x = [0, 10, 110, 112, 122, 124, 224, 234];
        double[] z = [4, 2.2, 2.0, 0.0, 0.0, 2.0, 2.2, 4];
        var points = x.Zip(z, (a, b) => (a, b)).ToList();
        Func<double, double> cube = y => { var s = ChannelReference.Polygon(points, y); return s.A * s.A * s.A / s.T; };
        // A^3/T falls as the overbanks flood; take the flow halfway (in A^3/T) between bank-full and the dip above it.
        double bankFull = cube(2.0);
        double dip = Enumerable.Range(1, 400).Select(i => cube(2.0 + 0.2 * i / 400)).Min();
        Assert.True(dip < bankFull, "the fixture must have a dip in A^3/T above bank-full");
        double flow = Math.Sqrt(ChannelReference.G * 0.5 * (bankFull + dip));

        // Independent: dense sign-change scan of Q^2 T - g A^3 on polygon geometry, refined by MathNet's Brent.
        var roots = ChannelReference.AllRoots(y => Math.Log(ChannelReference.G * cube(y) / (flow * flow)), 1e-6, 3.99, 40000);
        var result = CriticalFlow.CriticalDepth(new SurveyedSection(x, z), flow);
        Assert.Equal(3, roots.Count);
        Assert.Equal(DepthSolution.Multiple, result.Solution);
        Assert.Equal(roots[0], result.CriticalDepth, 1e-9);
        Assert.Equal(roots.Skip(1).ToArray(), result.AlternateCriticalDepths.ToArray(), (a, b) => Math.Abs(a - b) < 1e-9);
        Assert.Equal("multiple-critical-depths", Assert.Single(result.Warnings).CodeText);
        Assert.True(result.Converged);
    }

    [Fact]
    public void CriticalDepth_SurveyedTooSmall_HasNoDepthAndWarns()
    {
        var result = CriticalFlow.CriticalDepth(SurveyedSectionTests.DrawnTrapezoid(), 5000.0);
        Assert.Equal(DepthSolution.None, result.Solution);
        Assert.False(result.Converged);
        Assert.True(double.IsNaN(result.CriticalDepth));
        Assert.Equal("no-critical-depth-in-section", Assert.Single(result.Warnings).CodeText);
    }

    [Fact]
    public void CriticalDepth_BadArguments_ThrowNamingTheParameter()
    {
        var section = new CircularSection(1.0);
        Assert.Equal("flow", Assert.ThrowsAny<ArgumentException>(() => CriticalFlow.CriticalDepth(section, -1.0)).ParamName);
        Assert.Equal("flow", Assert.ThrowsAny<ArgumentException>(() => CriticalFlow.CriticalDepth(section, double.PositiveInfinity)).ParamName);
        Assert.Equal("manningN", Assert.ThrowsAny<ArgumentException>(() => CriticalFlow.CriticalDepth(section, 1.0, -0.01)).ParamName);
        Assert.Equal("section", Assert.ThrowsAny<ArgumentException>(() => CriticalFlow.CriticalDepth(null!, 1.0)).ParamName);
    }
}
