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
    /// <summary>Solves Colebrook-White for many pipes at once: <c>frictionFactor[i]</c> for <c>reynolds[i]</c> and
    /// <c>relativeRoughness[i]</c>, eight at a time in <see cref="Vector512{T}"/> lanes (four in <see cref="Vector256{T}"/>
    /// without AVX-512; one by one without either), giving for every element exactly the factor and iteration count of
    /// <see cref="Solve(double, double, Numerics.SolverTrace?)"/>.</summary>
    /// <remarks>
    /// <para>The scalar solve is latency-bound: each Newton step waits for the logarithm and the division of the one
    /// before. Here independent solves advance side by side in vector lanes, so their logarithms and divisions overlap,
    /// and the general solver's set-up (options, bracket, result record) is paid once per span instead of once per pipe.</para>
    /// <para>Each lane repeats the scalar solve's operations in the same order on the same values: the start x = 8, the
    /// known bracket [0.5, 50] and its update, the Newton step x - g/g', the bisection rules (step leaving the bracket,
    /// step not halving), the stop on a step below 2e-15 |x| and the stop on a predicted step. Vector additions,
    /// multiplications and divisions round as the scalar ones do (IEEE 754, no fused multiply-add in the iteration).
    /// The logarithm must round as the platform's <see cref="Math.Log(double)"/> does: one unit in the last place apart
    /// changes a Newton iterate, and the stopping tests then end on a different last step, up to tens of units in the
    /// last place of f apart (measured with .NET's own vector logarithm: Vector512.Log differs from Math.Log in 0.8
    /// percent of arguments, by up to 3 ulp). So the lanes use <see cref="LogNearest512"/>, a logarithm rounded to nearest that says when it cannot
    /// be sure of the rounding, and take Math.Log in those lanes (by its margin, about 8 percent of them). A platform logarithm within
    /// 0.531 ulp (glibc's is within 0.519, from memory) then gives the same double, and the answers are equal bit for bit;
    /// the tests hold the contract of 2 ulp over the whole domain.</para>
    /// <para>Elements outside the known bracket's domain (Re below 2000 or above 1e25) are handed to the scalar solve,
    /// which checks a wider bracket; elements with invalid arguments get NaN and are counted in
    /// <see cref="ColebrookSpanResult.Invalid"/> instead of throwing, so one bad pipe cannot stop a whole span. The
    /// solve allocates nothing.</para>
    /// </remarks>
    /// <param name="reynolds">Reynolds numbers.</param>
    /// <param name="relativeRoughness">Relative roughnesses e/D, as many as <paramref name="reynolds"/>.</param>
    /// <param name="frictionFactor">Receives the Darcy friction factors; as long as <paramref name="reynolds"/>.</param>
    /// <param name="iterations">When not empty (as long as <paramref name="reynolds"/>), receives each element's
    /// iteration count (0 for an invalid element).</param>
    /// <returns>The count, the worst iteration count, and the elements not converged or invalid.</returns>
    /// <exception cref="ArgumentException">The spans' lengths differ.</exception>
    public static ColebrookSpanResult Solve(ReadOnlySpan<double> reynolds, ReadOnlySpan<double> relativeRoughness,
        Span<double> frictionFactor, Span<int> iterations = default) =>
        Solve(reynolds, relativeRoughness, frictionFactor, iterations,
            Vector512.IsHardwareAccelerated ? 8 : Vector256.IsHardwareAccelerated ? 4 : 1);

    /// <summary>The span solve with a chosen number of lanes: 8 (AVX-512), 4 (AVX2) or 1 (the scalar solve element by
    /// element); tests run every width the machine has.</summary>
    internal static ColebrookSpanResult Solve(ReadOnlySpan<double> reynolds, ReadOnlySpan<double> relativeRoughness,
        Span<double> frictionFactor, Span<int> iterations, int lanes)
    {
        int n = reynolds.Length;
        if (relativeRoughness.Length != n || frictionFactor.Length != n || (!iterations.IsEmpty && iterations.Length != n))
            ThrowLengths();
        var tally = new Tally { FirstNotConverged = -1, FirstInvalid = -1 };
        int i = lanes switch
        {
            8 => Blocks512(reynolds, relativeRoughness, frictionFactor, iterations, ref tally),
            4 => Blocks256(reynolds, relativeRoughness, frictionFactor, iterations, ref tally),
            _ => 0,
        };
        for (; i < n; i++)
            One(reynolds[i], relativeRoughness[i], frictionFactor, iterations, i, ref tally);
        return new ColebrookSpanResult(n, tally.Worst, tally.NotConvergedCount, tally.FirstNotConverged,
            tally.InvalidCount, tally.FirstInvalid);
    }

    /// <summary>Every whole vector of 8 lanes; returns where the tail starts.</summary>
    private static int Blocks512(ReadOnlySpan<double> reynolds, ReadOnlySpan<double> relativeRoughness,
        Span<double> frictionFactor, Span<int> iterations, ref Tally tally)
    {
        int n = reynolds.Length, i = 0;
        ref double reStart = ref MemoryMarshal.GetReference(reynolds);
        ref double rrStart = ref MemoryMarshal.GetReference(relativeRoughness);
        ref double fStart = ref MemoryMarshal.GetReference(frictionFactor);
        for (; i + 8 <= n; i += 8)
        {
            var (f, its, scalarLanes, failedLanes) = Block512(Vector512.LoadUnsafe(ref reStart, (nuint)i), Vector512.LoadUnsafe(ref rrStart, (nuint)i));
            f.StoreUnsafe(ref fStart, (nuint)i);
            for (int k = 0; k < 8; k++)
            {
                if ((scalarLanes >> k & 1) != 0)
                {
                    One(reynolds[i + k], relativeRoughness[i + k], frictionFactor, iterations, i + k, ref tally);
                    continue;
                }
                int count = (int)its.GetElement(k);
                if (!iterations.IsEmpty) iterations[i + k] = count;
                tally.Worst = Math.Max(tally.Worst, count);
                if ((failedLanes >> k & 1) != 0) tally.NotConverged(i + k);
            }
        }
        return i;
    }

    /// <summary>Every whole vector of 4 lanes; returns where the tail starts.</summary>
    private static int Blocks256(ReadOnlySpan<double> reynolds, ReadOnlySpan<double> relativeRoughness,
        Span<double> frictionFactor, Span<int> iterations, ref Tally tally)
    {
        int n = reynolds.Length, i = 0;
        ref double reStart = ref MemoryMarshal.GetReference(reynolds);
        ref double rrStart = ref MemoryMarshal.GetReference(relativeRoughness);
        ref double fStart = ref MemoryMarshal.GetReference(frictionFactor);
        for (; i + 4 <= n; i += 4)
        {
            var (f, its, scalarLanes, failedLanes) = Block256(Vector256.LoadUnsafe(ref reStart, (nuint)i), Vector256.LoadUnsafe(ref rrStart, (nuint)i));
            f.StoreUnsafe(ref fStart, (nuint)i);
            for (int k = 0; k < 4; k++)
            {
                if ((scalarLanes >> k & 1) != 0)
                {
                    One(reynolds[i + k], relativeRoughness[i + k], frictionFactor, iterations, i + k, ref tally);
                    continue;
                }
                int count = (int)its.GetElement(k);
                if (!iterations.IsEmpty) iterations[i + k] = count;
                tally.Worst = Math.Max(tally.Worst, count);
                if ((failedLanes >> k & 1) != 0) tally.NotConverged(i + k);
            }
        }
        return i;
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

    /// <summary>Eight solves in the lanes of a Vector512: the scalar <see cref="Numerics.SafeguardedNewton"/> with the
    /// known bracket, statement for statement (see <see cref="Solve(ReadOnlySpan{double}, ReadOnlySpan{double}, Span{double}, Span{int})"/>).</summary>
    /// <returns>The factors; the iteration counts; the lanes left to the scalar solve (bit k for lane k); the lanes
    /// that stopped without converging.</returns>
    private static (Vector512<double> FrictionFactor, Vector512<long> Iterations, ulong ScalarLanes, ulong FailedLanes)
        Block512(Vector512<double> reynolds, Vector512<double> relativeRoughness)
    {
        var zero = Vector512<double>.Zero;
        // The domain of the known bracket [0.5, 50] (ColebrookWhite.Solve's remarks prove it), with valid roughness.
        var inDomain = Vector512.GreaterThanOrEqual(reynolds, Vector512.Create(2000.0))
            & Vector512.LessThanOrEqual(reynolds, Vector512.Create(1e25))
            & Vector512.GreaterThanOrEqual(relativeRoughness, zero)
            & Vector512.LessThan(relativeRoughness, Vector512.Create(1.0));
        ulong scalarLanes = ~inDomain.ExtractMostSignificantBits() & 0xFF;

        // The Equation struct's constants, rounded as there: c = 2.51/Re and r = (e/D)/3.7.
        var c = Vector512.Create(2.51) / reynolds;
        var r = relativeRoughness / Vector512.Create(3.7);

        var x = Vector512.Create(Start);
        var lo = Vector512.Create(0.5);
        var hi = Vector512.Create(50.0);
        var done = ~inDomain;           // lanes finished (or never started); all bits set where true
        var failed = zero;
        var result = x;
        var iterationsDone = Vector512<long>.Zero;

        var (fx, dfx) = Evaluate512(x, c, r, inDomain.ExtractMostSignificantBits());
        // The sizes of the last two steps start at the interval's width, as in the scalar solve.
        var previousStep = Vector512.Create(49.5);
        var stepBeforeLast = previousStep;
        var previousWasNewton = zero;

        for (long iteration = 1; ; iteration++)
        {
            var active = ~done;
            if (active.ExtractMostSignificantBits() == 0) break;
            var before = Vector512.Create(iteration - 1);
            var now = Vector512.Create(iteration);

            // Non-finite value (cannot happen inside the domain: a > 0; kept so the lanes follow the scalar rules).
            var stop = active & ~Vector512.IsFinite(fx);
            failed |= stop;
            Finish512(stop, x, before, ref result, ref iterationsDone, ref done, ref active);
            Finish512(active & Vector512.Equals(fx, zero), x, before, ref result, ref iterationsDone, ref done, ref active);
            if (iteration > MaxIterations)
            {
                failed |= active;
                Finish512(active, x, before, ref result, ref iterationsDone, ref done, ref active);
                break;
            }

            var below = Vector512.LessThan(fx, zero);
            lo = Vector512.ConditionalSelect(active & below, x, lo);
            hi = Vector512.ConditionalSelect(active & ~below, x, hi);

            var tolerance = Vector512.Create(RelativeTolerance) * Vector512.Abs(x);
            Finish512(active & Vector512.LessThanOrEqual(hi - lo, Vector512.Create(2.0) * tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            var badDerivative = Vector512.Equals(dfx, zero) | ~Vector512.IsFinite(dfx);
            var newtonStep = fx / dfx;
            var next = x - newtonStep;
            var absNewton = Vector512.Abs(newtonStep);
            Finish512(active & ~badDerivative & Vector512.LessThanOrEqual(absNewton, tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            var bisect = badDerivative
                | ~(Vector512.GreaterThan(next, lo) & Vector512.LessThan(next, hi))
                | Vector512.GreaterThan(absNewton, Vector512.Create(0.5) * Vector512.Abs(stepBeforeLast));
            next = Vector512.ConditionalSelect(bisect, lo + Vector512.Create(0.5) * (hi - lo), next);

            var step = next - x;
            var absStep = Vector512.Abs(step);
            var predicted = active & ~bisect & previousWasNewton
                & Vector512.LessThanOrEqual(absStep, Vector512.Create(0.1) * Vector512.Abs(previousStep))
                & Vector512.LessThanOrEqual(absStep * absStep * absStep, tolerance * previousStep * previousStep);
            Finish512(predicted, next, now, ref result, ref iterationsDone, ref done, ref active);

            previousWasNewton = ~bisect;
            stepBeforeLast = previousStep;
            previousStep = step;

            Finish512(active & Vector512.LessThanOrEqual(absStep, tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            x = next;
            ulong evaluate = active.ExtractMostSignificantBits();
            if (evaluate == 0) break;
            (fx, dfx) = Evaluate512(x, c, r, evaluate);
        }

        return (Vector512<double>.One / (result * result), iterationsDone, scalarLanes, failed.ExtractMostSignificantBits());
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Finish512(Vector512<double> stop, Vector512<double> value, Vector512<long> count,
        ref Vector512<double> result, ref Vector512<long> iterations, ref Vector512<double> done, ref Vector512<double> active)
    {
        stop &= active;
        result = Vector512.ConditionalSelect(stop, value, result);
        iterations = Vector512.ConditionalSelect(stop.AsInt64(), count, iterations);
        done |= stop;
        active &= ~stop;
    }

    /// <summary>g(x) = x + (2/ln 10) ln(r + c x) and g'(x) = 1 + (2/ln 10) c / (r + c x), as the scalar Equation
    /// computes them, in the lanes set in <paramref name="lanes"/> (the others are finished and their values unused).
    /// The logarithm is the lanes' logarithm rounded to nearest, or <see cref="Math.Log(double)"/> in a lane where that cannot be sure of
    /// the rounding.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static (Vector512<double> Value, Vector512<double> Derivative) Evaluate512(Vector512<double> x,
        Vector512<double> c, Vector512<double> r, ulong lanes)
    {
        var a = r + c * x;
        var log = LogNearest512(a, out var unsure);
        ulong scalar = unsure.ExtractMostSignificantBits() & lanes;
        while (scalar != 0)
        {
            int k = System.Numerics.BitOperations.TrailingZeroCount(scalar);
            log = log.WithElement(k, Math.Log(a.GetElement(k)));
            scalar &= scalar - 1;
        }
        var k2 = Vector512.Create(TwoOverLn10);
        return (x + k2 * log, Vector512<double>.One + k2 * c / a);
    }

    /// <summary>The natural logarithm rounded to nearest, in every lane where the rounding is certain;
    /// <paramref name="unsure"/> marks the lanes where it is not (the exact value within <see cref="MidpointMargin"/> of a
    /// midpoint between two doubles, or an argument outside [2^-1000, 0.5]). A correctly rounded result agrees with any
    /// logarithm whose error is below 0.5 + margin ulp, which is what makes the vector lanes repeat the scalar solve.</summary>
    /// <remarks>a = 2^k m with m in [sqrt(1/2), sqrt(2)), ln a = k ln 2 + 2 atanh(s), s = (m - 1)/(m + 1), |s| &lt;= 0.1716:
    /// s as a double-double (m - 1 exact, the quotient's remainder by a fused multiply-add), 2 atanh(s) = 2s + 2s^3 P(s^2)
    /// with the series P(z) = sum z^j/(2j + 3) to j = 9 (the rest below 2^-62 in absolute value), and k ln 2 + 2 s summed
    /// exactly. The arguments here (r + c x) lie in [1e-25, 0.34], so |ln a| &gt; 1 and the leading sum dominates; the
    /// error of the small terms is below 0.012 ulp of the result.</remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static Vector512<double> LogNearest512(Vector512<double> a, out Vector512<double> unsure)
    {
        var one = Vector512<double>.One;
        var bits = a.AsInt64();
        var k = Vector512.ShiftRightArithmetic(bits - Vector512.Create(0x3FE6A09E667F3BCDL), 52);
        var m = (bits - Vector512.ShiftLeft(k, 52)).AsDouble();
        var kd = Vector512.ConvertToDouble(k);

        var f = m - one;                                   // exact: m in [1/2, 2]
        var den = m + one;
        var back = den - m;
        var denLo = (m - (den - back)) + (one - back);     // m + 1 = den + denLo exactly
        var inverse = one / den;
        var sHi = f * inverse;
        var remainder = Vector512.FusedMultiplyAdd(-sHi, den, f);        // f - sHi den, exact
        remainder = Vector512.FusedMultiplyAdd(-sHi, denLo, remainder);
        var sLo = remainder * inverse;

        // P by Estrin's scheme: shorter dependency chains than Horner's, and the lanes wait on them.
        var z = sHi * sHi;
        var z2 = z * z;
        var z4 = z2 * z2;
        var p01 = Vector512.FusedMultiplyAdd(Vector512.Create(1.0 / 5), z, Vector512.Create(1.0 / 3));
        var p23 = Vector512.FusedMultiplyAdd(Vector512.Create(1.0 / 9), z, Vector512.Create(1.0 / 7));
        var p45 = Vector512.FusedMultiplyAdd(Vector512.Create(1.0 / 13), z, Vector512.Create(1.0 / 11));
        var p67 = Vector512.FusedMultiplyAdd(Vector512.Create(1.0 / 17), z, Vector512.Create(1.0 / 15));
        var p89 = Vector512.FusedMultiplyAdd(Vector512.Create(1.0 / 21), z, Vector512.Create(1.0 / 19));
        var p03 = Vector512.FusedMultiplyAdd(p23, z2, p01);
        var p47 = Vector512.FusedMultiplyAdd(p67, z2, p45);
        var p = Vector512.FusedMultiplyAdd(Vector512.FusedMultiplyAdd(p89, z4, p47), z4, p03);
        var twoS = sHi + sHi;
        var tail = twoS * z * p;

        var high = kd * Vector512.Create(Ln2Hi);           // exact
        var sum = high + twoS;                             // two-sum: sum + error = high + twoS exactly
        var b = sum - high;
        var error = (high - (sum - b)) + (twoS - b);
        var low = error + (kd * Vector512.Create(Ln2Lo) + ((sLo + sLo) + tail));
        var y = sum + low;
        var left = low - (y - sum);                        // what rounding y dropped (|sum| > 1 > |low|)

        var ulp = ((Vector512.Abs(y).AsInt64() & Vector512.Create(0x7FF0000000000000L)) - Vector512.Create(52L << 52)).AsDouble();
        var fromMidpoint = Vector512.Abs(Vector512.Abs(left) - Vector512.Create(0.5) * ulp);
        unsure = Vector512.LessThan(fromMidpoint, Vector512.Create(MidpointMargin) * ulp)
            | Vector512.Equals(y.AsInt64() & Vector512.Create(0x000FFFFFFFFFFFFFL), Vector512<long>.Zero).AsDouble()
            | ~(Vector512.GreaterThanOrEqual(a, Vector512.Create(Math.ScaleB(1.0, -1000))) & Vector512.LessThanOrEqual(a, Vector512.Create(0.5)));
        return y;
    }

    /// <summary>Four solves in the lanes of a Vector256: the scalar <see cref="Numerics.SafeguardedNewton"/> with the
    /// known bracket, statement for statement (see <see cref="Solve(ReadOnlySpan{double}, ReadOnlySpan{double}, Span{double}, Span{int})"/>).</summary>
    /// <returns>The factors; the iteration counts; the lanes left to the scalar solve (bit k for lane k); the lanes
    /// that stopped without converging.</returns>
    private static (Vector256<double> FrictionFactor, Vector256<long> Iterations, uint ScalarLanes, uint FailedLanes)
        Block256(Vector256<double> reynolds, Vector256<double> relativeRoughness)
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

        var (fx, dfx) = Evaluate256(x, c, r, inDomain.ExtractMostSignificantBits());
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
            Finish256(stop, x, before, ref result, ref iterationsDone, ref done, ref active);
            Finish256(active & Vector256.Equals(fx, zero), x, before, ref result, ref iterationsDone, ref done, ref active);
            if (iteration > MaxIterations)
            {
                failed |= active;
                Finish256(active, x, before, ref result, ref iterationsDone, ref done, ref active);
                break;
            }

            var below = Vector256.LessThan(fx, zero);
            lo = Vector256.ConditionalSelect(active & below, x, lo);
            hi = Vector256.ConditionalSelect(active & ~below, x, hi);

            var tolerance = Vector256.Create(RelativeTolerance) * Vector256.Abs(x);
            Finish256(active & Vector256.LessThanOrEqual(hi - lo, Vector256.Create(2.0) * tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            var badDerivative = Vector256.Equals(dfx, zero) | ~Vector256.IsFinite(dfx);
            var newtonStep = fx / dfx;
            var next = x - newtonStep;
            var absNewton = Vector256.Abs(newtonStep);
            Finish256(active & ~badDerivative & Vector256.LessThanOrEqual(absNewton, tolerance), x, now,
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
            Finish256(predicted, next, now, ref result, ref iterationsDone, ref done, ref active);

            previousWasNewton = ~bisect;
            stepBeforeLast = previousStep;
            previousStep = step;

            Finish256(active & Vector256.LessThanOrEqual(absStep, tolerance), x, now,
                ref result, ref iterationsDone, ref done, ref active);

            x = next;
            uint evaluate = active.ExtractMostSignificantBits();
            if (evaluate == 0) break;
            (fx, dfx) = Evaluate256(x, c, r, evaluate);
        }

        return (Vector256<double>.One / (result * result), iterationsDone, scalarLanes, failed.ExtractMostSignificantBits());
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Finish256(Vector256<double> stop, Vector256<double> value, Vector256<long> count,
        ref Vector256<double> result, ref Vector256<long> iterations, ref Vector256<double> done, ref Vector256<double> active)
    {
        stop &= active;
        result = Vector256.ConditionalSelect(stop, value, result);
        iterations = Vector256.ConditionalSelect(stop.AsInt64(), count, iterations);
        done |= stop;
        active &= ~stop;
    }

    /// <summary>g(x) = x + (2/ln 10) ln(r + c x) and g'(x) = 1 + (2/ln 10) c / (r + c x), as the scalar Equation
    /// computes them, in the lanes set in <paramref name="lanes"/> (the others are finished and their values unused).
    /// The logarithm is the lanes' logarithm rounded to nearest, or <see cref="Math.Log(double)"/> in a lane where that cannot be sure of
    /// the rounding.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static (Vector256<double> Value, Vector256<double> Derivative) Evaluate256(Vector256<double> x,
        Vector256<double> c, Vector256<double> r, uint lanes)
    {
        var a = r + c * x;
        var log = LogNearest256(a, out var unsure);
        uint scalar = unsure.ExtractMostSignificantBits() & lanes;
        while (scalar != 0)
        {
            int k = System.Numerics.BitOperations.TrailingZeroCount(scalar);
            log = log.WithElement(k, Math.Log(a.GetElement(k)));
            scalar &= scalar - 1;
        }
        var k2 = Vector256.Create(TwoOverLn10);
        return (x + k2 * log, Vector256<double>.One + k2 * c / a);
    }

    /// <summary>How close (in units in the last place of the answer) the exact logarithm may come to a rounding midpoint
    /// before <see cref="LogNearest256"/> declines to round it: its own error (at most about 0.012 ulp, from the analysis in
    /// its remarks) plus the platform logarithm's excess over half an ulp (0.019 for glibc's, whose stated bound is
    /// 0.519 ulp, from memory; 0.0021 measured over 400 000 arguments against 60-digit decimal logarithms), with room.</summary>
    private const double MidpointMargin = 0.04;

    // ln 2 split so that k ln2Hi is exact for |k| < 2^20 (ln2Hi has 32 significant bits); ln2Hi + ln2Lo is ln 2 to
    // 1.7e-26 relative (checked against a 60-digit decimal logarithm). The usual split of ln 2 (common practice).
    private static readonly double Ln2Hi = BitConverter.Int64BitsToDouble(0x3FE62E42FEE00000);
    private static readonly double Ln2Lo = BitConverter.Int64BitsToDouble(0x3DEA39EF35793C76);

    /// <summary>The natural logarithm rounded to nearest, in every lane where the rounding is certain;
    /// <paramref name="unsure"/> marks the lanes where it is not (the exact value within <see cref="MidpointMargin"/> of a
    /// midpoint between two doubles, or an argument outside [2^-1000, 0.5]). A correctly rounded result agrees with any
    /// logarithm whose error is below 0.5 + margin ulp, which is what makes the vector lanes repeat the scalar solve.</summary>
    /// <remarks>a = 2^k m with m in [sqrt(1/2), sqrt(2)), ln a = k ln 2 + 2 atanh(s), s = (m - 1)/(m + 1), |s| &lt;= 0.1716:
    /// s as a double-double (m - 1 exact, the quotient's remainder by a fused multiply-add), 2 atanh(s) = 2s + 2s^3 P(s^2)
    /// with the series P(z) = sum z^j/(2j + 3) to j = 9 (the rest below 2^-62 in absolute value), and k ln 2 + 2 s summed
    /// exactly. The arguments here (r + c x) lie in [1e-25, 0.34], so |ln a| &gt; 1 and the leading sum dominates; the
    /// error of the small terms is below 0.012 ulp of the result.</remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static Vector256<double> LogNearest256(Vector256<double> a, out Vector256<double> unsure)
    {
        var one = Vector256<double>.One;
        var bits = a.AsInt64();
        var k = Vector256.ShiftRightArithmetic(bits - Vector256.Create(0x3FE6A09E667F3BCDL), 52);
        var m = (bits - Vector256.ShiftLeft(k, 52)).AsDouble();
        var kd = Vector256.ConvertToDouble(k);

        var f = m - one;                                   // exact: m in [1/2, 2]
        var den = m + one;
        var back = den - m;
        var denLo = (m - (den - back)) + (one - back);     // m + 1 = den + denLo exactly
        var inverse = one / den;
        var sHi = f * inverse;
        var remainder = Vector256.FusedMultiplyAdd(-sHi, den, f);        // f - sHi den, exact
        remainder = Vector256.FusedMultiplyAdd(-sHi, denLo, remainder);
        var sLo = remainder * inverse;

        // P by Estrin's scheme: shorter dependency chains than Horner's, and the lanes wait on them.
        var z = sHi * sHi;
        var z2 = z * z;
        var z4 = z2 * z2;
        var p01 = Vector256.FusedMultiplyAdd(Vector256.Create(1.0 / 5), z, Vector256.Create(1.0 / 3));
        var p23 = Vector256.FusedMultiplyAdd(Vector256.Create(1.0 / 9), z, Vector256.Create(1.0 / 7));
        var p45 = Vector256.FusedMultiplyAdd(Vector256.Create(1.0 / 13), z, Vector256.Create(1.0 / 11));
        var p67 = Vector256.FusedMultiplyAdd(Vector256.Create(1.0 / 17), z, Vector256.Create(1.0 / 15));
        var p89 = Vector256.FusedMultiplyAdd(Vector256.Create(1.0 / 21), z, Vector256.Create(1.0 / 19));
        var p03 = Vector256.FusedMultiplyAdd(p23, z2, p01);
        var p47 = Vector256.FusedMultiplyAdd(p67, z2, p45);
        var p = Vector256.FusedMultiplyAdd(Vector256.FusedMultiplyAdd(p89, z4, p47), z4, p03);
        var twoS = sHi + sHi;
        var tail = twoS * z * p;

        var high = kd * Vector256.Create(Ln2Hi);           // exact
        var sum = high + twoS;                             // two-sum: sum + error = high + twoS exactly
        var b = sum - high;
        var error = (high - (sum - b)) + (twoS - b);
        var low = error + (kd * Vector256.Create(Ln2Lo) + ((sLo + sLo) + tail));
        var y = sum + low;
        var left = low - (y - sum);                        // what rounding y dropped (|sum| > 1 > |low|)

        var ulp = ((Vector256.Abs(y).AsInt64() & Vector256.Create(0x7FF0000000000000L)) - Vector256.Create(52L << 52)).AsDouble();
        var fromMidpoint = Vector256.Abs(Vector256.Abs(left) - Vector256.Create(0.5) * ulp);
        unsure = Vector256.LessThan(fromMidpoint, Vector256.Create(MidpointMargin) * ulp)
            | Vector256.Equals(y.AsInt64() & Vector256.Create(0x000FFFFFFFFFFFFFL), Vector256<long>.Zero).AsDouble()
            | ~(Vector256.GreaterThanOrEqual(a, Vector256.Create(Math.ScaleB(1.0, -1000))) & Vector256.LessThanOrEqual(a, Vector256.Create(0.5)));
        return y;
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
