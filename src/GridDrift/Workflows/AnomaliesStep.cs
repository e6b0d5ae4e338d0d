using GridDrift.Outputs.Description;
using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Outputs;
using GridDrift.Outputs.Fields;
using GridDrift.Outputs.Series;
using GridDrift.Regions;
using GridDrift.Operators.Statistics;
using GridDrift.Results;
using GridDrift.Products;
using GridDrift.Workflows.Options;

namespace GridDrift.Workflows;

internal sealed record AnomaliesOptions(
    IReadOnlyList<string> Inputs,
    string Variable,
    string Climatology,
    AnomalyKind Kind,
    string? Output,
    IReadOnlyList<string>? Regions = null,
    string? Table = null,
    string? Series = null,
    double MinValid = 0.5,
    ClassicVariant? Format = null,
    string Command = "griddrift anomalies",
    int Workers = 0,
    string? Units = null,
    FrameSlice? Slice = null)
{
    /// <summary>Which frames of the record to read (`--period`; [input] period).</summary>
    public FrameSelection Selection { get; init; } = FrameSelection.All;
}

internal sealed record AnomaliesSummary(int Frames, int FramesWithoutSlot, string? Series, IReadOnlyList<string> Warnings);

/// <summary>
/// `griddrift anomalies`: departures of every frame from its slot of a climatology, streamed
/// field by field into a CF NetCDF on the input's grid and, with --regions, reduced to
/// area-weighted region means (series NetCDF and Parquet table). Frames in flight are bounded
/// by the worker count.
/// </summary>
internal static class AnomaliesStep
{
    public static AnomaliesSummary Run(AnomaliesOptions o, IProgress<(int Done, int Total)>? progress = null)
    {
        using var source = FrameSource.Open(o.Inputs, o.Variable, o.Selection);
        if (o.Units is { } wantedUnits) source.ConvertUnits(wantedUnits);
        var clim = ClimatologyFile.Read(o.Climatology, o.Variable);
        var warnings = new List<string>(source.Warnings);
        if (clim.Cells != source.FrameLength)
            throw new BadInputException(o.Climatology, o.Variable, $"has {clim.Cells} cells per slot; the frames of {source.Files[0]} have {source.FrameLength}");
        if (clim.Scheme.Kind != ClimatologyKind.Month && clim.Scheme.Calendar != source.Calendar)
            throw new BadInputException(o.Climatology, "time",
                $"is in the {clim.Scheme.Calendar.CfName()} calendar but {source.Files[0]} is in {source.Calendar.CfName()}: {clim.Scheme.Kind.Name()} slots differ between them");
        var template = FieldTemplate.From(source);
        string units = source.Units;
        clim.ConvertTo(units); // a climatology made in other units (K against degC) still fits
        string anomalyUnits = o.Kind switch { AnomalyKind.Absolute => units, AnomalyKind.Relative => "%", _ => "1" };
        string longName = $"{o.Kind.Name()} anomaly of {template.DataAttribute("long_name") ?? o.Variable} from its {clim.Scheme.Kind.Name()} climatology";
        var provenance = Provenance.For(o.Command, (o.Slice is { } part ? source.FilesOf(part.First, part.End) : source.Files).Append(o.Climatology).ToArray());
        var extra = new Dictionary<string, string>
        {
            ["title"] = $"{o.Kind.Name()} anomalies of {o.Variable}",
            ["anomaly_kind"] = o.Kind.Name() + o.Kind switch
            {
                AnomalyKind.Relative => $": 100 (x - mean) / mean; missing where |mean| <= {Anomaly.RelativeGuard:g}",
                AnomalyKind.Standardized => $": (x - mean) / std; missing where std <= max(1e-12, {Anomaly.StandardizedGuard:g} |mean|)",
                _ => ": x - mean",
            },
            ["climatology_file"] = Path.GetFileName(o.Climatology),
            ["climatology_kind"] = clim.Scheme.Kind.Name(),
            ["climatology_base_period"] = clim.BasePeriod,
        };

        RegionSet? regions = null;
        SeriesProducts? series = null;
        string? seriesPath = null;
        if (o.Regions is { Count: > 0 })
        {
            var grid = GridReader.Read(source.Template, source.Axes);
            if (grid.CellCount != source.FrameLength)
                throw new BadInputException(source.Files[0], o.Variable, "frames with dimensions other than time, latitude and longitude cannot be reduced to regions");
            var shapes = RegionSpecs.ParseInput(o.Regions);
            regions = RegionSet.Build(grid, shapes);
            seriesPath = o.Series ?? (o.Output is { } output ? DefaultSeriesPath(output)
                : throw new ArgumentException("anomalies without a field file need a series path"));
            var calendarAttribute0 = source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";
            string quantity = o.Kind == AnomalyKind.Absolute ? "anomaly" : o.Kind.Name() + "_anomaly";
            var layout = new SeriesLayout(o.Variable, regions.Names, regions.Areas,
                [new SeriesQuantity(quantity, "area-weighted mean of the " + longName, anomalyUnits, "area: mean")],
                source.TimeUnits, calendarAttribute0, provenance, extra, Scalars: SelectionScalars.Of(source));
            series = new SeriesProducts(seriesPath, o.Table, layout, o.Format);
        }
        try
        {
            var calendarAttribute = source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";
            using var w = o.Output is null ? null : new FieldNetCdfWriter(o.Output, template, -1, o.Format, provenance.AsKeyValues(extra));
            ClassicWriter.Definition? time = null, data = null;
            if (w is not null)
            {
                time = w.DefineTime(source.TimeUnits, calendarAttribute).Time;
                data = w.DefineField(o.Variable, template.DataAttributes
                    .Where(a => a.Name is "coordinates" or "grid_mapping")
                    .Append(NcAttribute.Text("long_name", longName))
                    .Append(NcAttribute.Text("units", anomalyUnits)));
                w.EndDefinitions();
            }
            var slice = o.Slice ?? FrameSlice.Whole(source.FrameCount);
            var fields = w is null ? null : new FieldRecords(w, time!, data!, source.TimeUnits, source.FrameLength);
            var op = new AnomalyOperator(o.Kind, clim.Scheme, clim.Mean, clim.Std, clim.Cells, regions, o.MinValid, source.Times, fields, series);
            FrameEngine.Run(source, Enumerable.Range(slice.First, slice.Count).ToArray(), op, new EngineSettings(o.Workers, progress));
            int noSlot = op.FramesWithoutSlot;
            if (noSlot > 0) warnings.Add($"{Counted.Of(noSlot, "frame")} {(noSlot == 1 ? "falls" : "fall")} in no slot of the climatology (a time of day it does not hold): their anomalies are missing");
            w?.Commit();
            series?.Complete();
            return new AnomaliesSummary(slice.Count, noSlot, seriesPath, warnings);
        }
        finally
        {
            series?.Dispose();
        }
    }

    /// <summary>Where the region series go without --series: OUT_series.nc beside the fields.</summary>
    public static string DefaultSeriesPath(string output) =>
        ProductNames.Beside(output, ProductNames.Series);
}
