namespace GridDrift.Grids.Regridding;

/// <summary>
/// First-order conservative remapping between latitude-longitude grids (regular or Gaussian):
/// the weight of a source cell in a target cell is the exact spherical area of their overlap,
/// R² Δλ_overlap (sin φ₂ − sin φ₁)_overlap, with longitudes overlapping on the circle. The target
/// value is the overlap-area-weighted mean of the valid source cells, so a constant field stays
/// exact and the area integral over fully covered cells is preserved.
/// </summary>
public static class ConservativeRemap
{
    public static RemapWeights Build(Grid source, Grid target)
    {
        if (!source.IsRectilinear || !target.IsRectilinear)
            throw new NotSupportedException("conservative remapping needs latitude-longitude grids on both sides (curvilinear sources are not supported yet)");
        double r2 = target.EarthRadius * target.EarthRadius;
        var rows = new List<(int Row, double SinOverlap)>[target.Rows];
        for (int jt = 0; jt < target.Rows; jt++)
        {
            rows[jt] = [];
            double t0 = Math.Min(target.LatEdges![jt], target.LatEdges[jt + 1]), t1 = Math.Max(target.LatEdges[jt], target.LatEdges[jt + 1]);
            for (int js = 0; js < source.Rows; js++)
            {
                double s0 = Math.Min(source.LatEdges![js], source.LatEdges[js + 1]), s1 = Math.Max(source.LatEdges[js], source.LatEdges[js + 1]);
                double lo = Math.Max(t0, s0), hi = Math.Min(t1, s1);
                if (hi > lo) rows[jt].Add((js, Math.Sin(hi * Math.PI / 180) - Math.Sin(lo * Math.PI / 180)));
            }
        }
        var columns = new List<(int Column, double Degrees)>[target.Columns];
        for (int it = 0; it < target.Columns; it++)
        {
            columns[it] = [];
            double w0 = Math.Min(target.LonEdges![it], target.LonEdges[it + 1]), e0 = Math.Max(target.LonEdges[it], target.LonEdges[it + 1]);
            for (int isrc = 0; isrc < source.Columns; isrc++)
            {
                double w1 = Math.Min(source.LonEdges![isrc], source.LonEdges[isrc + 1]), e1 = Math.Max(source.LonEdges[isrc], source.LonEdges[isrc + 1]);
                double overlap = Sphere.LongitudeOverlap(w0, e0, w1, e1);
                if (overlap > 1e-12) columns[it].Add((isrc, overlap));
            }
        }
        var rowStart = new int[target.CellCount + 1];
        var column = new List<int>();
        var weight = new List<double>();
        var full = new double[target.CellCount];
        for (int jt = 0; jt < target.Rows; jt++)
            for (int it = 0; it < target.Columns; it++)
            {
                int t = jt * target.Columns + it;
                rowStart[t] = column.Count;
                foreach (var (js, sin) in rows[jt])
                    foreach (var (isrc, degrees) in columns[it])
                    {
                        column.Add(source.FrameIndex(js, isrc));
                        weight.Add(r2 * sin * degrees * Math.PI / 180);
                    }
                full[t] = target.CellArea[t];
            }
        rowStart[target.CellCount] = column.Count;
        return new RemapWeights
        {
            SourceCells = source.CellCount, TargetCells = target.CellCount, RowStart = rowStart, Column = column.ToArray(), Weight = weight.ToArray(),
            TargetWeight = full, Method = "conservative (first order, exact spherical overlap areas)",
        };
    }
}
