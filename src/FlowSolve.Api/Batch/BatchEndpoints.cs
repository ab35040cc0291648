using System.Text;
using System.Text.Json;
using FlowSolve.Api.Hosting;
using Microsoft.AspNetCore.Http.Timeouts;
using FlowSolve.Api.Problems;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Batch;

/// <summary><c>POST /v1/batch/{calculation}</c>: many cases of one calculation in one request, as a JSON array or CSV.</summary>
public static class BatchEndpoints
{
    /// <summary>Maps the batch route; after the catalogue, whose row calculations its description lists.</summary>
    public static IEndpointRouteBuilder MapBatchEndpoints(this IEndpointRouteBuilder routes)
    {
        var names = routes.ServiceProvider.GetRequiredService<CalculationCatalog>().All.Select(c => c.Name)
            .Where(n => !n.StartsWith("check/", StringComparison.Ordinal)).Order(StringComparer.Ordinal).ToArray();
        routes.MapPost("/v1/batch/{**calculation}", Run)
            .WithTags("Batch")
            .WithName("PostBatch")
            .WithSummary("Run many cases of one calculation (JSON array or CSV)")
            .WithDescription(
                "calculation is the calculation's route below /v1, for example friction-factor or pipes/head-loss. The body is " +
                "either a JSON array of request objects (Content-Type: application/json) or CSV (Content-Type: text/csv) with a " +
                "header row of request field names (dotted names such as section.shape nest) and one case per row. The answer " +
                "comes in the same format, one row per case in the same order: every output field, or that row's error. One bad " +
                "row never fails the others. JSON rows are {row, status, result} or {row, status, error, problem}; CSV rows start " +
                "with row, httpStatus and error columns, then every scalar output field (nested objects flattened with dots; " +
                "warnings as their codes separated by spaces; lists such as validity are left out of CSV: use JSON for them). " +
                "Above the configured row limit (default 100 000) the answer is 413. With select (CSV only) the answer's " +
                "columns after row, httpStatus and error are only the output fields named, in that order. A CSV batch's rows " +
                "are solved in parallel across the server's cores; the answer keeps their order.\n\nCalculations: " + string.Join(", ", names) +
                "; and check/ followed by any of them, for a batch of checks of claimed values.")
            .Accepts<JsonElement[]>("application/json", "text/csv")
            .Produces(200, contentType: "application/json")
            .Produces(200, contentType: "text/csv")
            .ProducesProblem(400)
            .ProducesProblem(404)
            .ProducesProblem(413)
            .ProducesProblem(415)
            .DisableRequestTimeout()
            .WithMetadata(new RequestExample([], JsonSerializer.SerializeToNode(new object[]
            {
                new { reynolds = 75000, relativeRoughness = 0.005 },
                new { reynolds = 250000, roughness = 0.00026, diameter = 0.3 },
            }, JsonSetup.Options)));
        return routes;
    }

    private static async Task<IResult> Run(
        [System.ComponentModel.Description("The calculation's route below /v1, for example friction-factor or pipes/head-loss (the list is in the operation's description).")] string calculation, HttpContext http, CalculationCatalog catalog,
        Microsoft.Extensions.Options.IOptions<FlowSolveOptions> options, ILoggerFactory loggers,
        [FromQuery(Name = "select"), System.ComponentModel.Description("CSV batches only: the output fields to write after row, httpStatus and error, as their CSV column names separated by commas (for example frictionFactor or headLoss,velocity,warnings); every output column when absent.")] string? select = null)
    {
        var logger = loggers.CreateLogger("FlowSolve.Batch");
        if (!catalog.TryGet(calculation, out var descriptor))
        {
            return TypedResults.Problem(statusCode: 404, title: "No such calculation.",
                detail: $"'{calculation}' is not a calculation. Available: {string.Join(", ", catalog.All.Select(c => c.Name).Order())}.");
        }
        string mediaType = http.Request.ContentType?.Split(';')[0].Trim().ToLowerInvariant() ?? "";
        var (columns, refusal) = Select(descriptor, select);
        if (refusal is not null) return refusal;
        if (select is not null && mediaType == "application/json")
            return ProblemResults.BadInput("select", "applies to CSV batches (Content-Type: text/csv); a JSON batch answers every field of each row");
        int limit = options.Value.Limits.BatchRows;
        // The batch keeps its own time budget (the general request timeout is off for this route) so that, once rows
        // are streaming, it can end the answer with a row that says where and why it stopped instead of a torn body.
        using var budget = CancellationTokenSource.CreateLinkedTokenSource(http.RequestAborted);
        budget.CancelAfter(TimeSpan.FromSeconds(options.Value.Limits.RequestTimeoutSeconds));
        var ct = budget.Token;
        try
        {
        return mediaType switch
        {
            "application/json" => await RunJson(descriptor, http, limit, options.Value.Limits.RequestTimeoutSeconds, logger, ct),
            "text/csv" => await RunCsv(descriptor, columns!, select is not null, http, limit, options.Value.Limits.RequestTimeoutSeconds, logger, ct),
            _ => TypedResults.Problem(statusCode: 415, title: "Unsupported media type.",
                detail: "Send a JSON array (Content-Type: application/json) or CSV with a header row (Content-Type: text/csv)."),
        };
        }
        catch (OperationCanceledException) when (!http.RequestAborted.IsCancellationRequested && !http.Response.HasStarted)
        {
            return TypedResults.Problem(statusCode: 503, title: "The batch ran past its time budget.",
                detail: TimeBudgetMessage(options.Value.Limits.RequestTimeoutSeconds, 0),
                extensions: new Dictionary<string, object?> { ["limit"] = "requestTimeoutSeconds" });
        }
    }

    internal static string TimeBudgetMessage(double seconds, int row) =>
        $"time budget of {seconds} s (FlowSolve:Limits:RequestTimeoutSeconds) exceeded" +
        (row > 0 ? $"; rows from {row} on were not calculated: split the batch" : "; split the batch");

    private static IResult TooMany(int limit) =>
        TypedResults.Problem(statusCode: 413, title: "Too many rows.",
            detail: $"The batch holds more than {limit} rows, the configured limit (FlowSolve:Limits:BatchRows). Split it.",
            extensions: new Dictionary<string, object?> { ["limit"] = "batchRows", ["maximumRows"] = limit });

    /// <summary>Reading the array keeps a row with a repeated key whole, so that the row's own binding refuses it and only
    /// that row fails (the same rule, per row, as a single call).</summary>
    private static readonly JsonSerializerOptions RowReadOptions = new(JsonSetup.Options) { AllowDuplicateProperties = true };

    private static async Task<IResult> RunJson(CalculationDescriptor descriptor, HttpContext http, int limit, double timeBudget, ILogger logger, CancellationToken ct)
    {
        // Rows are read one element at a time; at most `limit` of them are held before the answer starts.
        var rows = new List<JsonElement>();
        try
        {
            await foreach (var element in JsonSerializer.DeserializeAsyncEnumerable<JsonElement>(http.Request.Body, RowReadOptions, ct))
            {
                if (rows.Count == limit) return TooMany(limit);
                rows.Add(element);
            }
        }
        catch (JsonException e)
        {
            // Our own words, with where the reader stopped; the serializer's message names .NET types.
            string where = e.LineNumber is long line ? $" (the JSON stops being one at line {line + 1}, byte {(e.BytePositionInLine ?? 0) + 1})" : "";
            return ProblemResults.BadInput("body", "must be a JSON array of request objects, [{...}, {...}]" + where);
        }

        http.Response.ContentType = "application/json; charset=utf-8";
        // The pipe writer takes the serializer's synchronous flushes as buffer commits; FlushAsync sends them.
        var pipe = http.Response.BodyWriter;
        await using var writer = new Utf8JsonWriter(pipe);
        writer.WriteStartArray();
        long flushed = 0;
        var okRows = SolverMetrics.BatchRows.WithLabels(descriptor.Name, "ok");
        var errorRows = SolverMetrics.BatchRows.WithLabels(descriptor.Name, "error");
        for (int i = 0; i < rows.Count; i++)
        {
            if (ct.IsCancellationRequested)
            {
                if (http.RequestAborted.IsCancellationRequested) return Results.Empty;
                writer.WriteStartObject();
                writer.WriteNumber("row", i + 1);
                writer.WriteNumber("status", 503);
                writer.WriteString("error", TimeBudgetMessage(timeBudget, i + 1));
                writer.WriteEndObject();
                SolverMetrics.BatchRows.WithLabels(descriptor.Name, "cut-off").Inc(rows.Count - i);
                break;
            }
            var (status, value) = RunRow(descriptor, rows[i], logger);
            (status < 300 ? okRows : errorRows).Inc();
            writer.WriteStartObject();
            writer.WriteNumber("row", i + 1);
            writer.WriteNumber("status", status);
            if (status is >= 200 and < 300)
            {
                writer.WritePropertyName("result");
                JsonSerializer.Serialize(writer, value, value!.GetType(), JsonSetup.Options);
            }
            else
            {
                writer.WriteString("error", TextFormat.ErrorLine(value)["error: ".Length..]);
                writer.WritePropertyName("problem");
                JsonSerializer.Serialize(writer, value, value?.GetType() ?? typeof(object), JsonSetup.Options);
            }
            writer.WriteEndObject();
            if (writer.BytesCommitted + writer.BytesPending > flushed + 32_768)
            {
                writer.Flush();
                await pipe.FlushAsync(http.RequestAborted);
                flushed = writer.BytesCommitted;
            }
        }
        writer.WriteEndArray();
        writer.Flush();
        await pipe.FlushAsync(http.RequestAborted);
        return Results.Empty;
    }

    /// <summary>The output columns a CSV batch writes: every column, or those <c>select</c> names (400 naming select for
    /// an unknown or repeated name).</summary>
    private static (IReadOnlyList<ResponseColumn>? Columns, IResult? Problem) Select(CalculationDescriptor descriptor, string? select)
    {
        if (select is null) return (descriptor.Columns, null);
        var chosen = new List<ResponseColumn>();
        foreach (var raw in select.Split(','))
        {
            string name = raw.Trim();
            if (name.Length == 0) return (null, ProblemResults.BadInput("select", "names an empty field; give output field names separated by commas"));
            var column = descriptor.Columns.FirstOrDefault(c => c.Name.Equals(name, StringComparison.OrdinalIgnoreCase));
            if (column is null)
            {
                string? near = StrictQuery.Closest(name, descriptor.Columns.Select(c => c.Name));
                return (null, ProblemResults.BadInput("select", $"'{(name.Length > 40 ? name[..40] + "..." : name)}' is not an output column of {descriptor.Name}" +
                    (near is null ? "" : $"; did you mean '{near}'?") + $" (columns: {string.Join(", ", descriptor.Columns.Select(c => c.Name))})"));
            }
            if (chosen.Contains(column)) return (null, ProblemResults.BadInput("select", $"names '{column.Name}' more than once; name each field once"));
            chosen.Add(column);
        }
        return (chosen, null);
    }

    /// <summary>The whole body in one pooled buffer (its size is bounded by the body limit, which the server enforces
    /// while it is read). A declared length sizes the first buffer only up to 4 MiB: a header alone never reserves more
    /// memory than the bytes that actually arrive.</summary>
    private static async Task<(byte[] Buffer, int Length)> ReadBody(HttpRequest request, CancellationToken ct)
    {
        long? declared = request.ContentLength;
        var buffer = System.Buffers.ArrayPool<byte>.Shared.Rent(declared is > 0 and < 4 << 20 ? (int)declared + 1 : declared is > 0 ? 4 << 20 : 65_536);
        int length = 0;
        try
        {
            while (true)
            {
                if (length == buffer.Length)
                {
                    var larger = System.Buffers.ArrayPool<byte>.Shared.Rent((int)Math.Min(Array.MaxLength, 2L * buffer.Length));
                    buffer.AsSpan(0, length).CopyTo(larger);
                    System.Buffers.ArrayPool<byte>.Shared.Return(buffer);
                    buffer = larger;
                }
                int read = await request.Body.ReadAsync(buffer.AsMemory(length), ct);
                if (read == 0) return (buffer, length);
                length += read;
            }
        }
        catch
        {
            System.Buffers.ArrayPool<byte>.Shared.Return(buffer);
            throw;
        }
    }

    private static async Task<IResult> RunCsv(CalculationDescriptor descriptor, IReadOnlyList<ResponseColumn> columns, bool selected, HttpContext http,
        int limit, double timeBudget, ILogger logger, CancellationToken ct)
    {
        var (body, length) = await ReadBody(http.Request, ct);
        try
        {
            // A UTF-8 byte-order mark is dropped, as the text reader drops it.
            int start = length >= 3 && body[0] == 0xEF && body[1] == 0xBB && body[2] == 0xBF ? 3 : 0;
            if (CsvRowBinder.For(descriptor.RequestType) is { } binder && CsvRows.IsPlain(body.AsSpan(start, length - start)))
            {
                var rest = (ReadOnlySpan<byte>)body.AsSpan(start, length - start);
                var first = rest.IsEmpty ? null : Encoding.ASCII.GetString(CsvRows.NextLine(ref rest)).Split(',').ToList();
                var (plainHeader, problem) = Header(first);
                if (problem is not null) return problem;
                if (binder.Plan(plainHeader!) is { } plan)
                {
                    // Where each row lies in the body, in a pooled array (a batch of many rows would otherwise build a
                    // list on the large-object heap and copy it).
                    var lines = System.Buffers.ArrayPool<(int, int)>.Shared.Rent(1024);
                    try
                    {
                        int count = 0;
                        int offset = length - rest.Length;
                        while (!rest.IsEmpty)
                        {
                            int before = rest.Length;
                            var line = CsvRows.NextLine(ref rest);
                            int at = offset;
                            offset += before - rest.Length;
                            if (CsvRows.IsBlank(line)) continue;
                            if (count == limit) return TooMany(limit);
                            if (count == lines.Length)
                            {
                                var larger = System.Buffers.ArrayPool<(int, int)>.Shared.Rent(2 * lines.Length);
                                lines.AsSpan(0, count).CopyTo(larger);
                                System.Buffers.ArrayPool<(int, int)>.Shared.Return(lines);
                                lines = larger;
                            }
                            lines[count++] = (at, line.Length);
                        }
                        Func<object, double?>[]? shortcuts = selected && descriptor.Shortcuts is { } declared
                            && columns.All(c => declared.ContainsKey(c.Name)) ? columns.Select(c => declared[c.Name]).ToArray() : null;
                        var job = new CsvRows.Job(descriptor, plainHeader!, plan, columns, shortcuts, logger);
                        http.Response.ContentType = "text/csv; charset=utf-8";
                        await http.Response.Body.WriteAsync(Encoding.UTF8.GetBytes(HeaderLine(columns)), http.RequestAborted);
                        await CsvRows.Run(job, body, length, lines, count, http.Response.Body, descriptor.Name, timeBudget, ct, http.RequestAborted, columns.Count);
                        return Results.Empty;
                    }
                    finally
                    {
                        System.Buffers.ArrayPool<(int, int)>.Shared.Return(lines);
                    }
                }
            }
            using var stream = new MemoryStream(body, 0, length, writable: false);
            return await RunCsvText(descriptor, columns, stream, http, limit, timeBudget, logger, ct);
        }
        finally
        {
            System.Buffers.ArrayPool<byte>.Shared.Return(body);
        }
    }

    private static string HeaderLine(IReadOnlyList<ResponseColumn> columns)
    {
        var line = new StringBuilder("row,httpStatus,error");
        foreach (var c in columns) line.Append(',').Append(c.Name);
        return line.Append("\r\n").ToString();
    }

    /// <summary>The header trimmed, or the 400 for a missing header or a repeated column.</summary>
    private static (List<string>? Header, IResult? Problem) Header(List<string>? header)
    {
        if (header is null || header.All(h => h.Trim().Length == 0))
            return (null, ProblemResults.BadInput("body", "CSV needs a header row of request field names"));
        for (int i = 0; i < header.Count; i++) header[i] = header[i].Trim().TrimStart('\uFEFF');
        var repeated = header.Where(h => h.Length > 0).GroupBy(h => h, StringComparer.OrdinalIgnoreCase).FirstOrDefault(g => g.Count() > 1);
        if (repeated is not null)
            return (null, ProblemResults.BadInput(repeated.Key, "is a column of the header more than once; give each field once"));
        return (header, null);
    }

    /// <summary>Any CSV body (quoted cells, other line ends, any text): read as text, each row bound through JSON.</summary>
    private static async Task<IResult> RunCsvText(CalculationDescriptor descriptor, IReadOnlyList<ResponseColumn> columns, Stream body, HttpContext http,
        int limit, double timeBudget, ILogger logger, CancellationToken ct)
    {
        using var reader = new StreamReader(body, Encoding.UTF8, detectEncodingFromByteOrderMarks: true, bufferSize: 65_536);
        var (header, headerProblem) = Header(await Csv.ReadRecordAsync(reader, ct));
        if (headerProblem is not null) return headerProblem;
        // Columns whose request field is a number: their cells follow the query's invariant grammar (a decimal comma is
        // refused, naming the field, rather than read as text or as a number with a thousands separator).
        var numeric = header!.Select(h => IsNumericField(descriptor.RequestType, h)).ToArray();
        var cellErrors = new Dictionary<int, (string Field, string Message)>();

        // Each row is turned into its request's UTF-8 JSON as it is read and kept in one growing buffer (a few hundred
        // bytes a row, no objects per row survive the read), so that the 413 for too many rows comes before any answer.
        var plan = new Csv.HeaderPlan(header!);
        var store = new System.Buffers.ArrayBufferWriter<byte>(65_536);
        var ends = new List<int>();
        await using (var json = new Utf8JsonWriter(store))
        {
            while (await Csv.ReadRecordAsync(reader, ct) is { } record)
            {
                if (record.All(f => f.Trim().Length == 0)) continue; // blank line
                if (ends.Count == limit) return TooMany(limit);
                for (int c = 0; c < record.Count && c < numeric.Length; c++)
                {
                    var cell = record[c].AsSpan().Trim();
                    if (numeric[c] && cell.Length > 0 && StrictQuery.NumberProblem(cell) is { } problem)
                    {
                        cellErrors.TryAdd(ends.Count, (header![c], problem));
                        break;
                    }
                }
                Csv.WriteJson(json, plan, record);
                json.Flush();
                json.Reset(store);
                ends.Add(store.WrittenCount);
            }
        }

        http.Response.ContentType = "text/csv; charset=utf-8";
        await using var writer = new StreamWriter(http.Response.Body, new UTF8Encoding(false), 65_536);
        await writer.WriteAsync(HeaderLine(columns));
        var line = new StringBuilder();
        var okRows = SolverMetrics.BatchRows.WithLabels(descriptor.Name, "ok");
        var errorRows = SolverMetrics.BatchRows.WithLabels(descriptor.Name, "error");
        for (int i = 0; i < ends.Count; i++)
        {
            if (ct.IsCancellationRequested)
            {
                if (http.RequestAborted.IsCancellationRequested) return Results.Empty;
                await writer.WriteAsync($"{i + 1},503,{Csv.Escape(TimeBudgetMessage(timeBudget, i + 1))}{new string(',', columns.Count)}\r\n");
                SolverMetrics.BatchRows.WithLabels(descriptor.Name, "cut-off").Inc(ends.Count - i);
                break;
            }
            int start = i == 0 ? 0 : ends[i - 1];
            var (status, value) = cellErrors.TryGetValue(i, out var bad)
                ? (400, Problem(bad.Field, bad.Message))
                : RunRow(descriptor, store.WrittenSpan[start..ends[i]], logger);
            (status < 300 ? okRows : errorRows).Inc();
            AppendRow(line.Clear().Append(i + 1).Append(','), status, value, columns);
            await writer.WriteAsync(line, http.RequestAborted);
        }
        await writer.FlushAsync(http.RequestAborted);
        return Results.Empty;
    }

    /// <summary>Appends a row's status, error and output cells after its number, and the line end.</summary>
    internal static void AppendRow(StringBuilder line, int status, object? value, IReadOnlyList<ResponseColumn> columns)
    {
        line.Append(status).Append(',');
        if (status is >= 200 and < 300)
        {
            foreach (var c in columns) c.Write(value!, line.Append(','));
        }
        else
        {
            line.Append(Csv.Escape(TextFormat.ErrorLine(value)["error: ".Length..]));
            for (int c = 0; c < columns.Count; c++) line.Append(',');
        }
        line.Append("\r\n");
    }

    /// <summary>Runs one case given as UTF-8 JSON; a row's failure is that row's answer, never the batch's.</summary>
    internal static (int Status, object? Value) RunRow(CalculationDescriptor descriptor, ReadOnlySpan<byte> json, ILogger logger)
    {
        object? request;
        try
        {
            request = descriptor.Bind(json);
            if (request is null) return (400, Problem("row", "must be a JSON object of request fields"));
        }
        catch (JsonException e)
        {
            var (field, message) = BadRequestProblems.DescribeJson(e);
            return (400, Problem(field == "body" ? "row" : field, message));
        }
        return Invoke(descriptor, request, logger);
    }

    /// <summary>Runs one case of a JSON array: its raw UTF-8 goes to the same binder as a CSV row's.</summary>
    private static (int Status, object? Value) RunRow(CalculationDescriptor descriptor, JsonElement json, ILogger logger) =>
        json.ValueKind == JsonValueKind.Object
            ? RunRow(descriptor, System.Runtime.InteropServices.JsonMarshal.GetRawUtf8Value(json), logger)
            : (400, Problem("row", "must be a JSON object of request fields"));

    internal static (int Status, object? Value) Invoke(CalculationDescriptor descriptor, object request, ILogger logger)
    {
        try
        {
            return descriptor.Invoke(request).Unwrap();
        }
        catch (Exception e)
        {
            logger.LogError(e, "Batch row failed in {Calculation}", descriptor.Name);
            // A defect, not the row's fault: report it on the row and carry on with the others.
            return (500, new ProblemDetails { Status = 500, Title = "An internal error occurred.", Detail = "this row could not be calculated (a defect in FlowSolve; it has been logged)" });
        }
    }

    /// <summary>True when a (dotted) CSV header names a numeric field of the request type.</summary>
    internal static bool IsNumericField(Type requestType, string header)
    {
        Type? t = requestType;
        foreach (var part in header.Split('.'))
        {
            var p = t?.GetProperty(part, System.Reflection.BindingFlags.Public | System.Reflection.BindingFlags.Instance | System.Reflection.BindingFlags.IgnoreCase);
            if (p is null) return false;
            t = p.PropertyType;
        }
        t = Nullable.GetUnderlyingType(t!) ?? t;
        return t == typeof(double) || t == typeof(int) || t == typeof(float) || t == typeof(long) || t == typeof(decimal);
    }

    internal static HttpValidationProblemDetails Problem(string field, string message) =>
        new(new Dictionary<string, string[]> { [field] = [message] }) { Status = 400, Title = "One or more fields are invalid." };
}
