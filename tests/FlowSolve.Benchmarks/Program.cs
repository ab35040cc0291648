namespace FlowSolve.Benchmarks;

public static class BenchmarkEntry
{
    public static void Main(string[] args) =>
        BenchmarkDotNet.Running.BenchmarkSwitcher.FromAssembly(typeof(BenchmarkEntry).Assembly).Run(args);
}
