using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Pumps;

/// <summary>Pump, pump-set and system curves for plotting, with the duty point: <c>POST /v1/pumps/curves</c>. Not a
/// row calculation (its answer is curves): no batch or check.</summary>
public sealed class PumpCurvesCalculation : Calculation<DutyPointRequest, PumpCurvesResponse>
{
    /// <summary>How many points each curve has.</summary>
    public static QueryOption SamplePoints { get; } = new("samplePoints", QueryOptionKind.Integer,
        "Number of points on each curve, 2 to 10001; 41 when omitted.");

    public override CalculationInfo Info { get; } = new("pumps/curves", "Pumps", "PumpCurves", "dutyPoint.flow",
        "Pump, pump-set and system curves for plotting, with the duty point", PumpDocs.Curves)
    {
        Rows = false,
        Options = [SamplePoints, QueryOption.Sensitivities],
        Problems = [],
    };

    public override DutyPointRequest BodyExample => PumpDocs.Example;

    public override Outcome<PumpCurvesResponse> Solve(DutyPointRequest request, in CalculationContext context) =>
        PumpDutyPoints.Curves(request, context);
}
