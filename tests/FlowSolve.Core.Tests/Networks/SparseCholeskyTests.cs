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

    private static SparseCholesky Factor(int[] rowStart, int[] columns, double[] values, int parallelism = 1)
    {
        var cholesky = new SparseCholesky(rowStart, columns) { MaxDegreeOfParallelism = parallelism };
        values.CopyTo(cholesky.Values);
        Assert.True(cholesky.Factorise());
        return cholesky;
    }

    [Theory]
    [InlineData(1, 1, true, 1)]
    [InlineData(2, 2, false, 1)]
    [InlineData(12, 3, true, 1)]
    [InlineData(40, 4, false, 1)]
    [InlineData(150, 5, true, 1)]
    [InlineData(300, 6, false, 1)]
    [InlineData(400, 7, true, 1)]
    [InlineData(2, 2, false, 2)]
    [InlineData(12, 3, true, 2)]
    [InlineData(150, 5, true, 2)]
    [InlineData(300, 6, false, 2)]
    [InlineData(400, 7, true, 3)]
    public void Solve_RandomSparseSpd_MatchesMathNetDenseCholesky(int n, int seed, bool laplacian, int parallelism)
    {
        // Reference: MathNet.Numerics' dense Cholesky solve of the same matrix.
        var (rowStart, columns, values, dense) = RandomSpd(n, seed, laplacian);
        var cholesky = Factor(rowStart, columns, values, parallelism);
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

    /// <summary>A k x k five-point grid Laplacian with conductances over two decades (the shape of the network head
    /// equations) and a small positive shift on a few rows (fixed heads), as CSR.</summary>
    private static (int[] RowStart, int[] Columns, double[] Values) Grid(int k, int seed)
    {
        var random = new Random(seed);
        int n = k * k;
        var rows = new SortedDictionary<int, double>[n];
        for (int i = 0; i < n; i++) rows[i] = new() { [i] = i % 97 == 0 ? 0.05 : 0 };
        void Edge(int i, int j)
        {
            double w = Math.Pow(10, -2 - 2 * random.NextDouble());
            rows[i][i] += w; rows[j][j] += w;
            rows[i][j] = -w; rows[j][i] = -w;
        }
        for (int r = 0; r < k; r++)
            for (int c = 0; c < k; c++)
            {
                if (c + 1 < k) Edge(r * k + c, r * k + c + 1);
                if (r + 1 < k) Edge(r * k + c, (r + 1) * k + c);
            }
        var rowStart = new int[n + 1];
        var columns = new List<int>();
        var values = new List<double>();
        for (int i = 0; i < n; i++)
        {
            foreach (var (j, v) in rows[i]) { columns.Add(j); values.Add(v); }
            rowStart[i + 1] = columns.Count;
        }
        return (rowStart, columns.ToArray(), values.ToArray());
    }

    /// <summary>Factor and solution of the same system, sequential and with <paramref name="parallelism"/> threads.</summary>
    private static void AssertSameBits(int[] rowStart, int[] columns, double[] values, int parallelism, int factorisations)
    {
        var sequential = Factor(rowStart, columns, values, 1);
        var parallel = new SparseCholesky(rowStart, columns) { MaxDegreeOfParallelism = parallelism };
        values.CopyTo(parallel.Values);
        int n = sequential.Size;
        var b = new double[n];
        for (int i = 0; i < n; i++) b[i] = Math.Sin(0.7 * i) - 0.2;
        var expectedFactor = new double[sequential.FactorLength];
        sequential.SaveFactor(expectedFactor);
        var expectedX = new double[n];
        sequential.Solve(b, expectedX);
        var factor = new double[parallel.FactorLength];
        var x = new double[n];
        // Several factorisations of one instance: the schedule and work space are reused, the factor rebuilt each time.
        for (int repeat = 0; repeat < factorisations; repeat++)
        {
            Assert.True(parallel.Factorise());
            parallel.SaveFactor(factor);
            for (int i = 0; i < factor.Length; i++)
                Assert.Equal(BitConverter.DoubleToInt64Bits(expectedFactor[i]), BitConverter.DoubleToInt64Bits(factor[i]));
            parallel.Solve(b, x);
            for (int i = 0; i < n; i++)
                Assert.Equal(BitConverter.DoubleToInt64Bits(expectedX[i]), BitConverter.DoubleToInt64Bits(x[i]));
            factor.AsSpan().Clear();
        }
        // And the sequential factor solves the system (property: A x = b to rounding), so the bits compared are right.
        var ax = new double[n];
        sequential.Multiply(expectedX, ax);
        for (int i = 0; i < n; i++) Assert.Equal(b[i], ax[i], 1e-9 * (1 + Math.Abs(b[i])));
    }

    [Theory]
    [InlineData(8, 2)]
    [InlineData(45, 2)]
    [InlineData(100, 2)]
    [InlineData(100, 3)]
    [InlineData(71, 4)]
    [InlineData(160, 2)]
    public void Factorise_Parallel_GridFactorIdenticalToSequentialBitForBit(int k, int parallelism)
    {
        var (rowStart, columns, values) = Grid(k, 40 + k);
        AssertSameBits(rowStart, columns, values, parallelism, factorisations: 3);
    }

    [Theory]
    [InlineData(500, 31, true, 2)]
    [InlineData(800, 32, false, 2)]
    [InlineData(1500, 33, true, 2)]
    [InlineData(1500, 34, true, 4)]
    [InlineData(1200, 35, false, 3)]
    public void Factorise_Parallel_RandomSparseSpdFactorIdenticalToSequentialBitForBit(int n, int seed, bool laplacian, int parallelism)
    {
        var (rowStart, columns, values, _) = RandomSpd(n, seed, laplacian);
        AssertSameBits(rowStart, columns, values, parallelism, factorisations: 2);
    }

    [Fact]
    public void Factorise_Parallel_BlockDiagonalForestIdenticalToSequential()
    {
        // Four uncoupled grids: an elimination forest of four trees, dealt to parts as whole trees.
        var (r, c, v) = Grid(20, 5);
        int n = r.Length - 1, blocks = 4;
        var rowStart = new int[blocks * n + 1];
        var columns = new int[blocks * c.Length];
        var values = new double[blocks * v.Length];
        for (int b = 0; b < blocks; b++)
        {
            for (int i = 0; i < n; i++) rowStart[b * n + i + 1] = b * c.Length + r[i + 1];
            for (int a = 0; a < c.Length; a++) { columns[b * c.Length + a] = b * n + c[a]; values[b * v.Length + a] = v[a] * (1 + b); }
        }
        AssertSameBits(rowStart, columns, values, 2, factorisations: 2);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    public void Factorise_NotPositiveDefiniteInOneSubtree_ReturnsFalseAtAnyParallelism(int parallelism)
    {
        // A 60 x 60 grid Laplacian with one junction's diagonal made negative: the matrix is then indefinite (its
        // quadratic form is negative on that unit vector), so no Cholesky factor exists (algebra), whichever part of the
        // tree holds that junction. Afterwards the true values factorise again.
        var (rowStart, columns, values) = Grid(60, 9);
        foreach (int junction in new[] { 0, 1799, 3599 })
        {
            var cholesky = new SparseCholesky(rowStart, columns) { MaxDegreeOfParallelism = parallelism };
            values.CopyTo(cholesky.Values);
            cholesky.Values[cholesky.PositionOf(junction, junction)] = -1;
            Assert.False(cholesky.Factorise());
            values.CopyTo(cholesky.Values);
            Assert.True(cholesky.Factorise());
        }
    }

    [Fact]
    public void MaxDegreeOfParallelism_DefaultsByFactorSize_AndRejectsBelowOne()
    {
        // Default (stated in the property's documentation): every core for a factorisation of at least
        // ParallelThreshold multiply-adds, one thread below.
        var (r1, c1, _) = Grid(10, 1);
        var small = new SparseCholesky(r1, c1);
        Assert.True(small.FactorOperations < SparseCholesky.ParallelThreshold);
        Assert.Equal(1, small.MaxDegreeOfParallelism);
        var (r2, c2, _) = Grid(150, 1);
        var large = new SparseCholesky(r2, c2);
        Assert.True(large.FactorOperations >= SparseCholesky.ParallelThreshold);
        Assert.Equal(Environment.ProcessorCount, large.MaxDegreeOfParallelism);
        Assert.Throws<ArgumentOutOfRangeException>(() => large.MaxDegreeOfParallelism = 0);
    }

    [Fact]
    public void ParallelSchedule_Grid_SplitsIntoSmallPartsAndAShortChainAbove()
    {
        // Nested dissection splits a grid into halves of nearly equal work under each separator, so with two threads
        // (four parts each) no part should hold more than a quarter of the work, and the chain of separator fronts above
        // the parts (top separator, one below it, one below that) well under half of it, or two threads could not halve
        // the time (George 1973: the top separator of a k x k grid is a k x k dense front, k^3 / 3 of the order
        // k^3 log k total).
        var (rowStart, columns, values) = Grid(120, 3);
        var cholesky = new SparseCholesky(rowStart, columns) { MaxDegreeOfParallelism = 2 };
        values.CopyTo(cholesky.Values);
        Assert.True(cholesky.Factorise());
        var (topChain, largestPart) = cholesky.ParallelBalance;
        Assert.InRange(largestPart, 0.01, 0.25);
        Assert.InRange(topChain, 0.01, 0.35);
        Assert.InRange(cholesky.ParallelTopFronts, 1, cholesky.Supernodes / 10);
    }
}
