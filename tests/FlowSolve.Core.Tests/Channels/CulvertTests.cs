using FlowSolve.Core.Channels;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Channels;

/// <summary>
/// The culvert headwater against the FHWA HDS-5 relations (Schall et al. 2012, Hydraulic Design of Highway Culverts,
/// 3rd ed., Appendix A and the outlet-control energy balance; the equations from memory) written out independently
/// here, with every depth the code solves by Newton found again by MathNet's Brent on independently written geometry.
/// </summary>
public class CulvertTests
{
    private const double G = 9.80665;
    private const double Foot = 0.3048; // exact (NIST SP 811)

    // Circular concrete pipe, square edge with headwall: HDS-5 (2012) Table A.1 (from memory).
    private static readonly CulvertInletCoefficients SquareEdge = new(1, 0.0098, 2.0, 0.0398, 0.67, -0.5);

    // Rectangular box, 90 degree headwall with 45 degree bevels: HDS-5 (2012) Table A.1, a form-2 row (from memory).
    private static readonly CulvertInletCoefficients BoxBevel = new(2, 0.495, 0.667, 0.0314, 0.82, -0.5);

    // ---- independent geometry and solves -------------------------------------------------------------------------

    /// <summary>Part-full circle: theta = 2 acos(1 - 2y/D), A = D^2 (theta - sin theta)/8, T = D sin(theta/2), P = D theta/2.</summary>
    private static (double A, double T, double P) Circle(double d, double y)
    {
        double theta = 2 * Math.Acos(1 - 2 * y / d);
        return (d * d * (theta - Math.Sin(theta)) / 8, d * Math.Sin(theta / 2), d * theta / 2);
    }

    /// <summary>Critical depth of a circle by Brent on Q^2 T - g A^3 = 0.</summary>
    private static double CircleCritical(double d, double q) =>
        Brent.FindRoot(y => { var (a, t, _) = Circle(d, y); return q * q * t - G * a * a * a; }, 1e-9 * d, d * (1 - 1e-9), 1e-15, 500);

    /// <summary>Normal depth of a circle by Brent on (1/n) A R^(2/3) S^0.5 - Q = 0, below the discharge peak (y/D about 0.938).</summary>
    private static double CircleNormal(double d, double q, double s, double n) =>
        Brent.FindRoot(y => { var (a, _, p) = Circle(d, y); return a * Math.Pow(a / p, 2.0 / 3.0) * Math.Sqrt(s) / n - q; }, 1e-9 * d, 0.93 * d, 1e-15, 500);

    /// <summary>X = Ku Q / (A D^0.5) evaluated in feet and seconds, where HDS-5's Ku is 1: no SI constant involved.</summary>
    private static double FlowParameterInFeet(double q, double area, double d) =>
        (q / (Foot * Foot * Foot)) / (area / (Foot * Foot) * Math.Sqrt(d / Foot));

    private static double Hc(double dc, double area, double q) => dc + q * q / (area * area * 2 * G);

    // ---- tests ----------------------------------------------------------------------------------------------------

    [Fact]
    public void UnitCoefficient_IsThePrintedSiValue_AndTheExactChangeOfUnits()
    {
        // HDS-5 prints Ku = 1.811 for SI (from memory); the exact value is 1/sqrt(0.3048).
        Assert.Equal(1.811, Culvert.UnitCoefficientSi, 5e-4);
        double d = 1.2, q = 1.5, area = Math.PI * d * d / 4;
        Assert.Equal(FlowParameterInFeet(q, area, d), Culvert.UnitCoefficientSi * q / (area * Math.Sqrt(d)), 1e-13);
    }

    [Fact]
    public void Circle_Unsubmerged_Form1_MatchesTheEquationWithBrentsCriticalDepth()
    {
        double d = 1.2, q = 1.5, s = 0.01, area = Math.PI * d * d / 4;
        var r = Culvert.Solve(CulvertBarrel.Circular(d), 40, s, 0.013, 0.5, SquareEdge, q, 0.5);

        double dc = CircleCritical(d, q);
        double x = FlowParameterInFeet(q, area, d);
        Assert.True(x < 3.5);
        double hw = d * (Hc(dc, Circle(d, dc).A, q) / d + 0.0098 * x * x - 0.5 * s);

        Assert.True(r.Converged);
        Assert.Equal(CulvertInletRegime.Unsubmerged, r.InletRegime);
        Assert.Equal(dc, r.CriticalDepth, 1e-10 * d);
        Assert.Equal(x, r.FlowParameter, 1e-12 * x);
        Assert.Equal(hw, r.InletControlHeadwater, 1e-9 * hw);
        Assert.InRange(r.Iterations, 1, 40);
    }

    [Fact]
    public void Circle_Submerged_MatchesTheEquation()
    {
        double d = 1.2, q = 3.5, s = 0.01, area = Math.PI * d * d / 4;
        var r = Culvert.Solve(CulvertBarrel.Circular(d), 40, s, 0.013, 0.5, SquareEdge, q, 0.5);
        double x = FlowParameterInFeet(q, area, d);
        Assert.True(x > 4.0);
        Assert.Equal(CulvertInletRegime.Submerged, r.InletRegime);
        Assert.Equal(d * (0.0398 * x * x + 0.67 - 0.5 * s), r.InletControlHeadwater, 1e-12);
        Assert.Contains(r.Warnings, w => w.Code == "headwater-ratio-high");
    }

    [Fact]
    public void Circle_Transition_InterpolatesBetweenTheEndValues_AndIsContinuousAtBothEnds()
    {
        double d = 1.2, s = 0.01, area = Math.PI * d * d / 4;
        double QAt(double x) => x * area * Math.Sqrt(d) / Culvert.UnitCoefficientSi;
        var barrel = CulvertBarrel.Circular(d);

        // The unsubmerged end value at X = 3.5, with Brent's critical depth at that flow.
        double q35 = QAt(3.5), dc35 = CircleCritical(d, q35);
        double low = Hc(dc35, Circle(d, dc35).A, q35) / d + 0.0098 * 3.5 * 3.5 - 0.5 * s;
        double high = 0.0398 * 16 + 0.67 - 0.5 * s;
        double xMid = 3.8;
        var mid = Culvert.Solve(barrel, 40, s, 0.013, 0.5, SquareEdge, QAt(xMid), 0.5);
        Assert.Equal(CulvertInletRegime.Transition, mid.InletRegime);
        Assert.Equal(d * (low + (xMid - 3.5) / 0.5 * (high - low)), mid.InletControlHeadwater, 1e-9);
        Assert.Contains(mid.Warnings, w => w.Code == "inlet-control-transition");

        // Property: no jump where the regimes meet (a step of 1e-9 in X moves the headwater by far less than a millimetre).
        double Hw(double x) => Culvert.Solve(barrel, 40, s, 0.013, 0.5, SquareEdge, QAt(x), 0.5).InletControlHeadwater;
        Assert.Equal(Hw(3.5), Hw(3.5 + 1e-9), 1e-6);
        Assert.Equal(Hw(4.0 - 1e-9), Hw(4.0), 1e-6);
    }

    [Fact]
    public void Box_Form2_And_Form1_MatchTheEquations_WithTheRectanglesClosedFormCriticalDepth()
    {
        double b = 2.0, rise = 1.5, q = 4.0, s = 0.005, area = b * rise;
        var barrel = CulvertBarrel.Box(b, rise);
        double x = FlowParameterInFeet(q, area, rise);
        Assert.True(x < 3.5);

        var form2 = Culvert.Solve(barrel, 30, s, 0.015, 0.2, BoxBevel, q, 0.4);
        Assert.Equal(rise * 0.495 * Math.Pow(x, 0.667), form2.InletControlHeadwater, 1e-12);

        // Form 1 row: 30 to 75 degree wingwall flares (HDS-5 Table A.1, from memory); dc = (q^2/g)^(1/3) with q = Q/b.
        var flared = new CulvertInletCoefficients(1, 0.026, 1.0, 0.0347, 0.81, -0.5);
        var form1 = Culvert.Solve(barrel, 30, s, 0.015, 0.4, flared, q, 0.4);
        double dc = Math.Cbrt(q * q / (b * b * G));
        Assert.Equal(dc, form1.CriticalDepth, 1e-12);
        double hw = rise * ((dc + Math.Pow(q / (b * dc), 2) / (2 * G)) / rise + 0.026 * x - 0.5 * s);
        Assert.Equal(hw, form1.InletControlHeadwater, 1e-12);
    }

    [Fact]
    public void OutletControl_IsTheEnergyBalanceByHand_WithTheTailwaterAboveTheCrown()
    {
        // A long, rough, flat barrel under a high tailwater: outlet control governs.
        double d = 0.9, q = 1.0, len = 120, s = 0.002, n = 0.024, ke = 0.5, tw = 1.1;
        var r = Culvert.Solve(CulvertBarrel.Circular(d), len, s, n, ke, SquareEdge, q, tw);

        double area = Math.PI * d * d / 4, v = q / area, hv = v * v / (2 * G);
        double hf = n * n * len * v * v / Math.Pow(d / 4, 4.0 / 3.0); // Manning, SI, R = D/4 for the full circle
        double h0 = Math.Max(tw, (CircleCritical(d, q) + d) / 2);
        double hwo = h0 + ke * hv + hf + 1.0 * hv - s * len;

        Assert.Equal(hwo, r.OutletControlHeadwater, 1e-10);
        Assert.Equal(CulvertControl.Outlet, r.Control);
        Assert.Equal(hwo, r.Headwater, 1e-10);
        Assert.Equal(hf, r.FrictionLoss, 1e-12);
        Assert.Equal(ke * hv, r.EntranceLoss, 1e-14);
        Assert.Equal(hv, r.ExitLoss, 1e-14);
        Assert.Equal(tw, r.OutletControlTailwater);
        Assert.Equal(v, r.OutletVelocity, 1e-12); // tailwater above the crown: the full barrel
    }

    [Fact]
    public void OutletControl_UsesHalfOfCriticalDepthPlusRise_WhenTheTailwaterIsLow_AndOutletVelocityAtCriticalDepth()
    {
        double d = 0.9, q = 1.0, len = 200, s = 0.0, n = 0.024, ke = 0.9;
        var r = Culvert.Solve(CulvertBarrel.Circular(d), len, s, n, ke, SquareEdge, q, 0.1);
        double dc = CircleCritical(d, q);
        Assert.Equal((dc + d) / 2, r.OutletControlTailwater, 1e-10);
        Assert.Equal(CulvertControl.Outlet, r.Control);
        Assert.Equal(q / Circle(d, dc).A, r.OutletVelocity, 1e-8); // tailwater below critical depth: the outlet runs at dc
    }

    [Fact]
    public void InletControl_OutletVelocity_IsTheNormalDepthVelocityFromBrent()
    {
        double d = 1.2, q = 1.5, s = 0.02, n = 0.013;
        var r = Culvert.Solve(CulvertBarrel.Circular(d), 40, s, n, 0.5, SquareEdge, q, 0.3);
        Assert.Equal(CulvertControl.Inlet, r.Control);
        double yn = CircleNormal(d, q, s, n);
        Assert.Equal(yn, r.NormalDepth, 1e-9);
        Assert.Equal(q / Circle(d, yn).A, r.OutletVelocity, 1e-8);
        Assert.Equal(r.InletControlHeadwater, r.Headwater);
    }

    [Fact]
    public void SteepBarrel_UnderInletControl_WarnsOfAHighOutletVelocity_AtBrentsNormalDepth()
    {
        double d = 1.2, q = 3.0, s = 0.05, n = 0.012;
        var r = Culvert.Solve(CulvertBarrel.Circular(d), 30, s, n, 0.5, SquareEdge, q, 0.2);
        double v = q / Circle(d, CircleNormal(d, q, s, n)).A;
        Assert.Equal(CulvertControl.Inlet, r.Control);
        Assert.Equal(v, r.OutletVelocity, 1e-8);
        Assert.True(v > 4.5);
        Assert.Contains(r.Warnings, w => w.Code == "outlet-velocity-high");
    }

    [Fact]
    public void AdverseBarrel_UnderInletControl_TakesTheOutletVelocityAtCriticalDepth_AndSaysSo()
    {
        // Explicit form-2 coefficients with a large K so that the inlet governs on an adverse slope.
        var inlet = new CulvertInletCoefficients(2, 0.8, 0.667, 0.0314, 0.82, -0.5);
        double b = 2, rise = 1.5, q = 4;
        var r = Culvert.Solve(CulvertBarrel.Box(b, rise), 5, -0.005, 0.015, 0.2, inlet, q, 0.3);
        Assert.Equal(CulvertControl.Inlet, r.Control);
        Assert.True(double.IsNaN(r.NormalDepth));
        double dc = Math.Cbrt(q * q / (b * b * G)); // rectangle, closed form
        Assert.Equal(q / (b * dc), r.OutletVelocity, 1e-12);
        Assert.Contains(r.Warnings, w => w.Code == "no-normal-depth");
    }

    [Fact]
    public void PartlyFullBarrel_UnderOutletControl_BelowThreeQuartersOfTheRise_IsWarned()
    {
        double d = 1.0, q = 0.1, len = 100, s = 0.002;
        var r = Culvert.Solve(CulvertBarrel.Circular(d), len, s, 0.024, 0.5, SquareEdge, q, 0.0);
        double h0 = (CircleCritical(d, q) + d) / 2;
        Assert.Equal(h0, r.OutletControlTailwater, 1e-10);
        Assert.Equal(CulvertControl.Outlet, r.Control);
        Assert.True(r.OutletControlHeadwater < 0.75 * d);
        Assert.Contains(r.Warnings, w => w.Code == "outlet-control-partly-full");
    }

    [Fact]
    public void UsUnits_AreOnlyAChangeOfUnits()
    {
        // The same culvert stated in feet gives the same flow parameter: the exact Ku makes the answers unit-free.
        double d = 1.2, q = 1.5;
        var si = Culvert.Solve(CulvertBarrel.Circular(d), 40, 0.01, 0.013, 0.5, SquareEdge, q, 0.5);
        double area = Math.PI * d * d / 4;
        Assert.Equal(FlowParameterInFeet(q, area, d), si.FlowParameter, 1e-12);
    }

    [Fact]
    public void InletTable_NamesAreUnique_AndRowsCarryTheirSource()
    {
        var names = CulvertInlets.All.Select(r => r.Name).ToArray();
        Assert.Equal(names.Length, names.Distinct(StringComparer.Ordinal).Count());
        foreach (var row in CulvertInlets.All)
        {
            Assert.Same(row, CulvertInlets.Find(row.Name));
            Assert.Contains("Table A.1", row.Source, StringComparison.Ordinal);
            Assert.Contains("from memory", row.Source, StringComparison.Ordinal);
            Assert.InRange(row.Coefficients.Form, 1, 2);
        }
        Assert.Null(CulvertInlets.Find("no-such-inlet"));
    }

    [Theory]
    [InlineData(double.NaN)]
    [InlineData(-1.0)]
    [InlineData(0.0)]
    [InlineData(double.PositiveInfinity)]
    public void BadFlow_IsRefusedByTheGuard(double flow) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => Culvert.Solve(CulvertBarrel.Circular(1), 10, 0.01, 0.013, 0.5, SquareEdge, flow, 0));
}
