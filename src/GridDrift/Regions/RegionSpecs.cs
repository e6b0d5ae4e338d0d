using System.Globalization;

namespace GridDrift.Regions;

/// <summary>
/// Parses region specifications (DESIGN.md): <c>global</c> · <c>bands:STEP</c> (zonal bands from
/// −90° in STEP degrees) · <c>tiles:DLATxDLON</c> (from −90° and from longitude 0) ·
/// <c>box:NAME=SOUTH,NORTH,WEST,EAST</c> · <c>file:PATH.geojson</c>. Generated names read like
/// <c>band_s10_n10</c> and <c>tile_n20_n40_e000_e030</c>.
/// </summary>
internal static class RegionSpecs
{
    /// <summary>Parses user input: a malformed specification is bad input (exit code 2), not a crash.</summary>
    public static IReadOnlyList<RegionShape> ParseInput(IEnumerable<string> specs)
    {
        try
        {
            return Parse(specs);
        }
        catch (FormatException e)
        {
            throw new BadInputException(null, null, e.Message);
        }
    }

    /// <summary>At most this many regions in one analysis (e.g. tiles:1x1 gives 64,800): a bound on masks and products.</summary>
    public const int MaxRegions = 100_000;

    public static IReadOnlyList<RegionShape> Parse(IEnumerable<string> specs)
    {
        var shapes = new List<RegionShape>();
        foreach (var spec in specs)
            foreach (var part in spec.Split(' ', StringSplitOptions.RemoveEmptyEntries))
            {
                shapes.AddRange(ParseOne(part));
                if (shapes.Count > MaxRegions) throw new FormatException($"more than {MaxRegions} regions (at '{part}'): choose larger bands or tiles");
            }
        var duplicate = shapes.GroupBy(s => s.Name).FirstOrDefault(g => g.Count() > 1);
        if (duplicate is not null) throw new FormatException($"region '{duplicate.Key}' is defined twice");
        return shapes;
    }

    static IEnumerable<RegionShape> ParseOne(string spec)
    {
        if (spec == "global") return [new WholeDomain()];
        int colon = spec.IndexOf(':');
        if (colon < 0) throw new FormatException($"region '{spec}' is not one of global, bands:STEP, tiles:DLATxDLON, box:NAME=S,N,W,E, file:PATH.geojson");
        string kind = spec[..colon], body = spec[(colon + 1)..];
        return kind switch
        {
            "bands" => Bands(Number(body, spec)),
            "tiles" => Tiles(body, spec),
            "box" => [Box(body, spec)],
            "file" => GeoJsonRegions.Read(body),
            _ => throw new FormatException($"unknown region kind '{kind}' in '{spec}'"),
        };
    }

    static double Number(string text, string spec)
    {
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
            throw new FormatException($"'{text}' in region '{spec}' is not a number");
        return v;
    }

    static IEnumerable<RegionShape> Bands(double step)
    {
        if (step <= 0 || step > 180) throw new FormatException($"band step {step} must be in (0, 180]");
        if (Math.Ceiling(180 / step) > MaxRegions) throw new FormatException($"band step {step} gives more than {MaxRegions} regions");
        for (double s = -90; s < 90 - 1e-9; s += step)
        {
            double n = Math.Min(90, s + step);
            yield return new LatLonBox($"band_{Lat(s)}_{Lat(n)}", s, n, 0, 360);
        }
    }

    static IEnumerable<RegionShape> Tiles(string body, string spec)
    {
        var parts = body.Split('x', 'X');
        if (parts.Length != 2) throw new FormatException($"tiles need DLATxDLON, got '{spec}'");
        double dlat = Number(parts[0], spec), dlon = Number(parts[1], spec);
        if (dlat <= 0 || dlat > 180 || dlon <= 0 || dlon > 360) throw new FormatException($"tile size {body} out of range");
        if (Math.Ceiling(180 / dlat) * Math.Ceiling(360 / dlon) > MaxRegions) throw new FormatException($"tiles {body} give more than {MaxRegions} regions");
        var tiles = new List<RegionShape>();
        for (double s = -90; s < 90 - 1e-9; s += dlat)
        {
            double n = Math.Min(90, s + dlat);
            for (double w = 0; w < 360 - 1e-9; w += dlon)
            {
                double e = Math.Min(360, w + dlon);
                tiles.Add(new LatLonBox($"tile_{Lat(s)}_{Lat(n)}_{Lon(w)}_{Lon(e)}", s, n, w, e));
            }
        }
        return tiles;
    }

    static LatLonBox Box(string body, string spec)
    {
        int eq = body.IndexOf('=');
        if (eq <= 0) throw new FormatException($"a box needs a name: box:NAME=SOUTH,NORTH,WEST,EAST (got '{spec}')");
        string name = body[..eq];
        var v = body[(eq + 1)..].Split(',');
        if (v.Length != 4) throw new FormatException($"a box needs SOUTH,NORTH,WEST,EAST (got '{spec}')");
        double s = Number(v[0], spec), n = Number(v[1], spec), w = Number(v[2], spec), e = Number(v[3], spec);
        if (s < -90 || n > 90 || s >= n) throw new FormatException($"box '{name}': latitudes must satisfy -90 <= SOUTH < NORTH <= 90");
        if (Math.Abs(w) > 720 || Math.Abs(e) > 720) throw new FormatException($"box '{name}': longitudes must lie within ±720 degrees");
        return new LatLonBox(name, s, n, w, e);
    }

    /// <summary>Latitude label: s10, n00, n02.5.</summary>
    public static string Lat(double v) => (v < 0 ? "s" : "n") + Math.Abs(v).ToString("00.##", CultureInfo.InvariantCulture);

    /// <summary>Longitude label east of 0: e000 … e360.</summary>
    public static string Lon(double v) => "e" + v.ToString("000.##", CultureInfo.InvariantCulture);
}
