using GridDrift.Regions;
namespace GridDrift.Operators.Similarity;

/// <summary>
/// VIF of one region: the pixel-domain multi-scale VIF (<see cref="Vif"/>) on the region's
/// bounding index box, values rescaled to 0–255 over the data range; missing cells take the box's
/// mean of that frame.
/// </summary>
internal static class RegionVif
{
    public static double OfBox(Vif vif, RegionBox box, int gridColumns, ReadOnlySpan<float> a, ReadOnlySpan<float> b, DataRange range, double minValid)
    {
        if (box.Rows < Vif.MinimumSide || box.Columns < Vif.MinimumSide) return double.NaN;
        int n = box.Rows * box.Columns;
        var ra = new double[n];
        var rb = new double[n];
        double scale = 255 / range.Width;
        double suma = 0, sumb = 0;
        int valid = 0;
        for (int j = 0; j < box.Rows; j++)
            for (int i = 0; i < box.Columns; i++)
            {
                int cell = (box.FirstRow + j) * gridColumns + box.FirstColumn + i;
                float x = a[cell], y = b[cell];
                int k = j * box.Columns + i;
                if (float.IsNaN(x) || float.IsNaN(y)) { ra[k] = rb[k] = double.NaN; continue; }
                ra[k] = (x - range.Low) * scale;
                rb[k] = (y - range.Low) * scale;
                suma += ra[k]; sumb += rb[k]; valid++;
            }
        if (valid < minValid * n || valid == 0) return double.NaN;
        if (valid < n)
        {
            double ma = suma / valid, mb = sumb / valid;
            for (int k = 0; k < n; k++) if (double.IsNaN(ra[k])) { ra[k] = ma; rb[k] = mb; }
        }
        return vif.Compute(ra, rb, box.Rows, box.Columns);
    }
}
