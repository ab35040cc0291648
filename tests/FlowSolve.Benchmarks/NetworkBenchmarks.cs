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

/// <summary>Whole-network solves of generated grids: cold start, and one warm-started load case.</summary>
[MemoryDiagnoser]
public class NetworkBenchmarks
{
    private NetworkModel _model = null!;
    private NetworkSolver _warm = null!;

    /// <summary>Approximate pipe count.</summary>
    [Params(10_000, 100_000)]
    public int Pipes { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _model = GridNetwork.Create(Pipes);
        _warm = new NetworkSolver(_model);
        _warm.SolveCase(1.0);
    }

    /// <summary>Validation, pattern, and a solve from the default start.</summary>
    [Benchmark]
    public int SolveCold() => NetworkSolver.Solve(_model).Iterations;

    /// <summary>A load case at 1.1 times the demands, warm-started from the converged base case (then back to 1.0).</summary>
    [Benchmark]
    public int SolveWarmLoadCase() => _warm.SolveCase(1.1).Iterations + _warm.SolveCase(1.0).Iterations;
}

/// <summary>
/// The head equations' linear solve alone, at the size of a 100,000-pipe grid: our IC(0)-preconditioned conjugate
/// gradients on CSR against MathNet.Numerics' sparse storage with its BiCGStab and ILU(0) preconditioner (MathNet 5
/// has no linear conjugate-gradient solver). Matrix: the grid's weighted Laplacian, conductances log-uniform over
/// two decades, eight nodes tied to fixed heads; residual target 1e-13 (absolute, as in the network solve).
/// </summary>
[MemoryDiagnoser]
public class NetworkLinearSolveBenchmarks
{
    private const double Tolerance = 1e-13;
    private SymmetricSparseSolver _ours = null!;
    private SparseMatrix _mathNet = null!;
    private double[] _b = null!, _x = null!;

    [Params(100_000)]
    public int Pipes { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        int n = (int)Math.Round(0.5 + Math.Sqrt(0.25 + Pipes / 2.0));
        int size = n * n;
        var random = new Random(7);
        var diag = new double[size];
        var edges = new List<(int I, int J, double W)>();
        for (int r = 0; r < n; r++)
            for (int c = 0; c < n; c++)
            {
                int i = r * n + c;
                if (c + 1 < n) edges.Add((i, i + 1, Math.Pow(10, -2 - 2 * random.NextDouble())));
                if (r + 1 < n) edges.Add((i, i + n, Math.Pow(10, -2 - 2 * random.NextDouble())));
            }
        foreach (int k in new[] { 0, n / 2, n - 1, size / 2 + n - 1, size - 1, size - 1 - n / 2, size - n, size / 2 }) diag[k] += 0.05;
        var rows = new List<int>[size];
        for (int i = 0; i < size; i++) rows[i] = [i];
        foreach (var (i, j, _) in edges) { rows[i].Add(j); rows[j].Add(i); }
        var rowStart = new int[size + 1];
        var cols = new List<int>();
        for (int i = 0; i < size; i++) { rows[i].Sort(); cols.AddRange(rows[i]); rowStart[i + 1] = cols.Count; }
        _ours = new SymmetricSparseSolver(rowStart, cols.ToArray());
        var values = _ours.Values;
        for (int i = 0; i < size; i++) values[_ours.PositionOf(i, i)] += diag[i];
        var storage = new List<Tuple<int, int, double>>();
        foreach (var (i, j, w) in edges)
        {
            values[_ours.PositionOf(i, i)] += w;
            values[_ours.PositionOf(j, j)] += w;
            values[_ours.PositionOf(i, j)] -= w;
            values[_ours.PositionOf(j, i)] -= w;
        }
        for (int i = 0; i < size; i++)
            for (int k = rowStart[i]; k < rowStart[i + 1]; k++) storage.Add(Tuple.Create(i, cols[k], values[k]));
        _mathNet = SparseMatrix.OfIndexed(size, size, storage);
        _b = new double[size];
        for (int i = 0; i < size; i++) _b[i] = -2e-5;
        _x = new double[size];
    }

    [Benchmark(Baseline = true)]
    public int IncompleteCholeskyCg()
    {
        Array.Clear(_x);
        _ours.Factorise();
        return _ours.Solve(_b, _x, Tolerance, 10_000).Iterations;
    }

    [Benchmark]
    public double MathNetBiCgStabIlu0()
    {
        var b = Vector<double>.Build.DenseOfArray(_b);
        var x = Vector<double>.Build.Dense(b.Count);
        var monitor = new Iterator<double>(new IterationCountStopCriterion<double>(10_000),
            new ResidualStopCriterion<double>(Tolerance));
        new BiCgStab().Solve(_mathNet, b, x, monitor, new ILU0Preconditioner());
        return x[0];
    }
}
