namespace FlowSolve.Core.Channels;

/// <summary>The kind of a <see cref="ChannelSection"/>.</summary>
public enum SectionShape
{
    /// <summary>Rectangular: a flat bottom between vertical walls.</summary>
    Rectangular,

    /// <summary>Trapezoidal: a flat bottom with two sloping sides, each with its own slope.</summary>
    Trapezoidal,

    /// <summary>Triangular (V): two sloping sides meeting at the invert.</summary>
    Triangular,

    /// <summary>Circular, running part full (culvert barrel, storm or sanitary sewer).</summary>
    Circular,

    /// <summary>An irregular section from surveyed (station, elevation) points.</summary>
    Surveyed,
}
