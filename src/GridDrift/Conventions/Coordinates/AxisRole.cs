namespace GridDrift.Conventions.Coordinates;

/// <summary>What a coordinate variable measures (CF Conventions §4).</summary>
internal enum AxisRole
{
    None,
    Time,
    Latitude,
    Longitude,
    Vertical,
    ProjectionX,
    ProjectionY,
}
