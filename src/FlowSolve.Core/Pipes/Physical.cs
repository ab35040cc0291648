namespace FlowSolve.Core;

/// <summary>Physical constants shared by every area of FlowSolve.</summary>
public static class Physical
{
    /// <summary>Standard gravity g = 9.80665 m/s2, by definition (3rd CGPM, 1901). Used everywhere in FlowSolve.</summary>
    public const double StandardGravity = 9.80665;
}
