using MathNet.Numerics;
using FlowSolve.Core.Friction;
using FlowSolve.Core.NonNewtonian;
using FlowSolve.Core.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.NonNewtonian;

public sealed class PowerLawFrictionTests
{
    /// <summary>Dodge-Metzner in its published form, in f: 1/sqrt(f) - (4.0/n^0.75) log10(Re f^(1-n/2)) + 0.4/n^1.2 = 0,
    /// solved independently by MathNet's Brent over f in [1e-6, 0.5].</summary>
    private static double BrentDodgeMetzner(double re, double n) =>
        Brent.FindRoot(f => 1 / Math.Sqrt(f) - 4.0 / Math.Pow(n, 0.75) * Math.Log10(re * Math.Pow(f, 1 - n / 2)) + 0.4 / Math.Pow(n, 1.2),
            1e-7, 0.5, 1e-18, 1000);

    public static TheoryData<double, double> Grid()
    {
        var data = new TheoryData<double, double>();
        foreach (double n in new[] { 0.1, 0.36, 0.5, 0.7, 1.0, 1.4, 2.0 })
        foreach (double re in new[] { 2e3, 5e3, 3.6e4, 1e5, 1e7 })
            data.Add(re, n);
        return data;
    }

    [Theory]
    [MemberData(nameof(Grid))]
    public void DodgeMetzner_AgreesWithMathNetBrent_To1e12(double re, double n)
    {
        var r = PowerLawFriction.DodgeMetzner(re, n);
        double brent = BrentDodgeMetzner(re, n);
        Assert.True(r.Converged, r.Status.Reason());
        Assert.Equal(brent, r.Fanning, 1e-12 * brent);
        Assert.InRange(r.Iterations, 1, 12);
        // The residual reported is that of the returned factor.
        Assert.Equal(PowerLawFriction.DodgeMetznerResidual(r.Fanning, re, n), r.Residual, 1e-12);
    }

    [Theory]
    [InlineData(4e3)]
    [InlineData(1e4)]
    [InlineData(1e5)]
    [InlineData(1e6)]
    public void DodgeMetzner_AtNOne_IsPrandtlsSmoothPipeLawInFanningForm(double re)
    {
        // Prandtl's smooth-pipe law, Fanning form 1/sqrt(f) = 4.0 log10(Re sqrt(f)) - 0.4 (Dodge and Metzner 1959 reduce to
        // it at n = 1; from memory), solved by Brent.
        double prandtl = Brent.FindRoot(f => 1 / Math.Sqrt(f) - 4.0 * Math.Log10(re * Math.Sqrt(f)) + 0.4, 1e-5, 0.1, 1e-18, 1000);
        Assert.Equal(prandtl, PowerLawFriction.DodgeMetzner(re, 1.0).Fanning, 1e-12 * prandtl);
        // And within 1 percent of the Darcy form 1/sqrt(lambda) = 2 log10(Re sqrt(lambda)) - 0.8 (Prandtl-von Karman, as
        // labelled on a reproduction of the Moody diagram), whose constant the Fanning form rounds (-0.3959 to -0.4).
        double darcy = Brent.FindRoot(l => 1 / Math.Sqrt(l) - 2 * Math.Log10(re * Math.Sqrt(l)) + 0.8, 1e-4, 0.2, 1e-18, 1000);
        Assert.Equal(darcy, 4 * PowerLawFriction.DodgeMetzner(re, 1.0).Fanning, 0.01 * darcy);
    }

    [Fact]
    public void DodgeMetzner_AtNOne_MatchesExactColebrookWhiteSmoothWithinHalfAPercent()
    {
        // An independent smooth-pipe law already in FlowSolve (Colebrook-White with e/D = 0, tested against its own sources).
        foreach (double re in new[] { 1e4, 1e5, 1e6 })
        {
            double cw = ColebrookWhite.Solve(re, 0).FrictionFactor;
            Assert.Equal(cw, 4 * PowerLawFriction.DodgeMetzner(re, 1.0).Fanning, 0.005 * cw);
        }
    }

    [Fact]
    public void Reynolds_AtNOne_IsTheNewtonianReynoldsNumber()
    {
        // With n = 1 and K = mu, Re_MR = rho V D / mu exactly (closed form).
        double rho = 1100, mu = 0.02, v = 1.7, d = 0.15;
        Assert.Equal(rho * v * d / mu, PowerLawFriction.Reynolds(rho, mu, 1.0, v, d), 1e-12 * rho * v * d / mu);
    }

    [Fact]
    public void Reynolds_ClosedForm_AtShearThinningIndex()
    {
        double rho = 1200, k = 0.5, n = 0.6, v = 2, d = 0.1;
        double expected = rho * Math.Pow(v, 2 - n) * Math.Pow(d, n) / (k * Math.Pow(8, n - 1) * Math.Pow((3 * n + 1) / (4 * n), n));
        Assert.Equal(expected, PowerLawFriction.Reynolds(rho, k, n, v, d), 1e-12 * expected);
    }

    [Fact]
    public void CriticalReynolds_NewtonianValueAndMaximumNearPublishedFigures()
    {
        // About 2100 for a Newtonian fluid (Ryan and Johnson 1959; common practice), and a broad maximum of about 2400
        // near n = 0.4 (Ryan and Johnson's curve; from memory).
        Assert.Equal(2100, PowerLawFriction.CriticalReynolds(1.0), 0.001 * 2100);
        double best = 0, bestN = 0;
        for (int i = 0; i <= 900; i++)
        {
            double n = 0.1 + i * 0.001, re = PowerLawFriction.CriticalReynolds(n);
            if (re > best) (best, bestN) = (re, n);
        }
        Assert.Equal(2400, best, 0.01 * 2400);
        Assert.InRange(bestN, 0.3, 0.5);
    }

    [Fact]
    public void CriticalReynolds_ClosedForm()
    {
        foreach (double n in new[] { 0.2, 0.5, 1.0, 1.5 })
        {
            double expected = 6464 * n * Math.Pow(2 + n, (2 + n) / (1 + n)) / Math.Pow(1 + 3 * n, 2);
            Assert.Equal(expected, PowerLawFriction.CriticalReynolds(n), 1e-12 * expected);
        }
    }

    [Fact]
    public void LaminarWallStress_IsSixteenOverReTimesDynamicPressure()
    {
        // Closed-form identity: tau_w = K ((3n+1)/(4n) 8V/D)^n equals (16/Re_MR) rho V^2 / 2.
        double rho = 1300, k = 3.2, n = 0.45, v = 0.8, d = 0.08;
        double re = PowerLawFriction.Reynolds(rho, k, n, v, d);
        double tau = PowerLawFriction.LaminarWallShearStress(k, n, v, d);
        Assert.Equal(16 / re * rho * v * v / 2, tau, 1e-12 * tau);
    }

    [Theory]
    [InlineData(5e3, 0.5)]
    [InlineData(1e5, 1.0)]
    [InlineData(2e4, 1.6)]
    public void DodgeMetzner_LogSlope_MatchesCentralDifference(double re, double n)
    {
        var r = PowerLawFriction.DodgeMetzner(re, n);
        CentralDifference.Check("dlnf/dlnRe", r.DLnFDLnReynolds, lnRe => Math.Log(PowerLawFriction.DodgeMetzner(Math.Exp(lnRe), n).Fanning),
            Math.Log(re), step: 1e-3);
    }

    [Fact]
    public void DodgeMetzner_RefusesIndexOutsideDomain()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => PowerLawFriction.DodgeMetzner(1e4, 0));
        Assert.Throws<ArgumentOutOfRangeException>(() => PowerLawFriction.DodgeMetzner(1e4, 2.5));
        Assert.Throws<ArgumentOutOfRangeException>(() => PowerLawFriction.DodgeMetzner(double.NaN, 1));
    }
    [Theory]
    [InlineData(0.3)]
    [InlineData(0.6)]
    [InlineData(1.0)]
    [InlineData(1.5)]
    public void LaminarLaw_EqualsTheIntegratedVelocityProfile(double n)
    {
        // From the constitutive law alone: at a wall stress tau_w the stress at radius s is tau_w s/R, the shear rate
        // (tau_w s/(R K))^(1/n), the velocity u(r) its integral from r to R, the flow the integral of 2 pi r u(r); both by
        // MathNet's double-exponential quadrature. The laminar law (f = 16/Re_MR, as the wall stress
        // K ((3n+1)/(4n) 8V/D)^n) must give back tau_w at the mean velocity of that profile.
        double k = 0.5, d = 0.1, radius = d / 2, tauW = 30;
        double Gamma(double s) => Math.Pow(tauW * s / (radius * k), 1 / n);
        double U(double r) => Integrate.DoubleExponential(Gamma, r, radius, 1e-15);
        double q = Integrate.DoubleExponential(r => 2 * Math.PI * r * U(r), 0, radius, 1e-15);
        double v = q / (Math.PI * radius * radius);
        double tau = PowerLawFriction.LaminarWallShearStress(k, n, v, d);
        Assert.Equal(tauW, tau, 1e-10 * tauW);
        // The same through the Reynolds number: 16/Re_MR = tau_w/(rho V^2/2).
        double rho = 1200, re = PowerLawFriction.Reynolds(rho, k, n, v, d);
        Assert.Equal(tauW / (rho * v * v / 2), 16 / re, 1e-10 * 16 / re);
    }
}
