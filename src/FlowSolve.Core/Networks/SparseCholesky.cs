using System.Numerics;
using System.Runtime.InteropServices;

namespace FlowSolve.Core.Networks;

/// <summary>
/// A sparse symmetric positive definite matrix in compressed sparse row form (both triangles stored, column indices
/// sorted in each row) with a direct solve: a supernodal multifrontal Cholesky factorisation P A P^T = L L^T under a
/// nested-dissection ordering, analysed once for the pattern and refactorised in place for new values.
/// </summary>
/// <remarks>
/// <para>Analysis (once, at construction): the fill-reducing ordering (<see cref="NestedDissection"/>), the elimination
/// tree and its postorder (Liu 1990, SIAM J. Matrix Anal. Appl. 11(1)), the column counts of L by row subtrees, the
/// fundamental supernodes (columns with nested patterns, Liu, Ng and Peyton 1993, SIAM J. Matrix Anal. Appl. 14(1)),
/// each supernode's row structure, and every index map the numeric phase needs. Storage is O(|L|), which grows as
/// n log n for grid-like networks (George 1973).</para>
/// <para>Factorisation (<see cref="Factorise"/>, allocation-free): the multifrontal method (Duff and Reid 1983, ACM TOMS
/// 9(3)); for each supernode in postorder a dense frontal matrix gathers the supernode's entries of A and its children's
/// update matrices (extend-add), its leading columns are factorised densely (left-looking, vectorised), and the
/// trailing Schur complement goes on a stack for the parent. No pivoting is needed for a positive definite matrix; a
/// pivot that is not positive reports failure.</para>
/// <para>The values are in the order of the pattern given (<see cref="Values"/>, <see cref="PositionOf"/>), the same
/// layout as <see cref="SymmetricSparseSolver"/> for the same pattern. Not thread-safe: one instance per solver (a
/// parallel factorisation uses other threads inside one call, see <see cref="MaxDegreeOfParallelism"/>).</para>
/// </remarks>
public sealed partial class SparseCholesky
{
    private readonly int[] _rowStart, _columns;
    private readonly double[] _values;
    private readonly int[] _order, _position;      // new -> old and old -> new
    private readonly int _supernodes;
    private readonly int[] _superStart;            // first column of each supernode (new numbering), length S + 1
    private readonly int[] _structStart, _structure; // each supernode's rows (new numbering), ascending, own columns first
    private readonly int[] _blockStart;            // offset of each supernode's m x k column-major block in _factor
    private readonly double[] _factor;
    private readonly int[] _childStart, _children; // children of each supernode, ascending
    private readonly int[] _relativeStart, _relative; // each supernode's update rows as positions in its parent's front
    private readonly int[] _assemblyStart, _assemblySource, _assemblyTarget;
    private readonly double[] _work, _gather;

    /// <summary>Analyses the pattern: ordering, elimination tree, supernodes and storage.</summary>
    /// <param name="rowStart">Row pointers, length n + 1, starting at 0, non-decreasing.</param>
    /// <param name="columns">Column indices of every row, sorted and distinct in each row, symmetric, each row holding its
    /// diagonal.</param>
    /// <exception cref="ArgumentException">The pattern is malformed.</exception>
    public SparseCholesky(int[] rowStart, int[] columns)
    {
        SparsePattern.Diagonals(rowStart, columns);
        int n = rowStart.Length - 1;
        _rowStart = rowStart;
        _columns = columns;
        _values = new double[columns.Length];

        // 1. Fill-reducing order, then the elimination tree's postorder (same fill, contiguous subtrees).
        var order = NestedDissection.Order(rowStart, columns);
        var position = Inverse(order);
        var parent = EliminationTree(order, position);
        var post = Postorder(parent);
        var final = new int[n];
        for (int k = 0; k < n; k++) final[k] = order[post[k]];
        _order = final;
        _position = Inverse(final);
        parent = EliminationTree(_order, _position);

        // 2. Column counts of L (diagonal included) by row subtrees: row i of L holds the etree paths from each k < i
        //    with a_ik != 0 up to i.
        var count = new int[n];
        var mark = new int[n];
        Array.Fill(mark, -1);
        for (int i = 0; i < n; i++)
        {
            count[i]++;
            mark[i] = i;
            int old = _order[i];
            for (int a = rowStart[old]; a < rowStart[old + 1]; a++)
            {
                int k = _position[columns[a]];
                if (k >= i) continue;
                for (int r = k; mark[r] != i; r = parent[r]) { count[r]++; mark[r] = i; }
            }
        }

        // 3. Fundamental supernodes: j + 1 joins j's when it is j's parent, j is its only child, and the patterns nest.
        var childCount = new int[n];
        for (int j = 0; j < n; j++) if (parent[j] >= 0) childCount[parent[j]]++;
        var fundamental = new List<int> { 0 };
        for (int j = 1; j < n; j++)
            if (!(parent[j - 1] == j && childCount[j] == 1 && count[j - 1] == count[j] + 1)) fundamental.Add(j);
        if (n == 0) fundamental.Clear();
        fundamental.Add(n);
        _superStart = Amalgamate(fundamental, parent, count);
        _supernodes = _superStart.Length - 1;
        int s0 = _supernodes;
        var superOf = new int[n];
        for (int s = 0; s < s0; s++) for (int j = _superStart[s]; j < _superStart[s + 1]; j++) superOf[j] = s;
        var superParent = new int[s0];
        for (int s = 0; s < s0; s++)
        {
            int p = parent[_superStart[s + 1] - 1];
            superParent[s] = p < 0 ? -1 : superOf[p];
        }
        _childStart = new int[s0 + 1];
        for (int s = 0; s < s0; s++) if (superParent[s] >= 0) _childStart[superParent[s] + 1]++;
        for (int s = 0; s < s0; s++) _childStart[s + 1] += _childStart[s];
        _children = new int[_childStart[s0]];
        var next = _childStart[..s0];
        for (int s = 0; s < s0; s++) if (superParent[s] >= 0) _children[next[superParent[s]]++] = s; // ascending

        // 4. Row structures: own columns, then the rows below from A and from the children's structures (the union of
        //    the columns' patterns, so a relaxed supernode's rows cover each of its columns).
        _structStart = new int[s0 + 1];
        var structure = new List<int>(2 * columns.Length);
        Array.Fill(mark, -1);
        var local = new int[n];
        int assemblyCount = 0;
        long blockTotal = 0, frontMax = 0;
        for (int s = 0; s < s0; s++)
        {
            int f = _superStart[s], l = _superStart[s + 1], k = l - f;
            int begin = structure.Count;
            for (int j = f; j < l; j++) { structure.Add(j); mark[j] = s; }
            for (int j = f; j < l; j++)
            {
                int old = _order[j];
                for (int a = rowStart[old]; a < rowStart[old + 1]; a++)
                {
                    int i = _position[columns[a]];
                    if (i >= j) assemblyCount++;
                    if (i >= l && mark[i] != s) { mark[i] = s; structure.Add(i); }
                }
            }
            for (int c = _childStart[s]; c < _childStart[s + 1]; c++)
            {
                int child = _children[c];
                int ck = _superStart[child + 1] - _superStart[child];
                for (int r = _structStart[child] + ck; r < _structStart[child + 1]; r++)
                {
                    int i = structure[r];
                    if (i >= l && mark[i] != s) { mark[i] = s; structure.Add(i); }
                }
            }
            int m = structure.Count - begin;
            System.Runtime.InteropServices.CollectionsMarshal.AsSpan(structure).Slice(begin + k, m - k).Sort();
            _structStart[s + 1] = structure.Count;
            blockTotal += (long)m * k;
            frontMax = Math.Max(frontMax, (long)m * m);
        }
        if (blockTotal > Array.MaxLength || frontMax > Array.MaxLength)
            throw new ArgumentException("the factor is too large for this pattern", nameof(columns));
        _structure = structure.ToArray();
        _relativeStart = new int[s0 + 1];
        for (int s = 0; s < s0; s++)
            _relativeStart[s + 1] = _relativeStart[s] + _structStart[s + 1] - _structStart[s] - (_superStart[s + 1] - _superStart[s]);
        _relative = new int[_relativeStart[s0]];

        // 5. Index maps: children's update rows in the parent's front; A's entries in each front.
        _assemblyStart = new int[s0 + 1];
        _assemblySource = new int[assemblyCount];
        _assemblyTarget = new int[assemblyCount];
        _blockStart = new int[s0 + 1];
        int write = 0;
        for (int s = 0; s < s0; s++)
        {
            int f = _superStart[s], l = _superStart[s + 1], k = l - f;
            var rows = _structure.AsSpan(_structStart[s], _structStart[s + 1] - _structStart[s]);
            int m = rows.Length;
            for (int r = 0; r < m; r++) local[rows[r]] = r;
            _assemblyStart[s] = write;
            for (int j = f; j < l; j++)
            {
                int old = _order[j];
                for (int a = rowStart[old]; a < rowStart[old + 1]; a++)
                {
                    int i = _position[columns[a]];
                    if (i < j) continue;
                    _assemblySource[write] = a;
                    _assemblyTarget[write++] = (j - f) * m + local[i];
                }
            }
            for (int c = _childStart[s]; c < _childStart[s + 1]; c++)
            {
                int child = _children[c];
                int ck = _superStart[child + 1] - _superStart[child];
                int from = _structStart[child] + ck, u = _structStart[child + 1] - from;
                for (int r = 0; r < u; r++) _relative[_relativeStart[child] + r] = local[_structure[from + r]];
            }
            _blockStart[s + 1] = _blockStart[s] + m * k;
        }
        _assemblyStart[s0] = write;

        // 6. The sequential plan: every front in postorder on one update stack (its peak found by replaying the order).
        _factor = new double[_blockStart[s0]];
        _work = new double[n];
        int widest = 0;
        for (int s = 0; s < s0; s++) widest = Math.Max(widest, _structStart[s + 1] - _structStart[s]);
        _gather = new double[widest];
        _sequential = new Plan(this);
        _maxDegreeOfParallelism = FactorOperations >= ParallelThreshold ? Environment.ProcessorCount : 1;
    }

    /// <summary>Order n of the matrix.</summary>
    public int Size => _order.Length;

    /// <summary>Number of stored entries of A (both triangles).</summary>
    public int NonZeros => _columns.Length;

    /// <summary>Number of entries stored for the factor L (lower triangle with the diagonal): the fill the ordering leaves,
    /// plus the explicit zeros of relaxed supernodes.</summary>
    public long FactorNonZeros
    {
        get
        {
            long total = 0;
            for (int s = 0; s < _supernodes; s++)
            {
                long m = _structStart[s + 1] - _structStart[s], k = _superStart[s + 1] - _superStart[s];
                total += m * k - k * (k - 1) / 2;
            }
            return total;
        }
    }

    /// <summary>Multiply-add operations of one factorisation (the sum of the squared column counts, less lower order).</summary>
    public double FactorOperations
    {
        get
        {
            double total = 0;
            for (int s = 0; s < _supernodes; s++)
            {
                int m = _structStart[s + 1] - _structStart[s], k = _superStart[s + 1] - _superStart[s];
                for (int j = 0; j < k; j++) { double c = m - j; total += c * c; }
            }
            return total;
        }
    }

    /// <summary>Length of the factor's storage (<see cref="SaveFactor"/>).</summary>
    internal int FactorLength => _factor.Length;

    /// <summary>Copies the factor of the last successful <see cref="Factorise"/> into <paramref name="into"/> (length
    /// <see cref="FactorLength"/>), so that it can be put back by <see cref="RestoreFactor"/> after other factorisations
    /// of the same pattern: a copy instead of a refactorisation.</summary>
    internal void SaveFactor(Span<double> into) => _factor.CopyTo(into);

    /// <summary>Puts back a factor saved by <see cref="SaveFactor"/>; <see cref="Solve"/> then solves with it.</summary>
    internal void RestoreFactor(ReadOnlySpan<double> from) => from.CopyTo(_factor);

    /// <summary>Number of supernodes.</summary>
    public int Supernodes => _supernodes;

    /// <summary>The elimination order: entry k is the row of A eliminated k-th (a permutation of 0..n-1).</summary>
    public ReadOnlySpan<int> Order => _order;

    /// <summary>The values, in the order of the pattern; write them before <see cref="Factorise"/>.</summary>
    public Span<double> Values => _values;

    /// <summary>Position in <see cref="Values"/> of entry (row, column), or -1 when it is not in the pattern.</summary>
    /// <param name="row">Row index.</param>
    /// <param name="column">Column index.</param>
    public int PositionOf(int row, int column)
    {
        int k = Array.BinarySearch(_columns, _rowStart[row], _rowStart[row + 1] - _rowStart[row], column);
        return k >= 0 ? k : -1;
    }

    /// <summary>y = A x with the current values; allocation-free.</summary>
    /// <param name="x">Vector of length n.</param>
    /// <param name="y">Result, length n.</param>
    public void Multiply(ReadOnlySpan<double> x, Span<double> y)
    {
        SparsePattern.Multiply(_rowStart, _columns, _values, x, y);
    }

    /// <summary>Computes L with P A P^T = L L^T from the current values; allocation-free after the first call at a given
    /// <see cref="MaxDegreeOfParallelism"/>.</summary>
    /// <returns>False when a pivot is not positive (the matrix is not positive definite) or not finite.</returns>
    /// <remarks>With <see cref="MaxDegreeOfParallelism"/> above 1 the elimination tree is split once into sets of
    /// independent subtrees of balanced work (after Geist and Ng 1989's subtree-to-processor mapping), four a thread,
    /// each on its own update stack, and the separator fronts above them; the threads take the sets and then each front
    /// above once its children are done. Every front is assembled and factorised by the same operations in the same order
    /// as in the sequential factorisation (its entries of A, then its children's updates from the last child to the
    /// first), so the factor is the same bit for bit. <see cref="Solve"/> stays sequential: split the same way it was
    /// slower (its rows above the parts must be updated in the sequential order).</remarks>
    public bool Factorise()
    {
        int parts = _maxDegreeOfParallelism;
        if (parts <= 1 || _supernodes < 2) return FactorNodes(_sequential, _sequential.Top, _sequential.TopFront, _sequential.TopStack);
        var plan = _plan is { Threads: var p } && p == parts ? _plan : (_plan = new ParallelPlan(this, parts));
        return plan.Run();
    }

    /// <summary>Factorises the fronts of <paramref name="nodes"/> in their order (a postorder) with this front and
    /// update stack.</summary>
    private bool FactorNodes(Plan plan, int[] nodes, double[] front, double[] stack)
    {
        foreach (int s in nodes) if (!FactorNode(plan, s, front, stack)) return false;
        return true;
    }

    /// <summary>Factorises front s in this front space: its entries of A, then its children's updates from the last
    /// child to the first, read where the plan put them (their owner's stack); its update is written where the plan
    /// puts it in <paramref name="stackStore"/>.</summary>
    private bool FactorNode(Plan plan, int s, double[] frontStore, double[] stackStore)
    {
        var values = _values;
        var offset = plan.UpdateOffset;
        var owner = plan.Owner;
        var stacks = plan.Stacks;
        int k = _superStart[s + 1] - _superStart[s];
        int m = _structStart[s + 1] - _structStart[s], u = m - k;
        var f = frontStore.AsSpan(0, m * m);
        f.Clear();
        for (int a = _assemblyStart[s]; a < _assemblyStart[s + 1]; a++) f[_assemblyTarget[a]] += values[_assemblySource[a]];
        // Extend-add the children's updates, last child first (the order of a sequential update stack).
        for (int c = _childStart[s + 1] - 1; c >= _childStart[s]; c--)
        {
            int child = _children[c];
            int cu = _structStart[child + 1] - _structStart[child] - (_superStart[child + 1] - _superStart[child]);
            var update = stacks[owner[child]].AsSpan(offset[child], cu * cu);
            var rel = _relative.AsSpan(_relativeStart[child], cu);
            for (int q = 0; q < cu; q++)
            {
                var column = f[(rel[q] * m)..];
                var source = update.Slice(q * cu, cu);
                for (int r = q; r < cu; r++) column[rel[r]] += source[r];
            }
        }
        if (!FactorFront(f, m, k)) return false;
        f[..(m * k)].CopyTo(_factor.AsSpan(_blockStart[s], m * k));
        var to = stackStore.AsSpan(offset[s], u * u);
        for (int q = 0; q < u; q++) f.Slice((k + q) * m + k, u).CopyTo(to.Slice(q * u, u));
        return true;
    }

    /// <summary>Dense partial Cholesky of an m x m front (column-major, lower triangle used): the first k columns become
    /// L's, the trailing block becomes the Schur complement. Left-looking by columns, four source columns at a time.</summary>
    private static bool FactorFront(Span<double> f, int m, int k)
    {
        for (int j = 0; j < m; j++)
        {
            var target = f.Slice(j * m + j, m - j);
            int sources = Math.Min(j, k), p = 0;
            for (; p + 4 <= sources; p += 4)
            {
                int o0 = p * m + j, o1 = o0 + m, o2 = o1 + m, o3 = o2 + m;
                SubtractFour(target, f.Slice(o0, m - j), f.Slice(o1, m - j), f.Slice(o2, m - j), f.Slice(o3, m - j),
                    f[o0], f[o1], f[o2], f[o3]);
            }
            for (; p < sources; p++)
            {
                int o = p * m + j;
                double a = f[o];
                if (a != 0) SubtractOne(target, f.Slice(o, m - j), a);
            }
            if (j < k)
            {
                double d = target[0];
                if (!(d > 0) || !double.IsFinite(d)) return false;
                d = Math.Sqrt(d);
                target[0] = d;
                double inverse = 1 / d;
                for (int r = 1; r < target.Length; r++) target[r] *= inverse;
            }
        }
        return true;
    }

    private static void SubtractOne(Span<double> y, ReadOnlySpan<double> x, double a)
    {
        int i = 0;
        if (Vector.IsHardwareAccelerated && y.Length >= Vector<double>.Count)
        {
            var va = new Vector<double>(a);
            var vy = MemoryMarshal.Cast<double, Vector<double>>(y);
            var vx = MemoryMarshal.Cast<double, Vector<double>>(x);
            for (int v = 0; v < vy.Length; v++) vy[v] -= va * vx[v];
            i = vy.Length * Vector<double>.Count;
        }
        for (; i < y.Length; i++) y[i] -= a * x[i];
    }

    private static void SubtractFour(Span<double> y, ReadOnlySpan<double> x0, ReadOnlySpan<double> x1,
        ReadOnlySpan<double> x2, ReadOnlySpan<double> x3, double a0, double a1, double a2, double a3)
    {
        int i = 0;
        if (Vector.IsHardwareAccelerated && y.Length >= Vector<double>.Count)
        {
            Vector<double> v0 = new(a0), v1 = new(a1), v2 = new(a2), v3 = new(a3);
            var vy = MemoryMarshal.Cast<double, Vector<double>>(y);
            var w0 = MemoryMarshal.Cast<double, Vector<double>>(x0);
            var w1 = MemoryMarshal.Cast<double, Vector<double>>(x1);
            var w2 = MemoryMarshal.Cast<double, Vector<double>>(x2);
            var w3 = MemoryMarshal.Cast<double, Vector<double>>(x3);
            for (int v = 0; v < vy.Length; v++) vy[v] -= v0 * w0[v] + v1 * w1[v] + v2 * w2[v] + v3 * w3[v];
            i = vy.Length * Vector<double>.Count;
        }
        for (; i < y.Length; i++) y[i] -= a0 * x0[i] + a1 * x1[i] + a2 * x2[i] + a3 * x3[i];
    }

    /// <summary>Solves A x = b with the factor of the last successful <see cref="Factorise"/>; allocation-free.</summary>
    /// <param name="b">Right-hand side, length n.</param>
    /// <param name="x">Solution, length n (may be the same memory as <paramref name="b"/>).</param>
    public void Solve(ReadOnlySpan<double> b, Span<double> x)
    {
        int n = Size;
        var y = _work.AsSpan(0, n);
        for (int i = 0; i < n; i++) y[i] = b[_order[i]];
        var factor = _factor.AsSpan();
        var structure = _structure.AsSpan();
        // L y = P b, supernode by supernode: gather the supernode's rows, solve densely, scatter back.
        for (int s = 0; s < _supernodes; s++)
        {
            int f = _superStart[s], k = _superStart[s + 1] - f;
            int m = _structStart[s + 1] - _structStart[s];
            var rows = structure.Slice(_structStart[s], m);
            var block = factor.Slice(_blockStart[s], m * k);
            var t = _gather.AsSpan(0, m);
            for (int r = 0; r < m; r++) t[r] = y[rows[r]];
            for (int j = 0; j < k; j++)
            {
                var column = block.Slice(j * m, m);
                double tj = t[j] / column[j];
                t[j] = tj;
                if (tj != 0) SubtractOne(t[(j + 1)..], column[(j + 1)..], tj);
            }
            for (int r = 0; r < m; r++) y[rows[r]] = t[r];
        }
        // L^T z = y, in reverse.
        for (int s = _supernodes - 1; s >= 0; s--)
        {
            int f = _superStart[s], k = _superStart[s + 1] - f;
            int m = _structStart[s + 1] - _structStart[s];
            var rows = structure.Slice(_structStart[s], m);
            var block = factor.Slice(_blockStart[s], m * k);
            var t = _gather.AsSpan(0, m);
            for (int r = 0; r < m; r++) t[r] = y[rows[r]];
            for (int j = k - 1; j >= 0; j--)
            {
                var column = block.Slice(j * m, m);
                t[j] = (t[j] - Dot(column[(j + 1)..], t[(j + 1)..])) / column[j];
            }
            for (int j = 0; j < k; j++) y[f + j] = t[j];
        }
        for (int i = 0; i < n; i++) x[_order[i]] = y[i];
    }

    /// <summary>Relaxed supernodes (Ashcraft and Grimes 1989, ACM TOMS 15(4)): a fundamental supernode is merged into the
    /// one holding its parent when that follows it (it is the parent's last child, so the columns stay contiguous) and
    /// the explicit zeros this stores stay few: any merge up to 4 columns, up to 80 % zeros up to 16 columns, 10 % up to
    /// 48, 5 % beyond (thresholds of common practice, from memory). Fewer, larger fronts cost less bookkeeping per flop;
    /// the zeros are computed as zeros.</summary>
    private static int[] Amalgamate(List<int> fundamental, int[] parent, int[] count)
    {
        int fs = fundamental.Count - 1;
        var starts = new List<int>(fs + 1);
        if (fs == 0) return [0];
        starts.Add(0);
        // The current group: columns [groupStart, end of supernode s); its true entries and its stored size.
        long groupTrue = 0;
        int groupColumns = 0;
        for (int s = 0; s < fs; s++)
        {
            int f = fundamental[s], l = fundamental[s + 1], k = l - f, m = count[f];
            long own = (long)m * k - (long)k * (k - 1) / 2;
            if (groupColumns > 0)
            {
                // Merge the group (ending at column f - 1) into s when s holds its parent and the zeros stay few.
                bool merge = false;
                if (parent[f - 1] >= f && parent[f - 1] < l)
                {
                    int columns = groupColumns + k;
                    long rows = groupColumns + m;
                    long stored = rows * columns - (long)columns * (columns - 1) / 2;
                    double zeros = 1 - (double)(groupTrue + own) / stored;
                    merge = columns <= 4 || (columns <= 16 && zeros <= 0.8) || (columns <= 48 && zeros <= 0.1) || zeros <= 0.05;
                }
                if (!merge) { starts.Add(f); groupTrue = 0; groupColumns = 0; }
            }
            groupTrue += own;
            groupColumns += k;
        }
        starts.Add(fundamental[fs]);
        return starts.ToArray();
    }

    private static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        int i = 0;
        double sum = 0;
        if (Vector.IsHardwareAccelerated && a.Length >= Vector<double>.Count)
        {
            var va = MemoryMarshal.Cast<double, Vector<double>>(a);
            var vb = MemoryMarshal.Cast<double, Vector<double>>(b);
            var acc = Vector<double>.Zero;
            for (int v = 0; v < va.Length; v++) acc += va[v] * vb[v];
            sum = Vector.Sum(acc);
            i = va.Length * Vector<double>.Count;
        }
        for (; i < a.Length; i++) sum += a[i] * b[i];
        return sum;
    }

    private static int[] Inverse(int[] order)
    {
        var inverse = new int[order.Length];
        for (int k = 0; k < order.Length; k++) inverse[order[k]] = k;
        return inverse;
    }

    /// <summary>Elimination tree of P A P^T (Liu 1990's algorithm with path compression); -1 marks a root.</summary>
    private int[] EliminationTree(int[] order, int[] position)
    {
        int n = order.Length;
        var parent = new int[n];
        var ancestor = new int[n];
        for (int k = 0; k < n; k++)
        {
            parent[k] = -1;
            ancestor[k] = -1;
            int old = order[k];
            for (int a = _rowStart[old]; a < _rowStart[old + 1]; a++)
            {
                int i = position[_columns[a]];
                while (i != -1 && i < k)
                {
                    int up = ancestor[i];
                    ancestor[i] = k;
                    if (up == -1) { parent[i] = k; break; }
                    i = up;
                }
            }
        }
        return parent;
    }

    /// <summary>A postorder of the forest: post[k] is the node visited k-th (children before parents, subtrees contiguous).</summary>
    private static int[] Postorder(int[] parent)
    {
        int n = parent.Length;
        var head = new int[n];
        var nextSibling = new int[n];
        Array.Fill(head, -1);
        for (int j = n - 1; j >= 0; j--)
        {
            if (parent[j] < 0) continue;
            nextSibling[j] = head[parent[j]];
            head[parent[j]] = j;
        }
        var post = new int[n];
        var stack = new int[n];
        int k = 0;
        for (int root = 0; root < n; root++)
        {
            if (parent[root] >= 0) continue;
            int top = 0;
            stack[top++] = root;
            while (top > 0)
            {
                int p = stack[top - 1];
                int child = head[p];
                if (child == -1) { top--; post[k++] = p; }
                else { head[p] = nextSibling[child]; stack[top++] = child; }
            }
        }
        return post;
    }
}
