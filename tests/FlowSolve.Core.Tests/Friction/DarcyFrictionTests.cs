using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Tests.Friction;

public sealed class DarcyFrictionTests
{
    [Theory]
    [InlineData(10.0)]
    [InlineData(1999.0)]
    public void Compute_Laminar_IsHagenPoiseuille(double re)
    {
        // Hagen-Poiseuille f = 64/Re (found: Praks and Brkic 2018).
        var result = DarcyFriction.Compute(re, 0.001);
        Assert.Equal(FlowRegime.Laminar, result.Regime);
        Assert.Equal(64 / re, result.FrictionFactor, 1e-15);
        Assert.Equal(0, result.Iterations);
    }

    [Fact]
    public void Compute_Transitional_UsesChurchillWithWarning()
    {
        var result = DarcyFriction.Compute(3000, 0.001);
        Assert.Equal(FlowRegime.Transitional, result.Regime);
        Assert.Equal("churchill", result.Relation);
        Assert.Equal(ExplicitFriction.Churchill(3000, 0.001), result.FrictionFactor);
        Assert.True(result.Warnings.HasFlag(FrictionWarnings.TransitionalFlow));
        Assert.Contains(DarcyFriction.Describe(result.Warnings, 3000, 0.001, result.Relation), w => w.Code == "transitional-flow");
    }

    [Fact]
    public void Compute_LaminarLimitIsConfigurable()
    {
        var result = DarcyFriction.Compute(2200, 0, options: new FrictionOptions(2300, 4000));
        Assert.Equal(FlowRegime.Laminar, result.Regime);
        Assert.Equal(64 / 2200.0, result.FrictionFactor, 1e-15);
    }

    [Fact]
    public void Compute_OutsideRange_Warns()
    {
        var result = DarcyFriction.Compute(5e8, 0.08);
        Assert.True(result.Warnings.HasFlag(FrictionWarnings.ReynoldsAboveRange));
        Assert.True(result.Warnings.HasFlag(FrictionWarnings.RelativeRoughnessAboveRange));
        Assert.True(result.Converged);
    }

    [Fact]
    public void Compute_ApproximationOutsideItsRange_Warns()
    {
        // Swamee-Jain's stated roughness range stops at 0.01 (from memory: Swamee and Jain 1976).
        var result = DarcyFriction.Compute(1e5, 0.03, FrictionMethod.SwameeJain);
        Assert.True(result.Warnings.HasFlag(FrictionWarnings.ApproximationOutOfRange));
        Assert.Equal(ExplicitFriction.SwameeJain(1e5, 0.03), result.FrictionFactor);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(double.NaN)]
    [InlineData(1e16)]
    public void Compute_BadReynolds_Throws(double re) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => DarcyFriction.Compute(re, 0));
}
