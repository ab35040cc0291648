using System.Globalization;

namespace FlowSolve.Api.Problems;

/// <summary>
/// Collects per-field validation errors under their wire (camelCase) names, and reads numeric fields with the
/// checks every calculation needs: present, finite (no NaN, no infinity, nothing that overflowed), in range.
/// </summary>
/// <remarks>
/// ASP.NET Core's built-in minimal-API validation keys its errors by CLR property name (PascalCase) and skips
/// object-level rules when any property fails; our contract names wire fields and reports every bad field at
/// once, so validation is done here, once per request, before any Core call.
/// </remarks>
public sealed class FieldErrors
{
    private Dictionary<string, List<string>>? _errors;

    /// <summary>True when at least one error was recorded.</summary>
    public bool Any => _errors is { Count: > 0 };

    /// <summary>Records an error for a field.</summary>
    public void Add(string field, string message)
    {
        _errors ??= new Dictionary<string, List<string>>(StringComparer.Ordinal);
        if (!_errors.TryGetValue(field, out var list)) _errors[field] = list = new List<string>(1);
        list.Add(message);
    }

    /// <summary>True when this field already has an error.</summary>
    public bool Has(string field) => _errors?.ContainsKey(field) == true;

    /// <summary>The errors in the shape of <c>HttpValidationProblemDetails.Errors</c>.</summary>
    public Dictionary<string, string[]> ToDictionary() =>
        _errors?.ToDictionary(e => e.Key, e => e.Value.ToArray(), StringComparer.Ordinal) ?? new();

    /// <summary>A required number: present, finite, and inside [min, max] (or (min, max] when <paramref name="minExclusive"/>).</summary>
    /// <returns>The value, or NaN when an error was recorded (the caller returns the problem before using it).</returns>
    public double Required(string field, double? value, double min, double max, bool minExclusive = false, string? unit = null)
    {
        if (value is null)
        {
            Add(field, "is required");
            return double.NaN;
        }
        return Check(field, value.Value, min, max, minExclusive, unit);
    }

    /// <summary>An optional number; null when absent, otherwise checked as <see cref="Required"/>.</summary>
    public double? Optional(string field, double? value, double min, double max, bool minExclusive = false, string? unit = null) =>
        value is null ? null : Check(field, value.Value, min, max, minExclusive, unit);

    private double Check(string field, double value, double min, double max, bool minExclusive, string? unit)
    {
        if (double.IsNaN(value))
        {
            Add(field, "must be a number, not NaN");
            return double.NaN;
        }
        if (double.IsInfinity(value))
        {
            Add(field, "must be finite (the value is infinite or too large for a double)");
            return double.NaN;
        }
        bool low = minExclusive ? !(value > min) : !(value >= min);
        if (low || value > max)
        {
            string u = unit is null ? "" : " " + unit;
            string lower = minExclusive
                ? (min == 0 ? "greater than 0" : string.Create(CultureInfo.InvariantCulture, $"greater than {min:G6}{u}"))
                : string.Create(CultureInfo.InvariantCulture, $"at least {min:G6}{u}");
            string text = double.IsPositiveInfinity(max)
                ? $"must be {lower}"
                : string.Create(CultureInfo.InvariantCulture, $"must be {lower} and at most {max:G6}{u}");
            Add(field, text);
            return double.NaN;
        }
        // -0 is a legitimate double but reads oddly in an echo; normalise it.
        return value == 0 ? 0.0 : value;
    }
}
