namespace FlowSolve.Core.Networks;

/// <summary>Extended-period runs of a network with tanks, demand patterns and controls (contract; the integrator is
/// being built).</summary>
public static class NetworkSimulator
{
    /// <summary>Checks the run's model (the network, tanks, patterns, controls, times) and lists every problem, each
    /// naming its element.</summary>
    public static IReadOnlyList<NetworkIssue> Validate(SimulationModel model) => throw new NotImplementedException();

    /// <summary>Runs the model over its duration.</summary>
    /// <exception cref="NetworkValidationException">The model is invalid.</exception>
    public static SimulationResult Run(SimulationModel model, SimulationOptions? options = null,
        CancellationToken cancellationToken = default) => throw new NotImplementedException();
}
