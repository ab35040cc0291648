using System.Collections.Concurrent;
using System.Globalization;
using System.Linq.Expressions;
using System.Reflection;
using System.Text.Json;
using System.Text.Json.Serialization;
using System.Text.Json.Serialization.Metadata;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Batch;

/// <summary>
/// Binds a CSV row straight into a calculation's request record, without writing the row as JSON and binding that: the
/// record's fields are read from the API's own JSON contract for the type (wire names, constructor, defaults), and its
/// constructor is compiled once per type.
/// </summary>
/// <remarks>
/// The binder takes only what it can read exactly as the JSON path reads it: a flat header of the record's number,
/// whole-number, true/false and text fields, and cells that are clean for their kind (a number in the invariant grammar
/// and finite; a whole number that fits; true or false; text that is neither a number nor true/false, which the JSON
/// path would write as a number or a boolean and then refuse). Any other header leaves the whole batch to the JSON path
/// (<see cref="Plan"/> answers null); any other cell leaves that row to it (<see cref="RowPlan.TryBind"/> answers
/// false), so a refused row is refused by the same code, in the same words, as before. A clean cell's number is the one
/// the JSON path reads: both parse the same text with correct rounding (or the JSON path writes the parsed value in its
/// shortest round-trip form, which reads back to the same double).
/// </remarks>
public sealed class CsvRowBinder
{
    public enum Kind { Number, Integer, Flag, Text }

    private sealed record Field(int Position, Kind Kind);

    private static readonly ConcurrentDictionary<Type, CsvRowBinder?> Binders = new();

    private readonly Dictionary<string, Field> _fields;
    private readonly Func<RowValues, object> _create;

    private CsvRowBinder(Dictionary<string, Field> fields, int arity, Func<RowValues, object> create) =>
        (_fields, Arity, _create) = (fields, arity, create);

    /// <summary>Number of constructor parameters (the length of a <see cref="RowValues"/> for this type).</summary>
    public int Arity { get; }

    /// <summary>The binder of a request type, or null when its contract is not one the binder reads exactly (a custom
    /// converter, required properties, a constructor the serializer would not use).</summary>
    public static CsvRowBinder? For(Type requestType) => Binders.GetOrAdd(requestType, Build);

    private static CsvRowBinder? Build(Type type)
    {
        var options = JsonSetup.Options;
        if (options.Converters.Any(c => c.CanConvert(type)) || type.GetCustomAttribute<JsonConverterAttribute>() is not null) return null;
        JsonTypeInfo info;
        try
        {
            info = options.GetTypeInfo(type);
        }
        catch (NotSupportedException)
        {
            return null;
        }
        if (info.Kind != JsonTypeInfoKind.Object) return null;
        var ctors = type.GetConstructors(BindingFlags.Public | BindingFlags.Instance);
        if (ctors.Length != 1 || info.ConstructorAttributeProvider is ConstructorInfo used && used != ctors[0]) return null;
        var parameters = ctors[0].GetParameters();

        var fields = new Dictionary<string, Field>(StringComparer.OrdinalIgnoreCase);
        foreach (var property in info.Properties)
        {
            if (property.IsRequired || property.IsExtensionData) return null;
            if (property.AttributeProvider is not PropertyInfo clr) continue;
            int position = Array.FindIndex(parameters, p => string.Equals(p.Name, clr.Name, StringComparison.OrdinalIgnoreCase));
            // A field the constructor does not take, or one with its own converter, stays with the JSON path.
            if (position < 0 || property.CustomConverter is not null) continue;
            var t = Nullable.GetUnderlyingType(property.PropertyType) ?? property.PropertyType;
            if (options.Converters.Any(c => c.CanConvert(t))) continue;
            Kind? kind = t == typeof(double) ? Kind.Number : t == typeof(int) ? Kind.Integer : t == typeof(bool) ? Kind.Flag
                : t == typeof(string) ? Kind.Text : null;
            if (kind is { } k && parameters[position].ParameterType == property.PropertyType) fields[property.Name] = new Field(position, k);
        }

        // new T(values.Present[0] ? (double?)values.Numbers[0] : <default of parameter 0>, ...), compiled once.
        var values = Expression.Parameter(typeof(RowValues), "values");
        var arguments = new Expression[parameters.Length];
        for (int i = 0; i < parameters.Length; i++)
        {
            var p = parameters[i];
            Expression fallback = Expression.Constant(p.HasDefaultValue ? p.DefaultValue : DefaultOf(p.ParameterType), p.ParameterType);
            var field = fields.Values.FirstOrDefault(f => f.Position == i);
            if (field is null)
            {
                arguments[i] = fallback;
                continue;
            }
            string array = field.Kind switch
            {
                Kind.Number => nameof(RowValues.Numbers),
                Kind.Integer => nameof(RowValues.Integers),
                Kind.Flag => nameof(RowValues.Flags),
                _ => nameof(RowValues.Texts),
            };
            var read = Expression.Convert(Expression.ArrayIndex(Expression.Property(values, array), Expression.Constant(i)), p.ParameterType);
            var present = Expression.ArrayIndex(Expression.Property(values, nameof(RowValues.Present)), Expression.Constant(i));
            arguments[i] = Expression.Condition(present, read, fallback);
        }
        var create = Expression.Lambda<Func<RowValues, object>>(Expression.Convert(Expression.New(ctors[0], arguments), typeof(object)), values).Compile();
        return new CsvRowBinder(fields, parameters.Length, create);
    }

    private static object? DefaultOf(Type type) => type.IsValueType ? Activator.CreateInstance(type) : null;

    /// <summary>The binding of one batch's header, or null when a column is not a field the binder reads (a dotted name,
    /// an unknown name, a field of another kind): the batch then takes the JSON path.</summary>
    public RowPlan? Plan(IReadOnlyList<string> header)
    {
        var columns = new (int Position, Kind Kind)[header.Count];
        for (int c = 0; c < header.Count; c++)
        {
            if (header[c].Length == 0) { columns[c] = (-1, Kind.Text); continue; }
            if (!_fields.TryGetValue(header[c], out var field)) return null;
            columns[c] = (field.Position, field.Kind);
        }
        return new RowPlan(this, columns);
    }

    /// <summary>One batch's header bound to the request's constructor.</summary>
    public sealed class RowPlan(CsvRowBinder binder, (int Position, Kind Kind)[] columns)
    {
        /// <summary>A fresh set of values for one worker (not shared between threads).</summary>
        public RowValues NewValues() => new(binder.Arity, columns.Length);

        /// <summary>Binds one row (ASCII bytes without quotes or line breaks) into a request, or answers false when a cell
        /// is not clean for its field (the row then takes the JSON path).</summary>
        public bool TryBind(ReadOnlySpan<byte> line, RowValues values, out object? request)
        {
            request = null;
            values.Clear();
            Span<char> text = stackalloc char[128];
            int c = 0;
            while (c < columns.Length)
            {
                int comma = line.IndexOf((byte)',');
                var raw = comma < 0 ? line : line[..comma];
                var (position, kind) = columns[c];
                if (position >= 0 && kind == Kind.Number && values.Repeats(c, raw, out double repeated))
                {
                    // The same cell as this column's last number: the same value, read once.
                    values.Numbers[position] = repeated;
                    values.Present[position] = true;
                }
                else if (position >= 0)
                {
                    if (raw.Length > text.Length) return false;
                    for (int k = 0; k < raw.Length; k++) text[k] = (char)raw[k];
                    var cell = text[..raw.Length].Trim();
                    if (cell.Length > 0 && !Read(cell, kind, position, values)) return false;
                    if (cell.Length > 0 && kind == Kind.Number) values.Remember(c, raw, values.Numbers[position]);
                }
                if (comma < 0) break;
                line = line[(comma + 1)..];
                c++;
            }
            request = binder._create(values);
            return true;
        }

        private static bool Read(ReadOnlySpan<char> cell, Kind kind, int position, RowValues values)
        {
            bool number = StrictQuery.IsInvariantNumber(cell);
            double d = 0;
            bool parsed = number && double.TryParse(cell, NumberStyles.Float, CultureInfo.InvariantCulture, out d) && double.IsFinite(d);
            switch (kind)
            {
                case Kind.Number:
                    if (!parsed) return false;
                    values.Numbers[position] = d;
                    break;
                case Kind.Integer:
                    if (!parsed || d != Math.Floor(d) || d < int.MinValue || d > int.MaxValue) return false;
                    values.Integers[position] = (int)d;
                    break;
                case Kind.Flag:
                    if (cell.Equals("true", StringComparison.OrdinalIgnoreCase)) values.Flags[position] = true;
                    else if (cell.Equals("false", StringComparison.OrdinalIgnoreCase)) values.Flags[position] = false;
                    else return false;
                    break;
                default:
                    // The JSON path writes anything the parser reads as a finite number, and true/false, as JSON numbers
                    // and booleans, which a text field refuses: such cells go that way to be refused in its words.
                    if (double.TryParse(cell, NumberStyles.Float, CultureInfo.InvariantCulture, out double any) && double.IsFinite(any)) return false;
                    if (cell.Equals("true", StringComparison.OrdinalIgnoreCase) || cell.Equals("false", StringComparison.OrdinalIgnoreCase)) return false;
                    values.Texts[position] = cell.ToString();
                    break;
            }
            values.Present[position] = true;
            return true;
        }
    }

    /// <summary>The cells of one row by constructor position, one array per kind; and, by column, the last number cell
    /// read (its bytes and value), since a batch's columns often repeat a value row after row.</summary>
    public sealed class RowValues(int arity, int columns = 0)
    {
        /// <summary>Longest cell remembered (the binder reads cells of up to 128 characters).</summary>
        private const int CellRoom = 128;

        private readonly byte[] _lastCell = new byte[columns * CellRoom];
        private readonly int[] _lastLength = new int[columns];
        private readonly double[] _lastValue = new double[columns];

        /// <summary>True, with its value, when the cell's bytes are those of the column's last number cell read.</summary>
        public bool Repeats(int column, ReadOnlySpan<byte> cell, out double value)
        {
            value = 0;
            if (column >= _lastLength.Length || _lastLength[column] == 0 || _lastLength[column] != cell.Length) return false;
            if (!cell.SequenceEqual(_lastCell.AsSpan(column * CellRoom, cell.Length))) return false;
            value = _lastValue[column];
            return true;
        }

        /// <summary>Remembers a number cell read cleanly, as its bytes and value.</summary>
        public void Remember(int column, ReadOnlySpan<byte> cell, double value)
        {
            if (column >= _lastLength.Length || cell.Length > CellRoom) return;
            cell.CopyTo(_lastCell.AsSpan(column * CellRoom));
            _lastLength[column] = cell.Length;
            _lastValue[column] = value;
        }

        public bool[] Present { get; } = new bool[arity];
        public double[] Numbers { get; } = new double[arity];
        public int[] Integers { get; } = new int[arity];
        public bool[] Flags { get; } = new bool[arity];
        public string?[] Texts { get; } = new string?[arity];

        public void Clear()
        {
            Array.Clear(Present);
            Array.Clear(Texts);
        }
    }
}
