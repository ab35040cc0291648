using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Core.Networks;

/// <summary>
/// Steady flows and heads of a looped pipe network by the global gradient algorithm: Newton's method on the coupled
/// energy and continuity equations of the whole network (Todini and Pilati 1988).
/// </summary>
/// <remarks>
/// <para>Equations. For each open link l from node i to node j, energy: H_i - H_j = h_l(Q_l), with h the Darcy-Weisbach
/// loss of the single-pipe routes (<see cref="PipeHeadLoss.WithDerivative"/>: 64/Re below Re 2000, exact Colebrook-White
/// from 4000; in the transition zone Churchill (1977), joined continuously to both within 5 % of each limit by
/// <see cref="TransitionalFriction"/>, with a <see cref="NetworkWarningCode.TransitionalFlow"/> warning) or
/// the Hazen-Williams loss, or minus a pump's head
/// s^2 H(Q/s). For each junction n, continuity: sum of inflows - sum of outflows = demand_n. Linearising the energy
/// equation at the current flows with g_l = dh/dQ gives Q'_l = y_l + (H'_i - H'_j)/g_l, y_l = Q_l - h_l/g_l; putting
/// that into continuity leaves the Schur complement A21 D^-1 A12 H' = b in the junction heads alone, a weighted graph
/// Laplacian (weights 1/g_l) plus the links to reservoirs on its diagonal: sparse, symmetric and positive definite
/// when every part of the network reaches a reservoir. It is solved for the head corrections, so that the flows keep
/// full precision however large the heads; new flows follow link by link, and meet continuity exactly (to the linear
/// solve's residual) after every iteration. The iteration stops when every imbalance is within its tolerance, or within
/// what a double resolves at that link's or junction's scale where the tolerance is finer (see
/// <see cref="NetworkOptions.HeadTolerance"/>).</para>
/// <para>Quadratic convergence needs the true derivative: for Darcy-Weisbach g includes the friction factor's
/// dependence on the flow through df/dRe (Simpson and Elhay 2011, J. Hydraul. Eng. 137(6)). Near Q = 0 the laminar law
/// keeps g positive; Hazen-Williams (whose g vanishes at 0) is replaced below <see cref="NetworkOptions.RegularisationVelocity"/>
/// by an odd cubic with matching value and slope (after Elhay and Simpson 2011, J. Hydraul. Eng. 137(10)); a pump's g
/// is floored at a small positive value, and below zero flow its curve is continued by H(0) + H'(0) x + C0 (x/qRef)^2
/// (head rising as the flow reverses), since the polynomial there (a quadratic's head falls again) would give the link a
/// negative slope and, floored, a near-infinite conductance that drives the iteration away.</para>
/// <para>Safeguards: a Newton step that would change a link's flow by more than 30 m/s times its area (a pump: its
/// speed times its zero-head flow) or twice its present flow is shortened, heads and flows by the same fraction; an
/// iterate beyond the friction relations' Reynolds number 1e15 ends the solve with
/// <see cref="NetworkStatus.FlowsOutOfRange"/>. No finite input makes the solve throw.</para>
/// <para>Linear algebra (<see cref="NetworkOptions.LinearSolver"/>): by default a direct sparse Cholesky factorisation
/// (<see cref="SparseCholesky"/>) whose nested-dissection ordering and symbolic analysis run once per network, since the
/// pattern never changes across Newton iterations and load cases; each iteration refactorises in place and solves, with
/// iterative refinement if the residual exceeds the tolerance. Alternatively conjugate gradients with an incomplete
/// Cholesky preconditioner (<see cref="SymmetricSparseSolver"/>), warm-started from the current heads, which needs less
/// memory but hundreds of iterations a step on large grids. Either way the buffers are allocated once and reused.</para>
/// <para>Statuses: check valves and pumps are held fixed during a Newton solve; then a check valve carrying reverse
/// flow closes, a closed one with forward head opens, a pump driven backwards stops (for a curve falling from shut-off,
/// exactly when the head across it exceeds its shut-off head), a stopped one whose shut-off head exceeds the head across
/// it restarts, and the solve runs again from where it stood, up to
/// <see cref="NetworkOptions.MaxStatusPasses"/> times. A closed link carries exactly zero flow; in the head system it
/// keeps a vanishing conductance (1e-14 m2/s) so that a junction it isolates still has a defined head.</para>
/// <para>Pressure-driven demand (<see cref="NetworkModel.DemandModel"/>): a junction with a positive demand d receives
/// q = d r(p) (Wagner, Shamir and Marks 1988), and the problem has exactly one solution (Elhay, Piller, Deuerlein and
/// Simpson 2016, J. Water Resour. Plann. Manage. 142(2), from memory). The law, flat parts included, is one increasing
/// curve in the plane of the scaled pressure s = (p - min)/(req - min) and the fraction delivered x = q/d, and each such
/// junction's unknown is its position u = s + x along that curve (<see cref="PressureDrivenDemand.GraphPoint"/>), in
/// which both s and x move at rates between 0 and 1: nothing is unbounded, although r'(s) = e s^(e-1) is at s = 0 for
/// e &lt; 1 and the inverse law's slope is at x = 0 for e &gt; 1, and the flat parts (nothing delivered, everything
/// delivered) need no special states. The junction adds one equation, H - z - min = (req - min) s(u), and its delivery
/// d x(u) enters continuity; linearised along the curve's tangent, the delivery is q + c (F + dH) with F the equation's
/// imbalance and c = (d/(req - min)) dx/ds: a link from the junction to the fixed level z + min, which adds c to the
/// junction's diagonal of the head equations (continuity's -dq/dH moved to the left-hand side), keeping them
/// symmetric positive definite, as in the gradient formulation of Todini (2003) and Giustolisi, Savic and Kapelan
/// (2008) (from memory); the position follows as du = (F + dH)/(req - min) + dq/d. A vertical tangent (e &lt; 1 at
/// s = 0) is taken as dx/ds = 1e6: a bound of the Jacobian only, not of the law. The first <see cref="FreeSteps"/>
/// steps of a solve are taken in full, as in a demand-driven solve; later ones are safeguarded by a backtracking line
/// search (<see cref="LineSearch"/>), so that the iteration cannot cycle across the law's corners. Only a state that
/// meets the tolerances with the exact law is reported converged: besides F, continuity is judged with d r(p) at the
/// junction's head, which is the delivery reported. A closed link does not pull at the heads of its ends here (see
/// <see cref="Step"/>). A demand-driven solve runs none of this and takes the same steps as before pressure-driven
/// demand was added.</para>
/// <para>An instance keeps its state between solves (warm start) and is not thread-safe; the static methods create
/// their own instance. The results are engineering estimates to be checked by a qualified engineer.</para>
/// </remarks>
public sealed partial class NetworkSolver
{
    private const double ClosedConductance = 1e-14;
    private const double InitialVelocity = 0.3; // m/s, a usual start for the global gradient algorithm (common practice)
    // A Newton step that changes a pipe's flow by more than this velocity times its area (a pump's by its speed times its
    // curve's zero-head flow), or any link's by more than twice its present flow, is shortened; ten times the usual
    // design maximum, so a well-posed network never meets the limit after its first steps (a FlowSolve choice).
    private const double StepVelocity = 30;

    private enum Kind : byte { Darcy, Hazen, Pump, Valve }

    private readonly NetworkModel _model;
    private readonly NetworkOptions _options;
    private readonly int _junctions, _reservoirs, _pipes, _pumpEnd, _links; // links: pipes, then pumps up to _pumpEnd, then valves

    private readonly int[] _from, _to;
    private readonly Kind[] _kind;
    private readonly PipeGeometry[] _geometry;
    private readonly double[] _area, _hazenConstant, _minorConstant;
    private readonly bool[] _checkValve;
    private readonly PumpCurve[] _curve;      // by pump: link l is pump l - _pipes
    private readonly double[] _speed, _pumpSlopeFloor, _reverseCurvature;
    private readonly double[] _stepLimit;     // m3/s: the largest flow change of one Newton step before it is shortened
    private readonly TransitionalFriction[] _joins; // the transition zone's joined relations, one per relative roughness
    private readonly int[] _joinOf;                   // Darcy pipes: the index of theirs in _joins
    private readonly double[] _baseDemand, _demand, _elevation;

    private readonly LinkStatus[] _status;
    private readonly double[] _flow, _headLoss, _slope, _y, _conductance;
    private readonly double[] _head;       // all nodes; reservoirs hold their fixed head
    private readonly double[] _rhs, _x, _continuity, _residual;
    private readonly double[] _imbalance;  // per link: H_from - H_to - h(Q) at the current iterate (closed: H_from - H_to)
    private readonly double[] _nodeScale;  // per junction: |demand| + sum of |Q| of its links, for the continuity floor
    private bool _outOfRange; // an iterate's Reynolds number left the friction relations' range
    // The friction pass: Darcy pipes in turbulent flow, gathered each evaluation and solved as one span.
    private int _frictionParts;                        // parts of the friction pass run side by side (1: one core)
    private ParallelOptions? _parallel;
    private readonly int[] _turbulentLink;
    private readonly double[] _turbulentReynolds, _turbulentRoughness, _turbulentVelocity, _turbulentFriction;

    // Pressure-driven demand (null and empty arrays for a demand-driven model, whose _delivered is _demand itself).
    private readonly PressureDrivenDemand? _law;
    private readonly double[] _delivered;       // per junction: the flow drawn off in continuity
    private readonly bool[] _onLaw;             // per junction: its delivery follows the law (a positive demand)
    private readonly double[] _position;        // on-law junctions: u = s + x, the position along the law's graph
    private readonly double[] _graphPressure;   // on-law junctions: s(u), the scaled pressure of the graph point
    private readonly double[] _graphGood;       // on-law junctions: the graph point's coordinate solved for (x for e <= 1, s else)
    private readonly double[] _outletConductance; // on-law junctions: dq/dH along the graph's tangent, m2/s (capped)
    private readonly double[] _outletImbalance; // on-law junctions: H - z - min - (req - min) s(u), m
    private readonly double[] _lawDelivery;     // per junction: d r(p) by the exact law at the current head
    private readonly double[] _lawFloor;        // per junction: what rounding of the head can change in d r(p), m3/s
    private readonly int[] _diagJunction;       // per junction: its diagonal's position in the head equations' values
    // The line search: the step's start and the full step from it.
    private readonly double[] _startHead, _startFlow, _startPosition, _stepHead, _stepFlow, _stepPosition;
    private double _startMerit;
    // Newton steps of each solve taken in full before the line search engages (the global gradient algorithm's early
    // iterates are not monotone in any residual, and cutting them only slows it), the halvings of a step before the full
    // step is taken after all, and Armijo's fraction of the decrease the step predicts (FlowSolve choices, from trials on
    // generated networks: see docs/networks.md).
    private const int FreeSteps = 5, LineSearchHalvings = 10;
    private const double SufficientDecrease = 1e-4;

    private readonly SymmetricSparseSolver? _iterative;  // NetworkLinearSolver.ConjugateGradient
    private readonly SparseCholesky? _direct;            // NetworkLinearSolver.SparseCholesky
    private readonly int[] _diagFrom, _diagTo, _offFromTo, _offToFrom;
    private string[] _unsupplied; // recomputed by a timeline when its fixed heads or shut links change
    private readonly IReadOnlyDictionary<string, int> _linkIndex, _nodeIndex;
    private bool _warm;

    /// <summary>Validates the model and prepares every buffer and the sparsity pattern of the head equations.</summary>
    /// <param name="model">The network.</param>
    /// <param name="options">Tolerances and limits; <see cref="NetworkOptions.Default"/> when omitted.</param>
    /// <exception cref="NetworkValidationException">The model is invalid; <see cref="NetworkValidationException.Issues"/>
    /// names each offending element.</exception>
    /// <exception cref="ArgumentOutOfRangeException">An option is out of range.</exception>
    public NetworkSolver(NetworkModel model, NetworkOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(model);
        var issues = model.Validate();
        if (issues.Count > 0) throw new NetworkValidationException(issues);
        _options = options ?? NetworkOptions.Default;
        _options.Validate();
        _model = model;

        _junctions = model.Junctions.Count;
        _reservoirs = model.Reservoirs.Count;
        _pipes = model.Pipes.Count;
        _pumpEnd = _pipes + model.Pumps.Count;
        _links = _pumpEnd + model.Valves.Count;
        int nodes = _junctions + _reservoirs;

        var nodeIndex = new Dictionary<string, int>(nodes, StringComparer.Ordinal);
        _baseDemand = new double[_junctions];
        _demand = new double[_junctions];
        _elevation = new double[_junctions];
        _head = new double[nodes];
        for (int j = 0; j < _junctions; j++)
        {
            var junction = model.Junctions[j];
            nodeIndex[junction.Id] = j;
            _baseDemand[j] = junction.Demand;
            _elevation[j] = junction.Elevation;
        }
        for (int r = 0; r < _reservoirs; r++)
        {
            nodeIndex[model.Reservoirs[r].Id] = ~r;
            _head[_junctions + r] = model.Reservoirs[r].Head;
        }
        _nodeIndex = nodeIndex;
        int Node(string id) { int k = nodeIndex[id]; return k >= 0 ? k : _junctions + ~k; }

        _from = new int[_links];
        _to = new int[_links];
        _kind = new Kind[_links];
        _geometry = new PipeGeometry[_links];
        _area = new double[_links];
        _hazenConstant = new double[_links];
        _minorConstant = new double[_links];
        _checkValve = new bool[_links];
        _curve = new PumpCurve[model.Pumps.Count];
        _speed = new double[_links];
        _pumpSlopeFloor = new double[_links];
        _reverseCurvature = new double[_links];
        _stepLimit = new double[_links];
        _status = new LinkStatus[_links];
        _joinOf = new int[_pipes];
        var joins = new Dictionary<double, int>();
        var joinList = new List<TransitionalFriction>();
        var linkIndex = new Dictionary<string, int>(_links, StringComparer.Ordinal);
        double g = Physical.StandardGravity;
        for (int l = 0; l < _pipes; l++)
        {
            var p = model.Pipes[l];
            linkIndex[p.Id] = l;
            _from[l] = Node(p.From);
            _to[l] = Node(p.To);
            double area = 0.25 * Math.PI * p.Diameter * p.Diameter;
            _area[l] = area;
            _minorConstant[l] = p.MinorLossCoefficient / (2 * g * area * area);
            _stepLimit[l] = StepVelocity * area;
            _checkValve[l] = p.CheckValve;
            if (p.HazenWilliamsC is double c)
            {
                _kind[l] = Kind.Hazen;
                _hazenConstant[l] = HazenConstant(p.Length, p.Diameter, c);
                _geometry[l] = new PipeGeometry(p.Length, p.Diameter, 0, p.MinorLossCoefficient);
            }
            else
            {
                _kind[l] = Kind.Darcy;
                _geometry[l] = new PipeGeometry(p.Length, p.Diameter, p.Roughness, p.MinorLossCoefficient);
                // Pipes of one size and material share a relative roughness: prepare the transition zone once for each.
                double relative = p.Roughness / p.Diameter;
                if (!joins.TryGetValue(relative, out int join))
                {
                    joins[relative] = join = joinList.Count;
                    joinList.Add(new TransitionalFriction(relative, _options.Friction));
                }
                _joinOf[l] = join;
            }
        }
        for (int k = 0; k < model.Pumps.Count; k++)
        {
            int l = _pipes + k;
            var p = model.Pumps[k];
            linkIndex[p.Id] = ~k;
            _from[l] = Node(p.From);
            _to[l] = Node(p.To);
            _kind[l] = Kind.Pump;
            _curve[k] = p.Curve;
            _speed[l] = p.SpeedRatio;
            double qRef = p.Curve.ZeroHeadFlow ?? p.Curve.SearchLimit;
            // A pump's slope can vanish (a flat curve at shut-off); floor it at a millionth of the curve's mean slope.
            _pumpSlopeFloor[l] = 1e-6 * Math.Abs(p.Curve.C0) * Math.Max(p.SpeedRatio, 1e-3) / qRef;
            // Below zero flow the polynomial is no pump (a quadratic's head falls again, so dh/dQ turns negative and the
            // floored slope would give the link a near-infinite conductance): it is continued by H(0) + H'(0) x + K x^2,
            // K = C0 / qRef^2, which keeps the head rising as the flow reverses, with value and slope matched at 0.
            _reverseCurvature[l] = p.Curve.C0 / (qRef * qRef);
            _stepLimit[l] = Math.Max(p.SpeedRatio, 1e-3) * qRef;
        }
        _joins = joinList.ToArray();
        _linkIndex = linkIndex;
        _valveOf = PrepareValves(model, Node);

        _flow = new double[_links];
        _headLoss = new double[_links];
        _slope = new double[_links];
        _y = new double[_links];
        _conductance = new double[_links];
        _rhs = new double[_junctions];
        _x = new double[_junctions];
        _continuity = new double[_junctions];
        _imbalance = new double[_links];
        _nodeScale = new double[_junctions];
        _turbulentLink = new int[_pipes];
        _turbulentReynolds = new double[_pipes];
        _turbulentRoughness = new double[_pipes];
        _turbulentVelocity = new double[_pipes];
        _turbulentFriction = new double[_pipes];
        int cores = _options.MaxParallelism == 0 ? Environment.ProcessorCount : _options.MaxParallelism;
        _frictionParts = _links >= ParallelLinks ? Math.Min(cores, _links / (ParallelLinks / 2)) : 1;
        if (_frictionParts > 1) _parallel = new ParallelOptions { MaxDegreeOfParallelism = _frictionParts };

        _law = model.DemandModel;
        bool pdd = _law is not null;
        int pj = pdd ? _junctions : 0;
        _delivered = pdd ? new double[_junctions] : _demand;
        _onLaw = new bool[pj];
        _position = new double[pj];
        _graphPressure = new double[pj];
        _graphGood = new double[pj];
        _outletConductance = new double[pj];
        _outletImbalance = new double[pj];
        _lawDelivery = new double[pj];
        _lawFloor = new double[pj];
        _startHead = new double[pj];
        _startPosition = new double[pj];
        _stepHead = new double[pj];
        _stepPosition = new double[pj];
        _startFlow = new double[pdd ? _links : 0];
        _stepFlow = new double[pdd ? _links : 0];

        var (rowStart, columns) = BuildPattern();
        if (_options.LinearSolver == NetworkLinearSolver.ConjugateGradient)
            _iterative = new SymmetricSparseSolver(rowStart, columns);
        else
        {
            _direct = new SparseCholesky(rowStart, columns);
            // Every core for a large factorisation by default (its own threshold); the caller's limit when it set one.
            if (_options.MaxParallelism > 0)
                _direct.MaxDegreeOfParallelism = Math.Min(_direct.MaxDegreeOfParallelism, _options.MaxParallelism);
        }
        _residual = _direct is null ? [] : new double[_junctions];
        (_diagFrom, _diagTo, _offFromTo, _offToFrom) = EntryPositions(rowStart, columns);
        _diagJunction = new int[_junctions];
        for (int j = 0; j < _diagJunction.Length; j++)
            _diagJunction[j] = Array.BinarySearch(columns, rowStart[j], rowStart[j + 1] - rowStart[j], j);
        _unsupplied = FindUnsupplied();
        PrepareValveNeighbours();
        Reset();
    }

    /// <summary>The options in force.</summary>
    public NetworkOptions Options => _options;

    /// <summary>Solves a network once (a new solver; no warm start).</summary>
    /// <param name="model">The network.</param>
    /// <param name="options">Tolerances and limits; <see cref="NetworkOptions.Default"/> when omitted.</param>
    /// <returns>The result; non-convergence, flows out of range and unsupplied parts are statuses, never exceptions.</returns>
    /// <exception cref="NetworkValidationException">The model is invalid (each issue names its element).</exception>
    public static NetworkResult Solve(NetworkModel model, NetworkOptions? options = null) =>
        new NetworkSolver(model, options).SolveCase(1.0);

    /// <summary>Solves several load cases, each a multiplier on every demand, warm-starting each from the one before.</summary>
    /// <param name="model">The network.</param>
    /// <param name="multipliers">Demand multipliers, finite; in the order given.</param>
    /// <param name="options">Tolerances and limits; <see cref="NetworkOptions.Default"/> when omitted.</param>
    /// <returns>One result per multiplier, in order.</returns>
    /// <exception cref="NetworkValidationException">The model is invalid.</exception>
    /// <exception cref="ArgumentOutOfRangeException">A multiplier is not finite.</exception>
    public static IReadOnlyList<NetworkResult> SolveLoadCases(NetworkModel model, ReadOnlySpan<double> multipliers,
        NetworkOptions? options = null) => new NetworkSolver(model, options).SolveCases(multipliers);

    /// <summary>Solves load cases on this instance in order, each warm-started from the one before.</summary>
    /// <param name="multipliers">Demand multipliers, finite.</param>
    /// <returns>One result per multiplier.</returns>
    /// <exception cref="ArgumentOutOfRangeException">A multiplier is not finite.</exception>
    public IReadOnlyList<NetworkResult> SolveCases(ReadOnlySpan<double> multipliers)
    {
        var results = new NetworkResult[multipliers.Length];
        for (int i = 0; i < multipliers.Length; i++) results[i] = SolveCase(multipliers[i]);
        return results;
    }

    /// <summary>Forgets the previous solution: the next solve starts from the default start (0.3 m/s in every pipe).</summary>
    public void Reset()
    {
        double maxHead = double.NegativeInfinity;
        for (int r = 0; r < _reservoirs; r++) maxHead = Math.Max(maxHead, _head[_junctions + r]);
        if (!double.IsFinite(maxHead)) maxHead = 0;
        for (int j = 0; j < _junctions; j++) _head[j] = maxHead;
        for (int l = 0; l < _links; l++)
        {
            if (_kind[l] == Kind.Pump)
            {
                _status[l] = _speed[l] > 0 ? LinkStatus.Open : LinkStatus.PumpOff;
                _flow[l] = _status[l] == LinkStatus.Open ? 0.5 * _speed[l] * (_curve[l - _pipes].ZeroHeadFlow ?? _curve[l - _pipes].SearchLimit) : 0;
            }
            else if (_kind[l] == Kind.Valve)
            {
                _status[l] = LinkStatus.Open;
                _flow[l] = InitialVelocity * _area[l];
            }
            else
            {
                _status[l] = IsShut(l) ? LinkStatus.Closed : LinkStatus.Open;
                _flow[l] = _status[l] == LinkStatus.Open ? InitialVelocity * _area[l] : 0;
            }
        }
        ResetValves();
        _warm = false;
    }

    /// <summary>Solves with every demand multiplied by <paramref name="demandMultiplier"/>, starting from this instance's
    /// previous solution when it converged (else from the default start).</summary>
    /// <param name="demandMultiplier">Multiplier on every junction demand; finite (1 for the model as given).</param>
    /// <returns>The result; non-convergence, flows out of range and unsupplied parts are statuses, never exceptions.</returns>
    /// <exception cref="ArgumentOutOfRangeException">The multiplier is not finite.</exception>
    public NetworkResult SolveCase(double demandMultiplier = 1.0)
    {
        if (!double.IsFinite(demandMultiplier))
            throw new ArgumentOutOfRangeException(nameof(demandMultiplier), demandMultiplier, "must be finite");
        for (int j = 0; j < _junctions; j++) _demand[j] = _baseDemand[j] * demandMultiplier;
        if (_unsupplied.Length > 0)
            return Report(NetworkStatus.NoPathToFixedHead, demandMultiplier, [], 0);
        if (!_warm) Reset();
        if (_law is not null) PlaceOnLaw();

        var record = new List<NetworkIteration>();
        var status = SettleStatuses(record, _newton ??= Newton, watchCycles: true, out int pass);
        bool converged = status.HasAnswer();
        // Report the final iterate first; a failed solve then leaves the default start for the next one.
        var result = Report(status, demandMultiplier, record.ToArray(), pass);
        _warm = converged;
        if (!converged) Reset();
        return result;
    }

    /// <summary>The status passes of a solve: a Newton solve at fixed statuses (<paramref name="newton"/>), then the check
    /// valves' and pumps' statuses updated, until none changes (<see cref="NetworkStatus.Solved"/>, or
    /// <see cref="NetworkStatus.PumpCannotLift"/> when a running pump is left stopped), a Newton solve fails (its status),
    /// <see cref="NetworkOptions.MaxStatusPasses"/> is reached, or, with <paramref name="watchCycles"/> and control valves,
    /// a state of the statuses comes back (<see cref="NetworkStatus.StatusCycle"/>).</summary>
    /// <param name="record">Receives every Newton iteration.</param>
    /// <param name="newton">One Newton solve at fixed statuses: (pass, record) to its status.</param>
    /// <param name="watchCycles">Detect a cycle of valve states (and start <see cref="_cycle"/> afresh).</param>
    /// <param name="passes">The passes taken.</param>
    private NetworkStatus SettleStatuses(List<NetworkIteration> record, Func<int, List<NetworkIteration>, NetworkStatus> newton,
        bool watchCycles, out int passes)
    {
        var status = NetworkStatus.StatusesNotSettled;
        int pass = 0;
        List<byte[]>? seen = null;
        if (watchCycles)
        {
            if (_valveOf.Length > 0) seen = [StateSnapshot()];
            _cycle = [];
        }
        while (pass < _options.MaxStatusPasses)
        {
            pass++;
            var solved = newton(pass, record);
            if (solved != NetworkStatus.Solved) { status = solved; break; }
            if (UpdateStatuses() == 0) { status = NetworkStatus.Solved; break; }
            if (seen is not null && SeenBefore(seen)) { status = NetworkStatus.StatusCycle; break; }
        }
        if (status == NetworkStatus.Solved)
        {
            for (int l = _pipes; l < _pumpEnd; l++)
                if (_status[l] == LinkStatus.PumpOff && _speed[l] > 0) { status = NetworkStatus.PumpCannotLift; break; }
        }
        passes = pass;
        return status;
    }

    // Newton as a delegate, made once per solver rather than at every solve.
    private Func<int, List<NetworkIteration>, NetworkStatus>? _newton;

    /// <summary>Newton iterations with the statuses fixed, until the tolerances are met or the cap is reached.</summary>
    /// <remarks>Under pressure-driven demand, from step <see cref="FreeSteps"/> + 1 on, each step is followed by
    /// <see cref="LineSearch"/>.</remarks>
    private NetworkStatus Newton(int pass, List<NetworkIteration> record)
    {
        var o = _options;
        double maxChange = double.PositiveInfinity;
        int linear = 0, steps = 0;
        bool stepped = false, evaluated = false;
        (double Imbalance, double Continuity, bool Met) measured = default;
        while (true)
        {
            if (!evaluated)
            {
                _outOfRange = false;
                EvaluateLinks();
                EvaluateOutlets();
                measured = Measure();
            }
            evaluated = false;
            var (imbalance, continuity, met) = measured;
            if (stepped) record.Add(new NetworkIteration(record.Count + 1, pass, maxChange, imbalance, continuity, linear));
            if (_outOfRange) return NetworkStatus.FlowsOutOfRange;
            if (!double.IsFinite(imbalance) || !double.IsFinite(continuity)) return NetworkStatus.LinearSolveFailed;
            if (met) return NetworkStatus.Solved;
            if (record.Count >= o.MaxIterations) return NetworkStatus.IterationCapReached;
            // Inexact Newton: the head solve need only be accurate to about the error the quadratic model leaves after the
            // step (of order the last flow change squared); the final steps run at a tenth of the flow tolerance.
            double linearTolerance = Math.Max(0.1 * Math.Max(o.FlowTolerance, _stageFlowTolerance), Math.Min(1e-6, 1e-3 * maxChange * maxChange));
            bool search = _law is not null && steps++ >= FreeSteps;
            if (search)
            {
                Array.Copy(_head, _startHead, _junctions);
                Array.Copy(_flow, _startFlow, _links);
                Array.Copy(_position, _startPosition, _junctions);
            }
            if (!Step(linearTolerance, out maxChange, out linear)) return NetworkStatus.LinearSolveFailed;
            stepped = true;
            if (search)
            {
                measured = LineSearch(ref maxChange);
                evaluated = true;
            }
        }
    }

    /// <summary>The line search's merit at the current point: the sum of squares of every junction's continuity error,
    /// every open link's energy imbalance times its conductance at the step's start, and every on-law junction's
    /// imbalance H - z - min - (req - min) s(u) times d/(req - min) (the law's mean slope), all in (m3/s)^2. The weights
    /// are fixed during the search, so the Newton step is a descent direction of the merit.</summary>
    private double Merit()
    {
        var law = _law!;
        double span = law.RequiredPressureHead - law.MinimumPressureHead;
        double sum = 0;
        for (int j = 0; j < _junctions; j++)
        {
            double r = _dirichlet.Length > 0 && _dirichlet[j] ? 0 : _continuity[j];
            sum += r * r;
            if (!_onLaw[j]) continue;
            double f = _demand[j] / span * _outletImbalance[j];
            sum += f * f;
        }
        for (int l = 0; l < _links; l++)
        {
            if (_status[l] != LinkStatus.Open) continue;
            double e = _conductance[l] * _imbalance[l];
            sum += e * e;
        }
        return double.IsNaN(sum) ? double.PositiveInfinity : sum;
    }

    /// <summary>Backtracking after the (possibly shortened) Newton step just taken: the step is halved until the merit
    /// (<see cref="Merit"/>) falls below (1 - 1e-4 alpha) times its value at the start (Armijo's rule), or reaches the
    /// level of the tolerances, or the tolerances are met; after <see cref="LineSearchHalvings"/> halvings without
    /// that, the full step is taken after all (a corner of the law, or rounding at the tolerances). Leaves the accepted
    /// point evaluated and measured.</summary>
    private (double Imbalance, double Continuity, bool Met) LineSearch(ref double maxChange)
    {
        Array.Copy(_head, _stepHead, _junctions);
        Array.Copy(_flow, _stepFlow, _links);
        Array.Copy(_position, _stepPosition, _junctions);
        double noise = (_junctions + _links) * _options.FlowTolerance * _options.FlowTolerance;
        double alpha = 1;
        for (int halving = 0; ; halving++)
        {
            _outOfRange = false;
            EvaluateLinks();
            EvaluateOutlets();
            var measured = Measure();
            double merit = _outOfRange ? double.PositiveInfinity : Merit();
            if (measured.Met || !double.IsFinite(_startMerit) || merit <= (1 - SufficientDecrease * alpha) * _startMerit || merit <= noise)
            {
                maxChange *= alpha;
                return measured;
            }
            if (halving == LineSearchHalvings)
            {
                SetStep(1);
                _outOfRange = false;
                EvaluateLinks();
                EvaluateOutlets();
                return Measure();
            }
            alpha *= 0.5;
            SetStep(alpha);
        }
    }

    /// <summary>Moves the iterate to the point <paramref name="alpha"/> along the step from the line search's start.</summary>
    private void SetStep(double alpha)
    {
        for (int j = 0; j < _junctions; j++)
        {
            _head[j] = _startHead[j] + alpha * (_stepHead[j] - _startHead[j]);
            _position[j] = _startPosition[j] + alpha * (_stepPosition[j] - _startPosition[j]);
        }
        for (int l = 0; l < _links; l++) _flow[l] = _startFlow[l] + alpha * (_stepFlow[l] - _startFlow[l]);
    }

    /// <summary>Places every junction with a positive demand on the law's graph at its present head (u = s + r(s), so
    /// that it starts with no imbalance); the others draw their demand whatever the head.</summary>
    private void PlaceOnLaw()
    {
        var law = _law!;
        double min = law.MinimumPressureHead, span = law.RequiredPressureHead - min;
        for (int j = 0; j < _junctions; j++)
        {
            double d = _demand[j];
            _onLaw[j] = d > 0;
            if (!_onLaw[j]) { _delivered[j] = d; continue; }
            double s = (_head[j] - _elevation[j] - min) / span;
            _position[j] = double.IsFinite(s) ? s + PressureDrivenDemand.Exact(s, law.Exponent) : 1;
            _graphGood[j] = double.NaN; // no previous point to start the graph solve from
        }
    }

    /// <summary>Under pressure-driven demand, at the current heads and positions: each on-law junction's graph point
    /// (s(u), x(u)), its delivery d x(u), the imbalance H - z - min - (req - min) s(u) and the tangent's conductance;
    /// and each junction's delivery by the exact law, d r(p), with what rounding of the head can change in it.</summary>
    private void EvaluateOutlets()
    {
        var law = _law;
        if (law is null) return;
        double min = law.MinimumPressureHead, span = law.RequiredPressureHead - min, e = law.Exponent;
        for (int j = 0; j < _junctions; j++)
        {
            double d = _demand[j];
            if (!_onLaw[j])
            {
                _lawDelivery[j] = d;
                _lawFloor[j] = 0;
                continue;
            }
            var point = law.GraphPoint(_position[j], _graphGood[j]);
            _graphGood[j] = point.Good;
            _graphPressure[j] = point.S;
            _delivered[j] = d * point.X;
            _outletConductance[j] = d / span * point.Ratio;
            double h = _head[j], p = h - _elevation[j], s = (p - min) / span;
            _outletImbalance[j] = p - min - span * point.S;
            _lawDelivery[j] = d * PressureDrivenDemand.Exact(s, e);
            // The head holds 8 units in the last place of the numbers behind p; near the minimum pressure, where the
            // law's slope is unbounded for e < 1, that alone can move d r(p) by more than the flow tolerance.
            double eps = Resolution * (Math.Abs(h) + Math.Abs(_elevation[j]) + Math.Abs(min)) / span;
            _lawFloor[j] = s <= -eps || s >= 1 + eps ? 0
                : d * (PressureDrivenDemand.Exact(s + eps, e) - PressureDrivenDemand.Exact(s - eps, e));
        }
    }

    /// <summary>The least number of links at which the friction pass is split across cores (when
    /// <see cref="NetworkOptions.MaxParallelism"/> allows): below it the pass takes well under a millisecond, and handing
    /// it to another core would cost a good part of that (a FlowSolve choice).</summary>
    public const int ParallelLinks = 20_000;

    /// <summary>From now on this solver uses one core whatever <see cref="NetworkOptions.MaxParallelism"/> said: for a
    /// caller that runs several solvers side by side.</summary>
    internal void UseOneCore()
    {
        _frictionParts = 1;
        _parallel = null;
        if (_direct is not null) _direct.MaxDegreeOfParallelism = 1;
    }

    /// <summary>h and dh/dQ of every open link at the current flows.</summary>
    private void EvaluateLinks()
    {
        int parts = _frictionParts;
        if (parts <= 1)
        {
            EvaluateLinks(0, _links);
            return;
        }
        // Contiguous parts, each gathering its turbulent pipes into its own stretch of the span arrays (a part's pipes
        // fit in the stretch that starts at its first link), so the parts share nothing but _outOfRange (only set).
        Parallel.For(0, parts, _parallel!, _evaluatePart ??= EvaluatePart);
    }

    private Action<int>? _evaluatePart; // made once, not a closure at every pass

    /// <summary>Part <paramref name="part"/> of <see cref="_frictionParts"/> contiguous parts of the links.</summary>
    private void EvaluatePart(int part)
    {
        int parts = _frictionParts;
        EvaluateLinks((int)((long)_links * part / parts), (int)((long)_links * (part + 1) / parts));
    }

    /// <summary>h and dh/dQ of the open links in [<paramref name="start"/>, <paramref name="end"/>).</summary>
    private void EvaluateLinks(int start, int end)
    {
        double nu = _model.KinematicViscosity;
        var friction = _options.Friction;
        bool spanFriction = !_options.ScalarFrictionPass;
        int turbulent = start;
        for (int l = start; l < end; l++)
        {
            if (_status[l] != LinkStatus.Open) { _headLoss[l] = 0; _slope[l] = 0; continue; }
            double q = _flow[l];
            switch (_kind[l])
            {
                case Kind.Darcy:
                    if (spanFriction && GatherTurbulent(l, q, nu, friction, turbulent)) turbulent++;
                    else (_headLoss[l], _slope[l]) = DarcyLoss(l, q, nu, friction);
                    break;
                case Kind.Hazen:
                    (_headLoss[l], _slope[l]) = HazenLoss(l, q);
                    break;
                case Kind.Valve:
                    (_headLoss[l], _slope[l]) = ValveLoss(l, q);
                    break;
                default:
                {
                    double s = _speed[l], x = q / s;
                    var (head, slope) = _curve[l - _pipes].HeadAndSlope(Math.Max(x, 0));
                    if (x < 0)
                    {
                        // Reverse flow: the continuation H(0) + H'(0) x + K x^2 (see the constructor).
                        head += (slope + _reverseCurvature[l] * x) * x;
                        slope += 2 * _reverseCurvature[l] * x;
                    }
                    _headLoss[l] = -s * s * head;
                    _slope[l] = Math.Max(-s * slope, _pumpSlopeFloor[l]);
                    break;
                }
            }
        }
        if (turbulent > start) TurbulentFrictionPass(start, turbulent);
    }

    /// <summary>Adds an open Darcy pipe to the friction pass's span when <see cref="DarcyLoss"/> would reach the exact
    /// Colebrook-White solve for it (turbulent flow), with the Reynolds number, relative roughness and velocity that
    /// <see cref="PipeHeadLoss.WithDerivative"/> would compute, in the same operations; false leaves the pipe to
    /// <see cref="DarcyLoss"/> (laminar, transitional, creeping, beyond the relations' range).</summary>
    private bool GatherTurbulent(int l, double q, double nu, in FrictionOptions friction, int k)
    {
        ref readonly var pipe = ref _geometry[l];
        double aq = Math.Abs(q);
        double reLink = aq * pipe.Diameter / (_area[l] * nu);
        if (!(reLink <= DarcyFriction.MaximumReynolds) || (reLink >= friction.LaminarLimit && reLink < friction.TurbulentLimit)
            || q == 0 || !(aq / pipe.Area * pipe.Diameter / nu >= DarcyFriction.MinimumReynolds))
            return false;
        // PipeHeadLoss.Evaluate's velocity and Reynolds number, and DarcyFriction.Compute's choice of regime.
        double d = pipe.Diameter;
        double velocity = aq / (0.25 * Math.PI * d * d);
        double re = velocity * d / nu;
        if (!(re >= friction.TurbulentLimit && re <= DarcyFriction.MaximumReynolds)) return false;
        _turbulentLink[k] = l;
        _turbulentReynolds[k] = re;
        _turbulentRoughness[k] = pipe.Roughness / d;
        _turbulentVelocity[k] = velocity;
        return true;
    }

    /// <summary>h and dh/dQ of the gathered turbulent pipes: their friction factors in one span solve
    /// (<see cref="ColebrookWhite.Solve(ReadOnlySpan{double}, ReadOnlySpan{double}, Span{double}, Span{int})"/>, equal bit
    /// for bit to the scalar solve), then PipeHeadLoss.Evaluate's head loss and slope in its operations, so the pass
    /// answers exactly what <see cref="DarcyLoss"/> would.</summary>
    private void TurbulentFrictionPass(int start, int end)
    {
        ColebrookWhite.Solve(_turbulentReynolds.AsSpan(start, end - start), _turbulentRoughness.AsSpan(start, end - start),
            _turbulentFriction.AsSpan(start, end - start));
        for (int k = start; k < end; k++)
        {
            int l = _turbulentLink[k];
            ref readonly var pipe = ref _geometry[l];
            double f = _turbulentFriction[k], re = _turbulentReynolds[k], velocity = _turbulentVelocity[k];
            double q = _flow[l], aq = Math.Abs(q);
            double velocityHead = velocity * velocity / (2 * Physical.StandardGravity);
            double lOverD = pipe.Length / pipe.Diameter;
            double h = f * lOverD * velocityHead + pipe.MinorLossCoefficient * velocityHead;
            double dfdRe = new ColebrookResult(f, 0, 0, 0.0, SolveStatus.ConvergedOnPredictedStep, re,
                _turbulentRoughness[k]).DerivativeReynolds;
            double reDfDRe = re * dfdRe;
            _headLoss[l] = Math.CopySign(h, q);
            _slope[l] = (2.0 * h + lOverD * velocityHead * reDfDRe) / aq;
        }
    }

    /// <summary>Darcy-Weisbach h and dh/dQ: <see cref="PipeHeadLoss.WithDerivative"/>, the single-pipe relations, in
    /// laminar and turbulent flow; in the transition zone <see cref="TransitionalFriction"/>, which is the single pipe's
    /// Churchill (1977) except within 5 % of each regime limit, where a cubic joins it to the neighbouring law so that
    /// h(Q) has no jump for Newton to cycle across. One pipe at the same heads carries the same flow in a network as
    /// alone, except near the limits, where the single-pipe relation itself has no answer or two.</summary>
    private (double HeadLoss, double Slope) DarcyLoss(int l, double q, double nu, in FrictionOptions friction)
    {
        ref readonly var pipe = ref _geometry[l];
        double aq = Math.Abs(q);
        double re = aq * pipe.Diameter / (_area[l] * nu);
        if (!(re <= DarcyFriction.MaximumReynolds))
        {
            // Beyond the friction relations (or not finite): the solve stops with a status instead of an exception.
            _outOfRange = true;
            return (double.NaN, double.NaN);
        }
        if (!(re >= friction.LaminarLimit && re < friction.TurbulentLimit))
            return PipeHeadLoss.WithDerivative(pipe, nu, q, friction);
        var (f, dfdRe) = _joins[_joinOf[l]].Evaluate(re);
        double v = aq / _area[l];
        double velocityHead = v * v / (2 * Physical.StandardGravity);
        double lOverD = pipe.Length / pipe.Diameter;
        double h = (f * lOverD + pipe.MinorLossCoefficient) * velocityHead;
        double slope = (2 * h + lOverD * velocityHead * re * dfdRe) / aq;
        return (Math.CopySign(h, q), slope);
    }

    /// <summary>Hazen-Williams h = r |Q|^0.852 Q + m |Q| Q, regularised below the regularisation velocity by
    /// a Q + b Q^3 with the same value and slope at the threshold Qs: b = (S Qs - H)/(2 Qs^3), a = (3H - S Qs)/(2 Qs),
    /// both positive because 1 &lt; S Qs / H &lt;= 2, so h stays odd, increasing and once differentiable.</summary>
    private (double HeadLoss, double Slope) HazenLoss(int l, double q)
    {
        double r = _hazenConstant[l], m = _minorConstant[l];
        double threshold = _options.RegularisationVelocity * _area[l];
        double aq = Math.Abs(q);
        if (aq >= threshold)
        {
            double friction = r * Math.Pow(aq, HazenWilliams.FlowExponent);
            return (Math.CopySign(friction + m * aq * aq, q), HazenWilliams.FlowExponent * friction / aq + 2 * m * aq);
        }
        double hs = r * Math.Pow(threshold, HazenWilliams.FlowExponent) + m * threshold * threshold;
        double ss = HazenWilliams.FlowExponent * hs / threshold - (HazenWilliams.FlowExponent - 2) * m * threshold;
        double b = (ss * threshold - hs) / (2 * threshold * threshold * threshold);
        double a = (3 * hs - ss * threshold) / (2 * threshold);
        return (a * q + b * q * q * q, a + 3 * b * q * q);
    }

    /// <summary>What a double resolves, relative to the size of the numbers: 8 units in the last place (2^-52 each).
    /// A head of 10 m is held to 1.8e-15 m, so a link whose head loss is smaller than that, or a junction whose flows
    /// are so large that 1e-10 m3/s is below their rounding, can meet the absolute tolerances only by chance.</summary>
    private const double Resolution = 8 * 2.220446049250313e-16;

    /// <summary>Largest energy imbalance over the open links and largest continuity error over the junctions, and whether
    /// every one is within its tolerance. Each link's imbalance is kept for the next step.</summary>
    /// <remarks>The stopping rule: a link's imbalance |H_from - H_to - h(Q)| must be at most the head tolerance or, when
    /// that is finer than the arithmetic can hold, <see cref="Resolution"/> times (|H_from| + |H_to| + |h| + |Q| dh/dQ);
    /// a junction's continuity error at most the flow tolerance or <see cref="Resolution"/> times (|demand| + the sum of
    /// |Q| over its links), plus under pressure-driven demand what that rounding of its head changes in its delivery. Ordinary networks never reach the second bounds (they are 1e-13 m and 1e-15 m3/s at heads
    /// of 100 m and flows of 1 m3/s); without them a network with a very short or very wide pipe iterates to the cap.</remarks>
    private (double Imbalance, double Continuity, bool Met) Measure()
    {
        var o = _options;
        bool met = true;
        double imbalance = 0;
        var c = _continuity;
        var scale = _nodeScale;
        for (int j = 0; j < _junctions; j++) { c[j] = -_delivered[j]; scale[j] = Math.Abs(_delivered[j]); }
        if (_drawOffJunction >= 0) AddDrawOff(c, scale); // fire flow: a fixed draw-off on top (NetworkSolver.DrawOff.cs)
        for (int l = 0; l < _links; l++)
        {
            int f = _from[l], t = _to[l];
            double q = _flow[l], aq = Math.Abs(q);
            if (f < _junctions) { c[f] -= q; scale[f] += aq; }
            if (t < _junctions) { c[t] += q; scale[t] += aq; }
            double hf = _head[f], ht = _head[t];
            double e = hf - ht - _headLoss[l];
            _imbalance[l] = e;
            if (_status[l] == LinkStatus.Open)
            {
                double a = Math.Abs(e);
                if (!(a <= imbalance)) imbalance = a; // NaN propagates
                double floor = Resolution * (Math.Abs(hf) + Math.Abs(ht) + Math.Abs(_headLoss[l]) + aq * _slope[l]);
                if (!(a <= Math.Max(o.HeadTolerance, floor)) && !(a <= _stageFlowTolerance * Math.Abs(_slope[l]))) met = false;
            }
        }
        double continuity = 0;
        for (int j = 0; j < _junctions; j++)
        {
            if (_dirichlet.Length > 0 && _dirichlet[j]) continue; // a tank at a known head: c[j] is its net inflow
            double e = Math.Abs(c[j]);
            if (!(e <= continuity)) continuity = e;
            if (!(e <= Math.Max(Math.Max(o.FlowTolerance, _stageFlowTolerance), Resolution * scale[j]))) met = false;
        }
        if (_law is not null) met &= MeasureOutlets(ref imbalance, ref continuity);
        return (imbalance, continuity, met);
    }

    /// <summary>The stopping rule of the on-law junctions: the imbalance between the head and the graph point,
    /// H - z - min - (req - min) s(u), within the head tolerance (or what a double resolves, as for a link), and
    /// continuity with the exact law's delivery d r(p) in place of d x(u) within the flow tolerance (or what a double
    /// resolves, plus what rounding of the head changes in d r(p)), so that the delivery reported, d r(p), meets
    /// continuity.</summary>
    private bool MeasureOutlets(ref double imbalance, ref double continuity)
    {
        var o = _options;
        bool met = true;
        var law = _law!;
        double min = law.MinimumPressureHead, span = law.RequiredPressureHead - min;
        for (int j = 0; j < _junctions; j++)
        {
            if (!_onLaw[j]) continue;
            double f = _outletImbalance[j];
            double a = Math.Abs(f);
            if (!(a <= imbalance)) imbalance = a;
            double floor = Resolution * (Math.Abs(_head[j]) + Math.Abs(_elevation[j] + min) + span * Math.Abs(_graphPressure[j]));
            if (!(a <= Math.Max(o.HeadTolerance, floor))) met = false;
            double lawError = Math.Abs(_continuity[j] + _delivered[j] - _lawDelivery[j]);
            if (!(lawError <= continuity)) continuity = lawError;
            if (!(lawError <= Math.Max(o.FlowTolerance, Resolution * _nodeScale[j] + _lawFloor[j]))) met = false;
        }
        return met;
    }

    /// <summary>One Newton step: assemble and solve the head equations, then update every flow.</summary>
    /// <remarks>The step is solved for the head corrections dH rather than the new heads: A dH = R + A21 C E, with R each
    /// junction's continuity error and E each link's energy imbalance (both from <see cref="Measure"/>), and the flows
    /// follow as Q' = Q + c (E + dH_from - dH_to). Algebraically this is the same Newton step as solving for the heads,
    /// but the numbers it works with shrink as it converges, so the flows keep their full precision: solving for heads of
    /// 10 m holds them to 1.8e-15 m, and a pipe of conductance c = 1/(dh/dQ) = 2.5e5 m2/s (1 m wide, 1 m long, laminar)
    /// would turn that rounding into 4e-10 m3/s of flow, above the tolerance at every iteration.</remarks>
    private bool Step(double linearTolerance, out double maxChange, out int linearIterations)
    {
        maxChange = 0;
        linearIterations = 0;
        var values = _direct is null ? _iterative!.Values : _direct.Values;
        values.Clear();
        for (int j = 0; j < _junctions; j++) _rhs[j] = _continuity[j];
        for (int l = 0; l < _links; l++)
        {
            // A closed link keeps a vanishing conductance (its imbalance is the head across it), so that a junction it
            // isolates still has a defined head; its flow stays exactly zero.
            double c = _status[l] == LinkStatus.Open ? 1.0 / _slope[l] : ClosedConductance;
            _conductance[l] = c;
            double ce = c * _imbalance[l];
            // Under pressure-driven demand a closed link does not draw the heads at its ends together: a junction it cuts
            // off with zero delivery may stand at any head at or below the minimum, and the pull of a vanishing
            // conductance would only move it about (the head stays where the iteration left it).
            if (_law is not null && _status[l] != LinkStatus.Open) ce = 0;
            int f = _from[l], t = _to[l];
            bool fj = f < _junctions, tj = t < _junctions;
            if (_valveOf.Length > 0)
            {
                // A junction whose head an active valve holds is a fixed head for this step, like a reservoir; an active
                // valve's own flow follows from continuity (or its setting), not from a conductance.
                if (fj && _fixedHead[f]) fj = false;
                if (tj && _fixedHead[t]) tj = false;
                if (_kind[l] == Kind.Valve && _valveState[_valveOf[l]] == ValveState.Active && _status[l] != LinkStatus.Open) ce = 0;
            }
            if (_dirichlet.Length > 0)
            {
                // A tank at a known head (NetworkSolver.Timeline.cs) drops out of the head equations like a reservoir.
                if (fj && _dirichlet[f]) fj = false;
                if (tj && _dirichlet[t]) tj = false;
            }
            if (fj) { _rhs[f] -= ce; values[_diagFrom[l]] += c; }
            if (tj) { _rhs[t] += ce; values[_diagTo[l]] += c; }
            if (fj && tj) { values[_offFromTo[l]] -= c; values[_offToFrom[l]] -= c; }
        }
        if (_law is not null)
        {
            // The delivery linearised along the graph's tangent, q + c (F + dH): like a link from the junction to the
            // fixed level z + min.
            for (int j = 0; j < _junctions; j++)
            {
                if (!_onLaw[j] || (_valveOf.Length > 0 && _fixedHead[j])) continue;
                double c = _outletConductance[j];
                _rhs[j] -= c * _outletImbalance[j];
                values[_diagJunction[j]] += c;
            }
            _startMerit = Merit(); // the conductances just set are the line search's weights
        }
        if (_valveOf.Length > 0) AssembleValves(values);
        if (_dirichlet.Length > 0) ImposeKnownHeads(values);
        if (_direct is null)
        {
            if (!_iterative!.Factorise()) return false;
            Array.Clear(_x);
            var (iterations, residual) = _iterative.Solve(_rhs, _x, linearTolerance, _options.MaxLinearIterations);
            linearIterations = iterations;
            if (!double.IsFinite(residual)) return false;
        }
        else if (!SolveDirect(linearTolerance, out linearIterations)) return false;
        if (_valveOf.Length > 0 && !CorrectForValves(linearTolerance, ref linearIterations)) return false;
        // The Newton flows into _y, and the step length: a step that would move a link's flow by more than its limit is
        // shortened, flows and heads alike, so that no iterate runs away (a pump near shut-off, whose slope is floored,
        // can ask for enormous flows). Continuity then holds to the shortened fraction; full steps restore it.
        double scale = 1;
        for (int l = 0; l < _links; l++)
        {
            int f = _from[l], t = _to[l];
            double df = f < _junctions ? _x[f] : 0.0, dt = t < _junctions ? _x[t] : 0.0;
            double q = _status[l] == LinkStatus.Open ? _flow[l] + _conductance[l] * (_imbalance[l] + (df - dt))
                : _kind[l] == Kind.Valve ? ActiveValveFlow(l) : 0.0;
            _y[l] = q;
            double change = Math.Abs(q - _flow[l]), limit = Math.Max(_stepLimit[l], 2 * Math.Abs(_flow[l]));
            if (change > limit && limit < scale * change) scale = limit / change;
        }
        if (!double.IsFinite(scale)) return false;
        for (int j = 0; j < _junctions; j++) _head[j] += scale * _x[j];
        if (_law is not null)
        {
            // The position's step: along the tangent, du = ds + dx = (F + dH)/(req - min) + dq/d, with dq = c (F + dH).
            double span = _law.RequiredPressureHead - _law.MinimumPressureHead;
            for (int j = 0; j < _junctions; j++)
            {
                if (!_onLaw[j]) continue;
                double lift = _outletImbalance[j] + _x[j];
                double du = lift / span + _outletConductance[j] * lift / _demand[j];
                _position[j] += scale * du;
            }
        }
        for (int l = 0; l < _links; l++)
        {
            double q = scale < 1 ? _flow[l] + scale * (_y[l] - _flow[l]) : _y[l];
            double change = Math.Abs(q - _flow[l]);
            if (!(change <= maxChange)) maxChange = change; // NaN propagates
            _flow[l] = q;
        }
        return true;
    }

    /// <summary>The head equations by the sparse Cholesky factor, then iterative refinement (x += A^-1 (b - A x)) while
    /// the largest residual exceeds the tolerance, at most 4 steps: rounding in the factor of an ill-conditioned system
    /// (a vanishing conductance beside large ones) can leave more than the tolerance after one solve.</summary>
    private bool SolveDirect(double tolerance, out int solves)
    {
        var direct = _direct!;
        solves = 0;
        if (!direct.Factorise()) return false;
        direct.Solve(_rhs, _x);
        solves = 1;
        var r = _residual.AsSpan();
        for (int step = 0; ; step++)
        {
            direct.Multiply(_x, r);
            double largest = 0;
            for (int j = 0; j < r.Length; j++)
            {
                double e = _rhs[j] - r[j];
                r[j] = e;
                if (!(Math.Abs(e) <= largest)) largest = Math.Abs(e); // NaN propagates
            }
            if (!double.IsFinite(largest)) return false;
            if (largest <= tolerance || step == 4) return true;
            direct.Solve(r, r);
            for (int j = 0; j < r.Length; j++) _x[j] += r[j];
            solves++;
        }
    }

    /// <summary>Opens and closes check valves and pumps from the converged state; returns the number of changes.</summary>
    private int UpdateStatuses()
    {
        int changes = 0;
        // A head of ten head tolerances across a closed valve is taken as real, not rounding.
        double headMargin = 10 * _options.HeadTolerance;
        for (int l = 0; l < _links; l++)
        {
            double across = _head[_from[l]] - _head[_to[l]];
            if (_kind[l] == Kind.Pump)
            {
                if (!(_speed[l] > 0)) continue;
                double s = _speed[l];
                if (_status[l] == LinkStatus.Open && _flow[l] < 0)
                {
                    _status[l] = LinkStatus.PumpOff;
                    _flow[l] = 0;
                    changes++;
                }
                else if (_status[l] == LinkStatus.PumpOff && s * s * _curve[l - _pipes].C0 + across > headMargin)
                {
                    _status[l] = LinkStatus.Open;
                    _flow[l] = 0.5 * s * (_curve[l - _pipes].ZeroHeadFlow ?? _curve[l - _pipes].SearchLimit);
                    changes++;
                }
            }
            else if (_checkValve[l] && _status[l] != LinkStatus.Closed)
            {
                if (_status[l] == LinkStatus.Open && _flow[l] < 0)
                {
                    _status[l] = LinkStatus.CheckValveClosed;
                    _flow[l] = 0;
                    changes++;
                }
                else if (_status[l] == LinkStatus.CheckValveClosed && across > headMargin)
                {
                    _status[l] = LinkStatus.Open;
                    _flow[l] = 0.01 * InitialVelocity * _area[l];
                    changes++;
                }
            }
        }
        if (_valveOf.Length > 0) changes += UpdateValveStates(headMargin);
        return changes;
    }

    private NetworkResult Report(NetworkStatus status, double multiplier, NetworkIteration[] record, int passes)
    {
        var o = _options;
        bool solved = status != NetworkStatus.NoPathToFixedHead;
        var warnings = new List<NetworkWarning>();
        var pipes = new PipeResult[_pipes];
        double nu = _model.KinematicViscosity, g = Physical.StandardGravity;
        for (int l = 0; l < _pipes; l++)
        {
            string id = _model.Pipes[l].Id;
            if (!solved) { pipes[l] = new PipeResult(id, 0, 0, 0, 0, _status[l]); continue; }
            double q = _flow[l], v = q / _area[l], across = _head[_from[l]] - _head[_to[l]];
            double f = 0;
            if (_status[l] == LinkStatus.Open && q != 0)
            {
                double re = Math.Abs(q) * _geometry[l].Diameter / (_area[l] * nu);
                if (_kind[l] == Kind.Darcy && !(re <= DarcyFriction.MaximumReynolds))
                    f = double.NaN; // FlowsOutOfRange: no friction factor exists there
                else if (_kind[l] == Kind.Darcy && re >= o.Friction.LaminarLimit && re < o.Friction.TurbulentLimit)
                {
                    f = _joins[_joinOf[l]].Evaluate(re).F;
                    warnings.Add(new NetworkWarning(id, NetworkWarningCode.TransitionalFlow, re));
                }
                else if (_kind[l] == Kind.Darcy)
                    f = PipeHeadLoss.Evaluate(_geometry[l], nu, Math.Abs(q), o.Friction).FrictionFactor;
                else
                    f = 2 * g * _geometry[l].Diameter * _hazenConstant[l] * Math.Pow(Math.Abs(q), HazenWilliams.FlowExponent)
                        / (_geometry[l].Length * v * v);
            }
            double headLoss = _status[l] == LinkStatus.Open ? _headLoss[l] : across;
            pipes[l] = new PipeResult(id, q, v, headLoss, f, _status[l]);
            double speed = Math.Abs(v);
            if (_status[l] == LinkStatus.Open && speed < o.MinimumDesignVelocity)
                warnings.Add(new NetworkWarning(id, NetworkWarningCode.VelocityBelowDesignRange, speed));
            else if (speed > o.MaximumDesignVelocity)
                warnings.Add(new NetworkWarning(id, NetworkWarningCode.VelocityAboveDesignRange, speed));
        }
        var pumps = new PumpResult[_pumpEnd - _pipes];
        var unable = new List<string>();
        for (int l = _pipes; l < _pumpEnd; l++)
        {
            string id = _model.Pumps[l - _pipes].Id;
            double added = solved ? _head[_to[l]] - _head[_from[l]] : 0;
            pumps[l - _pipes] = new PumpResult(id, solved ? _flow[l] : 0, added, _status[l]);
            if (!solved) continue;
            if (_status[l] == LinkStatus.PumpOff && _speed[l] > 0)
            {
                unable.Add(id);
                warnings.Add(new NetworkWarning(id, NetworkWarningCode.PumpCannotLift, added));
            }
            else if (_status[l] == LinkStatus.Open && _curve[l - _pipes].DataMaximumFlow is double qmax)
            {
                double rated = _flow[l] / _speed[l];
                if (rated > qmax || rated < (_curve[l - _pipes].DataMinimumFlow ?? 0))
                    warnings.Add(new NetworkWarning(id, NetworkWarningCode.PumpOutsideCurveRange, rated));
            }
        }
        var junctions = new JunctionResult[_junctions];
        int shortJunctions = 0;
        double shortfall = 0;
        bool pdd = _law is not null;
        for (int j = 0; j < _junctions; j++)
        {
            string id = _model.Junctions[j].Id;
            double h = solved ? _head[j] : 0, p = solved ? h - _elevation[j] : 0;
            // The delivery by the exact law at the reported pressure (what the stopping rule judged), whatever stage the
            // iteration stopped in.
            double delivered = !solved ? 0 : pdd ? _law!.Delivered(_demand[j], p) : _demand[j];
            junctions[j] = new JunctionResult(id, h, p, _demand[j]) { DeliveredDemand = delivered };
            if (solved && p < 0) warnings.Add(new NetworkWarning(id, NetworkWarningCode.NegativePressure, p) { PressureDriven = pdd });
            if (solved && pdd && delivered < _demand[j])
            {
                shortJunctions++;
                shortfall += _demand[j] - delivered;
            }
        }
        if (shortJunctions > 0)
            warnings.Add(new NetworkWarning("", NetworkWarningCode.DemandShortfall, shortfall) { Count = shortJunctions, PressureDriven = true });
        var outflow = new double[_reservoirs];
        if (solved)
        {
            for (int l = 0; l < _links; l++)
            {
                if (_from[l] >= _junctions) outflow[_from[l] - _junctions] += _flow[l];
                if (_to[l] >= _junctions) outflow[_to[l] - _junctions] -= _flow[l];
            }
        }
        var reservoirs = new ReservoirResult[_reservoirs];
        for (int r = 0; r < _reservoirs; r++)
            reservoirs[r] = new ReservoirResult(_model.Reservoirs[r].Id, _head[_junctions + r], outflow[r]);
        var valves = ReportValves(solved, passes, warnings);
        return new NetworkResult(status, multiplier, pipes, pumps, junctions, reservoirs, record, passes,
            status == NetworkStatus.NoPathToFixedHead ? _unsupplied : [], unable.ToArray(), warnings.ToArray(),
            _linkIndex, _nodeIndex) { DemandModel = _law, Valves = valves };
    }

    /// <summary>The sparsity pattern of the head equations (one row per junction) in CSR form, rows sorted.</summary>
    private (int[] RowStart, int[] Columns) BuildPattern()
    {
        int n = _junctions;
        var count = new int[n + 1];
        for (int j = 0; j < n; j++) count[j] = 1;
        for (int l = 0; l < _links; l++)
        {
            int f = _from[l], t = _to[l];
            if (f < n && t < n) { count[f]++; count[t]++; }
        }
        var rowStart = new int[n + 1];
        for (int j = 0; j < n; j++) rowStart[j + 1] = rowStart[j] + count[j];
        var columns = new int[rowStart[n]];
        var fill = new int[n];
        for (int j = 0; j < n; j++) { columns[rowStart[j]] = j; fill[j] = 1; }
        for (int l = 0; l < _links; l++)
        {
            int f = _from[l], t = _to[l];
            if (f < n && t < n)
            {
                columns[rowStart[f] + fill[f]++] = t;
                columns[rowStart[t] + fill[t]++] = f;
            }
        }
        // Sort each row and drop duplicates (parallel links share an entry).
        var compactStart = new int[n + 1];
        int write = 0;
        for (int j = 0; j < n; j++)
        {
            int begin = rowStart[j], end = rowStart[j + 1];
            Array.Sort(columns, begin, end - begin);
            compactStart[j] = write;
            for (int k = begin; k < end; k++)
                if (k == begin || columns[k] != columns[k - 1]) columns[write++] = columns[k];
        }
        compactStart[n] = write;
        Array.Resize(ref columns, write);
        return (compactStart, columns);
    }

    /// <summary>Each link's entry positions in the values of the head equations' pattern (-1 where it has none).</summary>
    private (int[], int[], int[], int[]) EntryPositions(int[] rowStart, int[] columns)
    {
        int n = _junctions;
        int PositionOf(int row, int column)
        {
            int k = Array.BinarySearch(columns, rowStart[row], rowStart[row + 1] - rowStart[row], column);
            return k >= 0 ? k : -1;
        }
        var diagFrom = new int[_links];
        var diagTo = new int[_links];
        var offFromTo = new int[_links];
        var offToFrom = new int[_links];
        for (int l = 0; l < _links; l++)
        {
            int f = _from[l], t = _to[l];
            diagFrom[l] = f < n ? PositionOf(f, f) : -1;
            diagTo[l] = t < n ? PositionOf(t, t) : -1;
            offFromTo[l] = f < n && t < n ? PositionOf(f, t) : -1;
            offToFrom[l] = f < n && t < n ? PositionOf(t, f) : -1;
        }
        return (diagFrom, diagTo, offFromTo, offToFrom);
    }

    /// <summary>Junctions in connected parts without a reservoir (union-find over the links that can carry flow:
    /// every pipe not shut by the model and every pump with a speed).</summary>
    private string[] FindUnsupplied()
    {
        int nodes = _junctions + _reservoirs;
        var parent = new int[nodes];
        for (int i = 0; i < nodes; i++) parent[i] = i;
        int Find(int i)
        {
            while (parent[i] != i) { parent[i] = parent[parent[i]]; i = parent[i]; }
            return i;
        }
        for (int l = 0; l < _links; l++)
        {
            if (_kind[l] == Kind.Pump ? !(_speed[l] > 0) : IsShut(l)) continue;
            int a = Find(_from[l]), b = Find(_to[l]);
            if (a != b) parent[a] = b;
        }
        var supplied = new bool[nodes];
        for (int r = 0; r < _reservoirs; r++) supplied[Find(_junctions + r)] = true;
        for (int j = 0; j < _dirichlet.Length; j++)
            if (_dirichlet[j]) supplied[Find(j)] = true; // a tank at a known head supplies like a reservoir
        var list = new List<string>();
        for (int j = 0; j < _junctions; j++)
            if (!supplied[Find(j)]) list.Add(_model.Junctions[j].Id);
        return list.ToArray();
    }

    /// <summary>Hazen-Williams hf = r Q^(1/0.54) with r = k L / (C^(1/0.54) D^(2.63/0.54)) and
    /// k = (4^1.63 / (0.849 pi))^(1/0.54), the SI velocity form rearranged exactly (as in <see cref="HazenWilliams"/>).</summary>
    private static double HazenConstant(double length, double diameter, double coefficient)
    {
        double k = Math.Pow(Math.Pow(4.0, 1.63) / (HazenWilliams.VelocityConstant * Math.PI), HazenWilliams.FlowExponent);
        return k * length / (Math.Pow(coefficient, HazenWilliams.FlowExponent) * Math.Pow(diameter, HazenWilliams.DiameterExponent));
    }
}
