using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Gas;

/// <summary>First-order sensitivities of a gas line's solved output (the outlet pressure, Pa, or the mass flow, kg/s) to
/// each input, SI units throughout: d(output)/d(input).</summary>
/// <param name="InletPressure">Per Pa of p1.</param>
/// <param name="Given">Per unit of the other given quantity: per kg/s of mass flow when the outlet pressure was solved,
/// per Pa of outlet pressure when the mass flow was.</param>
/// <param name="Length">Per m of length.</param>
/// <param name="Diameter">Per m of diameter (the given mass flow or outlet pressure held).</param>
/// <param name="Roughness">Per m of roughness.</param>
/// <param name="Temperature">Per kelvin (= per degree C).</param>
/// <param name="DynamicViscosity">Per Pa s.</param>
/// <param name="CompressibilityFactor">Per unit of Z.</param>
/// <param name="MolarMass">Per kg/mol.</param>
public readonly record struct GasPartials(double InletPressure, double Given, double Length, double Diameter, double Roughness,
    double Temperature, double DynamicViscosity, double CompressibilityFactor, double MolarMass);

/// <summary>Sensitivities of a solved gas line by implicit differentiation of the relation
/// Phi = p1^2 - p2^2 - C G^2 (f L/D + 2 ln(p1/p2)) = 0, C = Z R T / M, G = m / A: dy/dx = -Phi_x / Phi_y, with df/dRe and
/// df/d(e/D) of the friction relation used (<see cref="FrictionSensitivity"/>). Each partial is taken over p1^2 (the
/// ratio is unchanged, and nothing overflows).</summary>
public static class GasSensitivity
{
    /// <summary>The partials of the solved output.</summary>
    /// <param name="r">A result with <see cref="GasFlowStatus.Solved"/>.</param>
    /// <param name="outletPressureSolved">True when the outlet pressure was solved (from the mass flow), false for the mass flow.</param>
    /// <exception cref="ArgumentException">The result holds no solved line.</exception>
    public static GasPartials Of(in GasFlowResult r, bool outletPressureSolved)
    {
        if (r.Status != GasFlowStatus.Solved) throw new ArgumentException("the result holds no solved line", nameof(r));
        var line = r.Line;
        var gas = r.Gas;
        double p1 = r.InletPressure, p2 = r.OutletPressure, g = r.MassFlux, d = line.Diameter, l = line.Length;
        double eD = line.RelativeRoughness, re = r.Reynolds, f = r.Friction.FrictionFactor;
        var fp = FrictionSensitivity.Of(r.Friction, re, eD);
        double rootB = g * Math.Sqrt(gas.PressurePerDensity) / p1, b = rootB * rootB; // C G^2 / p1^2
        double s = f * l / d + GasPipeFlow.PressureLog(p1, p2, (p1 - p2) / p1);
        double lOverD = l / d;

        double phiP1 = 2 / p1 * (1 - b);
        double phiP2 = -2 * p2 / p1 / p1 + 2 * b / p2;
        double phiM = -b * (2 * s + lOverD * re * fp.Reynolds) / g / line.Area;
        double phiL = -b * f / d;
        double dFdD = lOverD * (-fp.Reynolds * re / d - fp.RelativeRoughness * eD / d) - f * l / (d * d);
        double phiD = -b * (-4 * s / d + dFdD);
        double phiE = -b * lOverD * fp.RelativeRoughness / d;
        double phiT = -b * s / gas.AbsoluteTemperature;
        double phiMu = b * lOverD * fp.Reynolds * re / gas.DynamicViscosity;
        double phiZ = -b * s / gas.CompressibilityFactor;
        double phiMolar = b * s / gas.MolarMass;

        double y = outletPressureSolved ? phiP2 : phiM, given = outletPressureSolved ? phiM : phiP2;
        return new GasPartials(-phiP1 / y, -given / y, -phiL / y, -phiD / y, -phiE / y, -phiT / y, -phiMu / y, -phiZ / y, -phiMolar / y);
    }
}
