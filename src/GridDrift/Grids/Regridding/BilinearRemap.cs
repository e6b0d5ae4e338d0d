namespace GridDrift.Grids.Regridding;

/// <summary>
/// Bilinear interpolation between latitude-longitude grids, in latitude and longitude degrees.
/// Longitude is periodic when the source covers the whole circle (the interval between its last
/// and first column, across the date line or the 0° meridian, is interpolated like any other);
/// otherwise targets outside the source's longitudes get no value. Beyond the outermost source
/// latitudes (towards the poles) the outermost row is used, interpolated in longitude only.
/// </summary>
internal static class BilinearRemap
{
    public static RemapWeights Build(Grid source, Grid target)
    {
        if (!source.IsRectilinear || !target.IsRectilinear)
            throw new NotSupportedException("bilinear remapping needs latitude-longitude grids on both sides (curvilinear sources are not supported yet)");
        var lat = Enumerable.Range(0, source.Rows).Select(j => source.CenterLat[j * source.Columns]).ToArray();
        var lon = Enumerable.Range(0, source.Columns).Select(i => source.CenterLon[i]).ToArray();
        var latOrder = Enumerable.Range(0, lat.Length).OrderBy(j => lat[j]).ToArray();
        var sortedLat = latOrder.Select(j => lat[j]).ToArray();
        var lonOrder = Enumerable.Range(0, lon.Length).OrderBy(i => Wrap(lon[i])).ToArray();
        var sortedLon = lonOrder.Select(i => Wrap(lon[i])).ToArray();
        double span = Math.Abs(source.LonEdges![^1] - source.LonEdges[0]);
        bool periodic = span >= 360 - 1e-6;

        var rowStart = new int[target.CellCount + 1];
        var column = new List<int>();
        var weight = new List<double>();
        for (int jt = 0; jt < target.Rows; jt++)
            for (int it = 0; it < target.Columns; it++)
            {
                int t = jt * target.Columns + it;
                rowStart[t] = column.Count;
                double phi = target.CenterLat[t], lambda = Wrap(target.CenterLon[t]);
                var (j0, j1, b) = Bracket(sortedLat, phi, periodic: false);
                var (i0, i1, a) = Bracket(sortedLon, lambda, periodic, outsideMissing: true);
                if (i0 < 0) continue; // outside a limited-area source
                foreach (var (jj, wj) in new[] { (j0, 1 - b), (j1, b) })
                    foreach (var (ii, wi) in new[] { (i0, 1 - a), (i1, a) })
                        if (wj * wi > 0)
                        {
                            column.Add(source.FrameIndex(latOrder[jj], lonOrder[ii]));
                            weight.Add(wj * wi);
                        }
            }
        rowStart[target.CellCount] = column.Count;
        return new RemapWeights
        {
            SourceCells = source.CellCount, TargetCells = target.CellCount, RowStart = rowStart, Column = column.ToArray(), Weight = weight.ToArray(),
            TargetWeight = Enumerable.Repeat(1.0, target.CellCount).ToArray(), Method = "bilinear in latitude and longitude" + (periodic ? ", periodic in longitude" : ""),
        };
    }

    static double Wrap(double lon) => ((lon % 360) + 360) % 360;

    /// <summary>Indices below and above x in an ascending array and the fraction between them; clamped (or wrapped) at the ends.</summary>
    static (int Low, int High, double Fraction) Bracket(double[] sorted, double x, bool periodic, bool outsideMissing = false)
    {
        int n = sorted.Length;
        if (n == 1) return (0, 0, 0);
        int k = Array.BinarySearch(sorted, x);
        if (k >= 0) return (k, k, 0);
        k = ~k; // first index above x
        if (k == 0 || k == n)
        {
            if (!periodic) return outsideMissing ? (-1, -1, 0) : k == 0 ? (0, 0, 0) : (n - 1, n - 1, 0);
            double low = sorted[n - 1], high = sorted[0] + 360, v = k == 0 ? x + 360 : x;
            return (n - 1, 0, (v - low) / (high - low));
        }
        return (k - 1, k, (x - sorted[k - 1]) / (sorted[k] - sorted[k - 1]));
    }
}
