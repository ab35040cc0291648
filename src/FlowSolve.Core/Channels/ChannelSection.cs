namespace FlowSolve.Core.Channels;

/// <summary>
/// A channel cross-section: its area, wetted perimeter and top width as functions of flow depth, with their
/// derivatives. Sections are immutable and thread-safe; the concrete types are sealed.
/// </summary>
/// <remarks>
/// Depth y is measured from the lowest point of the section (the invert), in metres. Open prismatic shapes have no
/// upper limit (<see cref="MaximumDepth"/> is infinity); a circle is limited by its crown and a surveyed section by its
/// lower end point (the lower bank top).
/// </remarks>
public abstract class ChannelSection
{
    // Only the sealed shapes in this assembly derive from it, so the solvers can rely on each shape's properties
    // (monotone conveyance of the open shapes, the single conveyance peak of the circle).
    private protected ChannelSection()
    {
    }

    /// <summary>The kind of section.</summary>
    public abstract SectionShape Shape { get; }

    /// <summary>
    /// The largest depth the section can hold, m: <see cref="double.PositiveInfinity"/> for the open prismatic shapes,
    /// the diameter for a circle, the lower bank top above the invert for a surveyed section.
    /// </summary>
    public abstract double MaximumDepth { get; }

    /// <summary>True when every part of the wetted perimeter carries its own Manning n, so no n need be passed to the solvers.</summary>
    public virtual bool HasOwnRoughness => false;

    /// <summary>True when some part of the perimeter carries its own Manning n (Horton-Einstein composite roughness applies).</summary>
    public virtual bool HasCompositeRoughness => false;

    /// <summary>The section's properties at a depth.</summary>
    /// <param name="depth">Flow depth above the invert, m; from 0 to <see cref="MaximumDepth"/>.</param>
    /// <returns>Area, wetted perimeter, top width and their derivatives at that depth.</returns>
    /// <exception cref="ArgumentOutOfRangeException">The depth is negative, NaN or above <see cref="MaximumDepth"/>.</exception>
    public SectionGeometry At(double depth)
    {
        ChannelGuard.Depth(depth, MaximumDepth, nameof(depth));
        return Evaluate(depth);
    }

    /// <summary>The geometry at a depth already known to be valid (no guard; the solvers' hot path).</summary>
    internal abstract SectionGeometry Evaluate(double depth);

    /// <summary>
    /// The geometry approached from below (<paramref name="fromBelow"/> true) or from above. The two differ only where a
    /// horizontal survey segment lies exactly at the water surface; <see cref="Evaluate(double)"/> is the value from above.
    /// </summary>
    internal virtual SectionGeometry Evaluate(double depth, bool fromBelow) => Evaluate(depth);

    /// <summary>
    /// A start for the normal-depth solve of an open prismatic shape, from the geometric conveyance
    /// A^(5/3)/P^(2/3) = Q n / sqrt(S), m^(8/3). Only the open shapes override it.
    /// </summary>
    internal virtual double NormalDepthGuess(double geometricConveyance) => double.NaN;

    /// <summary>A start for the critical-depth solve from Q^2/g, m^5. Only the open shapes and the circle override it.</summary>
    internal virtual double CriticalDepthGuess(double flowSquaredOverGravity) => double.NaN;
}
