using System.Collections;
using System.Collections.Concurrent;
using System.Linq.Expressions;
using System.Reflection;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Problems;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// The one place every calculation's answer passes before it is written, whichever way it was asked for (JSON, text,
/// sheet, batch row, check): a number that is not finite never leaves the service (422 naming the field), an argument
/// the Core refuses becomes a 422 saying the inputs are outside what the calculation can evaluate, and with
/// <c>strict=true</c> an answer that carries a warning becomes a 422 naming the codes.
/// </summary>
public static class CalculationGuard
{
    private static readonly Assembly CoreAssembly = typeof(Core.Numerics.SafeguardedNewton).Assembly;

    /// <summary>The answer to send for a handler's result: the result itself, or a 422 when a number in it is not
    /// finite, or (with <paramref name="strict"/>) when it carries warnings.</summary>
    public static IResult Review(string calculation, IResult result, bool strict)
    {
        var (status, value) = result.Unwrap();
        if (status is < 200 or >= 300 || value is null) return result;
        return Review(calculation, value, strict) ?? result;
    }

    /// <summary>The problem that stands instead of an answer (a non-finite number, or warnings with
    /// <paramref name="strict"/>), or null when the answer may be sent.</summary>
    public static IResult? Review(string calculation, object value, bool strict)
    {
        if (Finite.FirstNonFinite(value) is { } field)
        {
            return ProblemResults.NoAnswer("The answer is not representable.",
                $"{calculation} produced a value of {field} that is not a finite number at these inputs: they lie outside what the " +
                "calculation can evaluate in double precision. Check the magnitudes of the inputs and their units.",
                new Dictionary<string, object?> { ["field"] = field });
        }
        if (strict && value is IWarned warned)
        {
            var codes = warned.WarningCodes().Distinct(StringComparer.Ordinal).ToArray();
            if (codes.Length > 0)
            {
                return ProblemResults.NoAnswer("The answer carries warnings (strict=true).",
                    "strict: the answer carries warnings: " + string.Join(",", codes),
                    new Dictionary<string, object?> { ["warnings"] = codes });
            }
        }
        return null;
    }

    /// <summary>A 422 for an exception the Core raises on arguments it cannot evaluate (a guard clause, an overflow),
    /// by rule rather than per handler; null for any other exception, which stays a defect (500).</summary>
    public static IResult? FromException(string calculation, Exception e)
    {
        if (e is not (ArgumentException or ArithmeticException)) return null;
        if (e.TargetSite?.DeclaringType?.Assembly != CoreAssembly && !(e.StackTrace ?? "").Contains("FlowSolve.Core.", StringComparison.Ordinal))
            return null;
        var extensions = new Dictionary<string, object?>();
        if (e is ArgumentException { ParamName: { } name }) extensions["parameter"] = name;
        return ProblemResults.NoAnswer("The inputs are outside what the calculation can evaluate.",
            $"{calculation} cannot be evaluated at these inputs: an intermediate value is out of the range the calculation accepts " +
            "(for example a coefficient or size so large that a derived quantity overflows). Check the magnitudes of the inputs and their units.",
            extensions);
    }

    /// <summary>Finds the first number in an answer that is NaN or infinite, by a checker compiled once per type.</summary>
    public static class Finite
    {
        private static readonly ConcurrentDictionary<Type, Func<object, string?>> Checkers = new();

        /// <summary>The dotted path of the first non-finite number, or null when every number is finite.</summary>
        public static string? FirstNonFinite(object? value) =>
            value is null ? null : Checkers.GetOrAdd(value.GetType(), Build)(value);

        private static Func<object, string?> Build(Type type)
        {
            if (type == typeof(double)) return o => double.IsFinite((double)o) ? null : "";
            if (type.IsPrimitive || type == typeof(string) || type == typeof(decimal) || type.IsEnum || !MayHoldNumbers(type, 0))
                return _ => null;
            if (typeof(IEnumerable).IsAssignableFrom(type)) return o => Items((IEnumerable)o);

            var input = Expression.Parameter(typeof(object), "o");
            var typed = Expression.Variable(type, "x");
            var found = Expression.Variable(typeof(string), "found");
            var end = Expression.Label(typeof(string), "end");
            var body = new List<Expression> { Expression.Assign(typed, Expression.Convert(input, type)) };
            foreach (var p in type.GetProperties(BindingFlags.Public | BindingFlags.Instance))
            {
                if (p.GetIndexParameters().Length > 0 || !p.CanRead) continue;
                string name = System.Text.Json.JsonNamingPolicy.CamelCase.ConvertName(p.Name);
                var read = Expression.Property(typed, p);
                var t = p.PropertyType;
                if (t == typeof(double))
                {
                    body.Add(Expression.IfThen(Expression.Not(Expression.Call(typeof(double), nameof(double.IsFinite), null, read)),
                        Expression.Return(end, Expression.Constant(name))));
                }
                else if (t == typeof(double?))
                {
                    body.Add(Expression.IfThen(Expression.Not(Expression.Call(typeof(Finite), nameof(IsFiniteOrNull), null, read)),
                        Expression.Return(end, Expression.Constant(name))));
                }
                else if (!t.IsPrimitive && t != typeof(string) && !t.IsEnum && MayHoldNumbers(t, 0))
                {
                    body.Add(Expression.Assign(found, Expression.Call(typeof(Finite), nameof(Nested), null,
                        Expression.Convert(read, typeof(object)), Expression.Constant(name))));
                    body.Add(Expression.IfThen(Expression.NotEqual(found, Expression.Constant(null, typeof(string))), Expression.Return(end, found)));
                }
            }
            body.Add(Expression.Label(end, Expression.Constant(null, typeof(string))));
            return Expression.Lambda<Func<object, string?>>(Expression.Block([typed, found], body), input).Compile();
        }

        private static bool IsFiniteOrNull(double? value) => value is not double v || double.IsFinite(v);

        private static string? Nested(object? value, string name) =>
            FirstNonFinite(value) is { } inner ? (inner.Length == 0 || inner[0] is '[' or '.' ? name + inner : name + "." + inner) : null;

        private static string? Items(IEnumerable items)
        {
            if (items is IList list)
            {
                // A list (an answer's validity checks, say) by index, without an enumerator object, and with the checker of
                // the items' type looked up once for a run of items of one type rather than once per item.
                Type? lastType = null;
                Func<object, string?>? checker = null;
                for (int k = 0; k < list.Count; k++)
                {
                    if (list[k] is not { } item) continue;
                    var type = item.GetType();
                    if (type != lastType) (lastType, checker) = (type, Checkers.GetOrAdd(type, Build));
                    if (checker!(item) is { } inner) return Where(item, k, inner);
                }
                return null;
            }
            int i = 0;
            foreach (var item in items)
            {
                if (FirstNonFinite(item) is { } inner) return Where(item!, i, inner);
                i++;
            }
            return null;
        }

        /// <summary>The path of a non-finite number found in the item at <paramref name="index"/> of a list (or the entry
        /// of a dictionary).</summary>
        private static string Where(object item, int index, string inner) =>
            item.GetType().IsGenericType && item.GetType().GetGenericTypeDefinition() == typeof(KeyValuePair<,>)
                ? "." + item.GetType().GetProperty("Key")!.GetValue(item) + (inner.StartsWith("value", StringComparison.Ordinal) ? inner[5..] : inner)
                : $"[{index}]" + (inner.Length == 0 || inner[0] is '[' or '.' ? inner : "." + inner);

        /// <summary>False for types that cannot hold a floating-point number (a warning, an assumption), so their
        /// lists are not walked at all.</summary>
        private static bool MayHoldNumbers(Type t, int depth)
        {
            if (t == typeof(double) || t == typeof(double?) || t == typeof(float) || t == typeof(object)) return true;
            if (t.IsPrimitive || t == typeof(string) || t.IsEnum || depth > 6) return false;
            if (t.IsArray) return MayHoldNumbers(t.GetElementType()!, depth + 1);
            if (t.IsGenericType && typeof(IEnumerable).IsAssignableFrom(t)) return t.GetGenericArguments().Any(a => MayHoldNumbers(a, depth + 1));
            if (typeof(IEnumerable).IsAssignableFrom(t))
            {
                // A sequence whose own type is not generic (a compiler-made iterator, say): by the item types of the
                // IEnumerable<T> it implements; one that implements none may hold anything.
                var itemTypes = t.GetInterfaces().Where(i => i.IsGenericType && i.GetGenericTypeDefinition() == typeof(IEnumerable<>))
                    .Select(i => i.GetGenericArguments()[0]).ToArray();
                return itemTypes.Length == 0 || itemTypes.Any(a => MayHoldNumbers(a, depth + 1));
            }
            if (t.IsGenericType && t.GetGenericTypeDefinition() == typeof(KeyValuePair<,>)) return MayHoldNumbers(t.GetGenericArguments()[1], depth + 1);
            if (t.IsInterface || t.IsAbstract) return true;
            return t.GetProperties(BindingFlags.Public | BindingFlags.Instance).Any(p => p.GetIndexParameters().Length == 0 && MayHoldNumbers(p.PropertyType, depth + 1));
        }
    }
}

/// <summary>An answer that carries warnings: the codes <c>select=warnings</c> and <c>strict=true</c> read.</summary>
public interface IWarned
{
    IReadOnlyList<WarningDto> Warnings { get; }

    /// <summary>Every warning code of the answer, in order (a network adds its load cases' element warnings).</summary>
    IEnumerable<string> WarningCodes() => Warnings.Select(w => w.Code);
}
