namespace FlowSolve.Core.Channels;

/// <summary>A rectangular channel: a flat bottom between vertical walls (a lined canal, a box culvert running part full).</summary>
public sealed class RectangularSection : ChannelSection
{
    /// <summary>Creates a rectangular section.</summary>
    /// <param name="width">Bottom width b, m; finite and greater than zero.</param>
    /// <exception cref="ArgumentOutOfRangeException">The width is not positive and finite.</exception>
    public RectangularSection(double width)
    {
        ChannelGuard.Positive(width, nameof(width));
        Width = width;
    }

    /// <summary>Bottom width b, m.</summary>
    public double Width { get; }

    /// <inheritdoc/>
    public override SectionShape Shape => SectionShape.Rectangular;

    /// <inheritdoc/>
    public override double MaximumDepth => double.PositiveInfinity;

    internal override SectionGeometry Evaluate(double depth) =>
        new(depth, Width * depth, Width + 2.0 * depth, Width, 2.0, 0.0, 0.0, 0.0, 0.0, 0.0);

    // Wide-channel estimate K = b y^(5/3): the true conveyance is smaller, so the root lies above it.
    internal override double NormalDepthGuess(double geometricConveyance) =>
        Math.Pow(geometricConveyance / Width, 0.6);

    // Exact: y_c = (q^2/g)^(1/3) with q = Q/b.
    internal override double CriticalDepthGuess(double flowSquaredOverGravity) =>
        Math.Cbrt(flowSquaredOverGravity / (Width * Width));
}
