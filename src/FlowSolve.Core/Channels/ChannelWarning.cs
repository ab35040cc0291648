namespace FlowSolve.Core.Channels;

/// <summary>What a <see cref="ChannelWarning"/> is about; <see cref="ChannelWarningCodeExtensions.Code"/> gives its stable wire code.</summary>
public enum ChannelWarningCode
{
    /// <summary>Two depths carry the flow at normal depth (a part-full pipe between its full and its peak discharge). Code <c>two-normal-depths</c>.</summary>
    TwoNormalDepths,

    /// <summary>More than two depths carry the flow at normal depth (a surveyed section whose conveyance is not monotone). Code <c>multiple-normal-depths</c>.</summary>
    MultipleNormalDepths,

    /// <summary>The flow exceeds the section's capacity, so no normal depth exists. Code <c>exceeds-capacity</c>.</summary>
    ExceedsCapacity,

    /// <summary>A depth was taken where the conveyance jumps (a horizontal survey segment floods at once). Code <c>conveyance-jump</c>.</summary>
    ConveyanceJump,

    /// <summary>The Froude number is close to 1, where the water surface is unstable. Code <c>near-critical</c>.</summary>
    NearCritical,

    /// <summary>More than one depth satisfies the critical-flow condition. Code <c>multiple-critical-depths</c>.</summary>
    MultipleCriticalDepths,

    /// <summary>The critical depth would lie above the top of the section. Code <c>no-critical-depth-in-section</c>.</summary>
    NoCriticalDepthInSection,

    /// <summary>The Manning n lies outside the range of tabulated values. Code <c>roughness-outside-typical-range</c>.</summary>
    RoughnessOutsideTypicalRange,

    /// <summary>A root solve stopped without meeting its tolerances. Code <c>not-converged</c>.</summary>
    NotConverged,

    /// <summary>The mean velocity at normal depth is above <see cref="ManningSolver.MaximumDesignVelocity"/>: scour of
    /// most linings, or a slope or flow typed in the wrong unit. Code <c>velocity-above-design-range</c>.</summary>
    VelocityAboveDesignRange,

    /// <summary>The mean velocity at normal depth is below <see cref="ManningSolver.MinimumDesignVelocity"/>: silting and
    /// weed growth. Code <c>velocity-below-design-range</c>.</summary>
    VelocityBelowDesignRange,

    /// <summary>The Froude number at normal depth is above <see cref="ManningSolver.MaximumDesignFroudeNumber"/>: strongly
    /// supercritical flow (standing waves, jumps at any disturbance), or a slope typed as a percent. Code
    /// <c>froude-above-design-range</c>.</summary>
    FroudeAboveDesignRange,
}

/// <summary>A warning attached to a channel result: a stable code and a sentence for the reader.</summary>
/// <param name="Code">What the warning is about.</param>
/// <param name="Message">An explanation for the engineer, with the figures involved (SI units).</param>
public sealed record ChannelWarning(ChannelWarningCode Code, string Message)
{
    /// <summary>The stable kebab-case code, for wire formats (for example <c>two-normal-depths</c>).</summary>
    public string CodeText => Code.Code();
}

/// <summary>Wire codes for <see cref="ChannelWarningCode"/> (static strings; no allocation).</summary>
public static class ChannelWarningCodeExtensions
{
    /// <summary>The stable kebab-case code of the warning.</summary>
    public static string Code(this ChannelWarningCode code) => code switch
    {
        ChannelWarningCode.TwoNormalDepths => "two-normal-depths",
        ChannelWarningCode.MultipleNormalDepths => "multiple-normal-depths",
        ChannelWarningCode.ExceedsCapacity => "exceeds-capacity",
        ChannelWarningCode.ConveyanceJump => "conveyance-jump",
        ChannelWarningCode.NearCritical => "near-critical",
        ChannelWarningCode.MultipleCriticalDepths => "multiple-critical-depths",
        ChannelWarningCode.NoCriticalDepthInSection => "no-critical-depth-in-section",
        ChannelWarningCode.RoughnessOutsideTypicalRange => "roughness-outside-typical-range",
        ChannelWarningCode.NotConverged => "not-converged",
        ChannelWarningCode.VelocityAboveDesignRange => "velocity-above-design-range",
        ChannelWarningCode.VelocityBelowDesignRange => "velocity-below-design-range",
        ChannelWarningCode.FroudeAboveDesignRange => "froude-above-design-range",
        _ => "unknown",
    };
}
