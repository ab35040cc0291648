namespace FlowSolve.Core.Friction;

/// <summary>What FlowSolve knows about a friction method: its name on the wire, its source, its published range,
/// and, for explicit approximations, the largest deviation from exact Colebrook-White that FlowSolve measured.</summary>
/// <param name="Method">The method.</param>
/// <param name="Code">Its kebab-case name on the wire, for example <c>swamee-jain</c>.</param>
/// <param name="Source">The publication.</param>
/// <param name="ReynoldsMinimum">Lowest Reynolds number of the stated range.</param>
/// <param name="ReynoldsMaximum">Highest Reynolds number of the stated range.</param>
/// <param name="RelativeRoughnessMinimum">Lowest relative roughness of the stated range.</param>
/// <param name="RelativeRoughnessMaximum">Highest relative roughness of the stated range.</param>
/// <param name="RangeProvenance">Where the range comes from, and whether it was read or recalled.</param>
/// <param name="MeasuredMaxDeviationPercent">
/// Largest |f_method / f_exact - 1| in percent over the stated range, measured by <see cref="FrictionSurvey"/>
/// on a grid of 241 Reynolds numbers (log-spaced) by 121 relative roughnesses (0 and log-spaced);
/// 0 for the exact method. A test recomputes it, so the figure cannot drift from the code.
/// </param>
/// <param name="WhereLargest">Where in the range the largest deviation occurs.</param>
public sealed record FrictionMethodInfo(
    FrictionMethod Method, string Code, string Source,
    double ReynoldsMinimum, double ReynoldsMaximum,
    double RelativeRoughnessMinimum, double RelativeRoughnessMaximum,
    string RangeProvenance, double MeasuredMaxDeviationPercent, string WhereLargest)
{
    /// <summary>The source and the range's provenance in one line, as a validity entry quotes them (built once).</summary>
    public string SourceAndRange { get; } = Source + "; range: " + RangeProvenance;

    /// <summary>True when both inputs lie in the stated range.</summary>
    /// <param name="reynolds">Reynolds number.</param>
    /// <param name="relativeRoughness">Relative roughness.</param>
    public bool InRange(double reynolds, double relativeRoughness) =>
        reynolds >= ReynoldsMinimum && reynolds <= ReynoldsMaximum &&
        relativeRoughness >= RelativeRoughnessMinimum && relativeRoughness <= RelativeRoughnessMaximum;

    /// <summary>Colebrook-White (1939), solved exactly.</summary>
    public static FrictionMethodInfo ColebrookWhite { get; } = new(
        FrictionMethod.ColebrookWhite, "colebrook-white",
        "Colebrook, C. F. (1939), J. Inst. Civ. Eng. 11(4), 133-156",
        4000, 1e8, 0, 0.05,
        "Praks and Brkic (2018), Advances in Civil Engineering 2018:5451034, abstract (read)", 0, "exact");

    /// <summary>Swamee and Jain (1976).</summary>
    public static FrictionMethodInfo SwameeJain { get; } = new(
        FrictionMethod.SwameeJain, "swamee-jain",
        "Swamee, P. K. and Jain, A. K. (1976), J. Hydraul. Div. ASCE 102(HY5), 657-664",
        5000, 1e8, 1e-6, 1e-2,
        "the paper's stated range, from memory", 2.79, "Re = 5000, e/D = 0.01 (the low-Reynolds, high-roughness corner)");

    /// <summary>Haaland (1983).</summary>
    public static FrictionMethodInfo Haaland { get; } = new(
        FrictionMethod.Haaland, "haaland",
        "Haaland, S. E. (1983), J. Fluids Eng. 105(1), 89-90",
        4000, 1e8, 0, 0.05,
        "Reynolds range from memory; roughness range taken as Colebrook-White's", 1.42, "Re = 9.1e4, e/D = 2.3e-4");

    /// <summary>Churchill (1977).</summary>
    public static FrictionMethodInfo Churchill { get; } = new(
        FrictionMethod.Churchill, "churchill",
        "Churchill, S. W. (1977), Chem. Eng. 84(24), 91-92",
        4000, 1e8, 0, 0.05,
        "all regimes per the paper (from memory); deviation measured on Colebrook-White's turbulent range", 3.15, "Re = 4.2e3, e/D = 0.015");

    /// <summary>Serghides (1984).</summary>
    public static FrictionMethodInfo Serghides { get; } = new(
        FrictionMethod.Serghides, "serghides",
        "Serghides, T. K. (1984), Chem. Eng. 91(5), 63-64",
        4000, 1e8, 0, 0.05,
        "turbulent range, from memory; taken as Colebrook-White's", 0.0031, "Re = 1.8e5, smooth pipe");

    /// <summary>Every method, exact first.</summary>
    public static IReadOnlyList<FrictionMethodInfo> All { get; } = [ColebrookWhite, SwameeJain, Haaland, Churchill, Serghides];

    /// <summary>The explicit approximations, in the order they are listed in responses.</summary>
    public static IReadOnlyList<FrictionMethodInfo> Approximations { get; } = [SwameeJain, Haaland, Churchill, Serghides];

    /// <summary>The record for a method.</summary>
    /// <param name="method">The method.</param>
    public static FrictionMethodInfo For(FrictionMethod method) => method switch
    {
        FrictionMethod.ColebrookWhite => ColebrookWhite,
        FrictionMethod.SwameeJain => SwameeJain,
        FrictionMethod.Haaland => Haaland,
        FrictionMethod.Churchill => Churchill,
        FrictionMethod.Serghides => Serghides,
        _ => throw new ArgumentOutOfRangeException(nameof(method), method, null),
    };

    /// <summary>Finds a method by its wire name (case-insensitive); false when unknown.</summary>
    /// <param name="code">The name, for example <c>haaland</c>.</param>
    /// <param name="info">The record when found.</param>
    public static bool TryParse(string? code, out FrictionMethodInfo info)
    {
        foreach (var candidate in All)
        {
            if (string.Equals(candidate.Code, code, StringComparison.OrdinalIgnoreCase))
            {
                info = candidate;
                return true;
            }
        }
        info = ColebrookWhite;
        return false;
    }
}
