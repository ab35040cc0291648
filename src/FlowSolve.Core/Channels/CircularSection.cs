using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Channels;

/// <summary>A circular conduit running part full: a culvert barrel, a storm or sanitary sewer.</summary>
/// <remarks>
/// <para>With the central angle theta subtended by the water surface, A = D^2 (theta - sin theta) / 8,
/// P = D theta / 2 and T = D sin(theta/2), where y = D (1 - cos(theta/2)) / 2 (common practice).</para>
/// <para>With a constant Manning n the discharge peaks below the crown, at y/D = <see cref="PeakDischargeDepthRatio"/>
/// (about 0.938), where 3 theta - 5 theta cos theta + 2 sin theta = 0; it falls back to the full-pipe value at the
/// crown. The mean velocity peaks at y/D = <see cref="PeakVelocityDepthRatio"/> (about 0.81), where tan theta = theta.
/// Both ratios are solved here once, to full precision, from those stationary conditions.</para>
/// </remarks>
public sealed class CircularSection : ChannelSection
{
    /// <summary>
    /// y/D at which the Manning discharge of a circle with constant n is greatest (about 0.938): the root of
    /// d(A^(5/3) P^(-2/3))/dtheta = 0, i.e. 3 theta - 5 theta cos theta + 2 sin theta = 0 on (pi, 2 pi).
    /// </summary>
    public static double PeakDischargeDepthRatio { get; } = DepthRatioOfAngle(SolveAngle(new PeakDischargeCondition(), 5.0));

    /// <summary>
    /// y/D at which the mean velocity (hydraulic radius) of a circle with constant n is greatest (about 0.813):
    /// the root of tan theta = theta on (pi, 3 pi / 2).
    /// </summary>
    public static double PeakVelocityDepthRatio { get; } = DepthRatioOfAngle(SolveAngle(new PeakVelocityCondition(), 4.5));

    /// <summary>Creates a circular section.</summary>
    /// <param name="diameter">Inside diameter D, m; finite and greater than zero.</param>
    /// <exception cref="ArgumentOutOfRangeException">The diameter is not positive and finite.</exception>
    public CircularSection(double diameter)
    {
        ChannelGuard.Positive(diameter, nameof(diameter));
        Diameter = diameter;
    }

    /// <summary>Inside diameter D, m.</summary>
    public double Diameter { get; }

    /// <inheritdoc/>
    public override SectionShape Shape => SectionShape.Circular;

    /// <summary>The diameter, m: the depth of a full pipe.</summary>
    public override double MaximumDepth => Diameter;

    /// <summary>The depth at which the discharge of this pipe peaks (constant n), m.</summary>
    public double PeakDischargeDepth => PeakDischargeDepthRatio * Diameter;

    internal override SectionGeometry Evaluate(double depth)
    {
        double d = Diameter;
        double ratio = depth / d;
        // theta = 4 asin(sqrt(y/D)); near the crown use the complement so that theta keeps its precision.
        double theta = ratio <= 0.5
            ? 4.0 * Math.Asin(Math.Sqrt(ratio))
            : 2.0 * Math.PI - 4.0 * Math.Asin(Math.Sqrt((d - depth) / d));
        double area = 0.125 * d * d * ThetaMinusSine(theta);
        double perimeter = 0.5 * d * theta;
        // T = 2 sqrt(y (D - y)), exact and free of the cancellation in D sin(theta/2) near the invert.
        double top = 2.0 * Math.Sqrt(depth * (d - depth));
        // dtheta/dy = 4 / T, so dP/dy = 2 D / T and dT/dy = 2 (D - 2y) / T (both infinite at invert and crown).
        double perimeterDerivative = 2.0 * d / top;
        double topDerivative = 2.0 * (d - 2.0 * depth) / top;
        return new SectionGeometry(depth, area, perimeter, top, perimeterDerivative, topDerivative, 0.0, 0.0, 0.0, 0.0);
    }

    // Straub's explicit estimate y_c = 1.01 D^-0.26 (Q^2/g)^0.25 (from memory: Straub 1978, as quoted in culvert
    // design guides), kept inside the pipe; it only starts the Newton solve.
    internal override double CriticalDepthGuess(double flowSquaredOverGravity)
    {
        double estimate = 1.01 * Math.Pow(Diameter, -0.26) * Math.Pow(flowSquaredOverGravity, 0.25);
        return Math.Clamp(estimate, 0.02 * Diameter, 0.98 * Diameter);
    }

    /// <summary>theta - sin theta without cancellation for small theta (series to theta^13).</summary>
    internal static double ThetaMinusSine(double theta)
    {
        if (theta > 0.1) return theta - Math.Sin(theta);
        double t2 = theta * theta;
        // theta^3/3! - theta^5/5! + theta^7/7! - theta^9/9! + theta^11/11!; the next term is below 1e-26 theta^3.
        return theta * t2 * (1.0 / 6.0 - t2 * (1.0 / 120.0 - t2 * (1.0 / 5040.0 - t2 * (1.0 / 362880.0 - t2 / 39916800.0))));
    }

    private static double DepthRatioOfAngle(double theta) => 0.5 * (1.0 - Math.Cos(0.5 * theta));

    private static double SolveAngle<T>(T condition, double guess) where T : struct, IDifferentiableFunction
    {
        var options = new SolverOptions(0.0, 4 * SolverOptions.MachineEpsilon, 0.0, 100);
        return SafeguardedNewton.Solve(condition, Bracket.Checked(Math.PI + 0.1, 2.0 * Math.PI - 0.1), guess, options).Root;
    }

    private readonly struct PeakDischargeCondition : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double theta)
        {
            double s = Math.Sin(theta), c = Math.Cos(theta);
            return (3.0 * theta - 5.0 * theta * c + 2.0 * s, 3.0 - 3.0 * c + 5.0 * theta * s);
        }
    }

    private readonly struct PeakVelocityCondition : IDifferentiableFunction
    {
        // sin theta - theta cos theta = 0 (tan theta = theta without the pole).
        public (double Value, double Derivative) Evaluate(double theta) =>
            (Math.Sin(theta) - theta * Math.Cos(theta), theta * Math.Sin(theta));
    }
}
