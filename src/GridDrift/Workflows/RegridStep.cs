using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Grids.Regridding;
using GridDrift.Outputs;
using GridDrift.Outputs.Fields;
using GridDrift.Results;
using GridDrift.Operators.Resampling;

namespace GridDrift.Workflows;

internal sealed record RegridOptions(
    IReadOnlyList<string> Inputs,
    string Variable,
    string To,
    string Method,
    string Output,
    ClassicVariant? Format = null,
    string Command = "griddrift regrid",
    string? Calendar = null,
    string? Resample = null,
    string? Weights = null,
    string? Units = null)
{
    /// <summary>Which frames of the record to read (`--period`; [input] period).</summary>
    public FrameSelection Selection { get; init; } = FrameSelection.All;
}

internal sealed record RegridSummary(int Frames, int Written, int Dropped, Grid Target, RemapWeights Weights, bool WeightsReused = false);

/// <summary>
/// `griddrift regrid`: each frame remapped onto a target grid (`regular:D`, `regular:DLATxDLON` or
/// the grid of a file) with weights built once (<see cref="ConservativeRemap"/>,
/// <see cref="BilinearRemap"/>); the output carries the covered fraction of every target cell.
/// </summary>
internal static class RegridStep
{
    public static RegridSummary Run(RegridOptions o, IProgress<(int, int)>? progress = null)
    {
        using var source = FrameSource.Open(o.Inputs, o.Variable, o.Selection);
        if (o.Units is { } wantedUnits) source.ConvertUnits(wantedUnits);
        var grid = GridReader.Read(source.Template, source.Axes);
        if (grid.CellCount != source.FrameLength)
            throw new BadInputException(source.Files[0], o.Variable, "frames with dimensions other than time, latitude and longitude cannot be regridded yet");
        Grid target;
        try { target = TargetGrids.TryParse(o.To) ?? ReadTarget(o.To); }
        catch (FormatException e) { throw new BadInputException(null, null, "--to " + e.Message); }
        if (o.Method is not ("conservative" or "bilinear")) throw new BadInputException(null, null, $"--method {o.Method}: choose bilinear or conservative");
        if (!target.IsRectilinear)
            throw new BadInputException(o.To, null, "the target must be a latitude-longitude grid");
        if (!grid.IsRectilinear && (o.Method != "conservative" || grid.CornerLat is null))
            throw new BadInputException(source.Files[0], o.Variable, "a curvilinear source can only be remapped conservatively (bilinear needs a latitude-longitude source)");
        RemapWeights? weights = o.Weights is { } saved && File.Exists(saved) ? WeightsFile.Load(saved, grid, target, o.Method) : null;
        bool reused = weights is not null;
        if (o.Weights is { } existing && File.Exists(existing) && !reused)
            throw new BadInputException(existing, null, $"holds weights for other grids or another method than {o.Method}: remove it or name another file");
        weights ??= o.Method == "conservative" ? ConservativeRemap.Build(grid, target) : BilinearRemap.Build(grid, target);
        if (o.Weights is { } path && !reused) WeightsFile.Save(path, weights, grid, target);
        var data = source.Template.RequireVariable(o.Variable);
        var template = FieldTemplate.ForGrid(target, data.Attributes.Where(a => a.Name != "units").Append(NcAttribute.Text("units", source.Units)));
        var calendar = source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";
        var toCalendar = source.Calendar;
        if (o.Calendar is { } wanted)
        {
            toCalendar = CfCalendars.Parse(wanted) ?? throw new BadInputException(null, null, $"--calendar {wanted} is not a CF calendar");
            if (!CalendarAlignment.CanAlign(source.Calendar, toCalendar))
                throw new BadInputException(source.Files[0], source.Axes.Time!.Name, $"{source.Calendar.CfName()} dates cannot keep their dates in the {toCalendar.CfName()} calendar (360_day has 30 February): not aligned rather than shifted");
            calendar = toCalendar.CfName();
        }
        Resampling resampling;
        int periodHours;
        try { resampling = PeriodMeans.Parse(o.Resample, out periodHours); }
        catch (FormatException e) { throw new BadInputException(null, null, e.Message); }
        var units = TimeUnits.Parse(source.TimeUnits.Text, toCalendar);
        var globals = Provenance.For(o.Command, source.Files).AsKeyValues(new Dictionary<string, string>
        {
            ["title"] = $"{o.Variable} remapped to {o.To}",
            ["remap_method"] = weights.Method + "; missing source cells left out and the weights renormalised",
            ["remap_source_grid"] = $"{grid.Rows} x {grid.Columns} ({grid.Kind.Words()})",
            ["calendar_alignment"] = toCalendar == source.Calendar ? "none" : $"{source.Calendar.CfName()} -> {toCalendar.CfName()} by date (year, month, day and time of day kept; dates the target calendar lacks dropped)",
            ["resampling"] = resampling == Resampling.None ? "none" : $"{(resampling == Resampling.Hours ? $"{periodHours}-hourly" : resampling.ToString().ToLowerInvariant())} means of the frames in each period",
        });
        using var w = new FieldNetCdfWriter(o.Output, template, -1, o.Format, globals);
        var (time, bounds) = w.DefineTime(source.TimeUnits, calendar, withBounds: resampling != Resampling.None);
        var attributes = template.DataAttributes.ToList();
        string methods = (o.Method == "conservative" ? "area: mean" : "") + (resampling == Resampling.None ? "" : " time: mean");
        if (methods.Trim().Length > 0) attributes.Add(NcAttribute.Text("cell_methods", methods.Trim()));
        attributes.Add(NcAttribute.Text("ancillary_variables", NcNames.Safe(o.Variable) + "_covered_fraction"));
        var values = w.DefineField(o.Variable, attributes);
        var fraction = w.Writer.AddVariable(NcNames.Safe(o.Variable) + "_covered_fraction", NcType.Float, w.FieldDimensions(),
            [NcAttribute.Text("long_name", o.Method == "conservative" ? "fraction of the target cell's area covered by valid source cells" : "valid share of the interpolation weight"), NcAttribute.Text("units", "1")]);
        w.EndDefinitions();
        var records = new RemappedRecords(w, time, bounds, values, fraction, units, target.CellCount);
        var means = resampling == Resampling.None ? null : new PeriodMeanSink(resampling, periodHours, target.CellCount, records);
        var aligned = new CfTime[source.FrameCount];
        var frames = new List<int>();
        for (int t = 0; t < source.FrameCount; t++)
            if (CalendarAlignment.Align(source.Times[t], toCalendar) is { } when)
            {
                aligned[t] = when;
                frames.Add(t);
            }
        FrameEngine.Run(source, frames, new RegridOperator(weights, aligned, means ?? (ICoveredFieldSink)records), new EngineSettings(Workers: 0, progress));
        means?.Flush();
        int written = records.Written, dropped = source.FrameCount - frames.Count;
        w.Commit();
        return new RegridSummary(source.FrameCount, written, dropped, target, weights, reused);
    }

    static Grid ReadTarget(string path)
    {
        if (!File.Exists(path)) throw new FormatException($"'{path}' is neither regular:D, regular:DLATxDLON nor a file");
        using var reader = DatasetFiles.Open(path);
        foreach (var v in reader.Variables.Where(v => v.Rank >= 2 && NcTypes.IsNumeric(v.Type)))
        {
            var axes = VariableAxes.Discover(reader, v);
            if (axes.Latitude is not null && axes.Longitude is not null) return GridReader.Read(reader, axes);
        }
        throw new BadInputException(path, null, "has no variable on a latitude-longitude grid to take the target grid from");
    }

    /// <summary>Remapped fields as records: time (and bounds), the field with missing values as the fill value, the covered fraction.</summary>
    sealed class RemappedRecords(FieldNetCdfWriter w, ClassicWriter.Definition time, ClassicWriter.Definition? bounds, ClassicWriter.Definition values,
        ClassicWriter.Definition fraction, TimeUnits units, int cells) : ICoveredFieldSink
    {
        readonly float[] _record = new float[cells];
        readonly double[] _one = new double[1], _two = new double[2];

        public int Written { get; private set; }

        public void Write(CfTime when, ReadOnlySpan<float> field, ReadOnlySpan<float> coveredFraction, (CfTime From, CfTime To)? period = null)
        {
            for (int i = 0; i < field.Length; i++) _record[i] = float.IsNaN(field[i]) ? ClimatologyNetCdfWriter.Fill : field[i];
            _one[0] = units.Encode(when);
            w.Writer.WriteRecord<double>(time, Written, _one);
            if (bounds is not null && period is { } p)
            {
                _two[0] = units.Encode(p.From);
                _two[1] = units.Encode(p.To);
                w.Writer.WriteRecord<double>(bounds, Written, _two);
            }
            w.Writer.WriteRecord<float>(values, Written, _record);
            w.Writer.WriteRecord<float>(fraction, Written, coveredFraction);
            Written++;
        }
    }
}
