using FlowSolve.Api.Contracts;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Api.Pipes;

/// <summary>The pipe calculations' sensitivities and roughness spread as wire records: the Core's derivatives
/// (<see cref="PipeSensitivity"/>) keyed by response and request field names, in SI.</summary>
internal static class PipeSensitivityTables
{
    /// <summary>Which problem was solved, so that the right inputs are listed.</summary>
    public enum Problem { HeadLoss, Flow, Diameter }

    public static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Build(
        Problem problem, in PipeSensitivities s, in PipeState state, PipeInput input, double head)
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

    /// <summary>The answer at the material's new and aged roughness, when the table gives both; <paramref name="answerAt"/>
    /// returns the answer in the response's unit at a roughness in m, or null when there is none.</summary>
    public static RoughnessSpreadDto? Spread(string output, PipeInput input, Func<double, double?> answerAt)
    {
        if (input.Material is not { Aged: double aged } material) return null;
        if (answerAt(material.New) is not double atNew || answerAt(aged) is not double atAged) return null;
        return new RoughnessSpreadDto(output, Math.Min(atNew, atAged), Math.Max(atNew, atAged), atNew, atAged,
            input.Units.Length(material.New), input.Units.Length(aged), material.Name,
            $"{RoughnessTable.Source} ({RoughnessTable.Provenance})");
    }

    /// <summary>The warnings that explain a missing sensitivities object or roughness spread.</summary>
    public static IReadOnlyList<WarningDto> With(IReadOnlyList<WarningDto> warnings, params WarningDto?[] more) =>
        [.. warnings, .. more.Where(w => w is not null).Select(w => w!)];

    public static WarningDto? SpreadWarning(PipeInput input, RoughnessSpreadDto? spread) =>
        spread is not null || input.Material is not { } m ? null
            : new WarningDto("roughness-spread-unavailable", m.Aged is null
                ? $"The roughness table gives no aged value for {m.Name}, so no spread from new to aged is reported."
                : "The answer has no solution at one end of the material's roughness range, so no spread is reported.");

    public static readonly WarningDto AtRegimeLimit = new("sensitivities-unavailable",
        "The answer sits on a jump of the friction factor at a regime limit, where no derivative exists; sensitivities are left out.");

    public static readonly WarningDto HazenWilliams = new("sensitivities-unavailable",
        "Sensitivities are given for the Darcy-Weisbach method; with method=hazen-williams they are left out.");
}
