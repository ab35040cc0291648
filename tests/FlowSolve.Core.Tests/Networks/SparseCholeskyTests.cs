using FlowSolve.Core.Networks;
using MathNet.Numerics.LinearAlgebra;

namespace FlowSolve.Core.Tests.Networks;

public sealed class SparseCholeskyTests
{
    /// <summary>A random sparse symmetric positive definite matrix on n rows, as CSR and as a MathNet dense matrix.
    /// <paramref name="laplacian"/>: a weighted graph Laplacian (random edges, weights over three decades) plus a positive
    /// diagonal on a few rows, the shape of the network head equations (an M-matrix). Otherwise: random entries of both
    /// signs made strictly diagonally dominant with a positive diagonal, hence positive definite (Gershgorin).</summary>
    private static (int[] RowStart, int[] Columns, double[] Values, Matrix<double> Dense) RandomSpd(int n, int seed, bool laplacian)
    {
        var random = new Random(seed);
        var dense = Matrix<double>.Build.Dense(n, n);
        int edges = 2 * n;
        for (int e = 0; e < edges && n > 1; e++)
        {
            int i = random.Next(n), j = random.Next(n);
            if (i == j) continue;
            double w = Math.Pow(10, 3 * random.NextDouble() - 3);
            if (laplacian)
            {
                dense[i, i] += w; dense[j, j] += w; dense[i, j] -= w; dense[j, i] -= w;
            }
            else
            {
                double v = random.NextDouble() < 0.5 ? -w : w;
                dense[i, j] += v; dense[j, i] += v;
            }
        }
        for (int i = 0; i < n; i++)
        {
            if (laplacian) { if (i % 7 == 0) dense[i, i] += 0.1; continue; }
            double off = 0;
            for (int j = 0; j < n; j++) if (j != i) off += Math.Abs(dense[i, j]);
            dense[i, i] = off + 0.01 + random.NextDouble();
        }
        if (laplacian)
        {
            // A path through every row keeps the graph connected, so the few shifted rows make it positive definite.
            for (int i = 0; i + 1 < n; i++) { dense[i, i] += 1e-3; dense[i + 1, i + 1] += 1e-3; dense[i, i + 1] -= 1e-3; dense[i + 1, i] -= 1e-3; }
        }
        var rowStart = new int[n + 1];
        var columns = new List<int>();
        var values = new List<double>();
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
                if (i == j || dense[i, j] != 0) { columns.Add(j); values.Add(dense[i, j]); }
            rowStart[i + 1] = columns.Count;
        }
        return (rowStart, columns.ToArray(), values.ToArray(), dense);
    }

    private static SparseCholesky Factor(int[] rowStart, int[] columns, double[] values)
    {
        var cholesky = new SparseCholesky(rowStart, columns);
        values.CopyTo(cholesky.Values);
        Assert.True(cholesky.Factorise());
        return cholesky;
    }

    [Theory]
    [InlineData(1, 1, true)]
    [InlineData(2, 2, false)]
    [InlineData(12, 3, true)]
    [InlineData(40, 4, false)]
    [InlineData(150, 5, true)]
    [InlineData(300, 6, false)]
    [InlineData(400, 7, true)]
    public void Solve_RandomSparseSpd_MatchesMathNetDenseCholesky(int n, int seed, bool laplacian)
    {
        // Reference: MathNet.Numerics' dense Cholesky solve of the same matrix.
        var (rowStart, columns, values, dense) = RandomSpd(n, seed, laplacian);
        var cholesky = Factor(rowStart, columns, values);
        var b = Vector<double>.Build.Dense(n, i => Math.Cos(3.0 * i) + 0.5);
        var expected = dense.Cholesky().Solve(b);
        var x = new double[n];
        cholesky.Solve(b.ToArray(), x);
        double scale = expected.InfinityNorm();
        for (int i = 0; i < n; i++) Assert.Equal(expected[i], x[i], 1e-9 * scale);
        // Residual (property): A x = b to rounding.
        var ax = new double[n];
        cholesky.Multiply(x, ax);
        for (int i = 0; i < n; i++) Assert.Equal(b[i], ax[i], 1e-10 * (1 + Math.Abs(b[i])));
    }

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    [InlineData(2)]
    public void Solve_AgreesWithConjugateGradientPath(int seed)
    {
        // Reference: the IC(0) conjugate-gradient solve (SymmetricSparseSolver) of the same Laplacian, driven to 1e-14.
        var (rowStart, columns, values, _) = RandomSpd(250, 10 + seed, laplacian: true);
        var cholesky = Factor(rowStart, columns, values);
        var cg = new SymmetricSparseSolver(rowStart, columns);
        values.CopyTo(cg.Values);
        Assert.True(cg.Factorise());
        var b = new double[250];
        for (int i = 0; i < b.Length; i++) b[i] = Math.Sin(i + 0.5);
        var expected = new double[250];
        var (_, residual) = cg.Solve(b, expected, 1e-14, 10_000);
        Assert.True(residual <= 1e-14);
        var x = new double[250];
        cholesky.Solve(b, x);
        double scale = expected.Max(Math.Abs);
        for (int i = 0; i < x.Length; i++) Assert.Equal(expected[i], x[i], 1e-9 * scale);
    }

    [Fact]
    public void Factorise_NewValuesOnTheSamePattern_SolveTheNewSystem()
    {
        // The analysis is kept; a second factorisation with other values (same pattern) answers the second matrix.
        var (rowStart, columns, values, _) = RandomSpd(120, 21, laplacian: false);
        var (_, _, _, dense2) = RandomSpd(120, 21, laplacian: false);
        var cholesky = Factor(rowStart, columns, values);
        // Keep the second matrix symmetric and dominant: scale each symmetric pair alike, then the diagonal up.
        var scaled = Matrix<double>.Build.Dense(120, 120);
        for (int i = 0; i < 120; i++)
            for (int a = rowStart[i]; a < rowStart[i + 1]; a++)
            {
                int j = columns[a];
                double factor = 1 + 0.5 * Math.Sin(Math.Min(i, j) * 131 + Math.Max(i, j));
                scaled[i, j] = i == j ? 2 * dense2[i, i] : dense2[i, j] * factor;
            }
        for (int i = 0; i < 120; i++)
            for (int a = rowStart[i]; a < rowStart[i + 1]; a++) cholesky.Values[a] = scaled[i, columns[a]];
        Assert.True(cholesky.Factorise());
        var b = Vector<double>.Build.Dense(120, i => i % 5 - 2.0);
        var expected = scaled.Cholesky().Solve(b);
        var x = new double[120];
        cholesky.Solve(b.ToArray(), x);
        for (int i = 0; i < 120; i++) Assert.Equal(expected[i], x[i], 1e-9 * expected.InfinityNorm());
    }

    [Fact]
    public void Solve_BlockDiagonalPattern_SolvesEachBlock()
    {
        // Two uncoupled tridiagonal blocks (an elimination forest with two roots), [2 -1; -1 2 -1; ...] on each:
        // x = (1, ..., 1) gives b = (1, 0, ..., 0, 1) on each block (algebra).
        int n = 20;
        var rowStart = new int[n + 1];
        var columns = new List<int>();
        var values = new List<double>();
        for (int i = 0; i < n; i++)
        {
            int block = i / 10, lo = block * 10, hi = lo + 9;
            if (i > lo) { columns.Add(i - 1); values.Add(-1); }
            columns.Add(i); values.Add(2);
            if (i < hi) { columns.Add(i + 1); values.Add(-1); }
            rowStart[i + 1] = columns.Count;
        }
        var cholesky = Factor(rowStart, columns.ToArray(), values.ToArray());
        var b = new double[n];
        for (int i = 0; i < n; i++) b[i] = i % 10 == 0 || i % 10 == 9 ? 1 : 0;
        var x = new double[n];
        cholesky.Solve(b, x);
        foreach (double v in x) Assert.Equal(1.0, v, 1e-13);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(30)]
    [InlineData(60)]
    public void Order_GridPattern_IsAPermutationAndCutsTheFill(int k)
    {
        // A k x k five-point grid Laplacian. Natural (row by row) order fills the whole band: about n k entries in L.
        // Nested dissection leaves O(n log n) (George 1973, SIAM J. Numer. Anal. 10(2)): below the band at k = 30, under
        // half of it at k = 60 (stored entries, explicit zeros of relaxed supernodes included).
        int n = k * k;
        var rowStart = new int[n + 1];
        var columns = new List<int>();
        var values = new List<double>();
        for (int r = 0; r < k; r++)
            for (int c = 0; c < k; c++)
            {
                int i = r * k + c;
                void Add(int j, double v) { columns.Add(j); values.Add(v); }
                if (r > 0) Add(i - k, -1);
                if (c > 0) Add(i - 1, -1);
                Add(i, 4.01);
                if (c + 1 < k) Add(i + 1, -1);
                if (r + 1 < k) Add(i + k, -1);
                rowStart[i + 1] = columns.Count;
            }
        var cholesky = Factor(rowStart, columns.ToArray(), values.ToArray());
        var seen = new bool[n];
        foreach (int v in cholesky.Order) { Assert.InRange(v, 0, n - 1); Assert.False(seen[v]); seen[v] = true; }
        Assert.Equal(n, cholesky.Order.Length);
        Assert.InRange(cholesky.FactorNonZeros, n, k < 60 ? Math.Max(n, (long)n * k) : (long)n * k / 2);
        // And the factor solves the grid system: A 1 = b with b the row sums (algebra).
        var b = new double[n];
        for (int i = 0; i < n; i++) for (int a = rowStart[i]; a < rowStart[i + 1]; a++) b[i] += values[a];
        var x = new double[n];
        cholesky.Solve(b, x);
        foreach (double v in x) Assert.Equal(1.0, v, 1e-12);
    }

    [Fact]
    public void Factorise_IndefiniteMatrix_ReturnsFalse()
    {
        // [[1, 2], [2, 1]] has eigenvalues 3 and -1: no Cholesky factor exists (algebra).
        var m = new SparseCholesky([0, 2, 4], [0, 1, 0, 1]);
        m.Values[0] = 1; m.Values[1] = 2; m.Values[2] = 2; m.Values[3] = 1;
        Assert.False(m.Factorise());
    }

    [Fact]
    public void Constructor_EmptyMatrix_SolvesNothing()
    {
        var m = new SparseCholesky([0], []);
        Assert.Equal(0, m.Size);
        Assert.True(m.Factorise());
        m.Solve([], []);
    }

    [Fact]
    public void Constructor_MalformedPatterns_Throw()
    {
        Assert.Throws<ArgumentException>(() => new SparseCholesky([0, 1, 2], [1, 0]));          // no diagonal
        Assert.Throws<ArgumentException>(() => new SparseCholesky([0, 2, 3], [1, 0, 1]));       // unsorted row
        Assert.Throws<ArgumentException>(() => new SparseCholesky([0, 1, 3], [0, 1, 2]));       // column out of range
        Assert.Throws<ArgumentException>(() => new SparseCholesky([0, 1], [0, 0]));             // rowStart short of columns
    }
}
