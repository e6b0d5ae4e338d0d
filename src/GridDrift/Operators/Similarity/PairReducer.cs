using GridDrift.Regions;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// Area-weighted pair statistics of two frames per region, over the cells valid in both:
/// Pearson correlation Σw(a−ā)(b−b̄)/√(Σw(a−ā)²·Σw(b−b̄)²), RMS difference √(Σw(b−a)²/Σw),
/// mean absolute change Σw|b−a|/Σw, the bias Σw(b−a)/Σw, and the valid fraction Σw/region area. Float64 sums,
/// shifted per region by its first valid earlier value, so small regional variances keep
/// their digits whatever the regional mean.
/// </summary>
internal static class PairReducer
{
    public const int Stride = 5;

    /// <summary>Per region r writes output[5r … 5r+4] = corr, rmsd, mean absolute change, valid fraction, bias (later − earlier).</summary>
    public static void Reduce(RegionMask mask, ReadOnlySpan<float> earlier, ReadOnlySpan<float> later, Span<double> output)
    {
        for (int r = 0; r < mask.Count; r++)
        {
            var cells = mask.CellsOf(r);
            var areas = mask.AreasOf(r);
            double sw = 0, sa = 0, sb = 0, saa = 0, sbb = 0, sab = 0, sabs = 0, sdd = 0, sd = 0, shift = double.NaN;
            for (int k = 0; k < cells.Length; k++)
            {
                float x = earlier[cells[k]], y = later[cells[k]];
                if (float.IsNaN(x) || float.IsNaN(y)) continue;
                if (double.IsNaN(shift)) shift = x;
                double w = areas[k], a = x - shift, b = y - shift, d = b - a;
                sw += w; sa += w * a; sb += w * b;
                saa += w * a * a; sbb += w * b * b; sab += w * a * b;
                sabs += w * Math.Abs(d); sdd += w * d * d; sd += w * d;
            }
            var slot = output.Slice(Stride * r, Stride);
            if (sw <= 0)
            {
                slot[0] = slot[1] = slot[2] = slot[4] = double.NaN;
                slot[3] = 0;
                continue;
            }
            double ma = sa / sw, mb = sb / sw;
            double va = saa / sw - ma * ma, vb = sbb / sw - mb * mb, cov = sab / sw - ma * mb;
            slot[0] = va > 0 && vb > 0 ? Math.Clamp(cov / Math.Sqrt(va * vb), -1, 1) : double.NaN;
            slot[1] = Math.Sqrt(sdd / sw);
            slot[2] = sabs / sw;
            slot[3] = ValidFraction.Of(sw, mask.RegionArea[r]);
            slot[4] = sd / sw;
        }
    }
}
