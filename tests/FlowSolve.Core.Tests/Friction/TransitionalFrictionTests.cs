using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Tests.Friction;

/// <summary>The network solver's transition-zone relation: Churchill (1977) inside the zone, cubic joins at its ends.</summary>
public sealed class TransitionalFrictionTests
{
    public static TheoryData<double> Roughness => new() { 0.0, 1e-5, 5e-4, 2e-3, 0.01, 0.05 };

    /// <summary>Inside the zone the value is the single pipe's Churchill bit for bit (the same operations as
    /// <see cref="ExplicitFriction.Churchill"/>), and df/dRe, now by the chain rule through Churchill's terms, equals the
    /// Richardson-extrapolated central difference of <see cref="ExplicitFriction.Churchill"/> itself (a stated property:
    /// the derivative of the function the solver evaluates).</summary>
    [Theory]
    [MemberData(nameof(Roughness))]
    public void InsideTheZone_IsChurchillWithItsDerivative(double relativeRoughness)
    {
        var join = new TransitionalFriction(relativeRoughness, FrictionOptions.Default);
        for (double re = 2150; re < 3780; re += 97.3)
        {
            Assert.True(join.IsChurchill(re), $"Re {re} should be inside the Churchill band");
            var (f, dfdRe) = join.Evaluate(re);
            Assert.Equal(ExplicitFriction.Churchill(re, relativeRoughness), f);
            CentralDifference.Check($"df/dRe at Re {re}, e/D {relativeRoughness}", dfdRe,
                x => ExplicitFriction.Churchill(x, relativeRoughness), re, step: 1e-3 * re, tolerance: 1e-7);
        }
    }

    /// <summary>The joins meet their neighbours with value and slope: at the laminar limit 64/Re and -64/Re^2, at the
    /// join's inner end Churchill and its derivative, at the turbulent limit Colebrook-White (each by its own solve).</summary>
    [Theory]
    [MemberData(nameof(Roughness))]
    public void Joins_MatchTheirNeighbours(double relativeRoughness)
    {
        var limits = FrictionOptions.Default;
        var join = new TransitionalFriction(relativeRoughness, limits);
        double lo = limits.LaminarLimit, hi = limits.TurbulentLimit;

        var (fLo, dLo) = join.Evaluate(lo);
        Assert.Equal(64 / lo, fLo, 1e-14 * fLo);
        Assert.Equal(-64 / (lo * lo), dLo, 1e-10 * Math.Abs(dLo));

        var cw = ColebrookWhite.Solve(hi, relativeRoughness);
        var (fHi, dHi) = join.Evaluate(hi);
        Assert.Equal(cw.FrictionFactor, fHi, 1e-14 * fHi);
        Assert.Equal(cw.DerivativeReynolds, dHi, 1e-10 * Math.Abs(dHi));

        foreach (double end in new[] { lo * (1 + TransitionalFriction.JoinWidth), hi * (1 - TransitionalFriction.JoinWidth) })
        {
            var (f, d) = join.Evaluate(end);
            Assert.Equal(ExplicitFriction.Churchill(end, relativeRoughness), f, 1e-13 * f);
            double fd = CentralDifference.Derivative(x => ExplicitFriction.Churchill(x, relativeRoughness), end, 1e-3 * end);
            Assert.Equal(fd, d, 1e-7 * Math.Abs(fd));
        }
    }
}
