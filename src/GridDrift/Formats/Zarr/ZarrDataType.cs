namespace GridDrift.Formats.Zarr;

/// <summary>
/// An array's element type as the netCDF model sees it: booleans become unsigned bytes (0, 1);
/// complex numbers, strings, structured and datetime types are listed but never read.
/// </summary>
internal sealed record ZarrDataType(NcType Type, bool BigEndian, string Declared)
{
    public int Size => NcTypes.SizeOf(Type);
    public bool Readable => Type != NcType.Unsupported;

    /// <summary>A Zarr v2 dtype: a NumPy type string, "&lt;f4", "&gt;i2", "|u1", "|b1".</summary>
    public static ZarrDataType FromV2(string dtype)
    {
        if (dtype.Length < 3) return new(NcType.Unsupported, false, dtype);
        bool big = dtype[0] == '>';
        NcType type = dtype[1..] switch
        {
            "b1" => NcType.UByte,
            "i1" => NcType.Byte,
            "u1" => NcType.UByte,
            "i2" => NcType.Short,
            "u2" => NcType.UShort,
            "i4" => NcType.Int,
            "u4" => NcType.UInt,
            "i8" => NcType.Int64,
            "u8" => NcType.UInt64,
            "f4" => NcType.Float,
            "f8" => NcType.Double,
            _ => NcType.Unsupported,
        };
        return new(type, big && type != NcType.Unsupported && NcTypes.SizeOf(type) > 1, dtype);
    }

    /// <summary>A Zarr v3 data type name ("float32", "int16", "bool", …); byte order comes from the bytes codec.</summary>
    public static ZarrDataType FromV3(string name) => new(name switch
    {
        "bool" => NcType.UByte,
        "int8" => NcType.Byte,
        "uint8" => NcType.UByte,
        "int16" => NcType.Short,
        "uint16" => NcType.UShort,
        "int32" => NcType.Int,
        "uint32" => NcType.UInt,
        "int64" => NcType.Int64,
        "uint64" => NcType.UInt64,
        "float32" => NcType.Float,
        "float64" => NcType.Double,
        _ => NcType.Unsupported,
    }, false, name);
}
