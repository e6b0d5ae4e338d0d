using System.Runtime.Intrinsics;

namespace GridDrift.Operators.Similarity;

/// <summary>The cells valid in both frames of a pair: their sums, which centre the similarity filters' values.</summary>
internal static class ValidPairs
{
    /// <summary>
    /// Sums of x and of y over the cells valid in both, and their count: float64 lanes
    /// accumulated across the frame and added up once at the end, so no step waits on the last.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public static (double X, double Y, int Count) Sums(ReadOnlySpan<float> x, ReadOnlySpan<float> y)
    {
        double sx = 0, sy = 0;
        int count = 0, i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var xLow = Vector256<double>.Zero; var xHigh = xLow; var yLow = xLow; var yHigh = xLow;
            var counts = Vector256<int>.Zero;
            for (; i + 8 <= x.Length; i += 8)
            {
                var a = Vector256.Create(x.Slice(i, 8));
                var b = Vector256.Create(y.Slice(i, 8));
                var valid = Vector256.Equals(a, a) & Vector256.Equals(b, b);
                var (al, ah) = Vector256.Widen(a & valid);
                var (bl, bh) = Vector256.Widen(b & valid);
                xLow += al; xHigh += ah; yLow += bl; yHigh += bh;
                counts -= valid.AsInt32(); // a valid lane is all ones, −1
            }
            sx = Vector256.Sum(xLow + xHigh);
            sy = Vector256.Sum(yLow + yHigh);
            count = Vector256.Sum(counts);
        }
        for (; i < x.Length; i++)
            if (!float.IsNaN(x[i]) && !float.IsNaN(y[i])) { sx += x[i]; sy += y[i]; count++; }
        return (sx, sy, count);
    }
}
