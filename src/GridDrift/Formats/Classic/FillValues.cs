using System.Buffers.Binary;

namespace GridDrift.Formats.Classic;

/// <summary>
/// The default fill values of the NetCDF specification (netcdf.h NC_FILL_*), used for data
/// a writer never wrote when the variable declares no _FillValue of its own.
/// </summary>
internal static class FillValues
{
    public static object DefaultTyped(NcType type) => type switch
    {
        NcType.Byte => new sbyte[] { -127 },
        NcType.Char => new byte[] { 0 },
        NcType.Short => new short[] { -32767 },
        NcType.Int => new int[] { -2147483647 },
        NcType.Float => new float[] { 9.9692099683868690e+36f },
        NcType.Double => new double[] { 9.9692099683868690e+36 },
        NcType.UByte => new byte[] { 255 },
        NcType.UShort => new ushort[] { 65535 },
        NcType.UInt => new uint[] { 4294967295 },
        NcType.Int64 => new long[] { -9223372036854775806 },
        NcType.UInt64 => new ulong[] { 18446744073709551614UL },
        _ => throw new ArgumentOutOfRangeException(nameof(type)),
    };

    /// <summary>One big-endian element: the variable's own _FillValue if it has one of its type, else the default.</summary>
    public static byte[] Pattern(NcType type, NcAttribute? fill)
    {
        object values = fill is not null && fill.Type == type && fill.Count > 0 && fill.Values is Array
            ? fill.Values : DefaultTyped(type);
        var bytes = new byte[NcTypes.SizeOf(type)];
        switch (values)
        {
            case sbyte[] v: bytes[0] = unchecked((byte)v[0]); break;
            case byte[] v: bytes[0] = v[0]; break;
            case short[] v: BinaryPrimitives.WriteInt16BigEndian(bytes, v[0]); break;
            case ushort[] v: BinaryPrimitives.WriteUInt16BigEndian(bytes, v[0]); break;
            case int[] v: BinaryPrimitives.WriteInt32BigEndian(bytes, v[0]); break;
            case uint[] v: BinaryPrimitives.WriteUInt32BigEndian(bytes, v[0]); break;
            case float[] v: BinaryPrimitives.WriteSingleBigEndian(bytes, v[0]); break;
            case double[] v: BinaryPrimitives.WriteDoubleBigEndian(bytes, v[0]); break;
            case long[] v: BinaryPrimitives.WriteInt64BigEndian(bytes, v[0]); break;
            case ulong[] v: BinaryPrimitives.WriteUInt64BigEndian(bytes, v[0]); break;
        }
        return bytes;
    }
}
