using System.Runtime.InteropServices;
using BenchmarkDotNet.Attributes;
using FlowSolve.Core.Networks;

namespace FlowSolve.Benchmarks;

/// <summary>
/// A comparison only, never used by the library: SuiteSparse's CHOLMOD (Debian package libcholmod3, called through
/// P/Invoke with its default settings: its own choice of ordering among AMD and METIS, and of supernodal or simplicial
/// factorisation, on the system BLAS) against our pure .NET sparse Cholesky, numeric factorisation plus one solve of the
/// grid's head equations; each analysis runs once in set-up. Needs <c>apt-get install libcholmod3</c>; without it the
/// set-up fails and BenchmarkDotNet reports the benchmark as failed.
/// </summary>
[MemoryDiagnoser]
public class NetworkCholmodBenchmarks : GridLaplacian
{
    private const string Library = "libcholmod.so.3";
    private SparseCholesky _ours = null!;
    private IntPtr _common, _factor, _p, _i, _x, _b, _a, _rhs;

    [Params(10_000, 100_000)]
    public int Pipes { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        Build(Pipes);
        _ours = new SparseCholesky(RowStart, Columns);
        Values.CopyTo(_ours.Values);

        // The full symmetric CSR is also its own CSC; stype 1 tells CHOLMOD to read the upper triangle only.
        _common = Marshal.AllocHGlobal(64 * 1024); // larger than cholmod_common in any 5.x release
        Marshal.Copy(new byte[64 * 1024], 0, _common, 64 * 1024);
        if (cholmod_start(_common) == 0) throw new InvalidOperationException("cholmod_start failed");
        _p = Copy(RowStart);
        _i = Copy(Columns);
        _x = Copy(Values);
        _b = Copy(B);
        _a = Marshal.AllocHGlobal(Marshal.SizeOf<Sparse>());
        Marshal.StructureToPtr(new Sparse
        {
            NRow = (nuint)Size, NCol = (nuint)Size, NzMax = (nuint)Columns.Length, P = _p, I = _i, X = _x,
            SType = 1, IType = 0 /* CHOLMOD_INT */, XType = 1 /* CHOLMOD_REAL */, DType = 0 /* CHOLMOD_DOUBLE */,
            Sorted = 1, Packed = 1,
        }, _a, false);
        _rhs = Marshal.AllocHGlobal(Marshal.SizeOf<Dense>());
        Marshal.StructureToPtr(new Dense { NRow = (nuint)Size, NCol = 1, NzMax = (nuint)Size, D = (nuint)Size, X = _b, XType = 1, DType = 0 },
            _rhs, false);
        _factor = cholmod_analyze(_a, _common);
        if (_factor == IntPtr.Zero) throw new InvalidOperationException("cholmod_analyze failed");
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        if (_factor != IntPtr.Zero) cholmod_free_factor(ref _factor, _common);
        cholmod_finish(_common);
        foreach (var h in new[] { _p, _i, _x, _b, _a, _rhs, _common }) Marshal.FreeHGlobal(h);
    }

    [Benchmark(Baseline = true)]
    public int SparseCholeskyFactorSolve()
    {
        if (!_ours.Factorise()) return -1;
        _ours.Solve(B, X);
        return 1;
    }

    /// <summary>cholmod_factorize and cholmod_solve (which allocates its answer natively; copied out like ours writes
    /// its answer, then freed). Returns x[0].</summary>
    [Benchmark]
    public double CholmodFactorizeSolve()
    {
        if (cholmod_factorize(_a, _factor, _common) == 0) return double.NaN;
        var x = cholmod_solve(0 /* CHOLMOD_A */, _factor, _rhs, _common);
        Marshal.Copy(Marshal.PtrToStructure<Dense>(x).X, X, 0, Size);
        cholmod_free_dense(ref x, _common);
        return X[0];
    }

    private static IntPtr Copy(int[] data)
    {
        var p = Marshal.AllocHGlobal(sizeof(int) * data.Length);
        Marshal.Copy(data, 0, p, data.Length);
        return p;
    }

    private static IntPtr Copy(double[] data)
    {
        var p = Marshal.AllocHGlobal(sizeof(double) * data.Length);
        Marshal.Copy(data, 0, p, data.Length);
        return p;
    }

    [StructLayout(LayoutKind.Sequential)]
    private struct Sparse
    {
        public nuint NRow, NCol, NzMax;
        public IntPtr P, I, Nz, X, Z;
        public int SType, IType, XType, DType, Sorted, Packed;
    }

    [StructLayout(LayoutKind.Sequential)]
    private struct Dense
    {
        public nuint NRow, NCol, NzMax, D;
        public IntPtr X, Z;
        public int XType, DType;
    }

    [DllImport(Library)] private static extern int cholmod_start(IntPtr common);
    [DllImport(Library)] private static extern int cholmod_finish(IntPtr common);
    [DllImport(Library)] private static extern IntPtr cholmod_analyze(IntPtr a, IntPtr common);
    [DllImport(Library)] private static extern int cholmod_factorize(IntPtr a, IntPtr factor, IntPtr common);
    [DllImport(Library)] private static extern IntPtr cholmod_solve(int system, IntPtr factor, IntPtr b, IntPtr common);
    [DllImport(Library)] private static extern int cholmod_free_dense(ref IntPtr x, IntPtr common);
    [DllImport(Library)] private static extern int cholmod_free_factor(ref IntPtr factor, IntPtr common);
}
