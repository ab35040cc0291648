using CsCheck;
using FlowSolve.Core.Networks;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;
using static FlowSolve.Core.Tests.Networks.NetworkChecks;

namespace FlowSolve.Core.Tests.Networks;

// Pumps that cannot lift (issue 9): a pump is a non-return link on its curve, and no iterate may run away.
public sealed partial class NetworkSolverTests
{
    private static NetworkModel LiftModel(double lift, PumpCurve curve, double diameter = 0.2, double speed = 1,
        double inLength = 10, double outLength = 400, double minorLoss = 0) =>
        Model([new("suction", 0, 0), new("delivery", 0, 0)], [new("sump", 0), new("tank", lift)],
            [new("in", "sump", "suction", inLength, diameter, 0.05e-3, MinorLossCoefficient: minorLoss),
             new("out", "delivery", "tank", outLength, diameter, 0.05e-3, MinorLossCoefficient: minorLoss)],
            [new NetworkPump("pump", "suction", "delivery", curve, speed)]);

    [Theory]
    [InlineData(-5000.0)]
    [InlineData(-500.0)]
    [InlineData(-50.0)]
    public void Solve_PumpOfHalfTheLift_StopsInsteadOfDiverging(double c2)
    {
        // Shut-off head 20 m against a static lift of 40 m through 200 mm pipes: H(Q) <= 20 < 40 for every forward flow,
        // so no duty point exists. Before the fix the first Newton pass drove the pump backwards until the Reynolds number
        // passed 1e15 (an exception) or the iteration cap was reached with reverse flows of 1e5 m3/s and more.
        var model = LiftModel(40, PumpCurve.FromCoefficients(20, 0, c2));
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.PumpCannotLift, result.Status);
        Assert.Equal(LinkStatus.PumpOff, result.Pump("pump").Status);
        Assert.Equal(0.0, result.Pump("pump").Flow);
        Assert.Equal(["pump"], result.PumpsUnableToLift);
        Assert.Contains(result.Warnings, w => w.ElementId == "pump" && w.Code == NetworkWarningCode.PumpCannotLift);
        Assert.Equal(40, result.Pump("pump").Head, 1e-6); // with no flow the tank's head stands across the stopped pump
        Assert.InRange(result.Iterations, 1, 30);
        foreach (var step in result.Record) Assert.True(step.MaxFlowChange < 10, $"iteration {step.Iteration}: flow change {step.MaxFlowChange} m3/s");
        AssertBalanced(model, result);
    }

    [Fact]
    public void Solve_AbsurdDemand_EndsWithFlowsOutOfRangeNotAnException()
    {
        // 1e12 m3/s through a 100 mm pipe is a Reynolds number of 4Q/(pi D nu), about 1e19, beyond the 1e15 that the
        // friction relations accept: the solve must say so with a status.
        var model = Model([new("j", 0, 1e12)], [new("r", 50)], [new("p", "r", "j", 100, 0.1, 0.05e-3)]);
        var result = NetworkSolver.Solve(model);
        Assert.Equal(NetworkStatus.FlowsOutOfRange, result.Status);
        Assert.False(result.Converged);
        Assert.Equal("flows-out-of-range", result.Status.Code());
        Assert.True(double.IsNaN(result.Pipe("p").FrictionFactor)); // no friction factor exists there
    }

    [Fact]
    public void SolveCases_PumpLiftsOnlyUnderHighDemand_StatusPerCase()
    {
        // A pump (shut-off 35 m) from a sump at 0 m boosts into junction "d", which feeds the town through a short main;
        // a tank at 40 m also feeds the town through 1 km of 150 mm pipe. With the pump off no flow passes "d", so the
        // head at the pump's delivery is the town's head, 40 m - hf(tank main, town demand): the pump can lift exactly
        // when that is below 35 m. hf is recomputed independently (Colebrook-White through FlowSolve.Core.Pipes).
        var curve = PumpCurve.FromCoefficients(35, 0, -2000);
        var model = Model([new("suction", 0, 0), new("d", 0, 0), new("town", 0, 0.02)], [new("sump", 0), new("tank", 40)],
        [
            new("in", "sump", "suction", 10, 0.2, 0.05e-3), new("link", "d", "town", 50, 0.2, 0.05e-3),
            new("main", "tank", "town", 1000, 0.15, 0.05e-3),
        ],
            [new NetworkPump("pump", "suction", "d", curve)]);
        double[] multipliers = [0.2, 1.5, 0.5, 2.0, 0.1];
        var results = new NetworkSolver(model).SolveCases(multipliers);
        for (int i = 0; i < multipliers.Length; i++)
        {
            double demand = 0.02 * multipliers[i];
            double headWithPumpOff = 40 - IndependentHeadLoss(model.Pipes[2], Water, demand);
            var r = results[i];
            var scaled = model with { Junctions = model.Junctions.Select(j => j with { Demand = j.Demand * multipliers[i] }).ToArray() };
            Assert.True(Math.Abs(headWithPumpOff - 35) > 1, $"case {i}: too close to shut-off for a clear expectation");
            if (headWithPumpOff > 35)
            {
                Assert.Equal(NetworkStatus.PumpCannotLift, r.Status);
                Assert.Equal(["pump"], r.PumpsUnableToLift);
                Assert.Equal(LinkStatus.PumpOff, r.Pump("pump").Status);
                Assert.Equal(headWithPumpOff, r.Pump("pump").Head, 1e-6);
            }
            else
            {
                Assert.Equal(NetworkStatus.Solved, r.Status);
                Assert.Empty(r.PumpsUnableToLift);
                Assert.Equal(LinkStatus.Open, r.Pump("pump").Status);
                Assert.True(r.Pump("pump").Flow > 0);
            }
            AssertBalanced(scaled, r);
        }
        Assert.Contains(results, r => r.Status == NetworkStatus.Solved);
        Assert.Contains(results, r => r.Status == NetworkStatus.PumpCannotLift);
    }

    [Fact]
    public void Solve_RandomShutOffAndLift_StopsOrMeetsTheDutyPoint()
    {
        // One pump H = s^2 c0 + c2 Q^2 between two reservoirs. Property: never an exception; PumpCannotLift when the
        // shut-off head s^2 c0 is below the lift by more than 0.1 m, Solved with the pump on its curve and energy and
        // continuity balanced to 1e-9 when it is above by as much. With 1 um pipes (friction f L/D below 1e-6 of the
        // minor loss K) the system is lift + K Q^2 with K = sum Km/(2 g A^2), and the duty point has the closed form
        // Q^2 = (s^2 c0 - lift)/(K - c2) (algebra), checked to 1e-5 relative.
        var gen = Gen.Select(Gen.Double[2, 100], Gen.Double[0, 150], Gen.Double[-20000, -20], Gen.Double[0.5, 1.3])
            .SelectMany((c0, lift, c2, s) => Gen.Select(Gen.Double[0.08, 0.5], Gen.Double[1, 50], Gen.Bool, Gen.Double[1, 3000])
                .Select((d, km, shortPipes, length) => (c0, lift, c2, s, d, km, shortPipes, length)));
        gen.Sample(t =>
        {
            var (c0, lift, c2, s, d, km, shortPipes, length) = t;
            double shutOff = s * s * c0;
            if (Math.Abs(shutOff - lift) < 0.1) return;
            double l = shortPipes ? 1e-6 : length;
            var model = LiftModel(lift, PumpCurve.FromCoefficients(c0, 0, c2), d, s, l, l, km);
            var result = NetworkSolver.Solve(model);
            if (shutOff < lift)
            {
                Assert.Equal(NetworkStatus.PumpCannotLift, result.Status);
                Assert.Equal(["pump"], result.PumpsUnableToLift);
                Assert.Equal(0.0, result.Pump("pump").Flow);
                Assert.Equal(lift, result.Pump("pump").Head, 1e-6);
            }
            else
            {
                Assert.Equal(NetworkStatus.Solved, result.Status);
                Assert.Equal(LinkStatus.Open, result.Pump("pump").Status);
                if (shortPipes)
                {
                    double area = 0.25 * Math.PI * d * d, k = 2 * km / (2 * Physical.StandardGravity * area * area);
                    double q = Math.Sqrt((shutOff - lift) / (k - c2));
                    Assert.True(Math.Abs(result.Pump("pump").Flow - q) <= 1e-5 * q, $"flow {result.Pump("pump").Flow} vs closed form {q}");
                }
            }
            AssertBalanced(model, result);
        }, iter: 1000);
    }
}
