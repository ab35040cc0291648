namespace FlowSolve.Core.Pipes;

/// <summary>One listed pipe size.</summary>
/// <param name="Name">The size's name in its table, for example <c>NPS 4</c> or <c>DN 110</c>.</param>
/// <param name="OutsideDiameter">Outside diameter in m.</param>
/// <param name="WallThickness">Wall thickness in m.</param>
/// <param name="InsideDiameter">Inside diameter OutsideDiameter - 2 WallThickness in m.</param>
public readonly record struct PipeSize(string Name, double OutsideDiameter, double WallThickness, double InsideDiameter);

/// <summary>A series of pipe sizes from a standard, sorted by inside diameter.</summary>
/// <param name="Name">Table name used by the API, for example <c>asme-b36.10m-schedule-40</c>.</param>
/// <param name="Standard">The standard's title.</param>
/// <param name="Edition">The edition, for example <c>ASME B36.10M-2018</c>.</param>
/// <param name="Series">The series within the standard, for example <c>Schedule 40</c>.</param>
/// <param name="Provenance">Whether the values were read or recalled ("from memory").</param>
/// <param name="Note">How the inside diameter is obtained.</param>
/// <param name="Sizes">The sizes, smallest inside diameter first.</param>
public sealed record PipeSizeTable(string Name, string Standard, string Edition, string Series, string Provenance,
    string Note, IReadOnlyList<PipeSize> Sizes)
{
    /// <summary>Finds a size by name (case-insensitive).</summary>
    /// <param name="name">For example <c>NPS 4</c>.</param>
    /// <param name="size">The size when found.</param>
    public bool TryGetSize(string? name, out PipeSize size)
    {
        foreach (var candidate in Sizes)
        {
            if (string.Equals(candidate.Name, name, StringComparison.OrdinalIgnoreCase))
            {
                size = candidate;
                return true;
            }
        }
        size = default;
        return false;
    }
}

/// <summary>The pipe size tables embedded in FlowSolve.Core (Pipes/Data/pipe-sizes-*.json).</summary>
public static class PipeSizeTables
{
    private static readonly Lazy<IReadOnlyList<PipeSizeTable>> Loaded = new(Load);

    /// <summary>Every table, in a stable order.</summary>
    public static IReadOnlyList<PipeSizeTable> All => Loaded.Value;

    /// <summary>The table names.</summary>
    public static IEnumerable<string> Names => All.Select(t => t.Name);

    /// <summary>Finds a table by name (case-insensitive); false when unknown.</summary>
    /// <param name="name">Table name.</param>
    /// <param name="table">The table when found.</param>
    public static bool TryGet(string? name, out PipeSizeTable table)
    {
        foreach (var candidate in All)
        {
            if (string.Equals(candidate.Name, name, StringComparison.OrdinalIgnoreCase))
            {
                table = candidate;
                return true;
            }
        }
        table = null!;
        return false;
    }

    /// <summary>Finds a table by name.</summary>
    /// <param name="name">Table name.</param>
    /// <exception cref="ArgumentException">The name is unknown (parameter <c>table</c>; the message lists the known names).</exception>
    public static PipeSizeTable Get(string? name) =>
        TryGet(name, out var table) ? table
        : throw new ArgumentException($"unknown pipe size table '{name}'; known: {string.Join(", ", Names)}", "table");

    private static IReadOnlyList<PipeSizeTable> Load()
    {
        var tables = new List<PipeSizeTable>();
        foreach (var file in new[] { "pipe-sizes-asme-b36.10m.json", "pipe-sizes-iso-4427.json" })
        {
            using var doc = EmbeddedData.Open(file);
            var root = doc.RootElement;
            double metres = root.GetProperty("metresPerUnit").GetDouble();
            foreach (var t in root.GetProperty("tables").EnumerateArray())
            {
                var sizes = new List<PipeSize>();
                foreach (var s in t.GetProperty("sizes").EnumerateArray())
                {
                    double od = s.GetProperty("outsideDiameter").GetDouble() * metres;
                    double wall = s.GetProperty("wallThickness").GetDouble() * metres;
                    sizes.Add(new PipeSize(s.String("name"), od, wall, od - 2 * wall));
                }
                sizes.Sort((x, y) => x.InsideDiameter.CompareTo(y.InsideDiameter));
                tables.Add(new PipeSizeTable(t.String("name"), root.String("standard"), root.String("edition"),
                    t.String("series"), root.String("provenance"), root.String("note"), sizes));
            }
        }
        return tables;
    }
}
