using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// JSON attributes as netCDF attributes: text stays text, numbers become int where every value is
/// a whole number that fits and double otherwise, lists of strings become string arrays. The
/// attributes CF compares with data values (_FillValue, missing_value, valid_min, valid_max,
/// valid_range) take the variable's own type, as netCDF requires, and may be spelled "NaN",
/// "Infinity" or "-Infinity" (JSON has no such numbers). Objects and nulls are skipped.
/// </summary>
internal static class ZarrAttributes
{
    static readonly HashSet<string> ValueTyped = ["_FillValue", "missing_value", "valid_min", "valid_max", "valid_range"];

    public static List<NcAttribute> From(JsonObject? json, NcType variableType, params string[] hidden)
    {
        var list = new List<NcAttribute>();
        if (json is null) return list;
        foreach (var (name, node) in json)
        {
            if (hidden.Contains(name) || node is null) continue;
            if (ValueTyped.Contains(name) && NcTypes.IsNumeric(variableType) && Numbers(node) is { } typed)
            {
                list.Add(new NcAttribute(name, variableType, Typed(variableType, typed)));
                continue;
            }
            if (Convert(name, node) is { } attribute) list.Add(attribute);
        }
        return list;
    }

    static NcAttribute? Convert(string name, JsonNode node)
    {
        if (node is JsonValue value)
        {
            if (value.TryGetValue<string>(out var text)) return NcAttribute.Text(name, text);
            if (value.TryGetValue<bool>(out var flag)) return NcAttribute.Of(name, flag ? 1 : 0);
        }
        if (node is JsonArray array && array.Count > 0 && array.All(e => e is JsonValue v && v.TryGetValue<string>(out _)))
            return new NcAttribute(name, NcType.String, array.Select(e => e!.GetValue<string>()).ToArray());
        if (Numbers(node) is not { Length: > 0 } numbers) return null;
        return numbers.All(x => x == Math.Floor(x) && x >= int.MinValue && x <= int.MaxValue)
            ? NcAttribute.Of(name, numbers.Select(x => (int)x).ToArray())
            : NcAttribute.Of(name, numbers);
    }

    /// <summary>A number, a list of numbers, or their special spellings; null for anything else.</summary>
    public static double[]? Numbers(JsonNode node)
    {
        if (node is JsonArray array)
        {
            var values = new double[array.Count];
            for (int i = 0; i < values.Length; i++)
                if (array[i] is not { } e || Number(e) is not { } x) return null;
                else values[i] = x;
            return values;
        }
        return Number(node) is { } one ? [one] : null;
    }

    public static double? Number(JsonNode node)
    {
        if (node is not JsonValue value) return null;
        if (value.GetValueKind() == JsonValueKind.Number) return value.GetValue<double>();
        if (value.GetValueKind() is JsonValueKind.True or JsonValueKind.False) return value.GetValue<bool>() ? 1 : 0;
        if (value.TryGetValue<string>(out var text))
            return text switch
            {
                "NaN" => double.NaN,
                "Infinity" => double.PositiveInfinity,
                "-Infinity" => double.NegativeInfinity,
                _ => null,
            };
        return null;
    }

    /// <summary>Values as the typed array <see cref="NcAttribute"/> holds for <paramref name="type"/>.</summary>
    public static object Typed(NcType type, double[] values) => type switch
    {
        NcType.Byte => values.Select(x => (sbyte)x).ToArray(),
        NcType.UByte => values.Select(x => (byte)x).ToArray(),
        NcType.Short => values.Select(x => (short)x).ToArray(),
        NcType.UShort => values.Select(x => (ushort)x).ToArray(),
        NcType.Int => values.Select(x => (int)x).ToArray(),
        NcType.UInt => values.Select(x => (uint)x).ToArray(),
        NcType.Int64 => values.Select(x => (long)x).ToArray(),
        NcType.UInt64 => values.Select(x => (ulong)x).ToArray(),
        NcType.Float => values.Select(x => (float)x).ToArray(),
        _ => values,
    };

    /// <summary>One element of <paramref name="type"/>, little-endian.</summary>
    public static byte[] Element(NcType type, double value)
    {
        var bytes = new byte[NcTypes.SizeOf(type)];
        switch (type)
        {
            case NcType.Byte: bytes[0] = (byte)(sbyte)value; break;
            case NcType.UByte: bytes[0] = (byte)value; break;
            case NcType.Short: BitConverter.TryWriteBytes(bytes, (short)value); break;
            case NcType.UShort: BitConverter.TryWriteBytes(bytes, (ushort)value); break;
            case NcType.Int: BitConverter.TryWriteBytes(bytes, (int)value); break;
            case NcType.UInt: BitConverter.TryWriteBytes(bytes, (uint)value); break;
            case NcType.Int64: BitConverter.TryWriteBytes(bytes, (long)value); break;
            case NcType.UInt64: BitConverter.TryWriteBytes(bytes, (ulong)value); break;
            case NcType.Float: BitConverter.TryWriteBytes(bytes, (float)value); break;
            case NcType.Double: BitConverter.TryWriteBytes(bytes, value); break;
        }
        return bytes;
    }

    /// <summary>A Zarr v3 fill value given as raw bits ("0x7fc00000"), little-endian; null when the text is not that.</summary>
    public static byte[]? RawBits(string text, int size)
    {
        if (!text.StartsWith("0x", StringComparison.Ordinal) || text.Length != 2 + 2 * size) return null;
        if (!ulong.TryParse(text.AsSpan(2), NumberStyles.HexNumber, CultureInfo.InvariantCulture, out var bits)) return null;
        return BitConverter.GetBytes(bits).AsSpan(0, size).ToArray();
    }
}
