using GridDrift.Formats;
using GridDrift.Conventions.Coordinates;

namespace GridDrift.Grids;

/// <summary>
/// Builds the horizontal grid of a data variable from its CF coordinates: 1-D latitude and
/// longitude (with CF §7.1 bounds where present), 2-D auxiliary latitude/longitude (CF §5.2),
/// or geostationary scan angles with their grid_mapping (CF Appendix F).
/// </summary>
internal static class GridReader
{
    public static Grid Read(IDatasetReader reader, VariableAxes axes, double radius = Sphere.MeanEarthRadius)
    {
        var data = axes.Data;
        if (axes.GridMapping is { } mapping && mapping.Attributes.Text("grid_mapping_name") == "geostationary"
            && axes.ProjectionX is { } xv && axes.ProjectionY is { } yv)
            return Geostationary(reader, mapping, xv, yv, radius);

        if (axes.Latitude is { Rank: 1 } lat && axes.Longitude is { Rank: 1 } lon)
        {
            int latDim = IndexOfDimension(data, lat.Dimensions[0]);
            int lonDim = IndexOfDimension(data, lon.Dimensions[0]);
            if (latDim < 0 || lonDim < 0)
                throw new BadInputException(reader.Path, data.Name, "latitude and longitude are not dimensions of the variable");
            var latitudes = reader.ReadAllDoubles(lat);
            var longitudes = reader.ReadAllDoubles(lon);
            CheckAxis(reader.Path, lat.Name, latitudes, 90 + LatitudeTolerance, "latitudes");
            CheckAxis(reader.Path, lon.Name, longitudes, MaxLongitude, "longitudes");
            return RectilinearGrid.Build(latitudes, longitudes, Bounds(reader, lat), Bounds(reader, lon), radius, columnsFirst: lonDim < latDim);
        }

        if (axes.Latitude is { Rank: 2 } lat2 && axes.Longitude is { Rank: 2 } lon2)
        {
            int rows = (int)lat2.Dimensions[0].Length, columns = (int)lat2.Dimensions[1].Length;
            double[]? cornerLat = null, cornerLon = null;
            if (Bounds(reader, lat2) is { } bl && Bounds(reader, lon2) is { } bo && bl.Length == 4 * rows * columns && bo.Length == bl.Length)
                (cornerLat, cornerLon) = (bl, bo);
            var latitudes = reader.ReadAllDoubles(lat2);
            var longitudes = reader.ReadAllDoubles(lon2);
            CheckRange(reader.Path, lat2.Name, latitudes, 90 + LatitudeTolerance, "latitudes");
            CheckRange(reader.Path, lon2.Name, longitudes, MaxLongitude, "longitudes");
            return CurvilinearGrid.Build(latitudes, longitudes, rows, columns, cornerLat, cornerLon, radius);
        }
        throw new BadInputException(reader.Path, data.Name,
            "no horizontal grid: neither latitude/longitude coordinates (CF §4.1, §4.2, §5.2) nor a geostationary grid_mapping");
    }

    /// <summary>Latitudes a hair beyond the poles (rounding in a file's float32 values) are taken; anything further is a broken coordinate.</summary>
    const double LatitudeTolerance = 1e-3;

    /// <summary>Longitudes beyond two turns either way are no convention of any grid: a broken coordinate.</summary>
    const double MaxLongitude = 720;

    /// <summary>A 1-D coordinate: finite, within ±<paramref name="limit"/> and strictly monotonic, else bad input naming the variable.</summary>
    static void CheckAxis(string path, string name, double[] values, double limit, string what)
    {
        CheckRange(path, name, values, limit, what);
        if (values.Length < 2) return;
        int direction = Math.Sign(values[1] - values[0]);
        for (int i = 1; i < values.Length; i++)
            if (direction == 0 || Math.Sign(values[i] - values[i - 1]) != direction)
                throw new BadInputException(path, name, $"{what} are not strictly increasing or decreasing (index {i - 1}: {values[i - 1]:R}, index {i}: {values[i]:R})");
    }

    /// <summary>Every value finite and within ±<paramref name="limit"/>, else bad input naming the variable.</summary>
    static void CheckRange(string path, string name, double[] values, double limit, string what)
    {
        for (int i = 0; i < values.Length; i++)
            if (!double.IsFinite(values[i]) || Math.Abs(values[i]) > limit)
                throw new BadInputException(path, name, $"{what} must be finite and within ±{limit:0.###} degrees; index {i} is {values[i]:R}");
    }

    static int IndexOfDimension(NcVariable v, NcDimension d)
    {
        for (int i = 0; i < v.Rank; i++) if (v.Dimensions[i] == d) return i;
        return -1;
    }

    static double[]? Bounds(IDatasetReader reader, NcVariable coordinate) =>
        coordinate.Attributes.Text("bounds") is { } name && reader.FindVariable(name) is { } b && NcTypes.IsNumeric(b.Type)
            ? reader.ReadAllDoubles(b) : null;

    static Grid Geostationary(IDatasetReader reader, NcVariable mapping, NcVariable xv, NcVariable yv, double radius)
    {
        double Required(string name) => mapping.Attributes.Find(name)?.FirstNumber()
            ?? throw new BadInputException(reader.Path, mapping.Name, $"geostationary grid_mapping lacks {name}");
        double height = Required("perspective_point_height");
        double a = Required("semi_major_axis");
        double b = mapping.Attributes.Find("semi_minor_axis")?.FirstNumber()
                   ?? (mapping.Attributes.Find("inverse_flattening")?.FirstNumber() is { } f ? a * (1 - 1 / f) : a);
        var projection = new GeostationaryProjection(height, a, b,
            mapping.Attributes.Find("longitude_of_projection_origin")?.FirstNumber() ?? 0,
            mapping.Attributes.Text("sweep_angle_axis") ?? "y");
        double[] ScanAngles(NcVariable v)
        {
            var values = reader.ReadAllDoubles(v);
            double scale = v.Attributes.Find("scale_factor")?.FirstNumber() ?? 1, offset = v.Attributes.Find("add_offset")?.FirstNumber() ?? 0;
            if (scale != 1 || offset != 0) for (int i = 0; i < values.Length; i++) values[i] = values[i] * scale + offset;
            // Older files give x/y in metres: the scan angle times the perspective point height.
            if ((v.Attributes.Text("units") ?? "rad").Trim() is "m" or "meter" or "metre" or "meters" or "metres")
                for (int i = 0; i < values.Length; i++) values[i] /= height;
            return values;
        }
        return projection.BuildGrid(ScanAngles(xv), ScanAngles(yv), radius);
    }
}
