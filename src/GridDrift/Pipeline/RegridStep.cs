using GridDrift.Conventions.Coordinates;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Grids.Regridding;
using GridDrift.Outputs;
using GridDrift.Outputs.Fields;

namespace GridDrift.Pipeline;

public sealed record RegridOptions(
    IReadOnlyList<string> Inputs,
    string Variable,
    string To,
    string Method,
    string Output,
    ClassicVariant? Format = null,
    string Command = "griddrift regrid");

public sealed record RegridSummary(int Frames, Grid Target, RemapWeights Weights);

/// <summary>
/// `griddrift regrid`: each frame remapped onto a target grid (`regular:D`, `regular:DLATxDLON` or
/// the grid of a file) with weights built once (<see cref="ConservativeRemap"/>,
/// <see cref="BilinearRemap"/>); the output carries the covered fraction of every target cell.
/// </summary>
public static class RegridStep
{
    public static RegridSummary Run(RegridOptions o, IProgress<(int, int)>? progress = null)
    {
        using var source = FrameSource.Open(o.Inputs, o.Variable);
        var grid = GridReader.Read(source.Template, source.Axes);
        if (grid.CellCount != source.FrameLength)
            throw new BadInputException(source.Files[0], o.Variable, "frames with dimensions other than time, latitude and longitude cannot be regridded yet");
        Grid target;
        try { target = TargetGrids.TryParse(o.To) ?? ReadTarget(o.To); }
        catch (FormatException e) { throw new BadInputException(null, null, "--to " + e.Message); }
        RemapWeights weights;
        try
        {
            weights = o.Method switch
            {
                "conservative" => ConservativeRemap.Build(grid, target),
                "bilinear" => BilinearRemap.Build(grid, target),
                _ => throw new BadInputException(null, null, $"--method {o.Method}: choose bilinear or conservative"),
            };
        }
        catch (NotSupportedException e) { throw new BadInputException(source.Files[0], o.Variable, e.Message); }
        var data = source.Template.RequireVariable(o.Variable);
        var template = FieldTemplate.ForGrid(target, data.Attributes);
        var calendar = source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";
        var globals = Provenance.For(o.Command, source.Files).AsKeyValues(new Dictionary<string, string>
        {
            ["title"] = $"{o.Variable} remapped to {o.To}",
            ["remap_method"] = weights.Method + "; missing source cells left out and the weights renormalised",
            ["remap_source_grid"] = $"{grid.Rows} x {grid.Columns} ({grid.Kind})",
        });
        using var w = new FieldNetCdfWriter(o.Output, template, -1, o.Format, globals);
        var time = w.Writer.AddVariable("time", NcType.Double, [w.Time],
            [NcAttribute.Text("standard_name", "time"), NcAttribute.Text("units", source.TimeUnits.Text), NcAttribute.Text("calendar", calendar), NcAttribute.Text("axis", "T")]);
        var attributes = template.DataAttributes.ToList();
        if (o.Method == "conservative") attributes.Add(NcAttribute.Text("cell_methods", "area: mean"));
        attributes.Add(NcAttribute.Text("ancillary_variables", o.Variable + "_covered_fraction"));
        attributes.Add(NcAttribute.Of("_FillValue", ClimatologyNetCdfWriter.Fill));
        var values = w.Writer.AddVariable(o.Variable, NcType.Float, w.FieldDimensions(), attributes);
        var fraction = w.Writer.AddVariable(o.Variable + "_covered_fraction", NcType.Float, w.FieldDimensions(),
            [NcAttribute.Text("long_name", o.Method == "conservative" ? "fraction of the target cell's area covered by valid source cells" : "valid share of the interpolation weight"), NcAttribute.Text("units", "1")]);
        w.EndDefinitions();
        var frame = new float[source.FrameLength];
        var output = new float[target.CellCount];
        var covered = new float[target.CellCount];
        for (int t = 0; t < source.FrameCount; t++)
        {
            source.ReadFrame(t, frame);
            weights.Apply(frame, output, covered);
            for (int i = 0; i < output.Length; i++) if (float.IsNaN(output[i])) output[i] = ClimatologyNetCdfWriter.Fill;
            w.Writer.WriteRecord<double>(time, t, [source.TimeUnits.Encode(source.Times[t])]);
            w.Writer.WriteRecord<float>(values, t, output);
            w.Writer.WriteRecord<float>(fraction, t, covered);
            progress?.Report((t + 1, source.FrameCount));
        }
        w.Commit();
        return new RegridSummary(source.FrameCount, target, weights);
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
}
