namespace FlowSolve.Core.Networks;

/// <summary>
/// A sparse symmetric positive definite matrix in compressed sparse row form (both triangles stored, column indices
/// sorted in each row), with an incomplete Cholesky preconditioned conjugate gradient solve on buffers it keeps.
/// </summary>
/// <remarks>
/// <para>The pattern is fixed at construction; the values are rewritten in place (<see cref="Values"/>) before each
/// solve, so a network solver allocates it once and reuses it for every Newton iteration and load case.</para>
/// <para>Preconditioner: IC(0), the incomplete Cholesky factor L with the pattern of the lower triangle (Meijerink and
/// van der Vorst 1977, Math. Comp. 31(137)). For a weighted graph Laplacian with positive weights plus a positive
/// diagonal (the network's head equations) the matrix is an M-matrix and IC(0) exists without breakdown (same paper).
/// The iteration is the preconditioned conjugate gradient method of Hestenes and Stiefel (1952).</para>
/// <para>Not thread-safe: one instance per solver.</para>
/// </remarks>
public sealed class SymmetricSparseSolver
{
    private readonly int[] _rowStart;
    private readonly int[] _columns;
    private readonly int[] _diagonal;          // position of (i, i) in _columns
    private readonly double[] _values;
    private readonly double[] _factor;         // IC(0) values on the full pattern; only the lower part (with diagonal) is used
    private readonly double[] _r, _z, _p, _q;

    /// <summary>Creates the matrix from its pattern.</summary>
    /// <param name="rowStart">Row pointers, length n + 1, starting at 0, non-decreasing.</param>
    /// <param name="columns">Column indices of every row, sorted and distinct in each row, symmetric, each row holding its
    /// diagonal.</param>
    /// <exception cref="ArgumentException">The pattern is malformed.</exception>
    public SymmetricSparseSolver(int[] rowStart, int[] columns)
    {
        _diagonal = SparsePattern.Diagonals(rowStart, columns);
        int n = rowStart.Length - 1;
        _rowStart = rowStart;
        _columns = columns;
        _values = new double[columns.Length];
        _factor = new double[columns.Length];
        _r = new double[n];
        _z = new double[n];
        _p = new double[n];
        _q = new double[n];
    }

    /// <summary>Order n of the matrix.</summary>
    public int Size => _diagonal.Length;

    /// <summary>Number of stored entries (both triangles).</summary>
    public int NonZeros => _columns.Length;

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

    /// <summary>Computes the IC(0) factor of the current values; allocation-free.</summary>
    /// <returns>False when a pivot is not positive (the matrix is not positive definite, or not an M-matrix).</returns>
    public bool Factorise()
    {
        int n = Size;
        var v = _values;
        var l = _factor;
        var cols = _columns;
        var start = _rowStart;
        for (int i = 0; i < n; i++)
        {
            int rowEnd = _diagonal[i];
            for (int a = start[i]; a < rowEnd; a++)
            {
                int k = cols[a];
                // L_ik = (A_ik - sum_{m<k} L_im L_km) / L_kk over the common pattern of rows i and k.
                double sum = v[a];
                int b = start[i], e = start[k], eEnd = _diagonal[k];
                while (b < a && e < eEnd)
                {
                    int cb = cols[b], ce = cols[e];
                    if (cb == ce) { sum -= l[b] * l[e]; b++; e++; }
                    else if (cb < ce) b++;
                    else e++;
                }
                l[a] = sum / l[eEnd];
            }
            double d = v[rowEnd];
            for (int a = start[i]; a < rowEnd; a++) d -= l[a] * l[a];
            if (!(d > 0)) return false;
            l[rowEnd] = Math.Sqrt(d);
        }
        return true;
    }

    /// <summary>Solves A x = b by IC(0)-preconditioned conjugate gradients, starting from the x given; allocation-free.</summary>
    /// <param name="b">Right-hand side, length n.</param>
    /// <param name="x">Start on entry, solution on return, length n.</param>
    /// <param name="tolerance">Stop when the largest residual |b - A x|_i is at most this (absolute, in b's units).</param>
    /// <param name="maxIterations">Iteration cap.</param>
    /// <returns>Iterations taken and the largest residual left.</returns>
    /// <remarks>Call <see cref="Factorise"/> first, after the values were last written.</remarks>
    public (int Iterations, double Residual) Solve(ReadOnlySpan<double> b, Span<double> x, double tolerance, int maxIterations)
    {
        // The recursively updated residual drifts from b - A x by rounding (about eps |A| |x| per iteration), so a
        // solve that meets the tolerance on it is checked on the true residual and restarted from there, at most 4 times.
        int total = 0;
        double rmax = 0;
        for (int restart = 0; restart < 5 && total < maxIterations; restart++)
        {
            (int iterations, rmax) = Iterate(b, x, tolerance, maxIterations - total);
            total += iterations;
            if (rmax <= tolerance && iterations == 0) break;
        }
        return (total, rmax);
    }

    private (int Iterations, double Residual) Iterate(ReadOnlySpan<double> b, Span<double> x, double tolerance, int maxIterations)
    {
        int n = Size;
        Span<double> r = _r, z = _z, p = _p, q = _q;
        Multiply(x, q);
        double rmax = 0;
        for (int i = 0; i < n; i++) { r[i] = b[i] - q[i]; rmax = Math.Max(rmax, Math.Abs(r[i])); }
        if (rmax <= tolerance) return (0, rmax);
        Precondition(r, z);
        z.CopyTo(p);
        double rz = Dot(r, z);
        int iteration = 0;
        while (iteration < maxIterations)
        {
            iteration++;
            Multiply(p, q);
            double pq = Dot(p, q);
            if (!(pq > 0)) break;
            double alpha = rz / pq;
            rmax = 0;
            for (int i = 0; i < n; i++)
            {
                x[i] += alpha * p[i];
                r[i] -= alpha * q[i];
                rmax = Math.Max(rmax, Math.Abs(r[i]));
            }
            if (rmax <= tolerance) break;
            Precondition(r, z);
            double rzNext = Dot(r, z);
            double beta = rzNext / rz;
            rz = rzNext;
            for (int i = 0; i < n; i++) p[i] = z[i] + beta * p[i];
        }
        return (iteration, rmax);
    }

    /// <summary>y = A x; allocation-free.</summary>
    /// <param name="x">Vector of length n.</param>
    /// <param name="y">Result, length n.</param>
    public void Multiply(ReadOnlySpan<double> x, Span<double> y)
    {
        SparsePattern.Multiply(_rowStart, _columns, _values, x, y);
    }

    /// <summary>z = (L L^T)^-1 r: forward substitution with L, back substitution with L^T (column sweep).</summary>
    private void Precondition(ReadOnlySpan<double> r, Span<double> z)
    {
        var l = _factor;
        var cols = _columns;
        var start = _rowStart;
        var diag = _diagonal;
        int n = z.Length;
        for (int i = 0; i < n; i++)
        {
            double s = r[i];
            for (int k = start[i]; k < diag[i]; k++) s -= l[k] * z[cols[k]];
            z[i] = s / l[diag[i]];
        }
        for (int i = n - 1; i >= 0; i--)
        {
            double zi = z[i] / l[diag[i]];
            z[i] = zi;
            for (int k = start[i]; k < diag[i]; k++) z[cols[k]] -= l[k] * zi;
        }
    }

    private static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        double s = 0;
        for (int i = 0; i < a.Length; i++) s += a[i] * b[i];
        return s;
    }
}
