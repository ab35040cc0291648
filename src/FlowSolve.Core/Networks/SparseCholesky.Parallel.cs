using System.Runtime.ExceptionServices;

namespace FlowSolve.Core.Networks;

/// <summary>The factorisation's schedule: which fronts run where, and where each front's update matrix is kept.</summary>
public sealed partial class SparseCholesky
{
    /// <summary>Multiply-adds of one factorisation (<see cref="FactorOperations"/>) from which the default
    /// <see cref="MaxDegreeOfParallelism"/> is every core. Measured with <c>NetworkLinearSolveBenchmarks</c> on the
    /// generated grids (docs/performance.md): two threads took 1.17 times as long at 9 948 pipes (5.9 million
    /// multiply-adds, under a millisecond, where handing tasks over costs more than it saves) and 0.68 times at 99 912
    /// (159 million); the threshold sits between, at a grid of about 20 000 pipes, not measured finer.</summary>
    internal const double ParallelThreshold = 2e7;

    private readonly Plan _sequential;
    private ParallelPlan? _plan;
    private int _maxDegreeOfParallelism;

    /// <summary>How many threads one <see cref="Factorise"/> may use (at least 1). The default is
    /// <see cref="Environment.ProcessorCount"/> when the factorisation is large enough to gain from it (a grid of about
    /// 20 000 pipes and more) and 1 below. Set it to 1 when the caller already runs one solver per core. The factor is the
    /// same bit for bit whatever the setting. The first factorisation
    /// after a change sets up the schedule and each thread's work space (allocated once; later factorisations allocate
    /// nothing); thread-pool work items help the calling thread, which itself takes every task that no pool thread has
    /// started, so a busy pool slows a factorisation but cannot stall it.</summary>
    /// <exception cref="ArgumentOutOfRangeException">The value is below 1.</exception>
    public int MaxDegreeOfParallelism
    {
        get => _maxDegreeOfParallelism;
        set
        {
            ArgumentOutOfRangeException.ThrowIfLessThan(value, 1);
            _maxDegreeOfParallelism = value;
        }
    }

    /// <summary>Number of fronts above the parallel parts (the separators at the top of the tree), each a task of its
    /// own, for the last parallel schedule; 0 before one is made.</summary>
    internal int ParallelTopFronts => _plan?.Top.Length ?? 0;

    /// <summary>Shares of the factorisation's work in the longest chain of fronts above the parts (each waiting for the
    /// one below) and in the largest part, for the last parallel schedule.</summary>
    internal (double TopChain, double LargestPart) ParallelBalance => _plan is null ? (0, 0) : (_plan.TopChain, _plan.LargestPart);

    /// <summary>Sequential multifrontal schedule: the nodes of <see cref="Top"/> run in this order on one update stack.
    /// <see cref="Owner"/>[s] indexes <see cref="Stacks"/>, the stack that holds front s's update matrix, at
    /// <see cref="UpdateOffset"/>[s].</summary>
    private class Plan
    {
        public readonly int[] Owner, UpdateOffset;
        public int[] Top = [];
        public double[][] Stacks = [];
        public double[] TopFront = [], TopStack = [];

        protected Plan(int supernodes)
        {
            Owner = new int[supernodes];
            UpdateOffset = new int[supernodes];
        }

        /// <summary>Every front in postorder on one stack.</summary>
        public Plan(SparseCholesky c) : this(c._supernodes)
        {
            Top = new int[c._supernodes];
            for (int s = 0; s < Top.Length; s++) Top[s] = s;
            var (front, stack) = Lay(c, Top, 0);
            TopFront = new double[front];
            TopStack = stack;
            Stacks = [stack];
        }

        /// <summary>Replays <paramref name="nodes"/> (owned by <paramref name="owner"/>) as an update stack: each front
        /// pops its children of the same owner (they are on top, a postorder of whole subtrees keeps that) and pushes its
        /// own update. Sets the offsets and returns the largest front's length and a stack large enough.</summary>
        protected (long FrontLength, double[] Stack) Lay(SparseCholesky c, int[] nodes, int owner)
        {
            long depth = 0, peak = 0, frontMax = 0;
            foreach (int s in nodes)
            {
                for (int i = c._childStart[s]; i < c._childStart[s + 1]; i++)
                    if (Owner[c._children[i]] == owner) depth -= Update(c, c._children[i]);
                UpdateOffset[s] = (int)depth;
                depth += Update(c, s);
                peak = Math.Max(peak, depth);
                long m = c._structStart[s + 1] - c._structStart[s];
                frontMax = Math.Max(frontMax, m * m);
            }
            if (peak > Array.MaxLength) throw new ArgumentException("the factor is too large for this pattern", "columns");
            return (frontMax, new double[peak]);
        }

        private static long Update(SparseCholesky c, int s)
        {
            long u = c._structStart[s + 1] - c._structStart[s] - (c._superStart[s + 1] - c._superStart[s]);
            return u * u;
        }
    }

    /// <summary>A split of the elimination tree into tasks (after Geist and Ng 1989, Int. J. Parallel Programming 18(4),
    /// the subtree-to-processor mapping): the heaviest subtree of a candidate set is replaced by its children (its root
    /// joins the fronts above, <see cref="Plan.Top"/>) while it holds more than a part's share of the work, then the
    /// subtrees are dealt heaviest first to the least loaded of <see cref="PartsPerThread"/> parts a thread. Each part
    /// (whole subtrees in postorder, on its own update stack) and each front above the parts is a task; a front above
    /// becomes ready when its children are done, and the threads take ready tasks as they come free, so that the
    /// separators under the top one run side by side too, and a thread that the machine's load holds back delays the
    /// others by one task at most.</summary>
    private sealed class ParallelPlan : Plan
    {
        /// <summary>Parts for each thread: enough that a held-back thread costs little, few enough that the separators
        /// above them stay a small share of the work (on the 99 912-pipe grid the longest chain of them is 16 percent);
        /// chosen, not tuned against other counts.</summary>
        public const int PartsPerThread = 4;

        public readonly int Threads;
        public readonly Part[] Parts;
        public readonly double TopChain, LargestPart;
        private readonly SparseCholesky _owner;
        private readonly int[] _topIndex;            // supernode -> index in Top, -1 elsewhere
        private readonly int[] _waitingStart;        // children of each top front, as a count of tasks
        private readonly int[] _notify, _notifyStart; // each task's fronts above to tell when it is done
        private readonly int[] _waiting, _ready;
        private readonly double[][] _fronts;          // one per thread slot
        private readonly bool[] _slotBusy;
        private readonly Helper[] _helpers;
        private readonly object _gate = new();
        private int _readyCount, _unfinished, _failed;
        private Exception? _error;

        public sealed class Part(int[] nodes)
        {
            public readonly int[] Nodes = nodes;
            public double[] Stack = [];
        }

        public ParallelPlan(SparseCholesky c, int threads) : base(c._supernodes)
        {
            _owner = c;
            Threads = threads;
            int parts = PartsPerThread * threads;
            int count = c._supernodes;
            // Work of each front (its multiply-adds plus the front's size, for the assembly) and of each subtree.
            var work = new double[count];
            var first = new int[count];
            for (int s = 0; s < count; s++)
            {
                int m = c._structStart[s + 1] - c._structStart[s], k = c._superStart[s + 1] - c._superStart[s];
                double w = (double)m * m;
                for (int j = 0; j < k; j++) { double col = m - j; w += col * col; }
                first[s] = s;
                for (int i = c._childStart[s]; i < c._childStart[s + 1]; i++)
                {
                    int child = c._children[i];
                    w += work[child];
                    first[s] = Math.Min(first[s], first[child]);
                }
                work[s] = w;
            }
            var parent = new int[count];
            Array.Fill(parent, -1);
            for (int s = 0; s < count; s++)
                for (int i = c._childStart[s]; i < c._childStart[s + 1]; i++) parent[c._children[i]] = s;
            var candidates = new List<int>();
            double total = 0;
            for (int s = 0; s < count; s++) if (parent[s] < 0) { candidates.Add(s); total += work[s]; }

            // Split the heaviest subtree while it holds more than a part's share of the work.
            var top = new List<int>();
            double share = total / parts;
            for (int step = 0; step < 16 * parts && candidates.Count > 0; step++)
            {
                candidates.Sort((a, b) => work[b].CompareTo(work[a]));
                int heaviest = candidates[0];
                if (work[heaviest] <= share || c._childStart[heaviest] == c._childStart[heaviest + 1]) break;
                candidates.RemoveAt(0);
                top.Add(heaviest);
                for (int i = c._childStart[heaviest]; i < c._childStart[heaviest + 1]; i++) candidates.Add(c._children[i]);
            }

            // Deal the subtrees, heaviest first to the least loaded part; each part takes its subtrees in ascending
            // order (a postorder). Parts are offered heaviest first, so that the last ones taken are short.
            var chosen = candidates.ToArray();
            Array.Sort(chosen, (a, b) => work[b].CompareTo(work[a]));
            var bins = new double[parts];
            var dealt = new List<int>[parts];
            for (int p = 0; p < parts; p++) dealt[p] = [];
            foreach (int s in chosen)
            {
                int p = Array.IndexOf(bins, bins.Min());
                bins[p] += work[s];
                dealt[p].Add(s);
            }
            var byWork = new int[parts];
            for (int p = 0; p < parts; p++) byWork[p] = p;
            Array.Sort(byWork, (x, y) => bins[y].CompareTo(bins[x]));
            Parts = new Part[parts];
            for (int p = 0; p < parts; p++)
            {
                var roots = dealt[byWork[p]];
                roots.Sort();
                var nodes = new List<int>();
                foreach (int root in roots) for (int s = first[root]; s <= root; s++) nodes.Add(s);
                Parts[p] = new Part(nodes.ToArray());
                foreach (int s in Parts[p].Nodes) Owner[s] = p;
            }
            var topNodes = top.ToArray();
            Array.Sort(topNodes);
            Top = topNodes;
            foreach (int s in Top) Owner[s] = parts;
            Stacks = new double[parts + 1][];
            long frontMax = 0;
            for (int p = 0; p < parts; p++)
            {
                var (front, stack) = Lay(c, Parts[p].Nodes, p);
                Parts[p].Stack = stack;
                Stacks[p] = stack;
                frontMax = Math.Max(frontMax, front);
            }
            // The fronts above the parts keep their updates apart (they finish in any order), one after another.
            long updates = 0;
            foreach (int s in Top)
            {
                int m = c._structStart[s + 1] - c._structStart[s], k = c._superStart[s + 1] - c._superStart[s];
                UpdateOffset[s] = (int)updates;
                updates += (long)(m - k) * (m - k);
                frontMax = Math.Max(frontMax, (long)m * m);
                if (updates > Array.MaxLength) throw new ArgumentException("the factor is too large for this pattern", "columns");
            }
            TopStack = new double[updates];
            Stacks[parts] = TopStack;
            _fronts = new double[threads][];
            for (int t = 0; t < threads; t++)
                _fronts[t] = t == 0 && c._sequential.TopFront.Length >= frontMax ? c._sequential.TopFront : new double[frontMax];
            TopFront = _fronts[0];
            _slotBusy = new bool[threads];

            // Tasks: parts 0..P-1, then the fronts above, P + index in Top. Each front above waits for its children's
            // tasks (a part holding several of its children counts once for each); each task tells its fronts above.
            _topIndex = new int[count];
            Array.Fill(_topIndex, -1);
            for (int t = 0; t < Top.Length; t++) _topIndex[Top[t]] = t;
            _waitingStart = new int[Top.Length];
            _waiting = new int[Top.Length];
            _ready = new int[parts + Top.Length];
            var notify = new List<int>();
            _notifyStart = new int[parts + Top.Length + 1];
            for (int task = 0; task < parts + Top.Length; task++)
            {
                if (task < parts)
                {
                    foreach (int root in dealt[byWork[task]])
                        if (parent[root] >= 0) { notify.Add(_topIndex[parent[root]]); _waitingStart[_topIndex[parent[root]]]++; }
                }
                else
                {
                    int s = Top[task - parts];
                    if (parent[s] >= 0) { notify.Add(_topIndex[parent[s]]); _waitingStart[_topIndex[parent[s]]]++; }
                }
                _notifyStart[task + 1] = notify.Count;
            }
            _notify = notify.ToArray();

            // The longest chain of fronts above the parts, each waiting for the one below: the part of the work that no
            // number of threads shortens.
            var chain = new double[count];
            double longest = 0;
            foreach (int s in Top)
            {
                double own = work[s], below = 0;
                for (int i = c._childStart[s]; i < c._childStart[s + 1]; i++)
                {
                    int child = c._children[i];
                    own -= work[child];
                    below = Math.Max(below, chain[child]);
                }
                chain[s] = own + below;
                longest = Math.Max(longest, chain[s]);
            }
            TopChain = total > 0 ? longest / total : 0;
            LargestPart = total > 0 ? bins.Max() / total : 0;
            _helpers = new Helper[threads - 1];
            for (int h = 0; h < _helpers.Length; h++) _helpers[h] = new Helper(this);
        }

        /// <summary>Factorises every part and every front above them: the calling thread and <see cref="Threads"/> - 1
        /// thread-pool work items take ready tasks until none is left (when the pool is busy, the calling thread runs
        /// them all); false when a pivot failed.</summary>
        public bool Run()
        {
            lock (_gate)
            {
                _failed = 0;
                _error = null;
                int parts = Parts.Length;
                _unfinished = parts + Top.Length;
                Array.Copy(_waitingStart, _waiting, _waiting.Length);
                // A stack: the heaviest part is taken first.
                _readyCount = 0;
                for (int p = parts - 1; p >= 0; p--) _ready[_readyCount++] = p;
            }
            foreach (var helper in _helpers) ThreadPool.UnsafeQueueUserWorkItem(helper, preferLocal: false);
            Work(0);
            if (_error is not null) ExceptionDispatchInfo.Throw(_error);
            return _failed == 0;
        }

        /// <summary>Takes ready tasks until every task of the current factorisation is done; the calling thread (slot 0) returns
        /// only then. A helper takes a free slot (its front and gather space) or leaves when there is none; a helper
        /// queued for an earlier call that runs late finds nothing unfinished and leaves, or helps the current call.</summary>
        private void Work(int slot)
        {
            lock (_gate)
            {
                if (slot != 0)
                {
                    slot = Array.IndexOf(_slotBusy, false, 1);
                    if (slot < 0 || _unfinished == 0) return;
                }
                _slotBusy[slot] = true;
            }
            try
            {
                while (true)
                {
                    int task;
                    lock (_gate)
                    {
                        while (_readyCount == 0 && _unfinished > 0) Monitor.Wait(_gate);
                        if (_unfinished == 0) return;
                        task = _ready[--_readyCount];
                    }
                    RunTask(task, slot);
                    lock (_gate)
                    {
                        for (int i = _notifyStart[task]; i < _notifyStart[task + 1]; i++)
                            if (--_waiting[_notify[i]] == 0) _ready[_readyCount++] = Parts.Length + _notify[i];
                        _unfinished--;
                        Monitor.PulseAll(_gate);
                    }
                }
            }
            finally
            {
                lock (_gate) _slotBusy[slot] = false;
            }
        }

        private void RunTask(int task, int slot)
        {
            if (Volatile.Read(ref _failed) != 0) return; // a failed pivot: the rest is not needed
            try
            {
                if (task >= Parts.Length)
                {
                    if (!_owner.FactorNode(this, Top[task - Parts.Length], _fronts[slot], TopStack)) Volatile.Write(ref _failed, 1);
                    return;
                }
                var part = Parts[task];
                foreach (int s in part.Nodes)
                    if (!_owner.FactorNode(this, s, _fronts[slot], part.Stack)) { Volatile.Write(ref _failed, 1); return; }
            }
            catch (Exception e)
            {
                _error = e;
                Volatile.Write(ref _failed, 1);
            }
        }

        private sealed class Helper(ParallelPlan plan) : IThreadPoolWorkItem
        {
            public void Execute() => plan.Work(-1);
        }
    }
}
