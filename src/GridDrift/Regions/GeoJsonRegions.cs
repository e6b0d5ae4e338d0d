using System.Text.Json;

namespace GridDrift.Regions;

/// <summary>
/// Regions from a GeoJSON file (RFC 7946): each Feature with a Polygon or MultiPolygon geometry
/// is one region named by its <c>name</c> property; holes are kept. A ring that crosses the
/// antimeridian (consecutive longitudes more than 180° apart) is unwrapped so that it stays
/// continuous.
/// </summary>
internal static class GeoJsonRegions
{
    public static IReadOnlyList<RegionShape> Read(string path)
    {
        if (!File.Exists(path)) throw new BadInputException(path, null, "no such region file");
        JsonDocument doc;
        try
        {
            doc = JsonDocument.Parse(File.ReadAllBytes(path));
        }
        catch (JsonException e)
        {
            throw new BadInputException(path, null, $"not valid JSON ({e.Message})");
        }
        using (doc)
            try { return Regions(doc.RootElement, path); }
            // a document of another shape (features not a list, a null geometry, a position that is not a pair of numbers) is bad input, not a fault
            catch (Exception e) when (e is KeyNotFoundException or InvalidOperationException or FormatException or IndexOutOfRangeException)
            {
                throw new BadInputException(path, null, $"not a GeoJSON region file of Polygon or MultiPolygon features ({e.Message})");
            }
    }

    /// <summary>At most this many positions in one region file: enough for detailed coastlines, and a bound on the time building masks takes.</summary>
    public const int MaxPositions = 200_000;

    static IReadOnlyList<RegionShape> Regions(JsonElement root, string path)
    {
        {
            var features = Type(root) switch
            {
                "FeatureCollection" => root.GetProperty("features").EnumerateArray().ToList(),
                "Feature" => [root],
                _ => throw new BadInputException(path, null, "expected a GeoJSON Feature or FeatureCollection"),
            };
            var regions = new List<RegionShape>();
            int index = 0;
            long positions = 0;
            foreach (var f in features)
            {
                index++;
                string name = f.TryGetProperty("properties", out var p) && p.ValueKind == JsonValueKind.Object
                              && p.TryGetProperty("name", out var n) && n.ValueKind == JsonValueKind.String
                    ? n.GetString()! : throw new BadInputException(path, null, $"feature {index} has no 'name' property");
                var g = f.GetProperty("geometry");
                var polygons = Type(g) switch
                {
                    "Polygon" => [Polygon(g.GetProperty("coordinates"), path, name)],
                    "MultiPolygon" => g.GetProperty("coordinates").EnumerateArray().Select(c => Polygon(c, path, name)).ToList(),
                    _ => throw new BadInputException(path, null, $"feature '{name}': only Polygon and MultiPolygon geometries make regions"),
                };
                CheckPositions(path, name, polygons, ref positions);
                regions.Add(new PolygonRegion(name, polygons));
            }
            return regions;
        }
    }

    /// <summary>Positions are finite longitudes within ±720 and latitudes within ±90, every polygon encloses some area, no ring crosses itself, and the file stays within <see cref="MaxPositions"/>.</summary>
    static void CheckPositions(string path, string name, IReadOnlyList<IReadOnlyList<(double Lon, double Lat)[]>> polygons, ref long positions)
    {
        foreach (var polygon in polygons)
        {
            foreach (var ring in polygon)
            {
                positions += ring.Length;
                if (positions > MaxPositions) throw new BadInputException(path, null, $"more than {MaxPositions} positions: simplify the polygons first");
                foreach (var (lon, lat) in ring)
                    if (!double.IsFinite(lon) || !double.IsFinite(lat) || Math.Abs(lat) > 90 || Math.Abs(lon) > 720)
                        throw new BadInputException(path, null, $"region '{name}': position ({lon}, {lat}) is not a longitude and latitude in degrees");
                if (RingCrossings.Find(ring) is var (first, second))
                    throw new BadInputException(path, null, $"region '{name}': a ring crosses itself (the edges from ({first.Lon}, {first.Lat}) and from ({second.Lon}, {second.Lat}) meet)");
            }
            var outer = polygon[0];
            if (GridDrift.Grids.Sphere.PolygonArea(outer.Select(p => p.Lat).ToArray(), outer.Select(p => p.Lon).ToArray(), 1) <= 0)
                throw new BadInputException(path, null, $"region '{name}': a polygon encloses no area");
        }
    }

    static string? Type(JsonElement e) => e.TryGetProperty("type", out var t) ? t.GetString() : null;

    static IReadOnlyList<(double Lon, double Lat)[]> Polygon(JsonElement rings, string path, string name)
    {
        var result = new List<(double, double)[]>();
        foreach (var ring in rings.EnumerateArray())
        {
            var points = ring.EnumerateArray().Select(pt => (pt[0].GetDouble(), pt[1].GetDouble())).ToArray();
            if (points.Length < 4) throw new BadInputException(path, null, $"region '{name}': a ring needs at least 4 positions (RFC 7946 §3.1.6)");
            for (int i = 1; i < points.Length; i++)
            {
                double d = points[i].Item1 - points[i - 1].Item1;
                if (d > 180) points[i].Item1 -= 360 * Math.Round(d / 360);
                else if (d < -180) points[i].Item1 += 360 * Math.Round(-d / 360);
            }
            result.Add(points);
        }
        return result;
    }
}
