using GridDrift.Grids;

namespace GridDrift.Regions;

/// <summary>
/// The fast path for latitude-longitude boxes (global, bands, tiles, boxes) on rectilinear grids,
/// where the area of cell (j, i) inside box b factorises: R² · Δsinφ_j(b) · Δλ_i(b). A frame is
/// then reduced row by row: for every distinct longitude range of the boxes, one contiguous pass
/// over the row's columns gives the partial sums Σ Δλ, Σ Δλ·d, Σ Δλ·d² (d = x − shift, float64)
/// and the extremes of the valid cells; each box then adds up R²·Δsinφ_j(b) times its range's
/// partial sums over its rows. Every cell is read once per distinct longitude range (twice for
/// global + bands + tiles), contiguously, instead of once per region through an index.
/// </summary>
internal sealed class SeparablePlan
{
    internal sealed record LonRange(int First, int Count, double[] Width);
    internal sealed record Box(int Range, int FirstRow, double[] RowFactor);

    internal LonRange[] Ranges { get; }
    internal Box[] Boxes { get; }
    internal int Rows { get; }
    internal int Columns { get; }
    internal bool ColumnsFirst { get; }
    internal double RadiusSquared { get; }

    SeparablePlan(LonRange[] ranges, Box[] boxes, Grid grid)
    {
        Ranges = ranges;
        Boxes = boxes;
        Rows = grid.Rows;
        Columns = grid.Columns;
        ColumnsFirst = grid.ColumnsFirst;
        RadiusSquared = grid.EarthRadius * grid.EarthRadius;
    }

    /// <summary>Each box's area on the sphere, m²: R² Σ_j Δsinφ_j(b) · Σ_i Δλ_i(b), as the cells' areas inside it add up.</summary>
    public double[] BoxAreas() => Boxes.Select(b =>
    {
        double across = Ranges[b.Range].Width.Where(w => w > 0).Sum();
        return RadiusSquared * b.RowFactor.Sum() * across;
    }).ToArray();

    /// <summary>Cells a box covers at most (its rows × its range's columns).</summary>
    public int CellsOf(int box) => Boxes[box].RowFactor.Length * Ranges[Boxes[box].Range].Count;

    /// <summary>A plan for the regions, or null when a region is not a box or the grid is not rectilinear.</summary>
    public static SeparablePlan? TryBuild(Grid grid, IReadOnlyList<RegionShape> regions)
    {
        if (!grid.IsRectilinear || grid.ColumnsFirst) return null;
        var lat = grid.LatEdges!;
        var lon = grid.LonEdges!;
        var ranges = new List<LonRange>();
        var keys = new Dictionary<string, int>();
        var boxes = new List<Box>();
        foreach (var region in regions)
        {
            double south, north;
            double[] width = new double[grid.Columns];
            switch (region)
            {
                case WholeDomain:
                    south = -90;
                    north = 90;
                    for (int i = 0; i < width.Length; i++) width[i] = Math.Abs(lon[i + 1] - lon[i]) * Math.PI / 180;
                    break;
                case LatLonBox b:
                    south = b.South;
                    north = b.North;
                    for (int i = 0; i < width.Length; i++)
                        width[i] = Sphere.LongitudeOverlap(Math.Min(lon[i], lon[i + 1]), Math.Max(lon[i], lon[i + 1]), b.West, b.EastUnwrapped) * Math.PI / 180;
                    break;
                default:
                    return null;
            }
            int first = Array.FindIndex(width, w => w > 0), last = Array.FindLastIndex(width, w => w > 0);
            if (first < 0) { first = 0; last = -1; }
            var trimmed = width[first..(last + 1)];
            string key = first + ":" + string.Join(",", trimmed.Select(w => BitConverter.DoubleToInt64Bits(w)));
            if (!keys.TryGetValue(key, out int range))
            {
                range = ranges.Count;
                keys[key] = range;
                ranges.Add(new LonRange(first, trimmed.Length, trimmed));
            }
            var factor = new double[grid.Rows];
            for (int j = 0; j < grid.Rows; j++)
            {
                double lo = Math.Min(lat[j], lat[j + 1]), hi = Math.Max(lat[j], lat[j + 1]);
                double s = Math.Max(lo, south), n = Math.Min(hi, north);
                factor[j] = n > s ? Sphere.ZoneFactor(s, n) : 0;
            }
            int firstRow = Array.FindIndex(factor, f => f > 0), lastRow = Array.FindLastIndex(factor, f => f > 0);
            if (firstRow < 0) { firstRow = 0; lastRow = -1; }
            boxes.Add(new Box(range, firstRow, factor[firstRow..(lastRow + 1)]));
        }
        return new SeparablePlan(ranges.ToArray(), boxes.ToArray(), grid);
    }
}
