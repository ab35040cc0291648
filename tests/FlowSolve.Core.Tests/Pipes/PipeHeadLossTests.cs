using FlowSolve.Core.Friction;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Tests.Pipes;

public sealed class PipeHeadLossTests
{
    private const double Foot = 0.3048;

    [Fact]
    public void Compute_WhiteExample6_7_MatchesPublishedFigures()
    {
        // F. M. White, Fluid Mechanics, Example 6.7 (text, found): oil rho 900 kg/m3, nu 1e-5 m2/s, Q 0.2 m3/s,
        // L 500 m, D 200 mm cast iron, e 0.26 mm: V about 6.4 m/s, Re about 128 000, chart f about 0.0225.
        // Head loss about 117 m: from memory.
        var pipe = new PipeGeometry(500, 0.2, 0.26e-3);
        var result = PipeHeadLoss.Compute(pipe, new FluidProperties(1e-5, 900), 0.2);

        Assert.Equal(6.4, result.State.Velocity, 0.05);
        Assert.Equal(128_000, result.State.Reynolds, 1_000.0);
        Assert.Equal(0.0225, result.State.FrictionFactor, 0.0225 * 0.02); // chart reading: about 2 %
        Assert.Equal(117, result.HeadLoss, 117 * 0.02);
        Assert.Equal(FlowRegime.Turbulent, result.State.Regime);
        Assert.True(result.Converged);
        Assert.InRange(result.Iterations, 1, 6);
        // Pressure drop is rho g h by definition.
        Assert.Equal(900 * Physical.StandardGravity * result.HeadLoss, result.PressureDrop!.Value, 1e-9 * result.PressureDrop.Value);
        // 6.4 m/s is above the 3 m/s design range (common practice).
        Assert.True(result.Warnings.HasFlag(PipeWarnings.VelocityAboveDesignRange));
        Assert.Contains(result.DescribeWarnings(), w => w.Code == "velocity-above-design-range");
    }

    [Fact]
    public void Compute_SeparatesFrictionMinorAndElevation()
    {
        // Darcy-Weisbach definitions: hf = f L/D V^2/2g, hm = K V^2/2g; total head = hf + hm + dz (stated convention).
        var pipe = new PipeGeometry(120, 0.1, 0.046e-3, 3.5);
        var result = PipeHeadLoss.Compute(pipe, new FluidProperties(1.004e-6, 998.2), 0.012, elevationRise: 7.5);
        var s = result.State;
        double vh = s.Velocity * s.Velocity / (2 * Physical.StandardGravity);
        Assert.Equal(s.FrictionFactor * 1200 * vh, s.FrictionHeadLoss, 1e-12 * s.FrictionHeadLoss);
        Assert.Equal(3.5 * vh, s.MinorHeadLoss, 1e-12 * s.MinorHeadLoss);
        Assert.Equal(s.FrictionHeadLoss + s.MinorHeadLoss + 7.5, result.TotalHead, 1e-12 * result.TotalHead);
        Assert.Equal(998.2 * Physical.StandardGravity * result.TotalHead, result.TotalPressureDifference!.Value, 1e-6);
        // The friction factor is DarcyFriction's exact value at this Reynolds number.
        Assert.Equal(DarcyFriction.Exact(s.Reynolds, s.RelativeRoughness).FrictionFactor, s.FrictionFactor, 1e-15);
    }

    [Fact]
    public void Compute_WithoutDensity_ReportsNoPressure()
    {
        var result = PipeHeadLoss.Compute(new PipeGeometry(10, 0.05, 0), new FluidProperties(1e-6), 0.001);
        Assert.Null(result.PressureDrop);
        Assert.Null(result.TotalPressureDifference);
    }

    public static TheoryData<double, double, double, double> DerivativeCases => new()
    {
        // D (m), e (m), K, Q (m3/s): laminar, transitional, turbulent smooth, turbulent rough with fittings.
        { 0.05, 0.0, 0.0, 5e-5 },
        { 0.05, 1e-5, 2.0, 1.2e-4 },
        { 0.3, 0.0, 0.0, 0.15 },
        { 0.3, 0.5e-3, 8.0, 0.15 },
    };

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void WithDerivative_MatchesCentralDifference(double d, double e, double k, double q)
    {
        // dh/dQ including df/dQ (Simpson and Elhay 2011, J. Hydraul. Eng. 137(6)) against a central difference.
        var pipe = new PipeGeometry(250, d, e, k);
        const double nu = 1e-6;
        var (h, dhdq) = PipeHeadLoss.WithDerivative(pipe, nu, q);
        double step = q * 1e-6;
        double numeric = (PipeHeadLoss.WithDerivative(pipe, nu, q + step).HeadLoss
                        - PipeHeadLoss.WithDerivative(pipe, nu, q - step).HeadLoss) / (2 * step);
        Assert.True(h > 0);
        Assert.Equal(numeric, dhdq, Math.Abs(numeric) * 1e-7);
    }

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void Compute_DiameterDerivative_MatchesCentralDifference(double d, double e, double k, double q)
    {
        var fluid = new FluidProperties(1e-6);
        var state = PipeHeadLoss.Compute(new PipeGeometry(250, d, e, k), fluid, q).State;
        double step = d * 1e-6;
        double numeric = (PipeHeadLoss.Compute(new PipeGeometry(250, d + step, e, k), fluid, q).HeadLoss
                        - PipeHeadLoss.Compute(new PipeGeometry(250, d - step, e, k), fluid, q).HeadLoss) / (2 * step);
        Assert.Equal(numeric, state.DHeadLossDDiameter, Math.Abs(numeric) * 1e-6);
    }

    [Fact]
    public void WithDerivative_NewtonWithFrictionTermConvergesFasterThanWithFrozenFactor()
    {
        // Simpson and Elhay (2011), J. Hydraul. Eng. 137(6): keeping df/dQ in the Jacobian keeps Newton quadratic;
        // the frozen-factor slope 2 hf / Q (the usual shortcut) is wrong by the friction term and converges linearly.
        // Checked here as a property: both reach the same flow, the exact slope in fewer steps.
        var pipe = new PipeGeometry(4800, 0.2292, 1.5e-6, 6.0);
        const double nu = 1.236e-6, target = 22.5;
        int Iterate(bool exact, out double q)
        {
            q = 0.01;
            for (int i = 1; i <= 200; i++)
            {
                var (h, dhdq) = PipeHeadLoss.WithDerivative(pipe, nu, q);
                double slope = exact ? dhdq : 2 * h / q;
                double step = (h - target) / slope;
                q -= step;
                if (Math.Abs(step) <= 1e-12 * q) return i;
            }
            return int.MaxValue;
        }
        int withTerm = Iterate(true, out double q1);
        int frozen = Iterate(false, out double q2);
        Assert.Equal(q1, q2, 1e-10 * q1);
        Assert.True(withTerm < frozen, $"with df/dQ {withTerm} iterations, frozen {frozen}");
        Assert.InRange(withTerm, 1, 10);
    }

    [Fact]
    public void WithDerivative_IsOddInFlow_AndLaminarAtZero()
    {
        var pipe = new PipeGeometry(100, 0.1, 1e-4, 1.0);
        var forward = PipeHeadLoss.WithDerivative(pipe, 1e-6, 0.02);
        var reverse = PipeHeadLoss.WithDerivative(pipe, 1e-6, -0.02);
        Assert.Equal(-forward.HeadLoss, reverse.HeadLoss);
        Assert.Equal(forward.DHeadLossDFlow, reverse.DHeadLossDFlow);
        // Hagen-Poiseuille: h = 128 nu L Q / (pi g D^4), so dh/dQ at Q = 0 is that slope.
        var atZero = PipeHeadLoss.WithDerivative(pipe, 1e-6, 0);
        Assert.Equal(0, atZero.HeadLoss);
        Assert.Equal(128 * 1e-6 * 100 / (Math.PI * Physical.StandardGravity * 1e-4), atZero.DHeadLossDFlow, 1e-12);
    }

    [Fact]
    public void Compute_UsCustomaryExample_ConvertsExactly()
    {
        // White, Fluid Mechanics (found; viscosity from memory): 4.5 ft of loss over 200 ft of 6-in pipe,
        // e/D 0.0008, nu 1.1e-5 ft2/s, at V = 6.05 ft/s. Head loss from that velocity returns 4.5 ft to the
        // figures' precision.
        double d = 0.5 * Foot;
        var pipe = new PipeGeometry(200 * Foot, d, 0.0008 * d);
        double q = 6.05 * Foot * pipe.Area;
        var result = PipeHeadLoss.Compute(pipe, new FluidProperties(1.1e-5 * Foot * Foot), q);
        Assert.Equal(4.5, result.HeadLoss / Foot, 4.5 * 0.01);
    }

    [Theory]
    [InlineData(0.0, 0.1, 0.0, 0.0, 0.01, "length")]
    [InlineData(-1.0, 0.1, 0.0, 0.0, 0.01, "length")]
    [InlineData(10.0, 0.0, 0.0, 0.0, 0.01, "diameter")]
    [InlineData(10.0, 0.1, 0.1, 0.0, 0.01, "roughness")]
    [InlineData(10.0, 0.1, 0.2, 0.0, 0.01, "roughness")]
    [InlineData(10.0, 0.1, -1e-6, 0.0, 0.01, "roughness")]
    [InlineData(10.0, 0.1, 0.0, -1.0, 0.01, "minorLossCoefficient")]
    [InlineData(10.0, 0.1, 0.0, 0.0, 0.0, "flow")]
    [InlineData(10.0, 0.1, 0.0, 0.0, double.NaN, "flow")]
    public void Compute_BadInput_ThrowsWithParameterName(double length, double d, double e, double k, double q, string name)
    {
        var ex = Assert.Throws<ArgumentOutOfRangeException>(() =>
            PipeHeadLoss.Compute(new PipeGeometry(length, d, e, k), new FluidProperties(1e-6), q));
        Assert.Equal(name, ex.ParamName);
    }

    [Fact]
    public void Compute_BadFluid_ThrowsWithParameterName()
    {
        var pipe = new PipeGeometry(10, 0.1, 0);
        Assert.Equal("kinematicViscosity", Assert.Throws<ArgumentOutOfRangeException>(() =>
            PipeHeadLoss.Compute(pipe, new FluidProperties(0), 0.01)).ParamName);
        Assert.Equal("density", Assert.Throws<ArgumentOutOfRangeException>(() =>
            PipeHeadLoss.Compute(pipe, new FluidProperties(1e-6, -1), 0.01)).ParamName);
    }
}
