using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace FlowSolve.Core.Friction;

/// <summary>What a span solve of Colebrook-White did, element by element summed up.</summary>
/// <param name="Count">Elements solved.</param>
/// <param name="WorstIterations">The largest iteration count of any element (0 for an empty span).</param>
/// <param name="NotConverged">Elements whose solve stopped without converging (as the scalar solve's status says);
/// their factor is the scalar solve's best iterate and must not be used.</param>
/// <param name="FirstNotConverged">Index of the first of them, or -1.</param>
/// <param name="Invalid">Elements with an argument the scalar solve refuses (a Reynolds number not finite and positive,
/// a relative roughness outside [0, 1), NaN): their factor is NaN and their iteration count 0.</param>
/// <param name="FirstInvalid">Index of the first of them, or -1.</param>
public readonly record struct ColebrookSpanResult(int Count, int WorstIterations, int NotConverged, int FirstNotConverged,
    int Invalid, int FirstInvalid)
{
    /// <summary>True when every element had valid arguments and converged.</summary>
    public bool AllConverged => NotConverged == 0 && Invalid == 0;
}

public static partial class ColebrookWhite
{
    private const int Lanes = 4;

    /// <summary>Solves Colebrook-White for many pipes at once: <c>frictionFactor[i]</c> for <c>reynolds[i]</c> and
    /// <c>relativeRoughness[i]</c>, four at a time in the hardware's vector registers, giving for every element exactly
    /// the factor and iteration count of <see cref="Solve(double, double, Numerics.SolverTrace?)"/>.</summary>
    /// <remarks>
    /// <para>The scalar solve is latency-bound: each Newton step waits for the logarithm and the division of the one
    /// before. Here four independent solves advance side by side in <see cref="Vector256{T}"/> lanes, so their
    /// logarithms and divisions overlap, and the general solver's set-up (options, bracket, result record) is paid once
    /// per span instead of once per pipe.</para>
    /// <para>Each lane repeats the scalar solve's operations in the same order on the same values: the start x = 8, the
    /// known bracket [0.5, 50] and its update, the Newton step x - g/g', the bisection rules (step leaving the bracket,
    /// step not halving), the stop on a step below 2e-15 |x| and the stop on a predicted step. Vector additions,
    /// multiplications and divisions round as the scalar ones do (IEEE 754, no fused multiply-add), and the logarithm is
    /// <see cref="Math.Log(double)"/> of each active lane, because no vector logarithm rounds as the platform's scalar one
    /// does: a logarithm one unit in the last place apart changes a Newton iterate, and the stopping tests then end
    /// on a different last step, up to tens of units in the last place of f apart. With the same logarithm the answers
    /// are equal bit for bit.</para>
    /// <para>Elements outside the known bracket's domain (Re below 2000 or above 1e25) are handed to the scalar solve,
    /// which checks a wider bracket; elements with invalid arguments get NaN and are counted in
    /// <see cref="ColebrookSpanResult.Invalid"/> instead of throwing, so one bad pipe cannot stop a whole span.</para>
    /// </remarks>
    /// <param name="reynolds">Reynolds numbers.</param>
    /// <param name="relativeRoughness">Relative roughnesses e/D, as many as <paramref name="reynolds"/>.</param>
    /// <param name="frictionFactor">Receives the Darcy friction factors; as long as <paramref name="reynolds"/>.</param>
    /// <param name="iterations">When not empty (as long as <paramref name="reynolds"/>), receives each element's
    /// iteration count (0 for an invalid element).</param>
    /// <returns>The count, the worst iteration count, and the elements not converged or invalid.</returns>
    /// <exception cref="ArgumentException">The spans' lengths differ.</exception>
    public static ColebrookSpanResult Solve(ReadOnlySpan<double> reynolds, ReadOnlySpan<double> relativeRoughness,
        Span<double> frictionFactor, Span<int> iterations = default)
    {
        int n = reynolds.Length;
        if (relativeRoughness.Length != n || frictionFactor.Length != n || (!iterations.IsEmpty && iterations.Length != n))
            ThrowLengths();
        bool wantIterations = !iterations.IsEmpty;
        var tally = new Tally { FirstNotConverged = -1, FirstInvalid = -1 };

        int i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            ref double reStart = ref MemoryMarshal.GetReference(reynolds);
            ref double rrStart = ref MemoryMarshal.GetReference(relativeRoughness);
            ref double fStart = ref MemoryMarshal.GetReference(frictionFactor);
            for (; i + Lanes <= n; i += Lanes)
            {
                var re = Vector256.LoadUnsafe(ref reStart, (nuint)i);
                var rr = Vector256.LoadUnsafe(ref rrStart, (nuint)i);
                var (f, its, scalarLanes, failedLanes) = Block(re, rr);
                f.StoreUnsafe(ref fStart, (nuint)i);
                for (int k = 0; k < Lanes; k++)
                {
                    if ((scalarLanes >> k & 1) != 0)
                    {
                        One(reynolds[i + k], relativeRoughness[i + k], frictionFactor, iterations, i + k, ref tally);
                        continue;
                    }
                    int count = (int)its.GetElement(k);
                    if (wantIterations) iterations[i + k] = count;
                    tally.Worst = Math.Max(tally.Worst, count);
                    if ((failedLanes >> k & 1) != 0) tally.NotConverged(i + k);
                }
            }
        }
        for (; i < n; i++)
            One(reynolds[i], relativeRoughness[i], frictionFactor, iterations, i, ref tally);

        return new ColebrookSpanResult(n, tally.Worst, tally.NotConvergedCount, tally.FirstNotConverged,
            tally.InvalidCount, tally.FirstInvalid);
    }

    /// <summary>One element by the scalar solve, or NaN for arguments it would refuse.</summary>
    private static void One(double reynolds, double relativeRoughness, Span<double> frictionFactor, Span<int> iterations,
        int index, ref Tally tally)
    {
        if (!(reynolds > 0) || !double.IsFinite(reynolds) || !(relativeRoughness >= 0) || !(relativeRoughness < 1))
        {
            frictionFactor[index] = double.NaN;
            if (!iterations.IsEmpty) iterations[index] = 0;
            tally.Invalid(index);
            return;
        }
        var result = Solve(reynolds, relativeRoughness);
        frictionFactor[index] = result.FrictionFactor;
        if (!iterations.IsEmpty) iterations[index] = result.Iterations;
        tally.Worst = Math.Max(tally.Worst, result.Iterations);
        if (!result.Converged) tally.NotConverged(index);
    }

    /// <summary>Four solves in the lanes of a vector: the scalar <see cref="Numerics.SafeguardedNewton"/> with the
    /// known bracket, statement for statement (see <see cref="Solve(ReadOnlySpan{double}, ReadOnlySpan{double}, Span{double}, Span{int})"/>).</summary>
    /// <returns>The factors; the iteration counts; the lanes left to the scalar solve (bit k for lane k); the lanes
    /// that stopped without converging.</returns>
    private static (Vector256<double> FrictionFactor, Vector256<long> Iterations, uint ScalarLanes, uint FailedLanes)
        Block(Vector256<double> reynolds, Vector256<double> relativeRoughness)
    {
        var zero = Vector256<double>.Zero;
        // The domain of the known bracket [0.5, 50] (ColebrookWhite.Solve's remarks prove it), with valid roughness.
        var inDomain = Vector256.GreaterThanOrEqual(reynolds, Vector256.Create(2000.0))
            & Vector256.LessThanOrEqual(reynolds, Vector256.Create(1e25))
            & Vector256.GreaterThanOrEqual(relativeRoughness, zero)
            & Vector256.LessThan(relativeRoughness, Vector256.Create(1.0));
        uint scalarLanes = ~inDomain.ExtractMostSignificantBits() & 0xF;

        // The Equation struct's constants, rounded as there: c = 2.51/Re and r = (e/D)/3.7.
        var c = Vector256.Create(2.51) / reynolds;
        var r = relativeRoughness / Vector256.Create(3.7);

        var x = Vector256.Create(Start);
        var lo = Vector256.Create(0.5);
        var hi = Vector256.Create(50.0);
        var done = ~inDomain;           // lanes finished (or never started); all bits set where true
        var failed = zero;
        var result = x;
        var iterationsDone = Vector256<long>.Zero;

        var (fx, dfx) = Evaluate(x, c, r, inDomain.ExtractMostSignificantBits());
        // The sizes of the last two steps start at the interval's width, as in the scalar solve.
        var previousStep = Vector256.Create(49.5);
        var stepBeforeLast = previousStep;
        var previousWasNewton = zero;

        for (long iteration = 1; ; iteration++)
        {
            var active = ~done;
            if (active.ExtractMostSignificantBits() == 0) break;
            var before = Vector256.Create(iteration - 1);
            var now = Vector256.Create(iteration);

            // Non-finite value (cannot happen inside the domain: a > 0; kept so the lanes follow the scalar rules).
            var stop = active & ~Vector256.IsFinite(fx);
            failed |= stop;
            Finish(stop, x, before, ref result, ref iterationsDone, ref done, ref active);
            Finish(active & Vector256.Equals(fx, zero), x, before, ref result, ref iterationsDone, ref done, ref active);
            if (iteration > MaxIterations)
            {
                failed |= active;
                Finish(active, x, before, ref result, ref iterationsDone, ref done, ref active);
                break;
            }

            var below = Vector256.LessThan(fx, zero);
            lo = Vector256.ConditionalSelect(active & below, x, lo);
            hi = Vector256.ConditionalSelect(active & ~below, x, hi);

            var tolerance = Vector256.Create(RelativeTolerance) * Vector256.Abs(x);
            Finish(active & Vector256.LessThanOrEqual(hi - lo, Vector256.Create(2.0) * tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            var badDerivative = Vector256.Equals(dfx, zero) | ~Vector256.IsFinite(dfx);
            var newtonStep = fx / dfx;
            var next = x - newtonStep;
            var absNewton = Vector256.Abs(newtonStep);
            Finish(active & ~badDerivative & Vector256.LessThanOrEqual(absNewton, tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            var bisect = badDerivative
                | ~(Vector256.GreaterThan(next, lo) & Vector256.LessThan(next, hi))
                | Vector256.GreaterThan(absNewton, Vector256.Create(0.5) * Vector256.Abs(stepBeforeLast));
            next = Vector256.ConditionalSelect(bisect, lo + Vector256.Create(0.5) * (hi - lo), next);

            var step = next - x;
            var absStep = Vector256.Abs(step);
            var predicted = active & ~bisect & previousWasNewton
                & Vector256.LessThanOrEqual(absStep, Vector256.Create(0.1) * Vector256.Abs(previousStep))
                & Vector256.LessThanOrEqual(absStep * absStep * absStep, tolerance * previousStep * previousStep);
            Finish(predicted, next, now, ref result, ref iterationsDone, ref done, ref active);

            previousWasNewton = ~bisect;
            stepBeforeLast = previousStep;
            previousStep = step;

            Finish(active & Vector256.LessThanOrEqual(absStep, tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            x = next;
            uint evaluate = active.ExtractMostSignificantBits();
            if (evaluate == 0) break;
            (fx, dfx) = Evaluate(x, c, r, evaluate);
        }

        return (Vector256<double>.One / (result * result), iterationsDone, scalarLanes, failed.ExtractMostSignificantBits());
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Finish(Vector256<double> stop, Vector256<double> value, Vector256<long> count,
        ref Vector256<double> result, ref Vector256<long> iterations, ref Vector256<double> done, ref Vector256<double> active)
    {
        stop &= active;
        result = Vector256.ConditionalSelect(stop, value, result);
        iterations = Vector256.ConditionalSelect(stop.AsInt64(), count, iterations);
        done |= stop;
        active &= ~stop;
    }

    /// <summary>g(x) = x + (2/ln 10) ln(r + c x) and g'(x) = 1 + (2/ln 10) c / (r + c x), as the scalar Equation
    /// computes them; the logarithm only in the lanes set in <paramref name="lanes"/> (the others are finished).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static (Vector256<double> Value, Vector256<double> Derivative) Evaluate(Vector256<double> x,
        Vector256<double> c, Vector256<double> r, uint lanes)
    {
        var a = r + c * x;
        var log = Vector256.Create(
            (lanes & 1) != 0 ? Math.Log(a.GetElement(0)) : 0.0,
            (lanes & 2) != 0 ? Math.Log(a.GetElement(1)) : 0.0,
            (lanes & 4) != 0 ? Math.Log(a.GetElement(2)) : 0.0,
            (lanes & 8) != 0 ? Math.Log(a.GetElement(3)) : 0.0);
        var k = Vector256.Create(TwoOverLn10);
        return (x + k * log, Vector256<double>.One + k * c / a);
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private static void ThrowLengths() =>
        throw new ArgumentException("reynolds, relativeRoughness, frictionFactor (and iterations when given) must have the same length");

    private struct Tally
    {
        public int Worst, NotConvergedCount, FirstNotConverged, InvalidCount, FirstInvalid;

        public void NotConverged(int index)
        {
            if (NotConvergedCount++ == 0) FirstNotConverged = index;
        }

        public void Invalid(int index)
        {
            if (InvalidCount++ == 0) FirstInvalid = index;
        }
    }
}
