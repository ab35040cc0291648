using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Tests.Friction;

public sealed class FrictionMethodInfoTests
{
    public static TheoryData<string> ApproximationCodes => new() { "swamee-jain", "haaland", "churchill", "serghides" };

    [Theory]
    [MemberData(nameof(ApproximationCodes))]
    public void MeasuredMaxDeviationPercent_MatchesAFreshSurvey(string code)
    {
        // The documented figure (README, OpenAPI) must be what the code actually does over the stated range.
        Assert.True(FrictionMethodInfo.TryParse(code, out var info));
        var survey = FrictionSurvey.MaximumDeviation(info);
        Assert.Equal(info.MeasuredMaxDeviationPercent, survey.MaxDeviationPercent, 0.005 * survey.MaxDeviationPercent + 5e-5);
    }

    [Fact]
    public void SwameeJain_OftenQuotedOnePercent_DoesNotHoldInLowReynoldsHighRoughnessCorner()
    {
        var survey = FrictionSurvey.MaximumDeviation(FrictionMethodInfo.SwameeJain);
        Assert.True(survey.MaxDeviationPercent > 1.0);
        Assert.True(survey.Reynolds < 2e4 && survey.RelativeRoughness > 1e-3,
            $"largest at Re {survey.Reynolds}, e/D {survey.RelativeRoughness}");
    }

    [Fact]
    public void TryParse_UnknownName_ReturnsFalse() => Assert.False(FrictionMethodInfo.TryParse("moody-chart", out _));
}
