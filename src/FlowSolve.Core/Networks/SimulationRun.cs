using System.Globalization;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Core.Networks;

/// <summary>One extended-period run (see <see cref="NetworkSimulator"/> for the method). Not thread-safe; used once.</summary>
internal sealed class SimulationRun
{
    // Bogacki and Shampine (1989): c = (0, 1/2, 3/4, 1); b = (2/9, 1/3, 4/9, 0); the error of the embedded second-order
    // solution, b - b* = (-5/72, 1/12, 1/9, -1/8).
    private const double B1 = 2.0 / 9, B2 = 1.0 / 3, B3 = 4.0 / 9;
    private const double E1 = -5.0 / 72, E2 = 1.0 / 12, E3 = 1.0 / 9, E4 = -1.0 / 8;
    // Samples of the step's interpolant searched for the first sign change of an event function (a FlowSolve choice:
    // a level that crosses a threshold and returns within 1/16 of a step would need a curvature the error control
    // does not allow at these tolerances).
    private const int EventSamples = 16;
    // A held tank is released when its free head passes the limit's head by more than this, m (about ten head
    // tolerances of the network solve: below it the sign of the net flow is rounding).
    private const double ReleaseMargin = 1e-9;

    private readonly SimulationModel _model;
    private readonly SimulationOptions _options;
    private readonly CancellationToken _token;
    private readonly NetworkSolver _solver;

    private readonly int _tankCount;
    private readonly int[] _tankNode;
    private readonly int[][] _tankLinks;
    private readonly double[] _area, _bottom, _min, _max;
    private readonly bool[] _isTank;

    private readonly int[] _patternOf;          // per solver junction: pattern index or -1
    private readonly double[][] _multipliers;
    private readonly double[] _factors;
    private readonly bool _patterned;
    private long _segment;

    private readonly NetworkControl[] _controls;
    private readonly int[] _controlLink;        // solver link index
    private readonly int[] _controlPump;        // model pump index, or -1 for a pipe
    private readonly int[] _controlTank;        // tank index, or -1 for a time control
    private readonly bool[] _armed;
    private readonly double[] _speed;           // per model pump: its speed ratio when running
    private readonly bool[] _pumpShut;
    private readonly double[] _controlTimes;    // distinct times of the time controls within the duration, sorted
    private int _nextControlTime;

    private readonly double[] _scratch, _scratchRate, _scratchRelease;
    private readonly double[] _y, _k1, _k2, _k3, _k4, _yStage, _yNew, _release, _releaseNew, _inflow;
    private readonly sbyte[] _held;             // +1 held full, -1 held empty, 0 moving
    private readonly bool[] _fullArmed, _emptyArmed;
    private readonly double _band;
    private readonly double _smallestArea;      // the smallest tank's area, m2 (for the stages' stopping rule)
    private bool _lastLoose;                    // the last solve stopped on the stages' rule, not the network's tolerances

    private readonly List<SimulationReport> _reports = [];
    private readonly List<SimulationEvent> _events = [];
    private readonly List<SimulationStep> _steps = [];
    private int _solves, _attempts;
    private int _stepSolves, _stepIterations;
    private NetworkStatus _lastStatus;
    private bool _stateCurrent; // the solver's state is the solve of the present time, levels and settings
    private int _forceRelease = -1;  // a held tank whose release was located in the last step: released at its end
    private int _locatedTank = -1;   // a tank whose limit was located on the last step: its event carries the root's figures
    private int _locatedIterations;
    private double _locatedResidual;

    private readonly long _reportCount;   // report times: k * reportStep for k < _reportCount, then the duration
    private long _nextReport;

    public SimulationRun(SimulationModel model, SimulationOptions options, CancellationToken token)
    {
        _model = model;
        _options = options;
        _token = token;
        var network = NetworkSimulator.WithTanks(model);
        _solver = new NetworkSolver(network, options.Network);
        _solver.BeginTimeline();

        var tanks = model.Tanks ?? [];
        _tankCount = tanks.Count;
        _tankNode = new int[_tankCount];
        _tankLinks = new int[_tankCount][];
        _area = new double[_tankCount];
        _bottom = new double[_tankCount];
        _min = new double[_tankCount];
        _max = new double[_tankCount];
        int junctions = network.Junctions.Count;
        _isTank = new bool[junctions];
        var tankIndex = new Dictionary<string, int>(StringComparer.Ordinal);
        for (int i = 0; i < _tankCount; i++)
        {
            var t = tanks[i];
            tankIndex[t.Id] = i;
            _tankNode[i] = _solver.NodeOf(t.Id);
            _isTank[_tankNode[i]] = true;
            _tankLinks[i] = _solver.LinksAt(_tankNode[i]);
            _area[i] = t.Area;
            _bottom[i] = t.Elevation;
            _min[i] = t.MinimumLevel;
            _max[i] = t.MaximumLevel;
        }
        _band = Math.Max(10 * options.LevelTolerance, 1e-6);
        _smallestArea = _tankCount == 0 ? 0 : _area.Min();

        var patterns = model.Patterns ?? [];
        var patternIndex = new Dictionary<string, int>(StringComparer.Ordinal);
        _multipliers = new double[patterns.Count][];
        for (int p = 0; p < patterns.Count; p++)
        {
            patternIndex[patterns[p].Id] = p;
            _multipliers[p] = [.. patterns[p].Multipliers];
        }
        _patternOf = new int[junctions];
        Array.Fill(_patternOf, -1);
        foreach (var (junction, pattern) in model.JunctionPatterns ?? new Dictionary<string, string>())
        {
            _patternOf[_solver.NodeOf(junction)] = patternIndex[pattern];
            _patterned = true;
        }
        _factors = new double[junctions];

        var pipeIndex = new Dictionary<string, int>(StringComparer.Ordinal);
        for (int k = 0; k < network.Pipes.Count; k++) pipeIndex[network.Pipes[k].Id] = k;
        var valveIndex = new Dictionary<string, int>(StringComparer.Ordinal);
        for (int k = 0; k < network.Valves.Count; k++) valveIndex[network.Valves[k].Id] = k;
        var pumpIndex = new Dictionary<string, int>(StringComparer.Ordinal);
        _speed = new double[network.Pumps.Count];
        _pumpShut = new bool[network.Pumps.Count];
        for (int k = 0; k < network.Pumps.Count; k++)
        {
            pumpIndex[network.Pumps[k].Id] = k;
            _speed[k] = network.Pumps[k].SpeedRatio;
        }
        _controls = [.. model.Controls ?? []];
        int n = _controls.Length;
        _controlLink = new int[n];
        _controlPump = new int[n];
        _controlTank = new int[n];
        _armed = new bool[n];
        var times = new SortedSet<double>();
        for (int c = 0; c < n; c++)
        {
            var control = _controls[c];
            if (pumpIndex.TryGetValue(control.LinkId, out int k))
            {
                _controlPump[c] = k;
                _controlLink[c] = _solver.PumpLink(k);
            }
            else
            {
                _controlPump[c] = -1;
                _controlLink[c] = pipeIndex.TryGetValue(control.LinkId, out k) ? _solver.PipeLink(k) : _solver.ValveLink(valveIndex[control.LinkId]);
            }
            _controlTank[c] = control.When.Time is null ? tankIndex[control.When.TankId!] : -1;
            _armed[c] = true;
            if (control.When.Time is double time && time <= model.Duration) times.Add(time);
        }
        _controlTimes = [.. times];

        _y = new double[_tankCount];
        _k1 = new double[_tankCount];
        _k2 = new double[_tankCount];
        _k3 = new double[_tankCount];
        _k4 = new double[_tankCount];
        _yStage = new double[_tankCount];
        _yNew = new double[_tankCount];
        _release = new double[_tankCount];
        _releaseNew = new double[_tankCount];
        _inflow = new double[_tankCount];
        _scratch = new double[_tankCount];
        _scratchRate = new double[_tankCount];
        _scratchRelease = new double[_tankCount];
        _held = new sbyte[_tankCount];
        _fullArmed = new bool[_tankCount];
        _emptyArmed = new bool[_tankCount];
        for (int i = 0; i < _tankCount; i++)
        {
            _y[i] = tanks[i].InitialLevel;
            _fullArmed[i] = _emptyArmed[i] = true;
        }

        double rs = model.ReportStep, duration = model.Duration;
        long count = (long)Math.Floor(duration / rs);
        while (count > 0 && count * rs > duration) count--;
        while ((count + 1) * rs <= duration) count++;
        _reportCount = count + 1; // 0, rs, ..., count * rs
    }

    private double ReportTime(long k) => k < _reportCount ? k * _model.ReportStep : _model.Duration;
    private bool HasReport(long k) => k < _reportCount || (k == _reportCount && _model.Duration > (_reportCount - 1) * _model.ReportStep);

    public SimulationResult Execute()
    {
        double t = 0, duration = _model.Duration;
        SetFactors();
        for (int i = 0; i < _tankCount; i++) _solver.SetKnownHead(_tankNode[i], _bottom[i] + _y[i]);
        _solver.RefreshSupply();
        FireTimeControls(0);
        FireLevelControls(0, null, 0, 0);
        if (!Settle(0)) return Finish(SimulationStatus.NetworkNotConverged, 0);
        if (!ReportIfDue(0)) return Finish(SimulationStatus.NetworkNotConverged, 0);

        double h = InitialStep(t, NextBreak(t));
        while (t < duration)
        {
            if (_token.IsCancellationRequested) return Finish(SimulationStatus.Cancelled, t);
            double bp = NextBreak(t);
            double t1 = StepEnd(t, h, bp);
            if (!(t1 > t)) t1 = bp;
            _stepSolves = _stepIterations = 0;
            int rejected = 0;
            double err;
            while (true)
            {
                if (_attempts >= _options.MaxSteps) return Finish(SimulationStatus.TooManySteps, t);
                _attempts++;
                var attempt = Attempt(t, t1, out err);
                if (attempt is null)
                {
                    // A stage's network solve failed: shorten the step (a large level change in one step can start the
                    // Newton iteration too far away) before giving up.
                    if (t1 - t <= 4 * _options.EventTimeTolerance) return Finish(SimulationStatus.NetworkNotConverged, t);
                    rejected++;
                    h = 0.25 * (t1 - t);
                    t1 = t + h;
                    if (!(t1 > t)) t1 = bp;
                    continue;
                }
                if (err <= _options.LevelTolerance) break;
                rejected++;
                h = (t1 - t) * Math.Max(0.2, 0.9 * Math.Cbrt(_options.LevelTolerance / err));
                t1 = StepEnd(t, h, bp);
                if (!(t1 > t)) t1 = bp;
            }
            double taken = t1 - t;
            // No growth right after a rejection (Hairer, Norsett and Wanner 1993, Section II.4, from memory): it would
            // only be rejected again.
            double growth = rejected > 0 ? 1 : 5;
            double proposal = taken * (err == 0 ? growth : Math.Clamp(0.9 * Math.Cbrt(_options.LevelTolerance / err), 0.2, growth));

            // Events on the step's interpolant: the earliest root, if any; and a held tank released within the step.
            var located = Locate(t, t1, out double eventTime, out int eventIterations, out double eventResidual);
            int released = FindRelease(t, t1, located is null ? t1 : eventTime, out double releaseTime);
            if (released >= 0)
            {
                located = null;
                eventTime = releaseTime;
                _forceRelease = released;
            }
            if ((located is not null || released >= 0) && t1 - eventTime > 0.5 * _options.EventTimeTolerance)
            {
                // Take the step again, to the event.
                if (_attempts >= _options.MaxSteps) return Finish(SimulationStatus.TooManySteps, t);
                _attempts++;
                if (Attempt(t, eventTime, out err) is null) return Finish(SimulationStatus.NetworkNotConverged, t);
                t1 = eventTime;
            }
            else if (located is not null) eventTime = t1;
            Array.Copy(_yNew, _y, _tankCount);
            Array.Copy(_k4, _k1, _tankCount);
            Array.Copy(_releaseNew, _release, _tankCount);
            _steps.Add(new SimulationStep(t, t1, _stepSolves, _stepIterations, err, rejected));
            t = t1;
            h = Math.Max(proposal, 4 * _options.EventTimeTolerance);
            _stateCurrent = true;

            bool changed = false;
            if (located is { } which)
                changed |= FireLevelControls(t, which, eventIterations, eventResidual);
            else
                changed |= FireLevelControls(t, null, 0, 0);
            if (_patterned && t == (_segment + 1) * _model.PatternStep)
            {
                _segment++;
                SetFactors();
                changed = true;
                // The demands jump here, and with them the levels' curvature: the proposal, grown from a step that the
                // boundary cut short (so its error was small), says nothing of the new hour. Start the new hour no longer
                // than the step just taken and let the error control grow it (restarting the step size after a
                // discontinuity of the right side, as Hairer, Norsett and Wanner 1993, Section II.4, advise, from
                // memory). On the 10 000-pipe benchmark day: 7 rejected steps instead of 16, 304 network solves
                // instead of 322.
                h = Math.Min(h, taken);
            }
            changed |= FireTimeControls(t);
            for (int i = 0; i < _tankCount; i++)
                if (_held[i] != 0 && (_release[i] > ReleaseMargin || _forceRelease == i)) changed = true;
            if (changed && !Settle(t)) return Finish(SimulationStatus.NetworkNotConverged, t);
            Rearm();
            if (!ReportIfDue(t)) return Finish(SimulationStatus.NetworkNotConverged, t);
        }
        return Finish(SimulationStatus.Completed, duration);
    }

    /// <summary>Where a step of size h from t should end, given the next break bp: at bp when it is within 1.1 h; halfway
    /// to it when it is within 2 h (two even steps rather than a full one and a sliver that costs as many network solves:
    /// on the 10 000-pipe benchmark day 295 solves instead of 304); else at t + h.</summary>
    private static double StepEnd(double t, double h, double bp)
    {
        double left = bp - t;
        if (left <= 1.1 * h) return bp;
        if (left < 2 * h) return t + 0.5 * left;
        return t + h;
    }

    private SimulationResult Finish(SimulationStatus status, double reached) =>
        new(status, reached, _reports, _events, _steps, _solves, NetworkSimulator.MethodName);

    /// <summary>The next time the right side may jump or a report is due: a pattern boundary, a time control, a report
    /// time, the duration.</summary>
    private double NextBreak(double t)
    {
        double next = _model.Duration;
        if (_patterned) next = Math.Min(next, (_segment + 1) * _model.PatternStep);
        while (_nextControlTime < _controlTimes.Length && _controlTimes[_nextControlTime] <= t) _nextControlTime++;
        if (_nextControlTime < _controlTimes.Length) next = Math.Min(next, _controlTimes[_nextControlTime]);
        if (HasReport(_nextReport)) next = Math.Min(next, ReportTime(_nextReport));
        return next;
    }

    private double InitialStep(double t, double bp)
    {
        double h = bp - t;
        for (int i = 0; i < _tankCount; i++)
        {
            double rate = Math.Abs(_k1[i]);
            if (rate > 0) h = Math.Min(h, 0.01 * (_max[i] - _min[i]) / rate);
        }
        return Math.Max(h, 4 * _options.EventTimeTolerance);
    }

    private void SetFactors()
    {
        for (int j = 0; j < _factors.Length; j++)
        {
            int p = _patternOf[j];
            _factors[j] = p < 0 ? 1.0 : _multipliers[p][(int)(_segment % _multipliers[p].Length)];
        }
        _solver.SetDemandFactors(_factors);
        _solver.ForgetHistory();
        _stateCurrent = false;
    }

    /// <summary>One network solve at levels <paramref name="y"/>: the rates dy/dt, and for held tanks the release
    /// measure (the free head's distance past the limit's head, positive when the tank would leave its limit).</summary>
    private bool Evaluate(double time, double[] y, double[] rate, double[] release, double stageFlowTolerance = 0)
    {
        for (int i = 0; i < _tankCount; i++)
            if (_held[i] == 0) _solver.SetKnownHead(_tankNode[i], _bottom[i] + y[i]);
        if (_options.ColdStarts) _solver.ForgetState();
        _lastStatus = _solver.SolveTimeline(time, out int iterations, stageFlowTolerance);
        _lastLoose = stageFlowTolerance > 0;
        _solves++;
        _stepSolves++;
        _stepIterations += iterations;
        if (!_lastStatus.HasAnswer()) return false;
        for (int i = 0; i < _tankCount; i++)
        {
            double q = _solver.NetInflow(_tankNode[i], _tankLinks[i]);
            _inflow[i] = _held[i] == 0 ? q : 0;
            rate[i] = _held[i] == 0 ? q / _area[i] : 0;
            if (_held[i] == 0) { release[i] = 0; continue; }
            double limit = _bottom[i] + (_held[i] > 0 ? _max[i] : _min[i]);
            double free = _solver.NodeHead(_tankNode[i]);
            release[i] = _held[i] > 0 ? limit - free : free - limit;
        }
        return true;
    }

    /// <summary>A Bogacki-Shampine step from (t, _y) with rates _k1 to t1: the new levels in _yNew and their rates in _k4;
    /// null when a network solve failed.</summary>
    private bool? Attempt(double t, double t1, out double err)
    {
        err = double.PositiveInfinity;
        double h = t1 - t;
        double loose = StageFlowTolerance(h);
        for (int i = 0; i < _tankCount; i++) _yStage[i] = _y[i] + 0.5 * h * _k1[i];
        if (!Evaluate(t + 0.5 * h, _yStage, _k2, _releaseNew, loose)) return null;
        for (int i = 0; i < _tankCount; i++) _yStage[i] = _y[i] + 0.75 * h * _k2[i];
        if (!Evaluate(t + 0.75 * h, _yStage, _k3, _releaseNew, loose)) return null;
        for (int i = 0; i < _tankCount; i++) _yNew[i] = _y[i] + h * (B1 * _k1[i] + B2 * _k2[i] + B3 * _k3[i]);
        if (!Evaluate(t1, _yNew, _k4, _releaseNew, loose)) return null;
        err = 0;
        for (int i = 0; i < _tankCount; i++)
        {
            double e = Math.Abs(h * (E1 * _k1[i] + E2 * _k2[i] + E3 * _k3[i] + E4 * _k4[i]));
            if (!(e <= err)) err = e; // NaN propagates
        }
        if (double.IsNaN(err)) err = double.PositiveInfinity;
        return true;
    }

    /// <summary>How closely a stage's network solve must meet continuity and the links' energy equations for a step of h
    /// seconds, as a flow (m3/s): StageAccuracy times the level tolerance times the smallest tank's area over h, so that
    /// the flows' remaining error moves no level by more than StageAccuracy of the level tolerance over the step (nor
    /// the error estimate, a weighted sum of the stages' rates with weights below 1 in sum of magnitudes). Never tighter
    /// than the network's own flow tolerance; 0 (the solver's tolerances) while a tank is held, whose release is judged
    /// on its free head to 1e-9 m.</summary>
    private double StageFlowTolerance(double h)
    {
        if (_options.StrictStages || _tankCount == 0 || !(h > 0)) return 0;
        for (int i = 0; i < _tankCount; i++) if (_held[i] != 0) return 0;
        double tolerance = StageAccuracy * _options.LevelTolerance * _smallestArea / h;
        return double.IsFinite(tolerance) ? tolerance : 0;
    }

    /// <summary>The share of the level tolerance a stage's inexact network solve may move a level by over its step.</summary>
    internal const double StageAccuracy = 0.1;

    /// <summary>An event condition: a tank reaching a limit (index -1 - tank for full, -1 - tankCount - tank for empty) or
    /// a control's threshold (index c &gt;= 0).</summary>
    private (int Tank, double Target, double Sign) Condition(int which)
    {
        if (which >= 0)
        {
            var when = _controls[which].When;
            return (_controlTank[which], when.LevelAbove ?? when.LevelBelow!.Value, when.LevelAbove is null ? -1 : 1);
        }
        int k = -1 - which;
        return k < _tankCount ? (k, _max[k], 1) : (k - _tankCount, _min[k - _tankCount], -1);
    }

    /// <summary>The earliest event on the interpolant of the step just attempted (t to t1, levels _y to _yNew, rates _k1
    /// and _k4), or null.</summary>
    private int? Locate(double t, double t1, out double eventTime, out int eventIterations, out double eventResidual)
    {
        double time = double.PositiveInfinity, residual = 0;
        int iterations = 0;
        int? best = null;
        for (int i = 0; i < _tankCount; i++)
        {
            if (_held[i] != 0) continue;
            Consider(-1 - i);
            Consider(-1 - _tankCount - i);
        }
        for (int c = 0; c < _controls.Length; c++)
            if (_controlTank[c] >= 0 && _armed[c]) Consider(c);
        eventTime = time;
        eventIterations = iterations;
        eventResidual = residual;
        return best;

        void Consider(int which)
        {
            var (tank, target, sign) = Condition(which);
            var f = new HermiteLevel(t, t1 - t, _y[tank], _yNew[tank], _k1[tank], _k4[tank], target, sign);
            double previous = f.Evaluate(t).Value;
            double lo = t;
            for (int k = 1; k <= EventSamples; k++)
            {
                double s = k == EventSamples ? t1 : t + (t1 - t) * k / EventSamples;
                if (s >= time) return; // an earlier event is already known
                double value = f.Evaluate(s).Value;
                if (previous < 0 && value >= 0)
                {
                    RootResult root = value == 0
                        ? new RootResult(s, 0, 1, 0, s, s, 0, SolveStatus.ConvergedOnResidual)
                        : SafeguardedNewton.Solve(f, Bracket.KnownIncreasing(lo, s), lo + (s - lo) * previous / (previous - value),
                            new SolverOptions(0.25 * _options.EventTimeTolerance, 0, 0, 100));
                    if (root.Root < time)
                    {
                        time = root.Root;
                        iterations = root.Iterations;
                        residual = sign * root.Residual;
                        best = which;
                    }
                    return;
                }
                previous = value;
                lo = s;
            }
        }
    }

    /// <summary>The first release of a held tank within the step (t to t1, before <paramref name="limit"/>): the root in
    /// time of its release measure, by the Illinois variant of regula falsi with a network solve at the interpolant's
    /// levels per iteration, to within <see cref="SimulationOptions.EventTimeTolerance"/>. Returns the tank (or -1) and the
    /// time, taken at the bracket's end where the tank would already leave its limit.</summary>
    private int FindRelease(double t, double t1, double limit, out double time)
    {
        time = double.PositiveInfinity;
        int tank = -1;
        for (int i = 0; i < _tankCount; i++)
        {
            if (_held[i] == 0 || !(_release[i] <= ReleaseMargin) || !(_releaseNew[i] > ReleaseMargin)) continue;
            double lo = t, hi = Math.Min(t1, limit), flo = _release[i] - ReleaseMargin, fhi = _releaseNew[i] - ReleaseMargin;
            if (hi < t1)
            {
                // The bracket's end is an earlier event: the release must lie before it to matter.
                if (!EvaluateAt(t, t1, hi)) continue;
                fhi = _scratchRelease[i] - ReleaseMargin;
                if (!(fhi > 0)) continue;
            }
            int side = 0;
            for (int iteration = 0; iteration < 60 && hi - lo > _options.EventTimeTolerance; iteration++)
            {
                double x = lo + (hi - lo) * flo / (flo - fhi);
                if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
                if (!EvaluateAt(t, t1, x)) break;
                double f = _scratchRelease[i] - ReleaseMargin;
                if (f > 0)
                {
                    (hi, fhi) = (x, f);
                    if (side == 1) flo *= 0.5;
                    side = 1;
                }
                else
                {
                    (lo, flo) = (x, f);
                    if (side == -1) fhi *= 0.5;
                    side = -1;
                }
            }
            if (hi < time) { time = hi; tank = i; }
        }
        _stateCurrent = false;
        return tank;
    }

    /// <summary>A network solve at time x of the step t to t1, every moving tank at its interpolated level.</summary>
    private bool EvaluateAt(double t, double t1, double x)
    {
        for (int i = 0; i < _tankCount; i++)
            _scratch[i] = _held[i] != 0 ? _y[i]
                : new HermiteLevel(t, t1 - t, _y[i], _yNew[i], _k1[i], _k4[i], 0, 1).Evaluate(x).Value;
        return Evaluate(x, _scratch, _scratchRate, _scratchRelease);
    }

    /// <summary>Level controls and tank limits at time t after a step: the located event (forced), and every armed
    /// condition that holds at the present levels. Returns whether anything changed.</summary>
    private bool FireLevelControls(double t, int? located, int iterations, double residual)
    {
        bool changed = false;
        for (int i = 0; i < _tankCount; i++)
        {
            if (_held[i] != 0) continue;
            bool full = located == -1 - i || _y[i] >= _max[i];
            bool empty = located == -1 - _tankCount - i || _y[i] <= _min[i];
            if (!full && !empty) continue;
            if (located == -1 - i || located == -1 - _tankCount - i)
            {
                _locatedTank = i;
                _locatedIterations = iterations;
                _locatedResidual = residual;
            }
            // The level is at its limit: never beyond it.
            _y[i] = full ? _max[i] : _min[i];
            _stateCurrent = false;
            changed = true;
        }
        for (int c = 0; c < _controls.Length; c++)
        {
            int tank = _controlTank[c];
            if (tank < 0 || !_armed[c]) continue;
            var (_, target, sign) = Condition(c);
            if (located != c && !(sign * (_y[tank] - target) >= 0)) continue;
            _armed[c] = false;
            bool isLocated = located == c;
            Apply(c, t, isLocated ? iterations : 0, isLocated ? residual : sign * (_y[tank] - target));
            changed = true;
        }
        return changed;
    }

    private bool FireTimeControls(double t)
    {
        bool changed = false;
        for (int c = 0; c < _controls.Length; c++)
        {
            if (_controls[c].When.Time is double time && time == t)
            {
                Apply(c, t, 0, 0);
                changed = true;
            }
        }
        return changed;
    }

    private void Apply(int c, double t, int iterations, double residual)
    {
        var set = _controls[c].Set;
        int l = _controlLink[c], pump = _controlPump[c];
        string change;
        if (pump >= 0)
        {
            if (set.SpeedRatio is double s)
            {
                _speed[pump] = s;
                _pumpShut[pump] = false;
                change = "speedRatio " + s.ToString("G6", CultureInfo.InvariantCulture);
            }
            else
            {
                bool open = set.Open!.Value;
                _pumpShut[pump] = !open;
                if (open && !(_speed[pump] > 0)) _speed[pump] = 1;
                change = open ? "open" : "closed";
            }
            _solver.SetPumpSpeed(l, _pumpShut[pump] ? 0 : _speed[pump]);
        }
        else
        {
            bool open = set.Open!.Value;
            _solver.SetLinkOpen(l, open);
            change = open ? "open" : "closed";
        }
        _solver.RefreshSupply();
        _solver.ForgetHistory();
        _stateCurrent = false;
        _events.Add(new SimulationEvent(t, "control", _controls[c].LinkId, change, residual, iterations));
    }

    /// <summary>Re-arms the level controls and tank-limit announcements whose level has moved back past the band.</summary>
    private void Rearm()
    {
        for (int c = 0; c < _controls.Length; c++)
        {
            int tank = _controlTank[c];
            if (tank < 0 || _armed[c]) continue;
            var (_, target, sign) = Condition(c);
            if (sign * (_y[tank] - target) < -_band) _armed[c] = true;
        }
        for (int i = 0; i < _tankCount; i++)
        {
            if (_y[i] < _max[i] - _band) _fullArmed[i] = true;
            if (_y[i] > _min[i] + _band) _emptyArmed[i] = true;
        }
    }

    /// <summary>Solves at time t and settles which tanks are held: a tank at a limit whose connections would move it
    /// beyond is held (announced when armed), a held one whose free head has passed the limit's is released. Each tank
    /// changes at most once per instant, so no loop of events can form at one instant.</summary>
    private bool Settle(double t)
    {
        Span<bool> changedHere = _tankCount <= 256 ? stackalloc bool[_tankCount] : new bool[_tankCount];
        for (int round = 0; round <= _tankCount; round++)
        {
            if (!Evaluate(t, _y, _k1, _release)) return false;
            _stateCurrent = true;
            bool changed = false;
            for (int i = 0; i < _tankCount; i++)
            {
                if (changedHere[i]) continue;
                if (_held[i] == 0)
                {
                    bool full = _y[i] >= _max[i] && _k1[i] > 0, empty = _y[i] <= _min[i] && _k1[i] < 0;
                    if (!full && !empty) continue;
                    _held[i] = (sbyte)(full ? 1 : -1);
                    _solver.SetFreeHead(_tankNode[i]);
                    if (full ? _fullArmed[i] : _emptyArmed[i])
                    {
                        bool wasLocated = _locatedTank == i;
                        _events.Add(new SimulationEvent(t, full ? "tank-full" : "tank-empty", _model.Tanks[i].Id,
                            string.Format(CultureInfo.InvariantCulture, "held at its {0} level {1:G6} m", full ? "maximum" : "minimum", _y[i]),
                            wasLocated ? _locatedResidual : 0, wasLocated ? _locatedIterations : 0));
                        if (full) _fullArmed[i] = false; else _emptyArmed[i] = false;
                    }
                }
                else if (_release[i] > ReleaseMargin || _forceRelease == i)
                {
                    _held[i] = 0;
                    _solver.SetKnownHead(_tankNode[i], _bottom[i] + _y[i]);
                }
                else continue;
                changedHere[i] = true;
                changed = true;
            }
            if (!changed) { _locatedTank = _forceRelease = -1; return true; }
            _solver.RefreshSupply();
            _solver.ForgetHistory();
            _stateCurrent = false;
        }
        return Evaluate(t, _y, _k1, _release) && (_stateCurrent = true);
    }

    /// <summary>Records the report of time t when one is due (solving again only when the solver's state is not
    /// already that of t).</summary>
    private bool ReportIfDue(double t)
    {
        if (!HasReport(_nextReport) || ReportTime(_nextReport) != t) return true;
        if (!_stateCurrent || _lastLoose)
        {
            if (!Evaluate(t, _y, _k1, _release)) return false;
            _stateCurrent = true;
        }
        var network = _solver.TimelineResult(_lastStatus, _isTank);
        var tanks = new TankState[_tankCount];
        for (int i = 0; i < _tankCount; i++)
            tanks[i] = new TankState(_model.Tanks[i].Id, _y[i], _bottom[i] + _y[i], _inflow[i],
                _held[i] > 0 ? "full" : _held[i] < 0 ? "empty" : null);
        _reports.Add(new SimulationReport(t, network, tanks));
        _nextReport++;
        return true;
    }

    /// <summary>g(t) = sign (p(t) - target), p the cubic Hermite interpolant of a level over one step.</summary>
    private readonly struct HermiteLevel(double t0, double h, double y0, double y1, double d0, double d1, double target, double sign)
        : IDifferentiableFunction
    {
        public (double Value, double Derivative) Evaluate(double x)
        {
            double s = (x - t0) / h, s2 = s * s, s3 = s2 * s;
            double p = (2 * s3 - 3 * s2 + 1) * y0 + (s3 - 2 * s2 + s) * h * d0 + (-2 * s3 + 3 * s2) * y1 + (s3 - s2) * h * d1;
            double dp = ((6 * s2 - 6 * s) * (y0 - y1)) / h + (3 * s2 - 4 * s + 1) * d0 + (3 * s2 - 2 * s) * d1;
            return (sign * (p - target), sign * dp);
        }
    }
}
