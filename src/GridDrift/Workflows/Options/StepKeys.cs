using GridDrift.Analysis;
using GridDrift.Operators.Climatology;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using static GridDrift.Workflows.Options.KeyChecks;

namespace GridDrift.Workflows.Options;

/// <summary>Options several commands share.</summary>
internal static class CommonKeys
{
    public static readonly StepKey<double> MinValid = new("min-valid", "a region with less than this fraction of its area valid gives NaN", 0.5, Between(0.0, 1.0));
    public static readonly StepKey<string> Out = new("out", "the product to write", "");
    public static readonly StepKey<string?> Table = new("table", "tidy Parquet table to write as well", null);
    public static readonly StepKey<string?> Plot = new("plot", "folder for the PNG figures", null);
    public static readonly StepKey<string?> Quantity = new("quantity", "the quantity to analyse (needed when the series holds several)", null);
}

/// <summary>`griddrift stats` and a recipe's [stats].</summary>
internal static class StatsKeys
{
    public static readonly StepKey<string> Stat = new("stat", "statistics, comma-separated: mean,std,min,max,p10,p50,p90,valid (default: all)",
        "mean,std,min,max,p10,p50,p90,valid", ListOf(RegionStatistics.Parse));

    public static readonly IReadOnlyList<StepKey> All = [Stat, CommonKeys.MinValid, CommonKeys.Out, CommonKeys.Table];

    public static RegionStatistic[] Statistics(string text) => Items(text).Select(RegionStatistics.Parse).Distinct().ToArray();

    internal static string[] Items(string text) => text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
}

/// <summary>`griddrift similarity` and a recipe's [similarity].</summary>
internal static class SimilarityKeys
{
    public static readonly StepKey<string> Metric = new("metric", "metrics, comma-separated: ssim, vif, corr, rmsd, mean-abs-change, bias (default: ssim,corr,rmsd,mean-abs-change)",
        "ssim,corr,rmsd,mean-abs-change", ListOf(SimilarityMetrics.Parse));
    public static readonly StepKey<int> Lag = new("lag", "compare each frame with the one LAG steps earlier", 1, AtLeast(1));
    public static readonly StepKey<string?> Range = new("range", "fixed dynamic range LO:HI of SSIM and VIF (default: valid_min/valid_max, else a default for the standard_name)", null,
        Accepts(text => DataRange.ParseOption(text)));
    public static readonly StepKey<bool> AcrossGaps = new("across-gaps", "also compare frames across gaps in the record (they are skipped and listed otherwise)", false);

    public static readonly IReadOnlyList<StepKey> All = [Metric, Lag, Range, AcrossGaps, CommonKeys.MinValid, CommonKeys.Out, CommonKeys.Table];

    public static SimilarityMetric[] Metrics(string text) => StatsKeys.Items(text).Select(SimilarityMetrics.Parse).Distinct().ToArray();
}

/// <summary>`griddrift climatology` and a recipe's [climatology].</summary>
internal static class ClimatologyKeys
{
    public static readonly StepKey<string> By = new("by", "slots: month, day-of-year or hour-by-month (the diurnal cycle of each month)", "month",
        OneOf("month", "day-of-year", "hour-by-month"));
    public static readonly StepKey<string?> Base = new("base", "base period START/END, e.g. 1991/2020 or 2031-01-01/2033-12-31 (default: the whole record)", null);
    public static readonly StepKey<string?> Smooth = new("smooth", "day-of-year smoothing: harmonics:N (first N annual harmonics) or window:DAYS (odd, wraps the year)", null,
        Accepts(text => Smoothing.Parse(text)));

    public static readonly IReadOnlyList<StepKey> All = [By, Base, Smooth, CommonKeys.Out];

    public static ClimatologyKind Kind(string text) => ClimatologyKinds.Parse(text) ?? throw new FormatException("choose month, day-of-year or hour-by-month");
}

/// <summary>`griddrift anomalies` and a recipe's [anomalies].</summary>
internal static class AnomaliesKeys
{
    public static readonly StepKey<string> Kind = new("kind", "absolute (x − mean), relative (percent of the mean) or standardized (÷ standard deviation)", "absolute",
        OneOf("absolute", "relative", "standardized"));
    /// <summary>A recipe's choice to keep the anomaly fields as well as the region series (the command line always writes them to --out).</summary>
    public static readonly StepKey<bool> Fields = new("fields", "also write the anomaly fields (OUT_fields.nc)", false);

    public static readonly IReadOnlyList<StepKey> All = [Kind, Fields, CommonKeys.MinValid, CommonKeys.Out, CommonKeys.Table];

    public static AnomalyKind KindOf(string text) => Anomaly.Parse(text) ?? throw new FormatException("choose absolute, relative or standardized");
}

/// <summary>`griddrift events` and a recipe's [events].</summary>
internal static class EventsKeys
{
    public static readonly StepKey<string> Detect = new("detect", "detectors: robust-z,hampel,iqr,seasonal-residual,gesd (default: all)",
        "robust-z,hampel,iqr,seasonal-residual,gesd", ListOf(MethodNames.ParseDetector));
    public static readonly StepKey<string> On = new("on", "residuals: detect and test on the residuals of a seasonal model; raw: on the values; auto: residuals when the record spans two years or more",
        "auto", OneOf("auto", "raw", "residuals"));
    public static readonly StepKey<string> Window = new("window", "moving window of the event counts, in days (e.g. 365d)", "365d", Accepts(w => EventsStep.ParseWindowDays(w)));
    public static readonly StepKey<string> Changepoints = new("changepoints", "pettitt, pelt (both PELT costs), pelt-mean, pelt-mean-variance, event-rate (change of the monthly event rate)", "pettitt,pelt,event-rate",
        ListOf(MethodNames.ParseChangeMethods));
    public static readonly StepKey<int> Consensus = new("consensus", "detectors that must agree for an event", 2, Between(1, 5));
    public static readonly StepKey<int> MinSegment = new("min-segment", "PELT's shortest segment, in time steps", 10, AtLeast(2));
    /// <summary>A recipe's series to analyse, named as a product of an earlier step (the command line takes it as its argument).</summary>
    public static readonly StepKey<string> Series = new("series", "the series product to analyse", "");

    public static readonly IReadOnlyList<StepKey> All = [Series, CommonKeys.Quantity, Detect, On, Window, Changepoints, Consensus, MinSegment, CommonKeys.Out, CommonKeys.Plot];
}

/// <summary>`griddrift attribute` and a recipe's [attribute].</summary>
internal static class AttributeKeys
{
    public static readonly StepKey<string> Target = new("target", "the region whose series is explained", "global");
    public static readonly StepKey<string?> Periods = new("periods", "two periods A/B,C/D whose region ranks are compared (default: before/after the target's change point)", null);
    public static readonly StepKey<string[]> Profiles = new("profiles", "regions whose partial dependence and ICE profiles are written", []);

    public static readonly IReadOnlyList<StepKey> All = [EventsKeys.Series, Target, CommonKeys.Quantity, Periods, Profiles, CommonKeys.Out, CommonKeys.Plot];
}

/// <summary>The analysis of `griddrift events` from its keys' values, the same for the command line and a recipe.</summary>
internal static class EventsAnalysis
{
    public static Analysis.SeriesAnalysisOptions From(string detect, string on, string window, string changepoints, int consensus, int minSegment) => new(
        StatsKeys.Items(detect).Select(MethodNames.ParseDetector).Distinct().ToArray(),
        StatsKeys.Items(changepoints).SelectMany(MethodNames.ParseChangeMethods).Distinct().ToArray(),
        on switch { "residuals" => true, "raw" => false, _ => null },
        EventsStep.ParseWindowDays(window),
        consensus,
        minSegment);
}
