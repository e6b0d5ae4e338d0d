using System.Text;
using System.Buffers.Binary;
using System.Numerics.Tensors;
using System.Runtime.InteropServices;

namespace GridDrift.Formats;

/// <summary>Conversions of raw, little-endian typed bytes, vectorised through TensorPrimitives.</summary>
internal static class RawValues
{
    public static void RequireNumericOrChar(string path, NcVariable variable)
    {
        if (variable.Type == NcType.Char) return;
        RequireNumeric(path, variable);
    }

    public static void RequireNumeric(string path, NcVariable variable)
    {
        if (variable.Type == NcType.Unsupported)
            throw new BadInputException(path, variable.Name, variable.UnsupportedKind is { } kind && kind.Contains(' ')
                ? $"cannot be read: {kind}" // a reason, not a type's name
                : $"is of the {variable.UnsupportedKind} type, which GridDrift lists but does not read");
        if (!NcTypes.IsNumeric(variable.Type))
            throw new BadInputException(path, variable.Name, $"is of type {variable.TypeName}, not numeric");
    }

    public static void ToDouble(NcType type, ReadOnlySpan<byte> raw, Span<double> destination)
    {
        switch (type)
        {
            case NcType.Byte: TensorPrimitives.ConvertChecked<sbyte, double>(MemoryMarshal.Cast<byte, sbyte>(raw), destination); break;
            case NcType.Char:
            case NcType.UByte: TensorPrimitives.ConvertChecked<byte, double>(raw, destination); break;
            case NcType.Short: TensorPrimitives.ConvertChecked<short, double>(MemoryMarshal.Cast<byte, short>(raw), destination); break;
            case NcType.UShort: TensorPrimitives.ConvertChecked<ushort, double>(MemoryMarshal.Cast<byte, ushort>(raw), destination); break;
            case NcType.Int: TensorPrimitives.ConvertChecked<int, double>(MemoryMarshal.Cast<byte, int>(raw), destination); break;
            case NcType.UInt: TensorPrimitives.ConvertChecked<uint, double>(MemoryMarshal.Cast<byte, uint>(raw), destination); break;
            case NcType.Int64: TensorPrimitives.ConvertTruncating<long, double>(MemoryMarshal.Cast<byte, long>(raw), destination); break;
            case NcType.UInt64: TensorPrimitives.ConvertTruncating<ulong, double>(MemoryMarshal.Cast<byte, ulong>(raw), destination); break;
            case NcType.Float: TensorPrimitives.ConvertChecked<float, double>(MemoryMarshal.Cast<byte, float>(raw), destination); break;
            case NcType.Double: MemoryMarshal.Cast<byte, double>(raw).CopyTo(destination); break;
            default: throw new ArgumentOutOfRangeException(nameof(type), type, "not a numeric type");
        }
    }


    /// <summary>Swaps every element of <paramref name="data"/> between big- and little-endian, in place.</summary>
    public static void SwapInPlace(Span<byte> data, int elementSize)
    {
        switch (elementSize)
        {
            case 1: return;
            case 2: { var s = MemoryMarshal.Cast<byte, ushort>(data); BinaryPrimitives.ReverseEndianness(s, s); return; }
            case 4: { var s = MemoryMarshal.Cast<byte, uint>(data); BinaryPrimitives.ReverseEndianness(s, s); return; }
            case 8: { var s = MemoryMarshal.Cast<byte, ulong>(data); BinaryPrimitives.ReverseEndianness(s, s); return; }
            default: throw new ArgumentOutOfRangeException(nameof(elementSize));
        }
    }

    /// <summary>Big-endian bytes to a typed array (char: text).</summary>
    public static object DecodeBigEndian(NcType type, ReadOnlySpan<byte> bigEndian)
    {
        var le = bigEndian.ToArray();
        RawValues.SwapInPlace(le, NcTypes.SizeOf(type));
        var span = le.AsSpan();
        return type switch
        {
            NcType.Char => DecodeText(le),
            NcType.Byte => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, sbyte>(span).ToArray(),
            NcType.UByte => le,
            NcType.Short => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, short>(span).ToArray(),
            NcType.UShort => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, ushort>(span).ToArray(),
            NcType.Int => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, int>(span).ToArray(),
            NcType.UInt => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, uint>(span).ToArray(),
            NcType.Float => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, float>(span).ToArray(),
            NcType.Double => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, double>(span).ToArray(),
            NcType.Int64 => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, long>(span).ToArray(),
            NcType.UInt64 => System.Runtime.InteropServices.MemoryMarshal.Cast<byte, ulong>(span).ToArray(),
            _ => throw new ArgumentOutOfRangeException(nameof(type)),
        };
    }

    /// <summary>Char attributes are text; a trailing NUL (which C writers often include) is dropped.</summary>
    static string DecodeText(byte[] bytes)
    {
        int end = bytes.Length;
        while (end > 0 && bytes[end - 1] == 0) end--;
        return Encoding.UTF8.GetString(bytes, 0, end);
    }
}
