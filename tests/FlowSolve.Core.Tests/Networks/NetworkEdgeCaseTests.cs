using FlowSolve.Core.Friction;
using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using MathNet.Numerics.RootFinding;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>
/// Networks at the edge of what double precision resolves, and pipes in the transition zone, each checked against an
/// exact answer found independently: MathNet.Numerics' Brent root finder on Darcy-Weisbach, with the friction factor
/// written out here from the published relations (64/Re; Churchill 1977 between Re 2000 and 4000; Colebrook-White 1939,
/// itself solved by Brent, above).
/// </summary>
public sealed class NetworkEdgeCaseTests
{
    private const double Nu = 1e-6; // m2/s, a round viscosity so that the Reynolds numbers are easy to read

    /// <summary>Darcy friction factor by the single-pipe rules, written out from the sources.</summary>
    internal static double ReferenceFriction(double re, double relativeRoughness)
    {
        if (re < 2000) return 64 / re;
        if (re < 4000)
        {
            // Churchill, S. W. (1977), Chem. Eng. 84(24), 91-92.
            double a = Math.Pow(-2.457 * Math.Log(Math.Pow(7 / re, 0.9) + 0.27 * relativeRoughness), 16);
            double b = Math.Pow(37530 / re, 16);
            return 8 * Math.Pow(Math.Pow(8 / re, 12) + Math.Pow(a + b, -1.5), 1.0 / 12);
        }
        // Colebrook, C. F. (1939): 1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f))), in x = 1/sqrt(f).
        double x = Brent.FindRoot(x => x + 2 * Math.Log10(relativeRoughness / 3.7 + 2.51 * x / re), 1, 100, 1e-14, 200);
        return 1 / (x * x);
    }

    /// <summary>Darcy-Weisbach head loss of a pipe at a positive flow.</summary>
    internal static double ReferenceHeadLoss(double length, double diameter, double roughness, double q, double nu = Nu)
    {
        double area = Math.PI * diameter * diameter / 4, v = q / area;
        return ReferenceFriction(v * diameter / nu, roughness / diameter) * length / diameter * v * v / (2 * Physical.StandardGravity);
    }

    /// <summary>The flow through two pipes in series that loses <paramref name="head"/> in all (Brent on the flow).</summary>
    private static double SeriesFlow(double head, params (double L, double D, double E)[] pipes)
    {
        double Residual(double q) => pipes.Sum(p => ReferenceHeadLoss(p.L, p.D, p.E, q)) - head;
        return Brent.FindRoot(Residual, 1e-12, 10, 1e-19, 500);
    }

    public static TheoryData<double, double, double> SeriesFamily => new()
    {
        // head difference (m), wide pipe's length (m) and diameter (m); the first two rows are the network of the report
        // (a 100 m x 0.05 m pipe from a reservoir at 11 m to a junction, a 1 m x 1 m pipe on to a reservoir at 10 m).
        { 1, 1, 1 },
        { 1, 1e-6, 1 },
        { 1, 1e-3, 1 },
        { 1, 10, 0.5 },
        { 0.2, 1, 1 },
        { 5, 1e-6, 2 },
        { 1, 100, 0.3 },
    };

    [Theory]
    [MemberData(nameof(SeriesFamily))]
    public void Solve_SeriesWithWideOrShortPipe_ConvergesToTheExactFlow(double head, double wideLength, double wideDiameter)
    {
        var model = new NetworkModel([new("j", 0, 0)], [new("upper", 10 + head), new("lower", 10)],
            [new("narrow", "upper", "j", 100, 0.05), new("wide", "j", "lower", wideLength, wideDiameter)], [], Nu);

        var result = NetworkSolver.Solve(model);

        double exact = SeriesFlow(head, (100, 0.05, 0), (wideLength, wideDiameter, 0));
        Assert.True(result.Status == NetworkStatus.Solved, $"{result.Status} after {result.Iterations} iterations");
        Assert.InRange(result.Iterations, 1, 20);
        Assert.Equal(exact, result.Pipe("narrow").Flow, exact * 1e-9);
        Assert.Equal(exact, result.Pipe("wide").Flow, exact * 1e-9);
        // The junction's head is the lower level plus the wide pipe's loss, to what a double holds at 10 m.
        double junction = 10 + ReferenceHeadLoss(wideLength, wideDiameter, 0, exact);
        Assert.Equal(junction, result.Junction("j").Head, 1e-12);
    }

    [Fact]
    public void Solve_SeriesWithLaminarWidePipe_StopsWhenTheFlowsStopChanging()
    {
        // The report's network: with the absolute rule alone the continuity error stalled at 1.9e-10 m3/s (a head of 10 m
        // held to 1.8e-15 m, times the wide pipe's conductance 1/(dh/dQ) = 2.4e5 m2/s) until the cap of 100 iterations.
        var model = new NetworkModel([new("j", 0, 0)], [new("upper", 11), new("lower", 10)],
            [new("narrow", "upper", "j", 100, 0.05), new("wide", "j", "lower", 1, 1)], [], Nu);
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.Solved, result.Status);
        // Property: Newton's quadratic convergence is kept, a handful of iterations, and the continuity error that stalled
        // now meets the absolute tolerance itself (the flows are no longer rounded through the heads).
        Assert.InRange(result.Iterations, 1, 12);
        var last = result.Record[^1];
        Assert.True(last.MaxContinuityError <= 1e-10, $"continuity {last.MaxContinuityError}");
    }

    public static TheoryData<double> TransitionalHeads => new() { 0.008, 0.01, 0.012, 0.014, 0.016, 0.02 };

    [Theory]
    [MemberData(nameof(TransitionalHeads))]
    public void Solve_TransitionalPipe_CarriesTheSinglePipeFlow(double head)
    {
        // 100 m of 50 mm smooth pipe, 8 to 20 mm of head: Re 2400 to 3400. The network used a cubic blend there and
        // carried up to 10.5 % more than the single-pipe relations.
        var model = new NetworkModel([], [new("a", 10 + head), new("b", 10)], [new("p", "a", "b", 100, 0.05)], [], Nu);
        var result = NetworkSolver.Solve(model);

        double exact = SeriesFlow(head, (100, 0.05, 0));
        double re = exact / (Math.PI * 0.05 * 0.05 / 4) * 0.05 / Nu;
        Assert.InRange(re, 2000, 4000);
        Assert.True(result.Converged, result.Status.Reason());
        // The energy tolerance of 1e-10 m on 8 to 20 mm of head allows a few parts in 1e9 of the flow.
        Assert.Equal(exact, result.Pipe("p").Flow, exact * 1e-8);
        // The same flow as the single-pipe solve of the library (within the two solves' tolerances).
        var single = PipeFlow.Solve(new PipeGeometry(100, 0.05, 0, 0), new FluidProperties(Nu), head);
        Assert.Equal(single.Flow, result.Pipe("p").Flow, exact * 1e-8);
        // One transitional-flow warning, on this pipe, quoting its Reynolds number.
        var warning = Assert.Single(result.Warnings, w => w.Code == NetworkWarningCode.TransitionalFlow);
        Assert.Equal("p", warning.ElementId);
        Assert.Equal(re, warning.Value, re * 1e-8);
        Assert.Equal("transitional-flow", warning.Describe().Code);
    }

    public static TheoryData<double> Roughnesses => new() { 0, 1e-5, 1e-4, 1e-3, 1e-2, 0.05 };

    [Theory]
    [MemberData(nameof(Roughnesses))]
    public void TransitionalFriction_IsChurchillInsideAndMeetsTheNeighbouringLawsAtTheLimits(double relativeRoughness)
    {
        var join = new TransitionalFriction(relativeRoughness, FrictionOptions.Default);
        // At the limits: the laminar law and Colebrook-White (both from the reference above, the second by Brent).
        Assert.Equal(64.0 / 2000, join.Evaluate(2000).F, 1e-15);
        Assert.Equal(ReferenceFriction(4000, relativeRoughness), join.Evaluate(4000).F, 1e-12);
        // Inside the joins (2100 to 3800): Churchill's own value.
        foreach (double re in new[] { 2100.0 + 1e-9, 2500, 3000, 3500, 3800 - 1e-9 })
        {
            Assert.True(join.IsChurchill(re));
            Assert.Equal(ReferenceFriction(re, relativeRoughness), join.Evaluate(re).F, 1e-13);
        }
        // Property: h is proportional to f Re^2 at a fixed pipe, so f Re^2 must rise through the whole zone, and the
        // reported slope must be the value's derivative (central difference of the values; 1e-3 relative, since the
        // second derivative jumps at the joins, 2100 and 3800).
        double previous = 0;
        for (double re = 2000; re < 4000; re += 0.5)
        {
            var (f, d) = join.Evaluate(re);
            Assert.True(f * re * re > previous, $"f Re^2 does not rise at Re {re}");
            previous = f * re * re;
            if (re > 2001 && re < 3999)
            {
                double numeric = (join.Evaluate(re + 0.01).F - join.Evaluate(re - 0.01).F) / 0.02;
                Assert.Equal(numeric, d, Math.Abs(numeric) * 1e-3 + 1e-12);
            }
        }
    }

    [Theory]
    [InlineData(0.483)]
    [InlineData(0.816)]
    [InlineData(1.38)]
    public void Solve_GridWithHundredsOfTransitionalPipes_Converges(double multiplier)
    {
        // A 40 x 40 grid of 100 mm pipes, 50 to 150 m long, fed from two corners, with demands that leave hundreds of
        // pipes in the transition zone. Churchill's jumps at Re 2000 and 4000, unjoined, kept Newton cycling to the cap
        // (head imbalance about 1e-6 m) at these three multipliers.
        var rng = new Random(7);
        const int n = 40;
        var junctions = new List<Junction>();
        var pipes = new List<NetworkPipe>();
        for (int i = 0; i < n; i++)
            for (int k = 0; k < n; k++)
            {
                junctions.Add(new($"n{i}_{k}", 0, 4e-5 * (0.2 + rng.NextDouble())));
                if (k + 1 < n) pipes.Add(new($"h{i}_{k}", $"n{i}_{k}", $"n{i}_{k + 1}", 50 + 100 * rng.NextDouble(), 0.1, 1e-5));
                if (i + 1 < n) pipes.Add(new($"v{i}_{k}", $"n{i}_{k}", $"n{i + 1}_{k}", 50 + 100 * rng.NextDouble(), 0.1, 1e-5));
            }
        pipes.Add(new("feed", "src", "n0_0", 10, 1.0, 1e-5));
        pipes.Add(new("feed2", "src2", $"n{n - 1}_{n - 1}", 10, 1.0, 1e-5));
        var model = new NetworkModel(junctions, [new("src", 100), new("src2", 99.9)], pipes, [], Nu);

        var result = NetworkSolver.Solve(model with { Junctions = junctions.Select(j => j with { Demand = j.Demand * multiplier }).ToArray() });

        Assert.True(result.Converged, $"{result.Status} after {result.Iterations} iterations");
        Assert.InRange(result.Iterations, 1, 20);
        Assert.True(result.Warnings.Count(w => w.Code == NetworkWarningCode.TransitionalFlow) >= 100);
        NetworkChecks.AssertBalanced(model with { Junctions = junctions.Select(j => j with { Demand = j.Demand * multiplier }).ToArray() }, result, 1e-8);
    }

    [Fact]
    public void Solve_TurbulentAndLaminarPipes_HaveNoTransitionalWarning()
    {
        var model = new NetworkModel([new("j", 0, 0)], [new("upper", 11), new("lower", 10)],
            [new("narrow", "upper", "j", 100, 0.05), new("wide", "j", "lower", 1, 1)], [], Nu);
        var result = NetworkSolver.Solve(model);
        double reNarrow = result.Pipe("narrow").Flow / (Math.PI * 0.05 * 0.05 / 4) * 0.05 / Nu;
        double reWide = result.Pipe("wide").Flow / (Math.PI / 4) / Nu;
        Assert.True(reNarrow > 4000 && reWide < 2000, $"Re {reNarrow} and {reWide}");
        Assert.DoesNotContain(result.Warnings, w => w.Code == NetworkWarningCode.TransitionalFlow);
    }
}
