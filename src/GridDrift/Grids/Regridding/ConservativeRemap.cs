namespace GridDrift.Grids.Regridding;

/// <summary>
/// First-order conservative remapping between latitude-longitude grids (regular or Gaussian):
/// the weight of a source cell in a target cell is the exact spherical area of their overlap,
/// R² Δλ_overlap (sin φ₂ − sin φ₁)_overlap, with longitudes overlapping on the circle. The target
/// value is the overlap-area-weighted mean of the valid source cells, so a constant field stays
/// exact and the area integral over fully covered cells is preserved.
/// Curvilinear sources (cells given by four corners) are split into 8 × 8 sub-cells, bilinear in
/// the corners' unit vectors; each carries 1/64 of the source cell's exact spherical area and
/// goes to the target cell holding its centre. The source integral is kept exactly; the overlap
/// areas are approximate, to the sub-cell size.
/// </summary>
internal static class ConservativeRemap
{
    public const int SamplesPerSide = 8;

    public static RemapWeights Build(Grid source, Grid target)
    {
        if (!target.IsRectilinear)
            throw new NotSupportedException("conservative remapping needs a latitude-longitude target grid");
        if (!source.IsRectilinear)
            return source.CornerLat is not null ? FromCorners(source, target)
                : throw new NotSupportedException("conservative remapping of this source needs its cell corners (a curvilinear grid), which it lacks");
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
                if (hi > lo) rows[jt].Add((js, Sphere.ZoneFactor(lo, hi)));
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

    static RemapWeights FromCorners(Grid source, Grid target)
    {
        int k = SamplesPerSide;
        var latEdges = target.LatEdges!;
        var lonEdges = target.LonEdges!;
        bool descending = latEdges[^1] < latEdges[0];
        var rows = new Dictionary<int, double>[target.CellCount];
        var c = new (double X, double Y, double Z)[4];
        for (int j = 0; j < source.Rows; j++)
            for (int i = 0; i < source.Columns; i++)
            {
                int cell = j * source.Columns + i;
                double area = source.CellArea[cell];
                if (!(area > 0) || double.IsNaN(source.CornerLat![4 * cell])) continue;
                for (int m = 0; m < 4; m++) c[m] = Sphere.UnitVector(source.CornerLat[4 * cell + m], source.CornerLon![4 * cell + m]);
                int frame = source.FrameIndex(j, i);
                double share = area / (k * k);
                for (int p = 0; p < k; p++)
                    for (int q = 0; q < k; q++)
                    {
                        double u = (q + 0.5) / k, v = (p + 0.5) / k;
                        double x = (1 - u) * (1 - v) * c[0].X + u * (1 - v) * c[1].X + u * v * c[2].X + (1 - u) * v * c[3].X;
                        double y = (1 - u) * (1 - v) * c[0].Y + u * (1 - v) * c[1].Y + u * v * c[2].Y + (1 - u) * v * c[3].Y;
                        double z = (1 - u) * (1 - v) * c[0].Z + u * (1 - v) * c[1].Z + u * v * c[2].Z + (1 - u) * v * c[3].Z;
                        var (lat, lon) = Sphere.LatLon((x, y, z));
                        int jt = Interval(latEdges, lat, descending), it = LongitudeInterval(lonEdges, lon);
                        if (jt < 0 || it < 0) continue;
                        int t = jt * target.Columns + it;
                        var row = rows[t] ??= [];
                        row[frame] = row.GetValueOrDefault(frame) + share;
                    }
            }
        var rowStart = new int[target.CellCount + 1];
        var column = new List<int>();
        var weight = new List<double>();
        for (int t = 0; t < target.CellCount; t++)
        {
            rowStart[t] = column.Count;
            if (rows[t] is { } row)
                foreach (var (frame, w) in row.OrderBy(e => e.Key)) { column.Add(frame); weight.Add(w); }
        }
        rowStart[target.CellCount] = column.Count;
        return new RemapWeights
        {
            SourceCells = source.CellCount, TargetCells = target.CellCount, RowStart = rowStart, Column = column.ToArray(), Weight = weight.ToArray(),
            TargetWeight = target.CellArea.ToArray(), Method = $"conservative (curvilinear source: {k} x {k} sub-cells per source cell, each 1/{k * k} of its exact area, assigned by centre)",
        };
    }

    /// <summary>The interval of monotonic edges holding x, or −1 outside.</summary>
    static int Interval(double[] edges, double x, bool descending)
    {
        int n = edges.Length - 1;
        for (int lo = 0, hi = n - 1; lo <= hi;)
        {
            int mid = (lo + hi) / 2;
            double a = Math.Min(edges[mid], edges[mid + 1]), b = Math.Max(edges[mid], edges[mid + 1]);
            if (x < a) { if (descending) lo = mid + 1; else hi = mid - 1; }
            else if (x > b) { if (descending) hi = mid - 1; else lo = mid + 1; }
            else return mid;
        }
        return -1;
    }

    static int LongitudeInterval(double[] edges, double lon)
    {
        double start = Math.Min(edges[0], edges[^1]);
        double x = start + (((lon - start) % 360) + 360) % 360;
        return Interval(edges, x, edges[^1] < edges[0]);
    }
}
