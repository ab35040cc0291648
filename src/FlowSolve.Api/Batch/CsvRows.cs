using System.Text;
using System.Text.Json;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Batch;

/// <summary>
/// The row path of a CSV batch whose body is plain (ASCII, no quoted cells, lines ended by LF or CRLF): rows are
/// bound straight into the request record (<see cref="CsvRowBinder"/>), solved by the calculation's own handler in
/// parallel blocks across the cores, and written in their order. A row the binder does not take (a cell that is not
/// clean for its field) is turned into JSON and bound as every row of a quoted body is, so its answer, refusal
/// included, is the same; a batch whose header the binder does not take never comes here.
/// </summary>
internal static class CsvRows
{
    /// <summary>Rows solved by one worker at a time: large enough to pay for the hand-over, small enough to spread.</summary>
    private const int BlockRows = 1024;

    /// <summary>True when the body can be split on bytes exactly as the text reader splits it: every byte ASCII, no
    /// double quote (so no cell spans lines or holds a comma), and every CR followed by LF.</summary>
    public static bool IsPlain(ReadOnlySpan<byte> body)
    {
        if (body.IndexOfAnyExceptInRange((byte)0, (byte)0x7F) >= 0 || body.IndexOf((byte)'"') >= 0) return false;
        int at = 0;
        while (body[at..].IndexOf((byte)'\r') is var i and >= 0)
        {
            at += i + 1;
            if (at >= body.Length || body[at] != '\n') return false;
        }
        return true;
    }

    /// <summary>The next line (without its LF or CRLF) and the rest of the body after it.</summary>
    public static ReadOnlySpan<byte> NextLine(ref ReadOnlySpan<byte> rest)
    {
        int end = rest.IndexOf((byte)'\n');
        var line = end < 0 ? rest : rest[..end];
        rest = end < 0 ? default : rest[(end + 1)..];
        if (line.Length > 0 && line[^1] == '\r') line = line[..^1];
        return line;
    }

    /// <summary>True for a line of nothing but commas and white space (the text reader's blank record).</summary>
    public static bool IsBlank(ReadOnlySpan<byte> line)
    {
        foreach (byte b in line)
            if (b != ',' && !char.IsWhiteSpace((char)b)) return false;
        return true;
    }

    /// <summary>Everything one batch's workers share: the header, its binding, the columns written (each with its UTF-8
    /// cell writer) and how rows that leave the binder are bound.</summary>
    internal sealed class Job(CalculationDescriptor descriptor, List<string> header, CsvRowBinder.RowPlan plan,
        IReadOnlyList<ResponseColumn> columns, Func<object, double?>[]? shortcuts, ILogger logger)
    {
        private readonly bool[] _numeric = header.Select(h => BatchEndpoints.IsNumericField(descriptor.RequestType, h)).ToArray();
        private readonly Csv.HeaderPlan _jsonPlan = new(header);
        private readonly Action<object, Utf8Lines>[] _cells = Utf8Cells.For(descriptor.ResponseType, columns);

        /// <summary>Solves rows [first, first + count) of <paramref name="lines"/> into <paramref name="output"/>, one CSV
        /// line each as the text path writes it, in UTF-8; counts ok and refused rows.</summary>
        /// <remarks>A row's cells go straight into the block's UTF-8 buffer (numbers formatted into its bytes); only an
        /// error row is built as text first.</remarks>
        public void Solve(ReadOnlySpan<byte> body, (int Start, int Length)[] lines, int first, int count, Worker worker, Utf8Lines output,
            out int ok, out int refused)
        {
            ok = refused = 0;
            output.Length = 0;
            for (int i = first; i < first + count; i++)
            {
                var line = body.Slice(lines[i].Start, lines[i].Length);
                output.Number(i + 1);
                output.Byte((byte)',');
                if (plan.TryBind(line, worker.Values, out var request))
                {
                    if (shortcuts is not null && Shortcut(request!, output))
                    {
                        ok++;
                        continue;
                    }
                    var (status, value) = BatchEndpoints.Invoke(descriptor, request!, logger);
                    if (Write(status, value, output)) ok++; else refused++;
                }
                else
                {
                    var (status, value) = ThroughJson(line, worker);
                    if (Write(status, value, output)) ok++; else refused++;
                }
            }
        }

        /// <summary>Writes "200,,v1,v2..." from the declared shortcuts, or nothing and false when one declines the row.</summary>
        private bool Shortcut(object request, Utf8Lines output)
        {
            int mark = output.Length;
            output.Number(StatusCodes.Status200OK);
            output.Byte((byte)',');
            foreach (var shortcut in shortcuts!)
            {
                double? given;
                try
                {
                    given = shortcut(request);
                }
                catch (Exception)
                {
                    given = null; // the full solve meets the same input and answers for it (a 422, or a logged defect)
                }
                if (given is not { } value)
                {
                    output.Length = mark;
                    return false;
                }
                output.Byte((byte)',');
                output.Number(value);
            }
            output.LineEnd();
            return true;
        }

        /// <summary>The row's status, error and output cells after its number, and the line end, as
        /// <see cref="BatchEndpoints.AppendRow"/> writes them.</summary>
        private bool Write(int status, object? value, Utf8Lines output)
        {
            if (status is >= 200 and < 300)
            {
                output.Number(status);
                output.Byte((byte)',');
                foreach (var cell in _cells)
                {
                    output.Byte((byte)',');
                    cell(value!, output);
                }
                output.LineEnd();
            }
            else
            {
                var text = output.Scratch.Clear();
                BatchEndpoints.AppendRow(text, status, value, columns);
                output.Raw(text);
            }
            return status < 300;
        }

        /// <summary>A row the binder does not take, as a quoted body's row goes: the strict number check on numeric
        /// cells, then the row written as JSON and bound from it.</summary>
        private (int Status, object? Value) ThroughJson(ReadOnlySpan<byte> line, Worker worker)
        {
            var record = worker.Record;
            record.Clear();
            foreach (var range in line.Split((byte)',')) record.Add(Encoding.ASCII.GetString(line[range]));
            for (int c = 0; c < record.Count && c < _numeric.Length; c++)
            {
                var cell = record[c].AsSpan().Trim();
                if (_numeric[c] && cell.Length > 0 && StrictQuery.NumberProblem(cell) is { } problem)
                    return (400, BatchEndpoints.Problem(header[c], problem));
            }
            worker.Json.Clear();
            using (var json = new Utf8JsonWriter(worker.Json))
                Csv.WriteJson(json, _jsonPlan, record);
            return BatchEndpoints.RunRow(descriptor, worker.Json.WrittenSpan, logger);
        }

        public Worker NewWorker() => new(plan.NewValues());
    }

    /// <summary>One worker's reusable scratch space.</summary>
    internal sealed class Worker(CsvRowBinder.RowValues values)
    {
        public CsvRowBinder.RowValues Values { get; } = values;
        public List<string> Record { get; } = [];
        public System.Buffers.ArrayBufferWriter<byte> Json { get; } = new(512);
    }

    /// <summary>One place in the ring of blocks in hand: the block's answer lines as UTF-8, the worker that solves it,
    /// the block it holds, and what its solve gave (false when the time budget ran out before it started).</summary>
    private sealed class Slot
    {
        public readonly Utf8Lines Output = new();
        public Worker? Worker;
        public int Block;
        public TaskCompletionSource<bool> Solved = new();
        public int Ok;
        public int Refused;
    }

    /// <summary>Solves every row in blocks handed to the thread pool in their order, each block encoded to UTF-8 by the
    /// thread that solves it, and writes the blocks in order, each as soon as it and those before it are done. At most
    /// a ring of cores x 4 blocks is in hand (solving, solved or being written); a block's place, with its buffer and
    /// worker, goes to the next block once it is written. Each block is claimed once, by whichever thread comes to it
    /// first: a pool thread, or the writer, which solves the block it needs next itself when no pool thread has started
    /// it (and, while a pool thread solves that one, a later block in hand) rather than wait for the pool to reach it,
    /// which on a busy machine can take longer than the block. No thread waits for another: the writer awaits. Stops, as
    /// the text path does, with a final error row naming the first row not written when the time budget runs out.</summary>
    public static async Task Run(Job job, byte[] body, int bodyLength, (int Start, int Length)[] lines, int rowCount, Stream output,
        string calculation, double timeBudget, CancellationToken ct, CancellationToken aborted, int columnCount)
    {
        int blocks = (rowCount + BlockRows - 1) / BlockRows;
        if (blocks == 0) return;
        int cores = Math.Max(1, Environment.ProcessorCount);
        var ring = new Slot[Math.Min(blocks, cores * 4)];
        for (int i = 0; i < ring.Length; i++) ring[i] = new Slot();
        // 1 once a thread has taken the block (to solve it, or, on the way out, so that nobody does).
        var claimed = new int[blocks];
        var okRows = SolverMetrics.BatchRows.WithLabels(calculation, "ok");
        var errorRows = SolverMetrics.BatchRows.WithLabels(calculation, "error");
        int started = 0;

        bool Claim(int block) => Interlocked.Exchange(ref claimed[block], 1) == 0;

        void Start(int block)
        {
            var slot = ring[block % ring.Length];
            slot.Block = block;
            // Without RunContinuationsAsynchronously: the thread that finishes the block the writer awaits goes on as the
            // writer, rather than handing it to the pool's queue behind the blocks in hand.
            slot.Solved = new TaskCompletionSource<bool>();
            // The pool's shared queue runs blocks first in, first out, so the block the writer waits for comes first.
            _ = Task.Factory.StartNew(() =>
            {
                if (Claim(block)) Solve(block, slot);
            }, CancellationToken.None, TaskCreationOptions.PreferFairness, TaskScheduler.Default);
        }

        // Solves a claimed block into its slot and completes the slot (with false when the budget ran out first).
        void Solve(int block, Slot slot)
        {
            try
            {
                if (ct.IsCancellationRequested)
                {
                    slot.Solved.TrySetResult(false);
                    return;
                }
                int first = block * BlockRows;
                slot.Worker ??= job.NewWorker();
                job.Solve(body.AsSpan(0, bodyLength), lines, first, Math.Min(BlockRows, rowCount - first), slot.Worker, slot.Output,
                    out slot.Ok, out slot.Refused);
                slot.Solved.TrySetResult(true);
            }
            catch (Exception e)
            {
                slot.Solved.TrySetException(e);
            }
        }

        try
        {
            while (started < ring.Length) Start(started++);
            for (int k = 0; k < blocks; k++)
            {
                var slot = ring[k % ring.Length];
                if (Claim(k)) Solve(k, slot);
                // A pool thread has this block: solve a later block in hand that none has started, while it works.
                for (int later = k + 1; later < started && !slot.Solved.Task.IsCompleted; later++)
                    if (Claim(later)) Solve(later, ring[later % ring.Length]);
                bool solved = await slot.Solved.Task;
                int first = k * BlockRows;
                if (!solved || ct.IsCancellationRequested)
                {
                    if (aborted.IsCancellationRequested) return;
                    await output.WriteAsync(Encoding.UTF8.GetBytes(
                        $"{first + 1},503,{Csv.Escape(BatchEndpoints.TimeBudgetMessage(timeBudget, first + 1))}{new string(',', columnCount)}\r\n"), aborted);
                    SolverMetrics.BatchRows.WithLabels(calculation, "cut-off").Inc(rowCount - first);
                    return;
                }
                await output.WriteAsync(slot.Output.Written, aborted);
                okRows.Inc(slot.Ok);
                errorRows.Inc(slot.Refused);
                // This place is free again: the block a ring further on takes it.
                if (started < blocks) Start(started++);
            }
        }
        finally
        {
            // The blocks read the body: every way out makes sure no block is being solved, or will be, before the body's
            // buffer goes back to the pool. A block in hand that nobody has taken is taken here, so it never runs; one a
            // thread has taken is waited for.
            foreach (var slot in ring)
            {
                if (slot.Block < started && Claim(slot.Block)) continue;
                try
                {
                    await slot.Solved.Task;
                }
                catch (Exception)
                {
                    // Seen by the loop above when it reached that block; otherwise the answer is already cut off or abandoned.
                }
            }
            foreach (var slot in ring) slot.Output.Release();
        }
    }
}
