namespace FlowSolve.Api.Tests.Hosting;

public sealed class HealthTests(ApiFixture api)
{
    [Theory]
    [InlineData("/health/live")]
    [InlineData("/health/ready")]
    public async Task Health_AnswersHealthy(string path)
    {
        using var response = await api.Client.GetAsync(path, TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        Assert.Equal("Healthy", await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
    }
}
