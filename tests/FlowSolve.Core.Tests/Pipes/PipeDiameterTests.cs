using FlowSolve.Core.Pipes;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Pipes;

public sealed class PipeDiameterTests
{
    [Fact]
    public void Solve_WhiteExample6_7_RecoversDiameter()
    {
        // White, Fluid Mechanics, Example 6.7 (found): 0.2 m3/s of oil (nu 1e-5) through 500 m of cast iron
        // (e 0.26 mm) loses about 117 m (from memory) in a 200 mm pipe; so 117 m allowed needs about 200 mm.
        var result = PipeDiameter.Solve(500, 0.26e-3, 0, new FluidProperties(1e-5), 0.2, 117);
        Assert.Equal(PipeStatus.Solved, result.Status);
        Assert.Equal(0.2, result.Diameter, 0.2 * 0.005); // D ~ h^-1/5: 2 % on h is 0.4 % on D
        Assert.InRange(result.Iterations, 1, 6);
    }

    [Theory]
    [MemberData(nameof(PipeFlowTests.Grid), MemberType = typeof(PipeFlowTests))]
    public void Solve_RoundTripFromHeadLoss_RecoversDiameter(double d, double e, double k, double re)
    {
        // Property: diameter -> head loss -> diameter recovers the diameter to 1e-10 relative.
        const double nu = 1e-6;
        var pipe = new PipeGeometry(200, d, e, k);
        double q = re * nu * pipe.Area / d;
        var forward = PipeHeadLoss.Compute(pipe, new FluidProperties(nu), q);
        var back = PipeDiameter.Solve(200, e, k, new FluidProperties(nu), q, forward.HeadLoss);
        Assert.Equal(PipeStatus.Solved, back.Status);
        Assert.Equal(d, back.Diameter, d * 1e-10);
        Assert.InRange(back.Iterations, 0, 8);
    }

    [Theory]
    [MemberData(nameof(PipeFlowTests.Grid), MemberType = typeof(PipeFlowTests))]
    public void Solve_AgreesWithMathNetBrent(double d, double e, double k, double re)
    {
        // Independent check: MathNet.Numerics' Brent on h(D) - H = 0 with the same head-loss relation.
        const double nu = 1e-6;
        var fluid = new FluidProperties(nu);
        double q = re * nu * 0.25 * Math.PI * d;
        double head = PipeHeadLoss.Compute(new PipeGeometry(60, d, e, k), fluid, q).HeadLoss * 0.98;
        var ours = PipeDiameter.Solve(60, e, k, fluid, q, head);
        double brent = Brent.FindRoot(x => PipeHeadLoss.Compute(new PipeGeometry(60, x, e, k), fluid, q).HeadLoss - head,
            d * 0.9, d * 1.2, 1e-16 * d, 200);
        Assert.Equal(PipeStatus.Solved, ours.Status);
        Assert.Equal(brent, ours.Diameter, brent * 1e-10);
    }

    [Fact]
    public void Solve_Laminar_IsHagenPoiseuille()
    {
        // Hagen-Poiseuille (found: Praks and Brkic 2018, f = 64/Re): D^4 = 128 nu L Q / (pi g H).
        const double nu = 1e-4, q = 1e-6, h = 2.0;
        var result = PipeDiameter.Solve(40, 0, 0, new FluidProperties(nu), q, h);
        double expected = Math.Pow(128 * nu * 40 * q / (Math.PI * Physical.StandardGravity * h), 0.25);
        Assert.Equal(expected, result.Diameter, expected * 1e-12);
        Assert.InRange(result.Iterations, 0, 2);
    }

    [Fact]
    public void SelectSize_Schedule40_PicksSmallestSizeMeetingAllowance()
    {
        // Property: the chosen size's inside diameter is at least the minimum, its head loss within the allowance,
        // and the next smaller listed size exceeds the allowance.
        var fluid = new FluidProperties(1.004e-6, 998.2);
        var result = PipeDiameter.SelectSize("asme-b36.10m-schedule-40", 300, 0.046e-3, 2.5, fluid, 0.03, 6.0);
        Assert.Equal(PipeStatus.Solved, result.Status);
        Assert.NotNull(result.Size);
        var size = result.Size!.Value;
        Assert.True(size.InsideDiameter >= result.Minimum.Diameter);
        Assert.True(result.AtSize.HeadLoss <= 6.0);
        var table = PipeSizeTables.Get("asme-b36.10m-schedule-40");
        int index = IndexOf(table, size.Name);
        Assert.True(index > 0);
        var smaller = table.Sizes[index - 1];
        Assert.True(PipeHeadLoss.Compute(new PipeGeometry(300, smaller.InsideDiameter, 0.046e-3, 2.5), fluid, 0.03).HeadLoss > 6.0);
        Assert.Equal(0.03 / (0.25 * Math.PI * size.InsideDiameter * size.InsideDiameter), result.AtSize.State.Velocity, 1e-12);
    }

    [Fact]
    public void SelectSize_AllowanceBelowMinorLossesAtLargestSize_IsNoListedSize()
    {
        // 20 fittings of K = 10 at 2 m3/s: even NPS 24 schedule 40 (22.624 in bore) loses more than 1 m to the fittings.
        var result = PipeDiameter.SelectSize("asme-b36.10m-schedule-40", 10, 0.046e-3, 200, new FluidProperties(1e-6), 2.0, 1.0);
        Assert.Equal(PipeStatus.NoListedSize, result.Status);
        Assert.Null(result.Size);
        Assert.False(result.Converged);
        Assert.True(result.AtSize.State.MinorHeadLoss > 1.0);
        Assert.True(result.Minimum.Converged); // the continuous minimum exists, larger than any listed bore
        Assert.True(result.Minimum.Diameter > 22.624 * 0.0254);
    }

    [Fact]
    public void SelectSize_UnknownTable_ThrowsNamingIt()
    {
        var ex = Assert.Throws<ArgumentException>(() =>
            PipeDiameter.SelectSize("no-such-table", 10, 0, 0, new FluidProperties(1e-6), 0.01, 1));
        Assert.Equal("table", ex.ParamName);
        Assert.Contains("no-such-table", ex.Message);
    }

    [Theory]
    [InlineData(0.0, 1.0, "flow")]
    [InlineData(0.01, 0.0, "allowedHeadLoss")]
    public void Solve_BadInput_ThrowsWithParameterName(double q, double h, string name) =>
        Assert.Equal(name, Assert.Throws<ArgumentOutOfRangeException>(() =>
            PipeDiameter.Solve(10, 0, 0, new FluidProperties(1e-6), q, h)).ParamName);

    private static int IndexOf(PipeSizeTable table, string name)
    {
        for (int i = 0; i < table.Sizes.Count; i++) if (table.Sizes[i].Name == name) return i;
        return -1;
    }
}
