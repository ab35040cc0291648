using System.Runtime.ExceptionServices;

namespace FlowSolve.Core.Networks;

/// <summary>The factorisation's schedule: which fronts run where, and where each front's update matrix is kept.</summary>
public sealed partial class SparseCholesky
{
    /// <summary>Multiply-adds of one factorisation (<see cref="FactorOperations"/>) from which the default
    /// <see cref="MaxDegreeOfParallelism"/> is every core: below it handing half the tree to a second thread costs more
    /// than it saves. Measured with <c>NetworkLinearSolveBenchmarks</c> on the generated grids (see
    /// docs/performance.md): about 5 million multiply-adds, a grid of some 5 000 pipes.</summary>
    internal const double ParallelThreshold = 5e6;

    private readonly Plan _sequential;
    private ParallelPlan? _plan;
    private int _maxDegreeOfParallelism;

    /// <summary>How many threads one <see cref="Factorise"/> may use (at least 1). The default is
    /// <see cref="Environment.ProcessorCount"/> when the factorisation is large enough to gain from it (about 5 000 pipes
    /// on a grid and more) and 1 below. Set it to 1 when the caller already runs one solver per core. The factor is the
    /// same bit for bit whatever the setting. The first factorisation after a change sets up the schedule and each
    /// thread's work space (allocated once); the thread pool runs the other parts, and the calling thread takes any part
    /// that no pool thread has started, so a busy pool slows a factorisation but cannot stall it.</summary>
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

    /// <summary>Number of fronts factorised on the calling thread after the parallel parts (the separators at the top
    /// of the tree), for the last parallel schedule; 0 before one is made.</summary>
    internal int ParallelTopFronts => _plan?.Top.Length ?? 0;

    /// <summary>Share of the factorisation's work in the fronts after the parallel parts, and the largest part's share
    /// of the rest against an even split (1 is perfect balance), for the last parallel schedule.</summary>
    internal (double TopShare, double Imbalance) ParallelBalance => _plan is null ? (0, 0) : (_plan.TopShare, _plan.Imbalance);

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
            TopFront = front;
            TopStack = stack;
            Stacks = [stack];
        }

        /// <summary>Replays <paramref name="nodes"/> (owned by <paramref name="owner"/>) as an update stack: each front
        /// pops its children of the same owner (they are on top, a postorder of whole subtrees keeps that) and pushes its
        /// own update. Sets the offsets and returns a front and a stack large enough.</summary>
        protected (double[] Front, double[] Stack) Lay(SparseCholesky c, int[] nodes, int owner)
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
            return (new double[frontMax], new double[peak]);
        }

        private static long Update(SparseCholesky c, int s)
        {
            long u = c._structStart[s + 1] - c._structStart[s] - (c._superStart[s + 1] - c._superStart[s]);
            return u * u;
        }
    }

    /// <summary>A static split of the elimination tree (Geist and Ng 1989, Int. J. Parallel Programming 18(4), the
    /// subtree-to-processor mapping): the heaviest subtree of a candidate set is replaced by its children (its root joins
    /// the fronts above, <see cref="Plan.Top"/>) until the candidates, dealt heaviest first to the least loaded part,
    /// balance; the schedule kept is the one with the least work on the longest path (largest part plus top fronts).
    /// Each part runs its subtrees in postorder on its own front and stack; the calling thread takes part 0.</summary>
    private sealed class ParallelPlan : Plan
    {
        public enum Phase { Factor, Forward, Backward }

        public readonly Part[] Parts;
        public readonly double TopShare, Imbalance;
        /// <summary>Each part front's first row that belongs to a front above the parts (its row count when none).</summary>
        public readonly int[] Cut;
        /// <summary>In postorder, the fronts above the parts and the part fronts with rows above the parts: the forward
        /// solve's sequential rest.</summary>
        public readonly int[] ForwardTail;
        private Phase _phase;
        private readonly SparseCholesky _owner;
        private readonly Item[] _items;
        private readonly ManualResetEventSlim _done = new(false);
        private int _generation, _pending, _failed;
        private Exception? _error;

        public sealed class Part(int[] nodes)
        {
            public readonly int[] Nodes = nodes;
            public double[] Front = [], Stack = [], Gather = [];
        }

        public ParallelPlan(SparseCholesky c, int parts) : base(c._supernodes)
        {
            _owner = c;
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
            var isChild = new bool[count];
            foreach (int child in c._children) isChild[child] = true;
            var candidates = new List<int>();
            double total = 0;
            for (int s = 0; s < count; s++) if (!isChild[s]) { candidates.Add(s); total += work[s]; }

            var top = new List<int>();
            double topWork = 0;
            var bins = new double[parts];
            var best = (Length: double.MaxValue, Top: 0, Candidates: Array.Empty<int>());
            for (int step = 0; step < 64 * parts + 64; step++)
            {
                candidates.Sort((a, b) => work[b].CompareTo(work[a]));
                Array.Clear(bins);
                foreach (int s in candidates) bins[Array.IndexOf(bins, bins.Min())] += work[s];
                double length = topWork + bins.Max();
                if (length < best.Length) best = (length, top.Count, candidates.ToArray());
                double even = (total - topWork) / parts;
                if (bins.Max() <= 1.02 * even) break;
                int heaviest = candidates[0];
                if (c._childStart[heaviest] == c._childStart[heaviest + 1]) break; // a leaf: nothing left to split
                candidates.RemoveAt(0);
                top.Add(heaviest);
                // The front's own work moves to the top; its children's subtrees become candidates.
                double own = work[heaviest];
                for (int i = c._childStart[heaviest]; i < c._childStart[heaviest + 1]; i++)
                {
                    candidates.Add(c._children[i]);
                    own -= work[c._children[i]];
                }
                topWork += own;
            }

            // Deal the best candidate set again, then give each part its subtrees in ascending order (a postorder).
            var chosen = best.Candidates;
            Array.Sort(chosen, (a, b) => work[b].CompareTo(work[a]));
            var dealt = new List<int>[parts];
            for (int p = 0; p < parts; p++) dealt[p] = [];
            Array.Clear(bins);
            foreach (int s in chosen)
            {
                int p = Array.IndexOf(bins, bins.Min());
                bins[p] += work[s];
                dealt[p].Add(s);
            }
            Parts = new Part[parts];
            for (int p = 0; p < parts; p++)
            {
                dealt[p].Sort();
                var nodes = new List<int>();
                foreach (int root in dealt[p]) for (int s = first[root]; s <= root; s++) nodes.Add(s);
                Parts[p] = new Part(nodes.ToArray());
                foreach (int s in Parts[p].Nodes) Owner[s] = p;
            }
            var topNodes = top.GetRange(0, best.Top).ToArray();
            Array.Sort(topNodes);
            Top = topNodes;
            foreach (int s in Top) Owner[s] = parts;
            Stacks = new double[parts + 1][];
            for (int p = 0; p < parts; p++)
            {
                (Parts[p].Front, Parts[p].Stack) = Lay(c, Parts[p].Nodes, p);
                Stacks[p] = Parts[p].Stack;
            }
            // The top fronts reuse the sequential front and stack when they are large enough (they are: the sequential
            // stack holds at least the top fronts' pending updates at every step).
            var (topFront, topStack) = Lay(c, Top, parts);
            TopFront = topFront.Length <= c._sequential.TopFront.Length ? c._sequential.TopFront : topFront;
            TopStack = topStack.Length <= c._sequential.TopStack.Length ? c._sequential.TopStack : topStack;
            Stacks[parts] = TopStack;

            // The forward solve's split of each part front's rows: its subtree's rows, then those of the fronts above.
            var superOf = new int[c.Size];
            for (int sn = 0; sn < count; sn++) for (int j = c._superStart[sn]; j < c._superStart[sn + 1]; j++) superOf[j] = sn;
            Cut = new int[count];
            var tail = new List<int>();
            for (int sn = 0; sn < count; sn++)
            {
                int m = c._structStart[sn + 1] - c._structStart[sn], cut = m;
                if (Owner[sn] < parts)
                {
                    for (int r = 0; r < m; r++)
                        if (Owner[superOf[c._structure[c._structStart[sn] + r]]] == parts) { cut = r; break; }
                }
                Cut[sn] = cut;
                if (Owner[sn] == parts || cut < m) tail.Add(sn);
            }
            ForwardTail = tail.ToArray();
            foreach (var part in Parts) part.Gather = new double[c._gather.Length];

            double topTotal = 0;
            foreach (int s in Top)
            {
                double own = work[s];
                for (int i = c._childStart[s]; i < c._childStart[s + 1]; i++) own -= work[c._children[i]];
                topTotal += own;
            }
            TopShare = total > 0 ? topTotal / total : 0;
            Imbalance = total > topTotal ? bins.Max() / ((total - topTotal) / parts) : 1;
            _items = new Item[parts];
            for (int p = 1; p < parts; p++) _items[p] = new Item(this, p);
        }

        /// <summary>Runs one phase (factorisation, forward or backward solve) of every part, part 0 on the calling thread
        /// and the others on the thread pool (or here, when no pool thread has started them by then); false when a pivot
        /// failed in any part.</summary>
        public bool Run(Phase phase)
        {
            _phase = phase;
            _failed = 0;
            _error = null;
            _pending = Parts.Length - 1;
            _done.Reset();
            int generation = Interlocked.Increment(ref _generation); // publishes the lines above to the pool threads
            for (int p = 1; p < Parts.Length; p++) ThreadPool.UnsafeQueueUserWorkItem(_items[p], preferLocal: false);
            RunPart(0);
            for (int p = 1; p < Parts.Length; p++)
                if (_items[p].TryClaim(generation)) { RunPart(p); Finish(); }
            if (Volatile.Read(ref _pending) > 0) _done.Wait();
            if (_error is not null) ExceptionDispatchInfo.Throw(_error);
            return Volatile.Read(ref _failed) == 0;
        }

        private void RunPart(int p)
        {
            try
            {
                var part = Parts[p];
                var nodes = part.Nodes;
                switch (_phase)
                {
                    case Phase.Factor:
                        if (!_owner.FactorNodes(this, nodes, part.Front, part.Stack)) Volatile.Write(ref _failed, 1);
                        break;
                    case Phase.Forward:
                        foreach (int s in nodes) _owner.ForwardHead(s, Cut[s], part.Gather);
                        break;
                    default:
                        for (int i = nodes.Length - 1; i >= 0; i--) _owner.Backward(nodes[i], part.Gather);
                        break;
                }
            }
            catch (Exception e)
            {
                _error = e;
                Volatile.Write(ref _failed, 1);
            }
        }

        private void Finish()
        {
            if (Interlocked.Decrement(ref _pending) == 0) _done.Set();
        }

        /// <summary>One part's work item, queued again at every factorisation. It runs the part of the current
        /// factorisation only if nobody has claimed it yet (a stale queue entry finds it claimed and does nothing).</summary>
        private sealed class Item(ParallelPlan plan, int part) : IThreadPoolWorkItem
        {
            private int _claimed;

            public bool TryClaim(int generation) =>
                Interlocked.CompareExchange(ref _claimed, generation, generation - 1) == generation - 1;

            public void Execute()
            {
                if (TryClaim(Volatile.Read(ref plan._generation))) { plan.RunPart(part); plan.Finish(); }
            }
        }
    }
}
