namespace FlowSolve.Core.Channels;

/// <summary>
/// The hydraulic properties of a channel cross-section at one flow depth, with the derivatives that a Newton
/// solve needs. All lengths in metres, areas in square metres.
/// </summary>
/// <remarks>
/// <para>The derivative of the flow area with depth is the top width (dA/dy = T), so it is not stored twice.</para>
/// <para>Composite roughness (Horton-Einstein; see <see cref="SurveyedSection"/>) is carried as two sums over the
/// segments that have their own Manning n: their wetted perimeter and the sum of P_i n_i^1.5. The rest of the wetted
/// perimeter takes the n passed to the solver (the "default n"). For the prismatic shapes both sums are zero.</para>
/// </remarks>
/// <param name="Depth">Flow depth above the lowest point of the section, m; 0 or more.</param>
/// <param name="Area">Flow area A, m2.</param>
/// <param name="WettedPerimeter">Wetted perimeter P, m.</param>
/// <param name="TopWidth">Water-surface width T, m (also dA/dy).</param>
/// <param name="WettedPerimeterDerivative">dP/dy, dimensionless (infinite at the crown of a full circle).</param>
/// <param name="TopWidthDerivative">dT/dy, dimensionless.</param>
/// <param name="PerimeterWithOwnN">Wetted perimeter of the segments that carry their own Manning n, m.</param>
/// <param name="PerimeterWithOwnNDerivative">Its derivative with depth.</param>
/// <param name="HortonEinsteinSum">Sum of P_i n_i^1.5 over the segments that carry their own n, m s^1.5 m^-0.5.</param>
/// <param name="HortonEinsteinSumDerivative">Its derivative with depth.</param>
public readonly record struct SectionGeometry(
    double Depth,
    double Area,
    double WettedPerimeter,
    double TopWidth,
    double WettedPerimeterDerivative,
    double TopWidthDerivative,
    double PerimeterWithOwnN,
    double PerimeterWithOwnNDerivative,
    double HortonEinsteinSum,
    double HortonEinsteinSumDerivative)
{
    /// <summary>dA/dy, m; equal to <see cref="TopWidth"/>.</summary>
    public double AreaDerivative => TopWidth;

    /// <summary>Hydraulic radius R = A/P, m.</summary>
    public double HydraulicRadius => Area / WettedPerimeter;

    /// <summary>Hydraulic depth A/T, m (infinite when the top width is zero, as in a full pipe).</summary>
    public double HydraulicDepth => Area / TopWidth;

    /// <summary>
    /// The roughness-weighted perimeter W = sum(P_i n_i^1.5), with <paramref name="defaultN"/> on the segments that
    /// have no n of their own; the Horton-Einstein composite n is (W/P)^(2/3).
    /// </summary>
    /// <param name="defaultN">Manning n of the segments without their own n, s m^-1/3; 0 when every segment has one.</param>
    public double WeightedPerimeter(double defaultN) =>
        HortonEinsteinSum + (WettedPerimeter - PerimeterWithOwnN) * defaultN * Math.Sqrt(defaultN);

    /// <summary>dW/dy for <see cref="WeightedPerimeter"/>.</summary>
    /// <param name="defaultN">As for <see cref="WeightedPerimeter"/>.</param>
    public double WeightedPerimeterDerivative(double defaultN) =>
        HortonEinsteinSumDerivative + (WettedPerimeterDerivative - PerimeterWithOwnNDerivative) * defaultN * Math.Sqrt(defaultN);

    /// <summary>
    /// The effective Manning n of the whole section: <paramref name="defaultN"/> for a single roughness, otherwise the
    /// Horton-Einstein composite n_c = [sum(P_i n_i^1.5) / P]^(2/3), s m^-1/3.
    /// </summary>
    /// <param name="defaultN">As for <see cref="WeightedPerimeter"/>.</param>
    public double EffectiveManningN(double defaultN)
    {
        if (PerimeterWithOwnN == 0.0) return defaultN;
        double ratio = WeightedPerimeter(defaultN) / WettedPerimeter;
        return Math.Cbrt(ratio * ratio);
    }

    /// <summary>
    /// Manning conveyance K = A R^(2/3) / n (SI, k = 1), m3/s, so that Q = K sqrt(S). With composite roughness this is
    /// A^(5/3) / W^(2/3), the same thing with the Horton-Einstein n.
    /// </summary>
    /// <param name="defaultN">As for <see cref="WeightedPerimeter"/>.</param>
    public double Conveyance(double defaultN)
    {
        double ratio = Area / WeightedPerimeter(defaultN);
        return Area * Math.Cbrt(ratio * ratio);
    }

    /// <summary>dK/dy for <see cref="Conveyance"/>, m2/s.</summary>
    /// <param name="defaultN">As for <see cref="WeightedPerimeter"/>.</param>
    public double ConveyanceDerivative(double defaultN) =>
        Conveyance(defaultN) * LogConveyanceDerivative(defaultN);

    /// <summary>d(ln K)/dy = (5/3) T/A - (2/3) W'/W, 1/m.</summary>
    internal double LogConveyanceDerivative(double defaultN) =>
        (5.0 / 3.0) * TopWidth / Area - (2.0 / 3.0) * WeightedPerimeterDerivative(defaultN) / WeightedPerimeter(defaultN);
}
