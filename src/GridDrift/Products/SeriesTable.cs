using GridDrift.Conventions.Time;
using Parquet;

namespace GridDrift.Products;

/// <summary>
/// GridDrift's tidy Parquet series read back: columns time (ISO 8601 in the record's calendar),
/// region, variable, quantity, units (absent from tables of earlier versions) and value. The calendar comes from the file's `calendar` metadata
/// (written by GridDrift), else standard.
/// </summary>
static class SeriesTable
{
    public static SeriesFile Read(string path)
    {
        using var stream = File.OpenRead(path);
        var reader = ParquetReader.CreateAsync(stream).GetAwaiter().GetResult();
        try { return Read(path, reader); }
        finally { reader.DisposeAsync().AsTask().GetAwaiter().GetResult(); }
    }

    static SeriesFile Read(string path, ParquetReader reader)
    {
        var calendar = CfCalendars.Parse(reader.CustomMetadata.TryGetValue("calendar", out var c) ? c : null) ?? CfCalendar.Standard;
        var fields = reader.Schema.GetDataFields();
        var time = new List<string>();
        var region = new List<string>();
        var variable = new List<string>();
        var quantity = new List<string>();
        var units = new Dictionary<string, string>();
        var value = new List<double>();
        for (int g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            int rows = checked((int)group.RowCount);
            Parquet.Schema.DataField Field(string name) => fields.FirstOrDefault(f => f.Name == name)
                ?? throw new BadInputException(path, null, $"has no column '{name}': not a GridDrift series table");
            string[] Text(string name)
            {
                var buffer = new string?[rows];
                group.ReadAsync(Field(name), buffer.AsMemory(), null, default).AsTask().GetAwaiter().GetResult();
                return buffer.Select(v => v ?? "").ToArray();
            }
            time.AddRange(Text("time"));
            region.AddRange(Text("region"));
            variable.AddRange(Text("variable"));
            var quantities0 = Text("quantity");
            quantity.AddRange(quantities0);
            if (fields.Any(f => f.Name == "units"))
            {
                var unitsHere = Text("units");
                for (int k = 0; k < rows; k++) units.TryAdd(quantities0[k], unitsHere[k]);
            }
            var values = new double?[rows];
            group.ReadAsync<double>(Field("value"), values.AsMemory(), null, default).AsTask().GetAwaiter().GetResult();
            value.AddRange(values.Select(v => v ?? double.NaN));
        }
        var times = time.Distinct().Select(t => (Text: t, Time: TimeUnits.ParseDate(t, calendar))).OrderBy(p => p.Time.Micros).ToList();
        var timeIndex = times.Select((p, i) => (p.Text, i)).ToDictionary(p => p.Text, p => p.i);
        var regions = region.Distinct().ToArray();
        var regionIndex = regions.Select((r, i) => (r, i)).ToDictionary(p => p.r, p => p.i);
        var quantities = new Dictionary<string, double[]>();
        for (int k = 0; k < time.Count; k++)
        {
            if (!quantities.TryGetValue(quantity[k], out var values))
            {
                values = new double[times.Count * regions.Length];
                Array.Fill(values, double.NaN);
                quantities[quantity[k]] = values;
            }
            values[timeIndex[time[k]] * regions.Length + regionIndex[region[k]]] = value[k];
        }
        return new SeriesFile
        {
            Path = path, Times = times.Select(p => p.Time).ToArray(), Regions = regions, Quantities = quantities,
            SourceVariable = variable.FirstOrDefault() ?? "", Units = quantities.Keys.ToDictionary(q => q, q => units.GetValueOrDefault(q, "")),
        };
    }
}
