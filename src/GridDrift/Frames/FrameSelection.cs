using GridDrift.Conventions.Time;

namespace GridDrift.Frames;

/// <summary>
/// Which frames of a record to read, and which 2-D slice of each: a time window (`--period`), a
/// vertical level (`--level 300hPa`, matched on the CF vertical coordinate in its own units), and
/// any other non-horizontal dimension fixed by value or index (`--at member=3`, `--at band#0`).
/// The same record for the command line and for recipes ([input] period, level, at).
/// </summary>
public sealed record FrameSelection(RecordWindow? Period = null, string? Level = null, IReadOnlyList<string>? At = null)
{
    public static readonly FrameSelection All = new();

    /// <summary>From the texts of the options (null or empty for none); a malformed one is a FormatException.</summary>
    public static FrameSelection Of(string? period, string? level = null, IReadOnlyList<string>? at = null)
    {
        if (level is not null) LevelValue.Parse(level);
        foreach (var a in at ?? []) DimensionPick.Parse(a);
        return new(period is null ? null : RecordWindow.Parse(period), level, at is { Count: > 0 } ? at : null);
    }
}

/// <summary>A level as written: a number and, optionally, its units ("300hPa", "850 hPa", "30000", "2 m").</summary>
public readonly record struct LevelValue(double Value, string? Units)
{
    public static LevelValue Parse(string text)
    {
        var m = System.Text.RegularExpressions.Regex.Match(text.Trim(), @"^([-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?)\s*(.*)$");
        if (!m.Success || !double.TryParse(m.Groups[1].Value, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double v) || !double.IsFinite(v))
            throw new FormatException($"'{text}' is not a level: a number with optional units, e.g. 300hPa or 850");
        string units = m.Groups[4].Value.Trim();
        return new LevelValue(v, units.Length == 0 ? null : units);
    }
}

/// <summary>One dimension fixed: NAME=VALUE (matched on the dimension's coordinate) or NAME#INDEX (from 0).</summary>
public readonly record struct DimensionPick(string Dimension, double? Value, int? Index)
{
    public static DimensionPick Parse(string text)
    {
        int hash = text.IndexOf('#'), eq = text.IndexOf('=');
        if (hash > 0 && int.TryParse(text[(hash + 1)..], System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture, out int index))
            return new DimensionPick(text[..hash].Trim(), null, index);
        if (eq > 0 && double.TryParse(text[(eq + 1)..], System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double value) && double.IsFinite(value))
            return new DimensionPick(text[..eq].Trim(), value, null);
        throw new FormatException($"'{text}' is not DIMENSION=VALUE or DIMENSION#INDEX (e.g. member=3, band#0)");
    }
}
