using GridDrift.Conventions.Time;
using GridDrift.Formats.Classic;
using GridDrift.Results;

namespace GridDrift.Outputs.Series;

/// <summary>The series NetCDF and, when asked for, the tidy Parquet table of one run, written together.</summary>
internal sealed class SeriesProducts : ISeriesSink
{
    readonly List<ISeriesSink> _sinks = new();

    public SeriesProducts(string netCdf, string? table, SeriesLayout layout, ClassicVariant? format)
    {
        try
        {
            _sinks.Add(new SeriesNetCdfWriter(netCdf, layout, format));
            if (table is not null) _sinks.Add(new SeriesParquetWriter(table, layout));
        }
        catch
        {
            Dispose();
            throw;
        }
    }

    public void Write(CfTime time, ReadOnlySpan<double> values, ReadOnlySpan<double> validFraction, CfTime? earlier = null)
    {
        foreach (var sink in _sinks) sink.Write(time, values, validFraction, earlier);
    }

    public void Complete()
    {
        foreach (var sink in _sinks) sink.Complete();
    }

    public void Dispose()
    {
        foreach (var sink in _sinks) sink.Dispose();
    }
}
