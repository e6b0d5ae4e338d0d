using GridDrift.Grids;

namespace GridDrift.Regions;

/// <summary>
/// Builds the <see cref="RegionMask"/> of a grid. Cover is exact where a box meets a rectilinear
/// (regular or Gaussian) grid: the part of cell [φ₁, φ₂] × [λ₁, λ₂] inside box [S, N] × [W, E]
/// is itself a latitude-longitude rectangle, of area R² Δλ∩ (sin min(φ₂, N) − sin max(φ₁, S)).
/// Polygons, and any region on a curvilinear or geostationary grid, are covered by sampling each
/// cell at K × K points (K = <see cref="SamplesPerSide"/>), each weighing its exact share of the
/// cell's area on rectilinear grids and an equal share otherwise: the fraction of a cut cell is
/// then within 1/K of the truth along each cut (about 1/(2K) on average), and cells wholly
/// inside or outside are exact.
/// </summary>
internal static class RegionMaskBuilder
{
    public const int SamplesPerSide = 8;

    public static RegionMask Build(Grid grid, IReadOnlyList<RegionShape> regions)
    {
        var rowStart = new int[regions.Count + 1];
        var cells = new List<int>();
        var areas = new List<double>();
        var fractions = new List<double>();
        var regionArea = new double[regions.Count];
        for (int r = 0; r < regions.Count; r++)
        {
            rowStart[r] = cells.Count;
            var entries = regions[r] switch
            {
                WholeDomain => Whole(grid),
                LatLonBox box when grid.IsRectilinear => ExactBox(grid, box),
                LatLonBox box => Sampled(grid, (lon, lat) => InBox(box, lon, lat)),
                PolygonRegion p => Sampled(grid, (lon, lat) => InPolygon(p, lon, lat)),
                _ => throw new ArgumentException($"unknown region type {regions[r].GetType().Name}"),
            };
            entries.Sort((a, b) => grid.FrameIndex(a.Row, a.Column).CompareTo(grid.FrameIndex(b.Row, b.Column)));
            foreach (var (row, column, area) in entries)
            {
                int cell = row * grid.Columns + column;
                cells.Add(grid.FrameIndex(row, column));
                areas.Add(area);
                fractions.Add(Math.Min(1, area / grid.CellArea[cell]));
                regionArea[r] += area;
            }
        }
        rowStart[^1] = cells.Count;
        return new RegionMask
        {
            Names = regions.Select(x => x.Name).ToArray(),
            RowStart = rowStart,
            Cells = cells.ToArray(),
            AreaInside = areas.ToArray(),
            Fraction = fractions.ToArray(),
            RegionArea = regionArea,
            EarthRadius = grid.EarthRadius,
        };
    }

    static List<(int Row, int Column, double Area)> Whole(Grid grid)
    {
        var list = new List<(int, int, double)>(grid.CellCount);
        for (int j = 0; j < grid.Rows; j++)
            for (int i = 0; i < grid.Columns; i++)
                if (grid.CellArea[j * grid.Columns + i] > 0) list.Add((j, i, grid.CellArea[j * grid.Columns + i]));
        return list;
    }

    static List<(int Row, int Column, double Area)> ExactBox(Grid grid, LatLonBox box)
    {
        var latEdges = grid.LatEdges!;
        var lonEdges = grid.LonEdges!;
        double r2 = grid.EarthRadius * grid.EarthRadius;
        var rowFactor = new double[grid.Rows];
        for (int j = 0; j < grid.Rows; j++)
        {
            double lo = Math.Min(latEdges[j], latEdges[j + 1]), hi = Math.Max(latEdges[j], latEdges[j + 1]);
            double s = Math.Max(lo, box.South), n = Math.Min(hi, box.North);
            rowFactor[j] = n > s ? Sphere.ZoneFactor(s, n) : 0;
        }
        var columnOverlap = new double[grid.Columns];
        double east = box.EastUnwrapped;
        for (int i = 0; i < grid.Columns; i++)
        {
            double w = Math.Min(lonEdges[i], lonEdges[i + 1]), e = Math.Max(lonEdges[i], lonEdges[i + 1]);
            columnOverlap[i] = Sphere.LongitudeOverlap(w, e, box.West, east) * Math.PI / 180;
        }
        var list = new List<(int, int, double)>();
        for (int j = 0; j < grid.Rows; j++)
        {
            if (rowFactor[j] <= 0) continue;
            for (int i = 0; i < grid.Columns; i++)
                if (columnOverlap[i] > 0) list.Add((j, i, r2 * rowFactor[j] * columnOverlap[i]));
        }
        return list;
    }

    static bool InBox(LatLonBox box, double lon, double lat)
    {
        if (lat < box.South || lat > box.North) return false;
        double d = lon - box.West;
        d -= 360 * Math.Floor(d / 360);
        return d <= box.EastUnwrapped - box.West;
    }

    /// <summary>Even-odd rule on the rings, in longitude/latitude (RFC 7946 §3.1.1: edges are straight lines in lon/lat).</summary>
    static bool InPolygon(PolygonRegion region, double lon, double lat)
    {
        foreach (var polygon in region.Polygons)
        {
            for (int shift = -1; shift <= 1; shift++)
            {
                double x = lon + 360 * shift;
                bool inside = false;
                foreach (var ring in polygon)
                    inside ^= InRing(ring, x, lat);
                if (inside) return true;
            }
        }
        return false;
    }

    static bool InRing((double Lon, double Lat)[] ring, double x, double y)
    {
        bool inside = false;
        for (int i = 0, j = ring.Length - 1; i < ring.Length; j = i++)
        {
            var (xi, yi) = ring[i];
            var (xj, yj) = ring[j];
            if ((yi > y) != (yj > y) && x < (xj - xi) * (y - yi) / (yj - yi) + xi) inside = !inside;
        }
        return inside;
    }

    static List<(int Row, int Column, double Area)> Sampled(Grid grid, Func<double, double, bool> inside)
    {
        var list = new List<(int, int, double)>();
        int k = SamplesPerSide;
        for (int j = 0; j < grid.Rows; j++)
            for (int i = 0; i < grid.Columns; i++)
            {
                int cell = j * grid.Columns + i;
                if (grid.CellArea[cell] <= 0) continue;
                double covered = grid.IsRectilinear ? SampleRectangle(grid, j, i, k, inside) : SampleQuadrilateral(grid, cell, k, inside);
                if (covered > 0) list.Add((j, i, covered * grid.CellArea[cell]));
            }
        return list;
    }

    static double SampleRectangle(Grid grid, int j, int i, int k, Func<double, double, bool> inside)
    {
        double la = grid.LatEdges![j], lb = grid.LatEdges[j + 1], wa = grid.LonEdges![i], wb = grid.LonEdges[i + 1];
        double total = Math.Abs(Sphere.ZoneFactor(la, lb));
        double covered = 0;
        for (int p = 0; p < k; p++)
        {
            double l0 = la + (lb - la) * p / k, l1 = la + (lb - la) * (p + 1) / k;
            double weight = Math.Abs(Sphere.ZoneFactor(l0, l1)) / total / k;
            double lat = 0.5 * (l0 + l1);
            for (int q = 0; q < k; q++)
                if (inside(wa + (wb - wa) * (q + 0.5) / k, lat)) covered += weight;
        }
        return covered;
    }

    static double SampleQuadrilateral(Grid grid, int cell, int k, Func<double, double, bool> inside)
    {
        var c = new (double X, double Y, double Z)[4];
        for (int m = 0; m < 4; m++) c[m] = Sphere.UnitVector(grid.CornerLat![4 * cell + m], grid.CornerLon![4 * cell + m]);
        int hits = 0;
        for (int p = 0; p < k; p++)
            for (int q = 0; q < k; q++)
            {
                double u = (q + 0.5) / k, v = (p + 0.5) / k;
                // bilinear in the corners (0: u=0,v=0; 1: u=1,v=0; 2: u=1,v=1; 3: u=0,v=1)
                double x = (1 - u) * (1 - v) * c[0].X + u * (1 - v) * c[1].X + u * v * c[2].X + (1 - u) * v * c[3].X;
                double y = (1 - u) * (1 - v) * c[0].Y + u * (1 - v) * c[1].Y + u * v * c[2].Y + (1 - u) * v * c[3].Y;
                double z = (1 - u) * (1 - v) * c[0].Z + u * (1 - v) * c[1].Z + u * v * c[2].Z + (1 - u) * v * c[3].Z;
                var (lat, lon) = Sphere.LatLon((x, y, z));
                if (inside(lon, lat)) hits++;
            }
        return hits / (double)(k * k);
    }
}
