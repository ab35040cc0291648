using FlowSolve.Core.Gas;
using FlowSolve.Core.Numerics;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Gas;

/// <summary>
/// The isothermal gas-line relation p1^2 - p2^2 = (Z R T G^2 / M) (f L/D + 2 ln(p1/p2)), checked against the same relation
/// written out here and solved by MathNet's Brent (with its own Brent solve of Colebrook-White for the friction factor),
/// against its incompressible limit (Darcy-Weisbach) and the published form of the isothermal limit, and by round trips.
/// </summary>
public class GasPipeFlowTests
{
    private const double R = 8.314462618; // J/(mol K), CODATA 2018

    // A natural-gas-like case: specific gravity 0.6 (M = 0.6 x 0.0289647 kg/mol), 15 degrees C, Z 0.9, k 1.3.
    private static readonly GasProperties NaturalGas = new(0.6 * 0.0289647, 15, 0.9, 1.1e-5, 1.3);
    private static readonly GasLine Trunk = new(50_000, 0.3, 4.5e-5);

    private static double C(in GasProperties g) => g.CompressibilityFactor * R * (g.Temperature + 273.15) / g.MolarMass;

    /// <summary>Colebrook-White (1939) 1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f))), solved by Brent in 1/sqrt(f);
    /// the laminar law 64/Re below Re 2000.</summary>
    private static double Friction(double re, double relativeRoughness) =>
        re < 2000 ? 64 / re
        : Math.Pow(Brent.FindRoot(x => x + 2 * Math.Log10(relativeRoughness / 3.7 + 2.51 * x / re), 0.5, 50, 1e-15, 200), -2);

    /// <summary>The relation divided by p1^2, written out: (p1^2 - p2^2)/p1^2 - C G^2/p1^2 (f L/D + 2 ln(p1/p2)).</summary>
    private static double Relation(in GasLine line, in GasProperties gas, double p1, double p2, double g) =>
        (1 - p2 / p1 * (p2 / p1))
        - C(gas) * g * g / (p1 * p1) * (Friction(g * line.Diameter / gas.DynamicViscosity, line.Roughness / line.Diameter) * line.Length / line.Diameter
                                      + 2 * Math.Log(p1 / p2));

    private static double Area(in GasLine line) => Math.PI / 4 * line.Diameter * line.Diameter;

    [Theory]
    [InlineData(5e6, 20.0, 50_000.0, 0.3)]
    [InlineData(7e6, 60.0, 120_000.0, 0.6)]
    [InlineData(4e5, 0.2, 2_000.0, 0.1)]     // a distribution main
    [InlineData(2e5, 0.002, 300.0, 0.05)]   // laminar: Re about 470
    public void OutletPressure_MatchesBrentOnTheSameRelation(double p1, double massFlow, double length, double diameter)
    {
        var line = new GasLine(length, diameter, 4.5e-5);
        var r = GasPipeFlow.SolveOutletPressure(line, NaturalGas, p1, massFlow);
        Assert.Equal(GasFlowStatus.Solved, r.Status);
        Assert.True(r.Converged);
        Assert.InRange(r.Iterations, 0, 12);
        double g = massFlow / Area(line);
        // The physical root lies above the choking pressure G sqrt(C): Brent on [G sqrt(C), p1].
        double pStar = g * Math.Sqrt(C(NaturalGas));
        double p2 = Brent.FindRoot(p => Relation(line, NaturalGas, p1, p, g), pStar * (1 + 1e-12), p1 * (1 - 1e-15), 1e-16, 400);
        Assert.Equal(p2, r.OutletPressure, 1e-11 * p1);
        Assert.True(Math.Abs(r.Residual) < 1e-13, $"residual {r.Residual}");
        Assert.Equal(massFlow, r.MassFlow, 1e-14 * massFlow);
    }

    [Theory]
    [InlineData(5e6, 3.5e6, 50_000.0, 0.3)]
    [InlineData(7e6, 6.9e6, 120_000.0, 0.6)]
    [InlineData(4e5, 2.5e5, 2_000.0, 0.1)]
    [InlineData(2e5, 1.9999e5, 300.0, 0.05)]
    public void MassFlow_MatchesBrentOnTheSameRelation(double p1, double p2, double length, double diameter)
    {
        var line = new GasLine(length, diameter, 4.5e-5);
        var r = GasPipeFlow.SolveMassFlow(line, NaturalGas, p1, p2);
        Assert.Equal(GasFlowStatus.Solved, r.Status);
        Assert.InRange(r.Iterations, 1, 15);
        // Brent in ln G over Reynolds numbers 10 to 1e9.
        double nuD = NaturalGas.DynamicViscosity / diameter;
        double s = Brent.FindRoot(x => Relation(line, NaturalGas, p1, p2, Math.Exp(x)), Math.Log(10 * nuD), Math.Log(1e9 * nuD), 1e-15, 400);
        Assert.Equal(Math.Exp(s), r.MassFlux, 1e-10 * r.MassFlux);
        Assert.True(Math.Abs(r.Residual) < 1e-12 * Math.Max(1, (p1 - p2) / p1 * 1e3), $"residual {r.Residual}");
    }

    [Theory]
    [InlineData(5e6, 50_000.0, 0.3)]
    [InlineData(7e6, 120_000.0, 0.6)]
    [InlineData(4e5, 2_000.0, 0.1)]
    [InlineData(3e5, 1.0, 0.1)]   // a short line: the limit is near an inlet at the limit velocity
    public void LargestMassFlux_MatchesBrent_AndThePublishedIsothermalLimit(double p1, double length, double diameter)
    {
        var line = new GasLine(length, diameter, 4.5e-5);
        var limit = GasPipeFlow.LargestMassFlux(line, NaturalGas, p1);
        Assert.True(limit.Found);
        Assert.InRange(limit.Iterations, 1, 15);
        double c = C(NaturalGas);
        // Written out: y - 1 - ln y = f(Re) L/D with y = p1^2/(C G^2), solved by Brent in ln G below the inlet limit p1/sqrt(C).
        double Limit(double lnG)
        {
            double g = Math.Exp(lnG), y = p1 * p1 / (c * g * g);
            return y - 1 - Math.Log(y) - Friction(g * diameter / NaturalGas.DynamicViscosity, 4.5e-5 / diameter) * length / diameter;
        }
        double top = Math.Log(p1 / Math.Sqrt(c));
        double lnG = Brent.FindRoot(Limit, top - 30, top - 1e-9, 1e-13, 400);
        Assert.Equal(Math.Exp(lnG), limit.MassFlux, 1e-10 * limit.MassFlux);

        // The same limit in its published form: f L*/D = (1 - k Ma1^2)/(k Ma1^2) + ln(k Ma1^2), Ma1 the inlet Mach number
        // (isothermal flow with friction; F. M. White, Fluid Mechanics, section on isothermal flow, from memory).
        double k = NaturalGas.HeatCapacityRatio, ma1 = limit.MassFlux * c / p1 / Math.Sqrt(k * c);
        double f = Friction(limit.Reynolds, 4.5e-5 / diameter);
        double fLd = (1 - k * ma1 * ma1) / (k * ma1 * ma1) + Math.Log(k * ma1 * ma1);
        Assert.Equal(f * length / diameter, fLd, 1e-9 * fLd + 1e-12);
        // ... where the outlet Mach number is 1/sqrt(k) (the design's definition of the limit).
        double ma2 = limit.MassFlux * c / limit.OutletPressure / Math.Sqrt(k * c);
        Assert.Equal(1 / Math.Sqrt(k), ma2, 1e-12);
    }

    [Fact]
    public void AMassFlowAboveTheLimit_IsChoked_AndOneBelowIt_IsSolvedOnTheSubsonicBranch()
    {
        var limit = GasPipeFlow.LargestMassFlux(Trunk, NaturalGas, 5e6);
        double largest = limit.MassFlux * Area(Trunk);
        var over = GasPipeFlow.SolveOutletPressure(Trunk, NaturalGas, 5e6, largest * 1.001);
        Assert.Equal(GasFlowStatus.Choked, over.Status);
        Assert.False(over.Converged);
        Assert.Equal(largest, over.LargestMassFlow, 1e-12 * largest);

        var under = GasPipeFlow.SolveOutletPressure(Trunk, NaturalGas, 5e6, largest * 0.98);
        Assert.Equal(GasFlowStatus.Solved, under.Status);
        Assert.True(under.OutletPressure > limit.OutletPressure);
        Assert.True(under.OutletMachNumber < 1 / Math.Sqrt(NaturalGas.HeatCapacityRatio));
        Assert.Contains(under.DescribeWarnings(), w => w.Code == "near-isothermal-limit");
        // The second root of the same relation lies below the choking pressure (Brent finds it there): not the answer.
        double g = under.MassFlux, pStar = g * Math.Sqrt(C(NaturalGas));
        double other = Brent.FindRoot(p => Relation(Trunk, NaturalGas, 5e6, p, g), pStar * 1e-40, pStar * (1 - 1e-12), 1e-16, 400);
        Assert.True(other < pStar && under.OutletPressure > pStar);

        // An outlet pressure below the choking pressure of the flow it would give is choked too.
        var low = GasPipeFlow.SolveMassFlow(Trunk, NaturalGas, 5e6, 0.2 * limit.OutletPressure);
        Assert.Equal(GasFlowStatus.Choked, low.Status);
    }

    [Theory]
    [InlineData(5e6, 20.0)]
    [InlineData(7e6, 25.0)]
    [InlineData(3e5, 0.3)]
    public void RoundTrip_OutletPressureThenMassFlow(double p1, double massFlow)
    {
        var there = GasPipeFlow.SolveOutletPressure(Trunk, NaturalGas, p1, massFlow);
        Assert.Equal(GasFlowStatus.Solved, there.Status);
        var back = GasPipeFlow.SolveMassFlow(Trunk, NaturalGas, p1, there.OutletPressure);
        Assert.Equal(GasFlowStatus.Solved, back.Status);
        Assert.Equal(massFlow, back.MassFlow, 1e-9 * massFlow);
    }

    [Theory]
    [InlineData(1.0)]
    [InlineData(1e-3)]
    public void ShortLine_ApproachesDarcyWeisbach_WithTheAccelerationFactor(double length)
    {
        // As L -> 0 with G held, p1 - p2 = (f L/D) rho1 V1^2/2 / (1 - V1^2/C) + O(L^2): Darcy-Weisbach at the inlet density,
        // raised by the acceleration of the expanding gas (differentiate the relation at p2 = p1; a stated property).
        var line = Trunk with { Length = length };
        double p1 = 5e6, massFlow = 20, g = massFlow / Area(line), c = C(NaturalGas);
        var r = GasPipeFlow.SolveOutletPressure(line, NaturalGas, p1, massFlow);
        double rho1 = p1 / c, v1 = g / rho1;
        double f = Friction(g * line.Diameter / NaturalGas.DynamicViscosity, line.Roughness / line.Diameter);
        double darcyWeisbach = f * length / line.Diameter * rho1 * v1 * v1 / 2;
        double expected = darcyWeisbach / (1 - v1 * v1 / c);
        Assert.Equal(expected, p1 - r.OutletPressure, 1e-5 * expected);
    }

    [Fact]
    public void SmallDrop_MatchesDarcyWeisbachAtTheMeanDensity()
    {
        // With p1 - p2 small the gas is nearly incompressible: G = sqrt(2 rho_m dp D / (f L)), rho_m at the mean pressure,
        // less the acceleration term 2 ln(p1/p2) beside f L/D (relative size (p1 - p2)/(p1 F)).
        double p1 = 5e6, p2 = p1 - 200, c = C(NaturalGas);
        var r = GasPipeFlow.SolveMassFlow(Trunk, NaturalGas, p1, p2);
        double rhoMean = 0.5 * (p1 + p2) / c;
        double f = Friction(r.Reynolds, Trunk.Roughness / Trunk.Diameter);
        double g = Math.Sqrt(2 * rhoMean * (p1 - p2) * Trunk.Diameter / (f * Trunk.Length));
        Assert.Equal(g, r.MassFlux, 1e-7 * g);
        Assert.Equal(f, r.Friction.FrictionFactor, 1e-12 * f);
    }

    [Fact]
    public void DerivedQuantities_FollowFromTheirDefinitions()
    {
        var r = GasPipeFlow.SolveOutletPressure(Trunk, NaturalGas, 5e6, 20);
        double c = C(NaturalGas), k = NaturalGas.HeatCapacityRatio;
        double g = 20 / Area(Trunk);
        Assert.Equal(g * c / 5e6, r.InletVelocity, 1e-12 * r.InletVelocity);
        Assert.Equal(g * c / r.OutletPressure, r.OutletVelocity, 1e-12 * r.OutletVelocity);
        Assert.Equal(r.OutletVelocity / Math.Sqrt(k * c), r.OutletMachNumber, 1e-12);
        // Standard volume flow: the ideal-gas density at 15 degrees C and 101 325 Pa, rho = p M / (R T).
        double rhoStd = 101_325 * NaturalGas.MolarMass / (R * 288.15);
        Assert.Equal(20 / rhoStd, r.StandardVolumeFlow, 1e-12 * r.StandardVolumeFlow);
        Assert.Equal(g * Trunk.Diameter / NaturalGas.DynamicViscosity, r.Reynolds, 1e-9);
    }

    [Theory]
    [InlineData(1e308, 1.0)]
    [InlineData(1e308, 1e300)]
    [InlineData(5e-324, 1e-300)]
    [InlineData(5e6, 5e-324)]
    public void ExtremeInputs_GiveAStatus_NeverAnExceptionOrANonFiniteAnswer(double p1, double massFlow)
    {
        foreach (var line in new[] { Trunk, Trunk with { Length = 5e-324 }, Trunk with { Length = 1e308, Diameter = 1e-6, Roughness = 0 } })
        {
            var r = GasPipeFlow.SolveOutletPressure(line, NaturalGas, p1, massFlow);
            if (r.Status == GasFlowStatus.Solved)
                Assert.True(double.IsFinite(r.OutletPressure) && r.OutletPressure > 0 && r.OutletPressure <= p1);
            if (!(p1 * 0.5 > 0)) continue;
            var m = GasPipeFlow.SolveMassFlow(line, NaturalGas, p1, p1 * 0.5);
            if (m.Status == GasFlowStatus.Solved) Assert.True(double.IsFinite(m.MassFlux) && m.MassFlux > 0);
            var limit = GasPipeFlow.LargestMassFlux(line, NaturalGas, p1);
            if (limit.Found) Assert.True(double.IsFinite(limit.MassFlux) && limit.MassFlux > 0);
        }
    }

    [Fact]
    public void Trace_RecordsTheDropSolve()
    {
        var trace = new SolverTrace();
        var r = GasPipeFlow.SolveOutletPressure(Trunk, NaturalGas, 5e6, 20, trace);
        Assert.Equal(r.Iterations, trace.Steps.Count);
        double last = trace.Steps[^1].X;
        Assert.Equal((5e6 - r.OutletPressure) / 5e6, last, 1e-15);
    }

    [Fact]
    public void BadArguments_Throw()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => GasPipeFlow.SolveMassFlow(Trunk, NaturalGas, 5e6, 5e6));
        Assert.Throws<ArgumentOutOfRangeException>(() => GasPipeFlow.SolveOutletPressure(Trunk, NaturalGas, double.NaN, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => GasPipeFlow.SolveOutletPressure(Trunk with { Roughness = 0.3 }, NaturalGas, 5e6, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => GasPipeFlow.LargestMassFlux(Trunk, NaturalGas with { HeatCapacityRatio = 0.9 }, 5e6));
    }
}

/// <summary><see cref="GasSensitivity"/> against central differences of the same solves (the stated property of
/// <see cref="CentralDifference"/>).</summary>
public class GasSensitivityTests
{
    private static readonly GasProperties Gas = new(0.6 * 0.0289647, 15, 0.9, 1.1e-5, 1.3);

    [Theory]
    [InlineData(true, 50_000.0, 0.3, 20.0, 0.0)]       // turbulent trunk line, outlet pressure from the mass flow
    [InlineData(false, 50_000.0, 0.3, 0.0, 3.5e6)]     // the same line, mass flow from the outlet pressure
    [InlineData(true, 300.0, 0.05, 0.002, 0.0)]        // laminar
    [InlineData(false, 2_000.0, 0.1, 0.0, 2.5e5)]      // a distribution main, large relative drop
    public void Partials_MatchCentralDifferences(bool outletSolved, double length, double diameter, double massFlow, double outlet)
    {
        double p1 = outletSolved && length < 1000 ? 2e5 : outletSolved ? 5e6 : outlet > 1e6 ? 5e6 : 4e5;
        var line = new GasLine(length, diameter, 4.5e-5);
        GasFlowResult Solve(GasLine l, GasProperties g, double inlet, double given) => outletSolved
            ? GasPipeFlow.SolveOutletPressure(l, g, inlet, given)
            : GasPipeFlow.SolveMassFlow(l, g, inlet, given);
        double Out(GasFlowResult r) => outletSolved ? r.OutletPressure : r.MassFlow;
        double givenValue = outletSolved ? massFlow : outlet;
        var r = Solve(line, Gas, p1, givenValue);
        Assert.Equal(GasFlowStatus.Solved, r.Status);
        var d = GasSensitivity.Of(r, outletSolved);
        CentralDifference.Check("d/dp1", d.InletPressure, x => Out(Solve(line, Gas, x, givenValue)), p1, step: 1e-4 * p1);
        CentralDifference.Check("d/dgiven", d.Given, x => Out(Solve(line, Gas, p1, x)), givenValue, step: 1e-4 * givenValue);
        CentralDifference.Check("d/dL", d.Length, x => Out(Solve(line with { Length = x }, Gas, p1, givenValue)), length);
        CentralDifference.Check("d/dD", d.Diameter, x => Out(Solve(line with { Diameter = x }, Gas, p1, givenValue)), diameter);
        CentralDifference.Check("d/de", d.Roughness, x => Out(Solve(line with { Roughness = x }, Gas, p1, givenValue)), 4.5e-5);
        CentralDifference.Check("d/dT", d.Temperature, x => Out(Solve(line, Gas with { Temperature = x }, p1, givenValue)), 15, step: 0.5);
        CentralDifference.Check("d/dmu", d.DynamicViscosity, x => Out(Solve(line, Gas with { DynamicViscosity = x }, p1, givenValue)), 1.1e-5);
        CentralDifference.Check("d/dZ", d.CompressibilityFactor, x => Out(Solve(line, Gas with { CompressibilityFactor = x }, p1, givenValue)), 0.9);
        CentralDifference.Check("d/dM", d.MolarMass, x => Out(Solve(line, Gas with { MolarMass = x }, p1, givenValue)), Gas.MolarMass);
    }
}
