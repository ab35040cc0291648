namespace FlowSolve.Core.Channels;

/// <summary>A triangular (V) channel: two plane sides meeting at the invert (a roadside gutter or swale).</summary>
/// <remarks>Side slopes are horizontal run per unit rise (z : 1); one side may be vertical (0), not both.</remarks>
public sealed class TriangularSection : ChannelSection
{
    private readonly double _slopeSum;
    private readonly double _sideLengths;

    /// <summary>Creates a symmetric triangular section.</summary>
    /// <param name="sideSlope">Side slope z of both sides (horizontal : vertical); finite and greater than zero.</param>
    /// <exception cref="ArgumentOutOfRangeException">The slope is not positive and finite.</exception>
    public TriangularSection(double sideSlope)
        : this(ChannelGuard.PositiveValue(sideSlope, nameof(sideSlope)), sideSlope)
    {
    }

    /// <summary>Creates a triangular section whose sides have their own slopes.</summary>
    /// <param name="leftSideSlope">Left side slope z1; finite, 0 or more.</param>
    /// <param name="rightSideSlope">Right side slope z2; finite, 0 or more; z1 + z2 must be greater than zero.</param>
    /// <exception cref="ArgumentOutOfRangeException">A negative or non-finite slope, or both slopes zero.</exception>
    public TriangularSection(double leftSideSlope, double rightSideSlope)
    {
        ChannelGuard.NonNegative(leftSideSlope, nameof(leftSideSlope));
        ChannelGuard.NonNegative(rightSideSlope, nameof(rightSideSlope));
        ChannelGuard.Positive(leftSideSlope + rightSideSlope, nameof(rightSideSlope));
        LeftSideSlope = leftSideSlope;
        RightSideSlope = rightSideSlope;
        _slopeSum = leftSideSlope + rightSideSlope;
        _sideLengths = Math.Sqrt(1.0 + leftSideSlope * leftSideSlope) + Math.Sqrt(1.0 + rightSideSlope * rightSideSlope);
    }

    /// <summary>Left side slope z1, horizontal per unit rise.</summary>
    public double LeftSideSlope { get; }

    /// <summary>Right side slope z2, horizontal per unit rise.</summary>
    public double RightSideSlope { get; }

    /// <inheritdoc/>
    public override SectionShape Shape => SectionShape.Triangular;

    /// <inheritdoc/>
    public override double MaximumDepth => double.PositiveInfinity;

    internal override SectionGeometry Evaluate(double depth) => new(
        depth, 0.5 * _slopeSum * depth * depth, _sideLengths * depth, _slopeSum * depth,
        _sideLengths, _slopeSum, 0.0, 0.0, 0.0, 0.0);

    internal override double NormalDepthGuess(double geometricConveyance) =>
        NormalDepthOf(geometricConveyance, _slopeSum, _sideLengths);

    internal override double CriticalDepthGuess(double flowSquaredOverGravity) =>
        CriticalDepthOf(flowSquaredOverGravity, _slopeSum);

    // Exact for a V: K = (m/2)^(5/3) p^(-2/3) y^(8/3), with m = z1 + z2 and p = sum of sqrt(1 + z^2).
    internal static double NormalDepthOf(double geometricConveyance, double slopeSum, double sideLengths) =>
        Math.Pow(geometricConveyance * Math.Pow(sideLengths, 2.0 / 3.0) / Math.Pow(0.5 * slopeSum, 5.0 / 3.0), 0.375);

    // Exact for a V: A^3/T = m^2 y^5 / 8.
    internal static double CriticalDepthOf(double flowSquaredOverGravity, double slopeSum) =>
        Math.Pow(8.0 * flowSquaredOverGravity / (slopeSum * slopeSum), 0.2);
}
