using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Api.Pipes;

/// <summary>The pipe calculations' sensitivities and roughness spread as wire records: the Core's derivatives
/// (<see cref="PipeSensitivity"/>) keyed by response and request field names, in SI.</summary>
internal static class PipeSensitivityTables
{
    /// <summary>Which problem was solved, so that the right inputs are listed.</summary>
    public enum Problem { HeadLoss, Flow, Diameter }

    public static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Build(
        Problem problem, in PipeSensitivities s, in PipeState state, PipeProblem input, double head)
    {
        var b = new SensitivityBuilder();
        (string Name, double Value, PipeInputDerivatives D)[] outputs =
        [
            (problem switch { Problem.HeadLoss => "headLoss", Problem.Flow => "flow", _ => "diameter" },
                problem switch { Problem.HeadLoss => state.HeadLoss, Problem.Flow => state.Flow, _ => state.Diameter }, s.Answer),
            ("velocity", state.Velocity, s.Velocity),
            ("reynolds", state.Reynolds, s.Reynolds),
            ("frictionFactor", state.FrictionFactor, s.FrictionFactor),
        ];
        double dnuDT = input.WaterCelsius is double t ? SensitivityBuilder.KinematicViscosityPerKelvin(t) : double.NaN;
        foreach (var (name, y, d) in outputs)
        {
            if (problem != Problem.Flow) b.Add(name, y, "flow", state.Flow, d.Flow);
            if (problem != Problem.Diameter) b.Add(name, y, "diameter", state.Diameter, d.Diameter);
            if (problem != Problem.HeadLoss)
            {
                b.Add(name, y, "headLoss", head, d.Head);
                b.Add(name, y, "elevationChange", input.ElevationRise, -d.Head);
            }
            b.Add(name, y, "length", input.Length, d.Length);
            b.Add(name, y, "roughness", input.Roughness, d.Roughness);
            b.Add(name, y, "minorLossCoefficient", input.MinorLossCoefficient, d.MinorLossCoefficient);
            if (input.WaterCelsius is double celsius) b.Add(name, y, "temperature", celsius, d.KinematicViscosity * dnuDT);
            else b.Add(name, y, "kinematicViscosity", input.Fluid.KinematicViscosity, d.KinematicViscosity);
        }
        return b.Build();
    }

    /// <summary>The answer at the two ends of a roughness range, in the response's unit; <paramref name="answerAt"/>
    /// returns the answer at a roughness in m, or null when there is none. The range, in order of preference: the
    /// caller's agedRoughness (from the roughness the answer used), the table's new and aged values, the table's stated
    /// uncertainty of the new value. Null when none applies or an end has no answer.</summary>
    public static RoughnessSpreadDto? Spread(string output, PipeProblem input, Func<double, double?> answerAt)
    {
        var u = input.Units;
        string table = $"{RoughnessTable.Source} ({RoughnessTable.Provenance})";
        if (input.AgedRoughness is double given)
        {
            double start = input.Roughness;
            if (answerAt(start) is not double atStart || answerAt(given) is not double atGiven) return null;
            string source = input.Material is { } m0 ? $"new end: {m0.Name}, {table}; aged end: agedRoughness as given" : "roughness and agedRoughness as given";
            return Make(output, u, start, atStart, given, atGiven, start, given, input.Material?.Name, source, "caller-aged", null);
        }
        if (input.Material is not { } material) return null;
        if (material.Aged is double aged)
        {
            if (answerAt(material.New) is not double atNew || answerAt(aged) is not double atAged) return null;
            return Make(output, u, material.New, atNew, aged, atAged, material.New, aged, material.Name, table, "new-to-aged", null);
        }
        if (!material.TryGetUncertaintyBand(out double low, out double high)) return null;
        if (answerAt(material.New) is not double atTable || answerAt(low) is not double atLow || answerAt(high) is not double atHigh) return null;
        return Make(output, u, low, atLow, high, atHigh, material.New, null, material.Name, table, "stated-uncertainty", material.UncertaintyPercent) with
        {
            AtNew = atTable, AtAged = null,
        };
    }

    /// <summary>A spread between roughness a (answer atA) and b (answer atB), in m; answers already in the response's unit.</summary>
    private static RoughnessSpreadDto Make(string output, UnitSystem u, double a, double atA, double b, double atB,
        double newEnd, double? agedEnd, string? material, string source, string basis, double? uncertaintyPercent)
    {
        bool aLower = a <= b;
        return new RoughnessSpreadDto(output, Math.Min(atA, atB), Math.Max(atA, atB), atA, atB,
            u.Length(newEnd), agedEnd is double e ? u.Length(e) : null, material, source, basis,
            u.Length(aLower ? a : b), u.Length(aLower ? b : a), aLower ? atA : atB, aLower ? atB : atA, uncertaintyPercent);
    }

    /// <summary>The warnings that explain a missing sensitivities object or roughness spread.</summary>
    public static IReadOnlyList<WarningDto> With(IReadOnlyList<WarningDto> warnings, params WarningDto?[] more) =>
        [.. warnings, .. more.Where(w => w is not null).Select(w => w!)];

    /// <summary>Why there is no spread, or what a spread over the table's uncertainty means; null otherwise.</summary>
    public static WarningDto? SpreadWarning(PipeProblem input, RoughnessSpreadDto? spread)
    {
        if (spread is { Basis: "stated-uncertainty" })
            return new WarningDto("roughness-spread-table-uncertainty", string.Create(CultureInfo.InvariantCulture,
                $"The roughness table gives no aged value for {spread.Material}, so roughnessSpread spans the table's stated uncertainty of the new value (plus or minus {spread.UncertaintyPercent} percent, from memory): the scatter of new surfaces, not an ageing estimate. Give agedRoughness for an aged or condition-assessed value."));
        if (spread is not null || (input.Material is null && input.AgedRoughness is null)) return null;
        if (input.AgedRoughness is null && input.Material is { } m && m.Aged is null && !m.TryGetUncertaintyBand(out _, out _))
            return new WarningDto("roughness-spread-unavailable",
                $"The roughness table gives neither an aged value nor an uncertainty for {m.Name}, so no spread is reported; give agedRoughness for one.");
        return new WarningDto("roughness-spread-unavailable",
            "The answer has no solution at one end of the roughness range, so no spread is reported.");
    }

    public static readonly WarningDto AtRegimeLimit = new("sensitivities-unavailable",
        "The answer sits on a jump of the friction factor at a regime limit, where no derivative exists; sensitivities are left out.");

    public static readonly WarningDto HazenWilliams = new("sensitivities-unavailable",
        "Sensitivities are given for the Darcy-Weisbach method; with method=hazen-williams they are left out.");
}
