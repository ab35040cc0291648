using FlowSolve.Core.Fluids;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Tests.Pumps;

public sealed class NpshAvailableTests
{
    private const double Foot = 0.3048;

    // A wastewater-treatment handbook's worked example (found): open tank of water at 60 degrees F, atmospheric head
    // 34 ft, vapour pressure head 0.6 ft, entrance loss 0.4 ft, friction 2 ft; level 15 ft above the pump gives 46 ft,
    // a suction lift of 20 ft gives 11 ft.
    public static TheoryData<double, double> Handbook => new()
    {
        { 15.0, 46.0 },
        { -20.0, 11.0 },
    };

    [Theory]
    [MemberData(nameof(Handbook))]
    public void Compute_HandbookOpenTank_MatchesPublishedValue(double staticSuctionFeet, double expectedFeet)
    {
        double rho = Water.Density((60 - 32) / 1.8);
        double rhoG = rho * Physical.StandardGravity;
        double npsha = NpshAvailable.Compute(34 * Foot * rhoG, 0.6 * Foot * rhoG, rho, staticSuctionFeet * Foot, 2.4 * Foot);
        Assert.Equal(expectedFeet, npsha / Foot, 1e-9);
    }

    [Fact]
    public void ForWater_At60F_VapourHeadIsTheHandbooks0_6Feet()
    {
        // The same handbook example's vapour pressure head, 0.6 ft at 60 degrees F (one decimal), against IAPWS-IF97.
        double t = (60 - 32) / 1.8;
        var suction = SuctionConditions.ForWater(t, staticSuctionHead: 0);
        double head = suction.VapourPressure / (Water.Density(t) * Physical.StandardGravity) / Foot;
        Assert.Equal(0.6, head, 0.05);
        Assert.Equal(Water.AtmosphericPressure, suction.SurfacePressure);
    }

    [Fact]
    public void Compute_SuctionPipe_AddsItsHeadLossAtFlowPerPump()
    {
        var fluid = new FluidProperties(1.004e-6, 998.2);
        var pipe = new PipeGeometry(8, 0.15, 0.05e-3, 2.5);
        var suction = new SuctionConditions(101325, 2339, 3.0, LossHead: 0.3, SuctionPipe: pipe);
        var (npsha, loss) = NpshAvailable.Compute(suction, fluid, 0.03);
        double expectedLoss = 0.3 + PipeHeadLoss.Compute(pipe, fluid, 0.03).HeadLoss;
        Assert.Equal(expectedLoss, loss, 1e-12);
        Assert.Equal((101325 - 2339) / (998.2 * Physical.StandardGravity) + 3.0 - expectedLoss, npsha, 1e-12);
    }

    [Theory]
    [InlineData(0.0, 2339.0, 998.0, 1.0, "surfacePressure")]
    [InlineData(101325.0, -1.0, 998.0, 1.0, "vapourPressure")]
    [InlineData(101325.0, 2339.0, 0.0, 1.0, "density")]
    [InlineData(101325.0, 2339.0, 998.0, -0.1, "lossHead")]
    public void Compute_BadInput_ThrowsNamingParameter(double ps, double pv, double rho, double loss, string name)
    {
        var e = Assert.ThrowsAny<ArgumentException>(() => NpshAvailable.Compute(ps, pv, rho, 2.0, loss));
        Assert.Equal(name, e.ParamName);
    }
}
