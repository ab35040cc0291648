namespace FlowSolve.Core.Friction;

/// <summary>How a Darcy friction factor is obtained in turbulent flow.</summary>
public enum FrictionMethod
{
    /// <summary>The implicit Colebrook-White equation, solved exactly (Colebrook 1939).</summary>
    ColebrookWhite,

    /// <summary>Swamee and Jain (1976), J. Hydraul. Div. ASCE 102(HY5).</summary>
    SwameeJain,

    /// <summary>Haaland (1983), J. Fluids Eng. 105(1).</summary>
    Haaland,

    /// <summary>Churchill (1977), Chem. Eng. 84(24): one expression for laminar, transitional and turbulent flow.</summary>
    Churchill,

    /// <summary>Serghides (1984), Chem. Eng. 91(5): Steffensen acceleration of three Colebrook fixed-point sweeps.</summary>
    Serghides,
}

/// <summary>The flow regime that decided which relation gave the friction factor.</summary>
public enum FlowRegime
{
    /// <summary>Reynolds number below the laminar limit: Hagen-Poiseuille, f = 64/Re.</summary>
    Laminar,

    /// <summary>Between the laminar and turbulent limits: no law holds; an interpolating method is used and a warning raised.</summary>
    Transitional,

    /// <summary>At or above the turbulent limit.</summary>
    Turbulent,
}

/// <summary>Warnings raised by a friction-factor evaluation, as flags so the hot path allocates nothing.</summary>
[Flags]
public enum FrictionWarnings
{
    /// <summary>No warning.</summary>
    None = 0,

    /// <summary>Reynolds number between the laminar and turbulent limits.</summary>
    TransitionalFlow = 1,

    /// <summary>Reynolds number above 1e8, the top of Colebrook-White's stated range.</summary>
    ReynoldsAboveRange = 2,

    /// <summary>Relative roughness above 0.05, the top of Colebrook-White's stated range.</summary>
    RelativeRoughnessAboveRange = 4,

    /// <summary>The selected explicit approximation is used outside its published range.</summary>
    ApproximationOutOfRange = 8,

    /// <summary>The selected approximation does not apply below the turbulent limit; the regime's own relation was used.</summary>
    MethodNotApplicableInRegime = 16,

    /// <summary>The iteration did not converge (never expected inside the validated input domain).</summary>
    NotConverged = 32,
}
