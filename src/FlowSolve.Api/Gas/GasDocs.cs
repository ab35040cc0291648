using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Gas;

/// <summary>The gas-line operation's OpenAPI description: method, sources, validity, units and cautions.</summary>
public static class GasDocs
{
    /// <summary>What gas work adds to the general cautions.</summary>
    public const string GasCautions =
        "Gas pressures, pipe materials and wall thicknesses, and any work on flammable or toxic gases follow the local codes " +
        "and the gas utility's rules; this calculation sizes the flow only.";

    public static string Description { get; } =
        "Steady isothermal flow of a gas in a horizontal pipe of constant section. Give inletPressure and either outletPressure " +
        "(the answer gives massFlow) or massFlow (the answer gives outletPressure); absolute pressures. The relation, from the " +
        "momentum equation integrated at constant temperature (Shapiro 1953, The Dynamics and Thermodynamics of Compressible " +
        "Fluid Flow, vol. 1, ch. 6): p1^2 - p2^2 = (Z R T G^2 / M) (f L/D + 2 ln(p1/p2)), G = mass flow / area, " +
        "R = 8.314462618 J/(mol K), f the Darcy friction factor at Re = G D / mu (the same all along the line): " +
        "Colebrook-White (1939) in turbulent flow, 64/Re below Re 2000, Churchill (1977) between, with a warning. Both " +
        "directions are solved by safeguarded Newton iteration (the outlet pressure in the relative drop (p1 - p2)/p1, the mass " +
        "flow in ln G).\n\n" +
        "The isothermal limit: the line chokes when the outlet velocity reaches sqrt(Z R T / M), the outlet Mach number " +
        "1/sqrt(k) with the speed of sound sqrt(k Z R T / M). Every answer gives largestMassFlow (and outletPressureAtLimit) so " +
        "the margin is visible; a massFlow above it, or an outletPressure below the choking pressure, answers 422 with " +
        "largestMassFlow in the problem body. For a mass flow below the limit the relation has two outlet pressures; the answer " +
        "is the higher, subsonic one (the other lies beyond the limit, which a line fed subsonic cannot reach). " +
        "standardVolumeFlow is at 15 degrees C and 101 325 Pa with the gas ideal there (Z = 1); specificGravity is relative to " +
        "dry air, 0.0289647 kg/mol.\n\n" +
        "Validity: a horizontal line at constant temperature, Z and viscosity, no fittings; long lines at moderate velocity, " +
        "where the gas exchanges heat with the ground (near the limit a real line runs closer to adiabatic flow: warned as " +
        "near-isothermal-limit). SI by default; units=us takes and gives psi (absolute), degrees F, ft, lb/s, lbf s/ft2, ft/s, " +
        "lb/ft3 and ft3/s (standard volume flow still at 15 degrees C and 101 325 Pa); molarMass is in kg/mol in both.\n\n" +
        GasCautions + " " + OpenApiSetup.Cautions;
}
