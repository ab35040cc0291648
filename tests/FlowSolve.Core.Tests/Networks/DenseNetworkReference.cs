using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using MathNet.Numerics.LinearAlgebra.Double;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>
/// An independent reference for small networks of pipes under pressure-driven demand: plain Newton on the full
/// equations (every link's flow and every junction's head as unknowns), the Jacobian by central differences, each step
/// solved densely by MathNet.Numerics' LU factorisation and halved while it does not reduce the sum of squared
/// residuals. The relations are written out here from their sources: Darcy-Weisbach with Colebrook-White (1939) solved
/// by MathNet's Brent (<see cref="NetworkEdgeCaseTests.ReferenceFriction"/>), the SI velocity form of Hazen-Williams
/// (V = 0.849 C R^0.63 S^0.54, common practice), and the law of Wagner, Shamir and Marks (1988, from memory):
/// q = d ((p - min)/(req - min))^e between the two heads, 0 below, d above, d itself for d &lt;= 0. Nothing from the
/// network solver is used: not its start, its formulation, its linear algebra or its law.
/// </summary>
internal static class DenseNetworkReference
{
    /// <summary>Law heads under which every demand is delivered in full at any finite pressure (demand-driven).</summary>
    public const double DemandDrivenMinimum = -1e301, DemandDrivenRequired = -1e300;

    /// <summary>The law, written out (the test's own).</summary>
    public static double Delivered(double demand, double pressureHead, double min, double req, double exponent)
    {
        if (!(demand > 0)) return demand;
        if (pressureHead <= min) return 0;
        if (pressureHead >= req) return demand;
        return demand * Math.Pow((pressureHead - min) / (req - min), exponent);
    }

    /// <summary>Signed head loss of a pipe at flow <paramref name="q"/>: Darcy-Weisbach with the friction factor of the
    /// single-pipe rules, or Hazen-Williams; plus the minor losses K V^2/(2g).</summary>
    public static double HeadLoss(NetworkPipe p, double nu, double q)
    {
        if (q == 0) return 0;
        double a = Math.PI * p.Diameter * p.Diameter / 4, v = Math.Abs(q) / a;
        double h;
        if (p.HazenWilliamsC is double c)
            h = p.Length * Math.Pow(v / (0.849 * c * Math.Pow(p.Diameter / 4, 0.63)), 1 / 0.54);
        else
        {
            // 64/Re, Churchill (1977) or Colebrook-White; the tests keep every answer's Reynolds numbers above 4200, clear
            // of the transition zone, where the network solver joins the relations differently (NetworkEdgeCaseTests).
            double re = Math.Max(v * p.Diameter / nu, 1e-12);
            double f = NetworkEdgeCaseTests.ReferenceFriction(re, p.Roughness / p.Diameter);
            h = f * p.Length / p.Diameter * v * v / (2 * Physical.StandardGravity);
        }
        h += p.MinorLossCoefficient * v * v / (2 * Physical.StandardGravity);
        return Math.CopySign(h, q);
    }

    /// <summary>Solves the network (pipes only, all open) with every demand times <paramref name="multiplier"/>, plus
    /// a fixed draw-off at one junction when <paramref name="drawOff"/> is given (a demand that does not follow the law).
    /// Demand-driven: pass <see cref="DemandDrivenMinimum"/> and <see cref="DemandDrivenRequired"/> as the law's heads.</summary>
    /// <returns>Flows in pipe order, heads in junction order, deliveries in junction order, and the largest residual
    /// (energy in m, continuity in m3/s) at the answer.</returns>
    public static (double[] Flows, double[] Heads, double[] Delivered, double Residual) Solve(
        NetworkModel model, double min, double req, double exponent, double multiplier = 1, (int Junction, double Flow)? drawOff = null)
    {
        int l = model.Pipes.Count, n = model.Junctions.Count;
        var junction = new Dictionary<string, int>();
        for (int j = 0; j < n; j++) junction[model.Junctions[j].Id] = j;
        var fixedHead = model.Reservoirs.ToDictionary(r => r.Id, r => r.Head);
        double start = model.Reservoirs.Max(r => r.Head);

        double Head(double[] x, string node) => junction.TryGetValue(node, out int j) ? x[l + j] : fixedHead[node];

        double[] Residual(double[] x)
        {
            var f = new double[l + n];
            for (int k = 0; k < l; k++)
            {
                var p = model.Pipes[k];
                f[k] = Head(x, p.From) - Head(x, p.To) - HeadLoss(p, model.KinematicViscosity, x[k]);
            }
            for (int j = 0; j < n; j++)
            {
                var jn = model.Junctions[j];
                f[l + j] = -Delivered(jn.Demand * multiplier, x[l + j] - jn.Elevation, min, req, exponent);
            }
            if (drawOff is { } d) f[l + d.Junction] -= d.Flow;
            for (int k = 0; k < l; k++)
            {
                var p = model.Pipes[k];
                if (junction.TryGetValue(p.From, out int a)) f[l + a] -= x[k];
                if (junction.TryGetValue(p.To, out int b)) f[l + b] += x[k];
            }
            return f;
        }

        // Continuity weighted by 1000 s/m2 in the merit, so that 1 mm of head and 1 l/s count alike.
        double Merit(double[] f)
        {
            double s = 0;
            for (int i = 0; i < f.Length; i++) { double w = i < l ? f[i] : 1000 * f[i]; s += w * w; }
            return s;
        }

        var x = new double[l + n];
        for (int k = 0; k < l; k++) x[k] = 0.3 * Math.PI * model.Pipes[k].Diameter * model.Pipes[k].Diameter / 4;
        for (int j = 0; j < n; j++) x[l + j] = start;
        var fx = Residual(x);
        for (int iteration = 0; iteration < 200; iteration++)
        {
            double largest = fx.Max(Math.Abs);
            if (largest < 1e-13) break;
            var jacobian = new DenseMatrix(l + n, l + n);
            for (int i = 0; i < l + n; i++)
            {
                double h = 1e-7 * Math.Max(Math.Abs(x[i]), i < l ? 1e-3 : 1);
                var up = (double[])x.Clone();
                var down = (double[])x.Clone();
                up[i] += h;
                down[i] -= h;
                var fu = Residual(up);
                var fd = Residual(down);
                for (int r = 0; r < l + n; r++) jacobian[r, i] = (fu[r] - fd[r]) / (2 * h);
            }
            var step = jacobian.Solve(DenseVector.OfArray(fx.Select(v => -v).ToArray()));
            double alpha = 1, merit = Merit(fx);
            double[] next = x, fn = fx;
            for (int halving = 0; halving < 30; halving++)
            {
                next = x.Select((v, i) => v + alpha * step[i]).ToArray();
                fn = Residual(next);
                if (Merit(fn) < merit) break;
                alpha *= 0.5;
            }
            if (next.SequenceEqual(x)) break;
            x = next;
            fx = fn;
        }
        var delivered = new double[n];
        for (int j = 0; j < n; j++)
        {
            var jn = model.Junctions[j];
            delivered[j] = Delivered(jn.Demand * multiplier, x[l + j] - jn.Elevation, min, req, exponent);
        }
        return (x[..l], x[l..], delivered, fx.Max(Math.Abs));
    }
}
