using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;

namespace FlowSolve.Api.Channels;

/// <summary>Normal depth by Manning's equation: <c>GET</c> and <c>POST /v1/channels/normal-depth</c>.</summary>
public sealed class NormalDepthCalculation : Calculation<NormalDepthQuery, NormalDepthRequest, NormalDepthResponse>
{
    public override CalculationInfo Info { get; } = new("channels/normal-depth", "Channels", "NormalDepth", "normalDepth",
        "Normal depth by Manning's equation", ChannelDocs.NormalDepth);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("shape", "trapezoidal"), ("bottomWidth", "3"), ("sideSlope", "2"), ("manningN", "0.025"), ("slope", "0.001"), ("flow", "10")];

    public override NormalDepthRequest BodyExample { get; } =
        new(new SectionInput("circular", Diameter: 1.2), ManningN: 0.013, Slope: 0.002, Flow: 1.1);

    public override Outcome<NormalDepthResponse> Solve(NormalDepthRequest request, in CalculationContext context) =>
        ChannelDepths.NormalDepth(request, context);

    protected override Outcome<NormalDepthResponse> SolveQuery(NormalDepthQuery query, in CalculationContext context) =>
        ChannelDepths.NormalDepth(query, context);

    protected override NormalDepthRequest FromQuery(NormalDepthQuery q) =>
        new(ChannelInput.Section(q.Shape, q.BottomWidth, q.SideSlope, q.LeftSideSlope, q.RightSideSlope, q.Diameter, q.Points),
            q.ManningN, q.Slope, q.Flow, q.Units);

    public override Sheet Sheet(NormalDepthRequest request, NormalDepthResponse answer) => NormalDepthSheet.Build(request, answer);
}
