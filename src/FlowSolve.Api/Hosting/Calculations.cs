using System.Linq.Expressions;
using System.Text.Json;
using Microsoft.AspNetCore.Http.HttpResults;

namespace FlowSolve.Api.Hosting;

/// <summary>Endpoint metadata naming a calculation and its primary output (what <c>format=text</c> returns).</summary>
/// <param name="Name">The calculation's route below /v1, for example <c>pipes/head-loss</c>.</param>
/// <param name="PrimaryOutput">The response field returned by <c>format=text</c> when no <c>select</c> is given.</param>
/// <param name="Text">False for a calculation whose answer is tables rather than one value per row (a network):
/// <c>format=text</c> then answers 400 naming <c>format</c>.</param>
public sealed record CalculationMetadata(string Name, string PrimaryOutput, bool Text = true)
{
    /// <summary>The calculation's own output options in the query (sensitivities, ...): the strict-query rules and the
    /// OpenAPI document read them.</summary>
    public IReadOnlyList<QueryOption> Options { get; init; } = [];
}

/// <summary>One calculation as the batch and text machinery see it: a request type, a response type, and a handler.</summary>
public sealed class CalculationDescriptor(string name, string primaryOutput, Type requestType, Type responseType, Func<object, IResult> invoke)
{
    public string Name { get; } = name;
    public string PrimaryOutput { get; } = primaryOutput;
    public Type RequestType { get; } = requestType;
    public Type ResponseType { get; } = responseType;

    /// <summary>Runs the calculation on a request already bound from JSON, through <see cref="CalculationGuard"/> as the
    /// HTTP routes do (non-finite numbers and arguments the Core refuses become 422s).</summary>
    public IResult Invoke(object request)
    {
        IResult result;
        try
        {
            result = invoke(request);
        }
        catch (Exception e) when (CalculationGuard.FromException(Name, e) is { } problem)
        {
            return problem;
        }
        return CalculationGuard.Review(Name, result, strict: false);
    }

    /// <summary>Binds a JSON object to the request type with the API's JSON rules (unknown fields rejected).</summary>
    public object? Bind(JsonElement json) => json.Deserialize(RequestType, JsonSetup.Options);

    /// <summary>Binds UTF-8 JSON to the request type, as <see cref="Bind(JsonElement)"/>.</summary>
    public object? Bind(ReadOnlySpan<byte> utf8Json) => JsonSerializer.Deserialize(utf8Json, RequestType, JsonSetup.Options);

    /// <summary>The CSV columns of a response: scalar fields, nested records flattened with dots, warnings as codes.</summary>
    public IReadOnlyList<ResponseColumn> Columns { get; } = ResponseColumns.For(responseType);

    /// <summary>The calculation's declared row shortcuts by column name (case-insensitive), or null.</summary>
    public IReadOnlyDictionary<string, Func<object, double?>>? Shortcuts { get; init; }
}

/// <summary>Every calculation the service offers, registered by each area when it maps its endpoints.</summary>
public sealed class CalculationCatalog
{
    private readonly Dictionary<string, CalculationDescriptor> _byName = new(StringComparer.OrdinalIgnoreCase);

    public IEnumerable<CalculationDescriptor> All => _byName.Values;

    public bool TryGet(string name, out CalculationDescriptor descriptor) => _byName.TryGetValue(name.Trim('/'), out descriptor!);

    public void Add(CalculationDescriptor descriptor) => _byName[descriptor.Name] = descriptor;

    public void Add<TRequest, TResponse>(string name, string primaryOutput, Func<TRequest, IResult> calculate) where TRequest : class =>
        _byName[name] = new CalculationDescriptor(name, primaryOutput, typeof(TRequest), typeof(TResponse), r => calculate((TRequest)r));
}

public static class CalculationExtensions
{
    /// <summary>The status and value inside a typed result (unwrapping <c>Results&lt;...&gt;</c>).</summary>
    public static (int Status, object? Value) Unwrap(this IResult result)
    {
        while (result is INestedHttpResult nested) result = nested.Result;
        int status = result is IStatusCodeHttpResult s ? s.StatusCode ?? 200 : 200;
        object? value = result is IValueHttpResult v ? v.Value : null;
        return (status, value);
    }
}

/// <summary>One CSV column of a response: its dotted wire name and how to write it as cell text.</summary>
/// <remarks>The reader is compiled once per column at start-up (typed property getters, no reflection per row), and
/// writes straight into the row's builder without an intermediate string: a batch writes tens of columns per row.</remarks>
public sealed class ResponseColumn
{
    private readonly Action<object, System.Text.StringBuilder> _write;

    private readonly Action<object, System.Text.StringBuilder>? _text;

    public ResponseColumn(string name, System.Reflection.PropertyInfo[] path)
    {
        Name = name;
        _write = CellWriter.Compile(path);
        // Only text cells differ between CSV and plain text (quoting); numbers, booleans and empty cells are alike.
        var leaf = path[^1].PropertyType;
        if (leaf == typeof(string) || !leaf.IsValueType && Nullable.GetUnderlyingType(leaf) is null) _text = CellWriter.Compile(path, plain: true);
    }

    public string Name { get; }

    /// <summary>Appends the value as cell text, formatted as the JSON answer writes it (shortest round-trip numbers,
    /// invariant culture), so a CSV cell equals the single call's JSON digit for digit; text is quoted when it holds a
    /// comma, quote or line break; a missing value (a null on the path) writes nothing.</summary>
    public void Write(object response, System.Text.StringBuilder cell) => _write(response, cell);

    /// <summary>The value as one plain-text answer (<c>format=text</c>): as <see cref="Write"/>, but text is not quoted
    /// for CSV and warnings are separated by commas.</summary>
    public void WriteText(object response, System.Text.StringBuilder cell)
    {
        if (_text is null) _write(response, cell);
        else _text(response, cell);
    }

    /// <summary>The value as cell text (see <see cref="Write"/>).</summary>
    public string Read(object response)
    {
        var cell = new System.Text.StringBuilder();
        _write(response, cell);
        return cell.ToString();
    }
}

/// <summary>Builds a column's writer: <c>(o, sb) =&gt; { var a = ((T)o).P1; if (a == null) return; ...; Append(sb, leaf); }</c>.</summary>
internal static class CellWriter
{
    private static readonly System.Globalization.CultureInfo Invariant = System.Globalization.CultureInfo.InvariantCulture;

    public static Action<object, System.Text.StringBuilder> Compile(System.Reflection.PropertyInfo[] path, bool plain = false) =>
        CompilePath<System.Text.StringBuilder>(path, type => plain ? PlainAppender(type) : Appender(type));

    /// <summary>Compiles a writer of one response column into a sink: the property path walked from the response (a null
    /// on the way writes nothing), then <paramref name="leaf"/>'s method for the leaf's type called with (sink, value).
    /// Shared by the text and CSV cells and the batch's UTF-8 rows.</summary>
    public static Action<object, TSink> CompilePath<TSink>(System.Reflection.PropertyInfo[] path, Func<Type, System.Reflection.MethodInfo> leaf)
    {
        var response = Expression.Parameter(typeof(object), "response");
        var sink = Expression.Parameter(typeof(TSink), "sink");
        var end = Expression.Label("end");
        var variables = new List<ParameterExpression>();
        var body = new List<Expression>();
        Expression current = Expression.Convert(response, path[0].DeclaringType!);
        for (int i = 0; i < path.Length; i++)
        {
            var step = Expression.Variable(path[i].PropertyType, "p" + i);
            variables.Add(step);
            body.Add(Expression.Assign(step, Expression.Property(current, path[i])));
            bool last = i == path.Length - 1;
            if (!last && !path[i].PropertyType.IsValueType)
                body.Add(Expression.IfThen(Expression.Equal(step, Expression.Constant(null, step.Type)), Expression.Return(end)));
            current = step;
        }
        body.Add(Expression.Call(leaf(current.Type), sink, current));
        body.Add(Expression.Label(end));
        return Expression.Lambda<Action<object, TSink>>(Expression.Block(variables, body), response, sink).Compile();
    }

    private static System.Reflection.MethodInfo Appender(Type type)
    {
        var exact = typeof(CellWriter).GetMethod(nameof(Append), [typeof(System.Text.StringBuilder), type]);
        if (exact is not null) return exact;
        if (typeof(IEnumerable<Contracts.WarningDto>).IsAssignableFrom(type))
            return typeof(CellWriter).GetMethod(nameof(AppendWarnings))!;
        if (Nullable.GetUnderlyingType(type) is { } underlying)
            return typeof(CellWriter).GetMethod(nameof(AppendNullable))!.MakeGenericMethod(underlying);
        return typeof(CellWriter).GetMethod(nameof(AppendObject))!.MakeGenericMethod(type);
    }

    private static System.Reflection.MethodInfo PlainAppender(Type type)
    {
        if (type == typeof(string)) return typeof(CellWriter).GetMethod(nameof(AppendPlain))!;
        if (typeof(IEnumerable<Contracts.WarningDto>).IsAssignableFrom(type)) return typeof(CellWriter).GetMethod(nameof(AppendWarningsPlain))!;
        return Appender(type);
    }

    public static void AppendPlain(System.Text.StringBuilder cell, string? value) => cell.Append(value);

    /// <summary>Warning codes for a plain-text answer: separated by commas (a CSV cell separates them by spaces).</summary>
    public static void AppendWarningsPlain(System.Text.StringBuilder cell, IEnumerable<Contracts.WarningDto>? warnings) => AppendCodes(cell, warnings, ',');

    public static void Append(System.Text.StringBuilder cell, double value) => cell.Append(Invariant, $"{value:R}");

    public static void Append(System.Text.StringBuilder cell, double? value)
    {
        if (value is { } v) cell.Append(Invariant, $"{v:R}");
    }

    public static void Append(System.Text.StringBuilder cell, bool value) => cell.Append(value ? "TRUE" : "FALSE");

    public static void Append(System.Text.StringBuilder cell, bool? value)
    {
        if (value is { } v) Append(cell, v);
    }

    public static void Append(System.Text.StringBuilder cell, int value) => cell.Append(Invariant, $"{value}");

    public static void Append(System.Text.StringBuilder cell, string? value)
    {
        if (value is not null) cell.Append(Batch.Csv.Escape(value));
    }

    public static void AppendWarnings(System.Text.StringBuilder cell, IEnumerable<Contracts.WarningDto>? warnings) => AppendCodes(cell, warnings, ' ');

    private static void AppendCodes(System.Text.StringBuilder cell, IEnumerable<Contracts.WarningDto>? warnings, char separator)
    {
        if (warnings is null) return;
        bool first = true;
        foreach (var w in warnings)
        {
            if (!first) cell.Append(separator);
            cell.Append(w.Code);
            first = false;
        }
    }

    public static void AppendNullable<T>(System.Text.StringBuilder cell, T? value) where T : struct
    {
        if (value is { } v) AppendObject(cell, v);
    }

    public static void AppendObject<T>(System.Text.StringBuilder cell, T value)
    {
        string text = value switch
        {
            null => "",
            IFormattable f => f.ToString(null, Invariant),
            _ => value.ToString() ?? "",
        };
        Append(cell, text);
    }
}

/// <summary>Works out the flat column list of a response type (reflection once per calculation, at start-up).</summary>
internal static class ResponseColumns
{
    private static readonly System.Collections.Concurrent.ConcurrentDictionary<Type, IReadOnlyDictionary<string, ResponseColumn>> Named = new();

    /// <summary>The columns of a response type by wire name (case-insensitive), built once per type.</summary>
    public static IReadOnlyDictionary<string, ResponseColumn> ByName(Type type) =>
        Named.GetOrAdd(type, t => For(t).ToDictionary(c => c.Name, StringComparer.OrdinalIgnoreCase));

    public static IReadOnlyList<ResponseColumn> For(Type type)
    {
        var columns = new List<ResponseColumn>();
        Walk(type, "", [], columns, 0);
        return columns;
    }

    private static void Walk(Type type, string prefix, System.Reflection.PropertyInfo[] path, List<ResponseColumn> columns, int depth)
    {
        foreach (var p in type.GetProperties())
        {
            string name = prefix + JsonNamingPolicy.CamelCase.ConvertName(p.Name);
            var t = Nullable.GetUnderlyingType(p.PropertyType) ?? p.PropertyType;
            System.Reflection.PropertyInfo[] here = [.. path, p];
            // The sensitivities (a nested dictionary) and the roughness spread answer only sensitivities=true, which batches do
            // not take: they stay out of the CSV columns.
            if (name is "sensitivities" or "roughnessSpread") continue;
            if (t.IsPrimitive || t == typeof(string) || t == typeof(decimal)) columns.Add(new ResponseColumn(name, here));
            else if (name == "warnings") columns.Add(new ResponseColumn(name, here));
            else if (!typeof(System.Collections.IEnumerable).IsAssignableFrom(t) && t.IsClass && depth < 3) Walk(t, name + ".", here, columns, depth + 1);
        }
    }
}
