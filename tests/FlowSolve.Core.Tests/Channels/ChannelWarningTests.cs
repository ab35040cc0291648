using System.Text.RegularExpressions;
using FlowSolve.Core.Channels;

namespace FlowSolve.Core.Tests.Channels;

public class ChannelWarningTests
{
    [Fact]
    public void Code_EveryValue_IsDistinctKebabCase()
    {
        // Stated property: wire codes are stable kebab-case strings, one per value.
        var codes = Enum.GetValues<ChannelWarningCode>().Select(c => c.Code()).ToList();
        Assert.All(codes, c => Assert.Matches(new Regex("^[a-z]+(-[a-z]+)*$"), c));
        Assert.DoesNotContain("unknown", codes);
        Assert.Equal(codes.Count, codes.Distinct().Count());
    }

    [Fact]
    public void CodeText_TwoNormalDepths_IsTheIssueCode()
    {
        Assert.Equal("two-normal-depths", new ChannelWarning(ChannelWarningCode.TwoNormalDepths, "m").CodeText);
    }
}
