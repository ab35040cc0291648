namespace FlowSolve.Core.Channels;

/// <summary>Derivatives of a channel answer's outputs with respect to one input.</summary>
/// <param name="Depth">d(depth)/dp: of the normal depth or of the critical depth, m per unit of p.</param>
/// <param name="Velocity">d(V)/dp, V = Q/A at that depth, m/s per unit of p.</param>
/// <param name="FroudeNumber">d(Fr)/dp, Fr = V / sqrt(g A/T) (normal depth only; NaN for the critical depth, where Fr = 1).</param>
public readonly record struct ChannelOutputDerivatives(double Depth, double Velocity, double FroudeNumber);

/// <summary>The derivatives of a depth answer with respect to every input it depends on, in SI units; NaN for an
/// input the section or the problem does not have.</summary>
/// <param name="Flow">With respect to Q, per m3/s.</param>
/// <param name="Slope">With respect to the bed slope S, per m/m (normal depth only).</param>
/// <param name="ManningN">With respect to Manning n, per s m^-1/3 (normal depth only); for a composite section, n of
/// the segments without their own.</param>
/// <param name="BottomWidth">With respect to the bottom width b, per m (rectangular and trapezoidal).</param>
/// <param name="LeftSideSlope">With respect to the left side slope z1 (trapezoidal and triangular).</param>
/// <param name="RightSideSlope">With respect to the right side slope z2 (trapezoidal and triangular).</param>
/// <param name="Diameter">With respect to the diameter D, per m (circular).</param>
public readonly record struct ChannelSensitivities(
    ChannelOutputDerivatives Flow, ChannelOutputDerivatives Slope, ChannelOutputDerivatives ManningN,
    ChannelOutputDerivatives BottomWidth, ChannelOutputDerivatives LeftSideSlope, ChannelOutputDerivatives RightSideSlope,
    ChannelOutputDerivatives Diameter);

/// <summary>
/// Sensitivities of the normal and critical depths by implicit differentiation of the equations the solvers solve.
/// </summary>
/// <remarks>
/// <para>Normal depth: G(y; p) = ln K(y; n, geometry) + (1/2) ln S - ln Q = 0 with the conveyance
/// K = A^(5/3) / W^(2/3), W = sum P_i n_i^1.5 (one n: K = A R^(2/3) / n). So dy/dp = -G_p / G_y with
/// G_y = (5/3) T/A - (2/3) W'/W (the derivative the Newton solve used), G_Q = -1/Q, G_S = 1/(2S),
/// G_n = -(2/3) W_n / W, and for a dimension p of the section G_p = (5/3) A_p/A - (2/3) W_p/W at fixed depth.</para>
/// <para>Critical depth: C(y; p) = 2 ln Q + ln T - ln g - 3 ln A = 0 (Q^2 T = g A^3), so
/// dy/dp = -C_p / C_y with C_y = T'/T - 3T/A, C_Q = 2/Q, and C_p = T_p/T - 3 A_p/A for a dimension p.</para>
/// <para>Dimension partials at fixed depth: rectangle and trapezoid A_b = y, P_b = T_b = 1; trapezoid and triangle
/// A_z = y^2/2, P_z = y z / sqrt(1 + z^2), T_z = y for each side slope z; circle, by homogeneity of degree 2, 1 and 1
/// in (y, D): A_D = (2A - yT)/D, P_D = (P - yP')/D, T_D = (T - yT')/D. Surveyed sections have no scalar dimensions
/// (their points are not differentiated).</para>
/// <para>Secondary outputs: V = Q/A gives dV/dp = Q_p/A - V (T dy/dp + A_p)/A; Fr = V sqrt(T/(gA)) gives
/// d ln Fr = d ln V + (1/2) d ln T - (1/2) d ln A.</para>
/// <para>Allocation-free and thread-safe.</para>
/// </remarks>
public static class ChannelSensitivity
{
    /// <summary>Sensitivities of the normal depth at its solution.</summary>
    /// <param name="section">The section solved.</param>
    /// <param name="depth">The normal depth found, m.</param>
    /// <param name="flow">Q in m3/s.</param>
    /// <param name="slope">S in m/m.</param>
    /// <param name="manningN">n of the segments without their own (0 when every segment has its own).</param>
    public static ChannelSensitivities NormalDepth(ChannelSection section, double depth, double flow, double slope, double manningN)
    {
        ArgumentNullException.ThrowIfNull(section);
        var g = section.At(depth);
        double w = g.WeightedPerimeter(manningN);
        double gy = (5.0 / 3.0) * g.TopWidth / g.Area - (2.0 / 3.0) * g.WeightedPerimeterDerivative(manningN) / w;
        double n15 = manningN * Math.Sqrt(manningN);
        double freeP = g.WettedPerimeter - g.PerimeterWithOwnN;

        var flowD = Normal(g, flow, gy, -1.0 / flow, 0, 0, 1.0);
        var slopeD = Normal(g, flow, gy, 0.5 / slope, 0, 0, 0);
        var nD = manningN > 0 && freeP > 0
            ? Normal(g, flow, gy, -(2.0 / 3.0) * freeP * 1.5 * Math.Sqrt(manningN) / w, 0, 0, 0)
            : Missing;

        ChannelOutputDerivatives Dimension((double A, double P, double T) part) =>
            Normal(g, flow, gy, (5.0 / 3.0) * part.A / g.Area - (2.0 / 3.0) * part.P * n15 / w, part.A, part.T, 0);

        var (b, zl, zr, dia) = Dimensions(section, g);
        return new ChannelSensitivities(flowD, slopeD, nD,
            b is { } pb ? Dimension(pb) : Missing, zl is { } pl ? Dimension(pl) : Missing,
            zr is { } pr ? Dimension(pr) : Missing, dia is { } pd ? Dimension(pd) : Missing);
    }

    /// <summary>Sensitivities of the critical depth at its solution (flow and the section's dimensions).</summary>
    /// <param name="section">The section solved.</param>
    /// <param name="depth">The critical depth found, m.</param>
    /// <param name="flow">Q in m3/s.</param>
    public static ChannelSensitivities CriticalDepth(ChannelSection section, double depth, double flow)
    {
        ArgumentNullException.ThrowIfNull(section);
        var g = section.At(depth);
        double cy = g.TopWidthDerivative / g.TopWidth - 3.0 * g.TopWidth / g.Area;
        var flowD = Critical(g, flow, cy, 2.0 / flow, 0, 1.0);
        ChannelOutputDerivatives Dimension((double A, double P, double T) part) =>
            Critical(g, flow, cy, part.T / g.TopWidth - 3.0 * part.A / g.Area, part.A, 0);
        var (b, zl, zr, dia) = Dimensions(section, g);
        return new ChannelSensitivities(flowD, Missing, Missing,
            b is { } pb ? Dimension(pb) : Missing, zl is { } pl ? Dimension(pl) : Missing,
            zr is { } pr ? Dimension(pr) : Missing, dia is { } pd ? Dimension(pd) : Missing);
    }

    private static readonly ChannelOutputDerivatives Missing = new(double.NaN, double.NaN, double.NaN);

    /// <summary>dy/dp = -G_p/G_y, then V and Fr; <paramref name="flowSeed"/> is dQ/dp (1 for Q itself).</summary>
    private static ChannelOutputDerivatives Normal(in SectionGeometry g, double flow, double gy, double gp, double areaP, double topP,
        double flowSeed)
    {
        double dy = -gp / gy;
        double v = flow / g.Area;
        double dLnA = (g.TopWidth * dy + areaP) / g.Area;
        double dLnT = (g.TopWidthDerivative * dy + topP) / g.TopWidth;
        double dLnV = flowSeed / flow - dLnA;
        double froude = v / Math.Sqrt(CriticalFlow.StandardGravity * g.Area / g.TopWidth);
        return new ChannelOutputDerivatives(dy, v * dLnV, froude * (dLnV + 0.5 * dLnT - 0.5 * dLnA));
    }

    private static ChannelOutputDerivatives Critical(in SectionGeometry g, double flow, double cy, double cp, double areaP, double flowSeed)
    {
        double dy = -cp / cy;
        double v = flow / g.Area;
        double dLnA = (g.TopWidth * dy + areaP) / g.Area;
        return new ChannelOutputDerivatives(dy, v * (flowSeed / flow - dLnA), double.NaN);
    }

    /// <summary>(A_p, P_p, T_p) at fixed depth for each dimension the section has.</summary>
    private static ((double, double, double)? BottomWidth, (double, double, double)? Left, (double, double, double)? Right,
        (double, double, double)? Diameter) Dimensions(ChannelSection section, in SectionGeometry g)
    {
        double y = g.Depth;
        switch (section)
        {
            case RectangularSection:
                return ((y, 1.0, 1.0), null, null, null);
            case TrapezoidalSection t:
                return ((y, 1.0, 1.0), Side(y, t.LeftSideSlope), Side(y, t.RightSideSlope), null);
            case TriangularSection t:
                return (null, Side(y, t.LeftSideSlope), Side(y, t.RightSideSlope), null);
            case CircularSection c:
                double d = c.Diameter;
                return (null, null, null, ((2.0 * g.Area - y * g.TopWidth) / d, (g.WettedPerimeter - y * g.WettedPerimeterDerivative) / d,
                    (g.TopWidth - y * g.TopWidthDerivative) / d));
            default:
                return (null, null, null, null);
        }

        static (double, double, double) Side(double y, double z) => (0.5 * y * y, y * z / Math.Sqrt(1.0 + z * z), y);
    }
}
