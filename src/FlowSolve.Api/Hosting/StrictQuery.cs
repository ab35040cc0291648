using System.Collections.Concurrent;
using System.Reflection;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// The query string of every <c>/v1</c> route understood exactly or refused, before any binding: each parameter must
/// be one the route takes (an unknown one answers 400 naming it, with the closest known name), given once (a repeat
/// answers 400), with a value; numbers in the invariant grammar only (digits, one point, an optional exponent), so a
/// decimal comma, a thousands separator or a space answers 400 with how to make a spreadsheet write a point. On a
/// route that takes a JSON body the query carries output options only; a calculation input there answers 400 saying
/// it belongs in the body.
/// </summary>
/// <remarks>
/// ASP.NET Core's binder joins a repeated value with a comma and parses numbers with thousands separators allowed, so
/// <c>flow=0,12</c> would be read as 12 and <c>reynolds=75000&amp;reynolds=8000</c> as 750008000, and it ignores a
/// parameter it does not know. The rules are derived once per endpoint from its handler's parameters (the
/// <c>[FromQuery]</c> names of the request record, the handler's own query options), so a new calculation is covered
/// without listing anything.
/// </remarks>
public sealed class StrictQuery(RequestDelegate next)
{
    private static readonly ConcurrentDictionary<Endpoint, QueryContract> Contracts = new();

    public Task InvokeAsync(HttpContext context)
    {
        if (!context.Request.Path.StartsWithSegments("/v1") || context.GetEndpoint() is not { } endpoint) return next(context);
        // Only a calculation's own methods are held to its query rules: an OPTIONS or HEAD (which a spreadsheet's web
        // function sends before its GET) meets the routing's 405, not a 400 about the query it carries.
        if (!HttpMethods.IsGet(context.Request.Method) && !HttpMethods.IsPost(context.Request.Method)) return next(context);
        var query = context.Request.Query;
        if (query.Count == 0) return next(context);
        var contract = Contracts.GetOrAdd(endpoint, QueryContract.For);
        if (contract.Check(query) is not { } error) return next(context);
        return Refuse(context, error.Field, error.Message);
    }

    private static Task Refuse(HttpContext context, string field, string message)
    {
        context.Response.StatusCode = StatusCodes.Status400BadRequest;
        if (string.Equals(context.Request.Query["format"].FirstOrDefault(), "text", StringComparison.OrdinalIgnoreCase)
            && context.Request.Query["format"].Count == 1)
        {
            // A spreadsheet cell shows the body as it is: one short line, the right status.
            context.Response.ContentType = "text/plain; charset=utf-8";
            return context.Response.WriteAsync($"error: {field}: {message}");
        }
        var problems = context.RequestServices.GetRequiredService<IProblemDetailsService>();
        var details = new HttpValidationProblemDetails(new Dictionary<string, string[]> { [field] = [message] })
        {
            Status = 400,
            Title = "One or more query parameters are invalid.",
            Detail = "See errors: each key is a query parameter, each value says what is wrong with it.",
            Type = "https://flowsolve.example/problems/invalid-input",
        };
        return problems.WriteAsync(new ProblemDetailsContext { HttpContext = context, ProblemDetails = details }).AsTask();
    }

    /// <summary>The spreadsheet hint of every number-grammar message.</summary>
    public const string PointHint =
        "use a point as the decimal separator and no thousands separators or spaces, for example 0.12 or 1.5e5; in a spreadsheet " +
        "whose locale writes a decimal comma, build the URL with SUBSTITUTE(A2;\",\";\".\") around each number (and ENCODEURL " +
        "for exponents such as 1E+20, whose '+' a URL would read as a space)";

    /// <summary>Why a query value is not a number in the invariant grammar, or null when it is one.</summary>
    public static string? NumberProblem(ReadOnlySpan<char> text)
    {
        if (IsInvariantNumber(text)) return null;
        if (text.IndexOf(',') >= 0) return $"'{Clip(text)}' holds a comma: {PointHint}";
        if (text.IndexOfAny(' ', '\u00A0', '\u202F') >= 0 || text.IndexOf('\'') >= 0 || text.IndexOf('_') >= 0)
            return $"'{Clip(text)}' holds a space or separator: {PointHint}";
        if (text.Count('.') > 1) return $"'{Clip(text)}' has more than one point: {PointHint}";
        return $"'{Clip(text)}' is not a number: expected digits with at most one decimal point and an optional exponent (e.g. 0.12, 1.5e5)";
    }

    /// <summary>[+-] digits [. digits] [e [+-] digits], with digits on at least one side of the point.</summary>
    public static bool IsInvariantNumber(ReadOnlySpan<char> s)
    {
        int i = 0, n = s.Length;
        if (i < n && (s[i] == '+' || s[i] == '-')) i++;
        int digits = 0;
        while (i < n && char.IsAsciiDigit(s[i])) { i++; digits++; }
        if (i < n && s[i] == '.')
        {
            i++;
            while (i < n && char.IsAsciiDigit(s[i])) { i++; digits++; }
        }
        if (digits == 0) return false;
        if (i < n && (s[i] == 'e' || s[i] == 'E'))
        {
            i++;
            if (i < n && (s[i] == '+' || s[i] == '-')) i++;
            int exponent = 0;
            while (i < n && char.IsAsciiDigit(s[i])) { i++; exponent++; }
            if (exponent == 0) return false;
        }
        return i == n;
    }

    private static string Clip(ReadOnlySpan<char> text) => text.Length > 40 ? text[..40].ToString() + "..." : text.ToString();

    /// <summary>The closest of <paramref name="known"/> to a misspelt name, or null when none is near (optimal string
    /// alignment distance at most 2, or a third of the name's length, case-insensitive).</summary>
    public static string? Closest(string name, IEnumerable<string> known)
    {
        string? best = null;
        int bestDistance = int.MaxValue;
        string lower = name.ToLowerInvariant();
        foreach (var k in known)
        {
            int d = Distance(lower, k.ToLowerInvariant());
            // A name that contains the other (unit for units, minorLoss for minorLossCoefficient) is near too.
            if (d > 2 && k.Length >= 4 && lower.Length >= 4
                && (k.Contains(lower, StringComparison.OrdinalIgnoreCase) || lower.Contains(k, StringComparison.OrdinalIgnoreCase)))
                d = 2;
            if (d < bestDistance) (best, bestDistance) = (k, d);
        }
        return bestDistance <= Math.Max(2, name.Length / 3) ? best : null;
    }

    private static int Distance(string a, string b)
    {
        var d = new int[a.Length + 1, b.Length + 1];
        for (int i = 0; i <= a.Length; i++) d[i, 0] = i;
        for (int j = 0; j <= b.Length; j++) d[0, j] = j;
        for (int i = 1; i <= a.Length; i++)
        for (int j = 1; j <= b.Length; j++)
        {
            int cost = a[i - 1] == b[j - 1] ? 0 : 1;
            d[i, j] = Math.Min(Math.Min(d[i - 1, j] + 1, d[i, j - 1] + 1), d[i - 1, j - 1] + cost);
            if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) d[i, j] = Math.Min(d[i, j], d[i - 2, j - 2] + 1);
        }
        return d[a.Length, b.Length];
    }
}

/// <summary>What one endpoint takes in its query: each name with its kind, and the body's field names if it has one.</summary>
public sealed class QueryContract
{
    private enum Kind { Text, Number, Boolean }

    private readonly Dictionary<string, Kind> _query = new(StringComparer.OrdinalIgnoreCase);
    private readonly HashSet<string> _body = new(StringComparer.OrdinalIgnoreCase);

    /// <summary>The names this endpoint takes in its query.</summary>
    public IEnumerable<string> QueryNames => _query.Keys;

    public static QueryContract For(Endpoint endpoint)
    {
        var contract = new QueryContract();
        var method = endpoint.Metadata.GetMetadata<MethodInfo>();
        var routeNames = (endpoint as RouteEndpoint)?.RoutePattern.Parameters.Select(p => p.Name).ToHashSet(StringComparer.OrdinalIgnoreCase) ?? [];
        var calculation = endpoint.Metadata.GetMetadata<CalculationMetadata>();
        if (method is not null)
        {
            foreach (var p in method.GetParameters()) contract.AddParameter(p, routeNames);
        }
        if (calculation is not null)
        {
            foreach (var option in calculation.Options)
                contract._query.TryAdd(option.Name, option.Kind == QueryOptionKind.Boolean ? Kind.Boolean : Kind.Number);
            contract._query.TryAdd("format", Kind.Text);
            contract._query.TryAdd("select", Kind.Text);
            contract._query.TryAdd("strict", Kind.Boolean);
            // trace is a request field; on a body route it is also taken as an output option in the query.
            if (contract._body.Contains("trace")) contract._query.TryAdd("trace", Kind.Boolean);
        }
        return contract;
    }

    private void AddParameter(ParameterInfo p, HashSet<string> routeNames)
    {
        var fromQuery = p.GetCustomAttribute<FromQueryAttribute>();
        if (p.GetCustomAttribute<AsParametersAttribute>() is not null)
        {
            var ctor = p.ParameterType.GetConstructors().OrderByDescending(c => c.GetParameters().Length).FirstOrDefault();
            foreach (var cp in ctor?.GetParameters() ?? [])
            {
                var property = p.ParameterType.GetProperty(cp.Name!, BindingFlags.Public | BindingFlags.Instance | BindingFlags.IgnoreCase);
                var attribute = cp.GetCustomAttribute<FromQueryAttribute>() ?? property?.GetCustomAttribute<FromQueryAttribute>();
                if (cp.GetCustomAttribute<FromRouteAttribute>() is not null || cp.GetCustomAttribute<FromServicesAttribute>() is not null) continue;
                if (attribute is null && (!IsSimple(cp.ParameterType) || routeNames.Contains(cp.Name!))) continue;
                _query[attribute?.Name ?? cp.Name!] = KindOf(cp.ParameterType);
            }
            return;
        }
        if (fromQuery is not null)
        {
            _query[fromQuery.Name ?? p.Name!] = KindOf(p.ParameterType);
            return;
        }
        if (p.GetCustomAttribute<FromRouteAttribute>() is not null || p.GetCustomAttribute<FromServicesAttribute>() is not null) return;
        if (p.GetCustomAttribute<FromBodyAttribute>() is not null)
        {
            AddBody(p.ParameterType);
            return;
        }
        if (IsSimple(p.ParameterType))
        {
            if (!routeNames.Contains(p.Name!)) _query[p.Name!] = KindOf(p.ParameterType);
            return;
        }
        // A record without attributes is the JSON body of a POST.
        if (p.ParameterType.IsClass && p.ParameterType.Namespace?.StartsWith("FlowSolve", StringComparison.Ordinal) == true)
            AddBody(p.ParameterType);
    }

    private void AddBody(Type type)
    {
        foreach (var property in type.GetProperties(BindingFlags.Public | BindingFlags.Instance))
            _body.Add(System.Text.Json.JsonNamingPolicy.CamelCase.ConvertName(property.Name));
    }

    private static bool IsSimple(Type t)
    {
        t = Nullable.GetUnderlyingType(t) ?? t;
        return t.IsPrimitive || t == typeof(string) || t == typeof(decimal) || t.IsEnum;
    }

    private static Kind KindOf(Type t)
    {
        t = Nullable.GetUnderlyingType(t) ?? t;
        if (t == typeof(bool)) return Kind.Boolean;
        if (t == typeof(double) || t == typeof(float) || t == typeof(decimal) || t == typeof(int) || t == typeof(long)) return Kind.Number;
        return Kind.Text;
    }

    /// <summary>The first rule the query breaks, as (parameter, message), or null when it keeps them all.</summary>
    public (string Field, string Message)? Check(IQueryCollection query)
    {
        foreach (var (name, values) in query)
        {
            if (!_query.TryGetValue(name, out var kind))
            {
                if (_body.Contains(name))
                    return (name, $"is an input of this calculation: on a POST every input, units included, belongs in the JSON body; the query carries only output options ({string.Join(", ", _query.Keys)})");
                string? near = StrictQuery.Closest(name, _query.Keys.Concat(_body));
                string known = _query.Count == 0 ? "this route takes no query parameters" : "the query parameters of this route are: " + string.Join(", ", _query.Keys);
                return (name, near is null
                    ? $"is not a parameter of this route ({known})"
                    : _body.Contains(near) && !_query.ContainsKey(near)
                        ? $"is not a parameter of this route: did you mean '{near}'? (it belongs in the JSON body on a POST)"
                        : $"is not a parameter of this route: did you mean '{near}'? ({known})");
            }
            if (values.Count > 1) return (name, $"is given {values.Count} times; give each parameter once");
            string value = values[0] ?? "";
            if (value.Length == 0) return (name, "has no value; give a value or leave the parameter out");
            switch (kind)
            {
                case Kind.Number when StrictQuery.NumberProblem(value) is { } problem:
                    return (name, problem);
                case Kind.Boolean when !value.Equals("true", StringComparison.OrdinalIgnoreCase) && !value.Equals("false", StringComparison.OrdinalIgnoreCase):
                    return (name, $"'{(value.Length > 40 ? value[..40] + "..." : value)}' is not true or false");
            }
        }
        return null;
    }
}
