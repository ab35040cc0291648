using FlowSolve.Core.Networks;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>
/// The pressure-driven law of Wagner, Shamir and Marks (1988, J. Water Resour. Plann. Manage. 114(3), from memory):
/// q = d r(p), r = 0 at and below the minimum pressure head, 1 at and above the required head,
/// ((p - min)/(req - min))^e between; an inflow (d &lt;= 0) is delivered in full. Checked against the law written out
/// in <see cref="DenseNetworkReference.Delivered"/> and its stated properties; the graph coordinate used by the solver
/// against the law itself.
/// </summary>
public sealed class PressureDrivenDemandTests
{
    public static TheoryData<double, double, double> Laws => new()
    {
        { 0, 20, 0.5 }, { 0, 20, 1 / 1.85 }, { 5, 25, 1 }, { -2, 10, 2 }, { 0, 0.01, 0.5 }, { 0, 30, 0.1 }, { 1, 15, 3 },
    };

    [Theory]
    [MemberData(nameof(Laws))]
    public void Delivered_MatchesTheLawWrittenOut_OnAGridOfPressures(double min, double req, double e)
    {
        var law = new PressureDrivenDemand(min, req, e);
        Assert.Empty(law.Validate());
        const double d = 0.012;
        for (int i = -50; i <= 150; i++)
        {
            double p = min + (req - min) * i / 100.0;
            double expected = DenseNetworkReference.Delivered(d, p, min, req, e);
            Assert.Equal(expected, law.Delivered(d, p), 1e-15 * d + 1e-300);
            Assert.InRange(law.Fraction(p), 0, 1);
        }
    }

    [Theory]
    [MemberData(nameof(Laws))]
    public void Fraction_IsZeroAtTheMinimumOneAtTheRequiredHeadAndIncreasing(double min, double req, double e)
    {
        // Stated properties of the law: r(min) = 0, r(req) = 1, continuous at both, never decreasing.
        var law = new PressureDrivenDemand(min, req, e);
        Assert.Equal(0.0, law.Fraction(min));
        Assert.Equal(0.0, law.Fraction(min - 100));
        Assert.Equal(1.0, law.Fraction(req));
        Assert.Equal(1.0, law.Fraction(req + 100));
        double span = req - min;
        double previous = 0;
        for (int i = 0; i <= 1000; i++)
        {
            double r = law.Fraction(min + span * i / 1000.0);
            Assert.True(r >= previous, $"decreases at {i}");
            previous = r;
        }
        Assert.Equal(Math.Pow(0.5, e), law.Fraction(min + 0.5 * span), 1e-15);
    }

    [Theory]
    [InlineData(-0.01)]
    [InlineData(0)]
    public void Delivered_AnInflowOrNoDemand_IsDeliveredInFullAtAnyPressure(double demand)
    {
        var law = new PressureDrivenDemand(0, 20);
        foreach (double p in new[] { -50.0, 0, 10, 20, 80 }) Assert.Equal(demand, law.Delivered(demand, p));
        Assert.Equal(0.5, law.Exponent); // Wagner et al. (1988): the orifice exponent is the default
    }

    [Fact]
    public void Fraction_OfNaN_IsNaN() => Assert.True(double.IsNaN(new PressureDrivenDemand(0, 20).Fraction(double.NaN)));

    [Theory]
    [InlineData(0, 0, 0.5)]          // required = minimum
    [InlineData(10, 5, 0.5)]         // required below minimum
    [InlineData(0, 0.005, 0.5)]      // a band narrower than 1 cm
    [InlineData(0, 20, 0)]           // exponent 0
    [InlineData(0, 20, 0.05)]        // below the accepted range
    [InlineData(0, 20, 3.5)]         // above it
    [InlineData(0, 20, double.NaN)]
    [InlineData(double.NaN, 20, 0.5)]
    [InlineData(0, double.PositiveInfinity, 0.5)]
    [InlineData(-20000, 20, 0.5)]
    public void Validate_RejectsABadLaw_AndTheSolverRefusesIt(double min, double req, double e)
    {
        var law = new PressureDrivenDemand(min, req, e);
        var issue = Assert.Single(law.Validate());
        Assert.Equal("bad-demand-model", issue.Code);
        var model = new NetworkModel([new Junction("j", 0, 0.01)], [new Reservoir("r", 30)],
            [new NetworkPipe("p", "r", "j", 100, 0.1, 1e-4)], [], 1e-6) { DemandModel = law };
        var thrown = Assert.Throws<NetworkValidationException>(() => new NetworkSolver(model));
        Assert.Contains(thrown.Issues, i => i.Code == "bad-demand-model");
    }

    [Theory]
    [MemberData(nameof(Laws))]
    public void GraphPoint_LiesOnTheLaw_WithCoordinatesSummingToThePosition(double min, double req, double e)
    {
        // The solver's coordinate along the law: every point (s, x) it returns satisfies x = r(s) on the power law,
        // x = 0 for s <= 0 and x = 1 for s >= 1, and s + x = u (the definition).
        var law = new PressureDrivenDemand(min, req, e);
        for (int i = -20; i <= 320; i++)
        {
            double u = i / 100.0;
            var point = law.GraphPoint(u, double.NaN);
            Assert.Equal(u, point.S + point.X, 1e-13);
            double r = DenseNetworkReference.Delivered(1, min + (req - min) * point.S, min, req, e);
            Assert.Equal(r, point.X, 1e-12);
            Assert.InRange(point.Ratio, 0, 1e6);
        }
    }
}
