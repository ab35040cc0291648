using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Tests.Pipes;

public sealed class HazenWilliamsTests
{
    [Fact]
    public void HeadLoss_ShammasWangExample5_36_MatchesPublishedGradient()
    {
        // Shammas and Wang (2016), Water Engineering: Hydraulics, Distribution and Treatment (Wiley), Example 5.36
        // (found; the authors' names from memory): 12-in (0.3048 m) pipe, 1 MGD (0.0438 m3/s), C = 100:
        // 2.07 ft per 1000 ft from the charts and the US-customary formula (the same text's SI arithmetic gives 2.17).
        var pipe = new PipeGeometry(1000, 0.3048, 0.26e-3);
        var result = HazenWilliams.HeadLoss(pipe, new FluidProperties(1.0e-6), 0.0438, 100);
        Assert.Equal(2.07, result.FrictionHeadLoss, 2.07 * 0.02); // chart precision
    }

    [Theory]
    [InlineData(1000.0, 0.3, 0.1, 100.0)]
    [InlineData(800.0, 0.4, 0.25, 120.0)]
    [InlineData(50.0, 0.05, 0.002, 140.0)]
    public void HeadLoss_AgreesWithRoundedSiForm(double length, double d, double q, double c)
    {
        // The usual SI form hf = 10.67 L Q^1.852 / (C^1.852 D^4.87) (common practice) rounds the constants that
        // FlowSolve derives from V = 0.849 C R^0.63 S^0.54; the two agree to a few tenths of a percent.
        double rounded = 10.67 * length * Math.Pow(q, 1.852) / (Math.Pow(c, 1.852) * Math.Pow(d, 4.87));
        var result = HazenWilliams.HeadLoss(new PipeGeometry(length, d, 0), new FluidProperties(1e-6), q, c);
        Assert.Equal(rounded, result.FrictionHeadLoss, rounded * 0.005);
    }

    [Fact]
    public void HeadLoss_ReportsDarcyWeisbachBesideIt()
    {
        // Property: the comparison is the Darcy-Weisbach head loss of the same pipe and flow, minor losses shared.
        var pipe = new PipeGeometry(600, 0.2, 0.046e-3, 3.0);
        var fluid = new FluidProperties(1.004e-6);
        var result = HazenWilliams.HeadLoss(pipe, fluid, 0.04, 140);
        var dw = PipeHeadLoss.Compute(pipe, fluid, 0.04);
        Assert.Equal(dw.HeadLoss, result.DarcyWeisbach.HeadLoss, 1e-12 * dw.HeadLoss);
        Assert.Equal(dw.State.MinorHeadLoss, result.MinorHeadLoss, 1e-12);
        Assert.Equal(result.HeadLoss - dw.HeadLoss, result.Difference, 1e-12);
        Assert.Equal(result.Difference / dw.HeadLoss, result.RelativeDifference, 1e-12);
        Assert.Equal(PipeWarnings.None, result.Warnings & ~PipeWarnings.MethodsDisagree);
    }

    [Fact]
    public void HeadLoss_OilInSmallPipe_WarnsOutsideUsualRange()
    {
        // Usual range (common practice): water at ordinary temperatures, turbulent flow, D >= 50 mm, V <= 3 m/s.
        var result = HazenWilliams.HeadLoss(new PipeGeometry(20, 0.02, 0), new FluidProperties(1e-4), 0.0012, 160);
        Assert.True(result.Warnings.HasFlag(PipeWarnings.HazenWilliamsFluidOutsideRange));
        Assert.True(result.Warnings.HasFlag(PipeWarnings.HazenWilliamsNotTurbulent));
        Assert.True(result.Warnings.HasFlag(PipeWarnings.HazenWilliamsDiameterOutsideRange));
        Assert.True(result.Warnings.HasFlag(PipeWarnings.HazenWilliamsVelocityOutsideRange));
        Assert.True(result.Warnings.HasFlag(PipeWarnings.HazenWilliamsCoefficientOutsideRange));
        var codes = result.DescribeWarnings().Select(w => w.Code).ToList();
        Assert.Contains("hazen-williams-fluid-outside-range", codes);
        Assert.Contains("hazen-williams-not-turbulent", codes); // Re about 760: laminar
        Assert.Contains(result.Validity(), v => v.Quantity == "diameter" && !v.InRange);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(4.0)]
    public void Flow_RoundTripFromHeadLoss_RecoversFlow(double k)
    {
        // Property: flow -> Hazen-Williams head loss -> flow, with and without minor losses.
        var pipe = new PipeGeometry(900, 0.25, 0.1e-3, k);
        var fluid = new FluidProperties(1.1e-6);
        var forward = HazenWilliams.HeadLoss(pipe, fluid, 0.06, 120);
        var back = HazenWilliams.Flow(pipe, fluid, forward.HeadLoss + 3, 120, elevationRise: 3);
        Assert.Equal(PipeStatus.Solved, back.Status);
        Assert.Equal(0.06, back.Flow, 0.06 * 1e-10);
        Assert.InRange(back.Iterations, 0, 8);
        Assert.True(back.DarcyWeisbach.Converged);
        Assert.Equal(back.Flow - back.DarcyWeisbach.Flow, back.FlowDifference, 1e-15);
    }

    [Fact]
    public void Flow_NoDrivingHead_IsNoFlow()
    {
        var result = HazenWilliams.Flow(new PipeGeometry(100, 0.1, 0), new FluidProperties(1e-6), 2, 130, elevationRise: 5);
        Assert.Equal(PipeStatus.NoFlow, result.Status);
        Assert.Equal(PipeStatus.NoFlow, result.DarcyWeisbach.Status);
    }

    [Fact]
    public void HeadLoss_BadCoefficient_Throws() =>
        Assert.Equal("coefficient", Assert.Throws<ArgumentOutOfRangeException>(() =>
            HazenWilliams.HeadLoss(new PipeGeometry(10, 0.1, 0), new FluidProperties(1e-6), 0.01, 0)).ParamName);
}
