namespace FlowSolve.Core.Networks;

/// <summary>
/// A fill-reducing ordering of a sparse symmetric matrix's graph by nested dissection with level-structure separators
/// (George 1973, SIAM J. Numer. Anal. 10(2); the automatic variant of George and Liu 1978, ACM TOMS 4(1)).
/// </summary>
/// <remarks>
/// <para>Each connected subgraph is split by a vertex separator taken from the breadth-first level structure rooted at a
/// pseudo-peripheral vertex (found by repeated breadth-first searches, Gibbs, Poole and Stockmeyer 1976): the middle
/// level, less the vertices of it that touch no later level. The two sides are ordered first, recursively, and the
/// separator last, so that eliminating one side never fills the other. Subgraphs of at most <c>leafSize</c> vertices
/// keep their breadth-first order.</para>
/// <para>On a k x k grid the first separator is an anti-diagonal of about k vertices, the size of the best straight
/// separator, and the Cholesky factor then holds O(n log n) entries and costs O(n^1.5) operations (George 1973).</para>
/// <para>O(E log n) time, O(n + E) memory; runs once per network (the pattern of the head equations never changes).</para>
/// </remarks>
internal static class NestedDissection
{
    /// <summary>Subgraphs of at most this many vertices are not dissected further.</summary>
    public const int DefaultLeafSize = 16;

    /// <summary>The elimination order of a symmetric pattern.</summary>
    /// <param name="rowStart">CSR row pointers, length n + 1.</param>
    /// <param name="columns">CSR column indices (a symmetric pattern; the diagonal may be present and is ignored).</param>
    /// <param name="leafSize">Subgraphs of at most this many vertices are left in breadth-first order.</param>
    /// <returns>The permutation new to old: <c>order[k]</c> is the vertex eliminated k-th.</returns>
    public static int[] Order(ReadOnlySpan<int> rowStart, ReadOnlySpan<int> columns, int leafSize = DefaultLeafSize)
    {
        int n = rowStart.Length - 1;
        var order = new int[n];
        if (n == 0) return order;
        var vertices = new int[n];
        for (int i = 0; i < n; i++) vertices[i] = i;
        var label = new int[n];           // the subgraph a vertex belongs to; 0 for the whole graph, -1 once ordered
        var level = new int[n];
        Array.Fill(level, -1);
        var queue = new int[n];
        var scratch = new int[n];
        int nextLabel = 1;
        int fill = n;                     // the output fills from the end: separators take the last numbers
        var work = new Stack<(int Start, int Count, int Label)>();
        work.Push((0, n, 0));
        while (work.Count > 0)
        {
            var (start, count, own) = work.Pop();
            var segment = vertices.AsSpan(start, count);
            // Breadth-first search from the segment's first vertex: one connected component of the subgraph.
            int root = segment[0];
            int reached = Search(root, own, rowStart, columns, label, level, queue, out int depth);
            if (reached < count)
            {
                // Disconnected: split off the component reached; no separator is needed between components.
                int write = 0, back = count;
                for (int i = 0; i < count; i++)
                {
                    int v = segment[i];
                    if (level[v] >= 0) scratch[write++] = v; else scratch[--back] = v;
                }
                foreach (int v in segment) level[v] = -1;
                scratch.AsSpan(0, count).CopyTo(segment);
                int a = nextLabel++, b = nextLabel++;
                for (int i = 0; i < write; i++) label[segment[i]] = a;
                for (int i = write; i < count; i++) label[segment[i]] = b;
                work.Push((start + write, count - write, b));
                work.Push((start, write, a));
                continue;
            }
            if (count <= leafSize)
            {
                Emit(queue.AsSpan(0, count), order, label, ref fill);
                foreach (int v in segment) level[v] = -1;
                continue;
            }
            // Pseudo-peripheral root: restart from the last vertex reached while the eccentricity grows.
            for (int round = 0; round < 2; round++)
            {
                int far = queue[count - 1];
                ClearLevels(queue.AsSpan(0, count), level);
                int farDepth;
                Search(far, own, rowStart, columns, label, level, queue, out farDepth);
                if (farDepth <= depth) { depth = farDepth; break; }
                depth = farDepth;
            }
            // The middle level: the first whose cumulative count reaches half the subgraph.
            int middle = 0, seen = 0;
            for (int i = 0; i < count; i++)
            {
                int v = queue[i];
                seen++;
                if (2 * seen >= count) { middle = level[v]; break; }
            }
            if (middle == 0) middle = 1;
            // Separator: the middle level's vertices that touch the next level; the rest of it joins the first side.
            int first = 0, second = 0, separator = 0;
            var sides = scratch.AsSpan(0, count);
            for (int i = 0; i < count; i++)
            {
                int v = queue[i], lv = level[v];
                if (lv > middle) continue;
                bool touches = false;
                if (lv == middle)
                {
                    for (int k = rowStart[v]; k < rowStart[v + 1]; k++)
                    {
                        int w = columns[k];
                        if (w != v && label[w] == own && level[w] == middle + 1) { touches = true; break; }
                    }
                }
                if (touches) level[v] = -2; // marked for the separator
                else sides[first++] = v;
            }
            for (int i = 0; i < count; i++)
            {
                int v = queue[i];
                if (level[v] > middle) sides[first + second++] = v;
            }
            if (first == 0 || second == 0)
            {
                // No useful separator (a clique or a star): order the subgraph as it stands.
                Emit(queue.AsSpan(0, count), order, label, ref fill);
                ClearLevels(queue.AsSpan(0, count), level);
                continue;
            }
            for (int i = 0; i < count; i++)
            {
                int v = queue[i];
                if (level[v] == -2) sides[first + second + separator++] = v;
            }
            ClearLevels(queue.AsSpan(0, count), level);
            sides.CopyTo(segment);
            Emit(segment.Slice(first + second, separator), order, label, ref fill);
            int la = nextLabel++, lb = nextLabel++;
            for (int i = 0; i < first; i++) label[segment[i]] = la;
            for (int i = first; i < first + second; i++) label[segment[i]] = lb;
            work.Push((start, first, la));
            work.Push((start + first, second, lb));
        }
        return order;
    }

    private static void Emit(ReadOnlySpan<int> vertices, int[] order, int[] label, ref int fill)
    {
        fill -= vertices.Length;
        for (int i = 0; i < vertices.Length; i++)
        {
            order[fill + i] = vertices[i];
            label[vertices[i]] = -1;
        }
    }

    private static void ClearLevels(ReadOnlySpan<int> vertices, int[] level)
    {
        foreach (int v in vertices) level[v] = -1;
    }

    /// <summary>Breadth-first search within the subgraph labelled <paramref name="own"/>; levels of unreached vertices
    /// must be -1 on entry. Returns the number reached (in <paramref name="queue"/>, by level) and the last level.</summary>
    private static int Search(int root, int own, ReadOnlySpan<int> rowStart, ReadOnlySpan<int> columns, int[] label,
        int[] level, int[] queue, out int depth)
    {
        int head = 0, tail = 0;
        queue[tail++] = root;
        level[root] = 0;
        while (head < tail)
        {
            int v = queue[head++], next = level[v] + 1;
            for (int k = rowStart[v]; k < rowStart[v + 1]; k++)
            {
                int w = columns[k];
                if (label[w] == own && level[w] < 0) { level[w] = next; queue[tail++] = w; }
            }
        }
        depth = level[queue[tail - 1]];
        return tail;
    }
}
