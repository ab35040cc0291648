using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Tests.Pipes;

/// <summary>Every sensitivity of the three pipe problems against a central difference of the same calculation
/// (a stated property), in laminar, transitional and turbulent flow, with and without minor losses.</summary>
public sealed class PipeSensitivityTests
{
    private delegate PipeState Solve(double q, double d, double l, double e, double k, double nu, double head);

    private static readonly string[] Inputs = ["flow", "diameter", "length", "roughness", "minorLossCoefficient", "kinematicViscosity", "head"];

    private static double Pick(in PipeInputDerivatives d, int i) => i switch
    {
        0 => d.Flow, 1 => d.Diameter, 2 => d.Length, 3 => d.Roughness, 4 => d.MinorLossCoefficient, 5 => d.KinematicViscosity, _ => d.Head,
    };

    private static void CheckAll(PipeSensitivities s, Solve solve, double[] x, Func<PipeState, double> answer, int skip)
    {
        (string Name, PipeInputDerivatives D, Func<PipeState, double> Read)[] outputs =
        [
            ("answer", s.Answer, answer), ("headLoss", s.HeadLoss, st => st.HeadLoss), ("velocity", s.Velocity, st => st.Velocity),
            ("reynolds", s.Reynolds, st => st.Reynolds), ("frictionFactor", s.FrictionFactor, st => st.FrictionFactor),
        ];
        foreach (var (name, d, read) in outputs)
        {
            for (int i = 0; i < Inputs.Length; i++)
            {
                if (i == skip || x[i] == 0) continue;
                int at = i;
                double F(double v)
                {
                    var y = (double[])x.Clone();
                    y[at] = v;
                    return read(solve(y[0], y[1], y[2], y[3], y[4], y[5], y[6]));
                }
                CentralDifference.Check($"d{name}/d{Inputs[i]}", Pick(d, i), F, x[i]);
            }
        }
    }

    // (flow m3/s, diameter m, length m, roughness m, K, nu m2/s): turbulent rough, turbulent with fittings,
    // transitional (Re about 3000), laminar (Re about 1000).
    public static TheoryData<double, double, double, double, double, double> States => new()
    {
        { 0.05, 0.2, 500, 2.6e-4, 0, 1.0e-6 },
        { 0.01, 0.1, 120, 4.6e-5, 3.5, 1.3e-6 },
        { 2.4e-4, 0.1, 50, 1e-5, 1.0, 1.0e-6 },
        { 2.0e-5, 0.025, 10, 1e-5, 0.5, 1.0e-6 },
    };

    [Theory]
    [MemberData(nameof(States))]
    public void HeadLoss_MatchesCentralDifferences(double q, double d, double l, double e, double k, double nu)
    {
        PipeState Run(double q1, double d1, double l1, double e1, double k1, double nu1, double _) =>
            PipeHeadLoss.Compute(new PipeGeometry(l1, d1, e1, k1), new FluidProperties(nu1), q1).State;
        var state = Run(q, d, l, e, k, nu, 0);
        var s = PipeSensitivity.HeadLoss(state, l, nu);
        CheckAll(s, Run, [q, d, l, e, k, nu, 0], st => st.HeadLoss, skip: 6);
    }

    [Theory]
    [MemberData(nameof(States))]
    public void Flow_MatchesCentralDifferences(double q, double d, double l, double e, double k, double nu)
    {
        // The head is the loss at the tabulated flow, so the answer lands in the same regime.
        double head = PipeHeadLoss.Compute(new PipeGeometry(l, d, e, k), new FluidProperties(nu), q).HeadLoss;
        PipeState Run(double _, double d1, double l1, double e1, double k1, double nu1, double h1)
        {
            var r = PipeFlow.Solve(new PipeGeometry(l1, d1, e1, k1), new FluidProperties(nu1), h1);
            Assert.Equal(PipeStatus.Solved, r.Status);
            return r.State;
        }
        var state = Run(0, d, l, e, k, nu, head);
        var s = PipeSensitivity.Flow(state, l, nu);
        Assert.Equal(0.0, s.Answer.Flow);
        CheckAll(s, Run, [q, d, l, e, k, nu, head], st => st.Flow, skip: 0);
    }

    [Theory]
    [MemberData(nameof(States))]
    public void Diameter_MatchesCentralDifferences(double q, double d, double l, double e, double k, double nu)
    {
        double head = PipeHeadLoss.Compute(new PipeGeometry(l, d, e, k), new FluidProperties(nu), q).HeadLoss;
        PipeState Run(double q1, double _, double l1, double e1, double k1, double nu1, double h1)
        {
            var r = PipeDiameter.Solve(l1, e1, k1, new FluidProperties(nu1), q1, h1);
            Assert.Equal(PipeStatus.Solved, r.Status);
            return r.State;
        }
        var state = Run(q, 0, l, e, k, nu, head);
        Assert.Equal(d, state.Diameter, d * 1e-9); // round trip: the diameter whose loss was given
        var s = PipeSensitivity.Diameter(state, l, nu);
        CheckAll(s, Run, [q, d, l, e, k, nu, head], st => st.Diameter, skip: 1);
    }
}
