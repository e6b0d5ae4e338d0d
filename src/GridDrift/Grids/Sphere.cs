namespace GridDrift.Grids;

/// <summary>
/// Areas on a sphere of radius R. A latitude-longitude rectangle has the exact area
/// A = R² Δλ (sin φ₂ − sin φ₁) (the zone-area formula of Archimedes, Δλ in radians); a polygon
/// with great-circle edges has area R² × its spherical excess, summed over a fan of triangles
/// with the formula of Van Oosterom & Strackee (1983, IEEE Trans. Biomed. Eng. 30(2): 125) for
/// the solid angle of a triangle, tan(E/2) = a·(b×c) / (1 + a·b + b·c + c·a).
/// </summary>
internal static class Sphere
{
    /// <summary>IUGG mean Earth radius R₁ = (2a + b)/3 of GRS80 (Moritz 2000, Journal of Geodesy 74: 128), in metres.</summary>
    public const double MeanEarthRadius = 6_371_008.8;

    const double Deg = Math.PI / 180;

    /// <summary>
    /// sin φ₂ − sin φ₁: the latitude factor of every latitude-longitude cell's area, the one place
    /// it is computed (a rectangle's area is R² × Δλ in radians × this).
    /// </summary>
    public static double ZoneFactor(double southDegrees, double northDegrees) => Math.Sin(northDegrees * Math.PI / 180) - Math.Sin(southDegrees * Math.PI / 180);

    /// <summary>Area of the rectangle between two latitudes and spanning <paramref name="deltaLonDegrees"/> of longitude.</summary>
    public static double RectangleArea(double lat1, double lat2, double deltaLonDegrees, double radius) =>
        radius * radius * Math.Abs(deltaLonDegrees) * Deg * Math.Abs(ZoneFactor(lat1, lat2));

    public static (double X, double Y, double Z) UnitVector(double latDegrees, double lonDegrees)
    {
        double phi = latDegrees * Deg, lam = lonDegrees * Deg;
        double c = Math.Cos(phi);
        return (c * Math.Cos(lam), c * Math.Sin(lam), Math.Sin(phi));
    }

    public static (double Lat, double Lon) LatLon((double X, double Y, double Z) v)
    {
        double n = Math.Sqrt(v.X * v.X + v.Y * v.Y + v.Z * v.Z);
        return (Math.Asin(Math.Clamp(v.Z / n, -1, 1)) / Deg, Math.Atan2(v.Y, v.X) / Deg);
    }

    /// <summary>Solid angle (steradians) of the spherical triangle a, b, c (unit vectors), signed by orientation.</summary>
    public static double TriangleExcess((double X, double Y, double Z) a, (double X, double Y, double Z) b, (double X, double Y, double Z) c)
    {
        double triple = a.X * (b.Y * c.Z - b.Z * c.Y) - a.Y * (b.X * c.Z - b.Z * c.X) + a.Z * (b.X * c.Y - b.Y * c.X);
        double denominator = 1 + Dot(a, b) + Dot(b, c) + Dot(c, a);
        return 2 * Math.Atan2(triple, denominator);
    }

    /// <summary>Area of a spherical polygon with great-circle edges (vertices in order, either orientation).</summary>
    public static double PolygonArea(ReadOnlySpan<double> latDegrees, ReadOnlySpan<double> lonDegrees, double radius)
    {
        if (latDegrees.Length < 3) return 0;
        var a = UnitVector(latDegrees[0], lonDegrees[0]);
        double excess = 0;
        for (int i = 1; i + 1 < latDegrees.Length; i++)
            excess += TriangleExcess(a, UnitVector(latDegrees[i], lonDegrees[i]), UnitVector(latDegrees[i + 1], lonDegrees[i + 1]));
        return Math.Abs(excess) * radius * radius;
    }

    static double Dot((double X, double Y, double Z) a, (double X, double Y, double Z) b) => a.X * b.X + a.Y * b.Y + a.Z * b.Z;

    /// <summary>The overlap, in degrees, of two longitude intervals on the circle (each given west to east, width ≤ 360).</summary>
    public static double LongitudeOverlap(double west1, double east1, double west2, double east2)
    {
        double width1 = east1 - west1, width2 = east2 - west2;
        if (width1 >= 360 - 1e-9) return Math.Min(width2, 360);
        if (width2 >= 360 - 1e-9) return Math.Min(width1, 360);
        double overlap = 0;
        long first = (long)Math.Floor((west1 - east2) / 360), last = (long)Math.Ceiling((east1 - west2) / 360);
        for (long k = first; k <= last; k++)
            overlap += Math.Max(0, Math.Min(east1, east2 + 360 * k) - Math.Max(west1, west2 + 360 * k));
        return overlap;
    }
}
