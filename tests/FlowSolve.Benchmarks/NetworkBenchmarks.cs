using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Networks;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Double;
using MathNet.Numerics.LinearAlgebra.Double.Solvers;
using MathNet.Numerics.LinearAlgebra.Solvers;

namespace FlowSolve.Benchmarks;

/// <summary>
/// A generated square grid network (a fictional layout for scale tests): n x n junctions joined by 2 n (n - 1) pipes
/// of 150 to 400 mm, Darcy-Weisbach, a small demand at every junction, fed by eight reservoirs along the edges.
/// </summary>
public static class GridNetwork
{
    /// <summary>The grid whose pipe count is nearest <paramref name="pipes"/>.</summary>
    public static NetworkModel Create(int pipes, int seed = 20261201)
    {
        int n = (int)Math.Round(0.5 + Math.Sqrt(0.25 + pipes / 2.0));
        var random = new Random(seed);
        var junctions = new Junction[n * n];
        var list = new List<NetworkPipe>(2 * n * n + 8);
        double[] sizes = [0.15, 0.2, 0.25, 0.3, 0.4];
        string Id(int r, int c) => $"j{r}_{c}";
        for (int r = 0; r < n; r++)
            for (int c = 0; c < n; c++)
            {
                junctions[r * n + c] = new Junction(Id(r, c), 10 * random.NextDouble(), 2e-5 * (0.5 + random.NextDouble()));
                if (c + 1 < n) list.Add(new NetworkPipe($"h{r}_{c}", Id(r, c), Id(r, c + 1), 100 + 100 * random.NextDouble(),
                    sizes[random.Next(sizes.Length)], 0.1e-3));
                if (r + 1 < n) list.Add(new NetworkPipe($"v{r}_{c}", Id(r, c), Id(r + 1, c), 100 + 100 * random.NextDouble(),
                    sizes[random.Next(sizes.Length)], 0.1e-3));
            }
        var reservoirs = new Reservoir[8];
        (int R, int C)[] at = [(0, 0), (0, n / 2), (0, n - 1), (n / 2, n - 1), (n - 1, n - 1), (n - 1, n / 2), (n - 1, 0), (n / 2, 0)];
        for (int k = 0; k < at.Length; k++)
        {
            reservoirs[k] = new Reservoir($"r{k}", 120 + k);
            list.Add(new NetworkPipe($"feed{k}", $"r{k}", Id(at[k].R, at[k].C), 50, 0.6, 0.1e-3));
        }
        return new NetworkModel(junctions, reservoirs, list, [], 1.004e-6);
    }
}

/// <summary>Whole-network solves of generated grids: cold start, and one warm-started load case, with each linear
/// solver for the head equations (the direct sparse Cholesky default, and the IC(0) conjugate-gradient path it replaced).</summary>
[MemoryDiagnoser]
public class NetworkBenchmarks
{
    private NetworkModel _model = null!;
    private NetworkSolver _warm = null!;
    private NetworkOptions _options;

    /// <summary>Approximate pipe count.</summary>
    [Params(10_000, 100_000)]
    public int Pipes { get; set; }

    /// <summary>Linear solver of the head equations.</summary>
    [Params(NetworkLinearSolver.SparseCholesky, NetworkLinearSolver.ConjugateGradient)]
    public NetworkLinearSolver Solver { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _model = GridNetwork.Create(Pipes);
        _options = NetworkOptions.Default with { LinearSolver = Solver };
        _warm = new NetworkSolver(_model, _options);
        _warm.SolveCase(1.0);
    }

    /// <summary>Validation, pattern (and for the direct solver the ordering and symbolic analysis), and a solve from the
    /// default start.</summary>
    [Benchmark]
    public int SolveCold() => NetworkSolver.Solve(_model, _options).Iterations;

    /// <summary>A load case at 1.1 times the demands, warm-started from the converged base case (then back to 1.0).</summary>
    [Benchmark]
    public int SolveWarmLoadCase() => _warm.SolveCase(1.1).Iterations + _warm.SolveCase(1.0).Iterations;
}

/// <summary>The friction pass before and after the span solve, in one run: the 100 000-pipe grid's cold solve with the
/// direct head solve, friction one pipe at a time (as before) against the turbulent pipes' Colebrook-White as one span
/// (<see cref="FlowSolve.Core.Friction.ColebrookWhite"/>); both give the same answer bit for bit (NetworkSolverTests).</summary>
[MemoryDiagnoser]
public class NetworkFrictionPassBenchmarks
{
    private NetworkModel _model = null!;
    private NetworkOptions _span, _scalar;

    /// <summary>Approximate pipe count.</summary>
    [Params(100_000)]
    public int Pipes { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _model = GridNetwork.Create(Pipes);
        _span = NetworkOptions.Default;
        _scalar = NetworkOptions.Default with { ScalarFrictionPass = true };
    }

    [Benchmark(Baseline = true)]
    public int SolveColdPipeByPipe() => NetworkSolver.Solve(_model, _scalar).Iterations;

    /// <summary>The span pass with everything on one core (NetworkOptions.MaxParallelism = 1): the friction pass and
    /// the factorisation as they ran before both were split across cores.</summary>
    [Benchmark]
    public int SolveColdSpanOneCore() => NetworkSolver.Solve(_model, _span with { MaxParallelism = 1 }).Iterations;

    [Benchmark]
    public int SolveColdSpan() => NetworkSolver.Solve(_model, _span).Iterations;
}

/// <summary>
/// The head equations' linear system alone, at the size of a generated grid: the grid's weighted Laplacian,
/// conductances log-uniform over two decades, eight nodes tied to fixed heads (CSR, both triangles).
/// </summary>
public abstract class GridLaplacian
{
    protected int[] RowStart = null!, Columns = null!;
    protected double[] Values = null!, B = null!, X = null!;
    protected int Size;

    protected void Build(int pipes)
    {
        int n = (int)Math.Round(0.5 + Math.Sqrt(0.25 + pipes / 2.0));
        Size = n * n;
        var random = new Random(7);
        var diag = new double[Size];
        var edges = new List<(int I, int J, double W)>();
        for (int r = 0; r < n; r++)
            for (int c = 0; c < n; c++)
            {
                int i = r * n + c;
                if (c + 1 < n) edges.Add((i, i + 1, Math.Pow(10, -2 - 2 * random.NextDouble())));
                if (r + 1 < n) edges.Add((i, i + n, Math.Pow(10, -2 - 2 * random.NextDouble())));
            }
        foreach (int k in new[] { 0, n / 2, n - 1, Size / 2 + n - 1, Size - 1, Size - 1 - n / 2, Size - n, Size / 2 }) diag[k] += 0.05;
        var rows = new List<int>[Size];
        for (int i = 0; i < Size; i++) rows[i] = [i];
        foreach (var (i, j, _) in edges) { rows[i].Add(j); rows[j].Add(i); }
        RowStart = new int[Size + 1];
        var cols = new List<int>();
        for (int i = 0; i < Size; i++) { rows[i].Sort(); cols.AddRange(rows[i]); RowStart[i + 1] = cols.Count; }
        Columns = cols.ToArray();
        Values = new double[Columns.Length];
        int At(int i, int j) => Array.BinarySearch(Columns, RowStart[i], RowStart[i + 1] - RowStart[i], j);
        for (int i = 0; i < Size; i++) Values[At(i, i)] += diag[i];
        foreach (var (i, j, w) in edges)
        {
            Values[At(i, i)] += w;
            Values[At(j, j)] += w;
            Values[At(i, j)] -= w;
            Values[At(j, i)] -= w;
        }
        B = new double[Size];
        for (int i = 0; i < Size; i++) B[i] = -2e-5;
        X = new double[Size];
    }
}

/// <summary>One head solve: our supernodal sparse Cholesky (numeric factorisation and triangular solves; the analysis
/// runs once in set-up, as in a network solve) against our IC(0)-preconditioned conjugate gradients to a residual of
/// 1e-13 (absolute, as in the network solve's final steps), and the one-off analysis on its own; the Cholesky on one
/// thread and on two (<see cref="Threads"/>).</summary>
[MemoryDiagnoser]
public class NetworkLinearSolveBenchmarks : GridLaplacian
{
    private const double Tolerance = 1e-13;
    private SymmetricSparseSolver _cg = null!;
    private SparseCholesky _direct = null!;

    [Params(10_000, 100_000)]
    public int Pipes { get; set; }

    /// <summary>The sparse Cholesky's <see cref="SparseCholesky.MaxDegreeOfParallelism"/>: 1 (sequential) or 2 (its
    /// independent subtrees on both cores); the same factor bit for bit. The other methods ignore it.</summary>
    [Params(1, 2)]
    public int Threads { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        Build(Pipes);
        _cg = new SymmetricSparseSolver(RowStart, Columns);
        Values.CopyTo(_cg.Values);
        _direct = new SparseCholesky(RowStart, Columns) { MaxDegreeOfParallelism = Threads };
        Values.CopyTo(_direct.Values);
    }

    [Benchmark(Baseline = true)]
    public int SparseCholeskyFactorSolve()
    {
        if (!_direct.Factorise()) return -1;
        _direct.Solve(B, X);
        return 1;
    }

    [Benchmark]
    public int IncompleteCholeskyCg()
    {
        Array.Clear(X);
        _cg.Factorise();
        return _cg.Solve(B, X, Tolerance, 10_000).Iterations;
    }

    /// <summary>Ordering, elimination tree, supernodes and storage: once per network.</summary>
    [Benchmark]
    public int SparseCholeskyAnalysis() => new SparseCholesky(RowStart, Columns).Supernodes;
}

/// <summary>
/// MathNet.Numerics 5's preconditioned iterative solvers on the same system at the 10,000-pipe size (beyond it they
/// take too long to benchmark), beside our sparse Cholesky. MathNet 5 has no linear conjugate gradient; TFQMR with a
/// diagonal preconditioner is the one of its solvers that converged here (BiCgStab stopped at its iteration cap, and
/// its ILU(0) preconditioner did not finish); target residual 1e-13 by its ResidualStopCriterion.
/// </summary>
[MemoryDiagnoser]
public class NetworkLinearSolveMathNetBenchmarks : GridLaplacian
{
    private SparseCholesky _direct = null!;
    private SparseMatrix _mathNet = null!;

    [GlobalSetup]
    public void Setup()
    {
        Build(10_000);
        _direct = new SparseCholesky(RowStart, Columns);
        Values.CopyTo(_direct.Values);
        var storage = new List<Tuple<int, int, double>>();
        for (int i = 0; i < Size; i++)
            for (int k = RowStart[i]; k < RowStart[i + 1]; k++) storage.Add(Tuple.Create(i, Columns[k], Values[k]));
        _mathNet = SparseMatrix.OfIndexed(Size, Size, storage);
    }

    [Benchmark(Baseline = true)]
    public int SparseCholeskyFactorSolve()
    {
        if (!_direct.Factorise()) return -1;
        _direct.Solve(B, X);
        return 1;
    }

    /// <summary>Returns the largest residual |b - A x| reached.</summary>
    [Benchmark]
    public double MathNetTfqmrDiagonal()
    {
        var b = Vector<double>.Build.DenseOfArray(B);
        var x = Vector<double>.Build.Dense(b.Count);
        var monitor = new Iterator<double>(new IterationCountStopCriterion<double>(5_000),
            new ResidualStopCriterion<double>(1e-13));
        new TFQMR().Solve(_mathNet, b, x, monitor, new DiagonalPreconditioner());
        return (b - _mathNet * x).InfinityNorm();
    }
}
