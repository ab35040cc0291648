using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>
/// Every root of a depth residual on a surveyed section, found without guessing: between consecutive break depths the
/// area is quadratic and the widths and perimeters linear in y, so the residual's stationary points there are roots of
/// a quadratic. Break depths and stationary points split [0, MaximumDepth] into pieces on which the residual is
/// monotone; each piece whose ends differ in sign holds exactly one root, found by the safeguarded Newton with a known
/// bracket. A sign change across a break depth (the conveyance drops when a horizontal segment floods) is recorded as a
/// root at that depth, flagged as a jump.
/// </summary>
internal sealed class DepthScan
{
    public List<double> Depths { get; } = new();
    public List<RootResult> Results { get; } = new();
    public List<bool> AtJump { get; } = new();

    /// <summary>The largest residual on the range and its depth (the capacity, for the conveyance residual).</summary>
    public double MaximumValue { get; private set; } = double.NegativeInfinity;
    public double DepthAtMaximum { get; private set; }

    /// <summary>The residual at <see cref="ChannelSection.MaximumDepth"/> approached from below.</summary>
    public double ValueAtTop { get; private set; }

    public int Iterations { get; private set; }
    public bool AllConverged { get; private set; } = true;
    public bool AnyJump { get; private set; }

    private SolverTrace? _trace;

    /// <summary>Scans the section's depth range segment by segment and solves for every root of the residual.</summary>
    /// <param name="section">The surveyed section.</param>
    /// <param name="function">The residual in depth.</param>
    /// <param name="options">The root finder's tolerances.</param>
    /// <param name="trace">Optional per-iteration record of the first depth's solve (the lowest root, the one reported).</param>
    public static DepthScan Run<T>(SurveyedSection section, in T function, in SolverOptions options, SolverTrace? trace = null)
        where T : struct, IDepthFunction
    {
        var scan = new DepthScan { _trace = trace };
        ReadOnlySpan<double> breaks = section.BreakDepths;
        double a = 0.0, fa = double.NegativeInfinity;
        for (int k = 0; k < breaks.Length; k++)
        {
            double b = breaks[k];
            var middle = section.Evaluate(0.5 * (a + b));
            int count = function.Stationary(middle, a, b, out double s1, out double s2);
            double left = a, fl = fa;
            for (int j = 0; j <= count; j++)
            {
                bool last = j == count;
                double p = last ? b : (j == 0 ? s1 : s2);
                double fp = function.Value(p, fromBelow: last);
                scan.Track(p, fp);
                scan.Piece(function, left, fl, p, fp, options);
                left = p;
                fl = fp;
            }
            if (k == breaks.Length - 1)
            {
                scan.ValueAtTop = fl;
                break;
            }
            double fr = function.Value(b, fromBelow: false);
            scan.Track(b, fr);
            if (fl != 0.0 && fr != 0.0 && (fl < 0.0) != (fr < 0.0))
                scan.Add(b, new RootResult(b, 0, 2, Math.Abs(fl) < Math.Abs(fr) ? fl : fr, b, b, 0.0, SolveStatus.ConvergedOnStep), jump: true);
            else if (fr == 0.0 && fl != 0.0)
                scan.Add(b, new RootResult(b, 0, 1, 0.0, b, b, 0.0, SolveStatus.ConvergedOnResidual), jump: false);
            a = b;
            fa = fr;
        }
        return scan;
    }

    private void Piece<T>(in T function, double left, double fl, double right, double fr, in SolverOptions options)
        where T : struct, IDepthFunction
    {
        if (fr == 0.0)
        {
            Add(right, new RootResult(right, 0, 1, 0.0, right, right, 0.0, SolveStatus.ConvergedOnResidual), jump: false);
            return;
        }
        bool rising = fl < 0.0 && fr > 0.0;
        if (!rising && !(fl > 0.0 && fr < 0.0)) return;
        // A secant start where both ends are finite; the midpoint from the invert (where the residual is -infinity).
        double guess = double.IsFinite(fl) ? left + (right - left) * fl / (fl - fr) : 0.5 * (left + right);
        var bracket = rising ? Bracket.KnownIncreasing(left, right) : Bracket.KnownDecreasing(left, right);
        var result = SafeguardedNewton.Solve(function, bracket, guess, options, Depths.Count == 0 ? _trace : null);
        Iterations += result.Iterations;
        AllConverged &= result.Converged;
        Add(result.Root, result, jump: false);
    }

    private void Track(double depth, double value)
    {
        if (value > MaximumValue)
        {
            MaximumValue = value;
            DepthAtMaximum = depth;
        }
    }

    private void Add(double depth, in RootResult result, bool jump)
    {
        Depths.Add(depth);
        Results.Add(result);
        AtJump.Add(jump);
        AnyJump |= jump;
    }
}
