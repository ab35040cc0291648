using System.Diagnostics.CodeAnalysis;

namespace FlowSolve.Core.Channels;

/// <summary>Argument guards for the channel types; the throws live here so the checked methods stay small.</summary>
internal static class ChannelGuard
{
    /// <summary>Throws unless <paramref name="value"/> is finite and greater than zero (NaN fails).</summary>
    public static void Positive(double value, string parameterName)
    {
        if (!(value > 0.0) || double.IsPositiveInfinity(value)) ThrowNotPositive(value, parameterName);
    }

    /// <summary>As <see cref="Positive"/>, returning the value (for constructor chaining).</summary>
    public static double PositiveValue(double value, string parameterName)
    {
        Positive(value, parameterName);
        return value;
    }

    /// <summary>Throws unless <paramref name="value"/> is finite and not negative (NaN fails).</summary>
    public static void NonNegative(double value, string parameterName)
    {
        if (!(value >= 0.0) || double.IsPositiveInfinity(value)) ThrowNegative(value, parameterName);
    }

    /// <summary>Throws unless <paramref name="depth"/> lies in [0, <paramref name="maximumDepth"/>].</summary>
    public static void Depth(double depth, double maximumDepth, string parameterName)
    {
        if (!(depth >= 0.0) || !(depth <= maximumDepth) || double.IsPositiveInfinity(depth))
            ThrowDepth(depth, maximumDepth, parameterName);
    }

    [DoesNotReturn]
    private static void ThrowNotPositive(double value, string parameterName) =>
        throw new ArgumentOutOfRangeException(parameterName, value, "must be finite and greater than zero");

    [DoesNotReturn]
    private static void ThrowNegative(double value, string parameterName) =>
        throw new ArgumentOutOfRangeException(parameterName, value, "must be finite and not negative");

    [DoesNotReturn]
    private static void ThrowDepth(double depth, double maximumDepth, string parameterName) =>
        throw new ArgumentOutOfRangeException(parameterName, depth, $"must lie between 0 and the section's maximum depth {maximumDepth} m");

    [DoesNotReturn]
    public static void Throw(string parameterName, string message) =>
        throw new ArgumentException(message, parameterName);
}
