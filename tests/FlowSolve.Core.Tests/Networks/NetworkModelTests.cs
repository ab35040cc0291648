using FlowSolve.Core.Networks;

namespace FlowSolve.Core.Tests.Networks;

public sealed class NetworkModelTests
{
    private static NetworkModel Valid() => new(
        [new Junction("j1", 0, 0.01), new Junction("j2", 0, 0.01)], [new Reservoir("r", 50)],
        [new NetworkPipe("p1", "r", "j1", 100, 0.2), new NetworkPipe("p2", "j1", "j2", 100, 0.2, HazenWilliamsC: 120)], [], 1e-6);

    [Fact]
    public void Validate_ValidModel_HasNoIssues() => Assert.Empty(Valid().Validate());

    // (model change, offending id, code): each stated rule of the model (the issue's list), one at a time.
    public static TheoryData<string, string, string> Broken => new()
    {
        { "unknown-node", "p2", "unknown-node" },
        { "duplicate-node", "j1", "duplicate-id" },
        { "duplicate-link", "p1", "duplicate-id" },
        { "self-loop", "p2", "self-loop" },
        { "zero-length", "p1", "non-positive-length" },
        { "negative-length", "p2", "non-positive-length" },
        { "roughness-above-diameter", "p1", "bad-roughness" },
        { "bad-c", "p2", "bad-hazen-williams-c" },
        { "bad-k", "p1", "bad-minor-loss" },
    };

    [Theory]
    [MemberData(nameof(Broken))]
    public void Validate_BrokenModel_NamesTheElement(string change, string id, string code)
    {
        var m = Valid();
        var pipes = m.Pipes.ToArray();
        var junctions = m.Junctions.ToArray();
        switch (change)
        {
            case "unknown-node": pipes[1] = pipes[1] with { To = "nowhere" }; break;
            case "duplicate-node": junctions[1] = junctions[1] with { Id = "j1" }; break;
            case "duplicate-link": pipes[1] = pipes[1] with { Id = "p1" }; break;
            case "self-loop": pipes[1] = pipes[1] with { To = "j1" }; break;
            case "zero-length": pipes[0] = pipes[0] with { Length = 0 }; break;
            case "negative-length": pipes[1] = pipes[1] with { Length = -5 }; break;
            case "roughness-above-diameter": pipes[0] = pipes[0] with { Roughness = 0.3 }; break;
            case "bad-c": pipes[1] = pipes[1] with { HazenWilliamsC = 0 }; break;
            case "bad-k": pipes[0] = pipes[0] with { MinorLossCoefficient = -1 }; break;
        }
        var broken = m with { Pipes = pipes, Junctions = junctions };
        var issue = Assert.Single(broken.Validate(), i => i.Code == code);
        Assert.Equal(id, issue.ElementId);
        Assert.Contains($"'{id}'", issue.Message);
        var thrown = Assert.Throws<NetworkValidationException>(() => new NetworkSolver(broken));
        Assert.Contains(thrown.Issues, i => i.ElementId == id && i.Code == code);
    }

    [Fact]
    public void Validate_BadViscosityAndSpeed_AreReported()
    {
        var m = Valid() with
        {
            KinematicViscosity = 0,
            Pumps = [new NetworkPump("pu", "j1", "j2", FlowSolve.Core.Pumps.PumpCurve.FromCoefficients(30, 0, -1000), 2.0)],
        };
        var issues = m.Validate();
        Assert.Contains(issues, i => i.Code == "bad-viscosity");
        Assert.Contains(issues, i => i.ElementId == "pu" && i.Code == "bad-speed-ratio");
    }
}
