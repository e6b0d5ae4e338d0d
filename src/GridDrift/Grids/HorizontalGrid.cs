namespace GridDrift.Grids;

/// <summary>
/// What describe reports of a horizontal grid, from its coordinate values alone (the grid model
/// with areas and regions builds on the same values). Spacing is "even" when every step is
/// within 1e-4 of the mean step, relative: float32 coordinates of a 0.25° grid pass; Gaussian
/// latitudes (steps that vary by more than that) do not.
/// </summary>
internal sealed record HorizontalGrid(GridKind Kind, int LatitudeCount, int LongitudeCount,
    double? LatitudeStep, double? LongitudeStep, bool LatitudeDescending, string LongitudeConvention, bool IsGlobalInLongitude)
{
    const double EvenTolerance = 1e-4;

    public static HorizontalGrid FromAxes(double[] latitudes, double[] longitudes)
    {
        var (latStep, latEven) = Step(latitudes);
        var (lonStep, lonEven) = Step(longitudes);
        var kind = latEven && lonEven ? GridKind.RegularLatLon : GridKind.IrregularLatLon;
        bool descending = latitudes.Length > 1 && latitudes[^1] < latitudes[0];
        double lonMin = longitudes.Length == 0 ? 0 : longitudes.Min();
        double lonMax = longitudes.Length == 0 ? 0 : longitudes.Max();
        string convention = lonMin < 0 ? "-180..180" : lonMax > 180 ? "0..360" : "0..180";
        bool global = lonStep is { } s && Math.Abs(Math.Abs(s) * longitudes.Length - 360) < Math.Abs(s) * 0.5;
        return new HorizontalGrid(kind, latitudes.Length, longitudes.Length,
            latStep is null ? null : Math.Abs(latStep.Value), lonStep is null ? null : Math.Abs(lonStep.Value),
            descending, convention, global);
    }

    public static HorizontalGrid Curvilinear(int rows, int columns) =>
        new(GridKind.Curvilinear, rows, columns, null, null, false, "", false);

    public static HorizontalGrid Projected(GridKind kind, int rows, int columns) =>
        new(kind, rows, columns, null, null, false, "", false);

    static (double? Step, bool Even) Step(double[] values)
    {
        if (values.Length < 2) return (null, true);
        double mean = (values[^1] - values[0]) / (values.Length - 1);
        bool even = true;
        for (int i = 1; i < values.Length; i++)
            if (Math.Abs(values[i] - values[i - 1] - mean) > EvenTolerance * Math.Abs(mean)) { even = false; break; }
        return (mean, even);
    }

    public string Describe()
    {
        string kind = Kind.Words();
        var parts = new List<string> { $"{kind}, {LatitudeCount} × {LongitudeCount}" };
        if (LatitudeStep is { } a && LongitudeStep is { } b)
            parts.Add(Kind == GridKind.RegularLatLon ? $"{a:0.####}° × {b:0.####}°" : $"mean {a:0.####}° × {b:0.####}°");
        if (Kind is GridKind.RegularLatLon or GridKind.IrregularLatLon)
        {
            parts.Add(LatitudeDescending ? "latitudes north to south" : "latitudes south to north");
            parts.Add($"longitudes {LongitudeConvention}{(IsGlobalInLongitude ? ", global" : "")}");
        }
        return string.Join("; ", parts);
    }
}
