using MathNet.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>
/// A trapezoidal channel written out independently of Core for the profile tests: geometry by closed forms, Manning's
/// friction slope, Fr^2 = Q^2 T/(g A^3), the momentum function M = b y^2/2 + z y^3/3 + Q^2/(g A), and the distance
/// along a gradually varied profile as MathNet's double-exponential quadrature of dx/dy = (1 - Fr^2)/(S0 - Sf) (Chow 1959,
/// Open-Channel Hydraulics, chapters 9 and 15, from memory); roots by MathNet's Brent.
/// </summary>
internal sealed record GvfTrapezoid(double B, double Z, double N, double Q, double S0)
{
    private const double G = 9.80665;

    public double A(double y) => B * y + Z * y * y;
    public double T(double y) => B + 2 * Z * y;
    public double P(double y) => B + 2 * y * Math.Sqrt(1 + Z * Z);
    public double Sf(double y) { double a = A(y), r = a / P(y); return Q * Q * N * N / (a * a * Math.Pow(r, 4.0 / 3)); }
    public double Fr2(double y) => Q * Q * T(y) / (G * Math.Pow(A(y), 3));
    public double M(double y) => B * y * y / 2 + Z * y * y * y / 3 + Q * Q / (G * A(y));

    /// <summary>Distance upstream from depth y0 to y along the profile (negative when y lies downstream).</summary>
    public double Upstream(double y0, double y) => y0 == y ? 0 : Integrate.OnClosedInterval(v => (1 - Fr2(v)) / (Sf(v) - S0), y0, y, 1e-15);

    public double CriticalDepth() => Brent.FindRoot(y => Fr2(y) - 1, 1e-6, 100, 1e-15, 500);

    public double Sequent(double y1, double yc) => Brent.FindRoot(y => M(y) - M(y1), yc, 100, 1e-15, 500);
}
