using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Tests.Friction;

/// <summary>Every partial of every friction relation against a central difference of the relation itself (a stated
/// mathematical property: the derivative of the computed function).</summary>
public sealed class FrictionSensitivityTests
{
    public static TheoryData<string, double, double> Cases => new()
    {
        { "colebrook-white", 1e5, 1e-3 },
        { "colebrook-white", 5e6, 1e-5 },
        { "colebrook-white", 6000, 0.03 },
        { "colebrook-white", 800, 1e-3 },    // laminar: 64/Re
        { "colebrook-white", 3000, 1e-3 },   // transition: Churchill
        { "swamee-jain", 2e5, 2e-4 },
        { "haaland", 2e5, 2e-4 },
        { "churchill", 2e5, 2e-4 },
        { "churchill", 500, 2e-4 },
        { "serghides", 2e5, 2e-4 },
        { "serghides", 1e7, 1e-6 },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Of_MatchesCentralDifferenceOfCompute(string method, double reynolds, double relativeRoughness)
    {
        FrictionMethodInfo.TryParse(method, out var info);
        double F(double re, double r) => DarcyFriction.Compute(re, r, info.Method).FrictionFactor;
        var result = DarcyFriction.Compute(reynolds, relativeRoughness, info.Method);
        var partials = FrictionSensitivity.Of(result, reynolds, relativeRoughness);
        CentralDifference.Check("df/dRe", partials.Reynolds, re => F(re, relativeRoughness), reynolds);
        if (result.Relation == DarcyFriction.LaminarRelation)
            Assert.Equal(0.0, partials.RelativeRoughness); // 64/Re does not depend on e/D
        else
            CentralDifference.Check("df/dr", partials.RelativeRoughness, r => F(reynolds, r), relativeRoughness);
    }

    [Fact]
    public void Of_Laminar_IsMinusFOverRe()
    {
        // f = 64/Re, so df/dRe = -64/Re^2 exactly.
        var result = DarcyFriction.Compute(1000, 0.01);
        Assert.Equal(-64.0 / 1e6, FrictionSensitivity.Of(result, 1000, 0.01).Reynolds, 1e-18);
    }
}
