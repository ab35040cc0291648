using FlowSolve.Core.Channels;
using FlowSolve.Core.Numerics;
using MathNet.Numerics;

namespace FlowSolve.Core.Tests.Channels;

public class ManningSolverTests
{
    private const double Foot = 0.3048; // exact, by definition of the international foot

    // Rectangular channels, n = 0.015: (width m, slope, depth m, discharge m3/s).
    // Source: V. M. Ponce, San Diego State University, CIVE 530 examination solutions (found); Q to four figures.
    public static TheoryData<double, double, double, double> PonceRectangles => new()
    {
        { 5.0, 0.0025, 0.8, 9.548 },
        { 6.0, 0.0025, 1.6, 32.91 },
        { 5.0, 0.003, 1.5, 26.23 },
    };

    [Theory]
    [MemberData(nameof(PonceRectangles))]
    public void NormalDepth_PonceRectangles_MatchPublishedDepth(double width, double slope, double depth, double flow)
    {
        var result = ManningSolver.NormalDepth(new RectangularSection(width), flow, slope, 0.015);
        // Q is given to four figures (up to 2e-4 relative), which moves the depth by less than 3e-4 m here.
        Assert.Equal(depth, result.NormalDepth, 5e-4);
        Assert.True(result.Converged);
        Assert.Equal(DepthSolution.Unique, result.Solution);
        Assert.InRange(result.Iterations, 1, 8);
        Assert.InRange(Math.Abs(result.Residual), 0.0, 1e-12);
    }

    [Theory]
    [MemberData(nameof(PonceRectangles))]
    public void Discharge_PonceRectangles_MatchPublishedFlow(double width, double slope, double depth, double flow)
    {
        double q = ManningSolver.Discharge(new RectangularSection(width), depth, slope, 0.015);
        // Four significant figures; the second case's published 32.91 lies 0.03 % below Manning's formula evaluated
        // exactly (32.921), so the tolerance is 0.05 %.
        Assert.Equal(flow, q, flow * 5e-4);
    }

    [Fact]
    public void NormalDepth_ChowTrapezoidInFeet_Is336Feet()
    {
        // Trapezoid b = 20 ft, side slope 2 : 1, S = 0.0016, n = 0.025, Q = 400 ft3/s: y_n = 3.36 ft.
        // From memory: Chow 1959, Open-Channel Hydraulics, a normal-depth example. Converted to SI at 0.3048 m/ft, n unchanged,
        // which is Manning with k = (1/0.3048)^(1/3) = 1.4859 in feet.
        var result = ManningSolver.NormalDepth(new TrapezoidalSection(20 * Foot, 2.0), 400 * Foot * Foot * Foot, 0.0016, 0.025);
        Assert.Equal(3.36, result.NormalDepth / Foot, 0.005);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 1, 8);
        Assert.Equal(FroudeRegime.Subcritical, result.Regime);
    }

    // (shape, flow m3/s, slope, n): every open shape against MathNet's Brent on Q = (1/n) A R^(2/3) sqrt(S) with
    // test-side closed-form geometry.
    public static TheoryData<string, double, double, double> OpenCases => new()
    {
        { "rectangle", 12.0, 0.001, 0.014 },
        { "rectangle", 0.002, 0.02, 0.011 },
        { "rectangle", 300.0, 1e-4, 0.035 },
        { "trapezoid", 25.0, 0.0004, 0.022 },
        { "trapezoid", 0.05, 0.05, 0.03 },
        { "trapezoid-vertical-left", 7.0, 0.002, 0.016 },
        { "triangle", 0.3, 0.01, 0.016 },
        { "triangle-gutter", 0.08, 0.02, 0.016 },
    };

    private static (ChannelSection Section, Func<double, ChannelReference.Shape> Reference) Open(string shape) => shape switch
    {
        "rectangle" => (new RectangularSection(3.0), y => ChannelReference.Trapezoid(3.0, 0, 0, y)),
        "trapezoid" => (new TrapezoidalSection(4.0, 1.5, 2.5), y => ChannelReference.Trapezoid(4.0, 1.5, 2.5, y)),
        "trapezoid-vertical-left" => (new TrapezoidalSection(2.0, 0.0, 1.0), y => ChannelReference.Trapezoid(2.0, 0.0, 1.0, y)),
        "triangle" => (new TriangularSection(1.0, 3.0), y => ChannelReference.Trapezoid(0.0, 1.0, 3.0, y)),
        "triangle-gutter" => (new TriangularSection(0.0, 24.0), y => ChannelReference.Trapezoid(0.0, 0.0, 24.0, y)),
        _ => throw new ArgumentOutOfRangeException(nameof(shape)),
    };

    [Theory]
    [MemberData(nameof(OpenCases))]
    public void NormalDepth_OpenShapes_MatchBrent(string shape, double flow, double slope, double n)
    {
        var (section, reference) = Open(shape);
        double brent = ChannelReference.Brent(y => ChannelReference.Manning(reference(y), slope, n) - flow, 1e-9, 1e3);
        var result = ManningSolver.NormalDepth(section, flow, slope, n);
        Assert.Equal(brent, result.NormalDepth, 1e-10 * brent + 1e-13);
        Assert.True(result.Converged);
        // 0 iterations where the start is exact (the V section's closed form).
        Assert.InRange(result.Iterations, 0, 10);
        Assert.Empty(result.AlternateNormalDepths);
        Assert.Null(result.AlternateNormalDepth);
        Assert.Null(result.Capacity);
    }

    [Fact]
    public void NormalDepth_Result_IsConsistentWithItsGeometry()
    {
        // Stated properties: V = Q/A, Fr = V/sqrt(g A/T), E = y + V^2/(2g), R = A/P.
        var result = ManningSolver.NormalDepth(new TrapezoidalSection(4.0, 1.5, 2.5), 25.0, 0.0004, 0.022);
        Assert.Equal(25.0 / result.Area, result.Velocity, 1e-14);
        Assert.Equal(result.Velocity / Math.Sqrt(ChannelReference.G * result.Area / result.TopWidth), result.FroudeNumber, 1e-14);
        Assert.Equal(result.NormalDepth + result.Velocity * result.Velocity / (2 * ChannelReference.G), result.SpecificEnergy, 1e-14);
        Assert.Equal(result.Area / result.WettedPerimeter, result.HydraulicRadius, 1e-14);
        Assert.Equal(0.022, result.EffectiveManningN);
        Assert.True(result.Validity.InTypicalRange);
        Assert.Equal(result.NormalDepth > result.CriticalDepth, result.Regime == FroudeRegime.Subcritical);
    }

    [Fact]
    public void NormalDepth_SteepSlope_IsSupercriticalBelowCriticalDepth()
    {
        var result = ManningSolver.NormalDepth(new RectangularSection(3.0), 12.0, 0.05, 0.014);
        Assert.Equal(FroudeRegime.Supercritical, result.Regime);
        Assert.True(result.NormalDepth < result.CriticalDepth);
        Assert.True(result.FroudeNumber > 1.0);
    }

    private static double FullPipeFlow(double d, double slope, double n) =>
        // Closed form: A = pi D^2/4, R = D/4.
        Math.PI * d * d / 4 * Math.Pow(d / 4, 2.0 / 3.0) * Math.Sqrt(slope) / n;

    [Fact]
    public void NormalDepth_CircleAtHalfFullFlow_IsHalfTheDiameter()
    {
        // Closed form: half full, A and P are both half the full values, so R is the same and Q = Q_full / 2.
        const double d = 0.6, slope = 0.005, n = 0.013;
        var result = ManningSolver.NormalDepth(new CircularSection(d), FullPipeFlow(d, slope, n) / 2, slope, n);
        Assert.Equal(d / 2, result.NormalDepth, 1e-12);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 0, 10);
        Assert.Equal(DepthSolution.Unique, result.Solution);
    }

    [Fact]
    public void Capacity_Circle_MatchesFullPipeClosedFormAndPeakRatio()
    {
        const double d = 1.05, slope = 0.002, n = 0.012;
        var capacity = ManningSolver.Capacity(new CircularSection(d), slope, n)!.Value;
        Assert.Equal(FullPipeFlow(d, slope, n), capacity.FullFlow, 1e-12 * capacity.FullFlow);
        Assert.Equal(d, capacity.FullDepth);
        // Common practice (textbook figures): the part-full peak is about 1.076 times the full-pipe flow, at y/D about 0.938.
        Assert.Equal(1.076, capacity.MaximumFlow / capacity.FullFlow, 0.001);
        Assert.Equal(0.938, capacity.DepthAtMaximumFlow / d, 0.001);
    }

    [Fact]
    public void NormalDepth_CircleAtFullPipeFlow_IsAbout082D()
    {
        // Common practice (textbook figures): the part-full discharge equals the full-pipe value again at y/D about 0.82.
        const double d = 0.9, slope = 0.003, n = 0.013;
        var result = ManningSolver.NormalDepth(new CircularSection(d), FullPipeFlow(d, slope, n), slope, n);
        Assert.Equal(0.82, result.NormalDepth / d, 0.005);
        Assert.Equal(DepthSolution.Unique, result.Solution);
        Assert.True(result.Converged);
    }

    [Theory]
    [InlineData(1e-4)]
    [InlineData(0.05)]
    [InlineData(0.7)]
    [InlineData(0.999)]
    public void NormalDepth_CircleBelowFullPipeFlow_MatchesBrent(double fraction)
    {
        const double d = 1.2, slope = 0.001, n = 0.013;
        double flow = fraction * FullPipeFlow(d, slope, n);
        // The chord formulas lose the area to cancellation below about 1e-5 D, so Brent starts there.
        double brent = ChannelReference.Brent(y => ChannelReference.Manning(ChannelReference.Circle(d, y), slope, n) - flow, 1e-5 * d, 0.9 * d);
        var result = ManningSolver.NormalDepth(new CircularSection(d), flow, slope, n);
        Assert.Equal(brent, result.NormalDepth, 1e-10);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 1, 15);
        Assert.Equal(DepthSolution.Unique, result.Solution);
    }

    [Fact]
    public void NormalDepth_CircleBetweenFullAndPeakFlow_ReportsBothDepths()
    {
        const double d = 1.2, slope = 0.001, n = 0.013;
        double flow = 1.05 * FullPipeFlow(d, slope, n);
        var section = new CircularSection(d);
        var result = ManningSolver.NormalDepth(section, flow, slope, n);

        // Independent: Brent on each side of the golden-section maximum of the chord-formula discharge.
        Func<double, double> residual = y => ChannelReference.Manning(ChannelReference.Circle(d, y), slope, n) - flow;
        double peak = FindMinimum.OfScalarFunctionConstrained(y => -residual(y), 0.85 * d, 0.99 * d, 1e-12);
        double lower = ChannelReference.Brent(residual, 0.5 * d, peak);
        double upper = ChannelReference.Brent(residual, peak, d);

        Assert.Equal(DepthSolution.Multiple, result.Solution);
        Assert.Equal(lower, result.NormalDepth, 1e-9);
        Assert.NotNull(result.AlternateNormalDepth);
        Assert.Equal(upper, result.AlternateNormalDepth!.Value, 1e-9);
        Assert.Equal([result.AlternateNormalDepth.Value], result.AlternateNormalDepths);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 2, 30);
        var warning = Assert.Single(result.Warnings, w => w.Code == ChannelWarningCode.TwoNormalDepths);
        Assert.Equal("two-normal-depths", warning.CodeText);
        Assert.Contains("lower depth", warning.Message);
    }

    [Fact]
    public void NormalDepth_CircleAbovePeakFlow_HasNoDepthAndStatesCapacity()
    {
        const double d = 0.45, slope = 0.004, n = 0.013;
        double full = FullPipeFlow(d, slope, n);
        var result = ManningSolver.NormalDepth(new CircularSection(d), 1.1 * full, slope, n);

        Assert.Equal(DepthSolution.None, result.Solution);
        Assert.False(result.Converged);
        Assert.Equal(SolveStatus.NoSignChange, result.Status);
        Assert.True(double.IsNaN(result.NormalDepth));
        var capacity = result.Capacity!.Value;
        // Independent: MathNet's golden-section maximum of the chord-formula discharge.
        double peakDepth = FindMinimum.OfScalarFunctionConstrained(
            y => -ChannelReference.Manning(ChannelReference.Circle(d, y), slope, n), 0.85 * d, 0.99 * d, 1e-12);
        double peakFlow = ChannelReference.Manning(ChannelReference.Circle(d, peakDepth), slope, n);
        Assert.Equal(peakFlow, capacity.MaximumFlow, 1e-10 * peakFlow);
        Assert.Equal(peakDepth, capacity.DepthAtMaximumFlow, 1e-6);
        Assert.Equal(full, capacity.FullFlow, 1e-12 * full);
        Assert.Equal("exceeds-capacity", Assert.Single(result.Warnings, w => w.Code == ChannelWarningCode.ExceedsCapacity).CodeText);
        // The critical depth still exists inside the pipe.
        Assert.InRange(result.CriticalDepth, 0.0, d);
    }

    [Fact]
    public void NormalDepth_SurveyedTrapezoid_MatchesTrapezoid()
    {
        const double flow = 30.0, slope = 0.0008, n = 0.025;
        var trapezoid = ManningSolver.NormalDepth(new TrapezoidalSection(6.0, 1.5, 2.0), flow, slope, n);
        var surveyed = ManningSolver.NormalDepth(SurveyedSectionTests.DrawnTrapezoid(), flow, slope, n);
        Assert.Equal(trapezoid.NormalDepth, surveyed.NormalDepth, 1e-10);
        Assert.Equal(trapezoid.CriticalDepth, surveyed.CriticalDepth, 1e-10);
        Assert.Equal(trapezoid.FroudeNumber, surveyed.FroudeNumber, 1e-9);
        Assert.Equal(DepthSolution.Unique, surveyed.Solution);
        Assert.True(surveyed.Converged);
        Assert.InRange(surveyed.Iterations, 1, 15);
    }

    [Fact]
    public void NormalDepth_SurveyedWithSegmentRoughness_MatchesBrentOnHortonEinstein()
    {
        // Rectangle 4 m wide, concrete walls n = 0.013, gravel bed n = 0.030, every segment with its own n.
        var section = new SurveyedSection([0.0, 0.0, 4.0, 4.0], [3.0, 0.0, 0.0, 3.0], [0.013, 0.030, 0.013]);
        const double flow = 9.0, slope = 0.001;
        // Horton-Einstein composite n (Chow 1959, section 6-5, from memory), written out for the rectangle.
        Func<double, double> residual = y =>
        {
            double nc = Math.Pow((2 * y * Math.Pow(0.013, 1.5) + 4 * Math.Pow(0.030, 1.5)) / (4 + 2 * y), 2.0 / 3.0);
            return ChannelReference.Manning(ChannelReference.Trapezoid(4, 0, 0, y), slope, nc) - flow;
        };
        double brent = ChannelReference.Brent(residual, 1e-6, 3.0);
        var result = ManningSolver.NormalDepth(section, flow, slope);
        Assert.Equal(brent, result.NormalDepth, 1e-10);
        Assert.True(result.Converged);
        Assert.Contains("Horton-Einstein", result.Method);
        Assert.InRange(result.EffectiveManningN, 0.013, 0.030);
    }

    // A compound section (fictional): main channel 10 m wide and 2 m deep with 1 : 1 sides, nearly flat overbanks
    // (1 in 500) 100 m wide each side, then banks up to 4 m.
    private static readonly double[] CompoundX = [0, 10, 110, 112, 122, 124, 224, 234];
    private static readonly double[] CompoundZ = [4, 2.2, 2.0, 0.0, 0.0, 2.0, 2.2, 4];

    private static ChannelReference.Shape CompoundReference(double y) =>
        ChannelReference.Polygon(CompoundX.Zip(CompoundZ, (x, z) => (x, z)).ToList(), y);

    [Fact]
    public void NormalDepth_CompoundSectionWithConveyanceDip_FindsEveryDepth()
    {
        const double slope = 0.0005, n = 0.03;
        var section = new SurveyedSection(CompoundX, CompoundZ);
        // Flow halfway between the bank-full discharge and the lowest discharge just above it.
        double bankFull = ChannelReference.Manning(CompoundReference(2.0), slope, n);
        double dip = Enumerable.Range(1, 200).Select(i => ChannelReference.Manning(CompoundReference(2.0 + 0.2 * i / 200), slope, n)).Min();
        Assert.True(dip < bankFull, "the fixture must have a conveyance dip above bank-full");
        double flow = 0.5 * (bankFull + dip);

        // Independent: a dense sign-change scan of the polygon-geometry residual, each root refined by Brent.
        var roots = ChannelReference.AllRoots(y => ChannelReference.Manning(CompoundReference(y), slope, n) - flow, 1e-6, 3.99, 40000);
        var result = ManningSolver.NormalDepth(section, flow, slope, n);

        Assert.Equal(3, roots.Count);
        Assert.Equal(DepthSolution.Multiple, result.Solution);
        Assert.Equal(roots[0], result.NormalDepth, 1e-9);
        Assert.Equal(roots.Skip(1).ToArray(), result.AlternateNormalDepths.ToArray(), (a, b) => Math.Abs(a - b) < 1e-9);
        Assert.Equal(ChannelWarningCode.MultipleNormalDepths, result.Warnings[0].Code);
        Assert.True(result.Converged);
    }

    [Fact]
    public void NormalDepth_CompoundSectionDipBetweenSurveyPoints_FindsBothDepthsInsideOneSegment()
    {
        // A flow just above the least conveyance of the dip, which lies between the survey points at 2.0 and 2.2 m:
        // the residual is positive at both points and negative between them, so only a split at the conveyance's
        // stationary point finds the two depths there.
        const double slope = 0.0005, n = 0.03;
        var section = new SurveyedSection(CompoundX, CompoundZ);
        double dip = Enumerable.Range(1, 2000).Select(i => ChannelReference.Manning(CompoundReference(2.0 + 0.2 * i / 2000), slope, n)).Min();
        double atUpperPoint = ChannelReference.Manning(CompoundReference(2.2), slope, n);
        double flow = dip + 0.25 * (atUpperPoint - dip);
        var roots = ChannelReference.AllRoots(y => ChannelReference.Manning(CompoundReference(y), slope, n) - flow, 1e-6, 3.99, 40000);
        var result = ManningSolver.NormalDepth(section, flow, slope, n);

        Assert.Equal(3, roots.Count);
        Assert.InRange(roots[1], 2.0, 2.2);
        Assert.InRange(roots[2], 2.0, 2.2);
        Assert.Equal(roots[0], result.NormalDepth, 1e-9);
        Assert.Equal(roots.Skip(1).ToArray(), result.AlternateNormalDepths.ToArray(), (a, b) => Math.Abs(a - b) < 1e-9);
        Assert.True(result.Converged);
    }

    [Fact]
    public void NormalDepth_FlowBetweenTheConveyancesEitherSideOfAFlatOverbank_IsTheOverbankLevelWithWarning()
    {
        // Rectangle 4 m wide and 2 m deep with a horizontal overbank 36 m wide at its top (fictional). At depth 2 the
        // conveyance falls at once from A = 8, P = 8 (just below) to A = 8, P = 44 (just above). A flow between them has
        // a normal depth in the rectangle, crosses at the overbank level without a root there (reported as the level,
        // with a warning), and another above once the overbank's conveyance has grown enough.
        var section = new SurveyedSection([0, 0, 4, 4, 40, 40], [5, 0, 0, 2, 2, 5]);
        const double slope = 0.001, n = 0.02;
        double below = ChannelReference.Manning(new(8, 8, 4), slope, n);
        double above = ChannelReference.Manning(new(8, 44, 40), slope, n);
        double flow = 0.5 * (below + above);
        var result = ManningSolver.NormalDepth(section, flow, slope, n);

        // Independent: Brent on the rectangle below the overbank, and on rectangle + overbank (A = 8 + 40 (y - 2),
        // P = 44 + 2 (y - 2) with both outer walls) above it.
        double lower = ChannelReference.Brent(y => ChannelReference.Manning(ChannelReference.Trapezoid(4, 0, 0, y), slope, n) - flow, 1e-6, 2.0);
        double upper = ChannelReference.Brent(y => ChannelReference.Manning(new(8 + 40 * (y - 2), 44 + 2 * (y - 2), 40), slope, n) - flow, 2.0, 5.0);
        Assert.Equal(lower, result.NormalDepth, 1e-10);
        Assert.Equal([2.0, upper], result.AlternateNormalDepths.ToArray(), (a, b) => Math.Abs(a - b) < 1e-10);
        Assert.Contains(result.Warnings, w => w.CodeText == "conveyance-jump");
    }

    [Fact]
    public void NormalDepth_SurveyedOvertopped_HasNoDepthAndStatesCapacity()
    {
        const double slope = 0.0005, n = 0.03;
        var section = new SurveyedSection(CompoundX, CompoundZ);
        double full = ChannelReference.Manning(CompoundReference(4.0), slope, n);
        var result = ManningSolver.NormalDepth(section, 1.2 * full, slope, n);
        Assert.Equal(DepthSolution.None, result.Solution);
        Assert.False(result.Converged);
        var capacity = result.Capacity!.Value;
        Assert.Equal(full, capacity.FullFlow, 1e-9 * full);
        Assert.Equal(4.0, capacity.FullDepth);
        // On this section the conveyance rises above the dip to the bank top, so the greatest flow is there.
        Assert.Equal(full, capacity.MaximumFlow, 1e-9 * full);
        Assert.Equal(ChannelWarningCode.ExceedsCapacity, result.Warnings[0].Code);
    }

    [Fact]
    public void NormalDepth_BadArguments_ThrowNamingTheParameter()
    {
        var section = new RectangularSection(2.0);
        Assert.Equal("flow", Assert.ThrowsAny<ArgumentException>(() => ManningSolver.NormalDepth(section, 0.0, 0.001, 0.013)).ParamName);
        Assert.Equal("slope", Assert.ThrowsAny<ArgumentException>(() => ManningSolver.NormalDepth(section, 1.0, -0.001, 0.013)).ParamName);
        Assert.Equal("slope", Assert.ThrowsAny<ArgumentException>(() => ManningSolver.NormalDepth(section, 1.0, 0.0, 0.013)).ParamName);
        Assert.Equal("manningN", Assert.ThrowsAny<ArgumentException>(() => ManningSolver.NormalDepth(section, 1.0, 0.001, double.NaN)).ParamName);
        Assert.Equal("manningN", Assert.ThrowsAny<ArgumentException>(() => ManningSolver.NormalDepth(section, 1.0, 0.001, 0.0)).ParamName);
        Assert.Equal("section", Assert.ThrowsAny<ArgumentException>(() => ManningSolver.NormalDepth(null!, 1.0, 0.001, 0.013)).ParamName);
        Assert.Equal("section", Assert.ThrowsAny<ArgumentException>(() => ManningSolver.NormalDepth(section, 1.0, 0.001)).ParamName);
    }

    [Fact]
    public void NormalDepth_RoughnessOutsideTable_Warns()
    {
        // An n of 0.5 (a units slip) is outside the tabulated 0.008 to 0.20 (Chow 1959, Table 5-6, from memory).
        var result = ManningSolver.NormalDepth(new RectangularSection(2.0), 1.0, 0.001, 0.5);
        Assert.False(result.Validity.InTypicalRange);
        Assert.Contains(result.Warnings, w => w.CodeText == "roughness-outside-typical-range");
    }
}
