using Prometheus;

namespace FlowSolve.Api.Hosting;

/// <summary>A response that came from a solve: what the solver metrics read, without serialising the response.</summary>
public interface ISolveSummary : IWarned
{
    int Iterations { get; }
    bool Converged { get; }
}

/// <summary>
/// Prometheus metrics at <c>/metrics</c> (prometheus-net): HTTP requests, latency histogram and status codes from its
/// middleware, plus solver iterations, non-converged solves and batch rows from FlowSolve.
/// </summary>
/// <remarks>No exemplars: the library would otherwise attach the current trace to every observation, reading a shared
/// clock under a lock on each request (about a third of a spreadsheet cell's handler time in a CPU profile under load),
/// and nothing here reads them.</remarks>
public static class SolverMetrics
{
    public static readonly Histogram Iterations = Prometheus.Metrics.CreateHistogram(
        "flowsolve_solver_iterations", "Solver iterations per calculation.",
        new HistogramConfiguration
        {
            LabelNames = ["calculation"], Buckets = [0, 1, 2, 3, 4, 5, 6, 8, 10, 15, 20, 30, 50, 100],
            ExemplarBehavior = ExemplarBehavior.NoExemplars(),
        });

    public static readonly Counter NotConverged = Prometheus.Metrics.CreateCounter(
        "flowsolve_solver_not_converged_total", "Calculations whose solve did not converge.",
        new CounterConfiguration { LabelNames = ["calculation"], ExemplarBehavior = ExemplarBehavior.NoExemplars() });

    public static readonly Counter BatchRows = Prometheus.Metrics.CreateCounter(
        "flowsolve_batch_rows_total", "Rows processed by batch requests.",
        new CounterConfiguration { LabelNames = ["calculation", "outcome"], ExemplarBehavior = ExemplarBehavior.NoExemplars() });

    /// <summary>One calculation's solver metrics, with the labelled series looked up once rather than per request.</summary>
    public sealed class For(string calculation)
    {
        private readonly Histogram.Child _iterations = Iterations.WithLabels(calculation);
        private readonly Lazy<Counter.Child> _notConverged = new(() => NotConverged.WithLabels(calculation));

        public void Record(object? value)
        {
            if (value is not ISolveSummary s) return;
            _iterations.Observe(s.Iterations);
            if (!s.Converged) _notConverged.Value.Inc();
        }
    }

    public static WebApplication UseFlowSolveMetrics(this WebApplication app)
    {
        app.UseHttpMetrics(o =>
        {
            o.ReduceStatusCodeCardinality();
            o.RequestCount.ExemplarPredicate = static _ => false;
            o.RequestDuration.ExemplarPredicate = static _ => false;
        });
        app.MapMetrics("/metrics");
        return app;
    }
}
