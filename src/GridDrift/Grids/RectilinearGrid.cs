namespace GridDrift.Grids;

/// <summary>
/// Regular and irregular (e.g. Gaussian) latitude-longitude grids from their 1-D coordinates.
/// Cell edges come from bounds where the file has them, else from midpoints between centres,
/// the outermost edges half a step beyond the outermost centres and latitudes clamped to ±90°
/// (so a cell centred on a pole is a half cell). Areas are exact: R² Δλ (sin φ₂ − sin φ₁).
/// </summary>
internal static class RectilinearGrid
{
    public static Grid Build(double[] lat, double[] lon, double[]? latBounds = null, double[]? lonBounds = null,
        double radius = Sphere.MeanEarthRadius, bool columnsFirst = false)
    {
        if (lat.Length == 0 || lon.Length == 0) throw new ArgumentException("a grid needs at least one latitude and one longitude");
        if ((latBounds is not null && !Contiguous(latBounds, lat.Length)) || (lonBounds is not null && !Contiguous(lonBounds, lon.Length)))
            return FromOwnBounds(lat, lon, latBounds ?? Bounds(EdgesFromCentres(lat)), lonBounds ?? Bounds(EdgesFromCentres(lon)), radius, columnsFirst);
        var latEdges = latBounds is not null ? EdgesFromBounds(latBounds, lat.Length) : EdgesFromCentres(lat);
        for (int i = 0; i < latEdges.Length; i++) latEdges[i] = Math.Clamp(latEdges[i], -90, 90);
        var lonEdges = lonBounds is not null ? EdgesFromBounds(lonBounds, lon.Length) : EdgesFromCentres(lon);
        return Assemble(lat, lon, radius, columnsFirst,
            (j, i) => Math.Abs(Sphere.ZoneFactor(latEdges[j], latEdges[j + 1])) * Math.Abs(lonEdges[i + 1] - lonEdges[i]),
            latEdges, lonEdges, null, null);
    }

    /// <summary>Centres and exact areas (R² times <paramref name="unitArea"/>, in degrees of longitude) of every cell, and the grid they make.</summary>
    static Grid Assemble(double[] lat, double[] lon, double radius, bool columnsFirst, Func<int, int, double> unitArea,
        double[]? latEdges, double[]? lonEdges, double[]? cornerLat, double[]? cornerLon)
    {
        int ny = lat.Length, nx = lon.Length;
        return new Grid
        {
            Kind = HorizontalGrid.FromAxes(lat, lon).Kind,
            Rows = ny,
            Columns = nx,
            EarthRadius = radius,
            CenterLatOnDemand = () => PerCell(ny, nx, (j, _) => lat[j]),
            CenterLonOnDemand = () => PerCell(ny, nx, (_, i) => lon[i]),
            CellAreaOnDemand = () => PerCell(ny, nx, (j, i) => radius * radius * unitArea(j, i) * Math.PI / 180),
            RowLatitudes = lat,
            ColumnLongitudes = lon,
            LatEdges = latEdges,
            LonEdges = lonEdges,
            CornerLat = cornerLat,
            CornerLon = cornerLon,
            ColumnsFirst = columnsFirst,
        };
    }

    static double[] PerCell(int rows, int columns, Func<int, int, double> value)
    {
        var values = new double[rows * columns];
        for (int j = 0; j < rows; j++)
            for (int i = 0; i < columns; i++) values[j * columns + i] = value(j, i);
        return values;
    }

    /// <summary>
    /// Cells that do not touch (a subset taken with a stride keeps each cell's own CF bounds, CF
    /// §7.1): each cell's area comes from its own bounds, and the cell is given by its four
    /// corners, as on curvilinear grids, since no shared edges describe the grid.
    /// </summary>
    static Grid FromOwnBounds(double[] lat, double[] lon, double[] latBounds, double[] lonBounds, double radius, bool columnsFirst)
    {
        int ny = lat.Length, nx = lon.Length;
        double South(int j) => Math.Clamp(Math.Min(latBounds[2 * j], latBounds[2 * j + 1]), -90, 90);
        double North(int j) => Math.Clamp(Math.Max(latBounds[2 * j], latBounds[2 * j + 1]), -90, 90);
        double West(int i) => Math.Min(lonBounds[2 * i], lonBounds[2 * i + 1]);
        double East(int i) => Math.Max(lonBounds[2 * i], lonBounds[2 * i + 1]);
        var cornerLat = new double[4 * ny * nx];
        var cornerLon = new double[4 * ny * nx];
        for (int j = 0; j < ny; j++)
            for (int i = 0; i < nx; i++)
            {
                int c = 4 * (j * nx + i);
                (cornerLat[c], cornerLat[c + 1], cornerLat[c + 2], cornerLat[c + 3]) = (South(j), South(j), North(j), North(j));
                (cornerLon[c], cornerLon[c + 1], cornerLon[c + 2], cornerLon[c + 3]) = (West(i), East(i), East(i), West(i));
            }
        return Assemble(lat, lon, radius, columnsFirst, (j, i) => Sphere.ZoneFactor(South(j), North(j)) * (East(i) - West(i)), null, null, cornerLat, cornerLon);
    }

    /// <summary>Whether neighbouring cells share their edge (to a millionth of the axis' span).</summary>
    static bool Contiguous(double[] bounds, int n)
    {
        if (bounds.Length != 2 * n) return true; // left to EdgesFromBounds, which names the fault
        double span = Math.Abs(bounds.Max() - bounds.Min()), tolerance = 1e-6 * Math.Max(span, 1e-9);
        for (int i = 0; i + 1 < n; i++)
        {
            double a = bounds[2 * i], b = bounds[2 * i + 1], c = bounds[2 * i + 2], d = bounds[2 * i + 3];
            bool touch = Math.Abs(Math.Max(a, b) - Math.Min(c, d)) <= tolerance || Math.Abs(Math.Min(a, b) - Math.Max(c, d)) <= tolerance;
            if (!touch) return false;
        }
        return true;
    }

    static double[] Bounds(double[] edges) => Enumerable.Range(0, edges.Length - 1).SelectMany(i => new[] { edges[i], edges[i + 1] }).ToArray();

    /// <summary>Edges halfway between centres; the ends half a step out.</summary>
    public static double[] EdgesFromCentres(double[] c)
    {
        int n = c.Length;
        var e = new double[n + 1];
        if (n == 1)
        {
            e[0] = c[0] - 0.5;
            e[1] = c[0] + 0.5;
            return e;
        }
        for (int i = 1; i < n; i++) e[i] = 0.5 * (c[i - 1] + c[i]);
        e[0] = c[0] - 0.5 * (c[1] - c[0]);
        e[n] = c[n - 1] + 0.5 * (c[n - 1] - c[n - 2]);
        return e;
    }

    /// <summary>Edges from CF bounds (n × 2, CF §7.1): contiguous cells share their edges.</summary>
    static double[] EdgesFromBounds(double[] bounds, int n)
    {
        if (bounds.Length != 2 * n) throw new ArgumentException($"bounds have {bounds.Length} values for {n} cells");
        var e = new double[n + 1];
        bool ascending = n < 2 || bounds[2] >= bounds[0];
        for (int i = 0; i < n; i++) e[i] = ascending ? Math.Min(bounds[2 * i], bounds[2 * i + 1]) : Math.Max(bounds[2 * i], bounds[2 * i + 1]);
        e[n] = ascending ? Math.Max(bounds[2 * n - 2], bounds[2 * n - 1]) : Math.Min(bounds[2 * n - 2], bounds[2 * n - 1]);
        return e;
    }
}
