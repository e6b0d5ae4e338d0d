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
        var found = ReportFindings.From(events, attribute);
        // the summary in plain words comes first: it is what most readers read
        var head = new ReportDocument(doc.Title);
        head.Text(Caution);
        head.Section("Summary");
        head.List(found.PlainWords());
        found.Tables(head);
        JsonObject? truth = truthPath is not null && File.Exists(truthPath) ? JsonNode.Parse(File.ReadAllText(truthPath))!.AsObject() : null;
        if (truth is not null) TruthScore.Write(head, truth, found, summary);
        found.Describe(summary);

        var figures = Directory.EnumerateFiles(folder, "*.png", SearchOption.AllDirectories).ToList();
        if (figures.Count > 0)
        {
            head.Section("Figures");
            // every region's figures, matched by exact file name (a region's name can be part of another's)
            var regionOrder = found.Regions.Select(SafeName).ToList();
            int Order(string f)
            {
                string name = Path.GetFileNameWithoutExtension(f);
                int at = regionOrder.FindIndex(r => name == "series_" + r || name == "counts_" + r);
                return at < 0 ? int.MaxValue : at;
            }
            foreach (var f in figures.OrderBy(Order).ThenBy(f => f, StringComparer.Ordinal))
                head.Image(Path.GetRelativePath(folder, f).Replace('\\', '/'), Caption(Path.GetFileNameWithoutExtension(f)));
        }
        head.Append(doc);
        head.Section("Recipe");
        head.Verbatim(File.ReadAllText(recipe.Path));
        head.Text($"Made by GridDrift {Provenance.Version}. Rerun with `griddrift run {Path.GetFileName(recipe.Path)}`: steps whose products are up to date are skipped.");
        head.Save(stem);
        return summary;
    }

    const string Caution = "**GridDrift is an analysis tool, not a warning or forecasting service.** These findings describe the record analysed; " +
        "for warnings and decisions about floods and droughts, consult the responsible national meteorological and hydrological services.";

    /// <summary>The figure file name part of a region, as `events --plot` writes it.</summary>
    public static string SafeName(string region) => string.Concat(region.Select(ch => char.IsLetterOrDigit(ch) || ch is '-' or '_' ? ch : '_'));

    static string Caption(string name) => name switch
    {
        "importance_heatmap" => "Permutation importance of each region for the attribution's target, year by year",
        _ when name.StartsWith("series_", StringComparison.Ordinal) => $"{name[7..]}: the series with its events and its changes at q < 0.05",
        _ when name.StartsWith("counts_", StringComparison.Ordinal) => $"{name[7..]}: events per month, with the change of the event rate where there is one",
        _ => name,
    };
}
