using FlowSolve.Core.Networks;

namespace FlowSolve.Core.Tests.Networks;

public sealed class NestedDissectionTests
{
    private static (int[] RowStart, int[] Columns) Pattern(int n, IEnumerable<(int, int)> edges)
    {
        var rows = new SortedSet<int>[n];
        for (int i = 0; i < n; i++) rows[i] = [i];
        foreach (var (i, j) in edges) { rows[i].Add(j); rows[j].Add(i); }
        var rowStart = new int[n + 1];
        var columns = new List<int>();
        for (int i = 0; i < n; i++) { columns.AddRange(rows[i]); rowStart[i + 1] = columns.Count; }
        return (rowStart, columns.ToArray());
    }

    private static void AssertPermutation(int[] order, int n)
    {
        Assert.Equal(n, order.Length);
        var seen = new bool[n];
        foreach (int v in order) { Assert.InRange(v, 0, n - 1); Assert.False(seen[v], $"vertex {v} twice"); seen[v] = true; }
    }

    public static TheoryData<string, int> Graphs => new()
    {
        { "empty", 0 }, { "single", 1 }, { "path", 200 }, { "grid", 40 }, { "random", 500 }, { "islands", 300 },
        { "star", 100 }, { "clique", 30 },
    };

    private static (int N, (int, int)[] Edges) Build(string kind, int size)
    {
        var random = new Random(size);
        return kind switch
        {
            "empty" or "single" => (size, []),
            "path" => (size, Enumerable.Range(0, size - 1).Select(i => (i, i + 1)).ToArray()),
            "grid" => (size * size, Enumerable.Range(0, size * size)
                .SelectMany(i => new[] { (i, i % size + 1 < size ? i + 1 : -1), (i, i + size < size * size ? i + size : -1) })
                .Where(e => e.Item2 >= 0).ToArray()),
            "random" => (size, Enumerable.Range(0, 3 * size).Select(_ => (random.Next(size), random.Next(size)))
                .Where(e => e.Item1 != e.Item2).ToArray()),
            // Three unconnected paths and some isolated vertices.
            "islands" => (size, Enumerable.Range(0, 250).Where(i => i % 80 != 79).Select(i => (i, i + 1)).ToArray()),
            "star" => (size, Enumerable.Range(1, size - 1).Select(i => (0, i)).ToArray()),
            "clique" => (size, Enumerable.Range(0, size).SelectMany(i => Enumerable.Range(i + 1, size - i - 1).Select(j => (i, j))).ToArray()),
            _ => throw new ArgumentOutOfRangeException(nameof(kind)),
        };
    }

    [Theory]
    [MemberData(nameof(Graphs))]
    public void Order_AnyGraph_IsAPermutation(string kind, int size)
    {
        var (n, edges) = Build(kind, size);
        var (rowStart, columns) = Pattern(n, edges);
        AssertPermutation(NestedDissection.Order(rowStart, columns), n);
        AssertPermutation(NestedDissection.Order(rowStart, columns, leafSize: 1), n);
    }

    [Fact]
    public void Order_Path_EliminatesTheMiddleLast()
    {
        // Dissection property: the last vertex ordered separates the graph; on a path of 201 vertices the first separator
        // is a single vertex near the middle, leaving two halves of about 100 (a level structure from an end, George 1973).
        var (n, edges) = Build("path", 201);
        var (rowStart, columns) = Pattern(n, edges);
        int last = NestedDissection.Order(rowStart, columns)[^1];
        Assert.InRange(last, 90, 110);
    }
}
