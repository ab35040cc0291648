using FlowSolve.Core.Fluids;

namespace FlowSolve.Api.Contracts;

/// <summary>One sensitivity of an output to an input.</summary>
/// <param name="Derivative">d(output)/d(input) in SI units (output's SI unit per input's SI unit; temperatures per kelvin, equal to per degree C), whatever the request's units.</param>
/// <param name="Elasticity">(d output / output) / (d input / input) = derivative x input / output, dimensionless: the percent change of the output per percent change of the input, with both in SI (temperature in degrees C). Absent when the output or the input is zero.</param>
public sealed record SensitivityDto(double Derivative, double? Elasticity);

/// <summary>The answer at the two ends of a roughness range of the pipe (see <paramref name="Basis"/>).</summary>
/// <param name="Output">The output field spread: headLoss, flow or diameter.</param>
/// <param name="Low">The smaller of the two answers, in the response's unit for that field.</param>
/// <param name="High">The larger of the two answers, in the response's unit for that field.</param>
/// <param name="AtNew">The answer at newRoughness.</param>
/// <param name="AtAged">The answer at agedRoughness; absent with basis stated-uncertainty.</param>
/// <param name="NewRoughness">The new end: the table's roughness of new pipe (new-to-aged, stated-uncertainty) or the roughness the answer used (caller-aged), m (ft with units=us).</param>
/// <param name="AgedRoughness">The aged end: the table's aged value (new-to-aged) or the request's agedRoughness (caller-aged), m (ft with units=us); absent with basis stated-uncertainty.</param>
/// <param name="Material">The material; absent when the roughness was given directly.</param>
/// <param name="Source">Where the roughness values come from, and how reliable they are.</param>
/// <param name="Basis">What the range is: new-to-aged (the table's new and aged values of the material), stated-uncertainty
/// (the table gives no aged value: its stated uncertainty of the new value, new (1 - u) to new (1 + u), the scatter of new
/// surfaces, not ageing), or caller-aged (from the roughness the answer used to the request's agedRoughness).</param>
/// <param name="LowRoughness">The smaller roughness of the range, m (ft with units=us).</param>
/// <param name="HighRoughness">The larger roughness of the range, m (ft with units=us).</param>
/// <param name="AtLowRoughness">The answer at lowRoughness, in the response's unit for that field.</param>
/// <param name="AtHighRoughness">The answer at highRoughness, in the response's unit for that field.</param>
/// <param name="UncertaintyPercent">With basis stated-uncertainty: the table's uncertainty u of the new value, percent; otherwise absent.</param>
public sealed record RoughnessSpreadDto(string Output, double Low, double High, double AtNew, double? AtAged,
    double NewRoughness, double? AgedRoughness, string? Material, string Source,
    string Basis, double LowRoughness, double HighRoughness, double AtLowRoughness, double AtHighRoughness, double? UncertaintyPercent);

/// <summary>Text shared by the sensitivity parameter and fields.</summary>
public static class SensitivityDocs
{
    public const string Parameter =
        "When true, the response adds sensitivities: for each main output (keyed by its response field name) and each numeric " +
        "input it depends on (keyed by the request's field name, dotted for nested fields), {derivative, elasticity}. Derivatives " +
        "come from implicit differentiation of the solved equation (the Newton derivative) and the chain rule through the " +
        "correlations, not from finite differences; they are in SI units even with units=us. Pipe calculations given a material " +
        "(or agedRoughness) also add roughnessSpread, the answer at both ends of a roughness range: the table's new and aged values, " +
        "or, where the table gives no aged value, its stated uncertainty of the new value (basis says which). Default false.";

    public const string Field =
        "Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}. Derivatives " +
        "are in SI units (m, m3/s, m2/s, per kelvin for temperature) whatever the request's units; elasticity is derivative x " +
        "input / output (both in SI), absent when either is zero. An entry whose derivative is not finite is left out. At a " +
        "regime limit (a jump of the friction factor) no derivative exists and the object is left out with a warning.";
}

/// <summary>Collects sensitivities keyed by output, then input; derivatives and values in SI.</summary>
internal sealed class SensitivityBuilder
{
    private readonly Dictionary<string, Dictionary<string, SensitivityDto>> _table = new(StringComparer.Ordinal);

    /// <summary>Adds d(output)/d(input) at output value <paramref name="y"/> and input value <paramref name="x"/> (SI); a
    /// derivative that is not finite is left out.</summary>
    public void Add(string output, double y, string input, double x, double derivative)
    {
        if (!double.IsFinite(derivative)) return;
        double? elasticity = y != 0 && x != 0 && double.IsFinite(derivative * x / y) ? derivative * x / y : null;
        if (!_table.TryGetValue(output, out var row)) _table[output] = row = new Dictionary<string, SensitivityDto>(StringComparer.Ordinal);
        row[input] = new SensitivityDto(derivative, elasticity);
    }

    /// <summary>The table, or null when empty.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Build() =>
        _table.Count == 0 ? null : _table.ToDictionary(p => p.Key, p => (IReadOnlyDictionary<string, SensitivityDto>)p.Value, StringComparer.Ordinal);

    /// <summary>d(nu)/dT of water at a temperature in degrees C, m2/(s K).</summary>
    public static double KinematicViscosityPerKelvin(double celsius) => WaterSensitivity.At(celsius).KinematicViscosityDerivative;
}
