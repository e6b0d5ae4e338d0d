using PureHDF;

namespace GridDrift.Formats.Hdf5;

/// <summary>Maps HDF5 datatypes onto NetCDF types, the way netCDF-4 stores them.</summary>
internal static class Hdf5Types
{
    /// <summary>The netCDF type of an HDF5 type, or Unsupported with the kind's name.</summary>
    public static (NcType Type, string? Kind) Classify(IH5DataType t) => t.Class switch
    {
        H5DataTypeClass.FixedPoint => (t.Size, t.FixedPoint.IsSigned) switch
        {
            (1, true) => (NcType.Byte, null),
            (1, false) => (NcType.UByte, null),
            (2, true) => (NcType.Short, null),
            (2, false) => (NcType.UShort, null),
            (4, true) => (NcType.Int, null),
            (4, false) => (NcType.UInt, null),
            (8, true) => (NcType.Int64, null),
            (8, false) => (NcType.UInt64, null),
            _ => (NcType.Unsupported, $"{t.Size}-byte integer"),
        },
        H5DataTypeClass.FloatingPoint => t.Size switch
        {
            4 => (NcType.Float, null),
            8 => (NcType.Double, null),
            _ => (NcType.Unsupported, $"{t.Size}-byte float"),
        },
        // netCDF-4 stores NC_CHAR as a fixed-length string of one byte, NC_STRING as a variable-length string.
        H5DataTypeClass.String => t.Size == 1 ? (NcType.Char, null) : (NcType.String, null),
        H5DataTypeClass.VariableLength when Hdf5Links.IsVariableLengthString(t) => (NcType.String, null),
        H5DataTypeClass.Compound => (NcType.Unsupported, "compound"),
        H5DataTypeClass.VariableLength => (NcType.Unsupported, "variable-length"),
        H5DataTypeClass.Opaque => (NcType.Unsupported, "opaque"),
        H5DataTypeClass.Enumerated => (NcType.Unsupported, "enum"),
        _ => (NcType.Unsupported, t.Class.ToString().ToLowerInvariant()),
    };

    public static NcAttribute ReadAttribute(IH5Attribute a)
    {
        var (type, kind) = Classify(a.Type);
        if (a.Space.Type == H5DataspaceType.Null)
            return new NcAttribute(a.Name, type == NcType.String ? NcType.Char : type, type switch
            {
                NcType.Char or NcType.String => "",
                NcType.Unsupported => kind ?? "unsupported",
                _ => Array.CreateInstance(ElementType(type), 0),
            });
        if (NcTypes.IsNumeric(type) && Hdf5ByteOrder.IsBigEndian(a.Type) && Hdf5ByteOrder.AttributeBytes(a) is { } bigEndian)
        {
            int size = NcTypes.SizeOf(type);
            long count = a.Space.Dimensions.Aggregate(1UL, (n, d) => n * d) is var c && a.Space.Type == H5DataspaceType.Scalar ? 1 : (long)c;
            var raw = bigEndian.AsSpan(0, (int)Math.Min(bigEndian.Length, count * size)).ToArray();
            return new NcAttribute(a.Name, type, RawValues.DecodeBigEndian(type, raw));
        }
        object values = type switch
        {
            NcType.Byte => a.Read<sbyte[]>(),
            NcType.UByte => a.Read<byte[]>(),
            NcType.Short => a.Read<short[]>(),
            NcType.UShort => a.Read<ushort[]>(),
            NcType.Int => a.Read<int[]>(),
            NcType.UInt => a.Read<uint[]>(),
            NcType.Int64 => a.Read<long[]>(),
            NcType.UInt64 => a.Read<ulong[]>(),
            NcType.Float => a.Read<float[]>(),
            NcType.Double => a.Read<double[]>(),
            NcType.Char or NcType.String => Text(a),
            _ => kind ?? "unsupported",
        };
        if (type == NcType.String && values is string) type = NcType.Char;
        return new NcAttribute(a.Name, type, values);
    }

    static Type ElementType(NcType type) => type switch
    {
        NcType.Byte => typeof(sbyte),
        NcType.UByte => typeof(byte),
        NcType.Short => typeof(short),
        NcType.UShort => typeof(ushort),
        NcType.Int => typeof(int),
        NcType.UInt => typeof(uint),
        NcType.Int64 => typeof(long),
        NcType.UInt64 => typeof(ulong),
        NcType.Float => typeof(float),
        _ => typeof(double),
    };

    /// <summary>Fixed-length text is NC_CHAR (one string); variable-length strings are NC_STRING (an array).</summary>
    static object Text(IH5Attribute a)
    {
        var strings = a.Read<string[]>();
        if (a.Type.Class == H5DataTypeClass.String)
            return string.Concat(strings).TrimEnd('\0');
        return strings;
    }
}
