namespace FlowSolve.Core;

/// <summary>
/// A warning attached to a result: a stable kebab-case <paramref name="Code"/> that callers may switch on,
/// and a sentence for people.
/// </summary>
/// <param name="Code">Stable identifier, for example <c>transitional-flow</c>.</param>
/// <param name="Message">Explanation for the engineer reading the result.</param>
public readonly record struct CalculationWarning(string Code, string Message);

/// <summary>The published validity range of a correlation and whether the inputs lie inside it.</summary>
/// <param name="Method">The correlation's identifier, for example <c>colebrook-white</c>.</param>
/// <param name="Source">The publication that states the range.</param>
/// <param name="Quantity">The input the range applies to, for example <c>reynolds</c>.</param>
/// <param name="Minimum">Lower end of the range (inclusive).</param>
/// <param name="Maximum">Upper end of the range (inclusive); positive infinity when open.</param>
/// <param name="Value">The input as used.</param>
public readonly record struct ValidityCheck(string Method, string Source, string Quantity, double Minimum, double Maximum, double Value)
{
    /// <summary>True when <see cref="Value"/> lies in [<see cref="Minimum"/>, <see cref="Maximum"/>].</summary>
    public bool InRange => Value >= Minimum && Value <= Maximum;
}
