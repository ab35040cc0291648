using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Pipes;

/// <summary>The pipe endpoints' OpenAPI descriptions.</summary>
internal static class PipeDocs
{
    private const string Common =
        " With sensitivities=true (Darcy-Weisbach only): the answer, velocity, reynolds and frictionFactor against every numeric " +
        "input (flow or headLoss and elevationChange, diameter, length, roughness, minorLossCoefficient, and temperature or " +
        "kinematicViscosity; the roughness and K also when they came from material or fittings), in SI; with a material (or agedRoughness), roughnessSpread: the answer at both ends of a roughness range, " +
        "with basis new-to-aged (the table's new and aged values), stated-uncertainty (no aged value in the table: its stated " +
        "uncertainty of the new value, new (1 - u) to new (1 + u), the scatter of new surfaces, not ageing, with a " +
        "roughness-spread-table-uncertainty warning) or caller-aged (from the roughness used to the request's agedRoughness). Gravity is standard gravity, 9.80665 m/s2. The fluid is given by kinematicViscosity (and density, for pressures), or by " +
        "temperature for water (IAPWS-IF97, IAPWS 2008); with neither, water at 20 degrees C (68 degrees F) is assumed and said so in " +
        "assumptions. units=us switches every field to ft, ft/s, ft3/s (or gpm with flowUnit=gpm), ft2/s, psi, lb/ft3 and degrees F, " +
        "with exact factors (NIST SP 811). Bad input answers 400 naming each bad field; a well-formed problem without an answer answers " +
        "422 saying why (pipeStatus outside-range also for Reynolds numbers below 1e-3, where 64/Re exceeds 64 000, and for answers " +
        "beyond double precision).\n\n" + OpenApiSetup.Cautions;

    public const string HeadLoss =
        "Friction + minor head loss of a full pipe at a flow: Darcy-Weisbach h = (f L/D + K) V^2/(2g) with f from the exact " +
        "Colebrook-White equation (64/Re below Re 2000; Churchill 1977 with a warning from 2000 to 4000), or Hazen-Williams " +
        "(method=hazen-williams, SI velocity form V = 0.849 C R^0.63 S^0.54, water only) with the Darcy-Weisbach loss and the " +
        "difference beside it. Also the total head the pipe needs, headLoss + elevationChange (z2 - z1), and the pressure drops when " +
        "the density is known." + Common;

    public const string Flow =
        "The flow that an available head drives through a full pipe: the losses absorb headLoss - elevationChange, solved for Q by " +
        "safeguarded Newton iteration in ln Q, with the Colebrook-White derivative df/dRe in the slope (Simpson and Elhay 2011), " +
        "to a step of 1e-13 in ln Q. For two reservoirs give the difference of their levels as headLoss and no elevationChange. With " +
        "method=hazen-williams the Hazen-Williams flow is returned with the Darcy-Weisbach flow from the same head beside it. Near " +
        "Re 4000 Churchill's transition factor lies above Colebrook-White's, so a head within that drop is met by two flows: flow " +
        "is the turbulent root and alternateFlow the transitional one, with a second-solution warning." + Common;

    public const string Diameter =
        "The smallest inside diameter that carries a flow within an allowed friction + minor head loss (Darcy-Weisbach, exact " +
        "Colebrook-White), solved by safeguarded Newton iteration in ln D, and with sizeTable the smallest listed size of that table " +
        "whose inside diameter meets the allowance (its head loss is computed and checked). headLoss follows the flow calculation's " +
        "convention: the losses may use headLoss - elevationChange. Near Re 4000 the factor rises from Colebrook-White to Churchill's " +
        "transition value as the diameter grows, so an allowance within that jump is met by two diameters: diameter is the turbulent " +
        "(smaller) root and alternateDiameter the transitional (larger) one, with a second-solution warning." + Common;
}
