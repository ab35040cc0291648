using System.Text.Json;
using System.Text.Json.Serialization;
using FlowSolve.Api.Channels;
using FlowSolve.Api.Check;
using FlowSolve.Api.Fluids;
using FlowSolve.Api.Networks;
using FlowSolve.Api.NonNewtonian;
using FlowSolve.Api.Friction;
using FlowSolve.Api.Gas;
using FlowSolve.Api.Pipes;
using FlowSolve.Api.Pumps;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api;

/// <summary>
/// Every calculation FlowSolve offers, declared once. The hosting layer derives from this list the GET and POST routes,
/// batch rows, checks, the text and HTML formats, the OpenAPI metadata and the metrics labels; the tests derive their
/// coverage from it (a calculation without docs, examples or tests fails <c>CatalogueTests</c>). A new calculation adds
/// one line here and its request and answer types to <see cref="ApiJsonContext"/> below; see DEVELOPERS.md.
/// </summary>
public static class Catalogue
{
    public static IReadOnlyList<ICalculation> All { get; } =
    [
        new FrictionFactorCalculation(),
        new WaterCalculation(),
        new PipeHeadLossCalculation(),
        new PipeFlowCalculation(),
        new PipeDiameterCalculation(),
        new NormalDepthCalculation(),
        new CriticalDepthCalculation(),
        new HydraulicJumpCalculation(),
        new ChannelProfileCalculation(),
        new CulvertCalculation(),
        new ReachProfileCalculation(),
        new DutyPointCalculation(),
        new PumpCurvesCalculation(),
        new NetworkSolveCalculation(),
        new GasPipeFlowCalculation(),
        new FireFlowCalculation(),
        new NetworkSimulationCalculation(),
        new NonNewtonianFrictionCalculation(),
        new NonNewtonianHeadLossCalculation(),
        new NonNewtonianFlowCalculation(),
    ];

    /// <summary>Maps every calculation (after the generated JSON metadata is registered, so answers use it from the first).</summary>
    public static IEndpointRouteBuilder MapCatalogue(this IEndpointRouteBuilder routes)
    {
        JsonSetup.UseGenerated(ApiJsonContext.Default);
        return routes.MapCalculations(All);
    }
}

/// <summary>
/// Compile-time JSON metadata for the calculations' requests and responses (System.Text.Json source generation), with
/// the same conventions as <see cref="JsonSetup"/>: writing a response takes the generated fast path instead of the
/// reflection-built converters, which is most of a calculation's own cost after the solve. Types not listed here (problem
/// details, examples) keep the reflection-based resolver behind it in <see cref="JsonSetup.Options"/>.
/// </summary>
/// <remarks>A new calculation adds its request and response here; the OpenAPI drift test and the text-format tests
/// compare the output with the reflection path's shape.</remarks>
[JsonSourceGenerationOptions(JsonSerializerDefaults.Web,
    PropertyNamingPolicy = JsonKnownNamingPolicy.CamelCase,
    DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
    UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
    NumberHandling = JsonNumberHandling.Strict,
    MaxDepth = 32)]
[JsonSerializable(typeof(FrictionFactorRequest))]
[JsonSerializable(typeof(FrictionFactorResponse))]
[JsonSerializable(typeof(WaterRequest))]
[JsonSerializable(typeof(WaterResponse))]
[JsonSerializable(typeof(PipeHeadLossRequest))]
[JsonSerializable(typeof(PipeHeadLossResponse))]
[JsonSerializable(typeof(PipeFlowRequest))]
[JsonSerializable(typeof(PipeFlowResponse))]
[JsonSerializable(typeof(PipeDiameterRequest))]
[JsonSerializable(typeof(PipeDiameterResponse))]
[JsonSerializable(typeof(PipeSizesResponse))]
[JsonSerializable(typeof(PipeMaterialsResponse))]
[JsonSerializable(typeof(PipeFittingsResponse))]
[JsonSerializable(typeof(NormalDepthRequest))]
[JsonSerializable(typeof(NormalDepthResponse))]
[JsonSerializable(typeof(CriticalDepthRequest))]
[JsonSerializable(typeof(CriticalDepthResponse))]
[JsonSerializable(typeof(HydraulicJumpRequest))]
[JsonSerializable(typeof(HydraulicJumpResponse))]
[JsonSerializable(typeof(ChannelProfileRequest))]
[JsonSerializable(typeof(ChannelProfileResponse))]
[JsonSerializable(typeof(CulvertRequest))]
[JsonSerializable(typeof(CulvertResponse))]
[JsonSerializable(typeof(ReachProfileRequest))]
[JsonSerializable(typeof(ReachProfileResponse))]
[JsonSerializable(typeof(DutyPointRequest))]
[JsonSerializable(typeof(DutyPointResponse))]
[JsonSerializable(typeof(PumpCurvesResponse))]
[JsonSerializable(typeof(CheckResponse))]
[JsonSerializable(typeof(NetworkSolveRequest))]
[JsonSerializable(typeof(NetworkSolveResponse))]
[JsonSerializable(typeof(GasPipeFlowRequest))]
[JsonSerializable(typeof(GasPipeFlowResponse))]
[JsonSerializable(typeof(FireFlowRequest))]
[JsonSerializable(typeof(FireFlowResponse))]
[JsonSerializable(typeof(NetworkSimulationRequest))]
[JsonSerializable(typeof(NetworkSimulationResponse))]
[JsonSerializable(typeof(NonNewtonianFrictionRequest))]
[JsonSerializable(typeof(NonNewtonianFrictionResponse))]
[JsonSerializable(typeof(NonNewtonianHeadLossRequest))]
[JsonSerializable(typeof(NonNewtonianHeadLossResponse))]
[JsonSerializable(typeof(NonNewtonianFlowRequest))]
[JsonSerializable(typeof(NonNewtonianFlowResponse))]
public sealed partial class ApiJsonContext : JsonSerializerContext;
