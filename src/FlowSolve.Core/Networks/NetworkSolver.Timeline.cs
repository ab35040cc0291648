namespace FlowSolve.Core.Networks;

/// <summary>
/// Hooks for an extended-period run (<see cref="NetworkSimulator"/>): one solver instance serves the whole run, warm
/// started from its previous state, with the symbolic factorisation done once.
/// </summary>
/// <remarks>
/// <para>The run's tanks are junctions of the solver's model from the start, so the sparsity pattern of the head
/// equations never changes. A tank whose level moves is a known head (a Dirichlet node): its row of the head equations
/// becomes the identity and its column drops out (the links to it are assembled as links to a reservoir), so the Newton
/// step leaves its head where the run put it, and its continuity residual is its net inflow. A tank held at a limit is
/// an ordinary junction of zero demand, its head unknown. Demands change per junction (patterns), pipes are shut and
/// opened, and pumps change speed, between solves.</para>
/// </remarks>
public sealed partial class NetworkSolver
{
    private bool[] _dirichlet = [];   // per junction: a tank at a known head (empty outside a timeline)
    private double[] _knownHead = []; // per junction: the known head, m (kept across a reset)
    private bool[] _shut = [];        // per link: a pipe shut (by the model or a control); empty: the model's Closed
    private List<NetworkIteration>? _timelineRecord;

    /// <summary>A pipe shut by the model or, in a timeline, a pipe or control valve shut by a control.</summary>
    private bool IsShut(int l) => _shut.Length > 0 ? _shut[l] : l < _pipes && _model.Pipes[l].Closed;

    /// <summary>Identity rows for the known heads: no correction of a known head.</summary>
    private void ImposeKnownHeads(Span<double> values)
    {
        for (int j = 0; j < _junctions; j++)
        {
            if (!_dirichlet[j]) continue;
            values[_diagJunction[j]] = 1;
            _rhs[j] = 0;
        }
    }

    /// <summary>Prepares the timeline's arrays (once, before the first hook).</summary>
    internal void BeginTimeline()
    {
        if (_dirichlet.Length == _junctions && _shut.Length == _links) return;
        _dirichlet = new bool[_junctions];
        _knownHead = new double[_junctions];
        _shut = new bool[_links];
        for (int l = 0; l < _pipes; l++) _shut[l] = _model.Pipes[l].Closed;
        _timelineRecord = [];
    }

    /// <summary>Node index of a junction id, or -1.</summary>
    internal int NodeOf(string id) => _nodeIndex.TryGetValue(id, out int k) && k >= 0 ? k : -1;

    /// <summary>Junction j's head is known (a tank at its level): <paramref name="head"/> m.</summary>
    internal void SetKnownHead(int j, double head)
    {
        _dirichlet[j] = true;
        _head[j] = _knownHead[j] = head;
    }

    /// <summary>Junction j's head becomes unknown again (a tank held at a limit, zero demand).</summary>
    internal void SetFreeHead(int j) => _dirichlet[j] = false;

    /// <summary>Sets each junction's demand to its model demand times <paramref name="factors"/>[j].</summary>
    internal void SetDemandFactors(ReadOnlySpan<double> factors)
    {
        for (int j = 0; j < _junctions; j++) _demand[j] = _baseDemand[j] * factors[j];
    }

    /// <summary>Opens or shuts link l: a pipe, or a control valve (shut, it stays closed whatever the heads; opened, it
    /// regulates again). Pumps: see <see cref="SetPumpSpeed"/>.</summary>
    internal void SetLinkOpen(int l, bool open)
    {
        if (_kind[l] == Kind.Pump) return;
        _shut[l] = !open;
        if (_kind[l] == Kind.Valve)
        {
            int v = _valveOf[l];
            bool throttle = _valveModel[v].Type == ControlValveType.Throttle;
            _valveState[v] = !open ? ValveState.Closed : throttle ? ValveState.Active : ValveState.Open;
            _status[l] = open ? LinkStatus.Open : LinkStatus.Closed;
            _flow[l] = open ? 0.01 * InitialVelocity * _area[l] : 0;
            if (IsPressureValve(v)) _fixedHead[_controlled[v]] = false;
            return;
        }
        if (!open)
        {
            _status[l] = LinkStatus.Closed;
            _flow[l] = 0;
        }
        else if (_status[l] == LinkStatus.Closed)
        {
            _status[l] = LinkStatus.Open;
            _flow[l] = (_checkValve[l] ? 0.01 : 1.0) * InitialVelocity * _area[l];
        }
    }

    /// <summary>Sets pump l's speed ratio (0 switches it off), with the limits that depend on it.</summary>
    internal void SetPumpSpeed(int l, double speed)
    {
        var curve = _curve[l - _pipes];
        double qRef = curve.ZeroHeadFlow ?? curve.SearchLimit;
        _speed[l] = speed;
        _pumpSlopeFloor[l] = 1e-6 * Math.Abs(curve.C0) * Math.Max(speed, 1e-3) / qRef;
        _stepLimit[l] = Math.Max(speed, 1e-3) * qRef;
        if (!(speed > 0))
        {
            _status[l] = LinkStatus.PumpOff;
            _flow[l] = 0;
        }
        else if (_status[l] == LinkStatus.PumpOff || _flow[l] <= 0)
        {
            _status[l] = LinkStatus.Open;
            _flow[l] = 0.5 * speed * qRef;
        }
    }

    /// <summary>Recomputes the junctions cut off from every fixed head (after shutting links or freeing tanks).</summary>
    internal void RefreshSupply() => _unsupplied = FindUnsupplied();

    /// <summary>The solver's link index of pipe k, pump k or valve k of the model.</summary>
    internal int PipeLink(int k) => k;
    internal int PumpLink(int k) => _pipes + k;
    internal int ValveLink(int k) => _pumpEnd + k;

    /// <summary>The next solve starts from the default start (the known heads kept).</summary>
    internal void ForgetState() => _warm = false;

    /// <summary>Head of node j, m.</summary>
    internal double NodeHead(int j) => _head[j];

    /// <summary>Net flow into junction j from its links, m3/s (from the present flows).</summary>
    internal double NetInflow(int j, ReadOnlySpan<int> links)
    {
        double sum = 0;
        foreach (int l in links)
        {
            if (_to[l] == j) sum += _flow[l];
            if (_from[l] == j) sum -= _flow[l];
        }
        return sum;
    }

    /// <summary>The links with an end at junction j.</summary>
    internal int[] LinksAt(int j)
    {
        var list = new List<int>();
        for (int l = 0; l < _links; l++)
            if (_from[l] == j || _to[l] == j) list.Add(l);
        return list.ToArray();
    }

    // A timeline solve's looser stopping rule (0: none): see SolveTimeline's stageFlowTolerance.
    private double _stageFlowTolerance;

    /// <summary>One solve at the present demands, known heads and link settings, warm started; the same loop as
    /// <see cref="SolveCase"/> without building a result (the run builds one only at its report times).</summary>
    /// <param name="iterations">Newton iterations of this solve.</param>
    /// <param name="time">The run's time of this solve, s (for the predictor: see <see cref="Predict"/>).</param>
    /// <param name="stageFlowTolerance">0 for the solver's own tolerances; else an open link also meets the stopping rule
    /// when its energy imbalance would move its flow by at most this, |E| / (dh/dQ) &lt;= tolerance (m3/s), and a junction
    /// when its continuity error is at most this: a right-hand side for an integration stage, whose accuracy the run
    /// derives from its level tolerance.</param>
    internal NetworkStatus SolveTimeline(double time, out int iterations, double stageFlowTolerance = 0)
    {
        _stageFlowTolerance = _law is null && _valveOf.Length == 0 ? stageFlowTolerance : 0;
        try { return SolveTimelineWarm(time, out iterations); }
        finally { _stageFlowTolerance = 0; }
    }

    private NetworkStatus SolveTimelineWarm(double time, out int iterations)
    {
        bool warm = _warm;
        if (warm) Predict(time);
        var status = SolveTimelineOnce(out iterations);
        if (status.HasAnswer())
        {
            Remember(time, _lastPasses > 1);
            return status;
        }
        _history = 0;
        if (!warm || status == NetworkStatus.NoPathToFixedHead) return status;
        // A warm start can fail where a cold one succeeds: the statuses are held during each Newton solve, so a check
        // valve (or stopped pump) that closed earlier and must now open, because a tank went still or a control shut a
        // pipe, leaves a junction whose demand no open link can bring. The cold start opens every one of them.
        int first = iterations;
        status = SolveTimelineOnce(out iterations);
        iterations += first;
        return status;
    }

    private NetworkStatus SolveTimelineOnce(out int iterations)
    {
        var record = _timelineRecord!;
        record.Clear();
        iterations = 0;
        _lastPasses = 0;
        if (_unsupplied.Length > 0) return NetworkStatus.NoPathToFixedHead;
        if (!_warm) ResetTimeline();
        if (_law is not null) PlaceOnLaw();
        var status = SettleStatuses(record, _newton ??= Newton, watchCycles: true, out int pass);
        iterations = record.Count;
        _lastPasses = pass;
        _warm = status.HasAnswer();
        if (!_warm) ResetTimeline();
        return status;
    }

    /// <summary><see cref="Reset"/>, then the known heads put back, and every other junction started at the highest
    /// fixed or known head.</summary>
    private void ResetTimeline()
    {
        Reset();
        double top = double.NegativeInfinity;
        for (int r = 0; r < _reservoirs; r++) top = Math.Max(top, _head[_junctions + r]);
        for (int j = 0; j < _junctions; j++) if (_dirichlet[j]) top = Math.Max(top, _knownHead[j]);
        if (!double.IsFinite(top)) top = 0;
        for (int j = 0; j < _junctions; j++) _head[j] = _dirichlet[j] ? _knownHead[j] : top;
    }

    private int _lastPasses;

    // The predictor: the last two solved states of the run (heads of the junctions, flows of the links) and their times.
    private double[] _headA = [], _flowA = [], _headB = [], _flowB = [];
    private double _timeA, _timeB;
    private int _history; // how many of A and B are valid (B the latest)

    /// <summary>Forgets the solved states behind the predictor (the demands, the links or the known heads changed
    /// their form: a pattern boundary, a control, a tank held or released).</summary>
    internal void ForgetHistory() => _history = 0;

    /// <summary>Starts the solve from the line through the last two solved states A and B, at B + w (B - A), for |w| at
    /// most 4 (else from B as it stands). Between pattern boundaries and controls the demands are fixed and the state is
    /// a smooth function of the tanks' heads alone, so w is taken where the line comes nearest the new tank heads y:
    /// w = &lt;y - y_B, y_B - y_A&gt; / |y_B - y_A|^2 (the projection on the line of the heads), rather than from the times
    /// (w = (t - t_B)/(t_B - t_A)), which the step's stages miss: they sit at levels off the trajectory (y + h/2 k1,
    /// y + 3h/4 k2) and a rejected step goes back in time. On the 10 000-pipe benchmark day 874 Newton iterations instead
    /// of 961 by the times (a fit through up to four earlier states did worse: 880 to 931). The times serve when no tank
    /// head moved. Only for a demand-driven model without control valves (their states and the law's positions are not
    /// extrapolated); the known heads are the run's own.</summary>
    private void Predict(double t)
    {
        if (_history < 2 || _law is not null || _valveOf.Length > 0) return;
        double w = (t - _timeB) / (_timeB - _timeA);
        double along = 0, length = 0;
        for (int j = 0; j < _junctions; j++)
        {
            if (!_dirichlet[j]) continue;
            double d = _headB[j] - _headA[j];
            along += (_knownHead[j] - _headB[j]) * d;
            length += d * d;
        }
        if (length > 0) w = along / length;
        if (!(Math.Abs(w) <= 4)) return;
        for (int j = 0; j < _junctions; j++)
            if (!_dirichlet[j]) _head[j] = _headB[j] + w * (_headB[j] - _headA[j]);
        for (int l = 0; l < _links; l++)
            if (_status[l] == LinkStatus.Open) _flow[l] = _flowB[l] + w * (_flowB[l] - _flowA[l]);
    }

    /// <summary>Keeps the state just solved at time t as B (the previous B becomes A, unless statuses changed).</summary>
    private void Remember(double t, bool statusesChanged)
    {
        if (_law is not null || _valveOf.Length > 0) return;
        if (_headA.Length != _junctions)
        {
            _headA = new double[_junctions];
            _headB = new double[_junctions];
            _flowA = new double[_links];
            _flowB = new double[_links];
        }
        if (_history > 0 && t == _timeB)
        {
            // The same instant again (a report, a settle): B is replaced, A kept.
            Array.Copy(_head, _headB, _junctions);
            Array.Copy(_flow, _flowB, _links);
            if (statusesChanged) _history = 1;
            return;
        }
        (_headA, _headB) = (_headB, _headA);
        (_flowA, _flowB) = (_flowB, _flowA);
        (_timeA, _timeB) = (_timeB, t);
        Array.Copy(_head, _headB, _junctions);
        Array.Copy(_flow, _flowB, _links);
        _history = statusesChanged ? 1 : Math.Min(_history + 1, 2);
    }

    /// <summary>The result of the last <see cref="SolveTimeline"/> (call right after it, before any hook), with the
    /// tanks at known heads listed as reservoirs (outflow = minus their net inflow) and the held ones as junctions.</summary>
    /// <param name="status">The status the solve returned.</param>
    /// <param name="isTank">Per junction: a tank.</param>
    internal NetworkResult TimelineResult(NetworkStatus status, bool[] isTank)
    {
        var full = Report(status, 1.0, _timelineRecord!.ToArray(), _lastPasses);
        var junctions = new List<JunctionResult>(_junctions);
        var reservoirs = new List<ReservoirResult>(full.Reservoirs);
        var index = new Dictionary<string, int>(_nodeIndex.Count, StringComparer.Ordinal);
        for (int r = 0; r < reservoirs.Count; r++) index[reservoirs[r].Id] = ~r;
        for (int j = 0; j < _junctions; j++)
        {
            var result = full.Junctions[j];
            if (isTank[j] && _dirichlet[j])
            {
                index[result.Id] = ~reservoirs.Count;
                reservoirs.Add(new ReservoirResult(result.Id, result.Head, full.Status == NetworkStatus.NoPathToFixedHead ? 0 : -_continuity[j]));
            }
            else
            {
                index[result.Id] = junctions.Count;
                junctions.Add(result);
            }
        }
        // A tank's "pressure" is its level (or, held, its free head above the bottom): not a junction's pressure to warn of.
        var warnings = new List<NetworkWarning>(full.Warnings.Count);
        foreach (var w in full.Warnings)
            if (w.Code != NetworkWarningCode.NegativePressure || !(NodeOf(w.ElementId) is int k && k >= 0 && isTank[k])) warnings.Add(w);
        // The tables Report built are handed on as they are (they are arrays no one else holds).
        return new NetworkResult(full.Status, 1.0, (PipeResult[])full.Pipes, (PumpResult[])full.Pumps, junctions.ToArray(), reservoirs.ToArray(),
            (NetworkIteration[])full.Record, full.StatusPasses, (string[])full.UnsuppliedJunctions, (string[])full.PumpsUnableToLift, warnings.ToArray(),
            _linkIndex, index) { DemandModel = full.DemandModel, Valves = full.Valves };
    }
}
