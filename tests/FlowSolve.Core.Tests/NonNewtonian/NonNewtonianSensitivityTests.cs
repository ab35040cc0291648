using FlowSolve.Core.NonNewtonian;
using MathNet.Numerics.Differentiation;

namespace FlowSolve.Core.Tests.NonNewtonian;

/// <summary>
/// <see cref="NonNewtonianSensitivity"/> against MathNet's numerical differentiation of the same Core calls (an
/// independent library: a five-point central difference, error O(h^4), with an absolute step of 1e-4 |x|, so its
/// truncation error is near 1e-16 and its rounding error near 1e-12 relative; 1e-6 agreement tests the derivative).
/// Every regime: the power law laminar, turbulent, and just above the critical Reynolds number (the warned band);
/// Bingham plastics at low and high Hedstrom numbers, near the transition and close to the plug limit. The cases sit at
/// least 1 percent in Re away from the power law's jump at Re_c, which has no derivative.
/// </summary>
public sealed class NonNewtonianSensitivityTests
{
    private const double Tolerance = 1e-6;

    // Slots of the parameter vector: the given quantity, D, L, K, rho, K_c, n, tau0, mu_p.
    private static readonly string[] Names = ["given", "diameter", "length", "minorLossCoefficient", "density", "consistencyIndex",
        "flowBehaviorIndex", "yieldStress", "plasticViscosity"];

    private static double[] Slots(in NonNewtonianPartials p) =>
        [p.Given, p.Diameter, p.Length, p.MinorLossCoefficient, p.Density, p.ConsistencyIndex, p.FlowBehaviorIndex, p.YieldStress, p.PlasticViscosity];

    private static NonNewtonianFluid Fluid(bool power, double[] x) => power
        ? NonNewtonianFluid.PowerLaw(x[4], x[5], x[6])
        : NonNewtonianFluid.BinghamPlastic(x[4], x[7], x[8]);

    /// <summary>MathNet's five-point derivative of <paramref name="f"/> in slot <paramref name="i"/> against the analytic one.</summary>
    private static void Check(string what, double analytic, Func<double[], double> f, double[] x, int i)
    {
        double h = 1e-4 * Math.Abs(x[i]);
        var nd = new NumericalDerivative(5, 2) { StepType = StepType.Absolute, StepSize = h };
        double fd = nd.EvaluateDerivative(v => { var c = (double[])x.Clone(); c[i] = v; return f(c); }, x[i], 1);
        double error = Math.Abs(analytic - fd);
        double scale = Math.Abs(x[i] / f(x));
        // A derivative that is zero in exact arithmetic leaves only rounding in the difference: it passes at 1e-9 in elasticity.
        Assert.True(error <= Tolerance * Math.Abs(fd) || error * scale < 1e-9,
            $"{what}/d{Names[i]}: analytic {analytic:R}, MathNet {fd:R}, relative error {error / Math.Abs(fd):E2}");
    }

    /// <summary>Checks every applicable slot of each output against MathNet.</summary>
    private static int CheckAll(NonNewtonianSensitivities s, double[] x, Func<double[], (double Output, double Darcy, double Re, double V)> f)
    {
        int checks = 0;
        var outputs = new (string Name, NonNewtonianPartials P, Func<double[], double> F)[]
        {
            ("output", s.Output, v => f(v).Output), ("frictionFactor", s.FrictionFactor, v => f(v).Darcy),
            ("reynolds", s.Reynolds, v => f(v).Re), ("velocity", s.Velocity, v => f(v).V),
        };
        foreach (var (name, p, fn) in outputs)
        {
            var d = Slots(p);
            for (int i = 0; i < d.Length; i++)
            {
                if (double.IsNaN(d[i])) continue;
                Check("d" + name, d[i], fn, x, i);
                checks++;
            }
        }
        return checks;
    }

    // Power law: K = 0.5 Pa s^n, n = 0.6, rho = 1200 (Vandrel Vale's drilling mud, invented) at several velocities;
    // Re_c(0.6) is about 2250. Bingham: rho, tau0, mu_p chosen for the Hedstrom number wanted.
    public static TheoryData<string, double, double, double, double, double, double, double> FrictionCases() => new()
    {
        // name, V, D, rho, K, n, tau0, mu_p
        { "power-law laminar", 1.0, 0.1, 1200, 0.5, 0.6, 0, 0 },
        { "power-law just above Re_c (warned band)", 5.8, 0.1, 1200, 0.5, 0.6, 0, 0 },
        { "power-law turbulent", 12.0, 0.1, 1200, 0.5, 0.6, 0, 0 },
        { "power-law turbulent, shear-thickening", 0.6, 0.2, 1000, 0.004, 1.3, 0, 0 },
        { "power-law turbulent, n = 0.3", 4.0, 0.1, 1100, 0.8, 0.3, 0, 0 },
        { "bingham low He (1000), turbulent", 3.0, 0.05, 1000, 0, 0, 0.01, 0.005 },
        { "bingham low He (1000), laminar", 0.1, 0.05, 1000, 0, 0, 0.01, 0.005 },
        { "bingham He 1.4e5, turbulent", 3.0, 0.1, 1100, 0, 0, 0.2, 0.004 },
        { "bingham low He, near transition", 0.6, 0.05, 1100, 0, 0, 0.5, 0.01 },
        { "bingham high He, laminar", 1.7, 0.15, 1450, 0, 0, 25, 0.06 },
        { "bingham high He, plug-like", 0.05, 0.15, 1450, 0, 0, 25, 0.06 },
        { "bingham high He, turbulent", 6.0, 0.3, 1300, 0, 0, 5, 0.01 },
    };

    [Theory]
    [MemberData(nameof(FrictionCases))]
    public void OfFriction_MatchesMathNetNumericalDerivative(string name, double v, double d, double rho, double k, double n, double tau0, double mu)
    {
        bool power = k > 0;
        double[] x = [v, d, 0, 0, rho, k, n, tau0, mu];
        var fluid = Fluid(power, x);
        var r = NonNewtonianFriction.Compute(fluid, v, d);
        if (power) Assert.True(Math.Abs(r.Reynolds / r.CriticalReynolds - 1) > 0.01, $"{name}: Re {r.Reynolds} too close to Re_c");
        var s = NonNewtonianSensitivity.OfFriction(fluid, v, d, r);
        int checks = CheckAll(s, x, p =>
        {
            var q = NonNewtonianFriction.Compute(Fluid(power, p), p[0], p[1]);
            return (q.Darcy, q.Darcy, q.Reynolds, p[0]);
        });
        Assert.True(checks >= 4 * 5, $"{name}: {checks} checks");
        Assert.True(double.IsNaN(s.Output.Length) && double.IsNaN(s.Output.MinorLossCoefficient));
        Assert.Equal(power, double.IsNaN(s.Output.YieldStress));
        Assert.Equal(power, !double.IsNaN(s.Output.FlowBehaviorIndex));
    }

    public static TheoryData<string, double, double, double, double, double, double, double> PipeCases() => new()
    {
        // name, Q (m3/s), D, rho, K, n, tau0, mu_p; L = 800 m, K_minor = 3.5
        { "power-law laminar", 0.005, 0.1, 1200, 0.5, 0.6, 0, 0 },
        { "power-law warned band, turbulent side", 0.047, 0.1, 1200, 0.5, 0.6, 0, 0 },
        { "power-law turbulent", 0.1, 0.1, 1200, 0.5, 0.6, 0, 0 },
        { "bingham low He (1000), turbulent", 0.005, 0.05, 1000, 0, 0, 0.01, 0.005 },
        { "bingham He 1.4e5", 0.02, 0.1, 1100, 0, 0, 0.2, 0.004 },
        { "bingham high He, laminar", 0.03, 0.15, 1450, 0, 0, 25, 0.06 },
        { "bingham high He, plug-like", 0.001, 0.15, 1450, 0, 0, 25, 0.06 },
        { "bingham high He, turbulent", 0.4, 0.3, 1300, 0, 0, 5, 0.01 },
    };

    [Theory]
    [MemberData(nameof(PipeCases))]
    public void OfHeadLoss_MatchesMathNetNumericalDerivative(string name, double q, double d, double rho, double k, double n, double tau0, double mu)
    {
        bool power = k > 0;
        double[] x = [q, d, 800, 3.5, rho, k, n, tau0, mu];
        var fluid = Fluid(power, x);
        var h = NonNewtonianPipe.HeadLoss(fluid, 800, d, 3.5, q);
        if (power) Assert.True(Math.Abs(h.Friction.Reynolds / h.Friction.CriticalReynolds - 1) > 0.01, $"{name}: too close to Re_c");
        var s = NonNewtonianSensitivity.OfHeadLoss(fluid, 800, d, 3.5, h);
        // The head loss's slope in the flow is the one the inverse solve uses.
        Assert.Equal(h.DHeadLossDFlow, s.Output.Given, 1e-12 * h.DHeadLossDFlow);
        int checks = CheckAll(s, x, p =>
        {
            var e = NonNewtonianPipe.HeadLoss(Fluid(power, p), p[2], p[1], p[3], p[0]);
            return (e.HeadLoss, e.Friction.Darcy, e.Friction.Reynolds, e.Velocity);
        });
        Assert.True(checks >= 4 * 7, $"{name}: {checks} checks");
    }

    [Theory]
    [MemberData(nameof(PipeCases))]
    public void OfFlow_MatchesMathNetNumericalDerivative(string name, double q, double d, double rho, double k, double n, double tau0, double mu)
    {
        // The head the flow q needs, then the flow that meets it: the inputs of the inverse problem.
        bool power = k > 0;
        var fluid = Fluid(power, [q, d, 800, 3.5, rho, k, n, tau0, mu]);
        double head = NonNewtonianPipe.HeadLoss(fluid, 800, d, 3.5, q).HeadLoss;
        double[] x = [head, d, 800, 3.5, rho, k, n, tau0, mu];
        var r = NonNewtonianPipe.Flow(fluid, 800, d, 3.5, head);
        Assert.Equal(NonNewtonianFlowStatus.Solved, r.Status);
        var s = NonNewtonianSensitivity.OfFlow(fluid, 800, d, 3.5, r);
        int checks = CheckAll(s, x, p =>
        {
            var e = NonNewtonianPipe.Flow(Fluid(power, p), p[2], p[1], p[3], p[0]);
            Assert.Equal(NonNewtonianFlowStatus.Solved, e.Status);
            return (e.State.Flow, e.State.Friction.Darcy, e.State.Friction.Reynolds, e.State.Velocity);
        });
        Assert.True(checks >= 4 * 7, $"{name}: {checks} checks");
        // dQ/dh* is the reciprocal of the head loss's slope (a stated property of the inverse).
        Assert.Equal(1 / r.State.DHeadLossDFlow, s.Output.Given, 1e-12 / r.State.DHeadLossDFlow);
    }

    [Fact]
    public void OfFriction_BinghamWithoutYieldStress_YieldStressSlopeIsTheFirstOrderTerm()
    {
        // At tau0 = 0 (a Newtonian fluid) f_L = (16/Re)(1 + He/(6 Re) + O(He^4)), so d ln f/dHe = 1/(6 Re) in laminar flow
        // when the turbulent part is negligible: d f/d tau0 = f (rho D^2/mu^2) / (6 Re). A one-sided MathNet difference
        // (tau0 cannot go below 0) agrees.
        double rho = 1000, mu = 0.5, v = 0.5, d = 0.05;
        var fluid = NonNewtonianFluid.BinghamPlastic(rho, 0, mu);
        var r = NonNewtonianFriction.Compute(fluid, v, d);
        var s = NonNewtonianSensitivity.OfFriction(fluid, v, d, r);
        double re = rho * v * d / mu;
        double closed = r.Darcy * (rho * d * d / (mu * mu)) / (6 * re);
        Assert.Equal(closed, s.Output.YieldStress, 1e-3 * closed); // the turbulent part adds f_T^m weight, below 1e-3 here
        var nd = new NumericalDerivative(5, 0) { StepType = StepType.Absolute, StepSize = 1e-6 };
        double fd = nd.EvaluateDerivative(t => NonNewtonianFriction.Compute(NonNewtonianFluid.BinghamPlastic(rho, t, mu), v, d).Darcy, 0, 1);
        Assert.Equal(fd, s.Output.YieldStress, 1e-5 * Math.Abs(fd));
    }

    [Fact]
    public void OfFlow_UnsolvedResult_Throws()
    {
        var paste = NonNewtonianFluid.BinghamPlastic(1450, 25, 0.06);
        var r = NonNewtonianPipe.Flow(paste, 1200, 0.15, 0, 10); // below the yield head (56 m)
        Assert.Equal(NonNewtonianFlowStatus.BelowYield, r.Status);
        Assert.Throws<ArgumentException>(() => NonNewtonianSensitivity.OfFlow(paste, 1200, 0.15, 0, r));
    }
}
