using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using GridDrift.Analysis;
using GridDrift.Conventions.Time;
using GridDrift.Outputs;
using GridDrift.Outputs.Series;
using GridDrift.Outputs.Tables;
using GridDrift.Results;
using GridDrift.Products;
using GridDrift.Workflows.Options;

namespace GridDrift.Workflows;

internal sealed record EventsOptions(
    string Input,
    string Output,
    string? Quantity = null,
    IReadOnlyList<string>? Regions = null,
    SeriesAnalysisOptions? Analysis = null,
    string Command = "griddrift events",
    string? PlotDirectory = null);

internal sealed record EventsSummary(int Series, int Events, int ChangePoints, int SignificantChanges, string FlagsTable, string CountsTable, string TrendsTable, string ChangePointsTable, JsonObject Json);

/// <summary>
/// `griddrift events`: reads a series product, analyses each chosen region's series of one
/// quantity (<see cref="SeriesAnalysis"/>) and writes four tidy tables — flags, counts, trends,
/// change points — beside a JSON summary.
/// </summary>
internal static class EventsStep
{
    public static readonly SeriesAnalysisOptions Defaults = new(
        [Detector.RobustZ, Detector.Hampel, Detector.Iqr, Detector.SeasonalResidual, Detector.Gesd],
        [ChangeMethod.Pettitt, ChangeMethod.PeltMean, ChangeMethod.PeltMeanVariance, ChangeMethod.EventRate]);

    public static EventsSummary Run(EventsOptions o)
    {
        var series = SeriesFile.Read(o.Input);
        string quantity = o.Quantity ?? (series.Quantities.Count == 1 ? series.Quantities.Keys.First()
            : throw new BadInputException(o.Input, null, $"holds several quantities ({string.Join(", ", series.Quantities.Keys)}): choose one with --quantity"));
        if (!series.Quantities.TryGetValue(quantity, out var values))
            throw new BadInputException(o.Input, quantity, $"no such quantity (the file has: {string.Join(", ", series.Quantities.Keys)})");
        var regions = o.Regions is { Count: > 0 } ? o.Regions : series.Regions;
        foreach (var r in regions)
            if (!series.Regions.Contains(r)) throw new BadInputException(o.Input, quantity, $"has no region '{r}' (it has: {string.Join(", ", series.Regions)})");
        if (series.Times.Length < 3) throw new BadInputException(o.Input, quantity, $"has {series.Times.Length} time steps; the analysis needs at least 3");
        var times = series.Times;
        string units = series.Units.TryGetValue(quantity, out var u) ? u : "";
        var regionSeries = regions.Select(region =>
        {
            int r = Array.IndexOf(series.Regions, region);
            return Enumerable.Range(0, times.Length).Select(t => values[t * series.Regions.Length + r]).ToArray();
        }).ToArray();
        var found = EventAnalysis.Run(times, regions, regionSeries, quantity, units, o.Analysis ?? Defaults);
        var analysis = found.Options;
        if (o.PlotDirectory is { } plots)
        {
            Directory.CreateDirectory(plots);
            foreach (var r in found.Regions)
            {
                string safe = string.Concat(r.Region.Select(ch => char.IsLetterOrDigit(ch) || ch is '-' or '_' ? ch : '_'));
                GridDrift.Outputs.Plots.AnalysisPlots.Series(Path.Combine(plots, $"series_{safe}.png"), r.Region, quantity, units, times, r.Values, r.Findings, analysis.Alpha);
                GridDrift.Outputs.Plots.AnalysisPlots.EventCounts(Path.Combine(plots, $"counts_{safe}.png"), r.Region, times, r.Findings.Events, r.Findings, analysis.Alpha);
            }
        }
        var metadata = Provenance.For(o.Command, [o.Input]).AsKeyValues(new Dictionary<string, string>
        {
            ["title"] = $"Events, trends and change points of {quantity}",
            ["detectors"] = string.Join(",", analysis.Detectors.Select(MethodNames.Name)),
            ["detectors_on"] = analysis.OnResiduals switch
            {
                true => "residuals of the seasonal model",
                false => "raw values",
                null => "residuals of the seasonal model when the record spans two years or more, else raw values",
            },
            ["seasonal_model"] = "least squares over the whole record: a constant, 3 annual harmonics, and 2 diurnal harmonics for sub-daily steps",
            ["tests"] = "Pettitt and Mann-Kendall on the series whitened by its AR sieve (Yule-Walker, order by AIC); PELT on the whitened series with the penalty calibrated to alpha; q by Benjamini-Hochberg over every p-value of the run",
            ["alpha"] = analysis.Alpha.ToString("R", CultureInfo.InvariantCulture),
            ["event_rule"] = $"at least {analysis.Consensus} detectors flag the value",
            ["window_days"] = analysis.WindowDays.ToString(CultureInfo.InvariantCulture),
            ["pelt_penalty"] = "per change, the (1 - alpha) quantile of the largest one-split cost drop of white noise of the same length (999 simulations)",
            ["pelt_min_segment"] = analysis.MinSegment.ToString(CultureInfo.InvariantCulture),
            ["slope_units"] = (units == "" ? "quantity" : units) + " per day",
            ["calendar"] = times[0].Calendar.CfName(),
        });
        var paths = new EventTables.Paths(o.Output, ProductNames.Beside(o.Output, ProductNames.Counts), ProductNames.Beside(o.Output, ProductNames.Trends),
            ProductNames.Beside(o.Output, ProductNames.ChangePoints));
        EventTables.Write(found, paths, metadata);
        return new EventsSummary(regions.Count, found.EventCount, found.ChangePointCount, found.SignificantChangeCount, paths.Flags, paths.Counts, paths.Trends, paths.ChangePoints,
            EventTables.Summary(found, o.Input, metadata));
    }


    /// <summary>A window of days as the command line and recipes give it: 365d or 365; throws FormatException otherwise.</summary>
    public static double ParseWindowDays(string text)
    {
        string days = text.Trim().TrimEnd('d', 'D');
        if (!double.TryParse(days, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double value) || !(value > 0) || double.IsInfinity(value))
            throw new FormatException("give a positive number of days, e.g. 365d");
        return value;
    }

    public static string Serialize(JsonObject json) => json.ToJsonString(new JsonSerializerOptions { WriteIndented = true });
}
