using FlowSolve.Core.Fluids;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Pumps;

public sealed class DutyPointTests
{
    private const double Foot = 0.3048;
    private const double CubicFoot = Foot * Foot * Foot;

    // H = 40 - 5000 Q^2 against H_sys = 15 + 3000 Q^2: the closed form Q^2 = (40 - 15) / (5000 + 3000).
    private static readonly PumpCurve Quadratic40 = PumpCurve.FromCoefficients(40, 0, -5000);
    private static readonly SystemCurve System15 = SystemCurve.Quadratic(15, 3000);

    [Fact]
    public void Solve_QuadraticPumpOnQuadraticSystem_MatchesClosedForm()
    {
        // Closed form of two quadratics (algebra): Q = sqrt(25/8000), H = 15 + 3000 Q^2.
        var result = DutyPoint.Solve(Quadratic40, System15);
        double q = Math.Sqrt(25.0 / 8000);
        Assert.Equal(DutyStatus.Solved, result.Status);
        Assert.True(result.Converged);
        Assert.Equal(q, result.Flow, 1e-12);
        Assert.Equal(15 + 3000 * q * q, result.Head, 1e-10);
        Assert.Equal(result.Flow, result.FlowPerPump);
        Assert.Equal(result.Head, result.HeadPerPump);
        Assert.InRange(result.Iterations, 1, 8);
        Assert.True(Math.Abs(result.Residual) < 1e-11);
        Assert.Equal("solved", result.Status.Code());
    }

    // (parallel, series, speed ratio, expected Q^2) from the combination rules in closed form:
    // parallel N: 40 - 5000 (Q/N)^2; series N: N (40 - 5000 Q^2); speed s: 40 s^2 - 5000 Q^2 (affinity laws, common practice).
    public static TheoryData<int, int, double, double> Arrangements => new()
    {
        { 2, 1, 1.0, 25.0 / (5000.0 / 4 + 3000) },
        { 3, 1, 1.0, 25.0 / (5000.0 / 9 + 3000) },
        { 1, 2, 1.0, 65.0 / (10000.0 + 3000) },
        { 1, 3, 1.0, 105.0 / (15000.0 + 3000) },
        { 1, 1, 0.8, (40 * 0.64 - 15) / 8000.0 },
        { 1, 1, 1.25, (40 * 1.5625 - 15) / 8000.0 },
        { 2, 1, 0.9, (40 * 0.81 - 15) / (5000.0 / 4 + 3000) },
        { 1, 2, 0.9, (80 * 0.81 - 15) / (10000.0 + 3000) },
    };

    [Theory]
    [MemberData(nameof(Arrangements))]
    public void Solve_ParallelSeriesAndSpeed_MatchClosedForm(int parallel, int series, double speed, double expectedSquare)
    {
        var result = DutyPoint.Solve(Quadratic40, System15, new PumpArrangement(parallel, series, speed));
        double q = Math.Sqrt(expectedSquare);
        Assert.True(result.Converged);
        Assert.Equal(q, result.Flow, 1e-12);
        Assert.Equal(15 + 3000 * q * q, result.Head, 1e-10);
        Assert.Equal(q / parallel, result.FlowPerPump, 1e-12);
        Assert.Equal(result.Head / series, result.HeadPerPump, 1e-10);
        Assert.Equal(q / parallel / speed, result.RatedSpeedFlow, 1e-12);
        Assert.InRange(result.Iterations, 1, 8);
    }

    [Fact]
    public void Solve_PublishedProblemReservoirToReservoir_MatchesClosedForm()
    {
        // Problem data found on a question-and-answer page reproducing a textbook problem (attributed, from memory, to
        // Cengel and Cimbala, Fluid Mechanics: Fundamentals and Applications, chapter on turbomachinery): H = H0 - a V^2,
        // H0 = 7.46 m, a = 0.0453 m/Lpm^2; system H = 3.52 m + b V^2, b = 0.0261 m/Lpm^2. The book's answer was not
        // read: the expectation is the closed form of the stated curves, V^2 = (H0 - dz)/(a + b), about 7.43 Lpm at 4.96 m.
        const double lpm = 1e-3 / 60;
        var pump = PumpCurve.FromCoefficients(7.46, 0, -0.0453 / (lpm * lpm));
        var system = SystemCurve.Quadratic(3.52, 0.0261 / (lpm * lpm));
        var result = DutyPoint.Solve(pump, system);
        double v = Math.Sqrt((7.46 - 3.52) / (0.0453 + 0.0261));
        Assert.True(result.Converged);
        Assert.Equal(v, result.Flow / lpm, 1e-9);
        Assert.Equal(3.52 + 0.0261 * v * v, result.Head, 1e-9);
        Assert.Equal(7.43, result.Flow / lpm, 0.01);
        Assert.InRange(result.Iterations, 1, 8);
    }

    public static TheoryData<int, int, double> PublishedArrangements => new()
    {
        { 1, 1, 75.0 }, // one pump: Q^2 = (365 - 290) / (20 + K)
        { 1, 2, 440.0 }, // two in series: 730 - 40 Q^2
        { 2, 1, 75.0 }, // two in parallel: 365 - 5 Q^2
    };

    [Theory]
    [MemberData(nameof(PublishedArrangements))]
    public void Solve_PublishedProblemSeriesAndParallel_MatchesClosedForm(int parallel, int series, double drive)
    {
        // Problem data found on a question-and-answer page reproducing a textbook problem (book not identified): pump
        // h = 365 - 20 Q^2 (ft, ft3/s) at 1100 rpm, reservoirs 290 ft apart, suction 90 ft of 10-in pipe f = 0.022,
        // discharge 4900 ft of 8-in pipe f = 0.028, minor losses neglected; one pump, two in series, two in parallel.
        // With constant f the system is 290 + K Q^2, K = sum 8 f L / (g pi^2 D^5) (Darcy-Weisbach); the expectation is
        // the closed form, not a published answer.
        const double g = 32.174;
        double k = 8 * 0.022 * 90 / (g * Math.PI * Math.PI * Math.Pow(10.0 / 12, 5))
                 + 8 * 0.028 * 4900 / (g * Math.PI * Math.PI * Math.Pow(8.0 / 12, 5));
        double pumpK = 20.0 * series / (parallel * parallel);
        double expected = Math.Sqrt(drive / (pumpK + k)); // ft3/s

        var pump = PumpCurve.FromCoefficients(365 * Foot, 0, -20 * Foot / (CubicFoot * CubicFoot));
        var system = SystemCurve.Quadratic(290 * Foot, k * Foot / (CubicFoot * CubicFoot));
        var result = DutyPoint.Solve(pump, system, new PumpArrangement(parallel, series, 1.0));
        Assert.True(result.Converged);
        Assert.Equal(expected, result.Flow / CubicFoot, 1e-10);
        Assert.InRange(result.Iterations, 1, 8);
    }

    public static TheoryData<int, int, double> PipeCases => new()
    {
        { 1, 1, 1.0 }, { 2, 1, 1.0 }, { 3, 1, 1.0 }, { 1, 2, 1.0 }, { 1, 3, 1.0 },
        { 1, 1, 0.7 }, { 1, 1, 1.2 }, { 2, 1, 0.85 }, { 1, 2, 1.1 },
    };

    [Theory]
    [MemberData(nameof(PipeCases))]
    public void Solve_PipeSystem_AgreesWithBrentOnCombinationRules(int parallel, int series, double speed)
    {
        // Cross-check with MathNet's Brent on the combination rules written out independently: parallel pumps each carry
        // q at the common head, H_sys(N q) = s^2 H(q/s); series pumps add heads, H_sys(Q) = N s^2 H(Q/s).
        var fit = PumpCurve.Fit([0, 0.02, 0.04, 0.06, 0.08], [62, 60.5, 56, 48, 37.5]).Curve;
        var water = Water.At(20);
        var fluid = new FluidProperties(water.KinematicViscosity, water.Density);
        var pipes = new[] { new PipeGeometry(40, 0.2, 0.05e-3, 1.5), new PipeGeometry(600, 0.15, 0.1e-3, 6.0) };
        var system = SystemCurve.FromPipes(18, pipes, fluid);
        var result = DutyPoint.Solve(fit, system, new PumpArrangement(parallel, series, speed));

        double onePump(double q) => speed * speed * fit.Head(q / speed);
        double loss(double q) => 18 + PipeHeadLoss.Compute(pipes[0], fluid, q).HeadLoss + PipeHeadLoss.Compute(pipes[1], fluid, q).HeadLoss;
        double qz = speed * fit.ZeroHeadFlow!.Value;
        double brent = parallel > 1
            ? parallel * Brent.FindRoot(q => onePump(q) - loss(parallel * q), 1e-9, qz, 1e-15, 200)
            : Brent.FindRoot(q => series * onePump(q) - loss(q), 1e-9, qz, 1e-15, 200);
        Assert.True(result.Converged);
        Assert.Equal(brent, result.Flow, 1e-10 * brent);
        Assert.Equal(loss(brent), result.Head, 1e-8 * result.Head);
        Assert.InRange(result.Iterations, 1, 12);
    }

    [Theory]
    [InlineData(0.6)]
    [InlineData(0.8)]
    [InlineData(1.3)]
    public void Solve_FrictionOnlySystem_ScalesByAffinityLaws(double speed)
    {
        // Affinity laws (common practice): on a system with no static head and losses in Q^2 the duty point moves along
        // the parabola, Q_s = s Q_1 and H_s = s^2 H_1. A cubic curve makes the check non-trivial.
        var pump = PumpCurve.FromCoefficients(50, 120, -9000, -40000, maximumFlow: 0.07);
        var system = SystemCurve.Quadratic(0, 6000);
        var rated = DutyPoint.Solve(pump, system);
        var scaled = DutyPoint.Solve(pump, system, new PumpArrangement(1, 1, speed));
        Assert.Equal(speed * rated.Flow, scaled.Flow, 1e-12);
        Assert.Equal(speed * speed * rated.Head, scaled.Head, 1e-10);
        double brent = Brent.FindRoot(q => speed * speed * pump.Head(q / speed) - 6000 * q * q, 1e-9, speed * pump.ZeroHeadFlow!.Value, 1e-15, 200);
        Assert.Equal(brent, scaled.Flow, 1e-12);
        Assert.InRange(scaled.Iterations, 1, 10);
    }

    [Fact]
    public void Solve_ShutOffBelowStaticHead_ReportsShortfall()
    {
        // Stated property: 40 m of shut-off head cannot lift against 52 m of static head; the curves come closest at
        // zero flow, 12 m apart.
        var result = DutyPoint.Solve(Quadratic40, SystemCurve.Quadratic(52, 3000));
        Assert.Equal(DutyStatus.ShutOffBelowStaticHead, result.Status);
        Assert.False(result.Converged);
        Assert.Equal(40, result.ShutOffHead);
        Assert.Equal(52, result.StaticHead);
        Assert.Equal(12, result.HeadShortfall, 1e-12);
        Assert.Equal(-12, result.ClosestApproach, 1e-12);
        Assert.Equal(0, result.ClosestApproachFlow, 1e-12);
        Assert.Equal(0, result.Flow);
        Assert.Equal("shut-off-below-static-head", result.Status.Code());
    }

    [Fact]
    public void Solve_TwoInSeriesLiftWhatOneCannot()
    {
        // Series rule: two pumps of 40 m shut-off give 80 m, enough for 52 m of static head (closed form).
        var result = DutyPoint.Solve(Quadratic40, SystemCurve.Quadratic(52, 3000), PumpArrangement.InSeries(2));
        Assert.True(result.Converged);
        Assert.Equal(Math.Sqrt(28.0 / 13000), result.Flow, 1e-12);
    }

    [Fact]
    public void Solve_FallingSystemBeyondZeroHead_CurvesDoNotMeet()
    {
        // A system falling 30 m: F(Q) = 70 - 6000 Q^2 stays positive up to the zero-head flow sqrt(40/5000), where it is
        // 70 - 6000 * 40/5000 = 22 m (closed form, the curves' closest approach).
        var result = DutyPoint.Solve(Quadratic40, SystemCurve.Quadratic(-30, 1000));
        double qz = Math.Sqrt(40.0 / 5000);
        Assert.Equal(DutyStatus.CurvesDoNotMeet, result.Status);
        Assert.Equal(qz, result.ZeroHeadFlow!.Value, 1e-14);
        Assert.Equal(22, result.ClosestApproach, 1e-9);
        Assert.Equal(qz, result.ClosestApproachFlow, 1e-9);
        Assert.Equal("curves-do-not-meet", result.Status.Code());
    }

    [Fact]
    public void Solve_CurveNeverReachingZeroHead_BracketEndsAtSearchLimit()
    {
        // H = 40 - 100 Q + 200 Q^2 has no real root (discriminant 10000 - 32000 < 0). Against 10 + 50 Q^2 the difference
        // 30 - 100 Q + 150 Q^2 is smallest at Q = 1/3, where it is 40/3 m (vertex of the parabola).
        var pump = PumpCurve.FromCoefficients(40, -100, 200, maximumFlow: 0.2);
        Assert.Null(pump.ZeroHeadFlow);
        Assert.Equal(PumpCurve.ZeroHeadSearchFactor * 0.2, pump.SearchLimit, 1e-15);
        var result = DutyPoint.Solve(pump, SystemCurve.Quadratic(10, 50));
        Assert.Equal(DutyStatus.CurvesDoNotMeet, result.Status);
        Assert.True(result.Warnings.HasFlag(PumpWarnings.ZeroHeadNotReached));
        Assert.Equal(40.0 / 3, result.ClosestApproach, 1e-9);
        Assert.Equal(1.0 / 3, result.ClosestApproachFlow, 1e-6);
        Assert.Contains(result.DescribeWarnings(), w => w.Code == "zero-head-not-reached");
    }

    [Fact]
    public void Solve_WithEfficiency_ReportsPowerAndBestEfficiencyRatio()
    {
        // eta = 32 q - 320 q^2 peaks at q = 0.05 with 0.8 (vertex). Shaft power is rho g Q H / eta by definition.
        var eff = EfficiencyCurve.FromCoefficients(0, 32, -320, 0, maximumFlow: 0.08);
        var fluid = new FluidProperties(1.004e-6, 998.2);
        var result = DutyPoint.Solve(Quadratic40, System15, data: new DutyPointData(Efficiency: eff, Fluid: fluid));
        double q = Math.Sqrt(25.0 / 8000), h = 15 + 3000 * q * q, eta = 32 * q - 320 * q * q;
        Assert.Equal(eta, result.Efficiency!.Value, 1e-12);
        Assert.Equal(998.2 * Physical.StandardGravity * q * h, result.HydraulicPower!.Value, 1e-9);
        Assert.Equal(998.2 * Physical.StandardGravity * q * h / eta, result.ShaftPower!.Value, 1e-8);
        Assert.Equal(0.05, result.BestEfficiencyFlow!.Value, 1e-14);
        Assert.Equal(q / 0.05, result.BestEfficiencyRatio!.Value, 1e-12);
        Assert.Equal(PumpWarnings.None, result.Warnings); // ratio 1.12 lies in 0.70..1.20
    }

    [Fact]
    public void Solve_SlowedPump_EfficiencyAtQOverSAndRatioAgainstScaledBep()
    {
        // Affinity laws (common practice): at speed s the efficiency is read at q/s and the BEP flow is s Q_BEP.
        var eff = EfficiencyCurve.FromCoefficients(0, 32, -320, 0, maximumFlow: 0.08);
        var result = DutyPoint.Solve(Quadratic40, System15, new PumpArrangement(1, 1, 0.7), new DutyPointData(Efficiency: eff));
        double q = Math.Sqrt((40 * 0.49 - 15) / 8000.0), rated = q / 0.7;
        Assert.Equal(32 * rated - 320 * rated * rated, result.Efficiency!.Value, 1e-12);
        Assert.Equal(0.035, result.BestEfficiencyFlow!.Value, 1e-14);
        Assert.Equal(q / 0.035, result.BestEfficiencyRatio!.Value, 1e-12);
        Assert.True(q / 0.035 < 0.7);
        Assert.True(result.Warnings.HasFlag(PumpWarnings.BelowPreferredRegion));
        Assert.Null(result.ShaftPower); // no density given
        Assert.Contains(result.DescribeWarnings(), w => w.Code == "below-preferred-region");
    }

    [Fact]
    public void Solve_WithSuction_ReportsNpshMarginAndWarnsWhenShort()
    {
        // NPSHa = (p_s - p_v)/(rho g) + z_s - h_L (definition); NPSHr scales with s^2 at q/s (common practice);
        // margin below 1.0 m or ratio below 1.1 is short (common practice).
        var fluid = new FluidProperties(1.004e-6, 998.2);
        var npsh = NpshCurve.Interpolate([0.0, 0.04, 0.08], [1.5, 2.5, 4.5]);
        var suction = new SuctionConditions(101325, 2339, -6.0, LossHead: 1.2);
        var result = DutyPoint.Solve(Quadratic40, System15, new PumpArrangement(1, 1, 1.1),
            new DutyPointData(NpshRequired: npsh, Suction: suction, Fluid: fluid));
        double q = Math.Sqrt((40 * 1.21 - 15) / 8000.0), rated = q / 1.1;
        double npshr = 1.21 * (2.5 + (rated - 0.04) / 0.04 * 2.0);
        double npsha = (101325 - 2339) / (998.2 * Physical.StandardGravity) - 6.0 - 1.2;
        Assert.Equal(npsha, result.NpshAvailable!.Value, 1e-12);
        Assert.Equal(npshr, result.NpshRequired!.Value, 1e-12);
        Assert.Equal(npsha - npshr, result.NpshMargin!.Value, 1e-12);
        Assert.Equal(npsha / npshr, result.NpshRatio!.Value, 1e-12);
        Assert.Equal(npsha - npshr < 1.0 || npsha / npshr < 1.1, result.Warnings.HasFlag(PumpWarnings.NpshMarginShort));

        var deeper = DutyPoint.Solve(Quadratic40, System15, new PumpArrangement(1, 1, 1.1),
            new DutyPointData(NpshRequired: npsh, Suction: suction with { StaticSuctionHead = -7.5 }, Fluid: fluid));
        Assert.True(deeper.NpshMargin < 1.0);
        Assert.True(deeper.Warnings.HasFlag(PumpWarnings.NpshMarginShort));
        Assert.Contains(deeper.DescribeWarnings(), w => w.Code == "npsh-margin-short");
    }

    [Fact]
    public void Solve_DutyBeyondCatalogue_Warns()
    {
        // Stated rule: the duty flow at rated speed beyond the largest catalogue flow is flagged.
        var pump = PumpCurve.FromCoefficients(40, 0, -5000, maximumFlow: 0.05);
        var result = DutyPoint.Solve(pump, System15);
        Assert.True(result.Flow > 0.05);
        Assert.True(result.Warnings.HasFlag(PumpWarnings.OutsideCatalogueRange));
        Assert.Contains(result.DescribeWarnings(), w => w.Code == "outside-catalogue-range");
    }

    [Fact]
    public void Solve_CoefficientsAndQuadraticSystem_AllocatesNothing()
    {
        var pipes = new[] { new PipeGeometry(300, 0.15, 0.1e-3, 4) };
        var pipeSystem = SystemCurve.FromPipes(15, pipes, new FluidProperties(1.004e-6));
        var arrangement = PumpArrangement.InParallel(2, 0.9);
        DutyPoint.Solve(Quadratic40, System15, arrangement);
        DutyPoint.Solve(Quadratic40, pipeSystem, arrangement);
        long before = GC.GetAllocatedBytesForCurrentThread();
        var a = DutyPoint.Solve(Quadratic40, System15, arrangement);
        var b = DutyPoint.Solve(Quadratic40, pipeSystem, arrangement);
        long after = GC.GetAllocatedBytesForCurrentThread();
        Assert.True(a.Converged && b.Converged);
        Assert.Equal(0, after - before);
    }

    [Fact]
    public void Solve_Trace_RecordsIterations()
    {
        var trace = new SolverTrace();
        var result = DutyPoint.Solve(Quadratic40, System15, trace: trace);
        Assert.Equal(result.Iterations, trace.Steps.Count);
    }

    [Theory]
    [InlineData(0, 1, 1.0, "parallel")]
    [InlineData(1, 0, 1.0, "series")]
    [InlineData(2, 2, 1.0, "series")]
    [InlineData(1, 1, 0.0, "speedRatio")]
    [InlineData(1, 1, 1.5000001, "speedRatio")]
    [InlineData(1, 1, double.NaN, "speedRatio")]
    public void Solve_BadArrangement_ThrowsNamingParameter(int parallel, int series, double speed, string name)
    {
        var e = Assert.ThrowsAny<ArgumentException>(() => DutyPoint.Solve(Quadratic40, System15, new PumpArrangement(parallel, series, speed)));
        Assert.Equal(name, e.ParamName);
    }

    [Fact]
    public void Solve_DefaultCurveOrSuctionWithoutDensity_Throws()
    {
        Assert.Equal("pump", Assert.Throws<ArgumentException>(() => DutyPoint.Solve(default, System15)).ParamName);
        var data = new DutyPointData(Suction: new SuctionConditions(101325, 2339, 2));
        Assert.Equal("density", Assert.Throws<ArgumentException>(() => DutyPoint.Solve(Quadratic40, System15, data: data)).ParamName);
    }

    [Fact]
    public void Solve_SpeedRatioAtUpperLimit_Accepted()
    {
        var result = DutyPoint.Solve(Quadratic40, System15, new PumpArrangement(1, 1, 1.5));
        Assert.Equal(Math.Sqrt((40 * 2.25 - 15) / 8000.0), result.Flow, 1e-12);
    }
}
