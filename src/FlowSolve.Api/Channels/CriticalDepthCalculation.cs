using FlowSolve.Api.Hosting;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Channels;

/// <summary>Critical depth: <c>GET</c> and <c>POST /v1/channels/critical-depth</c>.</summary>
public sealed class CriticalDepthCalculation : Calculation<CriticalDepthQuery, CriticalDepthRequest, CriticalDepthResponse>
{
    public override CalculationInfo Info { get; } = new("channels/critical-depth", "Channels", "CriticalDepth", "criticalDepth",
        "Critical depth", ChannelDocs.CriticalDepth);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("shape", "rectangular"), ("bottomWidth", "4"), ("flow", "12"), ("manningN", "0.015")];

    public override CriticalDepthRequest BodyExample { get; } =
        new(new SectionInput("surveyed", Points:
            [new(0, 2.5, 0.035), new(3, 1.0, 0.035), new(5, 0), new(9, 0, 0.035), new(11, 1.0, 0.035), new(14, 2.2)]),
            Flow: 8, ManningN: 0.02);

    public override Outcome<CriticalDepthResponse> Solve(CriticalDepthRequest request, in CalculationContext context) =>
        ChannelDepths.CriticalDepth(request, context);

    protected override Outcome<CriticalDepthResponse> SolveQuery(CriticalDepthQuery query, in CalculationContext context) =>
        ChannelDepths.CriticalDepth(query, context);

    protected override CriticalDepthRequest FromQuery(CriticalDepthQuery q) =>
        new(ChannelInput.Section(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter, q.Points),
            q.Flow, q.ManningN, q.Units);

    public override Sheet Sheet(CriticalDepthRequest request, CriticalDepthResponse answer) => CriticalDepthSheet.Build(request, answer);
}
