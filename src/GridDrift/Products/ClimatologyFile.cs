using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Time;
using GridDrift.Conventions.Values;
using GridDrift.Formats;

namespace GridDrift.Products;

/// <summary>A climatology product read back (as griddrift climatology writes it): the slot scheme and the per-slot fields.</summary>
internal sealed class ClimatologyFile
{
    public required string Path { get; init; }
    public required SlotScheme Scheme { get; init; }
    public required float[] Mean { get; init; }
    public required float[] Std { get; init; }
    public required int Cells { get; init; }
    public required string BasePeriod { get; init; }
    public required string Units { get; init; }

    /// <summary>Expresses the climatology in other units (the mean fully, the standard deviation by the scale only).</summary>
    public void ConvertTo(string units)
    {
        if (units == Units) return;
        GridDrift.Conventions.Units.UnitConverter c;
        try { c = GridDrift.Conventions.Units.UnitConverter.Between(Units, units); }
        catch (FormatException e) { throw new BadInputException(Path, null, "units of the climatology: " + e.Message); }
        c.Convert(Mean);
        for (int i = 0; i < Std.Length; i++) Std[i] = (float)(Std[i] * c.Scale);
    }

    public ReadOnlySpan<float> MeanOf(int slot) => Mean.AsSpan(slot * Cells, Cells);
    public ReadOnlySpan<float> StdOf(int slot) => Std.AsSpan(slot * Cells, Cells);

    public static ClimatologyFile Read(string path, string variable)
    {
        using var reader = DatasetFiles.Open(path);
        var global = reader.Attributes;
        var kindText = global.Text("climatology_kind")
            ?? throw new BadInputException(path, null, "is not a GridDrift climatology (no climatology_kind attribute); make one with griddrift climatology");
        var kind = ClimatologyKinds.Parse(kindText) ?? throw new BadInputException(path, null, $"climatology_kind '{kindText}' is not month, day-of-year or hour-by-month");
        var time = reader.RequireVariable("time");
        var calendar = CfCalendars.Parse(time.Attributes.Text("calendar"))
            ?? throw new BadInputException(path, "time", $"calendar '{time.Attributes.Text("calendar")}' is not a CF calendar");
        var scheme = kind switch
        {
            ClimatologyKind.HourByMonth => SlotScheme.HoursByMonth(calendar, (global.Text("climatology_times_of_day") ?? "")
                .Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(t => TimeSpan.Parse(t, System.Globalization.CultureInfo.InvariantCulture).Ticks / 10)),
            _ => SlotScheme.For(kind, calendar, []),
        };
        if (time.Dimensions.Count != 1 || time.Dimensions[0].Length != scheme.SlotCount)
            throw new BadInputException(path, "time", $"has {time.ElementCount} steps; a {kind.Name()} climatology in the {calendar.CfName()} calendar has {scheme.SlotCount}");
        // the climatology names its fields as the input variable, made safe for NetCDF (NcNames)
        if (reader.FindVariable(variable) is null && reader.FindVariable(NcNames.Safe(variable)) is not null) variable = NcNames.Safe(variable);
        var mean = Field(reader, reader.RequireVariable(variable), scheme.SlotCount, path);
        var std = Field(reader, reader.RequireVariable(variable + "_std"), scheme.SlotCount, path);
        return new ClimatologyFile
        {
            Path = path, Scheme = scheme, Mean = mean, Std = std, Cells = mean.Length / scheme.SlotCount,
            BasePeriod = global.Text("climatology_base_period") ?? "",
            Units = reader.RequireVariable(variable).Attributes.Text("units") ?? "1",
        };
    }

    static float[] Field(IDatasetReader reader, NcVariable v, int slots, string path)
    {
        if (v.Rank < 2 || v.Dimensions[0].Length != slots)
            throw new BadInputException(path, v.Name, $"should have time ({slots} slots) as its first dimension");
        var raw = reader.ReadAllDoubles(v);
        var values = new float[raw.Length];
        ValueCodec.For(v).Decode(raw, values);
        return values;
    }
}
