using GridDrift.Conventions.Time;
using GridDrift.Formats;

namespace GridDrift.Conventions.Coordinates;

/// <summary>
/// Recognises what a coordinate measures by the rules of CF Conventions §4: units spellings
/// (§4.1, §4.2), standard_name, the axis attribute, the positive attribute and pressure units
/// for vertical axes (§4.3), "UNIT since DATE" for time (§4.4). Variable names are consulted
/// last, as a common-practice fallback for files that carry no CF attributes.
/// </summary>
internal static class AxisClassifier
{
    static readonly HashSet<string> LatitudeUnits = new(StringComparer.OrdinalIgnoreCase)
        { "degrees_north", "degree_north", "degree_N", "degrees_N", "degreeN", "degreesN" };
    static readonly HashSet<string> LongitudeUnits = new(StringComparer.OrdinalIgnoreCase)
        { "degrees_east", "degree_east", "degree_E", "degrees_E", "degreeE", "degreesE" };
    static readonly HashSet<string> PressureUnits = new(StringComparer.OrdinalIgnoreCase)
        { "Pa", "hPa", "kPa", "mbar", "millibar", "millibars", "mb", "bar", "atm", "decibar", "dbar" };
    static readonly HashSet<string> VerticalStandardNames = new(StringComparer.Ordinal)
    {
        "air_pressure", "altitude", "height", "depth", "model_level_number", "atmosphere_sigma_coordinate",
        "atmosphere_hybrid_sigma_pressure_coordinate", "atmosphere_hybrid_height_coordinate", "geopotential_height",
        "air_potential_temperature", "atmosphere_ln_pressure_coordinate",
    };

    public static AxisRole Classify(NcVariable v)
    {
        var a = v.Attributes;
        string? units = a.Text("units")?.Trim();
        string? standardName = a.Text("standard_name")?.Trim();
        string? axis = a.Text("axis")?.Trim().ToUpperInvariant();

        if (standardName == "latitude" || (units is not null && LatitudeUnits.Contains(units))) return AxisRole.Latitude;
        if (standardName == "longitude" || (units is not null && LongitudeUnits.Contains(units))) return AxisRole.Longitude;
        if (standardName is "projection_x_coordinate" or "projection_x_angular_coordinate") return AxisRole.ProjectionX;
        if (standardName is "projection_y_coordinate" or "projection_y_angular_coordinate") return AxisRole.ProjectionY;
        if (standardName == "time" || axis == "T" || TimeUnits.LooksLikeTime(units)) return AxisRole.Time;
        if (axis == "Z" || a.Find("positive") is not null || (units is not null && PressureUnits.Contains(units))
            || (standardName is not null && VerticalStandardNames.Contains(standardName)))
            return AxisRole.Vertical;
        if (axis == "Y") return units is null || units.StartsWith("deg", StringComparison.OrdinalIgnoreCase) ? AxisRole.Latitude : AxisRole.ProjectionY;
        if (axis == "X") return units is null || units.StartsWith("deg", StringComparison.OrdinalIgnoreCase) ? AxisRole.Longitude : AxisRole.ProjectionX;

        string name = v.Name.Contains('/') ? v.Name[(v.Name.LastIndexOf('/') + 1)..] : v.Name;
        return name.ToLowerInvariant() switch
        {
            "lat" or "latitude" or "nav_lat" => AxisRole.Latitude,
            "lon" or "longitude" or "nav_lon" => AxisRole.Longitude,
            "time" or "t" when units is not null => AxisRole.Time,
            "level" or "lev" or "plev" or "pressure" => AxisRole.Vertical,
            _ => AxisRole.None,
        };
    }
}
