using GridDrift.Results;

namespace GridDrift.Operators.Statistics;

/// <summary>The per-region statistics of `griddrift stats`.</summary>
public enum RegionStatistic
{
    Mean,
    Std,
    Min,
    Max,
    P10,
    P50,
    P90,
    /// <summary>Area with data ÷ region area.</summary>
    Valid,
}

public static class RegionStatistics
{
    public static readonly RegionStatistic[] All =
        [RegionStatistic.Mean, RegionStatistic.Std, RegionStatistic.Min, RegionStatistic.Max, RegionStatistic.P10, RegionStatistic.P50, RegionStatistic.P90, RegionStatistic.Valid];

    public static string Name(this RegionStatistic s) => s switch
    {
        RegionStatistic.Mean => "mean",
        RegionStatistic.Std => "std",
        RegionStatistic.Min => "min",
        RegionStatistic.Max => "max",
        RegionStatistic.P10 => "p10",
        RegionStatistic.P50 => "p50",
        RegionStatistic.P90 => "p90",
        _ => "valid",
    };

    public static RegionStatistic Parse(string name) =>
        All.FirstOrDefault(s => s.Name() == name.Trim().ToLowerInvariant(), (RegionStatistic)(-1)) is var s && (int)s >= 0
            ? s : throw new FormatException($"unknown statistic '{name}' (choose from {string.Join(", ", All.Select(x => x.Name()))})");

    public static double? Quantile(this RegionStatistic s) => s switch
    {
        RegionStatistic.P10 => 0.10,
        RegionStatistic.P50 => 0.50,
        RegionStatistic.P90 => 0.90,
        _ => null,
    };

    /// <summary>The series quantity a statistic becomes: its variable name, long name, units and CF cell_methods.</summary>
    public static SeriesQuantity Quantity(this RegionStatistic s, string variable, string units) => s switch
    {
        RegionStatistic.Mean => new("mean", $"area-weighted mean of {variable}", units, "area: mean"),
        RegionStatistic.Std => new("std", $"area-weighted standard deviation of {variable}", units, "area: standard_deviation"),
        RegionStatistic.Min => new("min", $"minimum of {variable} over the region", units, "area: minimum"),
        RegionStatistic.Max => new("max", $"maximum of {variable} over the region", units, "area: maximum"),
        RegionStatistic.P50 => new("p50", $"area-weighted median of {variable}", units, "area: median"),
        // CF cell_methods has no percentile method: the long name says what it is.
        RegionStatistic.P10 => new("p10", $"area-weighted 10th percentile of {variable}", units, ""),
        RegionStatistic.P90 => new("p90", $"area-weighted 90th percentile of {variable}", units, ""),
        _ => throw new ArgumentOutOfRangeException(nameof(s)),
    };
}
