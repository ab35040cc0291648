namespace FlowSolve.Core.NonNewtonian;

/// <summary>First-order sensitivities of one output of a non-Newtonian calculation to each input, SI units throughout:
/// d(output)/d(input). An input that does not apply (a field of the other rheological model, or the length of a bare
/// friction factor) is NaN.</summary>
/// <param name="Given">Per unit of the given quantity: per m/s of velocity (friction factor), per m3/s of flow (head
/// loss), per m of head loss (flow).</param>
/// <param name="Diameter">Per m of diameter (the given velocity, flow or head loss held).</param>
/// <param name="Length">Per m of length.</param>
/// <param name="MinorLossCoefficient">Per unit of K.</param>
/// <param name="Density">Per kg/m3.</param>
/// <param name="ConsistencyIndex">Power law: per Pa s^n of K.</param>
/// <param name="FlowBehaviorIndex">Power law: per unit of n (K held in Pa s^n).</param>
/// <param name="YieldStress">Bingham plastic: per Pa of tau0.</param>
/// <param name="PlasticViscosity">Bingham plastic: per Pa s of mu_p.</param>
public readonly record struct NonNewtonianPartials(double Given, double Diameter, double Length, double MinorLossCoefficient,
    double Density, double ConsistencyIndex, double FlowBehaviorIndex, double YieldStress, double PlasticViscosity);

/// <summary>The sensitivities of a non-Newtonian answer: its primary output and the quantities beside it.</summary>
/// <param name="Output">The primary output: the Darcy friction factor, the head loss (m) or the flow (m3/s).</param>
/// <param name="FrictionFactor">The Darcy friction factor (4 x Fanning).</param>
/// <param name="Reynolds">The Reynolds number (Metzner-Reed, or plastic rho V D / mu_p).</param>
/// <param name="Velocity">The mean velocity, m/s (for the friction factor: 1 per m/s of the given velocity, 0 otherwise).</param>
public readonly record struct NonNewtonianSensitivities(NonNewtonianPartials Output, NonNewtonianPartials FrictionFactor,
    NonNewtonianPartials Reynolds, NonNewtonianPartials Velocity);

/// <summary>
/// Sensitivities of the non-Newtonian friction factor, head loss and flow by implicit differentiation of the solved
/// relations, never by differences.
/// </summary>
/// <remarks>
/// <para>Every quantity is followed as the gradient of its logarithm over the inputs (per unit of each input, so that a
/// yield stress of zero needs no special case). The friction factor depends on the inputs only through its groups:
/// ln f = F(ln Re_MR, n) for a power law and F(ln Re, He) for a Bingham plastic, so d ln f = F_Re d ln Re + F_n dn
/// (or F_He dHe) with the groups' gradients in closed form.</para>
/// <para>Dodge-Metzner, g(x) = x - c(n) (log10 Re_MR + (n - 2) log10 x) + d(n) = 0 in x = 1/sqrt(f), c = 4/n^0.75,
/// d = 0.4/n^1.2, gives dx = -(g_lnRe d ln Re + g_n dn)/g_x with g_x = 1 + c (2 - n)/(x ln 10), g_lnRe = -c/ln 10 and
/// g_n = 0.75 (c/n) (log10 Re_MR + (n - 2) log10 x) - c log10 x - 1.2 d/n; then d ln f = -2 dx/x. The laminar law is
/// d ln f = -d ln Re_MR. The jump at the critical Reynolds number has no derivative: each side is differentiated by its
/// own law.</para>
/// <para>Buckingham-Reiner is differentiated in its solve variable u = 1 - tau0/tau_w
/// (<see cref="BuckinghamReinerResult.DLnFDHedstrom"/>, <see cref="BuckinghamReinerResult.DLnFDLnReynolds"/>), and the
/// combination of Darby, Mun and Boger by the weights f_i^m / sum f^m of its parts.</para>
/// <para>Head loss h = 2 f V^2 L/(g D) + K V^2/(2g) with V = 4Q/(pi D^2). The flow that meets a head loss solves
/// h(Q, p) = h*, so dQ/dp = -h_p/h_Q and dQ/dh* = 1/h_Q, with h_Q the solve's own Newton slope; any other output y of
/// the flow's state follows as dy/dp = y_p + y_Q dQ/dp.</para>
/// </remarks>
public static class NonNewtonianSensitivity
{
    private const double Ln10 = 2.302585092994045684;

    /// <summary>Sensitivities of a friction factor (<see cref="NonNewtonianFriction.Compute"/>): Output and FrictionFactor
    /// are the Darcy factor; Given is per m/s of velocity; Length and MinorLossCoefficient are NaN.</summary>
    /// <param name="fluid">The fluid the factor was computed for.</param>
    /// <param name="velocity">Mean velocity, m/s.</param>
    /// <param name="diameter">Inside diameter, m.</param>
    /// <param name="friction">The result of <see cref="NonNewtonianFriction.Compute"/> for these inputs.</param>
    public static NonNewtonianSensitivities OfFriction(in NonNewtonianFluid fluid, double velocity, double diameter,
        in NonNewtonianFrictionResult friction)
    {
        var lnV = Grad.Unit(Grad.Given, 1 / velocity);
        var (lnRe, lnF) = Friction(fluid, velocity, diameter, friction, lnV);
        var f = Grad.ToPartials(lnF * friction.Darcy, fluid, pipe: false);
        return new(f, f, Grad.ToPartials(lnRe * friction.Reynolds, fluid, pipe: false), Grad.ToPartials(lnV * velocity, fluid, pipe: false));
    }

    /// <summary>Sensitivities of a head loss (<see cref="NonNewtonianPipe.HeadLoss"/>): Output is the head loss in m;
    /// Given is per m3/s of flow.</summary>
    /// <param name="fluid">The fluid.</param>
    /// <param name="length">L, m.</param>
    /// <param name="diameter">D, m.</param>
    /// <param name="minorLossCoefficient">K.</param>
    /// <param name="state">The result of <see cref="NonNewtonianPipe.HeadLoss"/> for these inputs.</param>
    public static NonNewtonianSensitivities OfHeadLoss(in NonNewtonianFluid fluid, double length, double diameter, double minorLossCoefficient,
        in NonNewtonianHeadLoss state)
    {
        var g = HeadLoss(fluid, length, diameter, state);
        return new(Grad.ToPartials(g.H, fluid, pipe: true), Grad.ToPartials(g.LnF * state.Friction.Darcy, fluid, pipe: true),
            Grad.ToPartials(g.LnRe * state.Friction.Reynolds, fluid, pipe: true), Grad.ToPartials(g.LnV * state.Velocity, fluid, pipe: true));
    }

    /// <summary>Sensitivities of the flow that meets a head loss (<see cref="NonNewtonianPipe.Flow"/>): Output is the flow
    /// in m3/s; Given is per m of head loss.</summary>
    /// <param name="fluid">The fluid.</param>
    /// <param name="length">L, m.</param>
    /// <param name="diameter">D, m.</param>
    /// <param name="minorLossCoefficient">K.</param>
    /// <param name="result">A result of <see cref="NonNewtonianPipe.Flow"/> with <see cref="NonNewtonianFlowStatus.Solved"/>.</param>
    /// <exception cref="ArgumentException">The result holds no solved flow.</exception>
    public static NonNewtonianSensitivities OfFlow(in NonNewtonianFluid fluid, double length, double diameter, double minorLossCoefficient,
        in NonNewtonianFlowResult result)
    {
        if (result.Status != NonNewtonianFlowStatus.Solved) throw new ArgumentException("the result holds no solved flow", nameof(result));
        var state = result.State;
        var g = HeadLoss(fluid, length, diameter, state);
        // dQ/dp = -h_p / h_Q for every input, dQ/dh* = 1 / h_Q in the Given slot.
        double hq = g.H[Grad.Given];
        var dq = g.H * (-1 / hq);
        dq[Grad.Given] = 1 / hq;
        Grad Total(Grad y)
        {
            double yq = y[Grad.Given];
            var t = y + dq * yq;
            t[Grad.Given] = yq * dq[Grad.Given];
            return t;
        }
        return new(Grad.ToPartials(dq, fluid, pipe: true), Grad.ToPartials(Total(g.LnF) * state.Friction.Darcy, fluid, pipe: true),
            Grad.ToPartials(Total(g.LnRe) * state.Friction.Reynolds, fluid, pipe: true), Grad.ToPartials(Total(g.LnV) * state.Velocity, fluid, pipe: true));
    }

    /// <summary>Gradients at a flow Q (Given slot = Q): ln V, ln Re, ln f, and h itself (not its logarithm).</summary>
    private static (Grad LnV, Grad LnRe, Grad LnF, Grad H) HeadLoss(in NonNewtonianFluid fluid, double length, double diameter,
        in NonNewtonianHeadLoss state)
    {
        // V = 4Q/(pi D^2): d ln V = d ln Q - 2 d ln D.
        var lnV = Grad.Unit(Grad.Given, 1 / state.Flow) + Grad.Unit(Grad.D, -2 / diameter);
        var (lnRe, lnF) = Friction(fluid, state.Velocity, diameter, state.Friction, lnV);
        // hf = 2 f V^2 L/(g D): d ln hf = d ln f + 2 d ln V + d ln L - d ln D; hm = K V^2/(2g).
        var lnHf = lnF + lnV * 2 + Grad.Unit(Grad.L, 1 / length) + Grad.Unit(Grad.D, -1 / diameter);
        var h = lnHf * state.FrictionHeadLoss + lnV * (2 * state.MinorHeadLoss) + Grad.Unit(Grad.K, state.VelocityHead);
        return (lnV, lnRe, lnF, h);
    }

    /// <summary>d ln Re and d ln f (Fanning, = Darcy) from d ln V, by the chain rule through the groups.</summary>
    private static (Grad LnRe, Grad LnF) Friction(in NonNewtonianFluid fluid, double velocity, double diameter,
        in NonNewtonianFrictionResult friction, Grad lnV)
    {
        double rho = fluid.Density;
        if (fluid.Model == RheologyModel.PowerLaw)
        {
            double n = fluid.FlowBehaviorIndex, k = fluid.ConsistencyIndex;
            // ln Re_MR = ln rho + (2-n) ln V + n ln D - ln K - (n-1) ln 8 - n ln((3n+1)/(4n));
            // d/dn of the last term is -ln((3n+1)/(4n)) + 1/(3n+1).
            double dLnReDn = Math.Log(diameter) - Math.Log(velocity) - Math.Log(8.0) - Math.Log((3 * n + 1) / (4 * n)) + 1 / (3 * n + 1);
            var lnRe = Grad.Unit(Grad.Rho, 1 / rho) + lnV * (2 - n) + Grad.Unit(Grad.D, n / diameter) + Grad.Unit(Grad.Kc, -1 / k)
                       + Grad.Unit(Grad.N, dLnReDn);
            if (friction.Relation != NonNewtonianFriction.DodgeMetzner) return (lnRe, lnRe * -1);
            double x = 1 / Math.Sqrt(friction.Fanning);
            double c = 4.0 / Math.Pow(n, 0.75), d = 0.4 / Math.Pow(n, 1.2);
            double log10X = Math.Log10(x);
            double gx = 1 + c * (2 - n) / (x * Ln10);
            double gn = 0.75 * c / n * (Math.Log10(friction.Reynolds) + (n - 2) * log10X) - c * log10X - 1.2 * d / n;
            // d ln f = -2 dx/x, dx = (c/ln 10 d ln Re - g_n dn)/g_x.
            double sRe = -2 * c / (Ln10 * x * gx), sN = 2 * gn / (x * gx);
            return (lnRe, lnRe * sRe + Grad.Unit(Grad.N, sN));
        }
        else
        {
            double mu = fluid.PlasticViscosity;
            // Re = rho V D / mu_p; He = rho D^2 tau0 / mu_p^2 (its gradient absolute: He may be 0).
            var lnRe = Grad.Unit(Grad.Rho, 1 / rho) + lnV + Grad.Unit(Grad.D, 1 / diameter) + Grad.Unit(Grad.Mu, -1 / mu);
            double he = friction.Hedstrom;
            var dHe = (Grad.Unit(Grad.Rho, 1 / rho) + Grad.Unit(Grad.D, 2 / diameter) + Grad.Unit(Grad.Mu, -2 / mu)) * he
                      + Grad.Unit(Grad.Tau0, rho * diameter * diameter / (mu * mu));
            // For a Bingham plastic DLnFDLnVelocity is d ln f / d ln Re at constant He (Re is proportional to V).
            return (lnRe, lnRe * friction.DLnFDLnVelocity + dHe * friction.DLnFDHedstrom);
        }
    }

    /// <summary>A gradient over the inputs: Given (velocity, flow or head loss), D, L, K, rho, K_c, n, tau0, mu_p. An inline
    /// array, so the arithmetic allocates nothing.</summary>
    [System.Runtime.CompilerServices.InlineArray(Count)]
    private struct Grad
    {
        public const int Given = 0, D = 1, L = 2, K = 3, Rho = 4, Kc = 5, N = 6, Tau0 = 7, Mu = 8, Count = 9;
        private double _element;

        public static Grad Unit(int slot, double value)
        {
            var g = new Grad();
            g[slot] = value;
            return g;
        }

        public static Grad operator +(Grad a, Grad b)
        {
            var g = new Grad();
            for (int i = 0; i < Count; i++) g[i] = a[i] + b[i];
            return g;
        }

        public static Grad operator *(Grad a, double s)
        {
            var g = new Grad();
            for (int i = 0; i < Count; i++) g[i] = a[i] * s;
            return g;
        }

        /// <summary>As partials, NaN where the input does not apply.</summary>
        public static NonNewtonianPartials ToPartials(in Grad g, in NonNewtonianFluid fluid, bool pipe)
        {
            bool power = fluid.Model == RheologyModel.PowerLaw;
            return new NonNewtonianPartials(g[Given], g[D], pipe ? g[L] : double.NaN, pipe ? g[K] : double.NaN, g[Rho],
                power ? g[Kc] : double.NaN, power ? g[N] : double.NaN, power ? double.NaN : g[Tau0], power ? double.NaN : g[Mu]);
        }
    }
}
