using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using MathNet.Numerics.LinearAlgebra.Double;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>
/// An independent reference for small networks of pipes and control valves, with every valve's state given: plain
/// Newton on the full equations (every pipe's and valve's flow and every junction's head as unknowns), the Jacobian by
/// central differences, each step solved densely by MathNet.Numerics' LU factorisation and halved while it does not
/// reduce the sum of squared residuals. Each valve contributes the one equation its state stands for, written out here:
/// open, H_from - H_to = K Q|Q|/(2 g A^2); closed, Q = 0; active pressure-reducing, H_to = z_to + setting; active
/// pressure-sustaining, H_from = z_from + setting; active flow-control, Q = setting; a throttle, the open law with K the
/// setting. Pipes use <see cref="DenseNetworkReference.HeadLoss"/> (Colebrook-White by MathNet's Brent), demands under
/// pressure-driven demand <see cref="DenseNetworkReference.Delivered"/>. Nothing of the network solver is used: not its
/// start, formulation, linear algebra, valve model or state search. The states found by the solver are then checked for
/// consistency by <see cref="AssertStatesConsistent"/>.
/// </summary>
internal static class DenseValveReference
{
    /// <summary>Open valve's loss K Q|Q|/(2 g A^2).</summary>
    public static double OpenLoss(ControlValve v, double q)
    {
        double a = Math.PI * v.Diameter * v.Diameter / 4;
        double k = v.Type == ControlValveType.Throttle ? v.Setting : v.MinorLossCoefficient;
        return k * q * Math.Abs(q) / (2 * Physical.StandardGravity * a * a);
    }

    /// <summary>Solves with the valve states given (in valve order).</summary>
    /// <returns>Flows by link id (pipes and valves), heads by junction id, and the largest residual at the answer.</returns>
    public static (Dictionary<string, double> Flows, Dictionary<string, double> Heads, double Residual) Solve(
        NetworkModel model, ValveState[] states, double multiplier = 1)
    {
        var pipes = model.Pipes;
        var valves = model.Valves;
        int np = pipes.Count, nv = valves.Count, l = np + nv, n = model.Junctions.Count;
        var junction = new Dictionary<string, int>();
        for (int j = 0; j < n; j++) junction[model.Junctions[j].Id] = j;
        var elevation = model.Junctions.ToDictionary(j => j.Id, j => j.Elevation);
        var fixedHead = model.Reservoirs.ToDictionary(r => r.Id, r => r.Head);
        double start = model.Reservoirs.Max(r => r.Head);
        var law = model.DemandModel;

        double Head(double[] x, string node) => junction.TryGetValue(node, out int j) ? x[l + j] : fixedHead[node];

        double[] Residual(double[] x)
        {
            var f = new double[l + n];
            for (int k = 0; k < np; k++)
                f[k] = Head(x, pipes[k].From) - Head(x, pipes[k].To) - DenseNetworkReference.HeadLoss(pipes[k], model.KinematicViscosity, x[k]);
            for (int k = 0; k < nv; k++)
            {
                var v = valves[k];
                double q = x[np + k];
                f[np + k] = (v.Type, states[k]) switch
                {
                    (_, ValveState.Closed) => q,
                    (ControlValveType.PressureReducing, ValveState.Active) => Head(x, v.To) - elevation[v.To] - v.Setting,
                    (ControlValveType.PressureSustaining, ValveState.Active) => Head(x, v.From) - elevation[v.From] - v.Setting,
                    (ControlValveType.FlowControl, ValveState.Active) => 1000 * (q - v.Setting),
                    _ => Head(x, v.From) - Head(x, v.To) - OpenLoss(v, q),
                };
            }
            for (int j = 0; j < n; j++)
            {
                var jn = model.Junctions[j];
                double d = jn.Demand * multiplier;
                f[l + j] = law is null ? -d : -DenseNetworkReference.Delivered(d, x[l + j] - jn.Elevation, law.MinimumPressureHead, law.RequiredPressureHead, law.Exponent);
            }
            void Flow(string from, string to, double q)
            {
                if (junction.TryGetValue(from, out int a)) f[l + a] -= q;
                if (junction.TryGetValue(to, out int b)) f[l + b] += q;
            }
            for (int k = 0; k < np; k++) Flow(pipes[k].From, pipes[k].To, x[k]);
            for (int k = 0; k < nv; k++) Flow(valves[k].From, valves[k].To, x[np + k]);
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
        for (int k = 0; k < np; k++) x[k] = 0.3 * Math.PI * pipes[k].Diameter * pipes[k].Diameter / 4;
        for (int k = 0; k < nv; k++) x[np + k] = 0.3 * Math.PI * valves[k].Diameter * valves[k].Diameter / 4;
        for (int j = 0; j < n; j++) x[l + j] = start;
        var fx = Residual(x);
        for (int iteration = 0; iteration < 300; iteration++)
        {
            if (fx.Max(Math.Abs) < 1e-13) break;
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
        var flows = new Dictionary<string, double>();
        for (int k = 0; k < np; k++) flows[pipes[k].Id] = x[k];
        for (int k = 0; k < nv; k++) flows[valves[k].Id] = x[np + k];
        var heads = new Dictionary<string, double>();
        for (int j = 0; j < n; j++) heads[model.Junctions[j].Id] = x[l + j];
        return (flows, heads, fx.Max(Math.Abs));
    }

    /// <summary>The stated meaning of each state, checked on a result: an active valve throttles (its head loss is at
    /// least the open loss) and passes forward flow; an open one carries forward flow and does not violate its setting;
    /// a closed one has no forward head that could open it usefully. Margins: 1e-6 m of head and 1e-9 m3/s of flow.</summary>
    public static void AssertStatesConsistent(NetworkModel model, NetworkResult result)
    {
        const double dh = 1e-6, dq = 1e-9;
        foreach (var v in model.Valves)
        {
            var r = result.Valve(v.Id);
            double hf = NetworkChecks.Head(result, v.From), ht = NetworkChecks.Head(result, v.To);
            string at = $"{v.Id} ({v.Type}, {r.State}): Q {r.Flow}, H_from {hf}, H_to {ht}";
            double Pressure(string node) => NetworkChecks.Head(result, node) - model.Junctions.First(j => j.Id == node).Elevation;
            switch (v.Type, r.State)
            {
                case (ControlValveType.Throttle, _):
                    Assert.Equal(ValveState.Active, r.State);
                    Assert.True(Math.Abs(hf - ht - OpenLoss(v, r.Flow)) < dh, at);
                    break;
                case (_, ValveState.Closed):
                    Assert.Equal(0.0, r.Flow);
                    if (v.Type == ControlValveType.PressureReducing)
                        Assert.True(hf <= ht + dh || Pressure(v.To) >= v.Setting - dh, at);
                    else if (v.Type == ControlValveType.PressureSustaining)
                        Assert.True(hf <= ht + dh || Pressure(v.From) <= v.Setting + dh, at);
                    else Assert.True(hf <= ht + dh, at);
                    break;
                case (_, ValveState.Open):
                    Assert.True(r.Flow >= -dq, at);
                    Assert.True(Math.Abs(hf - ht - OpenLoss(v, r.Flow)) < dh, at);
                    if (v.Type == ControlValveType.PressureReducing) Assert.True(Pressure(v.To) <= v.Setting + dh, at);
                    if (v.Type == ControlValveType.PressureSustaining) Assert.True(Pressure(v.From) >= v.Setting - dh, at);
                    if (v.Type == ControlValveType.FlowControl) Assert.True(r.Flow <= v.Setting + dq, at);
                    break;
                default: // active
                    Assert.True(r.Flow >= -dq, at);
                    Assert.True(hf - ht >= OpenLoss(v, r.Flow) - dh, at);
                    if (v.Type == ControlValveType.PressureReducing) Assert.Equal(v.Setting, Pressure(v.To), 9);
                    if (v.Type == ControlValveType.PressureSustaining) Assert.Equal(v.Setting, Pressure(v.From), 9);
                    if (v.Type == ControlValveType.FlowControl) Assert.Equal(v.Setting, r.Flow, 12);
                    break;
            }
        }
    }
}
