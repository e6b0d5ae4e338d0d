namespace GridDrift.Grids.Regridding;

/// <summary>
/// A remapping as a sparse matrix in CSR form: target cell t takes the source frame positions
/// Column[RowStart[t] … RowStart[t+1]−1] with the matching Weight. Built once, applied to every
/// frame. Missing source values are left out and the remaining weights renormalised; the covered
/// fraction is the valid weight over the full weight of the target cell (for conservative
/// weights, an area fraction).
/// </summary>
public sealed class RemapWeights
{
    public required int SourceCells { get; init; }
    public required int TargetCells { get; init; }
    public required int[] RowStart { get; init; }
    public required int[] Column { get; init; }
    public required double[] Weight { get; init; }
    /// <summary>Full weight of each target cell: its area for conservative weights, 1 for bilinear.</summary>
    public required double[] TargetWeight { get; init; }
    public required string Method { get; init; }

    public void Apply(ReadOnlySpan<float> source, Span<float> target, Span<float> coveredFraction)
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
