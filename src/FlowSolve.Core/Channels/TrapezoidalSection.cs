namespace FlowSolve.Core.Channels;

/// <summary>
/// A trapezoidal channel: a flat bottom and two plane sides, each with its own slope (an earth ditch, a lined canal).
/// </summary>
/// <remarks>Side slopes are horizontal run per unit rise (z : 1); 0 is a vertical side.</remarks>
public sealed class TrapezoidalSection : ChannelSection
{
    private readonly double _slopeSum;      // z1 + z2: dT/dy
    private readonly double _sideLengths;   // sqrt(1 + z1^2) + sqrt(1 + z2^2): dP/dy

    /// <summary>Creates a trapezoidal section with both sides at the same slope.</summary>
    /// <param name="bottomWidth">Bottom width b, m; finite and greater than zero.</param>
    /// <param name="sideSlope">Side slope z (horizontal : vertical) of both sides; finite, 0 or more.</param>
    /// <exception cref="ArgumentOutOfRangeException">A width that is not positive, or a negative or non-finite slope.</exception>
    public TrapezoidalSection(double bottomWidth, double sideSlope)
        : this(bottomWidth, sideSlope, sideSlope)
    {
    }

    /// <summary>Creates a trapezoidal section whose two sides have their own slopes.</summary>
    /// <param name="bottomWidth">Bottom width b, m; finite and greater than zero.</param>
    /// <param name="leftSideSlope">Left side slope z1 (horizontal : vertical); finite, 0 or more.</param>
    /// <param name="rightSideSlope">Right side slope z2 (horizontal : vertical); finite, 0 or more.</param>
    /// <exception cref="ArgumentOutOfRangeException">A width that is not positive, or a negative or non-finite slope.</exception>
    public TrapezoidalSection(double bottomWidth, double leftSideSlope, double rightSideSlope)
    {
        ChannelGuard.Positive(bottomWidth, nameof(bottomWidth));
        ChannelGuard.NonNegative(leftSideSlope, nameof(leftSideSlope));
        ChannelGuard.NonNegative(rightSideSlope, nameof(rightSideSlope));
        BottomWidth = bottomWidth;
        LeftSideSlope = leftSideSlope;
        RightSideSlope = rightSideSlope;
        _slopeSum = leftSideSlope + rightSideSlope;
        _sideLengths = Math.Sqrt(1.0 + leftSideSlope * leftSideSlope) + Math.Sqrt(1.0 + rightSideSlope * rightSideSlope);
    }

    /// <summary>Bottom width b, m.</summary>
    public double BottomWidth { get; }

    /// <summary>Left side slope z1, horizontal per unit rise.</summary>
    public double LeftSideSlope { get; }

    /// <summary>Right side slope z2, horizontal per unit rise.</summary>
    public double RightSideSlope { get; }

    /// <inheritdoc/>
    public override SectionShape Shape => SectionShape.Trapezoidal;

    /// <inheritdoc/>
    public override double MaximumDepth => double.PositiveInfinity;

    internal override SectionGeometry Evaluate(double depth) => new(
        depth,
        depth * (BottomWidth + 0.5 * _slopeSum * depth),
        BottomWidth + _sideLengths * depth,
        BottomWidth + _slopeSum * depth,
        _sideLengths, _slopeSum, 0.0, 0.0, 0.0, 0.0);

    // The smaller of the wide-rectangle and the V-section estimates; the log-space bracket in the solver makes any
    // positive start safe, a close one only saves iterations.
    internal override double NormalDepthGuess(double geometricConveyance)
    {
        double wide = Math.Pow(geometricConveyance / BottomWidth, 0.6);
        return _slopeSum > 0.0 ? Math.Min(wide, TriangularSection.NormalDepthOf(geometricConveyance, _slopeSum, _sideLengths)) : wide;
    }

    internal override double CriticalDepthGuess(double flowSquaredOverGravity)
    {
        double rectangle = Math.Cbrt(flowSquaredOverGravity / (BottomWidth * BottomWidth));
        return _slopeSum > 0.0 ? Math.Min(rectangle, TriangularSection.CriticalDepthOf(flowSquaredOverGravity, _slopeSum)) : rectangle;
    }
}
