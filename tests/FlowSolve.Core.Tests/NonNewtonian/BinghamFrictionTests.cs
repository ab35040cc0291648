using FlowSolve.Core.NonNewtonian;
using FlowSolve.Core.Numerics;
using MathNet.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.NonNewtonian;

public sealed class BinghamFrictionTests
{
    /// <summary>Buckingham-Reiner in its published form, F(f) = f - (16/Re)(1 + He/(6 Re) - He^4/(3 f^3 Re^7)), solved by
    /// MathNet's Brent. The physical root has tau0/tau_w &lt;= 1, that is f &gt;= 2 He/Re^2, where F &lt; 0; F &gt; 0 at
    /// f = (16/Re)(1 + He/(6 Re)): that is the bracket.</summary>
    private static double BrentBuckinghamReiner(double re, double he)
    {
        double upper = 16 / re * (1 + he / (6 * re));
        double lower = 2 * he / (re * re);
        return Brent.FindRoot(f => f - 16 / re * (1 + he / (6 * re) - Math.Pow(he, 4) / (3 * f * f * f * Math.Pow(re, 7))),
            lower, upper, 1e-16 * upper, 1000);
    }

    public static TheoryData<double, double> Grid()
    {
        var data = new TheoryData<double, double>();
        foreach (double re in new[] { 10.0, 500, 2000, 2e4 })
        foreach (double he in new[] { 10.0, 1e3, 1e5, 1e6 })
            data.Add(re, he);
        return data;
    }

    [Theory]
    [MemberData(nameof(Grid))]
    public void BuckinghamReiner_AgreesWithMathNetBrent_To1e10(double re, double he)
    {
        var r = BinghamFriction.BuckinghamReiner(re, he);
        double brent = BrentBuckinghamReiner(re, he);
        Assert.True(r.Converged, r.Status.Reason());
        Assert.Equal(brent, r.Fanning, 1e-10 * brent);
        Assert.InRange(r.Iterations, 1, 12);
        // The published form's residual at the returned factor is at rounding level.
        Assert.True(Math.Abs(BinghamFriction.BuckinghamReinerResidual(r.Fanning, re, he)) < 1e-9 * (1 + he / re));
        // The plug ratio is tau0/tau_w = 2 He/(f Re^2).
        Assert.Equal(2 * he / (r.Fanning * re * re), r.PlugRatio, 1e-12 * r.PlugRatio);
    }

    [Theory]
    [InlineData(1.0)]
    [InlineData(800.0)]
    [InlineData(1e6)]
    public void BuckinghamReiner_AtHedstromZero_IsTheNewtonianLaminarLaw(double re)
    {
        var r = BinghamFriction.BuckinghamReiner(re, 0);
        Assert.Equal(16 / re, r.Fanning);
        Assert.Equal(SolveStatus.ClosedForm, r.Status);
        Assert.Equal(0, r.Iterations);
    }

    [Fact]
    public void BuckinghamReiner_SmallHedstrom_ApproachesFirstOrderLimit()
    {
        // As He/Re -> 0 the He^4 term vanishes to fourth order: f -> (16/Re)(1 + He/(6 Re)).
        double re = 1000, he = 1e-3;
        double limit = 16 / re * (1 + he / (6 * re));
        Assert.Equal(limit, BinghamFriction.BuckinghamReiner(re, he).Fanning, 1e-14 * limit);
    }

    [Fact]
    public void BuckinghamReiner_PlugLimit_WallStressTendsToTheYieldStress()
    {
        // As the flow vanishes (He/Re -> infinity) tau_w -> tau0, so the plug ratio -> 1 and f Re^2/(2 He) -> 1.
        var r = BinghamFriction.BuckinghamReiner(1e-3, 1e6);
        Assert.True(r.Converged);
        Assert.InRange(r.PlugRatio, 0.999, 1.0);
        // And it still agrees with Brent on the published form.
        double brent = BrentBuckinghamReiner(1e-3, 1e6);
        Assert.Equal(brent, r.Fanning, 1e-9 * brent);
    }

    [Fact]
    public void DarbyTurbulent_ClosedForm()
    {
        // f_T = 10^a Re^-0.193, a = -1.47 (1 + 0.146 exp(-2.9e-5 He)) (Darby, Mun and Boger 1992; from memory).
        foreach (var (re, he) in new[] { (1e4, 0.0), (5e4, 1e5), (2e5, 3e6) })
        {
            double a = -1.47 * (1 + 0.146 * Math.Exp(-2.9e-5 * he));
            double expected = Math.Pow(10, a) / Math.Pow(re, 0.193);
            Assert.Equal(expected, BinghamFriction.DarbyTurbulent(re, he), 1e-13 * expected);
        }
    }

    [Theory]
    [InlineData(0.01, 0.004, 2.0)]
    [InlineData(0.003, 0.005, 3.7)]
    [InlineData(0.02, 0.01, 21.7)]
    public void Combine_EqualsTheDirectFormWhereItIsFinite(double a, double b, double m)
    {
        double direct = Math.Pow(Math.Pow(a, m) + Math.Pow(b, m), 1 / m);
        Assert.Equal(direct, BinghamFriction.Combine(a, b, m), 1e-14 * direct);
    }

    [Fact]
    public void Combine_LargeExponent_DoesNotOverflowAndTendsToTheLarger()
    {
        // m = 1.7 + 40000/Re reaches 4e7 at Re = 1e-3: the direct form overflows (16000^m is infinite).
        double m = BinghamFriction.CombinationExponent(1e-3);
        Assert.False(double.IsFinite(Math.Pow(Math.Pow(16000.0, m) + Math.Pow(0.01, m), 1 / m)));
        Assert.Equal(16000.0, BinghamFriction.Combine(16000, 0.01, m));
        Assert.Equal(2 * Math.Pow(2, 1 / m), BinghamFriction.Combine(2, 2, m), 1e-15);
    }

    [Theory]
    [InlineData(300, 1e4)]
    [InlineData(3000, 1e5)]
    [InlineData(2e4, 1e5)]
    [InlineData(1e5, 10)]
    public void Combined_LogSlope_MatchesCentralDifference(double re, double he)
    {
        // Through the whole model: fix He by fixing the fluid and diameter, and vary the velocity (Re is proportional to V).
        double rho = 1000, d = 0.1;
        double mu = rho * 2.0 * d / re; // Re at V = 2 m/s
        double tau0 = he * mu * mu / (rho * d * d);
        var fluid = NonNewtonianFluid.BinghamPlastic(rho, tau0, mu);
        var r = NonNewtonianFriction.Compute(fluid, 2.0, d);
        CentralDifference.Check("dlnf/dlnV", r.DLnFDLnVelocity, lnV => Math.Log(NonNewtonianFriction.Compute(fluid, Math.Exp(lnV), d).Fanning),
            Math.Log(2.0), step: 1e-3);
    }
    /// <summary>
    /// The flow of a Bingham plastic at a given wall stress, from the constitutive law alone: shear rate
    /// gamma(s) = max(0, (tau_w s/R - tau0)/mu_p) at radius s (the stress grows linearly from the axis), velocity
    /// u(r) = integral of gamma from r to R (no slip), flow Q = integral of 2 pi r u(r) from 0 to R, both by MathNet's
    /// Gauss-Legendre quadrature split at the plug radius R tau0/tau_w (the integrands are polynomials on each piece, so
    /// the quadrature is exact to rounding). An independent route to the laminar law: no friction factor, no
    /// Buckingham-Reiner equation.
    /// </summary>
    private static double ProfileFlow(double tauW, double tau0, double mu, double radius)
    {
        double rp = radius * tau0 / tauW;
        double Gamma(double s) => Math.Max(0, (tauW * s / radius - tau0) / mu);
        double U(double r) => r >= rp
            ? Integrate.GaussLegendre(Gamma, r, radius, 16)
            : Integrate.GaussLegendre(Gamma, rp, radius, 16); // the plug moves as one at u(rp)
        double Ring(double r) => 2 * Math.PI * r * U(r);
        return Integrate.GaussLegendre(Ring, 0, rp, 32) + Integrate.GaussLegendre(Ring, rp, radius, 32);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(0.1)]
    [InlineData(0.5)]
    [InlineData(0.9)]
    [InlineData(0.99)]
    [InlineData(0.999)]
    public void BuckinghamReiner_EqualsTheIntegratedPlugFlowProfile(double plugRatio)
    {
        // A paste of 1450 kg/m3, plastic viscosity 0.06 Pa s, in a 150 mm pipe at a wall stress of 40 Pa (the yield stress
        // set by the plug ratio). The mean velocity from the profile gives Re and He; Buckingham-Reiner must give back
        // f = tau_w / (rho V^2/2) and the plug ratio.
        double rho = 1450, mu = 0.06, d = 0.15, tauW = 40, tau0 = plugRatio * tauW;
        double q = ProfileFlow(tauW, tau0, mu, d / 2);
        double v = q / (Math.PI * d * d / 4);
        double re = BinghamFriction.Reynolds(rho, mu, v, d), he = BinghamFriction.Hedstrom(rho, tau0, mu, d);
        var r = BinghamFriction.BuckinghamReiner(re, he);
        double expected = tauW / (rho * v * v / 2);
        Assert.True(r.Converged);
        Assert.Equal(expected, r.Fanning, 1e-12 * expected);
        Assert.Equal(plugRatio, r.PlugRatio, 1e-12);
    }
}
