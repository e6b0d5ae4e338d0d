using System.Globalization;
using System.Text.Json.Nodes;
using GridDrift.Outputs;
using GridDrift.Outputs.Report;
using GridDrift.Results;
using GridDrift.Formats;

namespace GridDrift.Pipeline;

/// <summary>
/// The report of a run, as Markdown and HTML: inputs, the recipe, the steps, the figures and the
/// findings — change points per region, trends, trend reversals, leading regions — and, when the
/// recipe names a truth file (the demo does), the injected truth beside what was recovered.
/// </summary>
internal static class RunReport
{
    public const double TruthToleranceDays = 30;

    public static JsonObject Write(Recipe recipe, IReadOnlyList<StepOutcome> steps, IReadOnlyList<string> inputs, string[] outputs, string? truthPath, Func<string, string> product)
    {
        string stem = outputs[0][..^3];
        string folder = Path.GetDirectoryName(Path.GetFullPath(stem))!;
        var doc = new ReportDocument(recipe.Sections["report"].Keys.ContainsKey("title") ? recipe.Text("report", "title") : "GridDrift run report");
        doc.Text("**GridDrift is an analysis tool, not a warning or forecasting service.** These findings describe the record analysed; " +
            "for warnings and decisions about floods and droughts, consult the responsible national meteorological and hydrological services.");
        doc.Section("Inputs");
        doc.Text($"{inputs.Count} file(s), variable `{recipe.Text("input", "variable")}`, regions {string.Join(", ", recipe.List("input", "regions", ["global"]).Select(r => $"`{r}`"))}.");
        doc.Rows(["file", "SHA-256"], inputs.Select(f => new[] { Path.GetFileName(f), ChecksumCache.Sha256(f) }));
        doc.Section("Steps");
        doc.Rows(["step", "status", "seconds", "products"], steps.Select(s => new[]
        {
            s.Step, s.Skipped ? "up to date (skipped)" : "ran", s.Skipped ? "" : s.Took.TotalSeconds.ToString("0.0", CultureInfo.InvariantCulture),
            string.Join(", ", s.Outputs.Select(Path.GetFileName)),
        }));

        var summary = new JsonObject();
        var events = steps.FirstOrDefault(s => s.Step == "events")?.Summary;
        var attribute = steps.FirstOrDefault(s => s.Step == "attribute")?.Summary;
        doc.Section("Findings");
        var changes = events?["changepoints"]?.AsArray().Select(c => c!.AsObject()).ToList() ?? [];
        if (events is not null)
        {
            string quantity = (string?)events["quantity"] ?? "";
            var byRegion = changes.GroupBy(c => (string)c["region"]!).ToList();
            doc.Text(byRegion.Count == 0 ? $"No change point was found in any region's `{quantity}` series."
                : $"Change points in the `{quantity}` series of {byRegion.Count} region(s) (Pettitt's only where p < 0.05; PELT with a BIC penalty):");
            doc.Rows(["region", "method", "time", "p", "mean before", "mean after", "trend reverses"], changes.Select(c => new[]
            {
                (string)c["region"]!, (string)c["method"]!, (string)c["time"]!, Format(c["p_value"]), Format(c["mean_before"]), Format(c["mean_after"]),
                (bool?)c["trend_reverses"] == true ? "yes" : "no",
            }));
            var trends = events["trends"]?.AsArray().Select(t => t!.AsObject()).ToList() ?? [];
            doc.Text($"Trends of `{quantity}` over the whole record (Mann–Kendall with the Hamed–Rao correction; Sen's slope, per year):");
            doc.Rows(["region", "Sen slope per year", "95 % interval", "MK z", "MK p"], trends.Select(t => new[]
            {
                (string)t["region"]!, Format(t["sen_slope"], 365.2425), $"{Format(t["sen_slope_lo"], 365.2425)} … {Format(t["sen_slope_hi"], 365.2425)}",
                Format(t["mk_z_hamed_rao"]), Format(t["mk_p_hamed_rao"]),
            }));
            summary["changed_regions"] = new JsonArray(byRegion.Where(g => g.Any(c => (string)c["method"]! == "pelt-mean")).Select(g => (JsonNode)g.Key).ToArray());
            // the size of each region's main (Pettitt) change in units of the series' short-term noise
            var noise = trends.ToDictionary(t => (string)t["region"]!, t => t["noise_sd"]?.GetValue<double>() ?? double.NaN);
            string? aggregate = (string?)attribute?["target"];
            var mainChanges = changes.Where(c => (string)c["method"]! == "pettitt" && (string)c["region"]! != aggregate)
                .Select(c => ((string)c["region"]!, (string)c["time"]!, c["mean_before"]!.GetValue<double>(), c["mean_after"]!.GetValue<double>()));
            var main = GridDrift.Analysis.ChangeSizes.InNoiseUnits(mainChanges, noise);
            if (main.Count > 0)
            {
                doc.Text($"The main change of each region (Pettitt), largest first, in units of the series' short-term noise" + (aggregate is null ? ":" : $" (`{aggregate}`, the aggregate, left out):"));
                doc.Rows(["region", "time", "shift", "shift / noise"], main.Select(c => new[]
                {
                    c.Region, c.Time, c.Shift.ToString("0.####", CultureInfo.InvariantCulture), c.Size.ToString("0.0", CultureInfo.InvariantCulture),
                }));
                summary["largest_changes"] = new JsonArray(main.Select(c => (JsonNode)new JsonObject { ["region"] = c.Region, ["time"] = c.Time, ["shift"] = c.Shift, ["shift_over_noise"] = c.Size }).ToArray());
            }
        }
        if (attribute is not null)
        {
            var ranking = attribute["ranking"]!.AsArray().Select(r => r!.AsObject()).ToList();
            doc.Text($"Regions that drive `{attribute["target"]}` (ridge model, R² {Format(attribute["r2"])}; permutation importance, rise in mean squared error):");
            doc.Rows(["rank", "region", "importance"], ranking.Select(r => new[] { r["rank"]!.ToString(), (string)r["region"]!, Format(r["importance"]) }));
            var rankChanges = attribute["rank_changes"]?.AsArray().Select(c => c!.AsObject()).ToList() ?? [];
            if (rankChanges.Count > 0)
            {
                doc.Text($"Rank changes between the periods ({attribute["periods"]}):");
                doc.Rows(["region", "rank before", "rank after", "change"], rankChanges.Select(c => new[] { (string)c["region"]!, c["rank_first"]!.ToString(), c["rank_second"]!.ToString(), (string)c["change"]! }));
            }
            summary["leading_regions"] = new JsonArray(ranking.Take(3).Select(r => (JsonNode)(string)r["region"]!).ToArray());
        }
        if (truthPath is not null && File.Exists(truthPath))
            Truth(doc, JsonNode.Parse(File.ReadAllText(truthPath))!.AsObject(), changes, summary);

        var figures = Directory.EnumerateFiles(folder, "*.png", SearchOption.AllDirectories).Order().ToList();
        if (figures.Count > 0)
        {
            doc.Section("Figures");
            var changed = summary["changed_regions"]?.AsArray().Select(n => (string)n!).ToHashSet() ?? [];
            foreach (var f in figures.Where(f => Path.GetFileName(f).StartsWith("importance", StringComparison.Ordinal) ||
                         changed.Any(c => Path.GetFileName(f).Contains(c, StringComparison.Ordinal)) || Path.GetFileName(f).Contains("global", StringComparison.Ordinal)))
                doc.Image(Path.GetRelativePath(folder, f).Replace('\\', '/'), Caption(Path.GetFileNameWithoutExtension(f)));
            doc.Text($"All {figures.Count} figures are in `{Path.GetRelativePath(folder, Path.GetDirectoryName(figures[0])!)}`.");
        }
        doc.Section("Recipe");
        doc.Verbatim(File.ReadAllText(recipe.Path));
        doc.Text($"Made by GridDrift {Provenance.Version}. Rerun with `griddrift run {Path.GetFileName(recipe.Path)}`: steps whose products are up to date are skipped.");
        doc.Save(stem);
        return summary;
    }

    static void Truth(ReportDocument doc, JsonObject truth, List<JsonObject> changes, JsonObject summary)
    {
        doc.Section("Injected truth and what was recovered");
        var when = DateTime.Parse((string)truth["shift_time"]!, CultureInfo.InvariantCulture);
        var regions = truth["changed_regions"]!.AsArray().Select(r => (string)r!).ToArray();
        doc.Text($"The invented record carries a regime shift on {when:yyyy-MM-dd} in {string.Join(" and ", regions)} " +
            $"(waves {truth["wave_speed_factor"]}× faster, noise {truth["noise_factor"]}× larger). Recovered (closest PELT mean change in each region):");
        var rows = new List<string[]>();
        var recovered = new JsonArray();
        foreach (var r in regions)
        {
            var best = changes.Where(c => (string)c["region"]! == r && (string)c["method"]! == "pelt-mean")
                .Select(c => DateTime.Parse((string)c["time"]!, CultureInfo.InvariantCulture)).OrderBy(t => Math.Abs((t - when).TotalDays)).Cast<DateTime?>().FirstOrDefault();
            double? off = best is { } b ? (b - when).TotalDays : null;
            rows.Add([r, best?.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture) ?? "not found", off?.ToString("0.0", CultureInfo.InvariantCulture) ?? "",
                off is { } o && Math.Abs(o) <= TruthToleranceDays ? "yes" : "no"]);
            recovered.Add(new JsonObject { ["region"] = r, ["time"] = best?.ToString("s", CultureInfo.InvariantCulture), ["offset_days"] = off });
        }
        doc.Rows(["region", "change found", "days from the truth", $"within {TruthToleranceDays:0} days"], rows);
        var others = changes.Where(c => (string)c["method"]! == "pelt-mean" && !regions.Contains((string)c["region"]!)).Select(c => (string)c["region"]!).Distinct().ToList();
        doc.Text(others.Count == 0 ? "No other region shows a PELT mean change." : $"Other regions with a PELT mean change: {string.Join(", ", others)}.");
        var leading = summary["leading_regions"]?.AsArray().Select(n => (string)n!).Take(2).Order().ToArray() ?? [];
        bool ranked = leading.SequenceEqual(regions.Order());
        doc.Text(ranked ? $"The attribution ranks {string.Join(" and ", regions)} first, as injected." : $"The attribution's two leading regions are {string.Join(" and ", leading)}; the injected ones are {string.Join(" and ", regions)}.");
        summary["truth"] = truth.DeepClone();
        summary["recovered"] = recovered;
        summary["attribution_matches_truth"] = ranked;
    }

    static string Caption(string name) => name switch
    {
        "importance_heatmap" => "Permutation importance of each region for the target, year by year",
        _ when name.StartsWith("series_", StringComparison.Ordinal) => $"{name[7..]}: the series with its events and change points",
        _ when name.StartsWith("counts_", StringComparison.Ordinal) => $"{name[7..]}: events per year with Sen trend lines",
        _ => name,
    };

    static string Format(JsonNode? n, double scale = 1)
    {
        if (n is null) return "–";
        if (n.GetValueKind() != System.Text.Json.JsonValueKind.Number) return n.ToString();
        double v = n.GetValue<double>() * scale;
        // small figures keep three significant digits instead of rounding to 0
        return (v != 0 && Math.Abs(v) < 0.01 ? v.ToString("0.##E+0", CultureInfo.InvariantCulture) : v.ToString("0.####", CultureInfo.InvariantCulture));
    }
}
