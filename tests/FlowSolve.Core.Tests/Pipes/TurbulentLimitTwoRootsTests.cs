using FlowSolve.Core.Pipes;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Pipes;

/// <summary>
/// Near Re 4000 the friction factor drops where Churchill's (1977) transition value gives way to Colebrook-White, so a
/// head within that drop is met by two flows, and an allowance within it by two diameters. The reference is written
/// here from the published relations (Hagen-Poiseuille 64/Re below Re 2000, Churchill 1977 from 2000 to 4000,
/// Colebrook-White 1939 from 4000, solved by MathNet.Numerics' Brent), and its roots are found by scanning for sign
/// changes and refining each bracket with Brent; a sign change at the jump itself is not a root (the residual there
/// stays at the jump's size) and is dropped.
/// </summary>
public sealed class TurbulentLimitTwoRootsTests
{
    private const double G = 9.80665;
    private const double Nu = 1e-6;

    private static double Colebrook(double re, double r) =>
        Brent.FindRoot(f => 1 / Math.Sqrt(f) + 2 * Math.Log10(r / 3.7 + 2.51 / (re * Math.Sqrt(f))), 1e-3, 0.2, 1e-16, 200);

    /// <summary>Churchill, S. W. (1977), Chem. Eng. 84(24), 91-92: f = 8 [(8/Re)^12 + (A + B)^-1.5]^(1/12).</summary>
    private static double Churchill(double re, double r)
    {
        double a = Math.Pow(-2.457 * Math.Log(Math.Pow(7 / re, 0.9) + 0.27 * r), 16);
        double b = Math.Pow(37530 / re, 16);
        return 8 * Math.Pow(Math.Pow(8 / re, 12) + Math.Pow(a + b, -1.5), 1.0 / 12);
    }

    private static double Friction(double re, double r) => re < 2000 ? 64 / re : re < 4000 ? Churchill(re, r) : Colebrook(re, r);

    private static double HeadLoss(double length, double d, double e, double k, double q)
    {
        double v = q / (Math.PI * d * d / 4), re = v * d / Nu;
        return (Friction(re, e / d) * length / d + k) * v * v / (2 * G);
    }

    [Theory]
    [InlineData(0.0, 0.0, 0.5)]
    [InlineData(0.0, 2.0, 0.3)]
    [InlineData(1e-4, 0.0, 0.8)]
    [InlineData(1e-3, 5.0, 0.1)]
    public void Flow_HeadWithinTheDropAtRe4000_ReportsBothFlows(double roughness, double k, double within)
    {
        double d = 0.1, length = 100;
        var pipe = new PipeGeometry(length, d, roughness, k);
        double q4 = 4000 * Nu * (Math.PI * d * d / 4) / d;
        double top = HeadLoss(length, d, roughness, k, q4 * (1 - 1e-9)), bottom = HeadLoss(length, d, roughness, k, q4 * (1 + 1e-9));
        Assert.True(top > bottom, "Churchill just below Re 4000 lies above Colebrook-White just above it");
        double head = bottom + within * (top - bottom);

        var reference = RootScan.All(q => HeadLoss(length, d, roughness, k, q) - head, 0.5 * q4, 2 * q4, head);
        Assert.Equal(2, reference.Count);

        var trace = new FlowSolve.Core.Numerics.SolverTrace();
        var r = PipeFlow.Solve(pipe, new FluidProperties(Nu), head, trace: trace);
        Assert.Equal(PipeStatus.Solved, r.Status);
        Assert.True(r.Warnings.HasFlag(PipeWarnings.SecondSolution));
        Assert.Equal(r.Iterations, trace.Steps.Count); // the trace is the answer's own solve
        // The turbulent (higher) flow is the answer, the transitional (lower) one the alternate.
        Assert.Equal(reference[1], r.Flow, reference[1] * 1e-9);
        Assert.Equal(reference[0], r.AlternateFlow!.Value, reference[0] * 1e-9);
        Assert.True(r.State.Reynolds >= 4000);
        Assert.Contains(r.DescribeWarnings(), w => w.Code == "second-solution");
    }

    [Theory]
    [InlineData(1.2)]
    [InlineData(0.6)]
    public void Flow_HeadOutsideTheDrop_HasOneFlowAndNoAlternate(double factor)
    {
        double d = 0.1, length = 100;
        var pipe = new PipeGeometry(length, d, 0);
        double q4 = 4000 * Nu * (Math.PI * d * d / 4) / d;
        double head = factor * HeadLoss(length, d, 0, 0, q4 * (1 + 1e-9));
        var reference = RootScan.All(q => HeadLoss(length, d, 0, 0, q) - head, 0.2 * q4, 5 * q4, head);
        var r = PipeFlow.Solve(pipe, new FluidProperties(Nu), head);
        Assert.Equal(Assert.Single(reference), r.Flow, reference[0] * 1e-9);
        Assert.Null(r.AlternateFlow);
        Assert.False(r.Warnings.HasFlag(PipeWarnings.SecondSolution));
    }

    [Theory]
    [InlineData(0.00142, 0.0, 0.3)]
    [InlineData(0.00142, 0.0, 0.9)]
    [InlineData(0.01, 5e-5, 0.5)]
    public void Diameter_AllowanceWithinTheJumpAtRe4000_ReportsBothDiameters(double flow, double roughness, double within)
    {
        double length = 1000;
        double d4 = 4 * flow / (Math.PI * Nu * 4000);
        double turbulent = HeadLoss(length, d4 * (1 - 1e-9), roughness, 0, flow);
        double transitional = HeadLoss(length, d4 * (1 + 1e-9), roughness, 0, flow);
        Assert.True(transitional > turbulent, "the loss jumps up as the diameter grows through Re 4000");
        double allowed = turbulent + within * (transitional - turbulent);

        var reference = RootScan.All(dd => HeadLoss(length, dd, roughness, 0, flow) - allowed, 0.5 * d4, 2 * d4, allowed);
        Assert.Equal(2, reference.Count);

        var trace = new FlowSolve.Core.Numerics.SolverTrace();
        var r = PipeDiameter.Solve(length, roughness, 0, new FluidProperties(Nu), flow, allowed, trace: trace);
        Assert.Equal(PipeStatus.Solved, r.Status);
        Assert.Equal(r.Iterations, trace.Steps.Count); // the trace is the answer's own solve
        Assert.True(r.Warnings.HasFlag(PipeWarnings.SecondSolution));
        // The turbulent (smaller) diameter is the answer, the transitional (larger) one the alternate.
        Assert.Equal(reference[0], r.Diameter, reference[0] * 1e-9);
        Assert.Equal(reference[1], r.AlternateDiameter!.Value, reference[1] * 1e-9);
        Assert.Contains(r.DescribeWarnings(), w => w.Code == "second-solution");
    }

    [Fact]
    public void Diameter_AllowanceOutsideTheJump_HasNoAlternate()
    {
        double flow = 0.00142, length = 1000, d4 = 4 * flow / (Math.PI * Nu * 4000);
        double allowed = 1.5 * HeadLoss(length, d4, 0, 0, flow);
        var r = PipeDiameter.Solve(length, 0, 0, new FluidProperties(Nu), flow, allowed);
        var reference = RootScan.All(dd => HeadLoss(length, dd, 0, 0, flow) - allowed, 0.2 * d4, 5 * d4, allowed);
        Assert.Equal(Assert.Single(reference), r.Diameter, reference[0] * 1e-9);
        Assert.Null(r.AlternateDiameter);
    }
}
