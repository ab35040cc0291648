namespace FlowSolve.Core.Pumps;

/// <summary>The outcome of a pump-curve fit.</summary>
public enum CurveFitStatus
{
    /// <summary>Fitted: the head does not rise with flow anywhere on [0, largest catalogue flow].</summary>
    Fitted,

    /// <summary>Rejected: the fitted head rises with flow (dH/dQ &gt; 0) somewhere on [0, largest catalogue flow]; see
    /// <see cref="PumpCurveFit.MaximumSlope"/> and <see cref="PumpCurveFit.MaximumSlopeFlow"/>.</summary>
    RisesWithFlow,
}

/// <summary>The outcome of a duty-point solve.</summary>
public enum DutyStatus
{
    /// <summary>Solved: pump-set head equals system head to the solver's tolerance.</summary>
    Solved,

    /// <summary>No answer: the pump set's shut-off head does not exceed the static head, and its head stays at or below the
    /// system head at every flow up to the end of the bracket, so it cannot deliver flow (a rising curve that climbs above
    /// the system curve is solved instead, at its stable intersection, with <see cref="PumpWarnings.RisingCurve"/>);
    /// see <see cref="DutyPointResult.ShutOffHead"/>, <see cref="DutyPointResult.StaticHead"/> and
    /// <see cref="DutyPointResult.HeadShortfall"/>.</summary>
    ShutOffBelowStaticHead,

    /// <summary>No answer: the pump-set head stays above the system head from zero flow to the end of the bracket (the
    /// zero-head flow, or the search limit when the curve never reaches zero head); see
    /// <see cref="DutyPointResult.ClosestApproach"/> and <see cref="DutyPointResult.ClosestApproachFlow"/>.</summary>
    CurvesDoNotMeet,

    /// <summary>The solve stopped without converging; the values are the best iterate and must not be used.</summary>
    NotConverged,
}

/// <summary>Warnings attached to a duty point (flags).</summary>
[Flags]
public enum PumpWarnings
{
    /// <summary>No warning.</summary>
    None = 0,

    /// <summary>The duty flow per pump, brought back to rated speed (Q/s), lies outside the head curve's catalogue range.</summary>
    OutsideCatalogueRange = 1,

    /// <summary>The duty flow per pump is below the preferred operating region (default 70 percent of the BEP flow at
    /// speed; common practice).</summary>
    BelowPreferredRegion = 2,

    /// <summary>The duty flow per pump is above the preferred operating region (default 120 percent of the BEP flow at
    /// speed; common practice).</summary>
    AbovePreferredRegion = 4,

    /// <summary>The NPSH margin is short: NPSHa - NPSHr below the minimum margin (default 1.0 m) or NPSHa/NPSHr below the
    /// minimum ratio (default 1.1); common practice.</summary>
    NpshMarginShort = 8,

    /// <summary>The pump curve does not reach zero head within its search limit; the bracket ended there.</summary>
    ZeroHeadNotReached = 16,

    /// <summary>The pump curve rises with flow somewhere on its range (given coefficients): more than one duty point may exist.</summary>
    RisingCurve = 32,

    /// <summary>The efficiency curve gives zero or less at the duty flow; shaft power is not reported.</summary>
    EfficiencyNotPositive = 64,

    /// <summary>The duty flow per pump at rated speed lies outside the efficiency curve's catalogue range.</summary>
    OutsideEfficiencyData = 128,

    /// <summary>The duty flow per pump at rated speed lies outside the NPSH-required curve's catalogue range.</summary>
    OutsideNpshData = 256,

    /// <summary>The efficiency data show no peak inside their range; the BEP used is at an end of the data.</summary>
    BestEfficiencyAtDataEnd = 512,

    /// <summary>The duty-point solve did not converge.</summary>
    NotConverged = 1024,
}

/// <summary>Codes and sentences for the pump statuses.</summary>
public static class PumpStatusExtensions
{
    /// <summary>A stable kebab-case code, for wire formats.</summary>
    /// <param name="status">The status.</param>
    public static string Code(this CurveFitStatus status) => status switch
    {
        CurveFitStatus.Fitted => "fitted",
        CurveFitStatus.RisesWithFlow => "rises-with-flow",
        _ => "unknown",
    };

    /// <summary>A sentence that says what the status means (static strings; no allocation).</summary>
    /// <param name="status">The status.</param>
    public static string Reason(this CurveFitStatus status) => status switch
    {
        CurveFitStatus.Fitted => "fitted",
        CurveFitStatus.RisesWithFlow => "the fitted head rises with flow within the data range; the points do not describe a stable pump curve",
        _ => "unknown",
    };

    /// <summary>True when the result holds a duty point.</summary>
    /// <param name="status">The status.</param>
    public static bool HasAnswer(this DutyStatus status) => status == DutyStatus.Solved;

    /// <summary>A stable kebab-case code, for wire formats.</summary>
    /// <param name="status">The status.</param>
    public static string Code(this DutyStatus status) => status switch
    {
        DutyStatus.Solved => "solved",
        DutyStatus.ShutOffBelowStaticHead => "shut-off-below-static-head",
        DutyStatus.CurvesDoNotMeet => "curves-do-not-meet",
        DutyStatus.NotConverged => "not-converged",
        _ => "unknown",
    };

    /// <summary>A sentence that says why the solve ended (static strings; no allocation).</summary>
    /// <param name="status">The status.</param>
    public static string Reason(this DutyStatus status) => status switch
    {
        DutyStatus.Solved => "solved",
        DutyStatus.ShutOffBelowStaticHead => "no duty point: the pump set's shut-off head does not exceed the static head",
        DutyStatus.CurvesDoNotMeet => "no duty point: the pump and system curves do not meet between zero flow and the pump's zero-head flow (or search limit)",
        DutyStatus.NotConverged => "the duty-point solve stopped without converging",
        _ => "unknown",
    };
}
