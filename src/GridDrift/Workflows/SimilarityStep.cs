using System.Globalization;
using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Outputs;
using GridDrift.Outputs.Series;
using GridDrift.Regions;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Results;

namespace GridDrift.Workflows;

internal sealed record SimilarityOptions(
    IReadOnlyList<string> Inputs,
    string Variable,
    IReadOnlyList<string> Regions,
    IReadOnlyList<SimilarityMetric> Metrics,
    string Output,
    string? Table = null,
    int Lag = 1,
    string? Range = null,
    bool AcrossGaps = false,
    string? Against = null,
    double MinValid = 0.5,
    double EarthRadius = Sphere.MeanEarthRadius,
    ClassicVariant? Format = null,
    string Command = "griddrift similarity",
    int Workers = 0,
    IReadOnlyList<string>? Reference = null,
    string? Units = null,
    FrameSlice? Slice = null);

internal sealed record SimilaritySummary(int Pairs, IReadOnlyList<(CfTime Earlier, CfTime Later)> Skipped, DataRange Range, long CellsOutsideRange, int Regions);

/// <summary>
/// `griddrift similarity`: pair metrics per region over a record — consecutive frames (lag k)
/// or each frame against a fixed reference field. Each frame is read once into a ring of
/// lag + workers buffers; the pairs of a batch are computed on the workers and written in time
/// order, so memory is bounded by the frames in flight, not by the record's length.
/// </summary>
internal static class SimilarityStep
{
    public static SimilaritySummary Run(SimilarityOptions o, IProgress<(int Done, int Total)>? progress = null)
    {
        if (o.Lag < 1) throw new BadInputException(null, null, "--lag must be at least 1");
        if (o.Metrics.Count == 0) throw new BadInputException(null, null, "no metric asked for (--metric ssim,vif,corr,rmsd,mean-abs-change)");
        using var source = FrameSource.Open(o.Inputs, o.Variable);
        if (o.Units is { } wantedUnits) source.ConvertUnits(wantedUnits);
        var grid = GridReader.Read(source.Template, source.Axes, o.EarthRadius);
        if (source.FrameLength != grid.CellCount)
            throw new BadInputException(source.Files[0], o.Variable, $"frames have {source.FrameLength} values but the grid has {grid.CellCount} cells: only (time, y, x) variables are supported");
        if (grid.ColumnsFirst)
            throw new BadInputException(source.Files[0], o.Variable, "longitude comes before latitude in this variable's dimensions; similarity needs (time, lat, lon) order");
        var variable = source.Template.RequireVariable(o.Variable);
        var range = DataRange.Resolve(o.Range, variable, source.Files[0], source.Units);
        var shapes = RegionSpecs.ParseInput(o.Regions);
        var regions = RegionSet.Build(grid, shapes);
        var mask = regions.Mask;
        bool periodic = Ssim.PeriodicFor(grid);

        float[]? reference = o.Against is null ? null : ReadReference(o.Against, o.Variable, grid);
        using var observed = o.Reference is { Count: > 0 } ? FrameSource.Open(o.Reference, o.Variable) : null;
        observed?.ConvertUnits(source.Units); // the reference in the candidate's units (K against degC, g/kg against kg kg-1)
        List<FramePair> pairs;
        List<(CfTime Earlier, CfTime Later)> skipped;
        if (observed is not null)
        {
            if (observed.FrameLength != source.FrameLength)
                throw new BadInputException(observed.Files[0], o.Variable, $"frames have {observed.FrameLength} values, the candidate's {source.FrameLength}: regrid the candidate onto the reference grid first");
            if (observed.Calendar != source.Calendar)
                throw new BadInputException(observed.Files[0], observed.Axes.Time!.Name, $"is in the {observed.Calendar.CfName()} calendar and the candidate in {source.Calendar.CfName()}: align them first (regrid --calendar)");
            pairs = FramePairs.AtSharedTimes(observed, source);
            skipped = [];
            if (pairs.Count == 0) throw new BadInputException(source.Files[0], o.Variable, "no time step is shared with the reference");
        }
        else if (reference is not null)
        {
            pairs = FramePairs.AgainstFixed(source.FrameCount);
            skipped = [];
        }
        else pairs = FramePairs.AtLag(source, o.Lag, o.AcrossGaps, out skipped);
        if (o.Slice is { } slice)
        {
            // a shard owns the pairs whose later frame is its own; the earlier frame may lie in the slice before
            pairs = pairs.Where(p => slice.Contains(p.Later)).ToList();
            skipped = slice.Count == 0 ? [] : skipped.Where(s => s.Later >= source.Times[slice.First] && s.Later <= source.Times[slice.End - 1]).ToList();
        }

        string units = source.Units;
        var quantities = o.Metrics.Select(m => m.Quantity(o.Variable, units)).ToList();
        // a shard reads its slice and the lag frames before it: its provenance names those files only
        var read = o.Slice is { } owned ? source.FilesOf(owned.First - (reference is null && observed is null ? o.Lag : 0), owned.End) : source.Files;
        var layout = new SeriesLayout(o.Variable, mask.Names, mask.RegionArea, quantities, source.TimeUnits,
            source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard",
            Provenance.For(o.Command, observed is not null ? [.. observed.Files, .. read] : o.Against is null ? read : [.. read, o.Against]),
            new Dictionary<string, string>
            {
                ["title"] = observed is not null ? $"Comparison of {o.Variable}: candidate {Path.GetFileName(source.Files[0])} against reference {Path.GetFileName(observed.Files[0])}"
                    : reference is null ? $"Frame-to-frame similarity of {o.Variable} per region (lag {o.Lag})" : $"Similarity of each frame of {o.Variable} to {Path.GetFileName(o.Against)}",
                ["dynamic_range"] = $"{range.Low.ToString("R", CultureInfo.InvariantCulture)}:{range.High.ToString("R", CultureInfo.InvariantCulture)} ({range.Source})",
                ["lag"] = o.Lag.ToString(CultureInfo.InvariantCulture),
                ["earth_radius_m"] = o.EarthRadius.ToString("R", CultureInfo.InvariantCulture),
                ["min_valid"] = o.MinValid.ToString("R", CultureInfo.InvariantCulture),
                ["ssim_window"] = "Gaussian sigma 1.5, 11 taps; longitude " + (periodic ? "periodic" : "reflected") + ", latitude reflected; normalised convolution over missing cells",
                ["vif_domain"] = "pixel-domain multi-scale VIF on each region's bounding index box, values rescaled to 0-255 over the data range",
                ["skipped_pairs"] = skipped.Count == 0 ? "none" : string.Join("; ", skipped.Select(s => $"{s.Earlier.ToIsoString()}/{s.Later.ToIsoString()}")),
            },
            HasTimeBounds: reference is null && observed is null);

        using var products = new SeriesProducts(o.Output, o.Table, layout, o.Format);
        var op = new SimilarityOperator(regions, range, periodic, o.Metrics, o.MinValid, source.Times, observed is null ? source.Times : null, products);
        FrameEngine.RunPairs(observed ?? source, source, pairs, op, new EngineSettings(o.Workers, progress), reference);
        long outside = op.CellsOutsideRange;
        products.Complete();
        return new SimilaritySummary(pairs.Count, skipped, range, outside, mask.Count);
    }


    static float[] ReadReference(string path, string variable, Grid grid)
    {
        using var reader = DatasetFiles.Open(path);
        var v = reader.RequireVariable(variable);
        var axes = VariableAxes.Discover(reader, v);
        int timeDim = axes.IndexOf(AxisRole.Time);
        if (timeDim >= 0 && v.Dimensions[timeDim].Length != 1)
            throw new BadInputException(path, variable, $"has {v.Dimensions[timeDim].Length} time steps; --against needs one fixed field");
        if (v.ElementCount != grid.CellCount)
            throw new BadInputException(path, variable, $"has {v.ElementCount} values; the record's grid has {grid.CellCount} cells");
        var raw = reader.ReadAllDoubles(v);
        var field = new float[raw.Length];
        GridDrift.Conventions.Values.ValueCodec.For(v).Decode(raw, field);
        return field;
    }
}
