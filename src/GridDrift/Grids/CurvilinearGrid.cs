namespace GridDrift.Grids;

/// <summary>
/// Grids with 2-D latitude and longitude (CF §5.2). Each cell is the spherical quadrilateral of
/// its four corners: from the CF bounds variable (ny × nx × 4, §7.1) where the file has one, else
/// the normalised mean of the unit vectors of the four surrounding centres (centres extrapolated
/// one row or column outward at the edges). That corner rule is exact where cell edges lie
/// halfway between centres and in error by O(h²) of the cell size h on smoothly varying grids;
/// the area of the quadrilateral itself is exact on the sphere (great-circle edges).
/// </summary>
internal static class CurvilinearGrid
{
    public static Grid Build(double[] lat2d, double[] lon2d, int rows, int columns, double[]? cornerLat = null, double[]? cornerLon = null,
        double radius = Sphere.MeanEarthRadius, GridKind kind = GridKind.Curvilinear, bool[]? valid = null)
    {
        int n = rows * columns;
        if (lat2d.Length != n || lon2d.Length != n) throw new ArgumentException("2-D coordinates do not match the grid shape");
        if (cornerLat is null || cornerLon is null) (cornerLat, cornerLon) = CornersFromCentres(lat2d, lon2d, rows, columns, valid);
        var area = new double[n];
        Span<double> la = stackalloc double[4];
        Span<double> lo = stackalloc double[4];
        for (int c = 0; c < n; c++)
        {
            if (valid is not null && !valid[c]) continue;
            bool finite = true;
            for (int k = 0; k < 4; k++)
            {
                la[k] = cornerLat[4 * c + k];
                lo[k] = cornerLon[4 * c + k];
                finite &= double.IsFinite(la[k]) && double.IsFinite(lo[k]);
            }
            area[c] = finite ? Sphere.PolygonArea(la, lo, radius) : 0;
        }
        return new Grid
        {
            Kind = kind,
            Rows = rows,
            Columns = columns,
            EarthRadius = radius,
            CenterLat = lat2d,
            CenterLon = lon2d,
            CellArea = area,
            CornerLat = cornerLat,
            CornerLon = cornerLon,
        };
    }

    /// <summary>Four corners per cell, counter-clockwise in index space: (j−½,i−½), (j−½,i+½), (j+½,i+½), (j+½,i−½).</summary>
    public static (double[] Lat, double[] Lon) CornersFromCentres(double[] lat2d, double[] lon2d, int rows, int columns, bool[]? valid = null)
    {
        // centres as unit vectors, padded by one on every side with linear extrapolation
        int pr = rows + 2, pc = columns + 2;
        var v = new (double X, double Y, double Z)[pr * pc];
        for (int j = 0; j < rows; j++)
            for (int i = 0; i < columns; i++)
            {
                int c = j * columns + i;
                v[(j + 1) * pc + i + 1] = valid is not null && !valid[c] || !double.IsFinite(lat2d[c])
                    ? (double.NaN, double.NaN, double.NaN) : Sphere.UnitVector(lat2d[c], lon2d[c]);
            }
        static (double, double, double) Extrapolate((double X, double Y, double Z) a, (double X, double Y, double Z) b) =>
            (2 * a.X - b.X, 2 * a.Y - b.Y, 2 * a.Z - b.Z);
        for (int j = 1; j <= rows; j++)
        {
            v[j * pc] = columns > 1 ? Extrapolate(v[j * pc + 1], v[j * pc + 2]) : v[j * pc + 1];
            v[j * pc + pc - 1] = columns > 1 ? Extrapolate(v[j * pc + pc - 2], v[j * pc + pc - 3]) : v[j * pc + pc - 2];
        }
        for (int i = 0; i < pc; i++)
        {
            v[i] = rows > 1 ? Extrapolate(v[pc + i], v[2 * pc + i]) : v[pc + i];
            v[(pr - 1) * pc + i] = rows > 1 ? Extrapolate(v[(pr - 2) * pc + i], v[(pr - 3) * pc + i]) : v[(pr - 2) * pc + i];
        }
        // corner (j, i) of the (rows+1) × (columns+1) corner grid: mean of the four padded centres around it
        var cornerGridLat = new double[(rows + 1) * (columns + 1)];
        var cornerGridLon = new double[(rows + 1) * (columns + 1)];
        for (int j = 0; j <= rows; j++)
            for (int i = 0; i <= columns; i++)
            {
                var a = v[j * pc + i];
                var b = v[j * pc + i + 1];
                var c = v[(j + 1) * pc + i];
                var d = v[(j + 1) * pc + i + 1];
                var (lat, lon) = Sphere.LatLon((a.X + b.X + c.X + d.X, a.Y + b.Y + c.Y + d.Y, a.Z + b.Z + c.Z + d.Z));
                cornerGridLat[j * (columns + 1) + i] = lat;
                cornerGridLon[j * (columns + 1) + i] = lon;
            }
        var cornerLat = new double[4 * rows * columns];
        var cornerLon = new double[4 * rows * columns];
        for (int j = 0; j < rows; j++)
            for (int i = 0; i < columns; i++)
            {
                int cell = j * columns + i;
                int[] corners = [j * (columns + 1) + i, j * (columns + 1) + i + 1, (j + 1) * (columns + 1) + i + 1, (j + 1) * (columns + 1) + i];
                for (int k = 0; k < 4; k++)
                {
                    cornerLat[4 * cell + k] = cornerGridLat[corners[k]];
                    cornerLon[4 * cell + k] = cornerGridLon[corners[k]];
                }
            }
        return (cornerLat, cornerLon);
    }
}
