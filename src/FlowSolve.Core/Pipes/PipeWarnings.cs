using System.Globalization;

namespace FlowSolve.Core.Pipes;

/// <summary>Warnings raised by a pipe calculation, as flags so the hot path allocates nothing. Friction-factor
/// warnings travel separately as <see cref="Friction.FrictionWarnings"/>.</summary>
[Flags]
public enum PipeWarnings
{
    /// <summary>No warning.</summary>
    None = 0,

    /// <summary>Mean velocity below <see cref="PipeOptions.MinimumDesignVelocity"/> (common practice range).</summary>
    VelocityBelowDesignRange = 1,

    /// <summary>Mean velocity above <see cref="PipeOptions.MaximumDesignVelocity"/> (common practice range).</summary>
    VelocityAboveDesignRange = 2,

    /// <summary>The requested head lies inside the jump of the friction factor at a regime limit (laminar to
    /// transitional at Re 2000, transitional to turbulent at Re 4000), so no flow or diameter meets it exactly;
    /// the answer is the value at the limit.</summary>
    AtRegimeLimit = 4,

    /// <summary>The outer solve did not converge; the value is the best iterate and must not be used.</summary>
    NotConverged = 8,

    /// <summary>Hazen-Williams: the viscosity is not that of water at ordinary temperatures.</summary>
    HazenWilliamsFluidOutsideRange = 16,

    /// <summary>Hazen-Williams: the flow is not fully turbulent (Reynolds number below the turbulent limit).</summary>
    HazenWilliamsNotTurbulent = 32,

    /// <summary>Hazen-Williams: the diameter is outside the usual range of the formula.</summary>
    HazenWilliamsDiameterOutsideRange = 64,

    /// <summary>Hazen-Williams: the velocity is above the usual range of the formula.</summary>
    HazenWilliamsVelocityOutsideRange = 128,

    /// <summary>Hazen-Williams: the C factor is outside the range of tabulated values for real pipe.</summary>
    HazenWilliamsCoefficientOutsideRange = 256,

    /// <summary>Hazen-Williams and Darcy-Weisbach head losses differ by more than 10 percent.</summary>
    MethodsDisagree = 512,

    /// <summary>A second flow (or diameter) meets the same head: the head lies within the drop of the head loss at
    /// the turbulent limit (Re 4000), where Churchill's transition value gives way to the lower Colebrook-White value.
    /// The result carries the other root (<see cref="FlowResult.AlternateFlow"/>, <see cref="DiameterResult.AlternateDiameter"/>)
    /// and describes the warning itself, since the message quotes both roots (code <c>second-solution</c>).</summary>
    SecondSolution = 1024,
}

/// <summary>Why a pipe calculation ended, including the well-posed problems that have no answer.</summary>
public enum PipeStatus
{
    /// <summary>Solved: the reported value meets the problem to the solver's tolerance.</summary>
    Solved,

    /// <summary>Solved to the nearest possible value: the target lies in the friction factor's jump at a regime
    /// limit (see <see cref="PipeWarnings.AtRegimeLimit"/>).</summary>
    SolvedAtRegimeLimit,

    /// <summary>No answer: the available head does not exceed the elevation rise, so it cannot drive any flow.</summary>
    NoFlow,

    /// <summary>No answer: no size in the named table is large enough (for example the allowed head loss is
    /// smaller than the minor losses alone at the largest listed size).</summary>
    NoListedSize,

    /// <summary>No answer: the solution lies beyond the Reynolds numbers the friction relations accept (above 1e15, or
    /// below <see cref="Friction.DarcyFriction.MinimumReynolds"/>, 1e-3, where the laminar factor 64/Re exceeds 64 000),
    /// or beyond double precision (a vanishing length or flow).</summary>
    OutsideRange,

    /// <summary>The outer solve stopped without converging; the value is the best iterate.</summary>
    NotConverged,
}

/// <summary>Codes and sentences for <see cref="PipeStatus"/> and <see cref="PipeWarnings"/>.</summary>
public static class PipeStatusExtensions
{
    /// <summary>True when the result holds a usable value (<see cref="PipeStatus.Solved"/> or
    /// <see cref="PipeStatus.SolvedAtRegimeLimit"/>).</summary>
    /// <param name="status">The status.</param>
    public static bool HasAnswer(this PipeStatus status) =>
        status is PipeStatus.Solved or PipeStatus.SolvedAtRegimeLimit;

    /// <summary>A stable kebab-case code, for wire formats.</summary>
    /// <param name="status">The status.</param>
    public static string Code(this PipeStatus status) => status switch
    {
        PipeStatus.Solved => "solved",
        PipeStatus.SolvedAtRegimeLimit => "solved-at-regime-limit",
        PipeStatus.NoFlow => "no-flow",
        PipeStatus.NoListedSize => "no-listed-size",
        PipeStatus.OutsideRange => "outside-range",
        PipeStatus.NotConverged => "not-converged",
        _ => "unknown",
    };

    /// <summary>A sentence that says why the calculation ended (static strings; no allocation).</summary>
    /// <param name="status">The status.</param>
    public static string Reason(this PipeStatus status) => status switch
    {
        PipeStatus.Solved => "solved",
        PipeStatus.SolvedAtRegimeLimit =>
            "solved to the nearest value: the target lies in the friction factor's jump at a regime limit",
        PipeStatus.NoFlow => "no flow: the available head does not exceed the elevation rise",
        PipeStatus.NoListedSize => "no listed size is large enough for the allowed head loss",
        PipeStatus.OutsideRange => "the answer lies beyond the Reynolds numbers the friction relations accept",
        PipeStatus.NotConverged => "the solve stopped without converging",
        _ => "unknown",
    };

    /// <summary>Expands pipe warning flags into coded messages (allocates; for reports and the API).</summary>
    /// <param name="warnings">The flags.</param>
    /// <param name="velocity">Mean velocity in m/s, quoted in the messages.</param>
    /// <param name="options">The design velocity range quoted; <see cref="PipeOptions.Default"/> when omitted.</param>
    /// <param name="into">A list to append to; a new one when null.</param>
    public static List<CalculationWarning> Describe(this PipeWarnings warnings, double velocity,
        PipeOptions? options = null, List<CalculationWarning>? into = null)
    {
        var o = options ?? PipeOptions.Default;
        var list = into ?? new List<CalculationWarning>();
        var c = CultureInfo.InvariantCulture;
        if (warnings.HasFlag(PipeWarnings.VelocityBelowDesignRange))
            list.Add(new("velocity-below-design-range", string.Format(c,
                "Mean velocity {0:G4} m/s is below {1:G3} m/s, the low end of the usual design range (common practice); " +
                "sediment may settle.", velocity, o.MinimumDesignVelocity)));
        if (warnings.HasFlag(PipeWarnings.VelocityAboveDesignRange))
            list.Add(new("velocity-above-design-range", string.Format(c,
                "Mean velocity {0:G4} m/s is above {1:G3} m/s, the high end of the usual design range (common practice); " +
                "expect erosion, noise and surge pressures.", velocity, o.MaximumDesignVelocity)));
        if (warnings.HasFlag(PipeWarnings.AtRegimeLimit))
            list.Add(new("at-regime-limit",
                "The requested head falls inside the jump of the friction factor at a regime limit (Re 2000 or 4000), " +
                "so no value meets it exactly; the value at the limit is reported. Flow there may be laminar or turbulent."));
        if (warnings.HasFlag(PipeWarnings.NotConverged))
            list.Add(new("not-converged", "The pipe solve did not converge; the value is the best iterate and must not be used."));
        if (warnings.HasFlag(PipeWarnings.HazenWilliamsFluidOutsideRange))
            list.Add(new("hazen-williams-fluid-outside-range", string.Format(c,
                "Hazen-Williams holds for water at ordinary temperatures (kinematic viscosity {0:G3} to {1:G3} m2/s, about 4 to 30 degrees C: " +
                "common practice); use Darcy-Weisbach for this fluid.", HazenWilliams.MinimumViscosity, HazenWilliams.MaximumViscosity)));
        if (warnings.HasFlag(PipeWarnings.HazenWilliamsNotTurbulent))
            list.Add(new("hazen-williams-not-turbulent",
                "Hazen-Williams holds for turbulent flow only; the Reynolds number is below the turbulent limit."));
        if (warnings.HasFlag(PipeWarnings.HazenWilliamsDiameterOutsideRange))
            list.Add(new("hazen-williams-diameter-outside-range", string.Format(c,
                "Hazen-Williams is usually applied to diameters of {0:G3} m to {1:G3} m (common practice).",
                HazenWilliams.MinimumDiameter, HazenWilliams.MaximumDiameter)));
        if (warnings.HasFlag(PipeWarnings.HazenWilliamsVelocityOutsideRange))
            list.Add(new("hazen-williams-velocity-outside-range", string.Format(c,
                "Mean velocity {0:G4} m/s is above {1:G3} m/s, the usual upper limit for Hazen-Williams (common practice).",
                velocity, HazenWilliams.MaximumVelocity)));
        if (warnings.HasFlag(PipeWarnings.HazenWilliamsCoefficientOutsideRange))
            list.Add(new("hazen-williams-coefficient-outside-range", string.Format(c,
                "The C factor is outside {0:G3} to {1:G3}, the span of values tabulated for real pipe (common practice).",
                HazenWilliams.MinimumCoefficient, HazenWilliams.MaximumCoefficient)));
        if (warnings.HasFlag(PipeWarnings.MethodsDisagree))
            list.Add(new("methods-disagree",
                "Hazen-Williams and Darcy-Weisbach differ by more than 10 percent; check the C factor against the roughness."));
        return list;
    }
}
