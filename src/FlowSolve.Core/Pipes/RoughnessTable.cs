namespace FlowSolve.Core.Pipes;

/// <summary>The condition of a pipe's surface.</summary>
public enum SurfaceCondition
{
    /// <summary>New pipe.</summary>
    New,

    /// <summary>Aged (worn, rusted) pipe, where the source gives a value.</summary>
    Aged,
}

/// <summary>An absolute roughness for a pipe material.</summary>
/// <param name="Name">Material name used by the API, for example <c>cast-iron</c>.</param>
/// <param name="Description">The material as the source describes it.</param>
/// <param name="New">Absolute roughness of new pipe in m.</param>
/// <param name="Aged">Absolute roughness of aged pipe in m; null where the source gives none.</param>
/// <param name="AgedDescription">The aged surface as the source describes it, or null.</param>
public readonly record struct RoughnessMaterial(string Name, string Description, double New, double? Aged, string? AgedDescription)
{
    /// <summary>The uncertainty the source states beside the new value, in percent (for example 30 for plus or minus
    /// 30 percent); null where it states none. It describes the scatter of new surfaces of the kind, not ageing.</summary>
    public double? UncertaintyPercent { get; init; }

    /// <summary>The new value less and plus its stated uncertainty, New (1 - u) to New (1 + u), in m; false when the
    /// source states no uncertainty (or it is zero).</summary>
    /// <param name="low">New (1 - u), never below 0.</param>
    /// <param name="high">New (1 + u).</param>
    public bool TryGetUncertaintyBand(out double low, out double high)
    {
        if (UncertaintyPercent is not (double percent and > 0) || !(New > 0))
        {
            low = high = double.NaN;
            return false;
        }
        double u = percent / 100;
        low = Math.Max(0, New * (1 - u));
        high = New * (1 + u);
        return true;
    }

    /// <summary>The roughness for a condition; false when the source gives no aged value.</summary>
    /// <param name="condition">New or aged.</param>
    /// <param name="roughness">Absolute roughness in m.</param>
    public bool TryGet(SurfaceCondition condition, out double roughness)
    {
        roughness = condition == SurfaceCondition.New ? New : Aged ?? double.NaN;
        return !double.IsNaN(roughness);
    }
}

/// <summary>Absolute roughness of commercial pipe materials (Pipes/Data/roughness.json).</summary>
public static class RoughnessTable
{
    private static readonly Lazy<(string Source, string Provenance, IReadOnlyList<RoughnessMaterial> Materials)> Loaded = new(Load);

    /// <summary>The handbook the values come from.</summary>
    public static string Source => Loaded.Value.Source;

    /// <summary>Whether the values were read or recalled ("from memory").</summary>
    public static string Provenance => Loaded.Value.Provenance;

    /// <summary>Every material, in the source's order.</summary>
    public static IReadOnlyList<RoughnessMaterial> All => Loaded.Value.Materials;

    /// <summary>Finds a material by name (case-insensitive); false when unknown.</summary>
    /// <param name="name">Material name, for example <c>commercial-steel</c>.</param>
    /// <param name="material">The material when found.</param>
    public static bool TryGet(string? name, out RoughnessMaterial material)
    {
        foreach (var candidate in All)
        {
            if (string.Equals(candidate.Name, name, StringComparison.OrdinalIgnoreCase))
            {
                material = candidate;
                return true;
            }
        }
        material = default;
        return false;
    }

    /// <summary>The absolute roughness of a material in a condition, in m.</summary>
    /// <param name="name">Material name.</param>
    /// <param name="condition">New (default) or aged.</param>
    /// <exception cref="ArgumentException">The material is unknown (parameter <c>material</c>), or the source gives
    /// no aged value for it (parameter <c>condition</c>).</exception>
    public static double Roughness(string? name, SurfaceCondition condition = SurfaceCondition.New)
    {
        if (!TryGet(name, out var material))
            throw new ArgumentException($"unknown material '{name}'; known: {string.Join(", ", All.Select(m => m.Name))}", "material");
        if (!material.TryGet(condition, out double roughness))
            throw new ArgumentException($"the source gives no aged roughness for '{material.Name}'", "condition");
        return roughness;
    }

    private static (string, string, IReadOnlyList<RoughnessMaterial>) Load()
    {
        using var doc = EmbeddedData.Open("roughness.json");
        var root = doc.RootElement;
        var list = new List<RoughnessMaterial>();
        foreach (var m in root.GetProperty("materials").EnumerateArray())
        {
            // The file holds millimetres.
            list.Add(new RoughnessMaterial(m.String("name"), m.String("description"),
                m.GetProperty("new").GetDouble() * 1e-3, m.OptionalDouble("aged") * 1e-3, m.OptionalString("agedDescription"))
            {
                UncertaintyPercent = m.OptionalDouble("uncertaintyPercent"),
            });
        }
        return (root.String("source"), root.String("provenance"), list);
    }
}
