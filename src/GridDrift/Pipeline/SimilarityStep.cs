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
using GridDrift.Similarity;
using GridDrift.Statistics;

namespace GridDrift.Pipeline;

public sealed record SimilarityOptions(
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

public sealed record SimilaritySummary(int Pairs, IReadOnlyList<(CfTime Earlier, CfTime Later)> Skipped, DataRange Range, long CellsOutsideRange, int Regions);

/// <summary>
/// `griddrift similarity`: pair metrics per region over a record — consecutive frames (lag k)
/// or each frame against a fixed reference field. Each frame is read once into a ring of
/// lag + workers buffers; the pairs of a batch are computed on the workers and written in time
/// order, so memory is bounded by the frames in flight, not by the record's length.
/// </summary>
public static class SimilarityStep
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
        var range = DataRange.Resolve(o.Range, variable, source.Files[0]);
        if (o.Units is not null && o.Range is null)
        {
            // a range from the file's attributes or the standard_name defaults is in the file's units
            var c = GridDrift.Conventions.Units.UnitConverter.Between(variable.Attributes.Text("units") ?? "1", source.Units);
            range = range with { Low = c.Convert(range.Low), High = c.Convert(range.High) };
        }
        var shapes = RegionSpecs.ParseInput(o.Regions);
        var mask = RegionMaskBuilder.Build(grid, shapes);
        var plan = SeparablePlan.TryBuild(grid, shapes);
        bool periodic = grid.IsRectilinear && HorizontalGrid.FromAxes(Latitudes(grid), Longitudes(grid)).IsGlobalInLongitude;

        float[]? reference = o.Against is null ? null : ReadReference(o.Against, o.Variable, grid);
        using var observed = o.Reference is { Count: > 0 } ? FrameSource.Open(o.Reference, o.Variable) : null;
        observed?.ConvertUnits(source.Units); // the reference in the candidate's units (K against degC, g/kg against kg kg-1)
        List<(int Earlier, int Later)> pairs;
        List<(CfTime Earlier, CfTime Later)> skipped;
        if (observed is not null)
        {
            if (observed.FrameLength != source.FrameLength)
                throw new BadInputException(observed.Files[0], o.Variable, $"frames have {observed.FrameLength} values, the candidate's {source.FrameLength}: regrid the candidate onto the reference grid first");
            if (observed.Calendar != source.Calendar)
                throw new BadInputException(observed.Files[0], observed.Axes.Time!.Name, $"is in the {observed.Calendar.CfName()} calendar and the candidate in {source.Calendar.CfName()}: align them first (regrid --calendar)");
            var byTime = new Dictionary<long, int>();
            for (int i = 0; i < observed.FrameCount; i++) byTime[observed.Times[i].Micros] = i;
            pairs = Enumerable.Range(0, source.FrameCount).Where(i => byTime.ContainsKey(source.Times[i].Micros)).Select(i => (byTime[source.Times[i].Micros], i)).ToList();
            skipped = [];
            if (pairs.Count == 0) throw new BadInputException(source.Files[0], o.Variable, "no time step is shared with the reference");
        }
        else pairs = Pairs(source, o.Lag, o.AcrossGaps, reference is not null, out skipped);
        if (o.Slice is { } slice)
        {
            // a shard owns the pairs whose later frame is its own; the earlier frame may lie in the slice before
            pairs = pairs.Where(p => slice.Contains(p.Later)).ToList();
            skipped = slice.Count == 0 ? [] : skipped.Where(s => s.Later >= source.Times[slice.First] && s.Later <= source.Times[slice.End - 1]).ToList();
        }

        string units = source.Units;
        var quantities = o.Metrics.Select(m => Quantity(m, o.Variable, units)).ToList();
        // a shard reads its slice and the lag frames before it: its provenance names those files only
        var read = o.Slice is { } owned ? source.FilesOf(owned.First - (reference is null && observed is null ? o.Lag : 0), owned.End) : source.Files;
        var layout = new SeriesLayout(o.Variable, mask.Names, mask.RegionArea, quantities, source.TimeUnits,
            source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard",
            Provenance.For(o.Command, observed is not null ? [.. observed.Files, .. read] : o.Against is null ? read : [.. read, o.Against]),
            new Dictionary<string, string>
            {
                ["title"] = observed is not null ? $"Comparison of {o.Variable}: candidate {Path.GetFileName(source.Files[0])} against reference {Path.GetFileName(observed.Files[0])}"
                    : reference is null ? $"Frame-to-frame similarity of {o.Variable} per region (lag {o.Lag})" : $"Similarity of each frame of {o.Variable} to {Path.GetFileName(o.Against)}",
                ["data_range"] = $"{range.Low.ToString("R", CultureInfo.InvariantCulture)}:{range.High.ToString("R", CultureInfo.InvariantCulture)} ({range.Source})",
                ["lag"] = o.Lag.ToString(CultureInfo.InvariantCulture),
                ["earth_radius_m"] = o.EarthRadius.ToString("R", CultureInfo.InvariantCulture),
                ["min_valid"] = o.MinValid.ToString("R", CultureInfo.InvariantCulture),
                ["ssim_window"] = "Gaussian sigma 1.5, 11 taps; longitude " + (periodic ? "periodic" : "reflected") + ", latitude reflected; normalised convolution over missing cells",
                ["vif_domain"] = "pixel-domain multi-scale VIF on each region's bounding index box, values rescaled to 0-255 over the data range",
                ["skipped_pairs"] = skipped.Count == 0 ? "none" : string.Join("; ", skipped.Select(s => $"{s.Earlier.ToIsoString()}/{s.Later.ToIsoString()}")),
            },
            HasTimeBounds: reference is null && observed is null);

        using var products = new SeriesProducts(o.Output, o.Table, layout, o.Format);
        long outside = observed is not null
            ? Compare(observed, source, grid, mask, plan, range, periodic, o, pairs, products, progress)
            : Stream(source, grid, mask, plan, range, periodic, o, reference, pairs, products, progress);
        products.Complete();
        return new SimilaritySummary(pairs.Count, skipped, range, outside, mask.Count);
    }

    static double[] Latitudes(Grid grid) => Enumerable.Range(0, grid.Rows).Select(j => grid.CenterLat[j * grid.Columns]).ToArray();
    static double[] Longitudes(Grid grid) => grid.CenterLon.AsSpan(0, grid.Columns).ToArray();

    /// <summary>(earlier, later) frame indices; a pair whose time gap is not lag × the record's step is skipped and listed unless asked not to.</summary>
    static List<(int Earlier, int Later)> Pairs(FrameSource source, int lag, bool acrossGaps, bool against, out List<(CfTime Earlier, CfTime Later)> skipped)
    {
        skipped = new List<(CfTime Earlier, CfTime Later)>();
        var pairs = new List<(int, int)>();
        if (against)
        {
            for (int i = 0; i < source.FrameCount; i++) pairs.Add((-1, i));
            return pairs;
        }
        var step = source.Step;
        for (int i = lag; i < source.FrameCount; i++)
        {
            var a = source.Times[i - lag];
            var b = source.Times[i];
            bool regular = step is { } s && Math.Abs(s.StepsBetween(a, b) - lag) < 1e-9;
            if (regular || acrossGaps) pairs.Add((i - lag, i));
            else skipped.Add((a, b));
        }
        return pairs;
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

    /// <summary>One set of operators and result buffers per worker, made once per run.</summary>
    static Worker[] Workers(int workers, Grid grid, RegionMask mask, SeparablePlan? plan, DataRange range, bool periodic, SimilarityOptions o) =>
        Enumerable.Range(0, workers).Select(_ => new Worker
        {
            Ssim = new Ssim(grid.Rows, grid.Columns, periodic, range.Low, range.High),
            Vif = new Vif(),
            MapReducer = new RegionReducer(mask, [RegionStatistic.Mean, RegionStatistic.Valid], plan),
            Map = o.Metrics.Contains(SimilarityMetric.Ssim) ? new float[grid.CellCount] : [],
            MapStats = new double[mask.Count * 2],
            PairStats = new double[mask.Count * PairReducer.Stride],
            Pairs = plan is null ? null : new SeparablePairReducer(plan),
            Values = new double[mask.Count * o.Metrics.Count],
            Valid = new double[mask.Count],
        }).ToArray();

    sealed class Worker
    {
        public required Ssim Ssim;
        public required Vif Vif;
        public required RegionReducer MapReducer;
        public required float[] Map;
        public required double[] MapStats;
        public required double[] PairStats;
        public required SeparablePairReducer? Pairs;
        public required double[] Values;
        public required double[] Valid;
        public long Outside;
    }

    static long Stream(FrameSource source, Grid grid, RegionMask mask, SeparablePlan? plan, DataRange range, bool periodic, SimilarityOptions o,
        float[]? reference, List<(int Earlier, int Later)> pairs, ISeriesSink sink, IProgress<(int, int)>? progress)
    {
        int workers = Math.Max(1, o.Workers > 0 ? o.Workers : Environment.ProcessorCount);
        var boxes = o.Metrics.Contains(SimilarityMetric.Vif) ? RegionBox.Of(grid, mask) : [];
        var pool = Workers(workers, grid, mask, plan, range, periodic, o);

        // ring of decoded frames: a batch needs the frames from its first earlier index to its last later index
        int slots = (reference is null ? o.Lag : 0) + workers;
        var ring = Enumerable.Range(0, slots).Select(_ => new float[grid.CellCount]).ToArray();
        var held = Enumerable.Repeat(-1, slots).ToArray();
        float[] Frame(int index) => index < 0 ? reference! : ring[index % slots];

        var toRead = new int[2 * workers];
        int batch = 0, n = 0, count = 0;
        // both job bodies are made once: they read the batch's bounds from the variables above
        Action<int> read = k =>
        {
            int f = toRead[k];
            source.ReadFrame(f, ring[f % slots]);
            held[f % slots] = f;
        };
        Action<int> compute = w =>
        {
            var (earlier, later) = pairs[batch + w];
            Compute(pool[w], o, mask, boxes, grid.Columns, range, Frame(earlier), Frame(later));
        };
        using var team = new WorkerTeam(workers);
        for (batch = 0; batch < pairs.Count; batch += workers)
        {
            n = Math.Min(workers, pairs.Count - batch);
            count = 0;
            for (int p = batch; p < batch + n; p++)
            {
                Need(pairs[p].Earlier);
                Need(pairs[p].Later);
            }
            team.Run(count, read);
            team.Run(n, compute);
            for (int w = 0; w < n; w++)
            {
                var (earlier, later) = pairs[batch + w];
                sink.Write(source.Times[later], pool[w].Values, pool[w].Valid, earlier >= 0 ? source.Times[earlier] : null);
            }
            progress?.Report((batch + n, pairs.Count));
        }
        return pool.Sum(w => w.Outside);

        void Need(int f)
        {
            if (f >= 0 && held[f % slots] != f && Array.IndexOf(toRead, f, 0, count) < 0) toRead[count++] = f;
        }
    }

    /// <summary>Reference against candidate at each shared time: frames read and compared on the worker team, written in time order.</summary>
    static long Compare(FrameSource observed, FrameSource candidate, Grid grid, RegionMask mask, SeparablePlan? plan, DataRange range, bool periodic, SimilarityOptions o,
        List<(int Earlier, int Later)> pairs, ISeriesSink sink, IProgress<(int, int)>? progress)
    {
        int workers = Math.Max(1, o.Workers > 0 ? o.Workers : Environment.ProcessorCount);
        var boxes = o.Metrics.Contains(SimilarityMetric.Vif) ? RegionBox.Of(grid, mask) : [];
        var pool = Workers(workers, grid, mask, plan, range, periodic, o);
        var a = Enumerable.Range(0, workers).Select(_ => new float[grid.CellCount]).ToArray();
        var b = Enumerable.Range(0, workers).Select(_ => new float[grid.CellCount]).ToArray();
        int batch = 0;
        Action<int> work = w =>
        {
            var (r, c) = pairs[batch + w];
            observed.ReadFrame(r, a[w]);
            candidate.ReadFrame(c, b[w]);
            Compute(pool[w], o, mask, boxes, grid.Columns, range, a[w], b[w]);
        };
        using var team = new WorkerTeam(workers);
        for (batch = 0; batch < pairs.Count; batch += workers)
        {
            int n = Math.Min(workers, pairs.Count - batch);
            team.Run(n, work);
            for (int w = 0; w < n; w++) sink.Write(candidate.Times[pairs[batch + w].Later], pool[w].Values, pool[w].Valid);
            progress?.Report((batch + n, pairs.Count));
        }
        return pool.Sum(w => w.Outside);
    }

    static void Compute(Worker w, SimilarityOptions o, RegionMask mask, RegionBox[] boxes, int gridColumns, DataRange range, float[] a, float[] b)
    {
        int nq = o.Metrics.Count;
        foreach (var v in b) if (v < range.Low || v > range.High) w.Outside++;
        if (w.Pairs is { } separable) separable.Reduce(a, b, mask.RegionArea, w.PairStats);
        else PairReducer.Reduce(mask, a, b, w.PairStats);
        if (o.Metrics.Contains(SimilarityMetric.Ssim))
        {
            w.Ssim.Map(a, b, w.Map);
            w.MapReducer.Reduce(w.Map, w.MapStats);
        }
        for (int r = 0; r < mask.Count; r++)
        {
            double valid = w.PairStats[PairReducer.Stride * r + 3];
            w.Valid[r] = valid;
            bool drop = !(valid >= o.MinValid) || valid == 0;
            for (int q = 0; q < nq; q++)
            {
                double value = o.Metrics[q] switch
                {
                    SimilarityMetric.Ssim => w.MapStats[2 * r + 1] >= o.MinValid ? w.MapStats[2 * r] : double.NaN,
                    SimilarityMetric.Corr => w.PairStats[PairReducer.Stride * r],
                    SimilarityMetric.Rmsd => w.PairStats[PairReducer.Stride * r + 1],
                    SimilarityMetric.MeanAbsChange => w.PairStats[PairReducer.Stride * r + 2],
                    SimilarityMetric.Bias => w.PairStats[PairReducer.Stride * r + 4],
                    SimilarityMetric.Vif => drop ? double.NaN : VifOfBox(w.Vif, boxes[r], gridColumns, a, b, range, o.MinValid),
                    _ => double.NaN,
                };
                w.Values[r * nq + q] = drop ? double.NaN : value;
            }
        }
    }

    /// <summary>VIF on the region's bounding box, rescaled to 0–255; missing cells take the box's mean of that frame.</summary>
    static double VifOfBox(Vif vif, RegionBox box, int gridColumns, float[] a, float[] b, DataRange range, double minValid)
    {
        if (box.Rows < Vif.MinimumSide || box.Columns < Vif.MinimumSide) return double.NaN;
        int n = box.Rows * box.Columns;
        var ra = new double[n];
        var rb = new double[n];
        double scale = 255 / range.Width;
        double suma = 0, sumb = 0;
        int valid = 0;
        for (int j = 0; j < box.Rows; j++)
            for (int i = 0; i < box.Columns; i++)
            {
                int cell = (box.FirstRow + j) * gridColumns + box.FirstColumn + i;
                float x = a[cell], y = b[cell];
                int k = j * box.Columns + i;
                if (float.IsNaN(x) || float.IsNaN(y)) { ra[k] = rb[k] = double.NaN; continue; }
                ra[k] = (x - range.Low) * scale;
                rb[k] = (y - range.Low) * scale;
                suma += ra[k]; sumb += rb[k]; valid++;
            }
        if (valid < minValid * n || valid == 0) return double.NaN;
        if (valid < n)
        {
            double ma = suma / valid, mb = sumb / valid;
            for (int k = 0; k < n; k++) if (double.IsNaN(ra[k])) { ra[k] = ma; rb[k] = mb; }
        }
        return vif.Compute(ra, rb, box.Rows, box.Columns);
    }

    static SeriesQuantity Quantity(SimilarityMetric m, string variable, string units) => m switch
    {
        SimilarityMetric.Ssim => new("ssim", $"area-weighted mean structural similarity of {variable} between the paired frames", "1", "area: mean"),
        SimilarityMetric.Vif => new("vif", $"visual information fidelity of {variable} (later frame against earlier) on the region's bounding box", "1", ""),
        SimilarityMetric.Corr => new("corr", $"area-weighted Pearson correlation of {variable} between the paired frames", "1", ""),
        SimilarityMetric.Rmsd => new("rmsd", $"area-weighted root-mean-square difference of {variable} between the paired frames", units, ""),
        SimilarityMetric.Bias => new("bias", $"area-weighted mean difference of {variable}, later (candidate) minus earlier (reference)", units, "area: mean"),
        _ => new("mean_abs_change", $"area-weighted mean absolute change of {variable} between the paired frames", units, "area: mean"),
    };
}
