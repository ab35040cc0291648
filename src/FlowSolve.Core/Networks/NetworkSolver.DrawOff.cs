namespace FlowSolve.Core.Networks;

/// <summary>How a solve with an added draw-off ended (<see cref="NetworkSolver.SolveDrawOff"/>): no result tables.</summary>
/// <param name="Status">Why the solve stopped.</param>
/// <param name="Iterations">Newton iterations over all status passes.</param>
internal readonly record struct DrawOffSolve(NetworkStatus Status, int Iterations)
{
    /// <summary>True when the heads and flows meet the tolerances.</summary>
    public bool Converged => Status.HasAnswer();
}

/// <summary>The hook behind fire flow (<see cref="FireFlow"/>): a solve with a fixed draw-off added at one junction,
/// warm-started from the instance's present state, and the heads' derivatives with respect to that draw-off from the
/// factor of the head equations the solve already holds.</summary>
/// <remarks>The draw-off enters continuity only (<see cref="AddDrawOff"/>): it is a fixed demand whatever the pressure,
/// also under pressure-driven demand, where the junction's own demand still follows the law.</remarks>
public sealed partial class NetworkSolver
{
    private int _drawOffJunction = -1;
    private double _drawOff;
    private bool _factorCurrent; // the head equations' factor belongs to the present state (set by a draw-off solve)
    private int _stateDrawOffJunction = -1; // the draw-off the present state was solved with (-1: none)
    private double _stateDrawOff;
    private List<NetworkIteration>? _drawOffRecord;

    /// <summary>Continuity with the draw-off: junction k's imbalance falls by the draw-off, and its scale (for the
    /// rounding floor of the stopping rule) grows by it.</summary>
    private void AddDrawOff(double[] continuity, double[] scale)
    {
        continuity[_drawOffJunction] -= _drawOff;
        scale[_drawOffJunction] += Math.Abs(_drawOff);
    }

    /// <summary>Number of junctions (the length of the head vector).</summary>
    internal int JunctionCount => _junctions;

    /// <summary>The junction's index in model order, or -1 when <paramref name="id"/> is not a junction.</summary>
    internal int JunctionIndex(string id) => _nodeIndex.TryGetValue(id, out int k) && k >= 0 ? k : -1;

    /// <summary>Pressure head H - z of junction <paramref name="j"/> at the present state, m.</summary>
    internal double PressureHead(int j) => _head[j] - _elevation[j];

    /// <summary>Solves with every demand times <paramref name="demandMultiplier"/> plus the fixed
    /// <paramref name="drawOff"/> (m3/s) at junction <paramref name="junction"/>, from the present state (unlike
    /// <see cref="SolveCase"/>, a failed solve does not reset it: the caller restores a state it saved).</summary>
    internal DrawOffSolve SolveDrawOff(double demandMultiplier, int junction, double drawOff)
    {
        for (int j = 0; j < _junctions; j++) _demand[j] = _baseDemand[j] * demandMultiplier;
        if (_unsupplied.Length > 0) return new DrawOffSolve(NetworkStatus.NoPathToFixedHead, 0);
        if (_law is not null) PlaceOnLaw();
        _drawOffJunction = _stateDrawOffJunction = junction;
        _drawOff = _stateDrawOff = drawOff;
        try
        {
            var record = _drawOffRecord ??= [];
            record.Clear();
            var status = SettleStatuses(record, _newton ??= Newton, watchCycles: false, out int pass);
            // The factor is the last Newton step's, at the present statuses, when the last pass took a step.
            _factorCurrent = record.Count > 0 && record[^1].StatusPass == pass;
            _warm = status.HasAnswer();
            return new DrawOffSolve(status, record.Count);
        }
        finally
        {
            _drawOffJunction = -1;
        }
    }

    /// <summary>dH_j/dQ for every junction j, m per m3/s, where Q is a draw-off at <paramref name="junction"/>: the column
    /// -A^-1 e_k of the head equations' matrix A (the Schur complement of the Newton step, see <see cref="Step"/>; under
    /// pressure-driven demand with each on-law junction's tangent conductance on its diagonal), by one solve with the
    /// factor the last Newton step left. A draw-off dQ lowers junction k's continuity imbalance by dQ, so the Newton step
    /// moves the heads by A^-1 (-e_k) dQ. When the factor is not the present state's (no step was taken since the state
    /// was restored), one Newton step at the present state refreshes it first.</summary>
    /// <returns>False when the head equations could not be solved (non-finite values).</returns>
    internal bool DrawOffSensitivity(int junction, Span<double> dHeadDrawOff)
    {
        if (!_factorCurrent && !RefreshFactor()) return false;
        Array.Clear(_rhs);
        _rhs[junction] = -1;
        if (_direct is not null) _direct.Solve(_rhs, dHeadDrawOff);
        else
        {
            dHeadDrawOff.Clear();
            _iterative!.Solve(_rhs, dHeadDrawOff, 1e-14, _options.MaxLinearIterations);
        }
        foreach (double d in dHeadDrawOff)
            if (!double.IsFinite(d)) return false;
        return true;
    }

    /// <summary>Moves the present state along the tangent for a change <paramref name="change"/> (m3/s) of the draw-off:
    /// heads by dH/dQ times the change and each open link's flow by its conductance times the change of the head across
    /// it. That is the first Newton step of the next solve, taken with the factor already held, so the next solve
    /// saves a factorisation. The change is shortened like a Newton step (<see cref="Step"/>) when it would move a
    /// link's flow by more than its step limit or twice its flow.</summary>
    internal void PredictDrawOff(ReadOnlySpan<double> dHeadDrawOff, double change)
    {
        if (!_factorCurrent || !double.IsFinite(change)) return;
        double ignored = 0;
        if (double.IsNaN(MoveAlong(dHeadDrawOff, change, ref ignored))) return;
        _factorCurrent = false;
    }

    /// <summary>The factor of the head equations at the present state: one Newton step of the equations the present
    /// state solves (draw-off included) assembles and factorises them there; the step itself moves the state by what is
    /// left of its imbalances.</summary>
    /// <returns>False when the head equations could not be solved.</returns>
    private bool RefreshFactor()
    {
        _drawOffJunction = _stateDrawOffJunction;
        _drawOff = _stateDrawOff;
        try
        {
            _outOfRange = false;
            EvaluateLinks();
            EvaluateOutlets();
            Measure();
            if (_outOfRange || !Step(0.1 * _options.FlowTolerance, out _, out _)) return false;
        }
        finally
        {
            _drawOffJunction = -1;
        }
        _factorCurrent = true;
        return true;
    }

    /// <summary>Moves heads and open links' flows along the tangent dH/dQ for a change of the draw-off (see
    /// <see cref="PredictDrawOff"/>), shortened like a Newton step; raises <paramref name="maxChange"/> to the largest
    /// change of a link's flow.</summary>
    /// <returns>The change of the draw-off taken (the shortened one); NaN when none could be taken.</returns>
    private double MoveAlong(ReadOnlySpan<double> dHeadDrawOff, double change, ref double maxChange)
    {
        double scale = 1;
        for (int l = 0; l < _links; l++)
        {
            if (_status[l] != LinkStatus.Open) continue;
            int f = _from[l], t = _to[l];
            double across = (f < _junctions ? dHeadDrawOff[f] : 0) - (t < _junctions ? dHeadDrawOff[t] : 0);
            double move = Math.Abs(_conductance[l] * across * change);
            double limit = Math.Max(_stepLimit[l], 2 * Math.Abs(_flow[l]));
            if (move > limit && limit < scale * move) scale = limit / move;
        }
        if (!(scale > 0) || !double.IsFinite(scale)) return double.NaN;
        double step = scale * change;
        for (int j = 0; j < _junctions; j++) _head[j] += step * dHeadDrawOff[j];
        for (int l = 0; l < _links; l++)
        {
            if (_status[l] != LinkStatus.Open) continue;
            int f = _from[l], t = _to[l];
            double across = (f < _junctions ? dHeadDrawOff[f] : 0) - (t < _junctions ? dHeadDrawOff[t] : 0);
            double move = _conductance[l] * across * step;
            _flow[l] += move;
            if (!(Math.Abs(move) <= maxChange)) maxChange = Math.Abs(move);
        }
        return step;
    }

    /// <summary>A saved state of a solver: heads, flows, statuses and positions on the demand law.</summary>
    internal sealed class DrawOffState
    {
        internal double[] Head = [], Flow = [], Position = [];
        internal LinkStatus[] Status = [];
        internal bool Warm;
        internal int DrawOffJunction = -1;
        internal double DrawOff;
    }

    /// <summary>Saves the present state (with the draw-off it was solved with; none after <see cref="SolveCase"/> on a
    /// new instance, the only order in which <see cref="FireFlow"/> uses them) into <paramref name="into"/> (allocated on first use).</summary>
    internal DrawOffState SaveState(DrawOffState? into = null)
    {
        into ??= new DrawOffState();
        if (into.Head.Length != _head.Length) into.Head = new double[_head.Length];
        if (into.Flow.Length != _flow.Length) into.Flow = new double[_flow.Length];
        if (into.Position.Length != _position.Length) into.Position = new double[_position.Length];
        if (into.Status.Length != _status.Length) into.Status = new LinkStatus[_status.Length];
        _head.CopyTo(into.Head, 0);
        _flow.CopyTo(into.Flow, 0);
        _position.CopyTo(into.Position, 0);
        _status.CopyTo(into.Status, 0);
        into.Warm = _warm;
        into.DrawOffJunction = _stateDrawOffJunction;
        into.DrawOff = _stateDrawOff;
        return into;
    }

    /// <summary>Returns to a saved state; the factor held no longer belongs to it.</summary>
    internal void RestoreState(DrawOffState state)
    {
        state.Head.CopyTo(_head, 0);
        state.Flow.CopyTo(_flow, 0);
        state.Position.CopyTo(_position, 0);
        state.Status.CopyTo(_status, 0);
        _warm = state.Warm;
        _stateDrawOffJunction = state.DrawOffJunction;
        _stateDrawOff = state.DrawOff;
        _factorCurrent = false;
    }
}
