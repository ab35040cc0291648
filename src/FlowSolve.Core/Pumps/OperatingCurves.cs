namespace FlowSolve.Core.Pumps;

/// <summary>Pump, pump-set and system curves sampled on one flow axis, for plotting. Immutable.</summary>
/// <remarks>Every array has one value per entry of <see cref="Flow"/>. Heads are the polynomials as they are, so the
/// pump curves may go below zero beyond the zero-head flow (clip them for display if wanted).</remarks>
public sealed class OperatingCurves
{
    /// <summary>Default number of points, 41.</summary>
    public const int DefaultPoints = 41;

    /// <summary>Largest accepted number of points, 10001.</summary>
    public const int MaximumPoints = 10001;

    /// <summary>The plotted range ends at this multiple of max(duty flow, set zero-head flow or search limit).</summary>
    public const double RangeFactor = 1.2;

    private OperatingCurves(double[] flow, double[] pump, double[] set, double[] system, double[]? efficiency, double[]? npsh)
    {
        Flow = flow; PumpHead = pump; SetHead = set; SystemHead = system; Efficiency = efficiency; NpshRequired = npsh;
    }

    /// <summary>Flows in m3/s, evenly spaced from 0.</summary>
    public IReadOnlyList<double> Flow { get; }

    /// <summary>Head in m of one pump at the running speed, s^2 H(Q/s), at each flow of <see cref="Flow"/>.</summary>
    public IReadOnlyList<double> PumpHead { get; }

    /// <summary>Head in m of the whole pump set (parallel or series, at speed) at each set flow.</summary>
    public IReadOnlyList<double> SetHead { get; }

    /// <summary>System head in m at each flow.</summary>
    public IReadOnlyList<double> SystemHead { get; }

    /// <summary>Efficiency (fraction) of each pump when the set delivers each flow, eta(Q / (Parallel s)); null without data.</summary>
    public IReadOnlyList<double>? Efficiency { get; }

    /// <summary>NPSH required in m of each pump when the set delivers each flow, s^2 NPSHr(Q / (Parallel s)); null without data.</summary>
    public IReadOnlyList<double>? NpshRequired { get; }

    /// <summary>Samples the curves from 0 to <see cref="RangeFactor"/> x max(duty flow, set zero-head flow).</summary>
    /// <param name="pump">Head curve of one pump at rated speed.</param>
    /// <param name="system">System curve.</param>
    /// <param name="arrangement">Arrangement; <see cref="PumpArrangement.Single"/> when omitted.</param>
    /// <param name="dutyFlow">The duty (set) flow in m3/s when known (finite, 0 or more), so the plot contains it.</param>
    /// <param name="points">Number of points, 2 to 10001; 41 when omitted.</param>
    /// <param name="efficiency">Optional efficiency curve.</param>
    /// <param name="npshRequired">Optional NPSH-required curve.</param>
    /// <exception cref="ArgumentException">An argument is outside its domain (the parameter name says which).</exception>
    public static OperatingCurves Sample(in PumpCurve pump, in SystemCurve system, PumpArrangement? arrangement = null,
        double? dutyFlow = null, int points = DefaultPoints, EfficiencyCurve? efficiency = null, NpshCurve? npshRequired = null)
    {
        if (!(pump.SearchLimit > 0)) throw new ArgumentException("the pump curve is not initialised (default)", nameof(pump));
        var a = arrangement ?? PumpArrangement.Single;
        a.Validate();
        if (points < 2 || points > MaximumPoints) PumpGuard.Throw(nameof(points), points, "must lie in 2..10001");
        if (dutyFlow is double d) PumpGuard.NonNegative(d, nameof(dutyFlow));
        double s = a.SpeedRatio, np = a.Parallel, ns = a.Series;
        double end = RangeFactor * Math.Max(dutyFlow ?? 0, np * s * (pump.ZeroHeadFlow ?? pump.SearchLimit));
        var flow = new double[points];
        var single = new double[points];
        var set = new double[points];
        var sys = new double[points];
        var eta = efficiency is null ? null : new double[points];
        var npsh = npshRequired is null ? null : new double[points];
        for (int i = 0; i < points; i++)
        {
            double q = end * i / (points - 1);
            flow[i] = q;
            single[i] = s * s * pump.Head(q / s);
            set[i] = ns * s * s * pump.Head(q / (np * s));
            sys[i] = system.Head(q);
            if (eta is not null) eta[i] = efficiency!.Value.Efficiency(q / (np * s));
            if (npsh is not null) npsh[i] = s * s * npshRequired!.Required(q / (np * s));
        }
        return new OperatingCurves(flow, single, set, sys, eta, npsh);
    }
}
