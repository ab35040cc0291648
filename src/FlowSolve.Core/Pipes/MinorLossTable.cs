namespace FlowSolve.Core.Pipes;

/// <summary>A fitting and its typical loss coefficient.</summary>
/// <param name="Name">Fitting name used by the API, for example <c>gate-valve-open</c>.</param>
/// <param name="Description">The fitting as the source describes it.</param>
/// <param name="LossCoefficient">K (dimensionless), applied to the pipe's velocity head.</param>
public readonly record struct Fitting(string Name, string Description, double LossCoefficient);

/// <summary>A number of identical fittings in a pipe.</summary>
/// <param name="Name">Fitting name, one of <see cref="MinorLossTable.All"/>.</param>
/// <param name="Count">How many; finite and 0 or more (fractions allowed, for shared fittings).</param>
public readonly record struct FittingCount(string Name, double Count = 1);

/// <summary>Typical minor-loss coefficients of pipe fittings (Pipes/Data/fittings.json).</summary>
public static class MinorLossTable
{
    private static readonly Lazy<(string Source, string Provenance, IReadOnlyList<Fitting> Fittings)> Loaded = new(Load);

    /// <summary>The book the values come from.</summary>
    public static string Source => Loaded.Value.Source;

    /// <summary>Whether the values were read or recalled ("from memory").</summary>
    public static string Provenance => Loaded.Value.Provenance;

    /// <summary>Every fitting, in the source's order.</summary>
    public static IReadOnlyList<Fitting> All => Loaded.Value.Fittings;

    /// <summary>Finds a fitting by name (case-insensitive); false when unknown.</summary>
    /// <param name="name">Fitting name.</param>
    /// <param name="fitting">The fitting when found.</param>
    public static bool TryGet(string? name, out Fitting fitting)
    {
        foreach (var candidate in All)
        {
            if (string.Equals(candidate.Name, name, StringComparison.OrdinalIgnoreCase))
            {
                fitting = candidate;
                return true;
            }
        }
        fitting = default;
        return false;
    }

    /// <summary>Sums K over a list of fittings; false (with the first unknown name) when a name is unknown.</summary>
    /// <param name="fittings">Names and counts.</param>
    /// <param name="total">Sum of count x K.</param>
    /// <param name="unknown">The first unknown name, or null.</param>
    /// <exception cref="ArgumentOutOfRangeException">A count is negative or non-finite (parameter <c>fittings</c>).</exception>
    public static bool TrySum(ReadOnlySpan<FittingCount> fittings, out double total, out string? unknown)
    {
        total = 0;
        unknown = null;
        foreach (var item in fittings)
        {
            if (!(item.Count >= 0) || !double.IsFinite(item.Count))
                throw new ArgumentOutOfRangeException(nameof(fittings), item.Count, $"count of '{item.Name}' must be finite and 0 or more");
            if (!TryGet(item.Name, out var fitting))
            {
                unknown = item.Name;
                total = 0;
                return false;
            }
            total += item.Count * fitting.LossCoefficient;
        }
        return true;
    }

    /// <summary>Sums K over a list of fittings.</summary>
    /// <param name="fittings">Names and counts.</param>
    /// <exception cref="ArgumentException">A name is unknown (parameter <c>fittings</c>; the message names it).</exception>
    public static double Sum(ReadOnlySpan<FittingCount> fittings) =>
        TrySum(fittings, out double total, out string? unknown) ? total
        : throw new ArgumentException($"unknown fitting '{unknown}'", nameof(fittings));

    private static (string, string, IReadOnlyList<Fitting>) Load()
    {
        using var doc = EmbeddedData.Open("fittings.json");
        var root = doc.RootElement;
        var list = new List<Fitting>();
        foreach (var f in root.GetProperty("fittings").EnumerateArray())
            list.Add(new Fitting(f.String("name"), f.String("description"), f.GetProperty("k").GetDouble()));
        return (root.String("source"), root.String("provenance"), list);
    }
}
