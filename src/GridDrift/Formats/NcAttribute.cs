using System.Globalization;

namespace GridDrift.Formats;

/// <summary>
/// A NetCDF attribute. <see cref="Values"/> holds a typed array matching <see cref="Type"/>
/// (sbyte[], short[], int[], float[], double[], byte[], ushort[], uint[], long[], ulong[]),
/// a <see cref="string"/> for NC_CHAR text, or string[] for NC_STRING.
/// </summary>
internal sealed class NcAttribute
{
    public string Name { get; }
    public NcType Type { get; }
    public object Values { get; }

    public NcAttribute(string name, NcType type, object values)
    {
        Name = name;
        Type = type;
        Values = values;
    }

    public static NcAttribute Text(string name, string value) => new(name, NcType.Char, value);
    public static NcAttribute Of(string name, params double[] values) => new(name, NcType.Double, values);
    public static NcAttribute Of(string name, params float[] values) => new(name, NcType.Float, values);
    public static NcAttribute Of(string name, params int[] values) => new(name, NcType.Int, values);
    public static NcAttribute Of(string name, params short[] values) => new(name, NcType.Short, values);

    public int Count => Values switch
    {
        string => 1,
        Array a => a.Length,
        _ => 0,
    };

    /// <summary>Text of a char or string attribute (string arrays joined by newlines); null for numbers.</summary>
    public string? AsText() => Values switch
    {
        string s => s,
        string[] a => string.Join("\n", a),
        _ => null,
    };

    /// <summary>Numeric values as double (exact for every type but the largest 64-bit integers).</summary>
    public double[] AsDoubles()
    {
        if (Values is string or string[]) return [];
        var array = (Array)Values;
        var result = new double[array.Length];
        for (int i = 0; i < result.Length; i++)
            result[i] = Convert.ToDouble(array.GetValue(i), CultureInfo.InvariantCulture);
        return result;
    }

    public double? FirstNumber()
    {
        var values = AsDoubles();
        return values.Length > 0 ? values[0] : null;
    }

    // global attributes of products whose values are numbers, kept as text in the steps' dictionaries
    static readonly HashSet<string> NumericGlobals = ["earth_radius_m", "min_valid", "climatology_base_years"];
    static readonly HashSet<string> IntegerGlobals = ["lag", "climatology_frames", "frames_of_record"];

    /// <summary>A product's global attribute: a number where the attribute is one (earth_radius_m, min_valid, climatology_frames …), else text.</summary>
    public static NcAttribute Global(string name, string value)
    {
        if (IntegerGlobals.Contains(name) && int.TryParse(value, NumberStyles.Integer, CultureInfo.InvariantCulture, out int i)) return Of(name, i);
        if (NumericGlobals.Contains(name) && double.TryParse(value, NumberStyles.Float, CultureInfo.InvariantCulture, out double d)) return Of(name, d);
        return Text(name, value);
    }

    /// <summary>Text of a text attribute, the invariant rendering of a numeric one: how the steps' attribute dictionaries hold both.</summary>
    public string AsTextOrNumber() => AsText() ?? Render();

    /// <summary>The CDL-like rendering used by `describe` (numbers in invariant culture, text quoted).</summary>
    public string Render()
    {
        if (AsText() is { } text) return "\"" + text.Replace("\n", "\\n") + "\"";
        var array = (Array)Values;
        var parts = new string[array.Length];
        for (int i = 0; i < parts.Length; i++)
            parts[i] = Convert.ToString(array.GetValue(i), CultureInfo.InvariantCulture) ?? "";
        return string.Join(", ", parts);
    }

    public override string ToString() => $"{Name} = {Render()}";
}

internal static class NcAttributeListExtensions
{
    public static NcAttribute? Find(this IReadOnlyList<NcAttribute> attributes, string name)
    {
        foreach (var a in attributes)
            if (a.Name == name) return a;
        return null;
    }

    public static string? Text(this IReadOnlyList<NcAttribute> attributes, string name) =>
        attributes.Find(name)?.AsText();
}
