using System.Collections.Concurrent;
using System.Globalization;
using System.Linq.Expressions;
using System.Reflection;
using System.Text;
using System.Text.Json;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Batch;

/// <summary>
/// A batch's answer lines as UTF-8, written straight into a pooled buffer that grows as needed: numbers are formatted
/// into the bytes with the same round-trip formatting the text cells use (<c>R</c>, invariant culture), so no string or
/// builder stands between a value and its cell.
/// </summary>
public sealed class Utf8Lines
{
    /// <summary>The longest "R" form of a double (-2.2250738585072014E-308 is 24 bytes), with room to spare.</summary>
    private const int NumberRoom = 32;

    public byte[] Buffer = [];
    public int Length;

    /// <summary>Scratch for the rare cell or row written as text first (an error row, a column of another kind).</summary>
    public StringBuilder Scratch { get; } = new(256);

    /// <summary>The written bytes.</summary>
    public ReadOnlyMemory<byte> Written => Buffer.AsMemory(0, Length);

    /// <summary>Room for at least <paramref name="bytes"/> more bytes.</summary>
    public Span<byte> Room(int bytes)
    {
        if (Buffer.Length - Length < bytes)
        {
            var larger = System.Buffers.ArrayPool<byte>.Shared.Rent((int)Math.Min(Array.MaxLength,
                Math.Max(2L * Buffer.Length, (long)Length + bytes + 65_536)));
            Buffer.AsSpan(0, Length).CopyTo(larger);
            if (Buffer.Length > 0) System.Buffers.ArrayPool<byte>.Shared.Return(Buffer);
            Buffer = larger;
        }
        return Buffer.AsSpan(Length);
    }

    public void Byte(byte b)
    {
        if (Length == Buffer.Length) Room(1);
        Buffer[Length++] = b;
    }

    public void LineEnd()
    {
        Room(2);
        Buffer[Length++] = (byte)'\r';
        Buffer[Length++] = (byte)'\n';
    }

    /// <summary>Recently written numbers by their bits (a small direct-mapped table): a batch's rows repeat many values
    /// (the echoed fluid and roughness, a head loss that is also the total head), and copying the bytes of a value
    /// already formatted costs a fraction of formatting it again. The bytes are those the formatting gave for the same
    /// bits, so the cell is the same either way.</summary>
    private const int RecentSlots = 64;

    private readonly long[] _recentBits = new long[RecentSlots];
    private readonly byte[] _recentLength = new byte[RecentSlots];
    private readonly byte[] _recentText = new byte[RecentSlots * NumberRoom];

    public void Number(double value)
    {
        long bits = BitConverter.DoubleToInt64Bits(value);
        int slot = (int)((ulong)(bits * unchecked((long)0x9E3779B97F4A7C15)) >> 58);
        var room = Room(NumberRoom);
        int length = _recentLength[slot];
        if (length > 0 && _recentBits[slot] == bits)
        {
            _recentText.AsSpan(slot * NumberRoom, length).CopyTo(room);
            Length += length;
            return;
        }
        // Same formatting code as the text cell's $"{value:R}", writing bytes instead of chars.
        if (!value.TryFormat(room, out int written, "R", CultureInfo.InvariantCulture))
            throw new InvalidOperationException("a double's round-trip form exceeded its room");
        room[..written].CopyTo(_recentText.AsSpan(slot * NumberRoom));
        _recentBits[slot] = bits;
        _recentLength[slot] = (byte)written;
        Length += written;
    }

    public void Number(int value)
    {
        if (!value.TryFormat(Room(NumberRoom), out int written, default, CultureInfo.InvariantCulture))
            throw new InvalidOperationException("an integer's form exceeded its room");
        Length += written;
    }

    /// <summary>Text as UTF-8, unquoted.</summary>
    public void Raw(string text) => Raw(text.AsSpan());

    public void Raw(ReadOnlySpan<char> text)
    {
        if (text.IsEmpty) return;
        Length += Encoding.UTF8.GetBytes(text, Room(Encoding.UTF8.GetMaxByteCount(text.Length)));
    }

    /// <summary>Text as a CSV cell: quoted when it holds a comma, quote or line break (<see cref="Csv.Escape"/>).</summary>
    public void Cell(string? text)
    {
        if (text is null) return;
        if (text.AsSpan().IndexOfAny(",\"\r\n") < 0) Raw(text);
        else Raw(Csv.Escape(text));
    }

    /// <summary>A builder's text as UTF-8.</summary>
    public void Raw(StringBuilder text)
    {
        foreach (var chunk in text.GetChunks()) Raw(chunk.Span);
    }

    public void Release()
    {
        if (Buffer.Length > 0) System.Buffers.ArrayPool<byte>.Shared.Return(Buffer);
        Buffer = [];
        Length = 0;
    }
}

/// <summary>
/// Writes a response column's cell straight into <see cref="Utf8Lines"/>, with the same text as
/// <see cref="ResponseColumn.Write"/> byte for byte: numbers in their shortest round-trip form, TRUE/FALSE, text quoted
/// as CSV needs it, warnings as their codes separated by spaces, nothing for a missing value. The column's property path
/// is found from its dotted wire name, as the response's columns were named; a column of any other kind, or one whose
/// name does not lead to a property, is written by the column's own writer and encoded.
/// </summary>
public static class Utf8Cells
{
    private static readonly ConcurrentDictionary<(Type, string), Action<object, Utf8Lines>?> Compiled = new();

    /// <summary>One writer per column, in the columns' order.</summary>
    public static Action<object, Utf8Lines>[] For(Type responseType, IReadOnlyList<ResponseColumn> columns) =>
        columns.Select(c => Compiled.GetOrAdd((responseType, c.Name), static key => Compile(key.Item1, key.Item2)) ?? Fallback(c)).ToArray();

    /// <summary>The column written as text by its own writer, then encoded.</summary>
    private static Action<object, Utf8Lines> Fallback(ResponseColumn column) => (response, lines) =>
    {
        var text = lines.Scratch.Clear();
        column.Write(response, text);
        lines.Raw(text);
    };

    private static Action<object, Utf8Lines>? Compile(Type responseType, string name)
    {
        var path = PathOf(responseType, name);
        if (path is null || Writer(path[^1].PropertyType) is not { } leafWriter) return null;
        return CellWriter.CompilePath<Utf8Lines>(path, _ => leafWriter);
    }

    /// <summary>The properties a dotted camel-case column name reads, as the response's columns were named; null when a
    /// part names no property.</summary>
    private static PropertyInfo[]? PathOf(Type type, string name)
    {
        var path = new List<PropertyInfo>();
        Type current = type;
        foreach (var part in name.Split('.'))
        {
            var property = current.GetProperties().FirstOrDefault(p => JsonNamingPolicy.CamelCase.ConvertName(p.Name) == part);
            if (property is null) return null;
            path.Add(property);
            current = Nullable.GetUnderlyingType(property.PropertyType) ?? property.PropertyType;
        }
        return [.. path];
    }

    /// <summary>The writer for a leaf of this exact type, or null for a kind left to the column's own writer.</summary>
    private static MethodInfo? Writer(Type type)
    {
        string? method = type == typeof(double) ? nameof(WriteDouble)
            : type == typeof(double?) ? nameof(WriteNullableDouble)
            : type == typeof(int) ? nameof(WriteInt)
            : type == typeof(bool) ? nameof(WriteBool)
            : type == typeof(bool?) ? nameof(WriteNullableBool)
            : type == typeof(string) ? nameof(WriteString)
            : typeof(IEnumerable<WarningDto>).IsAssignableFrom(type) ? nameof(WriteWarnings)
            : null;
        return method is null ? null : typeof(Utf8Cells).GetMethod(method, BindingFlags.NonPublic | BindingFlags.Static);
    }

    private static void WriteDouble(Utf8Lines lines, double value) => lines.Number(value);

    private static void WriteNullableDouble(Utf8Lines lines, double? value)
    {
        if (value is { } v) lines.Number(v);
    }

    private static void WriteInt(Utf8Lines lines, int value) => lines.Number(value);

    private static void WriteBool(Utf8Lines lines, bool value) => lines.Raw(value ? "TRUE" : "FALSE");

    private static void WriteNullableBool(Utf8Lines lines, bool? value)
    {
        if (value is { } v) WriteBool(lines, v);
    }

    private static void WriteString(Utf8Lines lines, string? value) => lines.Cell(value);

    private static void WriteWarnings(Utf8Lines lines, IEnumerable<WarningDto>? warnings)
    {
        if (warnings is null) return;
        if (warnings is IReadOnlyList<WarningDto> list)
        {
            for (int i = 0; i < list.Count; i++)
            {
                if (i > 0) lines.Byte((byte)' ');
                lines.Raw(list[i].Code);
            }
            return;
        }
        bool first = true;
        foreach (var w in warnings)
        {
            if (!first) lines.Byte((byte)' ');
            lines.Raw(w.Code);
            first = false;
        }
    }
}
