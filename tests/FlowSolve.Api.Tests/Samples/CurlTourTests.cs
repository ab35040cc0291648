namespace FlowSolve.Api.Tests.Samples;

/// <summary>samples/scenario/curl-tour.sh run with bash and curl against a real FlowSolve process.</summary>
public sealed class CurlTourTests(LiveService service) : IClassFixture<LiveService>
{
    private static readonly string[] Script = ["samples/scenario/curl-tour.sh"];

    [Fact]
    public async Task Run_AgainstLiveService_EveryCallAnswers()
    {
        SamplePrograms.Require("curl");
        var run = await SamplePrograms.Run("bash", Script, service.BaseUrl, TimeSpan.FromSeconds(120));

        Assert.False(run.TimedOut, run.ToString());
        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.Contains("every call answered 200", run.Output);
        Assert.DoesNotContain("FAIL", run.Output + run.Errors);
        // The tour prints each text answer; the pumping main's head loss must be a number there.
        var line = run.Output.Split('\n').Single(l => l.StartsWith("head loss (friction and fittings), m", StringComparison.Ordinal));
        Assert.True(double.TryParse(line.Split(' ', StringSplitOptions.RemoveEmptyEntries)[^1], System.Globalization.CultureInfo.InvariantCulture, out double h) && h > 0, line);
    }

    [Fact]
    public async Task Run_NoServiceListening_ExitsNonZero()
    {
        SamplePrograms.Require("curl");
        var run = await SamplePrograms.Run("bash", Script, $"http://127.0.0.1:{LiveService.FreePort()}", TimeSpan.FromSeconds(60));

        Assert.False(run.TimedOut, run.ToString());
        Assert.NotEqual(0, run.ExitCode);
        Assert.Contains("FAIL", run.Errors);
    }
}
