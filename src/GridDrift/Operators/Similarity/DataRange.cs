using System.Globalization;
using GridDrift.Formats;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// The FIXED data range L of SSIM (and the 0–255 rescaling of VIF): from --range LO:HI, else the
/// variable's valid_min/valid_max (or valid_range), else a documented default for its
/// standard_name. Never a frame's own minimum and maximum: frames must stay comparable.
/// </summary>
internal sealed record DataRange(double Low, double High, string Source)
{
    public double Width => High - Low;

    /// <summary>Defaults by CF standard_name (physically plausible spans of the quantity, common practice).</summary>
    public static readonly IReadOnlyDictionary<string, (double Low, double High)> Defaults = new Dictionary<string, (double, double)>
    {
        ["toa_brightness_temperature"] = (180, 320),
        ["brightness_temperature"] = (180, 320),
        ["atmosphere_mass_content_of_water_vapor"] = (0, 80),
        ["lwe_thickness_of_atmosphere_mass_content_of_water_vapor"] = (0, 0.08),
        ["specific_humidity"] = (0, 0.03),
        ["relative_humidity"] = (0, 100),
        ["air_temperature"] = (180, 330),
    };

    /// <summary>
    /// <see cref="Resolve(string?, NcVariable, string)"/> for frames delivered in <paramref name="deliveredUnits"/>:
    /// a range from the file's attributes or the standard_name defaults is in the file's units and is converted.
    /// </summary>
    public static DataRange Resolve(string? option, NcVariable variable, string path, string deliveredUnits)
    {
        var range = Resolve(option, variable, path);
        string fileUnits = variable.Attributes.Text("units") ?? "1";
        if (option is not null || fileUnits == deliveredUnits) return range;
        var c = GridDrift.Conventions.Units.UnitConverter.Between(fileUnits, deliveredUnits);
        return range with { Low = c.Convert(range.Low), High = c.Convert(range.High) };
    }

    /// <summary>A range given as LO:HI with LO &lt; HI; throws FormatException otherwise.</summary>
    public static DataRange ParseOption(string text)
    {
        var parts = text.Split(':');
        if (parts.Length == 2 && double.TryParse(parts[0], NumberStyles.Float, CultureInfo.InvariantCulture, out var lo)
            && double.TryParse(parts[1], NumberStyles.Float, CultureInfo.InvariantCulture, out var hi) && hi > lo && double.IsFinite(lo) && double.IsFinite(hi))
            return new DataRange(lo, hi, "--range");
        throw new FormatException("expected LO:HI with LO < HI");
    }

    public static DataRange Resolve(string? option, NcVariable variable, string path)
    {
        if (option is not null)
            try { return ParseOption(option); }
            catch (FormatException e) { throw new BadInputException(null, null, $"--range {option}: {e.Message}"); }
        // the valid range as CF decoding reads it (packed bounds unpacked), the one place it is parsed
        if (GridDrift.Conventions.Values.ValueCodec.For(variable).ValidRange is { } valid && valid.High > valid.Low)
            return new DataRange(valid.Low, valid.High, "valid_min/valid_max");
        var a = variable.Attributes;
        if (a.Text("standard_name") is { } name && Defaults.TryGetValue(name, out var d)) return new DataRange(d.Low, d.High, $"default for {name}");
        throw new BadInputException(path, variable.Name,
            "no fixed data range: give --range LO:HI (SSIM needs one range for all frames; the variable has no valid_min/valid_max and no standard_name with a default)");
    }
}
