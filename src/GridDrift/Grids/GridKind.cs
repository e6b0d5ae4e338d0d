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
