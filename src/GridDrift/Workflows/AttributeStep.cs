using System.Globalization;
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

internal sealed record AttributeOptions(
    string Input,
    string Target,
    string Output,
    string? Quantity = null,
    string? Periods = null,
    IReadOnlyList<string>? Profiles = null,
    string Command = "griddrift attribute",
    string? PlotDirectory = null);

internal sealed record AttributeSummary(IReadOnlyList<(string Region, double Importance)> Ranking, double R2, JsonObject Json, IReadOnlyList<string> Tables);

/// <summary>
/// `griddrift attribute`: which regions drive a target series. Fits <see cref="Ridge"/> of the
/// target on the other regions' series, then writes permutation importance (record and per
/// year), mean |Shapley| per year, per-step Shapley values, the change of each region's importance
/// between two periods (given, or before/after the target's change point) with a bootstrap interval
/// (<see cref="ImportanceChange"/>), how the regions' Shapley ranks changed, and partial dependence
/// and ICE profiles of chosen regions.
/// </summary>
internal static class AttributeStep
{
    const int Leaders = 5;

    static JsonNode? Number(double v) => double.IsFinite(v) ? JsonValue.Create(v) : null;

    public static AttributeSummary Run(AttributeOptions o)
    {
        var series = SeriesFile.Read(o.Input);
        string quantity = o.Quantity ?? (series.Quantities.Count == 1 ? series.Quantities.Keys.First()
            : series.Quantities.Keys.FirstOrDefault(k => k is "ssim" or "mean") ?? throw new BadInputException(o.Input, null, $"holds several quantities ({string.Join(", ", series.Quantities.Keys)}): choose one with --quantity"));
        if (!series.Quantities.TryGetValue(quantity, out var values)) throw new BadInputException(o.Input, quantity, "no such quantity");
        int target = Array.IndexOf(series.Regions, o.Target);
        if (target < 0) throw new BadInputException(o.Input, quantity, $"has no region '{o.Target}' (it has: {string.Join(", ", series.Regions)})");
        var predictors = Enumerable.Range(0, series.Regions.Length).Where(r => r != target).ToArray();
        if (predictors.Length == 0) throw new BadInputException(o.Input, quantity, "holds only the target region: nothing to attribute it to");
        int nr = series.Regions.Length;
        var rows = Enumerable.Range(0, series.Times.Length)
            .Where(t => !double.IsNaN(values[t * nr + target]) && predictors.All(r => !double.IsNaN(values[t * nr + r]))).ToArray();
        if (rows.Length < 3 * predictors.Length + 10)
            throw new BadInputException(o.Input, quantity, $"has {rows.Length} complete time steps for {predictors.Length} regions: too few to fit a model");
        var x = new double[rows.Length, predictors.Length];
        var y = new double[rows.Length];
        for (int i = 0; i < rows.Length; i++)
        {
            y[i] = values[rows[i] * nr + target];
            for (int j = 0; j < predictors.Length; j++) x[i, j] = values[rows[i] * nr + predictors[j]];
        }
        var times = rows.Select(t => series.Times[t]).ToArray();
        var years = times.Select(t => t.Year).ToArray();
        var result = Attribution.Explain(x, y, years);
        string Name(int j) => series.Regions[predictors[j]];

        var importance = new TableBuilder().Text("region").Text("measure").Text("scope").Text("period").Number("value").Number("spread").Integer("rank");
        void AddRanked(IEnumerable<(int Region, double Value, double Spread)> items, string measure, string scope, string period)
        {
            int rank = 0;
            foreach (var item in items.OrderByDescending(i => double.IsNaN(i.Value) ? double.NegativeInfinity : i.Value))
                importance.Add(Name(item.Region), measure, scope, period, item.Value, item.Spread, ++rank);
        }
        AddRanked(result.Overall.Select(r => (r.Region, r.Importance, r.Spread)), "permutation", "record", "all");
        foreach (var (year, list) in result.ByYear)
            AddRanked(list.Select(r => (r.Region, r.Importance, r.Spread)), "permutation", "year", year.ToString("0000", CultureInfo.InvariantCulture));
        foreach (var year in years.Distinct().Order())
        {
            var inYear = Enumerable.Range(0, rows.Length).Where(i => years[i] == year).ToArray();
            AddRanked(Enumerable.Range(0, predictors.Length).Select(j => (j, inYear.Average(i => Math.Abs(result.Shapley[i, j])), double.NaN)),
                "mean_abs_shapley", "year", year.ToString("0000", CultureInfo.InvariantCulture));
        }
        var shapley = new TableBuilder().Text("time").Text("region").Number("phi");
        for (int i = 0; i < rows.Length; i++)
        {
            string iso = times[i].ToIsoString();
            for (int j = 0; j < predictors.Length; j++) shapley.Add(iso, Name(j), result.Shapley[i, j]);
        }

        var (first, second, how) = ChoosePeriods(o, times, y);
        var ranks = new TableBuilder().Text("region").Integer("rank_first").Integer("rank_second").Text("change");
        var changes = new JsonArray();
        var importanceChange = new TableBuilder().Text("region").Number("importance_before").Number("importance_after").Number("change").Number("change_lo").Number("change_hi").Integer("rank");
        var changeRanking = new JsonArray();
        if (first is { } a && second is { } b)
        {
            int place = 0;
            foreach (var c in ImportanceChange.Between(result.Model, x, y, times, a, b).OrderByDescending(c => double.IsNaN(c.Change) ? double.NegativeInfinity : c.Change))
            {
                importanceChange.Add(Name(c.Region), c.Before, c.After, c.Change, c.Low, c.High, ++place);
                changeRanking.Add(new JsonObject
                {
                    ["region"] = Name(c.Region), ["importance_before"] = Number(c.Before), ["importance_after"] = Number(c.After),
                    ["change"] = Number(c.Change), ["change_lo"] = Number(c.Low), ["change_hi"] = Number(c.High), ["rank"] = place,
                });
            }
            var r1 = Attribution.RankByShapley(result.Shapley, times, a, predictors.Length);
            var r2 = Attribution.RankByShapley(result.Shapley, times, b, predictors.Length);
            for (int j = 0; j < predictors.Length; j++)
            {
                bool lead1 = r1[j] <= Leaders, lead2 = r2[j] <= Leaders;
                string change = lead2 && !lead1 ? "new" : lead1 && !lead2 ? "dropped" : r2[j] < r1[j] ? "gained" : r2[j] > r1[j] ? "lost" : "same";
                ranks.Add(Name(j), r1[j], r2[j], change);
                changes.Add(new JsonObject { ["region"] = Name(j), ["rank_first"] = r1[j], ["rank_second"] = r2[j], ["change"] = change });
            }
        }
        var profiles = new TableBuilder().Text("region").Text("curve").Number("x").Number("prediction");
        foreach (var regionName in o.Profiles ?? [])
        {
            int j = Array.IndexOf(Enumerable.Range(0, predictors.Length).Select(Name).ToArray(), regionName);
            if (j < 0) throw new BadInputException(o.Input, quantity, $"--profiles {regionName}: not one of the explaining regions");
            var iceRows = Enumerable.Range(0, Math.Min(rows.Length, 20)).Select(k => k * rows.Length / Math.Min(rows.Length, 20)).ToArray();
            var (grid, pd, ice) = Attribution.Profiles(result.Model, x, j, 20, iceRows);
            for (int g = 0; g < grid.Length; g++)
            {
                profiles.Add(regionName, "partial_dependence", grid[g], pd[g]);
                for (int k = 0; k < iceRows.Length; k++) profiles.Add(regionName, "ice " + times[iceRows[k]].ToIsoString(), grid[g], ice[k, g]);
            }
        }

        if (o.PlotDirectory is { } plots)
        {
            Directory.CreateDirectory(plots);
            var yearList = result.ByYear.Keys.Order().ToList();
            var order = result.Overall.OrderByDescending(r => r.Importance).Select(r => r.Region).ToList();
            var heat = new double[order.Count, yearList.Count];
            for (int i = 0; i < order.Count; i++)
                for (int k = 0; k < yearList.Count; k++) heat[i, k] = result.ByYear[yearList[k]][order[i]].Importance;
            GridDrift.Outputs.Plots.AnalysisPlots.ImportanceHeatmap(Path.Combine(plots, "importance_heatmap.png"), o.Target, order.Select(Name).ToList(), yearList, heat);
        }
        var ranking = result.Overall.OrderByDescending(r => r.Importance).Select(r => (Name(r.Region), r.Importance)).ToList();
        var metadata = Provenance.For(o.Command, [o.Input]).AsKeyValues(new Dictionary<string, string>
        {
            ["title"] = $"Attribution of {o.Target} {quantity} to the other regions",
            ["model"] = "ridge regression on standardized series, lambda by 5-fold time-blocked cross-validation",
            ["lambda"] = result.Model.Lambda.ToString("R", CultureInfo.InvariantCulture),
            ["r2"] = result.R2.ToString("R", CultureInfo.InvariantCulture),
            ["importance"] = "permutation importance (Breiman 2001): rise in mean squared error, 10 shuffles; Shapley values of the linear model phi_j = beta_j (x_j - E x_j)",
            ["periods"] = how,
            ["importance_change"] = "permutation importance within each year of each period; change = mean over the after-years - mean over the before-years; 95 % interval from resampling the years of each period (999 resamples)",
        });
        var tables = new List<string> { o.Output, ProductNames.Beside(o.Output, ProductNames.Shapley) };
        importance.Write(o.Output, metadata);
        shapley.Write(tables[1], metadata);
        if (ranks.Count > 0) { tables.Add(ProductNames.Beside(o.Output, ProductNames.Ranks)); ranks.Write(tables[^1], metadata); }
        if (importanceChange.Count > 0) { tables.Add(ProductNames.Beside(o.Output, ProductNames.ImportanceChange)); importanceChange.Write(tables[^1], metadata); }
        if (profiles.Count > 0) { tables.Add(ProductNames.Beside(o.Output, ProductNames.Profiles)); profiles.Write(tables[^1], metadata); }
        var json = new JsonObject
        {
            ["input"] = o.Input, ["target"] = o.Target, ["quantity"] = quantity,
            ["r2"] = double.IsFinite(result.R2) ? result.R2 : null, ["lambda"] = result.Model.Lambda,
            ["ranking"] = new JsonArray(ranking.Select((r, k) => (JsonNode)new JsonObject { ["region"] = r.Item1, ["importance"] = r.Importance, ["rank"] = k + 1 }).ToArray()),
            ["periods"] = how, ["rank_changes"] = changes, ["importance_change"] = changeRanking, ["caution"] = metadata["caution"],
        };
        return new AttributeSummary(ranking, result.R2, json, tables);
    }

    static (TimePeriod? First, TimePeriod? Second, string How) ChoosePeriods(AttributeOptions o, CfTime[] times, double[] y)
    {
        if (o.Periods is { } text)
        {
            var parts = text.Split(',');
            if (parts.Length != 2) throw new BadInputException(null, null, $"--periods {text}: give two periods A/B,C/D");
            try
            {
                var a = TimePeriod.Parse(parts[0], times[0].Calendar);
                var b = TimePeriod.Parse(parts[1], times[0].Calendar);
                return (a, b, $"given: {a.ToIsoString()} and {b.ToIsoString()}");
            }
            catch (FormatException e) { throw new BadInputException(null, null, "--periods " + e.Message); }
        }
        // the target's change is found as `events` finds one: on the deseasonalised series, whitened, Pettitt's test
        var days = times.Select(t => t.SecondsSince(times[0]) / 86400.0).ToArray();
        double year = times[0].Calendar.MeanYearDays();
        var target = days[^1] - days[0] >= 2 * year ? SeasonalModel.Residuals(days, y, 3, year, trend: false) : y;
        var p = Prewhitened.Pettitt(target);
        if (!p.Found || !(p.P < 0.05)) return (null, null, "none: no --periods and no change in the target (whitened Pettitt test, p < 0.05)");
        var change = times[p.FirstAfter];
        return (new TimePeriod(times[0], change), new TimePeriod(change, times[^1].AddMicros(1)),
            $"before and after the target's change point {change.ToIsoString()} (whitened Pettitt test, p {GridDrift.Analysis.PValues.Format(p.P)})");
    }
}
