using System.ComponentModel;

namespace FlowSolve.Api.Check;

/// <summary>The documented shape of a check body: the calculation's own input fields (as in its route's POST body)
/// stand beside these two.</summary>
public sealed record CheckRequestShape(
    [property: Description("Claimed outputs keyed by the calculation's output field name, e.g. {\"frictionFactor\": 0.0191}; numbers in the request's units, or text for text fields such as regime.")]
    Dictionary<string, object> Claimed,
    [property: Description("Pass/fail tolerance on the deviation, percent (default 0.5).")]
    double? TolerancePercent = null);

/// <summary>One claimed output compared with the exact value.</summary>
/// <param name="Field">The output field, as in the calculation's response.</param>
/// <param name="Claimed">The claimed value as given (a number or text).</param>
/// <param name="Exact">FlowSolve's value of the field, in the request's units.</param>
/// <param name="Deviation">claimed - exact, in the field's unit (numbers only).</param>
/// <param name="DeviationPercent">(claimed / exact - 1) x 100 (numbers only; absent when the exact value is 0).</param>
/// <param name="Pass">True when |deviationPercent| is within the tolerance (numbers) or the text is equal.</param>
/// <param name="LikelyCause">What the claim matches instead, when FlowSolve can tell: an explicit approximation, another
/// water temperature, and so on. Absent when nothing was found.</param>
public sealed record ClaimCheckDto(string Field, object Claimed, object Exact, double? Deviation, double? DeviationPercent, bool Pass,
    string? LikelyCause);

/// <summary>The outcome of checking claimed values against a calculation.</summary>
/// <param name="Calculation">The calculation that was run, for example <c>friction-factor</c>.</param>
/// <param name="TolerancePercent">The tolerance used, percent (default 0.5).</param>
/// <param name="Passed">True when every claim passed.</param>
/// <param name="Checks">One entry per claimed field.</param>
/// <param name="Result">The calculation's full response for the same inputs.</param>
public sealed record CheckResponse(string Calculation, double TolerancePercent, bool Passed, IReadOnlyList<ClaimCheckDto> Checks, object Result);
