using System.Runtime.Intrinsics.X86;

namespace GridDrift.Formats.Zarr;

/// <summary>CRC-32C (Castagnoli polynomial, reflected 0x82F63B78; RFC 3720 §B.4), as Zarr v3's crc32c codec appends it.</summary>
internal static class Crc32c
{
    static readonly uint[] Table = Enumerable.Range(0, 256).Select(n =>
    {
        uint c = (uint)n;
        for (int k = 0; k < 8; k++) c = (c & 1) != 0 ? 0x82F63B78u ^ (c >> 1) : c >> 1;
        return c;
    }).ToArray();

    public static uint Of(ReadOnlySpan<byte> data)
    {
        uint crc = 0xFFFFFFFFu;
        int i = 0;
        if (Sse42.X64.IsSupported)
        {
            ulong wide = crc;
            for (; i + 8 <= data.Length; i += 8) wide = Sse42.X64.Crc32(wide, BitConverter.ToUInt64(data.Slice(i, 8)));
            crc = (uint)wide;
        }
        for (; i < data.Length; i++) crc = Table[(crc ^ data[i]) & 0xFF] ^ (crc >> 8);
        return crc ^ 0xFFFFFFFFu;
    }
}
