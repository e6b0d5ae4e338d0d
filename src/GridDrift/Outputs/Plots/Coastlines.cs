using System.Globalization;

namespace GridDrift.Outputs.Plots;

/// <summary>
/// The low-resolution coastlines drawn under region maps: Natural Earth's 1:110m coastline
/// (public domain), simplified and shipped as a resource (coastline_110m.txt, its attribution in
/// the file's header), read once.
/// </summary>
internal static class Coastlines
{
    public const string Attribution = "coastlines: Natural Earth (public domain)";

    static readonly Lazy<IReadOnlyList<(double Lon, double Lat)[]>> Lines = new(Read);

    /// <summary>The polylines with longitudes wrapped into [left, left + 360), split where a line crosses the map's edge.</summary>
    public static IEnumerable<(double[] X, double[] Y)> Wrapped(double left)
    {
        foreach (var line in Lines.Value)
        {
            var xs = new List<double>();
            var ys = new List<double>();
            double previous = double.NaN;
            foreach (var (lon, lat) in line)
            {
                double x = lon;
                while (x < left) x += 360;
                while (x >= left + 360) x -= 360;
                if (!double.IsNaN(previous) && Math.Abs(x - previous) > 180)
                {
                    if (xs.Count > 1) yield return (xs.ToArray(), ys.ToArray());
                    xs.Clear();
                    ys.Clear();
                }
                xs.Add(x);
                ys.Add(lat);
                previous = x;
            }
            if (xs.Count > 1) yield return (xs.ToArray(), ys.ToArray());
        }
    }

    static IReadOnlyList<(double, double)[]> Read()
    {
        using var stream = typeof(Coastlines).Assembly.GetManifestResourceStream("GridDrift.coastline_110m.txt")
            ?? throw new InvalidOperationException("the coastline resource is missing from the assembly");
        using var reader = new StreamReader(stream);
        var lines = new List<(double, double)[]>();
        for (string? text = reader.ReadLine(); text is not null; text = reader.ReadLine())
        {
            if (text.StartsWith('#') || text.Length == 0) continue;
            lines.Add(text.Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(pair =>
            {
                var parts = pair.Split(',');
                return (double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture));
            }).ToArray());
        }
        return lines;
    }
}
