using System.Globalization;

namespace GridDrift.Grids.Regridding;

/// <summary>
/// Target grid specs: `regular:D` or `regular:DLATxDLON` — cell edges at ±90° and at longitude
/// 0, DLON, 2·DLON …, so centres at −90 + DLAT/2 … and DLON/2 … (DESIGN.md).
/// </summary>
internal static class TargetGrids
{
    public static Grid? TryParse(string spec, double radius = Sphere.MeanEarthRadius)
    {
        if (!spec.StartsWith("regular:", StringComparison.Ordinal)) return null;
        var parts = spec["regular:".Length..].Split('x');
        if (parts.Length is < 1 or > 2 || !parts.All(p => double.TryParse(p, NumberStyles.Float, CultureInfo.InvariantCulture, out double d) && d > 0))
            throw new FormatException($"'{spec}' is not regular:D or regular:DLATxDLON");
        double dlat = double.Parse(parts[0], CultureInfo.InvariantCulture), dlon = double.Parse(parts[^1], CultureInfo.InvariantCulture);
        int ny = (int)Math.Round(180 / dlat), nx = (int)Math.Round(360 / dlon);
        if (Math.Abs(ny * dlat - 180) > 1e-9 || Math.Abs(nx * dlon - 360) > 1e-9)
            throw new FormatException($"'{spec}': the spacing must divide 180° of latitude and 360° of longitude");
        var lat = Enumerable.Range(0, ny).Select(j => -90 + dlat * (j + 0.5)).ToArray();
        var lon = Enumerable.Range(0, nx).Select(i => dlon * (i + 0.5)).ToArray();
        var latBounds = Enumerable.Range(0, ny).SelectMany(j => new[] { -90 + dlat * j, -90 + dlat * (j + 1) }).ToArray();
        var lonBounds = Enumerable.Range(0, nx).SelectMany(i => new[] { dlon * i, dlon * (i + 1) }).ToArray();
        return RectilinearGrid.Build(lat, lon, latBounds, lonBounds, radius);
    }
}
