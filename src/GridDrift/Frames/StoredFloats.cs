using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace GridDrift.Frames;

/// <summary>
/// How a frame loop turns float32 values at an address into physical values (NaN where
/// missing), four at a time. Kernels take the decoder as a struct type parameter, so the JIT
/// compiles one loop per decoder with the decoding inlined: the loop can run straight over a
/// mapped file's pages instead of over a decoded copy.
/// </summary>
internal unsafe interface IStoredFloats
{
    Vector256<double> Load4(byte* at);
    double Load(byte* at);
}

/// <summary>Values already decoded: native-order float32 with NaN for missing.</summary>
internal readonly unsafe struct DecodedFloats : IStoredFloats
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public Vector256<double> Load4(byte* at) => Vector256.WidenLower(Vector128.Load((float*)at).ToVector256Unsafe());

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Load(byte* at) => *(float*)at;
}

/// <summary>
/// Big-endian float32 as the NetCDF classic formats store them, with one value meaning missing
/// (the variable's _FillValue or missing_value; NaN when it has none): bytes reversed, the fill
/// value replaced by NaN, then widened — the decoding <see cref="FrameSource.ReadFrame"/> does.
/// </summary>
internal readonly unsafe struct BigEndianFloats(float fill) : IStoredFloats
{
    readonly float _fill = fill;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public Vector256<double> Load4(byte* at)
    {
        var swapped = Vector128.Shuffle(Vector128.Load(at), Vector128.Create((byte)3, 2, 1, 0, 7, 6, 5, 4, 11, 10, 9, 8, 15, 14, 13, 12)).AsSingle();
        var decoded = Vector128.ConditionalSelect(Vector128.Equals(swapped, Vector128.Create(_fill)), Vector128.Create(float.NaN), swapped);
        return Vector256.WidenLower(decoded.ToVector256Unsafe());
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Load(byte* at)
    {
        float v = BitConverter.Int32BitsToSingle(System.Buffers.Binary.BinaryPrimitives.ReverseEndianness(*(int*)at));
        return v == _fill ? double.NaN : v;
    }
}
