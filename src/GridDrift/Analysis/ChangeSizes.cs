namespace GridDrift.Analysis;

/// <summary>The size of a change in the mean in units of the series' short-term noise (the standard deviation of its step-to-step differences over √2).</summary>
internal static class ChangeSizes
{
    public sealed record Sized(string Region, string Time, double Shift, double Size);

    /// <summary>Each change's |after − before| ÷ its region's noise, largest first (NaN sizes last).</summary>
    public static List<Sized> InNoiseUnits(IEnumerable<(string Region, string Time, double Before, double After)> changes, IReadOnlyDictionary<string, double> noise) =>
        changes.Select(c => new Sized(c.Region, c.Time, c.After - c.Before, Math.Abs(c.After - c.Before) / noise.GetValueOrDefault(c.Region, double.NaN)))
            .OrderByDescending(c => double.IsNaN(c.Size) ? -1 : c.Size).ToList();
}
