namespace GridDrift.Regions;

/// <summary>A named area of the globe that a region mask is built from.</summary>
public abstract record RegionShape(string Name);

/// <summary>The whole domain of the grid, whatever it covers.</summary>
public sealed record WholeDomain() : RegionShape("global");

/// <summary>
/// A latitude-longitude box, south to north and west to east; west &gt; east crosses the date
/// line. Longitudes are compared on the circle, so the box is the same whatever longitude
/// convention (0..360 or −180..180) the grid uses.
/// </summary>
public sealed record LatLonBox(string Name, double South, double North, double West, double East) : RegionShape(Name)
{
    /// <summary>East edge, unwrapped so that it lies 0 to 360 degrees east of the west edge.</summary>
    public double EastUnwrapped
    {
        get
        {
            if (East - West >= 360) return West + 360;
            double e = East;
            while (e <= West) e += 360;
            return e;
        }
    }
}

/// <summary>Polygons with holes in longitude/latitude (GeoJSON, RFC 7946): rings as (lon, lat) pairs, first ring of each polygon the exterior.</summary>
public sealed record PolygonRegion(string Name, IReadOnlyList<IReadOnlyList<(double Lon, double Lat)[]>> Polygons) : RegionShape(Name);
