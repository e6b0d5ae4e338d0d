using System.Globalization;

namespace GridDrift.Operators.Climatology;

/// <summary>How a day-of-year climatology is smoothed: `harmonics:N` or `window:DAYS`.</summary>
internal abstract record Smoothing
{
    public sealed record Harmonics(int Count) : Smoothing;
    public sealed record Window(int Days) : Smoothing;

    public static Smoothing Parse(string text)
    {
        var parts = text.Split(':', 2);
        if (parts.Length == 2 && int.TryParse(parts[1], NumberStyles.None, CultureInfo.InvariantCulture, out int n) && n > 0)
        {
            if (parts[0] == "harmonics") return new Harmonics(n);
            if (parts[0] == "window")
                return n % 2 == 1 ? new Window(n) : throw new FormatException($"--smooth window:{n}: the window must be an odd number of days, centred on its day");
        }
        throw new FormatException($"--smooth '{text}' is not harmonics:N or window:DAYS");
    }

    public string Describe() => this switch
    {
        Harmonics h => $"least-squares fit of the mean and of the standard deviation over the slots to a constant and the first {h.Count} annual harmonics, each slot weighted by its sample count",
        Window w => $"pooled over a centred window of {w.Days} day slots that wraps the year (Chan et al. merge of the slots' states); counts are the pooled counts",
        _ => "",
    };
}
