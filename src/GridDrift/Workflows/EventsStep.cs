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

internal sealed record EventsSummary(int Series, int Events, int ChangePoints, string FlagsTable, string CountsTable, string TrendsTable, string ChangePointsTable, JsonObject Json);

/// <summary>
/// `griddrift events`: reads a series product, analyses each chosen region's series of one
/// quantity (<see cref="SeriesAnalysis"/>) and writes four tidy tables — flags, counts, trends,
/// change points — beside a JSON summary.
/// </summary>
internal static class EventsStep
{
    public static readonly SeriesAnalysisOptions Defaults = new(
        [Detector.RobustZ, Detector.Hampel, Detector.Iqr, Detector.SeasonalResidual, Detector.Gesd],
        [ChangeMethod.Pettitt, ChangeMethod.PeltMean, ChangeMethod.PeltMeanVariance]);

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
        var analysis = (o.Analysis ?? Defaults) with { YearDays = series.Times[0].Calendar.MeanYearDays() };
        var times = series.Times;
        var days = times.Select(t => t.SecondsSince(times[0]) / 86400.0).ToArray();
        string units = series.Units.TryGetValue(quantity, out var u) ? u : "";

        var flags = new TableBuilder().Text("time").Text("region").Text("quantity").Number("value").Text("detector").Number("score").Number("threshold").Flag("flagged").Integer("consensus").Flag("event");
        var counts = new TableBuilder().Text("region").Text("quantity").Text("kind").Text("period").Integer("count");
        var trends = new TableBuilder().Text("region").Text("quantity").Text("scope").Text("start").Text("end").Integer("n").Number("mk_s").Number("mk_s_variance")
            .Number("mk_z").Number("mk_p").Number("mk_z_hamed_rao").Number("mk_p_hamed_rao").Number("sen_slope_per_day").Number("sen_slope_lo").Number("sen_slope_hi").Text("units");
        var changes = new TableBuilder().Text("region").Text("quantity").Text("method").Text("time").Number("p_value").Number("mean_before").Number("mean_after")
            .Number("sen_slope_before_per_day").Number("sen_slope_after_per_day").Flag("trend_reverses");
        var jsonChanges = new JsonArray();
        var jsonTrends = new JsonArray();
        int eventCount = 0;
        // the regions are independent: analyse them on every core, then write in their order
        var series_ = regions.Select(region =>
        {
            int r = Array.IndexOf(series.Regions, region);
            return Enumerable.Range(0, times.Length).Select(t => values[t * series.Regions.Length + r]).ToArray();
        }).ToArray();
        var findings = new SeriesFindings[regions.Count];
        Parallel.For(0, regions.Count, k => findings[k] = SeriesAnalysis.Analyse(days, series_[k], analysis));
        for (int regionIndex = 0; regionIndex < regions.Count; regionIndex++)
        {
            string region = regions[regionIndex];
            var x = series_[regionIndex];
            var found = findings[regionIndex];
            for (int t = 0; t < times.Length; t++)
            {
                string iso = times[t].ToIsoString();
                foreach (var (detector, f) in found.Flags)
                    flags.Add(iso, region, quantity, x[t], Name(detector), f[t].Score, f[t].Threshold, f[t].Flagged, found.Consensus[t], found.Events[t]);
                counts.Add(region, quantity, "window", iso, found.WindowCounts[t]);
                if (found.Events[t]) eventCount++;
            }
            var yearly = Enumerable.Range(0, times.Length).GroupBy(t => times[t].Year).Select(g => (Year: g.Key, Count: g.Count(t => found.Events[t]))).ToList();
            foreach (var (year, count) in yearly) counts.Add(region, quantity, "year", year.ToString("0000", CultureInfo.InvariantCulture), count);
            if (o.PlotDirectory is { } plots)
            {
                Directory.CreateDirectory(plots);
                string safe = string.Concat(region.Select(ch => char.IsLetterOrDigit(ch) || ch is '-' or '_' ? ch : '_'));
                GridDrift.Outputs.Plots.AnalysisPlots.Series(Path.Combine(plots, $"series_{safe}.png"), region, quantity, units, times, x, found);
                var change = found.ChangePoints.FirstOrDefault(c => c.Method == ChangeMethod.PeltMean) ?? found.ChangePoints.FirstOrDefault();
                GridDrift.Outputs.Plots.AnalysisPlots.YearlyCounts(Path.Combine(plots, $"counts_{safe}.png"), region, yearly,
                    change is null ? null : times[change.FirstAfter].Year);
            }
            AddTrend(trends, region, quantity, "record", times[0], times[^1], found.Trend, found.Slope, units);
            jsonTrends.Add(new JsonObject
            {
                ["region"] = region, ["quantity"] = quantity,
                ["sen_slope"] = Number(found.Slope.Slope), ["sen_slope_lo"] = Number(found.Slope.Low), ["sen_slope_hi"] = Number(found.Slope.High),
                ["mk_z"] = Number(found.Trend.ZCorrected), ["mk_p"] = Number(found.Trend.PCorrected),
                ["mk_z_uncorrected"] = Number(found.Trend.Z), ["mk_p_uncorrected"] = Number(found.Trend.P),
                ["noise_sd"] = Number(RobustStatistics.DifferenceNoise(x.Where(v => !double.IsNaN(v)).ToArray())),
            });
            foreach (var (first, end, trend, slope) in found.Segments)
                AddTrend(trends, region, quantity, "segment", times[first], times[end - 1], trend, slope, units);
            foreach (var c in found.ChangePoints)
            {
                string when = times[c.FirstAfter].ToIsoString();
                changes.Add(region, quantity, Name(c.Method), when, c.P ?? double.NaN, c.MeanBefore, c.MeanAfter, c.Before.Slope, c.After.Slope, c.TrendReverses);
                jsonChanges.Add(new JsonObject
                {
                    ["region"] = region, ["quantity"] = quantity, ["method"] = Name(c.Method), ["time"] = when, ["p_value"] = c.P is { } p ? Number(p) : null,
                    ["mean_before"] = Number(c.MeanBefore), ["mean_after"] = Number(c.MeanAfter), ["trend_reverses"] = c.TrendReverses,
                });
            }
        }
        var metadata = Provenance.For(o.Command, [o.Input]).AsKeyValues(new Dictionary<string, string>
        {
            ["title"] = $"Events, trends and change points of {quantity}",
            ["detectors"] = string.Join(",", analysis.Detectors.Select(Name)),
            ["detectors_on"] = analysis.OnResiduals ? "residuals of a constant and 3 annual harmonics" : "raw values",
            ["event_rule"] = $"at least {analysis.Consensus} detectors flag the value",
            ["window_days"] = analysis.WindowDays.ToString(CultureInfo.InvariantCulture),
            ["pelt_penalty"] = "BIC: p ln n per change, p = 2 (mean change: location and mean) or 3 (mean and variance)",
            ["pelt_min_segment"] = analysis.MinSegment.ToString(CultureInfo.InvariantCulture),
            ["slope_units"] = (units == "" ? "quantity" : units) + " per day",
            ["calendar"] = times[0].Calendar.CfName(),
        });
        string countsPath = ProductNames.Beside(o.Output, ProductNames.Counts), trendsPath = ProductNames.Beside(o.Output, ProductNames.Trends),
            changesPath = ProductNames.Beside(o.Output, ProductNames.ChangePoints);
        flags.Write(o.Output, metadata);
        counts.Write(countsPath, metadata);
        trends.Write(trendsPath, metadata);
        changes.Write(changesPath, metadata);
        var json = new JsonObject
        {
            ["input"] = o.Input, ["quantity"] = quantity, ["calendar"] = times[0].Calendar.CfName(), ["slope_units"] = metadata["slope_units"],
            ["caution"] = metadata["caution"], ["changepoints"] = jsonChanges, ["trends"] = jsonTrends,
        };
        return new EventsSummary(regions.Count, eventCount, jsonChanges.Count, o.Output, countsPath, trendsPath, changesPath, json);
    }

    static void AddTrend(TableBuilder trends, string region, string quantity, string scope, CfTime start, CfTime end, MannKendall.Result mk, SenSlope.Estimate sen, string units) =>
        trends.Add(region, quantity, scope, start.ToIsoString(), end.ToIsoString(), mk.N, (double)mk.S, mk.VarS, mk.Z, mk.P, mk.ZCorrected, mk.PCorrected, sen.Slope, sen.Low, sen.High, units);

    static JsonNode? Number(double v) => double.IsFinite(v) ? JsonValue.Create(v) : null;

    /// <summary>A detector by its command-line name (the inverse of <see cref="Name(Detector)"/>).</summary>
    /// <summary>A window of days as the command line and recipes give it: 365d or 365; throws FormatException otherwise.</summary>
    public static double ParseWindowDays(string text)
    {
        string days = text.Trim().TrimEnd('d', 'D');
        if (!double.TryParse(days, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double value) || !(value > 0) || double.IsInfinity(value))
            throw new FormatException("give a positive number of days, e.g. 365d");
        return value;
    }

    public static Detector ParseDetector(string text) => text.Trim() switch
    {
        "robust-z" => Detector.RobustZ,
        "hampel" => Detector.Hampel,
        "iqr" => Detector.Iqr,
        "seasonal-residual" => Detector.SeasonalResidual,
        "gesd" => Detector.Gesd,
        var other => throw new FormatException($"unknown detector '{other}' (choose robust-z, hampel, iqr, seasonal-residual or gesd)"),
    };

    /// <summary>Change-point methods by name; `pelt` stands for both PELT costs.</summary>
    public static ChangeMethod[] ParseChangeMethods(string text) => text.Trim() switch
    {
        "pettitt" => [ChangeMethod.Pettitt],
        "pelt" => [ChangeMethod.PeltMean, ChangeMethod.PeltMeanVariance],
        "pelt-mean" => [ChangeMethod.PeltMean],
        "pelt-mean-variance" => [ChangeMethod.PeltMeanVariance],
        var other => throw new FormatException($"unknown change-point method '{other}' (choose pettitt, pelt, pelt-mean or pelt-mean-variance)"),
    };

    public static string Name(Detector d) => d switch
    {
        Detector.RobustZ => "robust-z",
        Detector.Hampel => "hampel",
        Detector.Iqr => "iqr",
        Detector.SeasonalResidual => "seasonal-residual",
        _ => "gesd",
    };

    public static string Name(ChangeMethod m) => m switch
    {
        ChangeMethod.Pettitt => "pettitt",
        ChangeMethod.PeltMean => "pelt-mean",
        _ => "pelt-mean-variance",
    };

    public static string Serialize(JsonObject json) => json.ToJsonString(new JsonSerializerOptions { WriteIndented = true });
}
