using GridDrift.Conventions.Time;
using GridDrift.Formats;

namespace GridDrift.Products;

/// <summary>
/// A (time, region) series read back for analysis: GridDrift's series NetCDF or any CF file
/// whose quantities are (time, region) variables labelled by a region variable (NetCDF-4 strings
/// or a char array), and GridDrift's tidy Parquet tables.
/// </summary>
internal sealed class SeriesFile
{
    public required string Path { get; init; }
    public required CfTime[] Times { get; init; }
    public required string[] Regions { get; init; }
    /// <summary>quantity → values[time × regions + region], NaN where missing.</summary>
    public required IReadOnlyDictionary<string, double[]> Quantities { get; init; }
    public required string SourceVariable { get; init; }
    public required IReadOnlyDictionary<string, string> Units { get; init; }

    static readonly HashSet<string> NotQuantities = ["valid_fraction", "region_area", "time_bnds", "region_name"];

    public static SeriesFile Read(string path) =>
        path.EndsWith(".parquet", StringComparison.OrdinalIgnoreCase) ? SeriesTable.Read(path) : ReadNetCdf(path);

    static SeriesFile ReadNetCdf(string path)
    {
        using var reader = DatasetFiles.Open(path);
        var time = reader.Variables.FirstOrDefault(v => v.Rank == 1 && TimeUnits.LooksLikeTime(v.Attributes.Text("units")))
            ?? throw new BadInputException(path, null, "has no time coordinate (a variable with units 'UNIT since DATE')");
        var timeDim = time.Dimensions[0];
        var candidates = reader.Variables.Where(v => v.Rank == 2 && v.Dimensions[0] == timeDim && NcTypes.IsNumeric(v.Type) && !NotQuantities.Contains(v.Name)).ToList();
        if (candidates.Count == 0) throw new BadInputException(path, null, "has no (time, region) variables");
        var regionDim = candidates[0].Dimensions[1];
        var label = reader.Variables.FirstOrDefault(v => (v.Type == NcType.String && v.Rank == 1 || v.Type == NcType.Char && v.Rank == 2) && v.Dimensions[0] == regionDim)
            ?? throw new BadInputException(path, null, $"has no label variable along its region dimension '{regionDim.Name}' (strings, or a char array)");
        var regions = reader.ReadText(label);
        var axis = TimeAxis.Read(reader, time);
        var quantities = new Dictionary<string, double[]>();
        var units = new Dictionary<string, string>();
        foreach (var v in candidates.Where(v => v.Dimensions[1] == regionDim))
        {
            var raw = reader.ReadAllDoubles(v);
            var values = new float[raw.Length];
            GridDrift.Conventions.Values.ValueCodec.For(v).Decode(raw, values);
            // decode to float32 masks fills; keep float64 where the file holds doubles
            quantities[v.Name] = v.Type == NcType.Double ? Mask(raw, values) : values.Select(f => (double)f).ToArray();
            units[v.Name] = v.Attributes.Text("units") ?? "1";
        }
        string source = reader.Attributes.Text("title") is { } title && title.Contains(" of ") ? title[(title.LastIndexOf(" of ", StringComparison.Ordinal) + 4)..].Split(' ')[0] : "";
        return new SeriesFile { Path = path, Times = axis.Times, Regions = regions, Quantities = quantities, SourceVariable = source, Units = units };
    }

    static double[] Mask(double[] raw, float[] decoded)
    {
        for (int i = 0; i < raw.Length; i++) if (float.IsNaN(decoded[i])) raw[i] = double.NaN;
        return raw;
    }
}
