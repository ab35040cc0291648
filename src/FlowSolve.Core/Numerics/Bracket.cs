namespace FlowSolve.Core.Numerics;

/// <summary>How much the caller knows about the interval handed to <see cref="SafeguardedNewton"/>.</summary>
public enum BracketKind
{
    /// <summary>The solver evaluates both ends and stops with <see cref="SolveStatus.NoSignChange"/> if the signs agree.</summary>
    Checked,

    /// <summary>The caller guarantees f(Lower) &lt; 0 &lt; f(Upper); the ends are not evaluated.</summary>
    KnownIncreasing,

    /// <summary>The caller guarantees f(Lower) &gt; 0 &gt; f(Upper); the ends are not evaluated.</summary>
    KnownDecreasing,

    /// <summary>
    /// Search bounds only: no sign change is required (an even-multiplicity root touches zero without crossing it).
    /// Steps that would leave the bounds are cut back halfway to the bound instead; the interval never shrinks,
    /// so convergence is not guaranteed and is reported as found.
    /// </summary>
    BoundsOnly,
}

/// <summary>An interval for a root solve, with what is known about the function's signs at its ends.</summary>
/// <param name="Lower">Lower end; finite.</param>
/// <param name="Upper">Upper end; finite and greater than <paramref name="Lower"/>.</param>
/// <param name="Kind">What is known about the signs at the ends.</param>
public readonly record struct Bracket(double Lower, double Upper, BracketKind Kind)
{
    /// <summary>An interval whose end signs the solver checks (two extra evaluations).</summary>
    public static Bracket Checked(double lower, double upper) => new(lower, upper, BracketKind.Checked);

    /// <summary>An interval on which the function is known to rise through zero.</summary>
    public static Bracket KnownIncreasing(double lower, double upper) => new(lower, upper, BracketKind.KnownIncreasing);

    /// <summary>An interval on which the function is known to fall through zero.</summary>
    public static Bracket KnownDecreasing(double lower, double upper) => new(lower, upper, BracketKind.KnownDecreasing);

    /// <summary>Search bounds with no sign change required; see <see cref="BracketKind.BoundsOnly"/>.</summary>
    public static Bracket BoundsOnly(double lower, double upper) => new(lower, upper, BracketKind.BoundsOnly);
}
