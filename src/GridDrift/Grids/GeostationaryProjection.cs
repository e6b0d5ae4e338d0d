namespace GridDrift.Grids;

/// <summary>
/// The CF <c>geostationary</c> grid mapping (CF Conventions Appendix F): pixel scan angles x, y
/// (radians; y positive northward) to geodetic latitude and longitude, by the inverse navigation
/// of the CGMS LRIT/HRIT Global Specification §4.4.3.2: the line of sight from the satellite at
/// distance H = perspective_point_height + semi_major_axis from the Earth's centre is intersected
/// with the ellipsoid; no intersection means the pixel is off the Earth's disk. With
/// sweep_angle_axis = "y" (the CGMS/MSG convention) the line of sight is
/// (−cos x cos y, sin x cos y, sin y); with "x" (GOES-R) it is (−cos x cos y, sin x, cos x sin y).
/// </summary>
internal sealed record GeostationaryProjection(double PerspectivePointHeight, double SemiMajorAxis, double SemiMinorAxis,
    double LongitudeOfProjectionOrigin, string SweepAngleAxis = "y")
{
    public double SatelliteDistance => PerspectivePointHeight + SemiMajorAxis;

    /// <summary>Geodetic latitude and longitude (degrees) of the pixel at scan angles (x, y), or null off the disk.</summary>
    public (double Lat, double Lon)? ToLatLon(double x, double y)
    {
        double dx = -Math.Cos(x) * Math.Cos(y);
        double dy, dz;
        if (SweepAngleAxis == "x")
        {
            dy = Math.Sin(x);
            dz = Math.Cos(x) * Math.Sin(y);
        }
        else
        {
            dy = Math.Sin(x) * Math.Cos(y);
            dz = Math.Sin(y);
        }
        double e2 = SemiMajorAxis * SemiMajorAxis / (SemiMinorAxis * SemiMinorAxis);
        double h = SatelliteDistance;
        double a = dx * dx + dy * dy + e2 * dz * dz;
        double b = 2 * h * dx;
        double c = h * h - SemiMajorAxis * SemiMajorAxis;
        double discriminant = b * b - 4 * a * c;
        if (discriminant < 0) return null;
        double k = (-b - Math.Sqrt(discriminant)) / (2 * a);
        double px = h + k * dx, py = k * dy, pz = k * dz;
        double lon = LongitudeOfProjectionOrigin + Math.Atan2(py, px) * 180 / Math.PI;
        double lat = Math.Atan(e2 * pz / Math.Sqrt(px * px + py * py)) * 180 / Math.PI;
        if (lon > 180) lon -= 360;
        if (lon < -180) lon += 360;
        return (lat, lon);
    }

    /// <summary>
    /// A geostationary grid: centres from the pixel scan angles, corners from the scan angles
    /// halfway between pixels, areas of the spherical quadrilaterals; pixels whose centre or any
    /// corner lies off the disk are invalid (area 0).
    /// </summary>
    public Grid BuildGrid(double[] x, double[] y, double radius = Sphere.MeanEarthRadius)
    {
        int rows = y.Length, columns = x.Length, n = rows * columns;
        var lat = new double[n];
        var lon = new double[n];
        var valid = new bool[n];
        var xe = RectilinearGrid.EdgesFromCentres(x);
        var ye = RectilinearGrid.EdgesFromCentres(y);
        var cornerLat = new double[4 * n];
        var cornerLon = new double[4 * n];
        for (int j = 0; j < rows; j++)
            for (int i = 0; i < columns; i++)
            {
                int cell = j * columns + i;
                var centre = ToLatLon(x[i], y[j]);
                lat[cell] = centre?.Lat ?? double.NaN;
                lon[cell] = centre?.Lon ?? double.NaN;
                valid[cell] = centre is not null;
                (double, double)[] corners = [(xe[i], ye[j]), (xe[i + 1], ye[j]), (xe[i + 1], ye[j + 1]), (xe[i], ye[j + 1])];
                for (int k = 0; k < 4; k++)
                {
                    var p = ToLatLon(corners[k].Item1, corners[k].Item2);
                    valid[cell] &= p is not null;
                    cornerLat[4 * cell + k] = p?.Lat ?? double.NaN;
                    cornerLon[4 * cell + k] = p?.Lon ?? double.NaN;
                }
            }
        return CurvilinearGrid.Build(lat, lon, rows, columns, cornerLat, cornerLon, radius, GridKind.Geostationary, valid);
    }
}
