using GridDrift.Results;

namespace GridDrift.Outputs.Series;

/// <summary>A regional series computed in memory, written as the series NetCDF or the tidy Parquet table of DESIGN.md.</summary>
public static class SeriesFiles
{
    /// <summary>Writes the series NetCDF (under a temporary name, renamed when complete); provenance records the inputs' checksums.</summary>
    public static void WriteNetCdf(this RegionalSeries series, string path, OutputFormat? format = null) =>
        (format ?? OutputFormat.Default).Write(path, (file, variant) =>
        {
            using var writer = new SeriesNetCdfWriter(file, WithChecksums(series.Layout), variant);
            series.CopyTo(writer);
            writer.Complete();
            return 0;
        });

    /// <summary>Writes the tidy Parquet table: one row per time, region and quantity.</summary>
    public static void WriteTable(this RegionalSeries series, string path)
    {
        using var writer = new SeriesParquetWriter(path, WithChecksums(series.Layout));
        series.CopyTo(writer);
        writer.Complete();
    }

    static SeriesLayout WithChecksums(SeriesLayout layout) =>
        layout.Provenance.InputSha256.Count == layout.Provenance.Inputs.Count ? layout
            : layout with { Provenance = Provenance.For(layout.Provenance.Command, layout.Provenance.Inputs) };
}
