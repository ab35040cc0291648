namespace FlowSolve.Core.Friction;

/// <summary>
/// The friction factor in the transition zone with continuous joins, for solvers that iterate across it (the network
/// solver): Churchill (1977), the single-pipe relation of <see cref="DarcyFriction"/>, over the zone's inside, and over
/// the 5 % of Reynolds number next to each limit a cubic Hermite in Re that meets the laminar law 64/Re at the laminar
/// limit and Colebrook-White at the turbulent limit, values and slopes matched.
/// </summary>
/// <remarks>
/// <para>Why: <see cref="DarcyFriction.Compute"/> switches from 64/Re to Churchill at Re 2000 (f rises by about 0.13 %)
/// and from Churchill to Colebrook-White at Re 4000 (f falls by 1 to 2 % for smooth and ordinary pipes). A pipe whose
/// head lies in such a gap has no flow at all (at 2000) or two (at 4000), and a Newton iteration over a whole network
/// with hundreds of pipes in the zone keeps stepping across a gap without converging (a 40 x 40 grid: 100 iterations,
/// head imbalance 1e-6 m). Joined, the loss h(Q) is continuous with a continuous slope and still rises with Q.</para>
/// <para>Between 1.05 times the laminar limit and 0.95 times the turbulent limit (2100 to 3800 by default) the value
/// is exactly Churchill's, the single pipe's; within the joins it differs from the single pipe's by at most the size of
/// the jump it replaces. The limits come from <see cref="FrictionOptions"/>; when they are closer together than the two
/// joins, one cubic joins the laminar law to Colebrook-White directly.</para>
/// </remarks>
public readonly struct TransitionalFriction
{
    /// <summary>The width of each join as a fraction of its regime limit (5 %; a FlowSolve choice: wide enough that
    /// the cubic keeps h(Q) rising for relative roughness up to 0.05, narrow enough to leave Churchill most of the zone).</summary>
    public const double JoinWidth = 0.05;

    private readonly double _lo, _hi, _a, _b, _relativeRoughness;
    private readonly double _fLo, _dLo, _fA, _dA, _fB, _dB, _fHi, _dHi;

    /// <summary>Prepares the joins for one relative roughness (one Colebrook-White solve and four Churchill values).</summary>
    /// <param name="relativeRoughness">e/D in [0, 1).</param>
    /// <param name="limits">Regime limits.</param>
    public TransitionalFriction(double relativeRoughness, in FrictionOptions limits)
    {
        _relativeRoughness = relativeRoughness;
        _lo = limits.LaminarLimit;
        _hi = limits.TurbulentLimit;
        _fLo = 64 / _lo;
        _dLo = -64 / (_lo * _lo);
        var cw = ColebrookWhite.Solve(_hi, relativeRoughness);
        _fHi = cw.FrictionFactor;
        _dHi = cw.DerivativeReynolds;
        _a = _lo * (1 + JoinWidth);
        _b = _hi * (1 - JoinWidth);
        if (_a < _b)
        {
            (_fA, _dA) = Churchill(_a, relativeRoughness);
            (_fB, _dB) = Churchill(_b, relativeRoughness);
        }
        else
        {
            _a = _b = _hi; // one join across the whole zone
        }
    }

    /// <summary>f and df/dRe at a Reynolds number within the transition zone (between the regime limits).</summary>
    /// <param name="reynolds">Reynolds number, from the laminar limit to the turbulent limit.</param>
    public (double F, double DfDRe) Evaluate(double reynolds)
    {
        if (reynolds <= _a)
            return _a < _hi
                ? Hermite(reynolds, _lo, _a, _fLo, _dLo, _fA, _dA)
                : Hermite(reynolds, _lo, _hi, _fLo, _dLo, _fHi, _dHi);
        if (reynolds >= _b) return Hermite(reynolds, _b, _hi, _fB, _dB, _fHi, _dHi);
        return Churchill(reynolds, _relativeRoughness);
    }

    /// <summary>True when the value at this Reynolds number is Churchill's own (not a join).</summary>
    /// <param name="reynolds">Reynolds number.</param>
    public bool IsChurchill(double reynolds) => reynolds > _a && reynolds < _b;

    /// <summary>Churchill's f, computed exactly as <see cref="ExplicitFriction.Churchill"/> computes it (the same
    /// operations, so the same bits as the single pipe's), and its derivative df/dRe by the chain rule through the same
    /// intermediate terms: with T = (8/Re)^12 + (A + B)^-1.5, f = 8 T^(1/12) and
    /// df/dRe = f/(12 T) dT/dRe, dT/dRe = -12 (8/Re)^12 / Re - 1.5 (A + B)^-2.5 (dA/dRe + dB/dRe),
    /// dA/dRe = 16 A/L dL/dRe with L = -2.457 ln u, u = (7/Re)^0.9 + 0.27 e/D, dL/dRe = 2.457 0.9 (7/Re)^0.9 / (u Re),
    /// dB/dRe = -16 B / Re. One evaluation instead of the three a central difference takes.</summary>
    internal static (double F, double DfDRe) Churchill(double re, double r)
    {
        double p = Math.Pow(7.0 / re, 0.9);
        double u = p + 0.27 * r;
        double l = -2.457 * Math.Log(u);
        double a = Math.Pow(l, 16);
        double b = Math.Pow(37530.0 / re, 16);
        double laminar = Math.Pow(8.0 / re, 12);
        double s = a + b;
        double turbulent = Math.Pow(s, -1.5);
        double t = laminar + turbulent;
        double f = 8.0 * Math.Pow(t, 1.0 / 12.0);
        double dl = 2.457 * 0.9 * p / (u * re);
        double ds = 16 * a / l * dl - 16 * b / re;
        double dt = -12 * laminar / re - 1.5 * turbulent / s * ds;
        return (f, f / (12 * t) * dt);
    }

    private static (double F, double DfDRe) Hermite(double re, double x0, double x1, double f0, double d0, double f1, double d1)
    {
        double w = x1 - x0, t = (re - x0) / w, t2 = t * t, t3 = t2 * t;
        double f = (2 * t3 - 3 * t2 + 1) * f0 + (t3 - 2 * t2 + t) * w * d0 + (-2 * t3 + 3 * t2) * f1 + (t3 - t2) * w * d1;
        double df = (6 * t2 - 6 * t) * f0 + (3 * t2 - 4 * t + 1) * w * d0 + (-6 * t2 + 6 * t) * f1 + (3 * t2 - 2 * t) * w * d1;
        return (f, df / w);
    }
}
