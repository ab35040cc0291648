using FlowSolve.Core.NonNewtonian;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.NonNewtonian;

public sealed class NonNewtonianPipeTests
{
    private const double G = 9.80665;

    // Fluids of the Vandrel Vale demo (invented): a thickened tailings paste and a drilling mud.
    private static readonly NonNewtonianFluid Paste = NonNewtonianFluid.BinghamPlastic(1450, 25, 0.06);
    private static readonly NonNewtonianFluid Mud = NonNewtonianFluid.PowerLaw(1200, 0.5, 0.6);

    public static TheoryData<string, double, double> Cases() => new()
    {
        { "paste", 0.15, 0.002 }, { "paste", 0.15, 0.05 }, { "paste", 0.3, 0.4 },
        { "mud", 0.1, 0.002 }, { "mud", 0.1, 0.05 }, { "mud", 0.2, 0.3 },
    };

    private static NonNewtonianFluid Fluid(string name) => name == "paste" ? Paste : Mud;

    [Theory]
    [MemberData(nameof(Cases))]
    public void Flow_RoundTripsHeadLoss(string fluid, double d, double q)
    {
        var f = Fluid(fluid);
        var h = NonNewtonianPipe.HeadLoss(f, 800, d, 3.5, q);
        var back = NonNewtonianPipe.Flow(f, 800, d, 3.5, h.HeadLoss);
        Assert.True(back.Converged, back.Status.ToString());
        Assert.Equal(q, back.State.Flow, 1e-11 * q);
        Assert.InRange(back.Iterations, 1, 30);
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Flow_AgreesWithMathNetBrentOnTheSameEquation(string fluid, double d, double q)
    {
        // h(Q) = h* solved independently by Brent in Q, over a bracket from 1e-6 to 1e3 times the flow.
        var f = Fluid(fluid);
        double target = NonNewtonianPipe.HeadLoss(f, 800, d, 0, q).HeadLoss * 1.37;
        double brent = Brent.FindRoot(x => NonNewtonianPipe.HeadLoss(f, 800, d, 0, x).HeadLoss - target, q * 1e-6, q * 1e3, 1e-17 * q, 1000);
        var r = NonNewtonianPipe.Flow(f, 800, d, 0, target);
        if (r.Status == NonNewtonianFlowStatus.InTransitionGap) return; // no root exists: the head is in the jump at Re_c
        Assert.True(r.Converged, r.Status.ToString());
        Assert.Equal(brent, r.State.Flow, 1e-10 * brent);
    }

    [Fact]
    public void HeadLoss_PowerLawAtNOne_IsHagenPoiseuille()
    {
        // n = 1, K = mu: laminar head loss 32 mu L V/(rho g D^2) (Hagen-Poiseuille, closed form).
        var f = NonNewtonianFluid.PowerLaw(1000, 0.05, 1.0);
        double d = 0.05, l = 120, q = 1e-4, v = q / (Math.PI * d * d / 4);
        double expected = 32 * 0.05 * l * v / (1000 * G * d * d);
        var h = NonNewtonianPipe.HeadLoss(f, l, d, 0, q);
        Assert.Equal("laminar", h.Friction.Regime.ToString().ToLowerInvariant());
        Assert.Equal(expected, h.HeadLoss, 1e-13 * expected);
    }

    [Fact]
    public void HeadLoss_BinghamWithoutYieldStress_IsHagenPoiseuilleInLaminarFlow()
    {
        // tau0 = 0 (He = 0): the Newtonian laminar law; at Re 100 Darby's turbulent part is (f_T/f_L)^m of about 1e-300 smaller.
        var f = NonNewtonianFluid.BinghamPlastic(1000, 0, 0.05);
        double d = 0.05, l = 120, v = 0.1, q = v * Math.PI * d * d / 4;
        double expected = 32 * 0.05 * l * v / (1000 * G * d * d);
        Assert.Equal(expected, NonNewtonianPipe.HeadLoss(f, l, d, 0, q).HeadLoss, 1e-13 * expected);
    }

    [Fact]
    public void HeadLoss_Bingham_TendsToTheYieldGradientAsTheFlowVanishes()
    {
        // A Bingham plastic needs a wall stress tau0 to move: h -> 4 tau0 L/(rho g D) as Q -> 0 (Buckingham 1921).
        double d = 0.15, l = 500;
        double yield = 4 * Paste.YieldStress * l / (Paste.Density * G * d);
        double h = NonNewtonianPipe.HeadLoss(Paste, l, d, 0, 1e-12).HeadLoss;
        Assert.Equal(yield, h, 1e-4 * yield);
        Assert.True(h > yield);
    }

    [Fact]
    public void Flow_Bingham_BelowTheYieldHead_HasNoFlow()
    {
        double d = 0.15, l = 500;
        double yield = 4 * Paste.YieldStress * l / (Paste.Density * G * d);
        var r = NonNewtonianPipe.Flow(Paste, l, d, 0, 0.999 * yield);
        Assert.Equal(NonNewtonianFlowStatus.BelowYield, r.Status);
        Assert.Equal(yield, r.YieldHeadLoss, 1e-14 * yield);
        var just = NonNewtonianPipe.Flow(Paste, l, d, 0, 1.0001 * yield);
        Assert.True(just.Converged, just.Status.ToString());
        Assert.True(just.State.Friction.PlugRatio > 0.9);
        Assert.Contains(just.State.Friction.Describe(), w => w.Code == "plug-like-flow");
    }

    [Fact]
    public void Flow_PowerLaw_HeadInTheJumpAtTheCriticalReynoldsNumber_IsReportedAsSuch()
    {
        double d = 0.1, l = 300;
        // Bracket the jump from both sides: a head just below the critical flow's laminar loss is laminar and solved.
        var probe = NonNewtonianPipe.Flow(Mud, l, d, 0, 1.0);
        Assert.True(probe.GapLow < probe.GapHigh, "Dodge-Metzner lies above the laminar law at Re_c for n = 0.6");
        var gap = NonNewtonianPipe.Flow(Mud, l, d, 0, 0.5 * (probe.GapLow + probe.GapHigh));
        Assert.Equal(NonNewtonianFlowStatus.InTransitionGap, gap.Status);
        var below = NonNewtonianPipe.Flow(Mud, l, d, 0, 0.99 * probe.GapLow);
        Assert.True(below.Converged);
        Assert.True(below.State.Flow < probe.CriticalFlow);
        var above = NonNewtonianPipe.Flow(Mud, l, d, 0, 1.01 * probe.GapHigh);
        Assert.True(above.Converged);
        Assert.True(above.State.Flow >= probe.CriticalFlow);
    }

    [Fact]
    public void Flow_PowerLawWhereDodgeMetznerDropsBelowTheLaminarLawAtReC_ReportsBothFlows()
    {
        // At n = 0.15, Dodge-Metzner at Re_c lies below 16/Re_c, so h(Q) drops at Re_c and heads inside the drop are met
        // by a laminar and a turbulent flow; each is checked against Brent on its own side of the critical flow.
        var fluid = NonNewtonianFluid.PowerLaw(1100, 2.0, 0.15);
        double d = 0.1, l = 200;
        var probe = NonNewtonianPipe.Flow(fluid, l, d, 0, 1.0);
        Assert.True(probe.GapHigh < probe.GapLow);
        double target = 0.5 * (probe.GapLow + probe.GapHigh), qc = probe.CriticalFlow;
        var r = NonNewtonianPipe.Flow(fluid, l, d, 0, target);
        Assert.True(r.Converged, r.Status.ToString());
        double h(double q) => NonNewtonianPipe.HeadLoss(fluid, l, d, 0, q).HeadLoss - target;
        double turbulent = Brent.FindRoot(h, qc * (1 + 1e-9), qc * 100, 1e-17 * qc, 1000);
        double laminar = Brent.FindRoot(h, qc * 1e-3, qc * (1 - 1e-9), 1e-17 * qc, 1000);
        Assert.Equal(turbulent, r.State.Flow, 1e-10 * turbulent);
        Assert.Equal(laminar, r.AlternateFlow, 1e-10 * laminar);
        Assert.True(r.AlternateFlow < qc && qc < r.State.Flow);
    }

    [Theory]
    [InlineData("paste", 0.01)]
    [InlineData("paste", 0.3)]
    [InlineData("mud", 0.005)]
    [InlineData("mud", 0.2)]
    public void DHeadLossDFlow_MatchesCentralDifference(string fluid, double q)
    {
        var f = Fluid(fluid);
        var h = NonNewtonianPipe.HeadLoss(f, 400, 0.15, 2, q);
        CentralDifference.Check("dh/dQ", h.DHeadLossDFlow, x => NonNewtonianPipe.HeadLoss(f, 400, 0.15, 2, x).HeadLoss, q, step: 1e-4 * q);
    }

    [Fact]
    public void Flow_HeadBeyondTheSearchedVelocities_IsOutsideRange()
    {
        var r = NonNewtonianPipe.Flow(Mud, 1, 0.5, 0, 1e7);
        Assert.Equal(NonNewtonianFlowStatus.OutsideRange, r.Status);
        Assert.False(r.Converged);
    }
}
