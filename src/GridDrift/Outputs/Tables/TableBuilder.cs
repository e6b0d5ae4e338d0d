using Parquet;
using Parquet.Schema;

namespace GridDrift.Outputs.Tables;

/// <summary>
/// A small tidy Parquet table built in memory and written once (analysis results: flags,
/// counts, trends, change points): text columns dictionary-encoded, numbers as nullable
/// float64, integers as int64, flags as booleans; Zstd at the Optimal level; provenance in the
/// key-value metadata; written under a temporary name and renamed when complete.
/// </summary>
internal sealed class TableBuilder
{
    enum Kind { Text, Number, Integer, Flag }

    readonly List<(string Name, Kind Kind)> _columns = [];
    readonly List<object?[]> _rows = [];

    public TableBuilder Text(string name) { _columns.Add((name, Kind.Text)); return this; }
    public TableBuilder Number(string name) { _columns.Add((name, Kind.Number)); return this; }
    public TableBuilder Integer(string name) { _columns.Add((name, Kind.Integer)); return this; }
    public TableBuilder Flag(string name) { _columns.Add((name, Kind.Flag)); return this; }

    public int Count => _rows.Count;

    /// <summary>One row, a value per column in order: string, double (NaN is null), long/int, bool.</summary>
    public void Add(params object?[] row)
    {
        if (row.Length != _columns.Count) throw new ArgumentException($"{row.Length} values for {_columns.Count} columns");
        _rows.Add(row);
    }

    public void Write(string path, IReadOnlyDictionary<string, string> metadata)
    {
        string final = Path.GetFullPath(path);
        string temp = Path.Combine(Path.GetDirectoryName(final)!, "." + Path.GetFileName(final) + "." + Guid.NewGuid().ToString("N")[..8] + ".part");
        var fields = _columns.Select(c => c.Kind switch
        {
            Kind.Text => (DataField)new DataField<string>(c.Name),
            Kind.Number => new DataField<double?>(c.Name),
            Kind.Integer => new DataField<long>(c.Name),
            _ => new DataField<bool>(c.Name),
        }).ToArray();
        var options = new ParquetOptions { CompressionMethod = CompressionMethod.Zstd, CompressionLevel = System.IO.Compression.CompressionLevel.Optimal };
        for (int i = 0; i < _columns.Count; i++)
            if (_columns[i].Kind == Kind.Text) options.ColumnEncodingHints[fields[i].Path.ToString()] = EncodingHint.Dictionary;
        try
        {
            using (var stream = new FileStream(temp, FileMode.CreateNew, FileAccess.ReadWrite))
            {
                var writer = ParquetWriter.CreateAsync(new ParquetSchema(fields), stream, options).GetAwaiter().GetResult();
                try
                {
                    writer.CustomMetadata = new Dictionary<string, string>(metadata);
                    using var group = writer.CreateRowGroup();
                    for (int c = 0; c < _columns.Count; c++)
                    {
                        switch (_columns[c].Kind)
                        {
                            case Kind.Text:
                                group.WriteAsync((DataField<string>)fields[c], _rows.Select(r => (string)r[c]!).ToList()).GetAwaiter().GetResult();
                                break;
                            case Kind.Number:
                                group.WriteAsync<double>((DataField<double?>)fields[c], _rows.Select(r => r[c] is double d && !double.IsNaN(d) ? d : (double?)null).ToArray().AsMemory()).GetAwaiter().GetResult();
                                break;
                            case Kind.Integer:
                                group.WriteAsync<long>((DataField<long>)fields[c], _rows.Select(r => Convert.ToInt64(r[c])).ToArray().AsMemory()).GetAwaiter().GetResult();
                                break;
                            default:
                                group.WriteAsync<bool>((DataField<bool>)fields[c], _rows.Select(r => (bool)r[c]!).ToArray().AsMemory()).GetAwaiter().GetResult();
                                break;
                        }
                    }
                }
                finally
                {
                    writer.DisposeAsync().AsTask().GetAwaiter().GetResult();
                }
                stream.Flush(flushToDisk: true);
            }
            File.Move(temp, final, overwrite: true);
        }
        catch
        {
            try { File.Delete(temp); } catch (IOException) { }
            throw;
        }
    }
}
