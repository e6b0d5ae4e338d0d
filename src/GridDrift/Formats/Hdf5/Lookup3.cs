using System.Buffers.Binary;
using System.Numerics;

namespace GridDrift.Formats.Hdf5;

/// <summary>
/// Bob Jenkins' lookup3 <c>hashlittle</c> (public domain, lookup3.c, 2006), the checksum the HDF5
/// File Format Specification (version 2+ structures, "Checksum" fields) puts on its metadata with
/// an initial value of 0. Read byte-wise in little-endian order, which is what hashlittle computes
/// on every machine.
/// </summary>
internal static class Lookup3
{
    public static uint Hash(ReadOnlySpan<byte> key, uint initial = 0)
    {
        uint a, b, c;
        a = b = c = 0xdeadbeef + (uint)key.Length + initial;
        while (key.Length > 12)
        {
            a += BinaryPrimitives.ReadUInt32LittleEndian(key);
            b += BinaryPrimitives.ReadUInt32LittleEndian(key[4..]);
            c += BinaryPrimitives.ReadUInt32LittleEndian(key[8..]);
            Mix(ref a, ref b, ref c);
            key = key[12..];
        }
        if (key.Length == 0) return c;
        Span<byte> tail = stackalloc byte[12];
        tail.Clear();
        key.CopyTo(tail);
        a += BinaryPrimitives.ReadUInt32LittleEndian(tail);
        b += BinaryPrimitives.ReadUInt32LittleEndian(tail[4..]);
        c += BinaryPrimitives.ReadUInt32LittleEndian(tail[8..]);
        Final(ref a, ref b, ref c);
        return c;
    }

    static void Mix(ref uint a, ref uint b, ref uint c)
    {
        a -= c; a ^= BitOperations.RotateLeft(c, 4); c += b;
        b -= a; b ^= BitOperations.RotateLeft(a, 6); a += c;
        c -= b; c ^= BitOperations.RotateLeft(b, 8); b += a;
        a -= c; a ^= BitOperations.RotateLeft(c, 16); c += b;
        b -= a; b ^= BitOperations.RotateLeft(a, 19); a += c;
        c -= b; c ^= BitOperations.RotateLeft(b, 4); b += a;
    }

    static void Final(ref uint a, ref uint b, ref uint c)
    {
        c ^= b; c -= BitOperations.RotateLeft(b, 14);
        a ^= c; a -= BitOperations.RotateLeft(c, 11);
        b ^= a; b -= BitOperations.RotateLeft(a, 25);
        c ^= b; c -= BitOperations.RotateLeft(b, 16);
        a ^= c; a -= BitOperations.RotateLeft(c, 4);
        b ^= a; b -= BitOperations.RotateLeft(a, 14);
        c ^= b; c -= BitOperations.RotateLeft(b, 24);
    }
}
