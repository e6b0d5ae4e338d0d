namespace GridDrift.Grids.Regridding;

/// <summary>
/// A remapping as a sparse matrix in CSR form: target cell t takes the source frame positions
/// Column[RowStart[t] … RowStart[t+1]−1] with the matching Weight. Built once, applied to every
/// frame. Missing source values are left out and the remaining weights renormalised; the covered
/// fraction is the valid weight over the full weight of the target cell (for conservative
/// weights, an area fraction).
/// </summary>
internal sealed class RemapWeights
{
    public required int SourceCells { get; init; }
    public required int TargetCells { get; init; }
    public required int[] RowStart { get; init; }
    public required int[] Column { get; init; }
    public required double[] Weight { get; init; }
    /// <summary>Full weight of each target cell: its area for conservative weights, 1 for bilinear.</summary>
    public required double[] TargetWeight { get; init; }
    public required string Method { get; init; }

    float[]? _normalized;
    float[]? _fullCover;
    double[]? _normalizedSum;

    /// <summary>
    /// For frames without missing values: each weight divided by its row's total, as float32 (the
    /// products are float32 too), so one pass reads 8 bytes per weight instead of 12 and needs no
    /// checks or division. Sums stay in float64.
    /// </summary>
    void Normalise()
    {
        var n = new float[Weight.Length];
        var cover = new float[TargetCells];
        var sums = new double[TargetCells];
        for (int t = 0; t < TargetCells; t++)
        {
            double sum = 0;
            for (int k = RowStart[t]; k < RowStart[t + 1]; k++) sum += Weight[k];
            for (int k = RowStart[t]; k < RowStart[t + 1]; k++) { n[k] = (float)(Weight[k] / sum); sums[t] += n[k]; }
            cover[t] = TargetWeight[t] > 0 ? (float)Math.Min(1, sum / TargetWeight[t]) : 0;
        }
        // dividing by the float32 weights' own sum keeps a constant field exact
        _normalizedSum = sums;
        _fullCover = cover;
        Volatile.Write(ref _normalized, n); // last: a worker that sees it sees the sums too
    }

    /// <summary>NaN is the only value not equal to itself: compared eight lanes at a time.</summary>
    static bool HasNaN(ReadOnlySpan<float> values)
    {
        int i = 0;
        if (System.Runtime.Intrinsics.Vector256.IsHardwareAccelerated)
            for (; i + 8 <= values.Length; i += 8)
            {
                var v = System.Runtime.Intrinsics.Vector256.Create(values.Slice(i, 8));
                if (!System.Runtime.Intrinsics.Vector256.EqualsAll(v, v)) return true;
            }
        for (; i < values.Length; i++) if (float.IsNaN(values[i])) return true;
        return false;
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Apply(ReadOnlySpan<float> source, Span<float> target, Span<float> coveredFraction)
    {
        if (HasNaN(source))
        {
            ApplyWithMissing(source, target, coveredFraction);
            return;
        }
        // workers remap frames at once: the first to get here normalises, the others wait for it
        if (Volatile.Read(ref _normalized) is null)
            lock (RowStart)
                if (_normalized is null) Normalise();
        var w = _normalized!;
        var col = Column;
        ref float x = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(source);
        for (int t = 0; t < TargetCells; t++)
        {
            int k = RowStart[t], end = RowStart[t + 1];
            double s = 0;
            for (; k < end; k++) s += w[k] * System.Runtime.CompilerServices.Unsafe.Add(ref x, col[k]);
            target[t] = end > RowStart[t] ? (float)(s / _normalizedSum![t]) : float.NaN;
        }
        if (!coveredFraction.IsEmpty) _fullCover.AsSpan().CopyTo(coveredFraction);
    }

    void ApplyWithMissing(ReadOnlySpan<float> source, Span<float> target, Span<float> coveredFraction)
    {
        for (int t = 0; t < TargetCells; t++)
        {
            double sum = 0, weight = 0;
            for (int k = RowStart[t]; k < RowStart[t + 1]; k++)
            {
                float v = source[Column[k]];
                if (float.IsNaN(v)) continue;
                sum += Weight[k] * v;
                weight += Weight[k];
            }
            target[t] = weight > 0 ? (float)(sum / weight) : float.NaN;
            if (!coveredFraction.IsEmpty) coveredFraction[t] = TargetWeight[t] > 0 ? (float)Math.Min(1, weight / TargetWeight[t]) : 0;
        }
    }
}
