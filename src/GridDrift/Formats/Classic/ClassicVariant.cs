namespace GridDrift.Formats.Classic;

/// <summary>
/// The three variants of the NetCDF classic format (NetCDF User's Guide, "File Format
/// Specification"; CDF-5 from the PnetCDF specification). They differ in the widths of
/// offsets and counts in the header.
/// </summary>
public enum ClassicVariant
{
    /// <summary>CDF-1, "classic": 32-bit offsets and counts.</summary>
    Cdf1 = 1,
    /// <summary>CDF-2, "64-bit offset": 64-bit variable offsets, 32-bit counts.</summary>
    Cdf2 = 2,
    /// <summary>CDF-5, "64-bit data": 64-bit offsets and counts, unsigned and 64-bit types.</summary>
    Cdf5 = 5,
}

internal static class ClassicLayout
{
    public const int TagDimension = 0x0A;
    public const int TagVariable = 0x0B;
    public const int TagAttribute = 0x0C;
    public const uint Streaming32 = 0xFFFFFFFF;
    public const ulong Streaming64 = 0xFFFFFFFFFFFFFFFF;

    /// <summary>Width in bytes of a NON_NEG count (nelems, dim length, vsize, numrecs).</summary>
    public static int CountWidth(ClassicVariant v) => v == ClassicVariant.Cdf5 ? 8 : 4;

    /// <summary>Width in bytes of a variable's begin OFFSET.</summary>
    public static int OffsetWidth(ClassicVariant v) => v == ClassicVariant.Cdf1 ? 4 : 8;

    public static long Pad4(long n) => (n + 3) & ~3L;

    public static string FormatName(ClassicVariant v) => v switch
    {
        ClassicVariant.Cdf1 => "classic",
        ClassicVariant.Cdf2 => "64-bit offset",
        _ => "64-bit data (CDF-5)",
    };
}
