using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Units;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Outputs;
using GridDrift.Outputs.Fields;
using GridDrift.Physics;

namespace GridDrift.Pipeline;

public sealed record DeriveOptions(
    IReadOnlyList<string> Inputs,
    string Quantity,
    string Output,
    string? Variable = null,
    string? SurfacePressure = null,
    ClassicVariant? Format = null,
    string Command = "griddrift derive");

public sealed record DeriveSummary(int Frames, int Levels, string Variable);

/// <summary>
/// `griddrift derive column-water-vapour`: total column water vapour (1/g)∫q dp from specific
/// humidity on pressure levels, frame by frame, bounded by the surface pressure where a
/// surface-pressure variable is named (<see cref="Moisture.ColumnWaterVapour"/>). Units of q and of
/// the pressures are converted (g/kg, kg kg-1, 1; hPa, Pa, mbar …). Written as a CF field with
/// standard_name atmosphere_mass_content_of_water_vapor on the input's horizontal grid.
/// </summary>
public static class DeriveStep
{
    public static DeriveSummary Run(DeriveOptions o, IProgress<(int, int)>? progress = null)
    {
        if (o.Quantity != "column-water-vapour")
            throw new BadInputException(null, null, $"derive {o.Quantity}: only column-water-vapour is available yet (relative-humidity and specific-humidity are not)");
        string variable = o.Variable ?? FindBy(o.Inputs[0], "specific_humidity");
        using var source = FrameSource.Open(o.Inputs, variable);
        var reader = source.Template;
        int vertical = source.Axes.IndexOf(AxisRole.Vertical);
        var data = reader.RequireVariable(variable);
        var levelVar = vertical >= 0 ? source.Axes.DimensionCoordinates[vertical] : null;
        if (levelVar is null)
            throw new BadInputException(source.Files[0], variable, "has no vertical coordinate (pressure levels) to integrate over");
        var frameDims = source.FrameDimensions.Select(d => d.Name).ToList();
        if (frameDims[0] != levelVar.Name)
            throw new BadInputException(source.Files[0], variable, $"the pressure dimension '{levelVar.Name}' must come first after time (the variable's dimensions are {string.Join(", ", data.Dimensions.Select(d => d.Name))})");
        var pressure = reader.ReadAllDoubles(levelVar);
        Convert(pressure, levelVar.Attributes.Text("units") ?? "Pa", "Pa", source.Files[0], levelVar.Name);
        double qScale = Converter(data.Attributes.Text("units") ?? "1", "kg kg-1", source.Files[0], variable).Scale;
        int levels = pressure.Length, cells = source.FrameLength / levels;

        FrameSource? surface = null;
        double psScale = 1;
        if (o.SurfacePressure is { } psName)
        {
            surface = FrameSource.Open(o.Inputs, psName);
            if (surface.FrameLength != cells || surface.FrameCount != source.FrameCount)
                throw new BadInputException(surface.Files[0], psName, $"has {surface.FrameCount} frames of {surface.FrameLength} cells; {variable} has {source.FrameCount} of {cells} per level");
            psScale = Converter(surface.Template.RequireVariable(psName).Attributes.Text("units") ?? "Pa", "Pa", surface.Files[0], psName).Scale;
        }
        try
        {
            var template = FieldTemplate.From(source, without: levelVar.Name);
            var calendar = reader.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";
            var globals = Provenance.For(o.Command, source.Files).AsKeyValues(new Dictionary<string, string>
            {
                ["title"] = $"Total column water vapour from {variable} on {levels} pressure levels",
                ["derivation"] = "(1/g) integral of q dp, trapezoid rule over pressure levels, g = 9.80665 m s-2; " +
                    (surface is null ? "the column ends at the deepest level" : $"bounded by the surface pressure {o.SurfacePressure}: levels below the surface excluded, the cut layer ends at the surface with q interpolated linearly in pressure"),
            });
            using var w = new FieldNetCdfWriter(o.Output, template, -1, o.Format, globals);
            var time = w.Writer.AddVariable("time", NcType.Double, [w.Time],
                [NcAttribute.Text("standard_name", "time"), NcAttribute.Text("units", source.TimeUnits.Text), NcAttribute.Text("calendar", calendar), NcAttribute.Text("axis", "T")]);
            var tcwv = w.Writer.AddVariable("tcwv", NcType.Float, w.FieldDimensions(), template.DataAttributes.Where(a => a.Name is "coordinates" or "grid_mapping")
                .Append(NcAttribute.Text("standard_name", "atmosphere_mass_content_of_water_vapor"))
                .Append(NcAttribute.Text("long_name", $"total column water vapour from {variable}"))
                .Append(NcAttribute.Text("units", "kg m-2"))
                .Append(NcAttribute.Of("_FillValue", ClimatologyNetCdfWriter.Fill)));
            w.EndDefinitions();
            var frame = new float[source.FrameLength];
            var ps = new float[cells];
            var column = new double[levels];
            var result = new float[cells];
            for (int t = 0; t < source.FrameCount; t++)
            {
                source.ReadFrame(t, frame);
                surface?.ReadFrame(t, ps);
                for (int c = 0; c < cells; c++)
                {
                    for (int k = 0; k < levels; k++) column[k] = frame[k * cells + c] * qScale;
                    double bottom = surface is null ? double.NaN : ps[c] * psScale;
                    double v = surface is not null && double.IsNaN(bottom) ? double.NaN : Moisture.ColumnWaterVapour(pressure, column, bottom);
                    result[c] = double.IsNaN(v) ? ClimatologyNetCdfWriter.Fill : (float)v;
                }
                w.Writer.WriteRecord<double>(time, t, [source.TimeUnits.Encode(source.Times[t])]);
                w.Writer.WriteRecord<float>(tcwv, t, result);
                progress?.Report((t + 1, source.FrameCount));
            }
            w.Commit();
            return new DeriveSummary(source.FrameCount, levels, "tcwv");
        }
        finally
        {
            surface?.Dispose();
        }
    }

    static string FindBy(string path, string standardName)
    {
        using var reader = DatasetFiles.Open(path);
        return reader.Variables.FirstOrDefault(v => v.Attributes.Text("standard_name") == standardName)?.Name
            ?? throw new BadInputException(path, null, $"no variable with standard_name {standardName}: name it with --var");
    }

    static UnitConverter Converter(string from, string to, string path, string variable)
    {
        try { return UnitConverter.Between(from, to); }
        catch (FormatException e) { throw new BadInputException(path, variable, "units: " + e.Message); }
    }

    static void Convert(double[] values, string from, string to, string path, string variable)
    {
        var c = Converter(from, to, path, variable);
        for (int i = 0; i < values.Length; i++) values[i] = c.Convert(values[i]);
    }
}
