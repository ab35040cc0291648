using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Tests.Friction;

public sealed class ExplicitFrictionTests
{
    // Each approximation is reproduced here from its published formula, written independently of the
    // production code (different grouping, log base e), and compared to 1e-12.
    public static TheoryData<double, double> Points => new()
    {
        { 5e3, 0.01 }, { 2e4, 1e-3 }, { 1e5, 1e-5 }, { 1e6, 2e-4 }, { 1e8, 0.0 }, { 4e3, 0.05 },
    };

    [Theory]
    [MemberData(nameof(Points))]
    public void SwameeJain_MatchesPublishedFormula(double re, double r)
    {
        // Swamee and Jain 1976: f = 1.325 / [ln(e/3.7D + 5.74/Re^0.9)]^2 (from memory), with Re^0.9 as exp(0.9 ln Re).
        double expected = 1.325 / Math.Pow(Math.Log(r / 3.7 + 5.74 * Math.Exp(-0.9 * Math.Log(re))), 2);
        Assert.Equal(expected, ExplicitFriction.SwameeJain(re, r), 1e-12 * expected);
        // The decimal form 0.25/[log10(...)]^2 differs only by the rounding of 1.325 (0.25 ln(10)^2 = 1.32547).
        double decimalForm = 0.25 / Math.Pow(Math.Log10(r / 3.7 + 5.74 / Math.Pow(re, 0.9)), 2);
        Assert.Equal(decimalForm, ExplicitFriction.SwameeJain(re, r), 4e-4 * decimalForm);
    }

    [Theory]
    [MemberData(nameof(Points))]
    public void Haaland_MatchesPublishedFormula(double re, double r)
    {
        // Haaland 1983: 1/sqrt(f) = -1.8 log10[6.9/Re + (e/3.7D)^1.11].
        double x = -1.8 / Math.Log(10) * Math.Log(6.9 / re + Math.Exp(1.11 * Math.Log(r / 3.7 + 1e-300)));
        Assert.Equal(1 / (x * x), ExplicitFriction.Haaland(re, r), 1e-12 * (1 / (x * x)));
    }

    [Theory]
    [MemberData(nameof(Points))]
    public void Churchill_MatchesPublishedFormula(double re, double r)
    {
        // Churchill 1977: f = 8[(8/Re)^12 + 1/(A + B)^(3/2)]^(1/12), A = {2.457 ln[1/((7/Re)^0.9 + 0.27 e/D)]}^16, B = (37530/Re)^16.
        double a = Math.Pow(2.457 * Math.Log(1 / (Math.Pow(7 / re, 0.9) + 0.27 * r)), 16);
        double b = Math.Pow(37530 / re, 16);
        double expected = 8 * Math.Pow(Math.Pow(8 / re, 12) + 1 / Math.Pow(a + b, 1.5), 1 / 12.0);
        Assert.Equal(expected, ExplicitFriction.Churchill(re, r), 1e-12 * expected);
    }

    [Theory]
    [InlineData(100.0)]
    [InlineData(1500.0)]
    public void Churchill_Laminar_ReducesTo64OverRe(double re)
    {
        // Churchill's expression is built to recover Hagen-Poiseuille f = 64/Re in laminar flow.
        Assert.Equal(64 / re, ExplicitFriction.Churchill(re, 0.001), 1e-4 * 64 / re);
    }

    [Theory]
    [MemberData(nameof(Points))]
    public void Serghides_MatchesPublishedFormula(double re, double r)
    {
        // Serghides 1984, eq. (Steffensen form): psi1 = -2log(e/3.7D + 12/Re), psi2 = -2log(e/3.7D + 2.51 psi1/Re),
        // psi3 = -2log(e/3.7D + 2.51 psi2/Re), f = [psi1 - (psi2 - psi1)^2 / (psi3 - 2 psi2 + psi1)]^-2.
        double p1 = -2 * Math.Log10(r / 3.7 + 12 / re);
        double p2 = -2 * Math.Log10(r / 3.7 + 2.51 * p1 / re);
        double p3 = -2 * Math.Log10(r / 3.7 + 2.51 * p2 / re);
        double expected = Math.Pow(p1 - Math.Pow(p2 - p1, 2) / (p3 - 2 * p2 + p1), -2);
        Assert.Equal(expected, ExplicitFriction.Serghides(re, r), 1e-12 * expected);
    }
}
