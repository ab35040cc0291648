namespace FlowSolve.Core.Tests.Networks;

/// <summary>
/// The two-loop network of Alperovits and Shamir 1977 (Water Resources Research 13(6)), from memory: one reservoir at
/// 210 m, 8 pipes of 1000 m, Hazen-Williams C = 130, elevations and demands (m3/h) below; diameters (inches) of the
/// least-cost design usually quoted for it (18, 10, 16, 4, 16, 10, 10, 1), also from memory. Plain data, shared with
/// the API tests (linked into FlowSolve.Api.Tests), so both solve the same network.
/// </summary>
internal static class AlperovitsShamirData
{
    public const string Reservoir = "1";
    public const double ReservoirHead = 210;
    public const double PipeLength = 1000;
    public const double HazenWilliamsC = 130;

    /// <summary>Junctions: id, elevation in m, demand in m3/h.</summary>
    public static readonly (string Id, double Elevation, double DemandCubicMetresPerHour)[] Junctions =
        [("2", 150, 100), ("3", 160, 100), ("4", 155, 120), ("5", 150, 270), ("6", 165, 330), ("7", 160, 200)];

    /// <summary>Pipes: id, from, to, diameter in inches.</summary>
    public static readonly (string Id, string From, string To, double Inches)[] Pipes =
        [("1", "1", "2", 18), ("2", "2", "3", 10), ("3", "2", "4", 16), ("4", "4", "5", 4), ("5", "4", "6", 16), ("6", "6", "7", 10), ("7", "3", "5", 10), ("8", "7", "5", 1)];

    /// <summary>The two loops as (pipe id, +1 along the pipe's direction or -1).</summary>
    public static readonly (string Pipe, int Sign)[][] Loops =
        [[("2", 1), ("7", 1), ("4", -1), ("3", -1)], [("4", 1), ("8", -1), ("6", -1), ("5", -1)]];
}
