using FlowSolve.Core.Friction;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Tests.Pipes;

/// <summary>Finite, well-formed inputs at the edge of double precision (5e-324, 1e308) give finite answers or a
/// no-answer status, never an infinity or an exception.</summary>
public sealed class VanishingInputTests
{
    private const double G = 9.80665;

    [Theory]
    [InlineData(1e-12)]
    [InlineData(1e-300)]
    [InlineData(5e-324)]
    public void WithDerivative_CreepingFlow_IsTheHagenPoiseuilleLaw(double flow)
    {
        // Hagen-Poiseuille (laminar law, any fluid-mechanics text): h = 128 nu L Q / (pi g D^4), dh/dQ = h / Q.
        var pipe = new PipeGeometry(100, 0.1, 1e-4);
        double nu = 1e-6, d = 0.1;
        double slope = 128 * nu * 100 / (Math.PI * G * d * d * d * d);
        var (h, dh) = PipeHeadLoss.WithDerivative(pipe, nu, flow);
        Assert.Equal(slope * flow, h, Math.Max(slope * flow * 1e-12, double.Epsilon));
        Assert.Equal(slope, dh, slope * 1e-12);
        var (hNeg, _) = PipeHeadLoss.WithDerivative(pipe, nu, -flow);
        Assert.Equal(-h, hNeg);
    }

    [Fact]
    public void WithDerivative_HugeDiameter_IsFiniteAndVanishing()
    {
        // The Reynolds number 4Q/(pi D nu) underflows to 0 for D = 1e308; the laminar loss there is 0 to double precision.
        var (h, dh) = PipeHeadLoss.WithDerivative(new PipeGeometry(100, 1e308, 1e-4), 1e-6, 0.05);
        Assert.Equal(0.0, h);
        Assert.True(double.IsFinite(dh) && dh >= 0);
    }

    [Fact]
    public void Flow_VanishingLength_IsOutsideRangeNotInfinite()
    {
        // 1 m of head over 5e-324 m of pipe would need a flow far beyond Re 1e15.
        var r = PipeFlow.Solve(new PipeGeometry(5e-324, 0.1, 1e-4), new FluidProperties(1e-6), 1.0);
        Assert.Equal(PipeStatus.OutsideRange, r.Status);
        Assert.True(double.IsFinite(r.Residual));
    }

    [Fact]
    public void Flow_VanishingHead_IsOutsideRangeBelowTheSmallestReynoldsNumber()
    {
        // 5e-324 m of head drives a flow whose Reynolds number (Hagen-Poiseuille: V = g D^2 H/(32 nu L)) is about 1e-320.
        var r = PipeFlow.Solve(new PipeGeometry(100, 0.1, 1e-4), new FluidProperties(1e-6), 5e-324);
        Assert.Equal(PipeStatus.OutsideRange, r.Status);
        // Just above the limit the laminar answer stands: Re = g D^3 H/(32 nu^2 L) = 0.01 for this head.
        double head = 0.01 * 32 * 1e-12 * 100 / (G * 1e-3);
        var laminar = PipeFlow.Solve(new PipeGeometry(100, 0.1, 1e-4), new FluidProperties(1e-6), head);
        Assert.Equal(PipeStatus.Solved, laminar.Status);
        Assert.Equal(0.01, laminar.State.Reynolds, 1e-12);
    }

    [Fact]
    public void HazenWilliamsFlow_VanishingLength_IsOutsideRange()
    {
        var r = HazenWilliams.Flow(new PipeGeometry(5e-324, 0.1, 1e-4), new FluidProperties(1e-6), 1.0, 120);
        Assert.Equal(PipeStatus.OutsideRange, r.Status);
        Assert.Equal(PipeStatus.OutsideRange, r.DarcyWeisbach.Status);
    }

    [Theory]
    [InlineData(5e-324, 100.0, 1e-4)]
    [InlineData(0.01, 5e-324, 1e-4)]
    [InlineData(0.01, 5e-324, 0.0)]
    public void Diameter_VanishingFlowOrLength_IsOutsideRangeNotInfinite(double flow, double length, double roughness)
    {
        var r = PipeDiameter.Solve(length, roughness, 0, new FluidProperties(1e-6), flow, 1.0);
        Assert.Equal(PipeStatus.OutsideRange, r.Status);
        Assert.False(r.Converged);
    }

    [Fact]
    public void Friction_LaminarAndExplicitRelations_ReportClosedForm()
    {
        var laminar = DarcyFriction.Compute(1000, 0);
        Assert.Equal(64.0 / 1000, laminar.FrictionFactor); // Hagen-Poiseuille
        Assert.Equal(0, laminar.Iterations);
        Assert.Equal(FlowSolve.Core.Numerics.SolveStatus.ClosedForm, laminar.Status);
        Assert.Equal("closed-form", FlowSolve.Core.Numerics.SolveStatusExtensions.Code(laminar.Status));
        Assert.True(laminar.Converged);
        Assert.Equal(FlowSolve.Core.Numerics.SolveStatus.ClosedForm, DarcyFriction.Compute(3000, 1e-4).Status); // Churchill
        Assert.Equal(FlowSolve.Core.Numerics.SolveStatus.ClosedForm, DarcyFriction.Compute(1e5, 1e-4, FrictionMethod.Haaland).Status);
        // The iterated relation keeps its solver codes.
        var exact = DarcyFriction.Compute(1e5, 1e-4);
        Assert.True(exact.Iterations > 0);
        Assert.NotEqual(FlowSolve.Core.Numerics.SolveStatus.ClosedForm, exact.Status);
    }
}
