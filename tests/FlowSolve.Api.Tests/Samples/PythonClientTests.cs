namespace FlowSolve.Api.Tests.Samples;

/// <summary>samples/python/flowsolve_client.py (standard library only) run with python3 against a real FlowSolve process.</summary>
public sealed class PythonClientTests(LiveService service) : IClassFixture<LiveService>
{
    private static readonly string[] Script = ["samples/python/flowsolve_client.py"];

    [Fact]
    public async Task Main_AgainstLiveService_EveryStepSucceeds()
    {
        var run = await SamplePrograms.Run("python3", Script, service.BaseUrl, TimeSpan.FromSeconds(120));

        Assert.False(run.TimedOut, run.ToString());
        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.Contains("every step of the scenario succeeded", run.Output);
        Assert.DoesNotContain("FAIL", run.Output);
        int cases = File.ReadAllLines(Path.Combine(LiveService.RepositoryRoot, "samples", "scenario", "pipe-sizing-study.csv"))
            .Count(l => l.Trim().Length > 0) - 1;
        Assert.Contains($"sizing study batch: {cases} answers for {cases} cases, 0 not 200", run.Output);
    }

    [Fact]
    public async Task Main_NoServiceListening_ExitsNonZero()
    {
        var run = await SamplePrograms.Run("python3", Script, $"http://127.0.0.1:{LiveService.FreePort()}", TimeSpan.FromSeconds(60));

        Assert.False(run.TimedOut, run.ToString());
        Assert.Equal(1, run.ExitCode);
        Assert.Contains("FAIL", run.Output);
    }
}
