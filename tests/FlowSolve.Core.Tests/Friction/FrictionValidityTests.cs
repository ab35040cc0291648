using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Tests.Friction;

/// <summary>
/// The validity a friction result reports is the published range of the relation it used (the ranges themselves are
/// checked against their sources in <see cref="FrictionMethodInfoTests"/>), and <see cref="DarcyFriction.ValidityAt"/>
/// states the same ranges as computing the factor would, without computing it. The Colebrook-White residual at the
/// returned answer is the equation evaluated there, and is within rounding of zero.
/// </summary>
public class FrictionValidityTests
{
    [Theory]
    [InlineData(800, 0.001)]       // laminar
    [InlineData(3000, 0.001)]      // transition zone (Churchill)
    [InlineData(75000, 0.005)]     // turbulent (Colebrook-White), inside its range
    [InlineData(2e8, 0.08)]        // turbulent, outside the published range on both inputs
    public void ValidityAt_StatesTheRangesOfTheRelationComputeUses(double reynolds, double relativeRoughness)
    {
        var options = FrictionOptions.Default;
        var computed = DarcyFriction.Compute(reynolds, relativeRoughness, FrictionMethod.ColebrookWhite, options);
        Assert.Equal(computed.Validity(options), DarcyFriction.ValidityAt(reynolds, relativeRoughness, options));
        foreach (var v in computed.Validity(options))
            Assert.Equal(v.Method, computed.Relation);
    }

    [Fact]
    public void Validity_OutsideTheRange_IsReportedAsOutside()
    {
        var v = DarcyFriction.ValidityAt(2e8, 0.08, FrictionOptions.Default);
        Assert.All(v, c => Assert.False(c.InRange));
        var inside = DarcyFriction.ValidityAt(75000, 0.005, FrictionOptions.Default);
        Assert.All(inside, c => Assert.True(c.InRange));
    }

    [Theory]
    [InlineData(75000, 0.005)]
    [InlineData(1e7, 0.0)]
    [InlineData(4500, 0.05)]
    public void ResidualAtAnswer_IsColebrookWhiteAtTheReturnedFactor(double reynolds, double relativeRoughness)
    {
        var r = DarcyFriction.Compute(reynolds, relativeRoughness, FrictionMethod.ColebrookWhite);
        double x = 1 / Math.Sqrt(r.FrictionFactor);
        // Colebrook (1939) in x = 1/sqrt(f): x + 2 log10(e/(3.7 D) + 2.51 x / Re) = 0.
        double residual = x + 2 * Math.Log10(relativeRoughness / 3.7 + 2.51 * x / reynolds);
        Assert.Equal(residual, r.ResidualAtAnswer, 1e-15);
        Assert.True(Math.Abs(r.ResidualAtAnswer) <= 1e-13 * x);
    }
}
