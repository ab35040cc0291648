using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Pipes;

public sealed class PipeFlowTests
{
    private const double Foot = 0.3048;

    [Fact]
    public void Solve_WhiteReverseOfExample6_6_GivesPublishedVelocity()
    {
        // F. M. White, Fluid Mechanics, the worked example that reverses Example 6.6 (found; the viscosity is from
        // memory): 4.5 ft of head loss over 200 ft of 6-in pipe, e/D = 0.0008, nu = 1.1e-5 ft2/s: V = 6.05 ft/s.
        double d = 0.5 * Foot;
        var pipe = new PipeGeometry(200 * Foot, d, 0.0008 * d);
        var result = PipeFlow.Solve(pipe, new FluidProperties(1.1e-5 * Foot * Foot), 4.5 * Foot);
        Assert.Equal(PipeStatus.Solved, result.Status);
        Assert.True(result.Converged);
        Assert.Equal(6.05, result.State.Velocity / Foot, 0.01); // three significant figures
        Assert.InRange(result.Iterations, 1, 6);
        Assert.InRange(result.FrictionIterations, result.Iterations, 6 * (result.Iterations + 1));
    }

    [Fact]
    public void Solve_ConcreteMainAtGradientOneIn250_GivesPublishedVelocity()
    {
        // A published worked solution (found): D = 1.2 m concrete, e = 0.60 mm, gradient 1 in 250,
        // nu = 1.005e-6 m2/s, v = 2.363 m/s with 2.5 in place of Colebrook's 2.51; 2.36 m/s expected with 2.51.
        var pipe = new PipeGeometry(250, 1.2, 0.60e-3);
        var result = PipeFlow.Solve(pipe, new FluidProperties(1.005e-6), 1.0);
        Assert.Equal(2.36, result.State.Velocity, 0.005);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 1, 6);
    }

    [Fact]
    public void Solve_Laminar_IsHagenPoiseuille()
    {
        // Hagen-Poiseuille (f = 64/Re; found: Praks and Brkic 2018): Q = pi g H D^4 / (128 nu L).
        var pipe = new PipeGeometry(30, 0.01, 1e-5);
        const double nu = 1e-4, head = 0.5;
        var result = PipeFlow.Solve(pipe, new FluidProperties(nu), head);
        double expected = Math.PI * Physical.StandardGravity * head * 1e-8 / (128 * nu * 30);
        Assert.Equal(FlowRegime.Laminar, result.State.Regime);
        Assert.Equal(expected, result.Flow, expected * 1e-12);
        Assert.InRange(result.Iterations, 0, 2);
        Assert.Equal(0, result.FrictionIterations);
    }

    [Fact]
    public void Solve_ElevationConvention_LossesAbsorbAvailableMinusRise()
    {
        // Stated convention: hf + hm = availableHead - elevationRise. Checked against the head-loss calculation.
        var pipe = new PipeGeometry(800, 0.25, 0.15e-3, 4.0);
        var fluid = new FluidProperties(1.004e-6, 998.2);
        var result = PipeFlow.Solve(pipe, fluid, availableHead: 40, elevationRise: 12);
        Assert.Equal(28, result.DrivingHead);
        var back = PipeHeadLoss.Compute(pipe, fluid, result.Flow, elevationRise: 12);
        Assert.Equal(40, back.TotalHead, 1e-10 * 40);
        Assert.Equal(998.2 * Physical.StandardGravity * 28, result.PressureDrop!.Value, 1e-6);
    }

    [Theory]
    [InlineData(10.0, 10.0)]
    [InlineData(5.0, 12.0)]
    [InlineData(0.0, 0.0)]
    public void Solve_HeadNotAboveRise_IsNoFlowNotException(double available, double rise)
    {
        var result = PipeFlow.Solve(new PipeGeometry(100, 0.1, 0), new FluidProperties(1e-6), available, rise);
        Assert.Equal(PipeStatus.NoFlow, result.Status);
        Assert.False(result.Converged);
        Assert.Equal(0, result.Flow);
        Assert.Equal("no-flow", result.Status.Code());
    }

    [Theory]
    [InlineData(0.0, 0.1, "length")]
    [InlineData(10.0, -0.1, "diameter")]
    public void Solve_BadGeometry_ThrowsWithParameterName(double length, double diameter, string name) =>
        Assert.Equal(name, Assert.Throws<ArgumentOutOfRangeException>(() =>
            PipeFlow.Solve(new PipeGeometry(length, diameter, 0), new FluidProperties(1e-6), 1)).ParamName);

    [Fact]
    public void Solve_NonFiniteHead_Throws() =>
        Assert.Equal("availableHead", Assert.Throws<ArgumentOutOfRangeException>(() =>
            PipeFlow.Solve(new PipeGeometry(10, 0.1, 0), new FluidProperties(1e-6), double.PositiveInfinity)).ParamName);

    /// <summary>Laminar, transitional and turbulent flows, smooth and rough, with and without minor losses.</summary>
    public static TheoryData<double, double, double, double> Grid()
    {
        var data = new TheoryData<double, double, double, double>();
        foreach (double d in new[] { 0.02, 0.15, 1.0 })
        foreach (double relativeRoughness in new[] { 0.0, 1e-4, 0.01 })
        foreach (double k in new[] { 0.0, 5.0 })
        foreach (double re in new[] { 500.0, 1500.0, 2500.0, 3500.0, 1e4, 1e5, 1e6, 1e7 })
            data.Add(d, relativeRoughness * d, k, re);
        return data;
    }

    [Theory]
    [MemberData(nameof(Grid))]
    public void Solve_RoundTripFromHeadLoss_RecoversFlow(double d, double e, double k, double re)
    {
        // Property: flow -> head loss -> flow recovers the flow to 1e-10 relative.
        const double nu = 1e-6;
        var pipe = new PipeGeometry(200, d, e, k);
        double q = re * nu * pipe.Area / d;
        var forward = PipeHeadLoss.Compute(pipe, new FluidProperties(nu), q);
        var back = PipeFlow.Solve(pipe, new FluidProperties(nu), forward.HeadLoss);
        Assert.Equal(PipeStatus.Solved, back.Status);
        Assert.Equal(q, back.Flow, q * 1e-10);
        Assert.InRange(back.Iterations, 0, 8);
    }

    [Theory]
    [MemberData(nameof(Grid))]
    public void Solve_AgreesWithMathNetBrent(double d, double e, double k, double re)
    {
        // Independent check: MathNet.Numerics' Brent on h(Q) - H = 0 with the same head-loss relation.
        const double nu = 1.3e-6;
        var pipe = new PipeGeometry(75, d, e, k);
        var fluid = new FluidProperties(nu);
        double q0 = re * nu * pipe.Area / d;
        double head = PipeHeadLoss.Compute(pipe, fluid, q0).HeadLoss * 1.01; // not a head this code produced
        var ours = PipeFlow.Solve(pipe, fluid, head);
        double brent = Brent.FindRoot(q => PipeHeadLoss.Compute(pipe, fluid, q).HeadLoss - head,
            q0 * 0.5, q0 * 2, 1e-16 * q0, 200);
        Assert.Equal(PipeStatus.Solved, ours.Status);
        Assert.Equal(brent, ours.Flow, brent * 1e-10);
    }

    [Fact]
    public void Solve_HeadInsideRegimeJump_ReportsLimitNotException()
    {
        // Property: the laminar law and Churchill's interpolation differ at Re = 2000, so heads between the two
        // values have no exact flow; the solve ends at the limit with a status and a warning.
        const double nu = 1e-6;
        var pipe = new PipeGeometry(100, 0.05, 0);
        var fluid = new FluidProperties(nu);
        double q = 2000 * nu * pipe.Area / 0.05;
        double velocityHead = Math.Pow(q / pipe.Area, 2) / (2 * Physical.StandardGravity);
        double laminar = 64.0 / 2000 * 100 / 0.05 * velocityHead;
        double upper = ExplicitFriction.Churchill(2000, 0) * 100 / 0.05 * velocityHead;
        Assert.True(upper > laminar);
        var result = PipeFlow.Solve(pipe, fluid, 0.5 * (laminar + upper));
        Assert.Equal(PipeStatus.SolvedAtRegimeLimit, result.Status);
        Assert.True(result.Warnings.HasFlag(PipeWarnings.AtRegimeLimit));
        Assert.Equal(q, result.Flow, q * 1e-9);
        Assert.True(result.Iterations <= PipeFlow.MaxIterations);
    }

    [Fact]
    public void Solve_Trace_RecordsOuterIterations()
    {
        var trace = new SolverTrace();
        var result = PipeFlow.Solve(new PipeGeometry(500, 0.2, 0.26e-3), new FluidProperties(1e-5), 117, trace: trace);
        Assert.Equal(result.Iterations, trace.Steps.Count);
    }
}
