using FlowSolve.Api.Hosting;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Pumps;

/// <summary>The duty point of a pump (or set) on a system: <c>GET</c> (compact form) and <c>POST /v1/pumps/duty-point</c>.</summary>
public sealed class DutyPointCalculation : Calculation<DutyPointQuery, DutyPointRequest, DutyPointResponse>
{
    public override CalculationInfo Info { get; } = new("pumps/duty-point", "Pumps", "PumpDutyPoint", "flow",
        "Pump duty point", PumpDocs.DutyPoint)
    {
        GetSummary = "Pump duty point, compact form (query parameters)",
        GetDescription = PumpDocs.DutyPointGet,
    };

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("c0", "40"), ("c1", "0"), ("c2", "-5000"), ("staticHead", "15"), ("resistance", "3000")];

    public override DutyPointRequest BodyExample => PumpDocs.Example;

    public override Outcome<DutyPointResponse> Solve(DutyPointRequest request, in CalculationContext context) =>
        PumpDutyPoints.Calculate(request, null, context);

    protected override Outcome<DutyPointResponse> SolveQuery(DutyPointQuery query, in CalculationContext context) =>
        PumpDutyPoints.FromQuery(query, context);

    protected override DutyPointRequest FromQuery(DutyPointQuery query) => PumpDutyPoints.ToRequest(query);

    public override Sheet Sheet(DutyPointRequest request, DutyPointResponse answer) => PumpDutySheet.Build(request, answer);
}
