namespace FlowSolve.Api.Pumps;

/// <summary>The pump endpoints' OpenAPI descriptions and examples.</summary>
public static class PumpDocs
{
    private const string Common =
        "The pump set's head at set flow Q is Hset(Q) = Ns s^2 H(Q / (Np s)) for Np identical pumps in parallel or Ns in series " +
        "at speed ratio s (affinity laws, common practice), H the curve of one pump at rated speed: a least-squares polynomial " +
        "through catalogue points (quadratic by default, or cubic) or given coefficients. The system needs Hsys(Q) = Hs + K Q^2 " +
        "plus the Darcy-Weisbach losses of pipes in series (exact Colebrook-White friction factor, minor losses). The duty point " +
        "Hset(Q) = Hsys(Q) is solved by safeguarded Newton iteration between zero flow and the set's zero-head flow. With " +
        "efficiency on the points: efficiency (a fitted curve through the origin), shaft power rho g Q H / efficiency and the " +
        "duty flow as a fraction of the best-efficiency flow at speed, with warnings outside 70 to 120 percent (common practice). " +
        "With suction data: NPSH available = (surface pressure - vapour pressure)/(rho g) + static suction head - losses, and " +
        "with NPSH required on the points, the margin and ratio (warned below 1.0 m or 1.1, common practice). g = 9.80665 m/s2. " +
        "Units: SI by default (m3/s, m, Pa, kg/m3, m2/s, W); units=us gives ft3/s (or US gal/min with flowUnit=gpm), ft, psi, " +
        "lb/ft3, ft2/s, degrees F and hp, for inputs and outputs alike. Fluid: water at a temperature, or kinematicViscosity " +
        "and density; water at 20 degrees C when neither is given (echoed in assumptions). A pump set that cannot reach the " +
        "static head, or curves that never meet, answer 422 (RFC 9457 problem details: status is the numeric HTTP status) with " +
        "dutyPointStatus (shut-off-below-static-head, curves-do-not-meet, or not-finite) and the figures (headShortfall, " +
        "closestApproach and its flow). A rising curve whose shut-off head is at or below the static head but which climbs above " +
        "the system curve is solved at its stable intersection, where the pump curve falls through the system curve, with a " +
        "rising-pump-curve warning and unstableFlow (the lower intersection, where it rises through). With efficiency points the " +
        "efficiency fit's deviations are reported (efficiencyRmsDeviation, efficiencyMaxDeviation) and an efficiency-above-data " +
        "warning says when the fit peaks above the highest catalogue efficiency (the shaft power then comes out low). " +
        "Results are engineering estimates to be checked by a qualified engineer; local codes and licensed practice govern.";

    public const string DutyPoint = "Duty point of identical pumps in parallel or series on a system curve. " + SensitivityNote + Common;

    /// <summary>What sensitivities=true adds to a duty point.</summary>
    public const string SensitivityNote =
        "With sensitivities=true: the flow and head against the curve's coefficients (when given as coefficients, not points; " +
        "SI coefficients), speedRatio, staticHead, resistance, each pipe's length, diameter, roughness and minorLossCoefficient, " +
        "and the fluid (temperature or kinematicViscosity) when there are pipes. ";

    public const string DutyPointGet =
        "Duty point, compact form for a spreadsheet cell: the pump as coefficients c0, c1, c2 (and c3) of one pump at rated " +
        "speed; the system as staticHead plus resistance K and/or one pipe (length, diameter, roughness, minorLossCoefficient); " +
        "suction data as staticSuctionHead, suctionLossHead, surfacePressure and vapourPressure. format=text returns the flow. " + Common;

    public const string Curves =
        "The curves behind a duty point, sampled on one flow axis for plotting: one pump at the running speed, the whole set " +
        "(the combined parallel or series curve), the system, and with data efficiency and NPSH required; plus the duty point " +
        "itself as from /v1/pumps/duty-point. The curves are returned also when there is no duty point (status and a warning " +
        "say why), since the plot shows where they fail to meet. The flows run from 0 to 1.2 times the larger of the duty flow " +
        "and the set's zero-head flow; pump heads are the polynomial as it is and may fall below zero beyond the zero-head flow. " +
        "With sensitivities=true the duty point carries them (dutyPoint.sensitivities: its flow and head); the sampled curves have none. " + Common;

    /// <summary>A fictional pump and rising main (invented data, for the example only).</summary>
    public static DutyPointRequest Example { get; } = new(
        Pump: new PumpInput(Points:
        [
            new PumpPointInput(0.00, 42.0, 0.00, 1.2),
            new PumpPointInput(0.02, 40.5, 0.55, 1.6),
            new PumpPointInput(0.04, 36.0, 0.74, 2.3),
            new PumpPointInput(0.06, 28.5, 0.76, 3.4),
            new PumpPointInput(0.08, 18.0, 0.62, 5.0),
        ]),
        System: new SystemInput(12.0, Pipes: [new PipeInput(350, 0.2, 0.00005, 4.5), new PipeInput(40, 0.15, 0.00005, 2.0)]),
        PumpsInParallel: 2,
        Temperature: 15,
        Suction: new SuctionInput(StaticSuctionHead: 2.5, LossHead: 0.6));
}
