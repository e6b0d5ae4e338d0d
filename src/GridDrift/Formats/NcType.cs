namespace GridDrift.Formats;

/// <summary>
/// The NetCDF external types. The numeric codes are those of the NetCDF classic format
/// specification (NC_BYTE = 1 … NC_UINT64 = 11) and of netCDF-4 (NC_STRING = 12).
/// </summary>
internal enum NcType
{
    Byte = 1,
    Char = 2,
    Short = 3,
    Int = 4,
    Float = 5,
    Double = 6,
    UByte = 7,
    UShort = 8,
    UInt = 9,
    Int64 = 10,
    UInt64 = 11,
    String = 12,
    /// <summary>compound, variable-length, opaque or enum: listed, never read.</summary>
    Unsupported = 99,
}

internal static class NcTypes
{
    public static int SizeOf(NcType type) => type switch
    {
        NcType.Byte or NcType.Char or NcType.UByte => 1,
        NcType.Short or NcType.UShort => 2,
        NcType.Int or NcType.UInt or NcType.Float => 4,
        NcType.Double or NcType.Int64 or NcType.UInt64 => 8,
        _ => throw new ArgumentOutOfRangeException(nameof(type), type, "type has no fixed size"),
    };

    public static bool IsNumeric(NcType type) =>
        type is not (NcType.Char or NcType.String or NcType.Unsupported);

    /// <summary>Types that only CDF-5 (and netCDF-4) can hold.</summary>
    public static bool NeedsCdf5(NcType type) =>
        type is NcType.UByte or NcType.UShort or NcType.UInt or NcType.Int64 or NcType.UInt64;

    /// <summary>The CDL spelling, as ncdump prints it.</summary>
    public static string CdlName(NcType type) => type switch
    {
        NcType.Byte => "byte",
        NcType.Char => "char",
        NcType.Short => "short",
        NcType.Int => "int",
        NcType.Float => "float",
        NcType.Double => "double",
        NcType.UByte => "ubyte",
        NcType.UShort => "ushort",
        NcType.UInt => "uint",
        NcType.Int64 => "int64",
        NcType.UInt64 => "uint64",
        NcType.String => "string",
        _ => "unsupported",
    };
}
