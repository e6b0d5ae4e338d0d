using GridDrift.Conventions.Time;
using Parquet;
using Parquet.Schema;
using GridDrift.Results;

namespace GridDrift.Outputs.Series;

/// <summary>
/// The tidy Parquet table of DESIGN.md: one row per time × region × quantity with columns
/// time (ISO 8601 text in the file's own calendar), time_utc (UTC timestamp in microseconds,
/// null where the calendar is not a real-world one), time_value (the CF offset), region,
/// variable, quantity, units (the quantity's), value (nullable), valid_fraction. Text columns are dictionary-encoded;
/// pages are Zstd-compressed at the Optimal level; provenance goes into the file's key-value
/// metadata. Rows are buffered and written a row group at a time, so memory stays bounded.
/// Written under a temporary name and renamed when complete.
/// </summary>
internal sealed class SeriesParquetWriter : ISeriesSink
{
    const int RowsPerGroup = 1 << 18;

    static readonly DataField<string> TimeField = new("time");
    static readonly DateTimeDataField TimeUtcField = new("time_utc", DateTimeFormat.Timestamp, isAdjustedToUTC: true, unit: DateTimeTimeUnit.Micros, isNullable: true);
    static readonly DataField<double> TimeValueField = new("time_value");
    static readonly DataField<string> RegionField = new("region");
    static readonly DataField<string> VariableField = new("variable");
    static readonly DataField<string> QuantityField = new("quantity");
    static readonly DataField<string> UnitsField = new("units");
    static readonly DataField<double?> ValueField = new("value");
    static readonly DataField<double> ValidField = new("valid_fraction");

    readonly string _finalPath;
    readonly string _tempPath;
    readonly FileStream _stream;
    readonly ParquetWriter _writer;
    readonly SeriesLayout _layout;
    readonly List<string> _time = new(), _region = new(), _variable = new(), _quantity = new(), _units = new();
    readonly List<DateTime?> _utc = new();
    readonly List<double> _timeValue = new(), _valid = new();
    readonly List<double?> _value = new();
    bool _completed;

    public SeriesParquetWriter(string path, SeriesLayout layout)
    {
        _layout = layout;
        _finalPath = Path.GetFullPath(path);
        _tempPath = Path.Combine(Path.GetDirectoryName(_finalPath)!, "." + Path.GetFileName(_finalPath) + "." + Guid.NewGuid().ToString("N")[..8] + ".part");
        _stream = new FileStream(_tempPath, FileMode.CreateNew, FileAccess.ReadWrite);
        var schema = new ParquetSchema(TimeField, TimeUtcField, TimeValueField, RegionField, VariableField, QuantityField, UnitsField, ValueField, ValidField);
        var options = new ParquetOptions { CompressionMethod = CompressionMethod.Zstd, CompressionLevel = System.IO.Compression.CompressionLevel.Optimal };
        foreach (var field in new DataField[] { TimeField, RegionField, VariableField, QuantityField, UnitsField })
            options.ColumnEncodingHints[field.Path.ToString()] = EncodingHint.Dictionary;
        _writer = ParquetWriter.CreateAsync(schema, _stream, options).GetAwaiter().GetResult();
        var metadata = new Dictionary<string, string>(layout.Provenance.AsKeyValues(layout.Attributes))
        {
            ["calendar"] = layout.CalendarAttribute,
            ["time_units"] = layout.TimeUnits.Text,
        };
        _writer.CustomMetadata = metadata;
    }

    public void Write(CfTime time, ReadOnlySpan<double> values, ReadOnlySpan<double> validFraction, CfTime? earlier = null)
    {
        string iso = time.ToIsoString();
        DateTime? utc = time.ToUtc();
        double offset = _layout.TimeUnits.Encode(time);
        int nq = _layout.Quantities.Count;
        for (int r = 0; r < _layout.Regions.Count; r++)
            for (int q = 0; q < nq; q++)
            {
                double v = values[r * nq + q];
                _time.Add(iso);
                _utc.Add(utc);
                _timeValue.Add(offset);
                _region.Add(_layout.Regions[r]);
                _variable.Add(_layout.SourceVariable);
                _quantity.Add(_layout.Quantities[q].Name);
                _units.Add(_layout.Quantities[q].Units);
                _value.Add(double.IsNaN(v) ? null : v);
                _valid.Add(validFraction[r]);
            }
        if (_time.Count >= RowsPerGroup) Flush();
    }

    void Flush()
    {
        if (_time.Count == 0) return;
        using (var group = _writer.CreateRowGroup())
        {
            group.WriteAsync(TimeField, _time).GetAwaiter().GetResult();
            group.WriteAsync<DateTime>(TimeUtcField, _utc.ToArray().AsMemory()).GetAwaiter().GetResult();
            group.WriteAsync<double>(TimeValueField, _timeValue.ToArray().AsMemory()).GetAwaiter().GetResult();
            group.WriteAsync(RegionField, _region).GetAwaiter().GetResult();
            group.WriteAsync(VariableField, _variable).GetAwaiter().GetResult();
            group.WriteAsync(QuantityField, _quantity).GetAwaiter().GetResult();
            group.WriteAsync(UnitsField, _units).GetAwaiter().GetResult();
            group.WriteAsync<double>(ValueField, _value.ToArray().AsMemory()).GetAwaiter().GetResult();
            group.WriteAsync<double>(ValidField, _valid.ToArray().AsMemory()).GetAwaiter().GetResult();
        }
        foreach (var list in new System.Collections.IList[] { _time, _utc, _timeValue, _region, _variable, _quantity, _units, _value, _valid }) list.Clear();
    }

    public void Complete()
    {
        Flush();
        _writer.DisposeAsync().AsTask().GetAwaiter().GetResult();
        _stream.Flush(flushToDisk: true);
        _stream.Dispose();
        File.Move(_tempPath, _finalPath, overwrite: true);
        _completed = true;
    }

    public void Dispose()
    {
        if (_completed) return;
        try { _writer.DisposeAsync().AsTask().GetAwaiter().GetResult(); } catch (Exception e) when (e is IOException or InvalidOperationException) { }
        _stream.Dispose();
        try { File.Delete(_tempPath); } catch (IOException) { }
    }
}
