namespace FlowSolve.Core.Channels;

/// <summary>
/// An irregular (natural) cross-section from surveyed (station, elevation) points, with an optional Manning n for each
/// segment between consecutive points.
/// </summary>
/// <remarks>
/// <para><b>Geometry.</b> The points are joined by straight segments. Stations must not decrease from one point to the
/// next; two equal stations make a vertical wall. The water surface is one level across the section, and everything
/// below it between the first and the last point is wet (a depression cut off by higher ground counts as wet). The
/// section holds water up to its lower end point: <see cref="MaximumDepth"/> is the lower of the two end elevations
/// above the lowest point, so the survey should reach the bank tops on both sides.</para>
/// <para><b>Composite roughness.</b> Where segments carry their own n, the section's n is the Horton-Einstein composite
/// n_c = [sum(P_i n_i^1.5) / P]^(2/3), P_i the wetted length of segment i (Horton 1933, Einstein 1934, as given in
/// Chow 1959, Open-Channel Hydraulics, section 6-5; from memory). It assumes the same mean velocity in every
/// sub-area. Segments with no n of their own (NaN) take the n passed to the solver.</para>
/// <para>The section is treated as one conveying unit, so the conveyance can fall as the water spreads onto a flat
/// overbank; the solvers then return every depth that satisfies the equation (see <see cref="ManningSolver"/>).</para>
/// </remarks>
public sealed class SurveyedSection : ChannelSection
{
    private readonly double[] _stations;
    private readonly double[] _elevations;
    private readonly double[] _segmentN;        // NaN where the segment takes the solver's n; empty when none given
    private readonly double[] _segmentNPow;     // n_i^1.5 (NaN as above)
    private readonly double[] _breakDepths;     // distinct point depths in (0, MaximumDepth], ascending

    /// <summary>Creates a surveyed section.</summary>
    /// <param name="stations">Horizontal positions of the points, m, left to right; at least three, finite, never decreasing.</param>
    /// <param name="elevations">Elevations of the points, m (any datum), one per station, finite.</param>
    /// <param name="segmentManningN">
    /// Optional Manning n of each segment (point i to point i + 1), s m^-1/3: one per segment (points - 1), each finite and
    /// positive, or NaN for a segment that takes the n passed to the solver. Null when the whole section has one n.
    /// </param>
    /// <exception cref="ArgumentNullException"><paramref name="stations"/> or <paramref name="elevations"/> is null.</exception>
    /// <exception cref="ArgumentException">
    /// Fewer than three points; the lists differ in length; a value is not finite; a station is smaller than the one
    /// before it; the section has no width; an end point is not above the lowest point; or a segment n is invalid.
    /// </exception>
    public SurveyedSection(IReadOnlyList<double> stations, IReadOnlyList<double> elevations, IReadOnlyList<double>? segmentManningN = null)
    {
        ArgumentNullException.ThrowIfNull(stations);
        ArgumentNullException.ThrowIfNull(elevations);
        int count = stations.Count;
        if (count < 3) ChannelGuard.Throw(nameof(stations), $"a surveyed section needs at least three points; {count} were given");
        if (elevations.Count != count) ChannelGuard.Throw(nameof(elevations), $"there must be one elevation per station ({count}); {elevations.Count} were given");

        _stations = new double[count];
        _elevations = new double[count];
        double lowest = double.PositiveInfinity;
        for (int i = 0; i < count; i++)
        {
            double x = stations[i], z = elevations[i];
            if (!double.IsFinite(x)) ChannelGuard.Throw(nameof(stations), $"station {i} is not a finite number");
            if (!double.IsFinite(z)) ChannelGuard.Throw(nameof(elevations), $"elevation {i} is not a finite number");
            if (i > 0 && x < _stations[i - 1])
                ChannelGuard.Throw(nameof(stations), $"stations must increase from left to right; station {i} ({x} m) is less than station {i - 1} ({_stations[i - 1]} m)");
            _stations[i] = x;
            _elevations[i] = z;
            lowest = Math.Min(lowest, z);
        }
        if (!(_stations[count - 1] > _stations[0])) ChannelGuard.Throw(nameof(stations), "the section has no width: the first and last stations are equal");

        InvertElevation = lowest;
        MaximumDepth = Math.Min(_elevations[0], _elevations[count - 1]) - lowest;
        if (!(MaximumDepth > 0.0)) ChannelGuard.Throw(nameof(elevations), "both end points must lie above the lowest point of the section");

        _segmentN = Array.Empty<double>();
        _segmentNPow = Array.Empty<double>();
        if (segmentManningN is not null)
        {
            if (segmentManningN.Count != count - 1)
                ChannelGuard.Throw(nameof(segmentManningN), $"there must be one Manning n per segment ({count - 1}); {segmentManningN.Count} were given");
            _segmentN = new double[count - 1];
            _segmentNPow = new double[count - 1];
            int given = 0;
            for (int i = 0; i < count - 1; i++)
            {
                double n = segmentManningN[i];
                if (!double.IsNaN(n) && (!(n > 0.0) || double.IsInfinity(n)))
                    ChannelGuard.Throw(nameof(segmentManningN), $"segment {i}: Manning n must be finite and greater than zero (or NaN to use the solver's n); got {n}");
                _segmentN[i] = n;
                _segmentNPow[i] = n * Math.Sqrt(n);
                if (!double.IsNaN(n)) given++;
            }
            HasCompositeRoughness = given > 0;
            HasOwnRoughness = given == count - 1;
        }

        var depths = new SortedSet<double>();
        foreach (double z in _elevations)
        {
            double d = z - lowest;
            if (d > 0.0 && d < MaximumDepth) depths.Add(d);
        }
        depths.Add(MaximumDepth);
        _breakDepths = [.. depths];
    }

    /// <summary>Elevation of the lowest point (the invert), m, on the survey's datum; depths are measured from it.</summary>
    public double InvertElevation { get; }

    /// <summary>Number of survey points.</summary>
    public int PointCount => _stations.Length;

    /// <summary>Station of point <paramref name="index"/>, m.</summary>
    /// <param name="index">0 to <see cref="PointCount"/> - 1.</param>
    public double Station(int index) => _stations[index];

    /// <summary>Elevation of point <paramref name="index"/>, m.</summary>
    /// <param name="index">0 to <see cref="PointCount"/> - 1.</param>
    public double Elevation(int index) => _elevations[index];

    /// <summary>Manning n of segment <paramref name="index"/> (point index to index + 1), or NaN where it takes the solver's n.</summary>
    /// <param name="index">0 to <see cref="PointCount"/> - 2.</param>
    public double SegmentManningN(int index) => _segmentN.Length == 0 ? double.NaN : _segmentN[index];

    /// <inheritdoc/>
    public override SectionShape Shape => SectionShape.Surveyed;

    /// <summary>The lower end point's height above the invert, m (the lower bank top).</summary>
    public override double MaximumDepth { get; }

    /// <inheritdoc/>
    public override bool HasOwnRoughness { get; }

    /// <inheritdoc/>
    public override bool HasCompositeRoughness { get; }

    /// <summary>Depths, m, where the geometry changes form (a survey point reaches the surface), ascending; the last is <see cref="MaximumDepth"/>.</summary>
    internal ReadOnlySpan<double> BreakDepths => _breakDepths;

    // From above inside the section; at the bank top from below (there is no section above it).
    internal override SectionGeometry Evaluate(double depth) => Evaluate(depth, fromBelow: depth >= MaximumDepth);

    internal override SectionGeometry Evaluate(double depth, bool fromBelow)
    {
        double level = InvertElevation + depth;
        double[] x = _stations, z = _elevations;
        bool composite = _segmentNPow.Length != 0;
        double area = 0, perimeter = 0, top = 0, dPerimeter = 0, dTop = 0;
        double ownPerimeter = 0, dOwnPerimeter = 0, sum = 0, dSum = 0;

        for (int i = 0; i < x.Length - 1; i++)
        {
            double z0 = z[i], z1 = z[i + 1];
            // From above, a point exactly at the surface is wet (a horizontal segment there is flooded); from below it is dry.
            bool wet0 = fromBelow ? z0 < level : z0 <= level;
            bool wet1 = fromBelow ? z1 < level : z1 <= level;
            if (!wet0 && !wet1) continue;

            double dx = x[i + 1] - x[i];
            double dz = z1 - z0;
            double length = Math.Sqrt(dx * dx + dz * dz);
            double segmentArea, segmentWidth, wetLength, dLength, dWidth;
            if (wet0 && wet1)
            {
                segmentWidth = dx;
                segmentArea = dx * (level - 0.5 * (z0 + z1));
                wetLength = length;
                dLength = 0.0;
                dWidth = 0.0;
            }
            else
            {
                double low = wet0 ? z0 : z1, high = wet0 ? z1 : z0;
                double rise = high - low;               // > 0 here
                double fraction = (level - low) / rise;  // share of the segment below the surface
                segmentWidth = fraction * dx;
                segmentArea = 0.5 * segmentWidth * (level - low);
                wetLength = fraction * length;
                dLength = length / rise;
                dWidth = dx / rise;
            }

            area += segmentArea;
            top += segmentWidth;
            perimeter += wetLength;
            dPerimeter += dLength;
            dTop += dWidth;
            if (composite)
            {
                double np = _segmentNPow[i];
                if (!double.IsNaN(np))
                {
                    ownPerimeter += wetLength;
                    dOwnPerimeter += dLength;
                    sum += np * wetLength;
                    dSum += np * dLength;
                }
            }
        }
        return new SectionGeometry(depth, area, perimeter, top, dPerimeter, dTop, ownPerimeter, dOwnPerimeter, sum, dSum);
    }
}
