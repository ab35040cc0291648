using FlowSolve.Core.Networks;
using MathNet.Numerics.LinearAlgebra;

namespace FlowSolve.Core.Tests.Networks;

public sealed class SymmetricSparseSolverTests
{
    /// <summary>A weighted path-plus-chords graph Laplacian on n nodes with a positive diagonal shift on some nodes
    /// (the shape of the network head equations), as CSR and as a MathNet dense matrix.</summary>
    private static (SymmetricSparseSolver Sparse, Matrix<double> Dense) Laplacian(int n, int seed)
    {
        var random = new Random(seed);
        var dense = Matrix<double>.Build.Dense(n, n);
        void Edge(int i, int j, double w) { dense[i, i] += w; dense[j, j] += w; dense[i, j] -= w; dense[j, i] -= w; }
        for (int i = 0; i + 1 < n; i++) Edge(i, i + 1, Math.Pow(10, 3 * random.NextDouble() - 3));
        for (int i = 0; i + 7 < n; i += 3) Edge(i, i + 7, Math.Pow(10, 3 * random.NextDouble() - 3));
        dense[0, 0] += 0.5;
        dense[n - 1, n - 1] += 0.01;
        var rowStart = new int[n + 1];
        var cols = new List<int>();
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++) if (dense[i, j] != 0) cols.Add(j);
            rowStart[i + 1] = cols.Count;
        }
        var sparse = new SymmetricSparseSolver(rowStart, cols.ToArray());
        var values = sparse.Values;
        int k = 0;
        for (int i = 0; i < n; i++) for (int j = 0; j < n; j++) if (dense[i, j] != 0) values[k++] = dense[i, j];
        return (sparse, dense);
    }

    [Theory]
    [InlineData(10, 1)]
    [InlineData(60, 2)]
    [InlineData(200, 3)]
    public void Solve_WeightedLaplacian_MatchesMathNetDenseCholesky(int n, int seed)
    {
        // Reference: MathNet.Numerics dense Cholesky solve of the same matrix.
        var (sparse, dense) = Laplacian(n, seed);
        var b = Vector<double>.Build.Dense(n, i => Math.Sin(i + 1.0));
        var expected = dense.Cholesky().Solve(b);
        Assert.True(sparse.Factorise());
        var x = new double[n];
        var (iterations, residual) = sparse.Solve(b.ToArray(), x, 1e-13, 10 * n);
        Assert.True(residual <= 1e-13);
        Assert.InRange(iterations, 1, 2 * n);
        for (int i = 0; i < n; i++) Assert.Equal(expected[i], x[i], 1e-6 * Math.Max(1, Math.Abs(expected[i])));
        var ax = new double[n];
        sparse.Multiply(x, ax);
        for (int i = 0; i < n; i++) Assert.Equal(b[i], ax[i], 1e-12);
    }

    [Fact]
    public void Factorise_IndefiniteMatrix_ReturnsFalse()
    {
        // [[1, 2], [2, 1]] has eigenvalues 3 and -1: no Cholesky factor exists (algebra).
        var m = new SymmetricSparseSolver([0, 2, 4], [0, 1, 0, 1]);
        m.Values[0] = 1; m.Values[1] = 2; m.Values[2] = 2; m.Values[3] = 1;
        Assert.False(m.Factorise());
    }

    [Fact]
    public void Constructor_RowWithoutDiagonal_Throws() =>
        Assert.Throws<ArgumentException>(() => new SymmetricSparseSolver([0, 1, 2], [1, 0]));
}
