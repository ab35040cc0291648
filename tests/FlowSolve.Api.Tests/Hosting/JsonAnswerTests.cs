using FlowSolve.Api.Friction;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Pipes;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.DependencyInjection;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>A calculation's one-block JSON answer against ASP.NET Core's own <c>Ok&lt;T&gt;</c> result (the reference):
/// the same bytes, status and content type, and a Content-Length that matches the body.</summary>
public class JsonAnswerTests(ApiFixture api)
{
    private static IServiceProvider Services()
    {
        var services = new ServiceCollection();
        services.AddLogging();
        services.Configure<Microsoft.AspNetCore.Http.Json.JsonOptions>(o => JsonSetup.Configure(o.SerializerOptions));
        return services.BuildServiceProvider();
    }

    private static async Task<(int Status, string? Type, byte[] Body)> Run(IResult result)
    {
        var context = new DefaultHttpContext { RequestServices = Services() };
        var body = new MemoryStream();
        context.Response.Body = body;
        await result.ExecuteAsync(context);
        await context.Response.CompleteAsync(); // what the server does when the request ends: flushes what was written
        return (context.Response.StatusCode, context.Response.ContentType, body.ToArray());
    }

    public static TheoryData<string> Cases() => ["friction", "friction-sensitivities", "pipe", "escaping"];

    [Theory]
    [MemberData(nameof(Cases))]
    public async Task The_answer_is_byte_for_byte_what_Ok_writes(string kind)
    {
        object value = kind switch
        {
            "friction" => new FrictionFactorCalculation().Solve(new FrictionFactorRequest(Reynolds: 75000, RelativeRoughness: 0.005), CalculationContext.Plain).Answer!,
            // Text the two encoders treat differently (the relaxed one leaves < > & ' + and non-ASCII as they are; the
            // default one escapes them), since the serializer runs without the pipeline's encoder and the writer keeps it.
            "escaping" => new FrictionFactorCalculation().Solve(new FrictionFactorRequest(Reynolds: 75000, RelativeRoughness: 0.005), CalculationContext.Plain).Answer!
                with { Warnings = [new("probe", "Re < 4000 & 'x' + 5 \u00b0C \u2264 \u00e9\t\"q\" \\ end")] },
            "friction-sensitivities" => new FrictionFactorCalculation().Solve(new FrictionFactorRequest(Reynolds: 2.5e5, Roughness: 0.00026, Diameter: 0.3, Method: "haaland"), CalculationContext.Plain).Answer!,
            _ => new PipeHeadLossCalculation().Solve(new PipeHeadLossRequest(0.12, 0.35, 2350, Roughness: 0.00026,
                MinorLossCoefficient: 4.5, KinematicViscosity: 1.2e-6, Density: 999.5), CalculationContext.Plain).Answer!,
        };
        var reference = await Run((IResult)Activator.CreateInstance(typeof(Ok<>).MakeGenericType(value.GetType()),
            System.Reflection.BindingFlags.NonPublic | System.Reflection.BindingFlags.Instance, null, [value], null)!);
        var ours = await Run(new JsonAnswer(value, 200));
        Assert.Equal(reference.Status, ours.Status);
        Assert.Equal(reference.Type, ours.Type);
        Assert.Equal(System.Text.Encoding.UTF8.GetString(reference.Body), System.Text.Encoding.UTF8.GetString(ours.Body));
    }

    [Fact]
    public async Task Through_the_service_the_length_header_matches_the_body()
    {
        using var response = await api.Client.GetAsync("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005",
            TestContext.Current.CancellationToken);
        byte[] body = await response.Content.ReadAsByteArrayAsync(TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        Assert.Equal(body.Length, response.Content.Headers.ContentLength);
        Assert.Equal("application/json; charset=utf-8", response.Content.Headers.ContentType?.ToString());
    }
}
