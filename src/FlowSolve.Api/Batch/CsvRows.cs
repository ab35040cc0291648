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

    /// <summary>Everything one batch's workers share: the header, its binding, the columns written and how rows that
    /// leave the binder are bound.</summary>
    internal sealed class Job(CalculationDescriptor descriptor, List<string> header, CsvRowBinder.RowPlan plan,
        IReadOnlyList<ResponseColumn> columns, Func<object, double?>[]? shortcuts, ILogger logger)
    {
        private readonly bool[] _numeric = header.Select(h => BatchEndpoints.IsNumericField(descriptor.RequestType, h)).ToArray();
        private readonly Csv.HeaderPlan _jsonPlan = new(header);

        /// <summary>Solves rows [first, first + count) of <paramref name="lines"/> into <paramref name="text"/>, one CSV
        /// line each, as the JSON path writes them; counts ok and refused rows.</summary>
        public void Solve(ReadOnlySpan<byte> body, (int Start, int Length)[] lines, int first, int count, Worker worker, StringBuilder text,
            out int ok, out int refused)
        {
            ok = refused = 0;
            for (int i = first; i < first + count; i++)
            {
                var line = body.Slice(lines[i].Start, lines[i].Length);
                text.Append(i + 1).Append(',');
                if (plan.TryBind(line, worker.Values, out var request))
                {
                    if (shortcuts is not null && Shortcut(request!, text))
                    {
                        ok++;
                        continue;
                    }
                    var (status, value) = BatchEndpoints.Invoke(descriptor, request!, logger);
                    if (Write(status, value, text)) ok++; else refused++;
                }
                else
                {
                    var (status, value) = ThroughJson(line, worker);
                    if (Write(status, value, text)) ok++; else refused++;
                }
            }
        }

        /// <summary>Writes "200,,v1,v2..." from the declared shortcuts, or nothing and false when one declines the row.</summary>
        private bool Shortcut(object request, StringBuilder text)
        {
            int mark = text.Length;
            text.Append(StatusCodes.Status200OK).Append(',');
            foreach (var shortcut in shortcuts!)
            {
                if (shortcut(request) is not { } value)
                {
                    text.Length = mark;
                    return false;
                }
                CellWriter.Append(text.Append(','), value);
            }
            text.Append("\r\n");
            return true;
        }

        private bool Write(int status, object? value, StringBuilder text)
        {
            BatchEndpoints.AppendRow(text, status, value, columns);
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

    /// <summary>Solves every row in blocks spread over the cores, a window of blocks at a time, and writes each window's
    /// blocks in order before the next is solved (so at most a window's text is held). Stops, as the JSON path does, with
    /// a final error row naming the first row not written when the time budget runs out.</summary>
    public static async Task Run(Job job, byte[] body, int bodyLength, (int Start, int Length)[] lines, int rowCount, StreamWriter writer,
        string calculation, double timeBudget, CancellationToken ct, CancellationToken aborted, int columnCount)
    {
        int blocks = (rowCount + BlockRows - 1) / BlockRows;
        int cores = Math.Max(1, Environment.ProcessorCount);
        int window = Math.Min(blocks, cores * 4);
        var texts = new StringBuilder[window];
        for (int k = 0; k < window; k++) texts[k] = new StringBuilder(BlockRows * 64);
        var done = new bool[window];
        var oks = new int[window];
        var refusals = new int[window];
        var okRows = SolverMetrics.BatchRows.WithLabels(calculation, "ok");
        var errorRows = SolverMetrics.BatchRows.WithLabels(calculation, "error");
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = cores };
        for (int w = 0; w < blocks; w += window)
        {
            int count = Math.Min(window, blocks - w);
            int from = w;
            Parallel.For(0, count, parallel, job.NewWorker, (k, _, worker) =>
            {
                done[k] = false;
                texts[k].Clear();
                if (ct.IsCancellationRequested) return worker;
                int first = (from + k) * BlockRows;
                job.Solve(body.AsSpan(0, bodyLength), lines, first, Math.Min(BlockRows, rowCount - first), worker, texts[k], out oks[k], out refusals[k]);
                done[k] = true;
                return worker;
            }, static _ => { });
            for (int k = 0; k < count; k++)
            {
                int first = (w + k) * BlockRows;
                if (!done[k] || ct.IsCancellationRequested)
                {
                    if (aborted.IsCancellationRequested) return;
                    await writer.WriteAsync($"{first + 1},503,{Csv.Escape(BatchEndpoints.TimeBudgetMessage(timeBudget, first + 1))}{new string(',', columnCount)}\r\n");
                    SolverMetrics.BatchRows.WithLabels(calculation, "cut-off").Inc(rowCount - first);
                    return;
                }
                await writer.WriteAsync(texts[k], aborted);
                okRows.Inc(oks[k]);
                errorRows.Inc(refusals[k]);
            }
        }
    }
}
