using FlowSolve.Core.Friction;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Pumps;

/// <summary>
/// The head a pipe system needs against flow: H_sys(Q) = StaticHead + Coefficient Q^2 + the Darcy-Weisbach losses of
/// the pipes in series (each carrying Q), in m with Q in m3/s.
/// </summary>
/// <remarks>
/// <para>The pipe losses come from <see cref="PipeHeadLoss.WithDerivative"/>: the exact Colebrook-White friction factor
/// at each flow (laminar and transition as in <see cref="DarcyFriction"/>), each pipe's minor losses, and the exact
/// slope dh/dQ. The pipe array is held, not copied: do not change it while the curve is in use. Evaluation allocates
/// nothing and is thread-safe.</para>
/// <para><c>default</c> is the flat curve H_sys = 0.</para>
/// </remarks>
public readonly record struct SystemCurve
{
    private readonly PipeGeometry[]? _pipes;

    private SystemCurve(double staticHead, double coefficient, PipeGeometry[]? pipes, double kinematicViscosity, FrictionOptions friction)
    {
        StaticHead = staticHead;
        Coefficient = coefficient;
        _pipes = pipes;
        KinematicViscosity = kinematicViscosity;
        Friction = friction;
    }

    /// <summary>Static head in m: the rise of the delivery level (or pressure head) over the suction level; any sign.</summary>
    public double StaticHead { get; }

    /// <summary>The lumped loss coefficient K in m per (m3/s)^2 (h = K Q^2), 0 or more.</summary>
    public double Coefficient { get; }

    /// <summary>The pipes in series, or an empty list.</summary>
    public IReadOnlyList<PipeGeometry> Pipes => _pipes ?? [];

    /// <summary>Kinematic viscosity in m2/s used for the pipes (0 without pipes).</summary>
    public double KinematicViscosity { get; }

    /// <summary>Regime limits used for the pipes' friction factor.</summary>
    public FrictionOptions Friction { get; }

    /// <summary>True when the curve includes pipes.</summary>
    public bool HasPipes => _pipes is { Length: > 0 };

    /// <summary>A system of static head plus a lumped K Q^2.</summary>
    /// <param name="staticHead">Static head in m; finite, any sign.</param>
    /// <param name="coefficient">K in m per (m3/s)^2; finite, 0 or more.</param>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static SystemCurve Quadratic(double staticHead, double coefficient)
    {
        PumpGuard.Finite(staticHead, nameof(staticHead));
        PumpGuard.NonNegative(coefficient, nameof(coefficient));
        return new SystemCurve(staticHead, coefficient, null, 0, FrictionOptions.Default);
    }

    /// <summary>A system of static head plus pipes in series (Darcy-Weisbach, exact friction factor, minor losses).</summary>
    /// <param name="staticHead">Static head in m; finite, any sign.</param>
    /// <param name="pipes">One or more pipes, each carrying the whole flow; held, not copied.</param>
    /// <param name="fluid">The fluid (its kinematic viscosity is used).</param>
    /// <param name="coefficient">An extra lumped K in m per (m3/s)^2 (equipment, a control valve); 0 or more.</param>
    /// <param name="friction">Regime limits; <see cref="FrictionOptions.Default"/> when omitted.</param>
    /// <exception cref="ArgumentException">An argument is outside its domain; a bad pipe is named <c>pipes[i].field</c>.</exception>
    public static SystemCurve FromPipes(double staticHead, PipeGeometry[] pipes, in FluidProperties fluid,
        double coefficient = 0, FrictionOptions? friction = null)
    {
        PumpGuard.Finite(staticHead, nameof(staticHead));
        PumpGuard.NonNegative(coefficient, nameof(coefficient));
        ArgumentNullException.ThrowIfNull(pipes);
        if (pipes.Length == 0) throw new ArgumentException("at least one pipe is needed", nameof(pipes));
        PumpGuard.Positive(fluid.KinematicViscosity, "kinematicViscosity");
        for (int i = 0; i < pipes.Length; i++)
        {
            try { PipeGuard.Geometry(pipes[i]); }
            catch (ArgumentOutOfRangeException e)
            {
                throw new ArgumentOutOfRangeException($"pipes[{i}].{e.ParamName}", e.ActualValue, e.Message);
            }
        }
        return new SystemCurve(staticHead, coefficient, pipes, fluid.KinematicViscosity, friction ?? FrictionOptions.Default);
    }

    /// <summary>System head in m at a flow.</summary>
    /// <param name="flow">Flow in m3/s; finite (the losses are odd in Q).</param>
    public double Head(double flow) => HeadAndSlope(flow).Head;

    /// <summary>System head in m and its slope dH/dQ in m per m3/s; allocation-free.</summary>
    /// <param name="flow">Flow in m3/s; finite.</param>
    public (double Head, double Slope) HeadAndSlope(double flow)
    {
        double h = StaticHead + Coefficient * flow * Math.Abs(flow);
        double dh = 2 * Coefficient * Math.Abs(flow);
        if (_pipes is { } pipes)
        {
            for (int i = 0; i < pipes.Length; i++)
            {
                var (loss, slope) = PipeHeadLoss.WithDerivative(pipes[i], KinematicViscosity, flow, Friction);
                h += loss;
                dh += slope;
            }
        }
        return (h, dh);
    }
}
