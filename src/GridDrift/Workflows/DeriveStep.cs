using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Units;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Outputs;
using GridDrift.Outputs.Fields;
using GridDrift.Operators.Physics;
using GridDrift.Results;

namespace GridDrift.Workflows;

internal sealed record DeriveOptions(
    IReadOnlyList<string> Inputs,
    string Quantity,
    string Output,
    string? Variable = null,
    string? SurfacePressure = null,
    ClassicVariant? Format = null,
    string Command = "griddrift derive",
    string? Temperature = null,
    string? Pressure = null,
    string? Units = null)
{
    /// <summary>Which frames of the record to read (`--period`; [input] period).</summary>
    public FrameSelection Selection { get; init; } = FrameSelection.All;
}

internal sealed record DeriveSummary(int Frames, int Levels, string Variable);

/// <summary>
/// `griddrift derive column-water-vapour`: total column water vapour (1/g)∫q dp from specific
/// humidity on pressure levels, frame by frame, bounded by the surface pressure where a
/// surface-pressure variable is named (<see cref="Moisture.ColumnWaterVapour"/>). Units of q and of
/// the pressures are converted (g/kg, kg kg-1, 1; hPa, Pa, mbar …). Written as a CF field with
/// standard_name atmosphere_mass_content_of_water_vapor on the input's horizontal grid.
/// </summary>
internal static class DeriveStep
{
    public static DeriveSummary Run(DeriveOptions o, IProgress<(int, int)>? progress = null)
    {
        if (o.Quantity is "relative-humidity" or "specific-humidity") return PointWise(o, progress);
        if (o.Quantity != "column-water-vapour")
            throw new BadInputException(null, null, $"derive {o.Quantity}: choose column-water-vapour, relative-humidity or specific-humidity");
        string variable = o.Variable ?? FindBy(o.Inputs[0], "specific_humidity");
        using var source = FrameSource.Open(o.Inputs, variable, o.Selection);
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
            surface = FrameSource.Open(o.Inputs, psName, o.Selection);
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
            var (time, _) = w.DefineTime(source.TimeUnits, calendar);
            var tcwv = w.DefineField("tcwv", template.DataAttributes.Where(a => a.Name is "coordinates" or "grid_mapping")
                .Append(NcAttribute.Text("standard_name", "atmosphere_mass_content_of_water_vapor"))
                .Append(NcAttribute.Text("long_name", $"total column water vapour from {variable}"))
                .Append(NcAttribute.Text("units", o.Units ?? "kg m-2")));
            w.EndDefinitions();
            var outUnits = o.Units is null ? null : Converter("kg m-2", o.Units, o.Output, "tcwv");
            var sources = surface is null ? new[] { source } : [source, surface];
            var op = new ColumnWaterVapourOperator(pressure, cells, qScale, psScale, outUnits, surface is not null, source.Times,
                new FieldRecords(w, time, tcwv, source.TimeUnits, cells));
            FrameEngine.Run(sources, Enumerable.Range(0, source.FrameCount).ToArray(), op, new EngineSettings(Workers: 0, progress));
            w.Commit();
            return new DeriveSummary(source.FrameCount, levels, "tcwv");
        }
        finally
        {
            surface?.Dispose();
        }
    }

    /// <summary>
    /// relative-humidity from specific humidity (--var), temperature (--temperature) and pressure;
    /// specific-humidity from dew point (--var) and pressure. The pressure is a variable of the same
    /// shape (--pressure) or, by default, the humidity's vertical coordinate.
    /// </summary>
    static DeriveSummary PointWise(DeriveOptions o, IProgress<(int, int)>? progress)
    {
        bool rh = o.Quantity == "relative-humidity";
        string variable = o.Variable ?? FindBy(o.Inputs[0], rh ? "specific_humidity" : "dew_point_temperature");
        using var source = FrameSource.Open(o.Inputs, variable, o.Selection);
        var reader = source.Template;
        var data = reader.RequireVariable(variable);
        var extra = new List<FrameSource>();
        try
        {
            FrameSource Companion(string name, string what)
            {
                var f = FrameSource.Open(o.Inputs, name, o.Selection);
                extra.Add(f);
                if (f.FrameLength != source.FrameLength || f.FrameCount != source.FrameCount)
                    throw new BadInputException(f.Files[0], name, $"{what} has {f.FrameCount} frames of {f.FrameLength} values; {variable} has {source.FrameCount} of {source.FrameLength}");
                return f;
            }
            FrameSource? temperature = rh ? Companion(o.Temperature ?? FindBy(o.Inputs[0], "air_temperature"), "the temperature") : null;
            FrameSource? pressureField = o.Pressure is { } pn ? Companion(pn, "the pressure") : null;
            double[]? levels = null;
            int cells = source.FrameLength;
            if (pressureField is null)
            {
                int vertical = source.Axes.IndexOf(AxisRole.Vertical);
                var levelVar = vertical >= 0 ? source.Axes.DimensionCoordinates[vertical] : null;
                if (levelVar is null || source.FrameDimensions[0].Name != levelVar.Name)
                    throw new BadInputException(source.Files[0], variable, "needs a pressure: name a pressure variable with --pressure, or give pressure levels as its first dimension after time");
                levels = reader.ReadAllDoubles(levelVar);
                Convert(levels, levelVar.Attributes.Text("units") ?? "Pa", "Pa", source.Files[0], levelVar.Name);
                cells = source.FrameLength / levels.Length;
            }
            double pScale = pressureField is null ? 1 : Converter(pressureField.Template.RequireVariable(o.Pressure!).Attributes.Text("units") ?? "Pa", "Pa", pressureField.Files[0], o.Pressure!).Scale;
            var inputUnits = Converter(data.Attributes.Text("units") ?? (rh ? "1" : "K"), rh ? "kg kg-1" : "K", source.Files[0], variable);
            var tUnits = temperature is null ? null : Converter(temperature.Template.RequireVariable(temperature.VariableName).Attributes.Text("units") ?? "K", "K", temperature.Files[0], temperature.VariableName);

            string name = rh ? "hur" : "hus";
            var template = FieldTemplate.From(source);
            var calendar = reader.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";
            var globals = Provenance.For(o.Command, source.Files).AsKeyValues(new Dictionary<string, string>
            {
                ["title"] = rh ? $"Relative humidity from {variable}" : $"Specific humidity from {variable}",
                ["derivation"] = (rh ? "RH = 100 e / e_s(T), e = q p / (0.622 + 0.378 q)" : "q = 0.622 e / (p - 0.378 e), e = e_s(dew point)") +
                    "; e_s over liquid water by Bolton (1980) eq. 10, 6.112 exp(17.67 T / (T + 243.5)) hPa, T in degC, within 0.1 % for -30 to 35 degC",
            });
            using var w = new FieldNetCdfWriter(o.Output, template, -1, o.Format, globals);
            var (time, _) = w.DefineTime(source.TimeUnits, calendar);
            var output = w.DefineField(name, template.DataAttributes.Where(a => a.Name is "coordinates" or "grid_mapping")
                .Append(NcAttribute.Text("standard_name", rh ? "relative_humidity" : "specific_humidity"))
                .Append(NcAttribute.Text("long_name", rh ? "relative humidity over liquid water" : $"specific humidity from the dew point {variable}"))
                .Append(NcAttribute.Text("units", o.Units ?? (rh ? "%" : "kg kg-1"))));
            w.EndDefinitions();
            var outUnits = o.Units is null ? null : Converter(rh ? "%" : "kg kg-1", o.Units, o.Output, name);
            var sources = new List<FrameSource> { source };
            if (temperature is not null) sources.Add(temperature);
            if (pressureField is not null) sources.Add(pressureField);
            var op = new HumidityOperator(rh ? HumidityQuantity.RelativeHumidity : HumidityQuantity.SpecificHumidityFromDewPoint, pressureField is null ? levels : null, cells,
                inputUnits, tUnits, pScale, outUnits, source.FrameLength, source.Times, new FieldRecords(w, time, output, source.TimeUnits, source.FrameLength));
            FrameEngine.Run(sources, Enumerable.Range(0, source.FrameCount).ToArray(), op, new EngineSettings(Workers: 0, progress));
            w.Commit();
            return new DeriveSummary(source.FrameCount, levels?.Length ?? 1, name);
        }
        finally
        {
            foreach (var f in extra) f.Dispose();
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
