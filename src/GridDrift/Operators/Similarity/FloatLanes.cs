using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// The float32 vector operations of the band filter's loops, for 16 lanes and for 8: each loop
/// is written once as a generic method and compiled for each width (the JIT specialises generic
/// methods over structs, so these static members are inlined, not called through an interface).
/// </summary>
internal interface IFloatLanes<TV>
{
    static abstract bool Available { get; }
    static abstract int Count { get; }
    static abstract TV Zero { get; }
    static abstract TV Splat(float x);
    static abstract TV Load(ref float at, nint offset);
    static abstract void Store(TV value, ref float at, nint offset);
    static abstract TV Add(TV a, TV b);
    static abstract TV Multiply(TV a, TV b);
    static abstract TV MultiplyAdd(TV a, TV b, TV addend);
}

internal readonly struct Lanes16 : IFloatLanes<Vector512<float>>
{
    public static bool Available => Vector512.IsHardwareAccelerated;
    public static int Count => 16;
    public static Vector512<float> Zero => Vector512<float>.Zero;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector512<float> Splat(float x) => Vector512.Create(x);
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector512<float> Load(ref float at, nint offset) => Vector512.LoadUnsafe(ref Unsafe.Add(ref at, offset));
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static void Store(Vector512<float> value, ref float at, nint offset) => value.StoreUnsafe(ref Unsafe.Add(ref at, offset));
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector512<float> Add(Vector512<float> a, Vector512<float> b) => a + b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector512<float> Multiply(Vector512<float> a, Vector512<float> b) => a * b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector512<float> MultiplyAdd(Vector512<float> a, Vector512<float> b, Vector512<float> addend) => Vector512.FusedMultiplyAdd(a, b, addend);
}

internal readonly struct Lanes8 : IFloatLanes<Vector256<float>>
{
    public static bool Available => Vector256.IsHardwareAccelerated;
    public static int Count => 8;
    public static Vector256<float> Zero => Vector256<float>.Zero;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<float> Splat(float x) => Vector256.Create(x);
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<float> Load(ref float at, nint offset) => Vector256.LoadUnsafe(ref Unsafe.Add(ref at, offset));
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static void Store(Vector256<float> value, ref float at, nint offset) => value.StoreUnsafe(ref Unsafe.Add(ref at, offset));
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<float> Add(Vector256<float> a, Vector256<float> b) => a + b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<float> Multiply(Vector256<float> a, Vector256<float> b) => a * b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<float> MultiplyAdd(Vector256<float> a, Vector256<float> b, Vector256<float> addend) => Vector256.FusedMultiplyAdd(a, b, addend);
}
