namespace FlowSolve.Core.Channels;

/// <summary>The barrel shapes a culvert calculation takes.</summary>
public enum CulvertShape
{
    /// <summary>A circular pipe of diameter D (its rise is D).</summary>
    Circular,

    /// <summary>A rectangular box of span B and rise D.</summary>
    Box,
}

/// <summary>
/// The inlet-control coefficients of FHWA HDS-5 (Schall et al. 2012, Hydraulic Design of
/// Highway Culverts, 3rd ed., FHWA-HIF-12-026, Appendix A): the form of the unsubmerged equation, its K and M, the
/// submerged equation's c and Y, and the slope coefficient Ks.
/// </summary>
/// <param name="Form">1: HW/D = Hc/D + K X^M + Ks S; 2: HW/D = K X^M (X = Ku Q / (A D^0.5), the publication's flow parameter in foot-second units).</param>
/// <param name="K">Unsubmerged coefficient K (dimensionless once X is in the publication's units).</param>
/// <param name="M">Unsubmerged exponent M.</param>
/// <param name="C">Submerged coefficient c in HW/D = c X^2 + Y + Ks S.</param>
/// <param name="Y">Submerged constant Y.</param>
/// <param name="SlopeCoefficient">Ks: -0.5, or +0.7 for an inlet mitered to the fill slope (HDS-5, Appendix A, from memory).</param>
public readonly record struct CulvertInletCoefficients(int Form, double K, double M, double C, double Y, double SlopeCoefficient)
{
    /// <summary>Ks for every inlet but a mitered one.</summary>
    public const double UsualSlopeCoefficient = -0.5;

    /// <summary>Ks for an inlet mitered to the fill slope.</summary>
    public const double MiteredSlopeCoefficient = 0.7;
}

/// <summary>One row of the shipped table of inlet types: the coefficients, the entrance loss coefficient, and where both come from.</summary>
/// <param name="Name">Short kebab-case name (ours), used as <c>inletType</c>.</param>
/// <param name="Shape">The barrel shape the row applies to.</param>
/// <param name="Description">The inlet in words, as the publication's row describes it.</param>
/// <param name="Coefficients">Form, K, M, c, Y and Ks.</param>
/// <param name="EntranceLossCoefficient">ke for the outlet-control energy balance, the default when none is given.</param>
/// <param name="Source">The table and row the coefficients and ke come from.</param>
public sealed record CulvertInletType(string Name, CulvertShape Shape, string Description, CulvertInletCoefficients Coefficients,
    double EntranceLossCoefficient, string Source);

/// <summary>
/// A small table of common inlets with their HDS-5 inlet-control coefficients (FHWA HDS-5, 3rd ed., 2012, Appendix A,
/// Table A.1, "Constants for inlet control design equations") and entrance loss coefficients ke (HDS-5's table of
/// entrance loss coefficients for outlet control, full or partly full). Every figure here is recalled, not read: from
/// memory. Check them against the publication before relying on them; explicit coefficients may be given instead.
/// </summary>
public static class CulvertInlets
{
    private const string CoefficientTable = "FHWA HDS-5 (2012), Appendix A, Table A.1";
    private const string KeTable = "ke: HDS-5 (2012), table of entrance loss coefficients";

    private static CulvertInletType Row(string name, CulvertShape shape, string description, int form, double k, double m, double c, double y,
        double ke, bool mitered = false) =>
        new(name, shape, description,
            new CulvertInletCoefficients(form, k, m, c, y, mitered ? CulvertInletCoefficients.MiteredSlopeCoefficient : CulvertInletCoefficients.UsualSlopeCoefficient),
            ke, $"{CoefficientTable}, row \"{description}\"; {KeTable} (both from memory)");

    /// <summary>Every shipped inlet type, circular rows first.</summary>
    public static IReadOnlyList<CulvertInletType> All { get; } =
    [
        Row("circular-concrete-square-edge-headwall", CulvertShape.Circular, "circular concrete, square edge with headwall", 1, 0.0098, 2.0, 0.0398, 0.67, 0.5),
        Row("circular-concrete-groove-end-headwall", CulvertShape.Circular, "circular concrete, groove end with headwall", 1, 0.0018, 2.0, 0.0292, 0.74, 0.2),
        Row("circular-concrete-groove-end-projecting", CulvertShape.Circular, "circular concrete, groove end projecting", 1, 0.0045, 2.0, 0.0317, 0.69, 0.2),
        Row("circular-corrugated-metal-headwall", CulvertShape.Circular, "circular corrugated metal, headwall", 1, 0.0078, 2.0, 0.0379, 0.69, 0.5),
        Row("circular-corrugated-metal-mitered", CulvertShape.Circular, "circular corrugated metal, mitered to slope", 1, 0.0210, 1.33, 0.0463, 0.75, 0.7, mitered: true),
        Row("circular-corrugated-metal-projecting", CulvertShape.Circular, "circular corrugated metal, projecting", 1, 0.0340, 1.50, 0.0553, 0.54, 0.9),
        Row("circular-beveled-ring-45", CulvertShape.Circular, "circular, beveled ring, 45 degree bevels", 1, 0.0018, 2.50, 0.0300, 0.74, 0.2),
        Row("circular-beveled-ring-33.7", CulvertShape.Circular, "circular, beveled ring, 33.7 degree bevels", 1, 0.0018, 2.50, 0.0243, 0.83, 0.2),
        Row("box-wingwall-flare-30-to-75", CulvertShape.Box, "rectangular box, 30 to 75 degree wingwall flares", 1, 0.026, 1.0, 0.0347, 0.81, 0.4),
        Row("box-wingwall-flare-90-or-15", CulvertShape.Box, "rectangular box, 90 and 15 degree wingwall flares", 1, 0.061, 0.75, 0.0400, 0.80, 0.5),
        Row("box-wingwall-flare-0", CulvertShape.Box, "rectangular box, 0 degree wingwall flares", 1, 0.061, 0.75, 0.0423, 0.82, 0.7),
        Row("box-headwall-chamfer-19mm", CulvertShape.Box, "rectangular box, 90 degree headwall with 3/4 in chamfers", 2, 0.515, 0.667, 0.0375, 0.79, 0.5),
        Row("box-headwall-bevel-45", CulvertShape.Box, "rectangular box, 90 degree headwall with 45 degree bevels", 2, 0.495, 0.667, 0.0314, 0.82, 0.2),
        Row("box-headwall-bevel-33.7", CulvertShape.Box, "rectangular box, 90 degree headwall with 33.7 degree bevels", 2, 0.486, 0.667, 0.0252, 0.865, 0.2),
    ];

    /// <summary>The inlet type of that name (ordinal, case-sensitive), or null.</summary>
    public static CulvertInletType? Find(string name)
    {
        foreach (var row in All) if (string.Equals(row.Name, name, StringComparison.Ordinal)) return row;
        return null;
    }
}
