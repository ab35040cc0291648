namespace FlowSolve.Core.Tests.Fluids;

/// <summary>Relative-tolerance comparison for the fluid property tests.</summary>
internal static class RelativeAssert
{
    /// <summary>Fails unless |actual - expected| &lt;= tolerance * |expected|.</summary>
    public static void Equal(double expected, double actual, double tolerance)
    {
        double error = Math.Abs(actual - expected) / Math.Abs(expected);
        Assert.True(error <= tolerance,
            $"expected {expected:R}, got {actual:R}: relative error {error:E3} exceeds {tolerance:E3}");
    }
}
