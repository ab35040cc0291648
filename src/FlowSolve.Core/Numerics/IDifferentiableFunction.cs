namespace FlowSolve.Core.Numerics;

/// <summary>
/// A scalar function that returns its value and first derivative together, so that a relation
/// computes shared sub-expressions (a logarithm, a square root) once per evaluation.
/// </summary>
/// <remarks>
/// Implement it on a <c>struct</c>: <see cref="SafeguardedNewton"/> is generic over the implementing type,
/// so the call is specialised by the JIT and the solve allocates nothing.
/// </remarks>
public interface IDifferentiableFunction
{
    /// <summary>Evaluates the function and its derivative at <paramref name="x"/>.</summary>
    (double Value, double Derivative) Evaluate(double x);
}
