namespace FlowSolve.Core.Networks;

/// <summary>
/// Control valves in the global gradient algorithm (see <see cref="ControlValve"/>).
/// </summary>
/// <remarks>
/// <para>States. Each valve is open, active or closed during a Newton solve, and the states are re-examined between
/// solves with the check valves and pumps (<see cref="UpdateValveStates"/>). Open, a valve is a fitting, h = K V^2/(2g),
/// made an odd cubic below <see cref="NetworkOptions.RegularisationVelocity"/> as for Hazen-Williams so that its slope
/// never vanishes. Closed, it carries no flow. An active flow-control valve carries exactly its setting. An active
/// pressure-reducing valve fixes the head of its To node at z + setting (a pressure-sustaining valve, of its From node),
/// and its flow is what continuity at that node asks.</para>
/// <para>The linear system stays symmetric positive definite. A node whose head an active valve holds drops out of the
/// head equations like a reservoir (its row becomes the identity). The valve's flow, by continuity at that node, is
/// Q = g - w^T dH, linear in the corrections dH of the heads around it, and it leaves (or, for a pressure-sustaining
/// valve, enters) the valve's other end r: so the exact Newton system is (A - sum u_p w_p^T) dH = b, with A the usual
/// symmetric positive definite matrix and one rank-one term u_p = +-e_r per active pressure valve. It is solved by the
/// Sherman-Morrison-Woodbury identity with A's own factor: x0 = A^-1 b, z_p = A^-1 u_p, then the small dense system
/// (I - W^T Z) t = W^T x0 by Gaussian elimination with partial pivoting, and dH = x0 + Z t. The Newton step is exact
/// (quadratic convergence) at the price of one more solve with the factor per active pressure valve. Because each
/// node may be an end of at most one valve, no two valves fix one node and no valve's flow depends on another's.</para>
/// <para>State rules (the margin is ten head tolerances, as for check valves; a reverse flow must exceed the flow
/// tolerance). Pressure-reducing: open to active when the head at To exceeds the target; active to open when the head at
/// From cannot supply the target plus the open loss; open or active to closed under reverse flow; closed to open (or
/// active, when the head at From exceeds the target) when the head at To falls below the target with forward head
/// across. Pressure-sustaining, mirrored on the From node: open to active when the head at From falls below the target;
/// active to open when the target exceeds the head at To by less than the open loss; closed to open when the head at From
/// exceeds the target and the head at To. Flow-control: open to active when the flow exceeds the setting; active to open
/// when the head across is less than the open loss at the setting; closed to open under forward head. A throttle has no
/// states (it is always active: its setting is its loss coefficient) and passes flow either way.</para>
/// <para>The search ends when no state changes, when <see cref="NetworkOptions.MaxStatusPasses"/> passes have run
/// (<see cref="NetworkStatus.StatusesNotSettled"/>), or when a set of states recurs (<see cref="NetworkStatus.StatusCycle"/>,
/// a warning on each valve that changed within the cycle): never reported converged.</para>
/// </remarks>
public sealed partial class NetworkSolver
{
    private int[] _valveOf = [];            // per link: its valve's index, -1 for a pipe or pump; empty without valves
    private ControlValve[] _valveModel = [];
    private ValveState[] _valveState = [];
    private double[] _valveTarget = [];     // pressure valves: the head held (z + setting), m; flow-control: the flow, m3/s
    private int[] _valveLink = [];          // per valve: its link index
    private int[] _controlled = [];         // per valve: the node whose head it holds (pressure valves), else -1
    private int[] _coupled = [];            // per pressure valve: its other end when a junction (the rank-one term's row), else -1
    private int[][] _neighbours = [];       // per pressure valve: the links at its controlled node, itself excluded
    private double[] _valveConstant = [];   // per valve: an active pressure valve's flow at dH = 0 (g)
    private bool[] _fixedHead = [];         // per junction: its head is held by an active valve this Newton solve
    private double[][] _woodbury = [];      // per valve slot: A^-1 u_p
    private double[] _small = [], _smallRhs = [], _unit = [];
    private int[] _activePressure = [];
    private string[] _cycle = [];

    /// <summary>Fills the link arrays of the valves (after the pipes and pumps) and returns each link's valve index.</summary>
    private int[] PrepareValves(NetworkModel model, Func<string, int> node)
    {
        int count = model.Valves.Count;
        if (count == 0) return [];
        var of = new int[_links];
        Array.Fill(of, -1);
        _valveModel = new ControlValve[count];
        _valveState = new ValveState[count];
        _valveTarget = new double[count];
        _valveLink = new int[count];
        _controlled = new int[count];
        _coupled = new int[count];
        _neighbours = new int[count][];
        _valveConstant = new double[count];
        _fixedHead = new bool[_junctions];
        _woodbury = new double[count][];
        _small = new double[count * count];
        _smallRhs = new double[count];
        _unit = new double[_junctions];
        _activePressure = new int[count];
        double g = Physical.StandardGravity;
        for (int v = 0; v < count; v++)
        {
            var valve = model.Valves[v];
            int l = _pumpEnd + v;
            of[l] = v;
            _valveModel[v] = valve;
            _valveLink[v] = l;
            _from[l] = node(valve.From);
            _to[l] = node(valve.To);
            _kind[l] = Kind.Valve;
            double area = 0.25 * Math.PI * valve.Diameter * valve.Diameter;
            _area[l] = area;
            _minorConstant[l] = valve.OpenLossCoefficient / (2 * g * area * area);
            _stepLimit[l] = StepVelocity * area;
            (_controlled[v], _coupled[v]) = valve.Type switch
            {
                ControlValveType.PressureReducing => (_to[l], _from[l] < _junctions ? _from[l] : -1),
                ControlValveType.PressureSustaining => (_from[l], _to[l] < _junctions ? _to[l] : -1),
                _ => (-1, -1),
            };
            _valveTarget[v] = _controlled[v] >= 0 ? _elevation[_controlled[v]] + valve.Setting : valve.Setting;
            _neighbours[v] = [];
        }
        return of;
    }

    /// <summary>The links at each pressure valve's controlled node (once the link arrays are complete).</summary>
    private void PrepareValveNeighbours()
    {
        for (int v = 0; v < _valveModel.Length; v++)
        {
            int c = _controlled[v];
            if (c < 0) continue;
            var list = new List<int>();
            for (int l = 0; l < _links; l++)
                if (l != _valveLink[v] && (_from[l] == c || _to[l] == c)) list.Add(l);
            _neighbours[v] = list.ToArray();
        }
    }

    /// <summary>Every valve open (a throttle active), no head held.</summary>
    private void ResetValves()
    {
        for (int v = 0; v < _valveModel.Length; v++)
        {
            _valveState[v] = _valveModel[v].Type == ControlValveType.Throttle ? ValveState.Active : ValveState.Open;
            if (_shut.Length == 0 || !_shut[_valveLink[v]]) continue;
            _valveState[v] = ValveState.Closed; // shut by a control of an extended-period run
            _status[_valveLink[v]] = LinkStatus.Closed;
            _flow[_valveLink[v]] = 0;
        }
        Array.Clear(_fixedHead);
    }

    private bool IsPressureValve(int v) => _controlled[v] >= 0;

    /// <summary>The open valve's loss K Q|Q|/(2 g A^2), below the regularisation velocity the odd cubic a Q + b Q^3 with
    /// the same value and slope there (a = m Qs/2, b = m/(2 Qs)).</summary>
    private (double HeadLoss, double Slope) ValveLoss(int l, double q)
    {
        double m = _minorConstant[l], threshold = _options.RegularisationVelocity * _area[l], aq = Math.Abs(q);
        if (aq >= threshold) return (m * q * aq, 2 * m * aq);
        double a = 0.5 * m * threshold, b = 0.5 * m / threshold;
        return (a * q + b * q * q * q, a + 3 * b * q * q);
    }

    /// <summary>The fixed rows of the held heads, and for each active pressure valve its flow at dH = 0 and its term in
    /// the right-hand side of its other end's row.</summary>
    private void AssembleValves(Span<double> values)
    {
        int n = 0;
        for (int j = 0; j < _junctions; j++)
        {
            if (!_fixedHead[j]) continue;
            values[_diagJunction[j]] = 1;
            _rhs[j] = 0;
        }
        for (int v = 0; v < _valveModel.Length; v++)
        {
            if (!IsPressureValve(v) || _valveState[v] != ValveState.Active) continue;
            _valveConstant[v] = ControlledFlow(v, null);
            int r = _coupled[v];
            if (r >= 0 && !_fixedHead[r])
            {
                _rhs[r] += Sign(v) * (_flow[_valveLink[v]] - _valveConstant[v]);
                _activePressure[n++] = v;
            }
        }
        _activeCount = n;
    }

    private int _activeCount;

    /// <summary>+1 for a pressure-reducing valve (its flow leaves the row's node), -1 for a pressure-sustaining one.</summary>
    private double Sign(int v) => _valveModel[v].Type == ControlValveType.PressureReducing ? 1 : -1;

    /// <summary>An active pressure valve's flow by continuity at its controlled node after a step dH =
    /// <paramref name="dh"/> (null: dH = 0): sign (delivery + outflows - inflows) with every other link's linearised flow
    /// Q + c (E + dH_from - dH_to) and the held head's dH = 0.</summary>
    private double ControlledFlow(int v, double[]? dh)
    {
        int c = _controlled[v];
        double sum = _delivered[c];
        if (_law is not null && _onLaw[c]) sum += _outletConductance[c] * _outletImbalance[c];
        foreach (int l in _neighbours[v])
        {
            double q = _status[l] == LinkStatus.Open
                ? _flow[l] + _conductance[l] * (_imbalance[l] + (dh is null ? 0 : Correction(dh, _from[l]) - Correction(dh, _to[l])))
                : _kind[l] == Kind.Valve ? _flow[l] : 0;
            sum += _from[l] == c ? q : -q;
        }
        return Sign(v) * sum;
    }

    /// <summary>The linear part of <see cref="ControlledFlow"/> for a vector y: sign (sum over outflows of c (y_from -
    /// y_to) minus the same over inflows), y taken as 0 at fixed heads and reservoirs. Equals -w^T y.</summary>
    private double LinearPart(int v, double[] y)
    {
        int c = _controlled[v];
        double sum = 0;
        foreach (int l in _neighbours[v])
        {
            if (_status[l] != LinkStatus.Open) continue;
            double d = _conductance[l] * (Correction(y, _from[l]) - Correction(y, _to[l]));
            sum += _from[l] == c ? d : -d;
        }
        return Sign(v) * sum;
    }

    private double Correction(double[] y, int node) => node < _junctions && !_fixedHead[node] ? y[node] : 0;

    /// <summary>Applies the rank-one terms of the active pressure valves to the head corrections in <c>_x</c> (which
    /// hold A^-1 b) by the Sherman-Morrison-Woodbury identity; false if a value is not finite or the small system is
    /// singular.</summary>
    private bool CorrectForValves(double linearTolerance, ref int linearIterations)
    {
        int p = _activeCount;
        if (p == 0) return true;
        for (int a = 0; a < p; a++)
        {
            int v = _activePressure[a];
            var z = _woodbury[a] ??= new double[_junctions];
            Array.Clear(z);
            var u = _unit;
            Array.Clear(u);
            u[_coupled[v]] = Sign(v);
            if (_direct is not null)
            {
                _direct.Solve(u, z);
                linearIterations++;
            }
            else
            {
                var (iterations, residual) = _iterative!.Solve(u, z, linearTolerance, _options.MaxLinearIterations);
                linearIterations += iterations;
                if (!double.IsFinite(residual)) return false;
            }
        }
        // S = I - W^T Z, with w_p^T y = -LinearPart(p, y); right-hand side W^T x0.
        for (int a = 0; a < p; a++)
        {
            int v = _activePressure[a];
            for (int b = 0; b < p; b++) _small[a * p + b] = (a == b ? 1 : 0) + LinearPart(v, _woodbury[b]);
            _smallRhs[a] = -LinearPart(v, _x);
        }
        if (!SolveSmall(p)) return false;
        for (int b = 0; b < p; b++)
        {
            double t = _smallRhs[b];
            var z = _woodbury[b];
            for (int j = 0; j < _junctions; j++) _x[j] += t * z[j];
        }
        for (int j = 0; j < _junctions; j++) if (!double.IsFinite(_x[j])) return false;
        return true;
    }

    /// <summary>Gaussian elimination with partial pivoting on the p x p system in <c>_small</c>, solution in <c>_smallRhs</c>.</summary>
    private bool SolveSmall(int p)
    {
        var m = _small;
        var r = _smallRhs;
        for (int k = 0; k < p; k++)
        {
            int pivot = k;
            for (int i = k + 1; i < p; i++) if (Math.Abs(m[i * p + k]) > Math.Abs(m[pivot * p + k])) pivot = i;
            double big = m[pivot * p + k];
            if (!(Math.Abs(big) > 1e-300) || !double.IsFinite(big)) return false;
            if (pivot != k)
            {
                for (int j = 0; j < p; j++) (m[k * p + j], m[pivot * p + j]) = (m[pivot * p + j], m[k * p + j]);
                (r[k], r[pivot]) = (r[pivot], r[k]);
            }
            for (int i = k + 1; i < p; i++)
            {
                double f = m[i * p + k] / big;
                if (f == 0) continue;
                for (int j = k; j < p; j++) m[i * p + j] -= f * m[k * p + j];
                r[i] -= f * r[k];
            }
        }
        for (int k = p - 1; k >= 0; k--)
        {
            double s = r[k];
            for (int j = k + 1; j < p; j++) s -= m[k * p + j] * r[j];
            r[k] = s / m[k * p + k];
        }
        return true;
    }

    /// <summary>The new flow of a valve link that is not open: 0 closed, the setting for an active flow-control valve,
    /// by continuity at the held node for an active pressure valve (with the step's head corrections in <c>_x</c>).</summary>
    private double ActiveValveFlow(int l)
    {
        int v = _valveOf[l];
        if (_valveState[v] != ValveState.Active) return 0;
        if (!IsPressureValve(v)) return _valveTarget[v];
        return _valveConstant[v] + LinearPart(v, _x);
    }

    /// <summary>Re-examines every valve's state from the converged Newton solve; returns the number of changes.</summary>
    private int UpdateValveStates(double margin)
    {
        int changes = 0;
        double reverse = -_options.FlowTolerance;
        for (int v = 0; v < _valveModel.Length; v++)
        {
            var type = _valveModel[v].Type;
            if (type == ControlValveType.Throttle) continue;
            int l = _valveLink[v], f = _from[l], t = _to[l];
            if (_shut.Length > 0 && _shut[l]) continue; // shut by a control: stays closed
            double hf = _head[f], ht = _head[t], q = _flow[l], target = _valveTarget[v];
            var state = _valveState[v];
            var next = state;
            switch (type)
            {
                case ControlValveType.PressureReducing:
                    if (state != ValveState.Closed && q < reverse) next = ValveState.Closed;
                    else if (state == ValveState.Open && ht > target + margin) next = ValveState.Active;
                    else if (state == ValveState.Active && hf - target - ValveLoss(l, q).HeadLoss < -margin) next = ValveState.Open;
                    else if (state == ValveState.Closed && ht < target - margin && hf > ht + margin)
                        next = hf > target + margin ? ValveState.Active : ValveState.Open;
                    break;
                case ControlValveType.PressureSustaining:
                    if (state != ValveState.Closed && q < reverse) next = ValveState.Closed;
                    else if (state == ValveState.Open && hf < target - margin) next = ValveState.Active;
                    else if (state == ValveState.Active && target - ht - ValveLoss(l, q).HeadLoss < -margin) next = ValveState.Open;
                    else if (state == ValveState.Closed && hf > target + margin && hf > ht + margin) next = ValveState.Open;
                    break;
                default: // flow control
                    if (state == ValveState.Open && q < reverse) next = ValveState.Closed;
                    else if (state == ValveState.Open && q > target + _options.FlowTolerance) next = ValveState.Active;
                    else if (state == ValveState.Active && hf - ht - ValveLoss(l, target).HeadLoss < -margin) next = ValveState.Open;
                    else if (state == ValveState.Closed && hf - ht > margin) next = ValveState.Open;
                    break;
            }
            if (next == state) continue;
            changes++;
            _valveState[v] = next;
            _status[l] = next == ValveState.Open ? LinkStatus.Open : LinkStatus.Closed;
            if (next == ValveState.Closed) _flow[l] = 0;
            else if (next == ValveState.Active && !IsPressureValve(v)) _flow[l] = target;
            else if (state == ValveState.Closed) _flow[l] = 0.01 * InitialVelocity * _area[l];
            if (next == ValveState.Active && IsPressureValve(v)) _head[_controlled[v]] = target;
        }
        if (changes > 0) changes += DemoteFloatingValves();
        for (int v = 0; v < _valveModel.Length; v++)
            if (IsPressureValve(v)) _fixedHead[_controlled[v]] = _valveState[v] == ValveState.Active;
        return changes;
    }

    /// <summary>An active valve drops its energy equation, so a group of junctions joined to the rest only through
    /// active valves (and closed links) would have no head to stand on: its heads float and the head equations are
    /// singular. That happens when several states change in one pass (a pressure-reducing valve made active whose
    /// upstream side is now fed only from its own downstream node, through valves just closed). Such a valve cannot hold
    /// its setting: a pressure-reducing one is closed (its upstream side could only be fed back from its downstream
    /// side), a pressure-sustaining or flow-control one opened (the demand beyond it must pass). Repeated until no group
    /// floats; returns the number of valves changed.</summary>
    private int DemoteFloatingValves()
    {
        int nodes = _junctions + _reservoirs, demoted = 0;
        var parent = new int[nodes];
        var supplied = new bool[nodes];
        int Find(int i)
        {
            while (parent[i] != i) { parent[i] = parent[parent[i]]; i = parent[i]; }
            return i;
        }
        for (int round = 0; round <= _valveModel.Length; round++)
        {
            bool any = false;
            for (int v = 0; v < _valveModel.Length; v++)
            {
                var type = _valveModel[v].Type;
                if (type == ControlValveType.Throttle || _valveState[v] != ValveState.Active) continue;
                // The groups joined by open links, the valve's own held node left out (the water it sends on leaves
                // there), each standing on a reservoir or on a head another active valve holds.
                int own = _controlled[v];
                for (int i = 0; i < nodes; i++) parent[i] = i;
                Array.Clear(supplied);
                for (int l = 0; l < _links; l++)
                {
                    if (_status[l] != LinkStatus.Open || _from[l] == own || _to[l] == own) continue;
                    int a = Find(_from[l]), b = Find(_to[l]);
                    if (a != b) parent[a] = b;
                }
                for (int r = 0; r < _reservoirs; r++) supplied[Find(_junctions + r)] = true;
                for (int j = 0; j < _dirichlet.Length; j++)
                    if (_dirichlet[j]) supplied[Find(j)] = true; // a tank at a known head (an extended-period run)
                for (int w = 0; w < _valveModel.Length; w++)
                    if (w != v && IsPressureValve(w) && _valveState[w] == ValveState.Active) supplied[Find(_controlled[w])] = true;
                int lv = _valveLink[v], f = _from[lv], t = _to[lv];
                if ((f == own || supplied[Find(f)]) && (t == own || supplied[Find(t)])) continue;
                any = true;
                demoted++;
                if (type == ControlValveType.PressureReducing)
                {
                    _valveState[v] = ValveState.Closed;
                    _flow[lv] = 0;
                }
                else
                {
                    _valveState[v] = ValveState.Open;
                    _status[lv] = LinkStatus.Open;
                    if (!(_flow[lv] > 0)) _flow[lv] = 0.01 * InitialVelocity * _area[lv];
                }
            }
            if (!any) break;
        }
        return demoted;
    }

    /// <summary>Every link's status and every valve's state, one byte each.</summary>
    private byte[] StateSnapshot()
    {
        var s = new byte[_links + _valveModel.Length];
        for (int l = 0; l < _links; l++) s[l] = (byte)_status[l];
        for (int v = 0; v < _valveModel.Length; v++) s[_links + v] = (byte)_valveState[v];
        return s;
    }

    /// <summary>True when the present states were solved before in this case; then <c>_cycle</c> names the valves that
    /// changed within the cycle. Else the states are remembered.</summary>
    private bool SeenBefore(List<byte[]> seen)
    {
        var now = StateSnapshot();
        for (int k = 0; k < seen.Count; k++)
        {
            if (!seen[k].AsSpan().SequenceEqual(now)) continue;
            var names = new List<string>();
            for (int v = 0; v < _valveModel.Length; v++)
            {
                for (int i = k; i < seen.Count; i++)
                {
                    var next = i + 1 < seen.Count ? seen[i + 1] : now;
                    if (seen[i][_links + v] != next[_links + v]) { names.Add(_valveModel[v].Id); break; }
                }
            }
            _cycle = names.ToArray();
            return true;
        }
        seen.Add(now);
        return false;
    }

    /// <summary>Each valve's result, and a warning on each valve of a cycle.</summary>
    private ValveResult[] ReportValves(bool solved, int passes, List<NetworkWarning> warnings)
    {
        var results = new ValveResult[_valveModel.Length];
        for (int v = 0; v < results.Length; v++)
        {
            int l = _valveLink[v];
            results[v] = solved
                ? new ValveResult(_valveModel[v].Id, _flow[l], _head[_from[l]] - _head[_to[l]], _valveState[v])
                : new ValveResult(_valveModel[v].Id, 0, 0, _valveState[v]);
        }
        foreach (var id in _cycle) warnings.Add(new NetworkWarning(id, NetworkWarningCode.ValveStateCycle, passes));
        return results;
    }
}
