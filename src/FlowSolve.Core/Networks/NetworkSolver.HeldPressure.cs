namespace FlowSolve.Core.Networks;

/// <summary>The bordered Newton iteration behind fast fire flow (<see cref="FireFlow"/>): the draw-off at one junction
/// is an unknown of the network solve, and the pressure head of one junction (the fire-flow junction itself, or another
/// whose minimum limits the flow) is held at a given value as the extra equation, so that the network and the draw-off
/// converge together in one Newton iteration instead of a network solve per trial draw-off.</summary>
/// <remarks>
/// <para>The bordered system. With the draw-off Q at junction k an unknown, the Newton step of the network equations
/// (<see cref="Step"/>: the head equations A dH = b in the head corrections, A the Schur complement) gains one column,
/// the draw-off's: continuity at k falls by dQ, so A dH = b - e_k dQ; and one row, the held junction c's head,
/// H_c + dH_c = H*. By linearity dH = x + w dQ with A x = b (the ordinary step) and A w = -e_k (the heads' response
/// to the draw-off, the column <see cref="DrawOffSensitivity"/> gives), so dQ = (H* - H_c - x_c) / w_c: one
/// factorisation and two triangular solves an iteration. w_c is negative (A is a weighted graph Laplacian plus links to
/// fixed heads, an M-matrix, whose inverse has no negative entry); a zero or non-finite w_c ends the solve with
/// <see cref="NetworkStatus.LinearSolveFailed"/>. The flows follow the heads link by link as in every step, so
/// continuity holds with the new draw-off after each step.</para>
/// <para>The step is taken as the ordinary step (shortened by <see cref="Step"/> when it would move a flow too far)
/// followed by the border's part w dQ, with dQ computed from the head the held junction reached after the first part
/// and shortened by the same rule (<see cref="MoveAlong"/>). With neither part shortened this is exactly the bordered
/// Newton step; shortened, it still moves toward the held head. The solve stops when the network's own tolerances are
/// met at the present draw-off and the held junction's head is within the given tolerance of H*. Statuses (check
/// valves, pumps) are updated between passes as in <see cref="SolveCase"/>.</para>
/// <para>Used for demand-driven networks solved with the direct head solver and without control valves
/// (<see cref="CanHoldPressure"/>); the caller falls back to the scalar search on any other network and on any solve
/// that does not converge.</para>
/// </remarks>
public sealed partial class NetworkSolver
{
    private double[] _border = [];          // w = A^-1 (-e_k), the heads' response to the draw-off
    private double[] _keptFactor = [];      // a factor kept by KeepFactor, and the conductances it was assembled with
    private double[] _keptConductance = [];

    /// <summary>True when <see cref="SolveHeldPressure"/> applies: a demand-driven network without control valves whose
    /// head equations are solved by the direct sparse Cholesky factorisation.</summary>
    internal bool CanHoldPressure => _direct is not null && _law is null && _valveOf.Length == 0;

    /// <summary>Elevation of junction <paramref name="j"/>, m.</summary>
    internal double Elevation(int j) => _elevation[j];

    /// <summary>The draw-off in m3/s the present state was solved with (0 when none).</summary>
    internal double StateDrawOff => _stateDrawOffJunction >= 0 ? _stateDrawOff : 0;

    /// <summary>Keeps a factor of the head equations for <see cref="RestoreKeptFactor"/>, and the conductances it was
    /// assembled with: at the present state with every open pipe's flow raised to at least
    /// <paramref name="leastVelocity"/> (m/s) times its area, or, with 0, at the present state itself. One Newton step
    /// assembles and factorises them (when the factor held is not already the present state's), which moves the state:
    /// the caller restores a state it saved.</summary>
    /// <returns>False when the head equations could not be solved, or the direct solver is not in use.</returns>
    internal bool KeepFactor(double leastVelocity)
    {
        if (_direct is null) return false;
        if (leastVelocity > 0)
        {
            for (int l = 0; l < _pipes; l++)
            {
                if (_status[l] != LinkStatus.Open) continue;
                double least = leastVelocity * _area[l];
                if (Math.Abs(_flow[l]) < least) _flow[l] = Math.CopySign(least, _flow[l]);
            }
            _factorCurrent = false;
        }
        if (!_factorCurrent && !RefreshFactor()) return false;
        if (_keptFactor.Length != _direct.FactorLength) _keptFactor = new double[_direct.FactorLength];
        if (_keptConductance.Length != _links) _keptConductance = new double[_links];
        _direct.SaveFactor(_keptFactor);
        _conductance.CopyTo(_keptConductance, 0);
        return true;
    }

    /// <summary>Puts back the factor and conductances kept by <see cref="KeepFactor"/>, as the present state's: call it
    /// right after restoring the state they were kept at.</summary>
    internal void RestoreKeptFactor()
    {
        _direct!.RestoreFactor(_keptFactor);
        _keptConductance.CopyTo(_conductance, 0);
        _factorCurrent = true;
    }

    /// <summary>Moves the present state along a tangent w = dH/dQ for a draw-off <paramref name="change"/>: heads by
    /// w times the change, each open link's flow by its conductance (those of the factor last made or restored) times
    /// the change of the head across it; shortened like a Newton step.</summary>
    /// <returns>The change taken; NaN when none could be.</returns>
    internal double MoveAlongTangent(ReadOnlySpan<double> dHeadDrawOff, double change)
    {
        if (!double.IsFinite(change)) return double.NaN;
        double ignored = 0;
        double moved = MoveAlong(dHeadDrawOff, change, ref ignored);
        if (!double.IsNaN(moved)) _factorCurrent = false;
        return moved;
    }

    /// <summary>The drop of the draw-off junction's head estimated at the present flows, m: the sum over the open links
    /// of phi_l (h_l(Q_l) - (H_from - H_to) of <paramref name="reference"/>), with phi_l = c_l (w_from - w_to) the flows of a
    /// unit draw-off by the tangent (<paramref name="dHeadDrawOff"/> = w, c the conductances of the factor held). By
    /// Tellegen's theorem the sum of a flow that meets continuity for a unit draw-off times the change of each link's head
    /// loss is the drop of the draw-off junction's head, exactly, when the head losses are those of a solution; at flows
    /// moved along the tangent it is an estimate that follows the losses' growth with the flow (a FlowSolve use of the
    /// theorem, for a first trial only). Evaluates every link at the present flows.</summary>
    /// <returns>The estimate; NaN when a flow left the friction relations' range.</returns>
    internal double DropAlong(ReadOnlySpan<double> dHeadDrawOff, DrawOffState reference)
    {
        _outOfRange = false;
        EvaluateLinks();
        if (_outOfRange) return double.NaN;
        double sum = 0;
        for (int l = 0; l < _links; l++)
        {
            if (_status[l] != LinkStatus.Open) continue;
            int f = _from[l], t = _to[l];
            double phi = _conductance[l] * ((f < _junctions ? dHeadDrawOff[f] : 0) - (t < _junctions ? dHeadDrawOff[t] : 0));
            sum += phi * (_headLoss[l] - (reference.Head[f] - reference.Head[t]));
        }
        return sum;
    }

    /// <summary>Solves with every demand times <paramref name="demandMultiplier"/> plus an unknown draw-off at
    /// <paramref name="junction"/>, chosen so that junction <paramref name="held"/> stands at the head
    /// <paramref name="heldHead"/> (m), by the bordered Newton iteration (see the type's remarks), from the present
    /// state and the draw-off <paramref name="startDrawOff"/> (m3/s). The draw-off found is <see cref="StateDrawOff"/>.
    /// A failed solve does not reset the state: the caller restores a state it saved.</summary>
    /// <param name="demandMultiplier">Multiplier on every demand.</param>
    /// <param name="junction">The draw-off junction k.</param>
    /// <param name="startDrawOff">The draw-off the present state stands at, m3/s.</param>
    /// <param name="held">The junction c whose head is held.</param>
    /// <param name="heldHead">The head H* to hold it at, m.</param>
    /// <param name="tolerance">Largest |H_c - H*| of an answer, m.</param>
    internal DrawOffSolve SolveHeldPressure(double demandMultiplier, int junction, double startDrawOff, int held, double heldHead, double tolerance)
    {
        for (int j = 0; j < _junctions; j++) _demand[j] = _baseDemand[j] * demandMultiplier;
        if (_unsupplied.Length > 0 || !CanHoldPressure) return new DrawOffSolve(NetworkStatus.NoPathToFixedHead, 0);
        if (_border.Length != _junctions) _border = new double[_junctions];
        _drawOffJunction = _stateDrawOffJunction = junction;
        _drawOff = startDrawOff;
        try
        {
            var record = _drawOffRecord ??= [];
            record.Clear();
            var status = SettleStatuses(record, (p, r) => HeldNewton(p, r, held, heldHead, tolerance), watchCycles: false, out int pass);
            _factorCurrent = record.Count > 0 && record[^1].StatusPass == pass;
            _warm = status.HasAnswer();
            return new DrawOffSolve(status, record.Count);
        }
        finally
        {
            _stateDrawOff = _drawOff;
            _drawOffJunction = -1;
        }
    }

    /// <summary>Bordered Newton iterations with the statuses fixed, until the tolerances are met (and the held head) or
    /// the cap is reached; as <see cref="Newton"/> for a demand-driven network, plus the border's part of each step.</summary>
    private NetworkStatus HeldNewton(int pass, List<NetworkIteration> record, int held, double heldHead, double tolerance)
    {
        var o = _options;
        double maxChange = double.PositiveInfinity;
        int linear = 0;
        bool stepped = false;
        var w = _border;
        while (true)
        {
            _outOfRange = false;
            EvaluateLinks();
            var (imbalance, continuity, met) = Measure();
            if (stepped) record.Add(new NetworkIteration(record.Count + 1, pass, maxChange, imbalance, continuity, linear));
            if (_outOfRange) return NetworkStatus.FlowsOutOfRange;
            if (!double.IsFinite(imbalance) || !double.IsFinite(continuity)) return NetworkStatus.LinearSolveFailed;
            if (met && Math.Abs(_head[held] - heldHead) <= tolerance) return NetworkStatus.Solved;
            if (record.Count >= o.MaxIterations) return NetworkStatus.IterationCapReached;
            double linearTolerance = Math.Max(0.1 * o.FlowTolerance, Math.Min(1e-6, 1e-3 * maxChange * maxChange));
            if (!Step(linearTolerance, out maxChange, out linear)) return NetworkStatus.LinearSolveFailed;
            stepped = true;
            // The border with the factor the step just made: w = A^-1 (-e_k), then the draw-off change that brings the
            // held junction to its head.
            Array.Clear(_rhs);
            _rhs[_drawOffJunction] = -1;
            _direct!.Solve(_rhs, w);
            double slope = w[held];
            if (!(slope < 0) || !double.IsFinite(slope)) return NetworkStatus.LinearSolveFailed;
            double moved = MoveAlong(w, (heldHead - _head[held]) / slope, ref maxChange);
            if (double.IsNaN(moved)) return NetworkStatus.LinearSolveFailed;
            _drawOff += moved;
            if (!double.IsFinite(_drawOff)) return NetworkStatus.LinearSolveFailed;
        }
    }
}
