using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Networks;

/// <summary>Why a fire-flow search at one junction stopped.</summary>
public enum FireFlowStatus
{
    /// <summary>The available flow was found: the limiting pressure head meets its limit within the tolerance.</summary>
    Solved,

    /// <summary>No answer: the junction's own pressure head is below the residual pressure head even with no draw-off.</summary>
    ResidualNotMetAtZeroDrawOff,

    /// <summary>No answer: another junction's pressure head is below the minimum pressure head even with no draw-off.</summary>
    MinimumNotMetAtZeroDrawOff,

    /// <summary>Every limit is still met at the search limit (30 m/s mean velocity in every pipe at the junction): the
    /// available flow is larger than anything the pipes could carry in practice; the figure reported is that limit.</summary>
    AboveSearchLimit,

    /// <summary>A network solve at a trial draw-off did not converge; the last converged trial is reported.</summary>
    NetworkNotSolved,

    /// <summary>The search reached its iteration cap; the last trial is reported.</summary>
    IterationCapReached,
}

/// <summary>Codes and reasons of <see cref="FireFlowStatus"/>.</summary>
public static class FireFlowStatusExtensions
{
    /// <summary>Kebab-case code for wire formats.</summary>
    /// <param name="status">The status.</param>
    public static string Code(this FireFlowStatus status) => status switch
    {
        FireFlowStatus.Solved => "solved",
        FireFlowStatus.ResidualNotMetAtZeroDrawOff => "residual-not-met-at-zero-draw-off",
        FireFlowStatus.MinimumNotMetAtZeroDrawOff => "minimum-not-met-at-zero-draw-off",
        FireFlowStatus.AboveSearchLimit => "above-search-limit",
        FireFlowStatus.NetworkNotSolved => "network-not-solved",
        _ => "iteration-cap-reached",
    };

    /// <summary>A sentence that says what the status means.</summary>
    /// <param name="status">The status.</param>
    public static string Reason(this FireFlowStatus status) => status switch
    {
        FireFlowStatus.Solved => "converged: the limiting junction's pressure head meets its limit",
        FireFlowStatus.ResidualNotMetAtZeroDrawOff => "no answer: the junction's pressure head is below the residual pressure head even with no draw-off",
        FireFlowStatus.MinimumNotMetAtZeroDrawOff => "no answer: another junction's pressure head is below the minimum pressure head even with no draw-off",
        FireFlowStatus.AboveSearchLimit => "every limit is still met at the search limit (30 m/s mean velocity in every pipe at the junction); the limit is reported",
        FireFlowStatus.NetworkNotSolved => "a network solve at a trial draw-off did not converge; the last converged trial is reported",
        _ => "the search reached its iteration cap; the last trial is reported",
    };
}

/// <summary>The limits of a fire-flow analysis.</summary>
/// <param name="ResidualPressureHead">The pressure head in m that each fire-flow junction must keep while the fire flow
/// is drawn; finite, at most <see cref="MaximumPressureHead"/> in size. 14 m (about 20 psi) is a common-practice
/// default only: local fire codes govern.</param>
/// <param name="MinimumPressureHead">When given, the pressure head in m that every other junction must keep; finite,
/// at most <see cref="MaximumPressureHead"/> in size.</param>
/// <param name="DemandMultiplier">Multiplier on every junction's demand for the background load (the first load case);
/// finite, 0 or more.</param>
public sealed record FireFlowOptions(double ResidualPressureHead = 14, double? MinimumPressureHead = null, double DemandMultiplier = 1)
{
    /// <summary>Largest size of a pressure-head limit, 10 000 m (a FlowSolve bound, as for pressure-driven demand).</summary>
    public const double MaximumPressureHead = PressureDrivenDemand.MaximumPressureHead;

    /// <summary>Mean velocity in m/s that bounds the search: the draw-off is sought below the flow that would run every
    /// pipe at the junction at 30 m/s, ten times the usual design maximum (the network solver's own step limit).</summary>
    public const double SearchVelocity = 30;

    /// <summary>Tolerance on the limiting pressure head in m (1e-6 m by default): the search stops when that junction's
    /// pressure head is this close to its limit, or when the draw-off's Newton step is below a relative 1e-12.</summary>
    public double PressureTolerance { get; init; } = 1e-6;

    /// <summary>Most network solves of one junction's search (40 by default).</summary>
    public int MaxIterations { get; init; } = 40;

    /// <summary>Most junction searches run at once, each on its own solver instance started from the same background
    /// state, so the answers are those of one search after another, in the order asked; 0 (the default) for one per
    /// processor, 1 for one after another on the calling thread.</summary>
    public int MaxParallelism { get; init; }

    /// <summary>Turns the bordered solve off, leaving the scalar search at every junction (for comparisons).</summary>
    internal bool ScalarSearchOnly { get; init; }

    /// <summary>Throws for an out-of-range field.</summary>
    /// <exception cref="ArgumentOutOfRangeException">A field is not finite or out of range.</exception>
    public void Validate()
    {
        if (!double.IsFinite(ResidualPressureHead) || Math.Abs(ResidualPressureHead) > MaximumPressureHead)
            throw new ArgumentOutOfRangeException(nameof(ResidualPressureHead), ResidualPressureHead, $"must be finite and at most {MaximumPressureHead} m in size");
        if (MinimumPressureHead is double m && (!double.IsFinite(m) || Math.Abs(m) > MaximumPressureHead))
            throw new ArgumentOutOfRangeException(nameof(MinimumPressureHead), m, $"must be finite and at most {MaximumPressureHead} m in size");
        if (!double.IsFinite(DemandMultiplier) || DemandMultiplier < 0)
            throw new ArgumentOutOfRangeException(nameof(DemandMultiplier), DemandMultiplier, "must be finite and 0 or more");
        if (!(PressureTolerance > 0) || !double.IsFinite(PressureTolerance))
            throw new ArgumentOutOfRangeException(nameof(PressureTolerance), PressureTolerance, "must be finite and positive");
        ArgumentOutOfRangeException.ThrowIfLessThan(MaxIterations, 1);
        ArgumentOutOfRangeException.ThrowIfNegative(MaxParallelism);
    }
}

/// <summary>The fire flow available at one junction.</summary>
/// <param name="Id">The fire-flow junction.</param>
/// <param name="AvailableFlow">The largest draw-off in m3/s, on top of the background demands, at which every limit
/// holds; 0 when there is no answer.</param>
/// <param name="PressureHead">The junction's own pressure head in m at that draw-off.</param>
/// <param name="LimitingJunction">The junction whose pressure head sets the limit: the fire-flow junction itself
/// (residual pressure head) or another junction (minimum pressure head).</param>
/// <param name="LimitingPressureHead">The limiting junction's pressure head in m at that draw-off.</param>
/// <param name="Iterations">Network solves of the search (each warm-started from the one before); a bordered solve,
/// which finds the draw-off together with the network, counts as one.</param>
/// <param name="NetworkIterations">Newton iterations of those network solves, summed.</param>
/// <param name="Status">Why the search stopped.</param>
public readonly record struct FireFlowResult(
    string Id, double AvailableFlow, double PressureHead, string LimitingJunction, double LimitingPressureHead,
    int Iterations, int NetworkIterations, FireFlowStatus Status)
{
    /// <summary>True when the available flow was found (<see cref="FireFlowStatus.Solved"/>).</summary>
    public bool Converged => Status == FireFlowStatus.Solved;
}

/// <summary>A fire-flow analysis: the background solve and one result per fire-flow junction, in the order asked.</summary>
/// <param name="Background">The network solved with the background demands and no draw-off.</param>
/// <param name="Junctions">One result per junction asked; empty when the background solve has no answer.</param>
public sealed record FireFlowReport(NetworkResult Background, IReadOnlyList<FireFlowResult> Junctions);

/// <summary>
/// Fire flow: at each junction asked, the largest draw-off Q, on top of the background demands, at which the junction's
/// own pressure head stays at or above the residual pressure head and, when a minimum pressure head is given, every
/// other junction's stays at or above that.
/// </summary>
/// <remarks>
/// <para>Each junction's answer is a scalar root. Every pressure head p_c(Q) falls as the draw-off grows (more water
/// drawn through the same pipes; common practice, and a property the tests check), so the available flow is the
/// smallest Q at which any constrained pressure head reaches its limit, the root of R(Q) = max_c r_c(Q) with one term
/// per constraint c (the junction itself against the residual, each other junction against the minimum). The term is
/// taken in the variable that makes it nearly linear: with the margin m_c = p_c(0) - limit_c and the drop
/// D_c(Q) = p_c(0) - p_c(Q), r_c = sqrt(D_c) - sqrt(m_c), because head losses grow about as the square of the flow
/// (Darcy-Weisbach in turbulent flow), so sqrt(D_c) is about proportional to Q, and Newton's method on it converges in
/// a few steps where in p itself it would overshoot (p is concave in Q). The term that is largest at the root is the
/// limiting junction.</para>
/// <para>R is evaluated by a full network solve with the draw-off added at the junction (<see cref="NetworkSolver"/>,
/// a fixed demand whatever the pressure, also under pressure-driven demand), warm-started from the solve before and
/// moved first along the tangent (the predictor saves one factorisation a trial). Its derivative comes from the
/// network's own Jacobian: dp/dQ = -(A^-1 e_k)_c, one more solve with the factor of the head equations the network solve
/// already holds, which gives every junction's derivative at once. The root is found by <see cref="SafeguardedNewton"/>
/// on the bracket (0, Q_max), R(0) &lt; 0, with Q_max the flow that would run every pipe at the junction at
/// <see cref="FireFlowOptions.SearchVelocity"/>; it starts from the smaller of the draw-off that the background's
/// tangent predicts would reach the first limit and 1.5 m/s in those pipes (a FlowSolve choice; the answer does not
/// depend on it). Each junction's search starts from the background solution.</para>
/// <para>The bordered solve. A demand-driven network without control valves, solved with the direct head solver (the
/// default), takes a faster way to the same root: the draw-off becomes an unknown of one network solve, with the pressure
/// head of one constrained junction held at its limit as the extra equation (<see cref="NetworkSolver"/>'s bordered
/// Newton iteration: one factorisation and two triangular solves an iteration), so that the network and the draw-off
/// converge together instead of a network solve per trial. The junction itself is held first; when another junction is
/// then below its minimum, the most broken one is held next, warm-started from the last solve; since every pressure
/// head falls as the draw-off grows, the draw-off falls from solve to solve, and when every limit holds (to
/// <see cref="FireFlowOptions.PressureTolerance"/>) the junction held is the first to reach its limit and its draw-off is
/// the answer. The solve starts from the background moved along a tangent of the network at fire-flow scale (every
/// pipe's flow raised to at least 1.5 m/s in one factorisation kept for the whole analysis) to a draw-off estimated from
/// the drop there. Its answer meets the network's tolerances at the draw-off found and holds the limiting pressure head
/// to rounding; any solve that does not converge, or a draw-off beyond the search limit, hands the junction to the
/// scalar search above, unchanged.</para>
/// <para>Junctions are searched in parallel (<see cref="FireFlowOptions.MaxParallelism"/>), each worker on its own
/// solver started from the same background state: every answer is the one a search one after another gives, in the
/// order asked.</para>
/// <para>The results are engineering estimates to be checked by a qualified engineer; a fire-flow figure does not
/// replace a hydrant flow test, and local fire codes govern the residual pressure.</para>
/// </remarks>
public static class FireFlow
{
    /// <summary>Mean velocity in m/s of the first trial draw-off in the junction's pipes (a FlowSolve choice).</summary>
    private const double StartVelocity = 1.5;

    /// <summary>The junctions fire flow is sought at by default: every junction with a positive demand, in model order.</summary>
    /// <param name="model">The network.</param>
    public static IReadOnlyList<string> DefaultJunctions(NetworkModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var ids = new List<string>();
        foreach (var j in model.Junctions) if (j.Demand > 0) ids.Add(j.Id);
        return ids;
    }

    /// <summary>Finds the fire flow available at each junction of <paramref name="junctions"/>.</summary>
    /// <param name="model">The network.</param>
    /// <param name="junctions">Junction ids, each at most once; <see cref="DefaultJunctions"/> when null.</param>
    /// <param name="options">The limits; <c>new FireFlowOptions()</c> (14 m residual, no minimum) when null.</param>
    /// <param name="networkOptions">The network solver's options; <see cref="NetworkOptions.Default"/> when null.</param>
    /// <param name="cancellation">Checked before every network solve.</param>
    /// <returns>The background solve and one result per junction; a junction with no answer is a status, not an exception.</returns>
    /// <exception cref="NetworkValidationException">The model is invalid.</exception>
    /// <exception cref="ArgumentException">A junction id is unknown or repeated.</exception>
    /// <exception cref="ArgumentOutOfRangeException">An option is out of range.</exception>
    /// <exception cref="OperationCanceledException">The cancellation was requested.</exception>
    public static FireFlowReport Solve(NetworkModel model, IReadOnlyList<string>? junctions = null, FireFlowOptions? options = null,
        NetworkOptions? networkOptions = null, CancellationToken cancellation = default)
    {
        ArgumentNullException.ThrowIfNull(model);
        options ??= new FireFlowOptions();
        options.Validate();
        var solver = new NetworkSolver(model, networkOptions);
        junctions ??= DefaultJunctions(model);
        var index = new int[junctions.Count];
        var seen = new HashSet<int>();
        for (int i = 0; i < index.Length; i++)
        {
            int k = junctions[i] is { } id ? solver.JunctionIndex(id) : -1;
            if (k < 0) throw new ArgumentException($"'{junctions[i]}' is not a junction of the network", nameof(junctions));
            if (!seen.Add(k)) throw new ArgumentException($"junction '{junctions[i]}' is listed more than once", nameof(junctions));
            index[i] = k;
        }

        cancellation.ThrowIfCancellationRequested();
        var background = solver.SolveCase(options.DemandMultiplier);
        if (!background.Converged) return new FireFlowReport(background, []);

        var search = new Search(model, solver, options, cancellation);
        var results = new FireFlowResult[index.Length];
        // The first trial of every junction from the background's tangent, while the background's factor is held.
        var start = new double[index.Length];
        // Under the bordered solve only a junction that falls back to the scalar search needs it (computed then).
        if (search.IsBordered) Array.Fill(start, double.NaN);
        else for (int i = 0; i < index.Length; i++) start[i] = search.FirstTrial(index[i]);
        search.KeepStartFactor();
        int workers = Math.Min(options.MaxParallelism > 0 ? options.MaxParallelism : Environment.ProcessorCount, index.Length);
        if (workers <= 1)
        {
            for (int i = 0; i < index.Length; i++) results[i] = search.Run(index[i], start[i]);
            return new FireFlowReport(background, results);
        }
        // Each worker takes the next junction not yet taken, on its own solver started from the same background state,
        // and writes its answer in that junction's place: the answers do not depend on which worker found them. The
        // workers fill the cores, so each solver keeps to one.
        solver.UseOneCore();
        var workerOptions = (networkOptions ?? NetworkOptions.Default) with { MaxParallelism = 1 };
        int next = -1;
        try
        {
            Parallel.For(0, workers, new ParallelOptions { MaxDegreeOfParallelism = workers }, w =>
            {
                var own = w == 0 ? search : search.Fork(workerOptions);
                for (int i = Interlocked.Increment(ref next); i < index.Length; i = Interlocked.Increment(ref next))
                    results[i] = own.Run(index[i], start[i]);
            });
        }
        catch (AggregateException e) when (e.InnerExceptions.Count > 0)
        {
            // The caller sees the first worker's exception itself (a cancellation, as on one thread).
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(e.InnerExceptions[0]);
        }
        return new FireFlowReport(background, results);
    }

    /// <summary>One analysis's state: the solver, the background, and the present junction's search.</summary>
    private sealed class Search
    {
        private readonly NetworkModel _model;
        private readonly NetworkSolver _solver;
        private readonly FireFlowOptions _options;
        private readonly CancellationToken _cancellation;
        private readonly NetworkSolver.DrawOffState _background, _lastGood;
        private readonly double[] _backgroundPressure, _margin, _slope, _goodSlope;
        private readonly double[] _pipeArea; // per junction: the sum of the areas of the pipes (and pumps' equivalents) at it
        private readonly bool _minimum;
        private readonly bool _bordered; // the bordered solve applies (NetworkSolver.CanHoldPressure)
        private bool _keptFactor;        // the solver holds the bordered solves' start factor (KeepStartFactor)

        // The present junction's search.
        private int _k;
        private double _goodFlow;
        private bool _haveGood;
        private int _solves, _networkIterations;
        private bool _failed;
        private int _limiting;
        private double _limitingPressure, _ownPressure;

        public Search(NetworkModel model, NetworkSolver solver, FireFlowOptions options, CancellationToken cancellation)
            : this(model, solver, options, cancellation, solver.SaveState(), null, null)
        {
        }

        private Search(NetworkModel model, NetworkSolver solver, FireFlowOptions options, CancellationToken cancellation,
            NetworkSolver.DrawOffState background, double[]? backgroundPressure, double[]? pipeArea)
        {
            _model = model;
            _solver = solver;
            _options = options;
            _cancellation = cancellation;
            int n = solver.JunctionCount;
            _background = background;
            _lastGood = new NetworkSolver.DrawOffState();
            _margin = new double[n];
            _slope = new double[n];
            _goodSlope = new double[n];
            _minimum = options.MinimumPressureHead is not null;
            _bordered = solver.CanHoldPressure && !options.ScalarSearchOnly;
            if (backgroundPressure is not null && pipeArea is not null)
            {
                _backgroundPressure = backgroundPressure;
                _pipeArea = pipeArea;
                return;
            }
            _backgroundPressure = new double[n];
            for (int j = 0; j < n; j++) _backgroundPressure[j] = solver.PressureHead(j);
            _pipeArea = new double[n];
            var nodes = new Dictionary<string, int>(StringComparer.Ordinal);
            for (int j = 0; j < n; j++) nodes[model.Junctions[j].Id] = j;
            foreach (var p in model.Pipes)
            {
                if (p.Closed) continue;
                double a = 0.25 * Math.PI * p.Diameter * p.Diameter;
                if (nodes.TryGetValue(p.From, out int f)) _pipeArea[f] += a;
                if (nodes.TryGetValue(p.To, out int t)) _pipeArea[t] += a;
            }
            foreach (var p in model.Pumps)
            {
                // A pump's equivalent: the area that carries its zero-head flow at the search velocity.
                double a = Math.Max(p.SpeedRatio, 1e-3) * (p.Curve.ZeroHeadFlow ?? p.Curve.SearchLimit) / FireFlowOptions.SearchVelocity;
                if (nodes.TryGetValue(p.From, out int f)) _pipeArea[f] += a;
                if (nodes.TryGetValue(p.To, out int t)) _pipeArea[t] += a;
            }
        }

        /// <summary>A search on a solver of its own, started from this one's background state (for another worker);
        /// the background's figures are shared, read only.</summary>
        public Search Fork(NetworkOptions? networkOptions)
        {
            var solver = new NetworkSolver(_model, networkOptions);
            solver.RestoreState(_background);
            var fork = new Search(_model, solver, _options, _cancellation, _background, _backgroundPressure, _pipeArea);
            if (_keptFactor) fork.KeepStartFactor();
            return fork;
        }

        private double Limit(int j) => j == _k ? _options.ResidualPressureHead : _options.MinimumPressureHead!.Value;

        /// <summary>The first trial draw-off at junction k: the smaller of the draw-off at which the background's tangent
        /// reaches the first limit (an upper estimate, the drops being convex in Q) and 1.5 m/s in the junction's pipes.</summary>
        public double FirstTrial(int k)
        {
            _k = k;
            double byVelocity = StartVelocity * _pipeArea[k];
            if (!_solver.DrawOffSensitivity(k, _slope)) return byVelocity;
            double tangent = double.PositiveInfinity;
            for (int j = 0; j < _slope.Length; j++)
            {
                if (j != k && !_minimum) continue;
                double margin = _backgroundPressure[j] - Limit(j);
                if (margin > 0 && _slope[j] < 0) tangent = Math.Min(tangent, margin / -_slope[j]);
            }
            return Math.Min(tangent, byVelocity);
        }

        public FireFlowResult Run(int k, double firstTrial)
        {
            _k = k;
            string id = _model.Junctions[k].Id;
            int n = _margin.Length;
            // The margins with no draw-off: a limit already broken there is no answer, a limit just met is a zero flow.
            double smallest = double.PositiveInfinity, largest = 0;
            int tightest = k;
            for (int j = 0; j < n; j++)
            {
                if (j != k && !_minimum) continue;
                double m = _backgroundPressure[j] - Limit(j);
                _margin[j] = m;
                if (m < smallest || (m == smallest && j == k)) { smallest = m; tightest = j; }
                largest = Math.Max(largest, m);
            }
            double own = _backgroundPressure[k];
            if (_margin[k] < 0)
                return new FireFlowResult(id, 0, own, id, own, 0, 0, FireFlowStatus.ResidualNotMetAtZeroDrawOff);
            if (smallest < 0)
                return new FireFlowResult(id, 0, own, _model.Junctions[tightest].Id, _backgroundPressure[tightest], 0, 0, FireFlowStatus.MinimumNotMetAtZeroDrawOff);
            if (smallest == 0)
                return new FireFlowResult(id, 0, own, _model.Junctions[tightest].Id, _backgroundPressure[tightest], 0, 0, FireFlowStatus.Solved);

            double cap = FireFlowOptions.SearchVelocity * _pipeArea[k];
            if (!(cap > 0) || !double.IsFinite(cap)) cap = 1;
            if (_bordered && Bordered(id, cap) is { } found) return found;

            _solver.RestoreState(_background);
            if (double.IsNaN(firstTrial))
            {
                // The background's factor, refreshed from the background state as before the first search.
                firstTrial = FirstTrial(k);
                _solver.RestoreState(_background);
            }
            _haveGood = false;
            _failed = false;
            _solves = _networkIterations = 0;
            double guess = firstTrial > 0 && firstTrial < cap ? firstTrial : 0.05 * cap;

            // Stop when the limiting pressure head is within the tolerance of its limit: |dR| = |dp| / (2 sqrt(D)), and
            // D = m_c at the root, so a residual of tol / (2 sqrt(largest margin)) keeps every junction's |dp| <= tol.
            var solverOptions = new SolverOptions(0, 1e-12, _options.PressureTolerance / (2 * Math.Sqrt(largest)), _options.MaxIterations);
            var root = SafeguardedNewton.Solve(new Residual(this), Bracket.KnownIncreasing(0, cap), guess, solverOptions);

            var status = root.Status switch
            {
                SolveStatus.ConvergedOnResidual or SolveStatus.ConvergedOnStep => FireFlowStatus.Solved,
                SolveStatus.NonFiniteValue => FireFlowStatus.NetworkNotSolved,
                _ => FireFlowStatus.IterationCapReached,
            };
            if (_failed && _haveGood)
            {
                // Report the last converged trial: the state and figures are those of _goodFlow.
                _solver.RestoreState(_lastGood);
                Record(_goodSlope);
                return new FireFlowResult(id, _goodFlow, _ownPressure, _model.Junctions[_limiting].Id, _limitingPressure,
                    _solves, _networkIterations, FireFlowStatus.NetworkNotSolved);
            }
            if (_failed)
                return new FireFlowResult(id, 0, own, id, own, _solves, _networkIterations, FireFlowStatus.NetworkNotSolved);
            // Converged on a step at the upper end with every limit still met: the flow is beyond the search limit.
            if (status == FireFlowStatus.Solved && root.Residual < 0 && root.Root >= (1 - 1e-6) * cap)
                status = FireFlowStatus.AboveSearchLimit;
            return new FireFlowResult(id, root.Root, _ownPressure, _model.Junctions[_limiting].Id, _limitingPressure,
                _solves, _networkIterations, status);
        }

        /// <summary>The available flow by bordered solves (<see cref="NetworkSolver.SolveHeldPressure"/>): the draw-off
        /// found with one constrained junction's pressure head held at its limit, starting with the junction itself; when
        /// another constraint is then broken, the solve is repeated with the most broken one held (largest term r_c),
        /// warm-started from the last. Each pressure head falls as the draw-off grows, so a constraint broken at the
        /// present draw-off reaches its limit at a smaller one, and the draw-off falls from solve to solve; when every
        /// constraint holds (to the pressure tolerance), the one held reaches its limit first, and its draw-off is the
        /// answer. Null (the scalar search takes over) when a solve does not converge, the draw-off found is not
        /// within (0, cap), or the limit on solves is reached.</summary>
        private FireFlowResult? Bordered(string id, double cap)
        {
            const int MaxHeldSolves = 8; // a FlowSolve choice: the limiting junction is usually the first or second held
            int k = _k, held = k, solves = 0, iterations = 0;
            double tolerance = _options.PressureTolerance;
            _solver.RestoreState(_background);
            double drawOff = _keptFactor ? FirstDrawOff(k) : 0;
            while (solves < MaxHeldSolves)
            {
                _cancellation.ThrowIfCancellationRequested();
                double heldHead = _solver.Elevation(held) + Limit(held);
                var solve = _solver.SolveHeldPressure(_options.DemandMultiplier, k, drawOff, held, heldHead, tolerance);
                solves++;
                iterations += solve.Iterations;
                if (!solve.Converged) return null;
                drawOff = _solver.StateDrawOff;
                if (!(drawOff > 0) || !(drawOff < cap)) return null;
                int broken = -1;
                double worst = double.NegativeInfinity;
                for (int j = 0; j < _margin.Length; j++)
                {
                    if (j != k && !_minimum) continue;
                    double p = _solver.PressureHead(j);
                    if (j == held || p >= Limit(j) - tolerance) continue;
                    double term = Math.Sqrt(Math.Max(_backgroundPressure[j] - p, 0)) - Math.Sqrt(_margin[j]);
                    if (term > worst) { worst = term; broken = j; }
                }
                if (broken < 0)
                    return new FireFlowResult(id, drawOff, _solver.PressureHead(k), _model.Junctions[held].Id,
                        _solver.PressureHead(held), solves, iterations, FireFlowStatus.Solved);
                held = broken;
            }
            return null;
        }

        /// <summary>True when the bordered solve applies (else every junction takes the scalar search).</summary>
        public bool IsBordered => _bordered;

        /// <summary>Keeps the factor the bordered solves start from: the head equations at the background state with
        /// every open pipe's flow raised to at least <see cref="StartVelocity"/> (see <see cref="FirstDrawOff"/>).</summary>
        public void KeepStartFactor()
        {
            if (!_bordered) return;
            _solver.RestoreState(_background);
            _keptFactor = _solver.KeepFactor(StartVelocity);
            _solver.RestoreState(_background);
        }

        /// <summary>The bordered solve's start at junction k: the state moved from the background along a tangent to a
        /// draw-off estimated from it. The tangent w = dH/dQ comes from the kept factor (one triangular solve), the head
        /// equations with every pipe's flow raised to at least 1.5 m/s: the scale of a fire flow near the junction rather
        /// than the background's small flows, whose laminar conductances would send too much of the draw-off through
        /// lightly used pipes (on the 10 000-pipe benchmark grid, 7.8 Newton iterations a junction against 8.4 from the
        /// background's own tangent). The draw-off at which the tangent meets the margin, Q_t, is a first trial; the
        /// junction's drop there is estimated by <see cref="NetworkSolver.DropAlong"/> (one evaluation of the links),
        /// and the start is Q_t sqrt(margin / drop), the draw-off at which a drop growing as the square of the flow
        /// reaches the margin. Returns the draw-off the state stands at (0 when it stayed at the background).</summary>
        private double FirstDrawOff(int k)
        {
            _solver.RestoreKeptFactor();
            if (!_solver.DrawOffSensitivity(k, _slope)) return Restart();
            double a = -_slope[k], margin = _margin[k];
            if (!(a > 0) || !double.IsFinite(a)) return Restart();
            double q = margin / a;
            double moved = _solver.MoveAlongTangent(_slope, q);
            if (moved > 0)
            {
                double drop = _solver.DropAlong(_slope, _background);
                double next = moved * Math.Sqrt(margin / drop);
                if (drop > 0 && next > 0 && double.IsFinite(next)) q = next;
            }
            _solver.RestoreState(_background);
            double taken = _solver.MoveAlongTangent(_slope, q);
            return taken > 0 ? taken : Restart();

            double Restart()
            {
                _solver.RestoreState(_background);
                return 0;
            }
        }

        /// <summary>R(Q) and dR/dQ by a network solve with the draw-off Q at the present junction.</summary>
        public (double Value, double Derivative) Evaluate(double q)
        {
            _cancellation.ThrowIfCancellationRequested();
            if (_failed) return (double.NaN, double.NaN);
            // Move along the tangent from the last converged trial (its factor is held), then solve.
            if (_haveGood) _solver.PredictDrawOff(_goodSlope, q - _goodFlow);
            var solve = _solver.SolveDrawOff(_options.DemandMultiplier, _k, q);
            _solves++;
            _networkIterations += solve.Iterations;
            if (!solve.Converged || !_solver.DrawOffSensitivity(_k, _slope))
            {
                _failed = true;
                return (double.NaN, double.NaN);
            }
            _goodFlow = q;
            _haveGood = true;
            _slope.CopyTo(_goodSlope, 0);
            _solver.SaveState(_lastGood);
            return Record(_slope);
        }

        /// <summary>The largest term r_c at the present state, its derivative, and the limiting junction.</summary>
        private (double Value, double Derivative) Record(double[] slope)
        {
            int n = _margin.Length;
            double best = double.NegativeInfinity, derivative = double.NaN;
            int limiting = _k;
            for (int j = 0; j < n; j++)
            {
                if (j != _k && !_minimum) continue;
                double p = _solver.PressureHead(j);
                double drop = Math.Max(_backgroundPressure[j] - p, 0);
                double root = Math.Sqrt(drop);
                double r = root - Math.Sqrt(_margin[j]);
                if (r > best || (r == best && j == _k))
                {
                    best = r;
                    limiting = j;
                    // d sqrt(D)/dQ = -(dp/dQ) / (2 sqrt(D)); infinite at D = 0 (the solver bisects there).
                    derivative = root > 0 ? -slope[j] / (2 * root) : double.PositiveInfinity;
                }
            }
            _limiting = limiting;
            _limitingPressure = _solver.PressureHead(limiting);
            _ownPressure = _solver.PressureHead(_k);
            return (best, derivative);
        }
    }

    /// <summary>R(Q) for <see cref="SafeguardedNewton"/>: each evaluation is a network solve.</summary>
    private readonly struct Residual : IDifferentiableFunction
    {
        private readonly Search _search;

        public Residual(Search search) => _search = search;

        public (double Value, double Derivative) Evaluate(double x) => _search.Evaluate(x);
    }
}
