using FlowSolve.Core.Friction;
using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Tests.Networks;

/// <summary>Independent checks of a network result: continuity at every junction and energy on every link (so around
/// every loop), each recomputed from the reported flows with the pipe relations of FlowSolve.Core.Pipes; and each
/// junction's delivery: its whole demand in a demand-driven solve, under pressure-driven demand the law of Wagner,
/// Shamir and Marks (1988) written out in <see cref="DenseNetworkReference.Delivered"/>, at the reported pressure, to
/// 1e-9 of the demand.</summary>
internal static class NetworkChecks
{
    public static void AssertBalanced(NetworkModel model, NetworkResult result, double tolerance = 1e-9)
    {
        Assert.True(result.Converged, result.Status.Reason());
        var net = new Dictionary<string, double>();
        foreach (var j in model.Junctions)
        {
            var r = result.Junction(j.Id);
            if (model.DemandModel is { } law)
            {
                double expected = DenseNetworkReference.Delivered(r.Demand, r.PressureHead, law.MinimumPressureHead, law.RequiredPressureHead, law.Exponent);
                Assert.True(Math.Abs(r.DeliveredDemand - expected) <= 1e-9 * Math.Abs(r.Demand),
                    $"law at {j.Id}: delivered {r.DeliveredDemand} at pressure head {r.PressureHead}, the law gives {expected}");
            }
            else Assert.Equal(r.Demand, r.DeliveredDemand);
            net[j.Id] = -r.DeliveredDemand;
        }
        void Flow(string from, string to, double q)
        {
            if (net.ContainsKey(from)) net[from] -= q;
            if (net.ContainsKey(to)) net[to] += q;
        }
        foreach (var p in model.Pipes) Flow(p.From, p.To, result.Pipe(p.Id).Flow);
        foreach (var p in model.Pumps) Flow(p.From, p.To, result.Pump(p.Id).Flow);
        foreach (var (id, error) in net) Assert.True(Math.Abs(error) <= tolerance, $"continuity at {id}: {error}");

        foreach (var p in model.Pipes)
        {
            var r = result.Pipe(p.Id);
            double across = Head(result, p.From) - Head(result, p.To);
            if (r.Status != LinkStatus.Open)
            {
                Assert.Equal(0.0, r.Flow);
                continue;
            }
            double expected = IndependentHeadLoss(p, model.KinematicViscosity, r.Flow);
            Assert.True(Math.Abs(across - expected) <= tolerance, $"energy on {p.Id}: {across} vs {expected}");
        }
        foreach (var p in model.Pumps)
        {
            var r = result.Pump(p.Id);
            if (r.Status != LinkStatus.Open) { Assert.Equal(0.0, r.Flow); continue; }
            double added = DutyPoint.SetHead(p.Curve, PumpArrangement.InSeries(1, p.SpeedRatio), r.Flow);
            double rise = Head(result, p.To) - Head(result, p.From);
            Assert.True(Math.Abs(rise - added) <= tolerance, $"energy on {p.Id}: {rise} vs {added}");
        }
    }

    /// <summary>Sum of signed head losses around a loop given as (pipe id, +1 along the pipe's direction or -1).</summary>
    public static double LoopSum(NetworkModel model, NetworkResult result, params (string Pipe, int Sign)[] loop)
    {
        double sum = 0;
        foreach (var (id, sign) in loop)
        {
            var p = model.Pipes.First(x => x.Id == id);
            sum += sign * IndependentHeadLoss(p, model.KinematicViscosity, result.Pipe(id).Flow);
        }
        return sum;
    }

    public static double IndependentHeadLoss(NetworkPipe p, double nu, double flow)
    {
        if (flow == 0) return 0;
        var geometry = new PipeGeometry(p.Length, p.Diameter, p.HazenWilliamsC is null ? p.Roughness : 0, p.MinorLossCoefficient);
        double area = 0.25 * Math.PI * p.Diameter * p.Diameter, v = Math.Abs(flow) / area, re = v * p.Diameter / nu;
        double h;
        if (p.HazenWilliamsC is double c)
            h = HazenWilliams.HeadLoss(geometry, new FluidProperties(nu), Math.Abs(flow), c).HeadLoss;
        else if (re >= 2000 && re < 4000)
        {
            // The network's transition zone: Churchill (1977), joined to 64/Re and Colebrook-White by a cubic within 5 %
            // of each limit (TransitionalFriction, itself checked against Churchill and Brent in NetworkEdgeCaseTests).
            double f = new TransitionalFriction(p.Roughness / p.Diameter, FrictionOptions.Default).Evaluate(re).F;
            h = (f * p.Length / p.Diameter + p.MinorLossCoefficient) * v * v / (2 * Physical.StandardGravity);
        }
        else
            h = PipeHeadLoss.Compute(geometry, new FluidProperties(nu), Math.Abs(flow)).HeadLoss;
        return Math.CopySign(h, flow);
    }

    public static double Head(NetworkResult result, string node) =>
        result.Junctions.Any(j => j.Id == node) ? result.Junction(node).Head : result.Reservoir(node).Head;
}
