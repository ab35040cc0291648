using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.NonNewtonian;

/// <summary>The non-Newtonian endpoints' OpenAPI descriptions.</summary>
internal static class NonNewtonianDocs
{
    private const string Methods =
        " model=power-law (density, consistencyIndex K, flowBehaviorIndex n): Metzner-Reed Reynolds number Re_MR = rho V^(2-n) D^n / " +
        "(K 8^(n-1) ((3n+1)/(4n))^n) (Metzner and Reed 1955, AIChE J. 1(4)); laminar Fanning f = 16/Re_MR below the critical " +
        "Reynolds number of Ryan and Johnson (1959, AIChE J. 5(4)), Re_c = 6464 n (2+n)^((2+n)/(1+n)) / (1+3n)^2; from Re_c the " +
        "Dodge-Metzner equation (1959, AIChE J. 5(2)) for smooth pipes, 1/sqrt(f) = (4.0/n^0.75) log10(Re_MR f^(1-n/2)) - 0.4/n^1.2, " +
        "solved exactly by safeguarded Newton in 1/sqrt(f) (data range 0.36 <= n <= 1.0, 2900 <= Re_MR <= 36000, from memory); " +
        "a near-critical-reynolds warning between 0.8 and 1.25 times Re_c. model=bingham-plastic (density, yieldStress tau0, " +
        "plasticViscosity mu_p): Hedstrom number He = rho D^2 tau0 / mu_p^2 (Hedstrom 1952, Ind. Eng. Chem. 44(3)), Re = rho V D / mu_p; " +
        "laminar Fanning f_L from Buckingham-Reiner (Buckingham 1921, Proc. ASTM 21), f_L = (16/Re)(1 + He/(6 Re) - He^4/(3 f_L^3 Re^7)), " +
        "solved exactly in u = 1 - tau0/tau_w; turbulent f_T = 10^a Re^-0.193 with a = -1.47 (1 + 0.146 exp(-2.9e-5 He)); all regimes " +
        "f = (f_L^m + f_T^m)^(1/m), m = 1.7 + 40000/Re (Darby, Mun and Boger 1992, Chem. Eng. 99(9); Darby 2001, Chemical Engineering " +
        "Fluid Mechanics, 2nd ed.), evaluated as max (1 + (min/max)^m)^(1/m) so that it never overflows. frictionFactor is the Darcy " +
        "factor (4 x Fanning), as everywhere in FlowSolve; fanningFrictionFactor is beside it. The wall is taken as smooth. A field " +
        "of the other model is a 400 naming it. units=us switches to ft, ft/s, lb/ft3, lbf/ft2 (stresses and K), lbf s/ft2 and psi, " +
        "with exact factors (NIST SP 811). Rheological constants must come from measurements of the actual fluid over the shear " +
        "rates of the pipe; published correlations for these fluids scatter by 10 to 30 percent (common practice). sensitivities=true " +
        "adds d(output)/d(input) in SI for each input given, by implicit differentiation of Dodge-Metzner, Buckingham-Reiner and " +
        "(for the flow) of h(Q) = headLoss, never by differences; the power law's jump at Re_c has no derivative, so each side is " +
        "differentiated by its own law.\n\n" + OpenApiSetup.Cautions;

    public const string Friction =
        "Fanning and Darcy friction factors of a power-law fluid or a Bingham plastic at a mean velocity in a smooth pipe, with the " +
        "Reynolds number, the Hedstrom number (Bingham) or the critical Reynolds number (power law), the regime, and the solve's " +
        "iterations and residual." + Methods;

    public const string HeadLoss =
        "Head loss of a power-law fluid or a Bingham plastic in a full, smooth pipe at a flow: Darcy-Weisbach hf = f (L/D) V^2/(2g) " +
        "(= 4 tau_w L/(rho g D)) with the friction factor below, plus minor losses K V^2/(2g), and the pressure drop rho g (hf + hm). " +
        "flow in flowUnit (m3/s by default), velocity reported." + Methods;

    public const string Flow =
        "The flow of a power-law fluid or a Bingham plastic that meets a head loss (friction + minor) in a full, smooth pipe: the " +
        "inverse of non-newtonian/head-loss, solved by safeguarded Newton iteration in ln Q with the friction factor's own slope. " +
        "422 when no flow meets it: for a Bingham plastic, a head loss at or below 4 tau0 L/(rho g D) (the yield stress must be " +
        "overcome before anything flows; yieldHeadLoss in the problem); for a power-law fluid, a head loss inside the jump of friction " +
        "at Re_c between the laminar law and Dodge-Metzner (both ends and the critical flow in the problem); or a flow beyond the " +
        "evaluated range." + Methods;
}
