namespace GridDrift.Grids;

/// <summary>The horizontal grid families GridDrift recognises.</summary>
public enum GridKind
{
    None,
    /// <summary>1-D latitude and longitude, both evenly spaced.</summary>
    RegularLatLon,
    /// <summary>1-D latitude and longitude, latitudes unevenly spaced (e.g. Gaussian).</summary>
    IrregularLatLon,
    /// <summary>2-D latitude and longitude (CF §5.2 auxiliary coordinates).</summary>
    Curvilinear,
    /// <summary>Scan-angle x/y with the CF geostationary grid_mapping.</summary>
    Geostationary,
    /// <summary>Projection x/y with some other grid_mapping.</summary>
    Projected,
}

/// <summary>Grid kinds in the words `describe` uses, for every message a user reads.</summary>
public static class GridKindWords
{
    public static string Words(this GridKind kind) => kind switch
    {
        GridKind.RegularLatLon => "regular latitude-longitude",
        GridKind.IrregularLatLon => "latitude-longitude with uneven latitudes (e.g. Gaussian)",
        GridKind.Curvilinear => "curvilinear (2-D latitude/longitude)",
        GridKind.Geostationary => "geostationary (scan angles)",
        GridKind.Projected => "projected x/y",
        _ => "none",
    };
}
