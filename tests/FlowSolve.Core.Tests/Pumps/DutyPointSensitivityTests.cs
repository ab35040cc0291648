using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Tests.Pumps;

/// <summary>Duty-point sensitivities against central differences of <see cref="DutyPoint.Solve"/> (a stated property).</summary>
public sealed class DutyPointSensitivityTests
{
    // x: c0, c1, c2, c3, s, Hs, K, nu, then L, D, e, Km of each pipe.
    private static DutyPointResult Run(double[] x, int parallel, int series, int pipes)
    {
        var pump = PumpCurve.FromCoefficients(x[0], x[1], x[2], x[3], 1.5 * Math.Sqrt(x[0] / -x[2]));
        SystemCurve system;
        if (pipes == 0) system = SystemCurve.Quadratic(x[5], x[6]);
        else
        {
            var list = new PipeGeometry[pipes];
            for (int i = 0; i < pipes; i++) list[i] = new PipeGeometry(x[8 + 4 * i], x[9 + 4 * i], x[10 + 4 * i], x[11 + 4 * i]);
            system = SystemCurve.FromPipes(x[5], list, new FluidProperties(x[7]), x[6]);
        }
        var r = DutyPoint.Solve(pump, system, new PumpArrangement(parallel, series, x[4]));
        Assert.Equal(DutyStatus.Solved, r.Status);
        return r;
    }

    public static TheoryData<int, int, double[]> Cases => new()
    {
        { 1, 1, [40, 0, -5000, 0, 1.0, 15, 3000, 0] },
        { 2, 1, [40, 100, -5000, -20000, 0.9, 15, 3000, 0] },
        { 1, 2, [40, 0, -5000, 0, 1.1, 50, 2000, 0] },
        { 1, 1, [45, 20, -900, 0, 1.0, 12, 50, 1.0e-6, 400, 0.2, 4.6e-5, 3.0] },
        { 2, 1, [45, 20, -900, 0, 0.95, 12, 0, 1.3e-6, 400, 0.2, 4.6e-5, 3.0, 150, 0.15, 1.5e-4, 1.0] },
        { 1, 1, [20, 0, -1e5, 0, 1.0, 2, 0, 1.0e-4, 50, 0.05, 1e-5, 0.5] }, // an oil in laminar flow (Re about 1200)
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void At_MatchesCentralDifferences(int parallel, int series, double[] x)
    {
        int pipes = x.Length > 8 ? (x.Length - 8) / 4 : 0;
        var r = Run(x, parallel, series, pipes);
        var pump = PumpCurve.FromCoefficients(x[0], x[1], x[2], x[3], 1.5 * Math.Sqrt(x[0] / -x[2]));
        var list = new PipeGeometry[pipes];
        for (int i = 0; i < pipes; i++) list[i] = new PipeGeometry(x[8 + 4 * i], x[9 + 4 * i], x[10 + 4 * i], x[11 + 4 * i]);
        var system = pipes == 0 ? SystemCurve.Quadratic(x[5], x[6]) : SystemCurve.FromPipes(x[5], list, new FluidProperties(x[7]), x[6]);
        Span<DutyPipeDerivatives> perPipe = stackalloc DutyPipeDerivatives[pipes];
        var s = DutyPointSensitivity.At(pump, system, new PumpArrangement(parallel, series, x[4]), r.Flow, perPipe);

        var entries = new List<(string, DutyOutputDerivatives, int)>
        {
            ("c0", s.C0, 0), ("c1", s.C1, 1), ("c2", s.C2, 2), ("c3", s.C3, 3), ("speedRatio", s.SpeedRatio, 4),
            ("staticHead", s.StaticHead, 5), ("resistance", s.Resistance, 6),
        };
        if (pipes > 0) entries.Add(("kinematicViscosity", s.KinematicViscosity, 7));
        for (int i = 0; i < pipes; i++)
        {
            entries.Add(($"pipes[{i}].length", perPipe[i].Length, 8 + 4 * i));
            entries.Add(($"pipes[{i}].diameter", perPipe[i].Diameter, 9 + 4 * i));
            entries.Add(($"pipes[{i}].roughness", perPipe[i].Roughness, 10 + 4 * i));
            entries.Add(($"pipes[{i}].minorLossCoefficient", perPipe[i].MinorLossCoefficient, 11 + 4 * i));
        }
        foreach (var (name, d, i) in entries)
        {
            if (x[i] == 0 && i >= 4) continue; // a zero resistance cannot be perturbed downwards
            double F(double v, bool head) { var y = (double[])x.Clone(); y[i] = v; var rr = Run(y, parallel, series, pipes); return head ? rr.Head : rr.Flow; }
            // A coefficient that is 0 is perturbed by an absolute step scaled to the curve's size.
            double? step = x[i] == 0 ? 1e-7 * Math.Abs(x[0]) / Math.Pow(r.Flow, i) : null;
            CentralDifference.Check("dQ/d" + name, d.Flow, v => F(v, false), x[i], step);
            CentralDifference.Check("dH/d" + name, d.Head, v => F(v, true), x[i], step);
        }
    }
}
