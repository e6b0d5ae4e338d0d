using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using GridDrift.Operators.Climatology;
using GridDrift.Frames;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Workflows;

namespace GridDrift.Pipeline;

/// <summary>What one step of a run did: ran, or was skipped because its checkpoint still held.</summary>
public sealed record StepOutcome(string Step, bool Skipped, IReadOnlyList<string> Outputs, JsonObject Summary, TimeSpan Took);

/// <summary>
/// `griddrift run`: the steps of a recipe in their fixed order (stats, similarity, climatology,
/// anomalies, events, attribute, report). After a step completes, a checkpoint
/// (OUT/.griddrift-run/STEP.json) records the fingerprint of its recipe section and of [input],
/// its outputs and its summary. A step is skipped when its checkpoint's fingerprint matches, all
/// its outputs exist, and none is older than its inputs — so an interrupted run resumes where it
/// stopped. Every product is itself written under a temporary name and renamed when complete.
/// </summary>
public static class RecipeRunner
{
    public static readonly string[] Order = ["stats", "similarity", "climatology", "anomalies", "events", "attribute", "report"];

    /// <summary>The steps a shard runs: each reads only its slice of the record (and, for pairs, the frames just before it).</summary>
    public static readonly string[] Sharded = ["stats", "similarity", "climatology", "anomalies"];

    public static IReadOnlyList<StepOutcome> Run(string recipePath, Action<string>? log = null, string command = "griddrift run", ShardSpec? shard = null)
    {
        var recipe = Recipe.Load(recipePath);
        string Resolve(string p) => InFolder(recipe, p);
        var inputs = Inputs(recipe);
        string variable = recipe.Text("input", "variable");
        var regions = recipe.List("input", "regions", ["global"]);
        string mainDir = OutFolder(recipe);
        string outDir = shard is { } sh ? sh.Folder(mainDir) : mainDir;
        Directory.CreateDirectory(outDir);
        string MainProduct(string name) => Path.IsPathRooted(name) ? name : Path.Combine(mainDir, name);
        string Product(string name) => Path.IsPathRooted(name) && shard is null ? name : Path.Combine(outDir, Path.IsPathRooted(name) ? Path.GetFileName(name) : name);
        string stateDir = Path.Combine(outDir, ".griddrift-run");
        Directory.CreateDirectory(stateDir);
        using var runLock = RunLock.Take(stateDir, outDir);
        FrameSlice? slice = null;
        if (shard is { } spec) slice = ShardManifest.Begin(recipe, spec, inputs, variable, outDir);
        var outcomes = new List<StepOutcome>();

        foreach (var step in Order.Where(recipe.Has))
        {
            string how = $"{command} {recipePath} [{step}]";
            if (shard is not null && !Sharded.Contains(step))
            {
                log?.Invoke($"{step}: needs the whole record; it runs after griddrift gather");
                continue;
            }
            var (stepInputs, outputs) = Plan(recipe, step, inputs, Product, Resolve, shard is null ? null : MainProduct);
            if (shard is not null && step == "climatology") outputs = [ShardManifest.PartialName(outputs[0])];
            if (shard is not null && step == "anomalies" && !GatheredClimatologyHolds(recipe, mainDir, MainProduct))
            {
                log?.Invoke("anomalies: waits for the gathered climatology (griddrift gather, then run this shard again)");
                continue;
            }
            string fingerprint = shard is { } f ? f.Fingerprint(recipe.Fingerprint(step)) : recipe.Fingerprint(step);
            var checkpoint = Path.Combine(stateDir, step + ".json");
            if (UpToDate(checkpoint, fingerprint, stepInputs, outputs, out var kept))
            {
                outcomes.Add(new StepOutcome(step, true, outputs, kept, TimeSpan.Zero));
                log?.Invoke($"{step}: up to date, skipped");
                continue;
            }
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var summary = step switch
            {
                "stats" => RunStats(recipe, inputs, variable, regions, outputs, how, slice),
                "similarity" => RunSimilarity(recipe, inputs, variable, regions, outputs, how, slice),
                "climatology" => RunClimatology(recipe, inputs, variable, outputs, how, slice),
                "anomalies" => RunAnomalies(recipe, inputs, variable, regions, stepInputs[^1], outputs, how, slice),
                "events" => EventsStep.Run(new EventsOptions(stepInputs[0], outputs[0], recipe.OptionalText("events", "quantity"), null, EventsAnalysis(recipe), how,
                    recipe.OptionalText("events", "plots") is { } ep ? Product(ep) : null)).Json,
                "attribute" => AttributeStep.Run(new AttributeOptions(stepInputs[0], recipe.Text("attribute", "target", "global"), outputs[0],
                    recipe.OptionalText("attribute", "quantity"), recipe.OptionalText("attribute", "periods"), recipe.List("attribute", "profiles", []), how,
                    recipe.OptionalText("attribute", "plots") is { } ap ? Product(ap) : null)).Json,
                _ => RunReport.Write(recipe, outcomes, inputs, outputs, recipe.OptionalText("report", "truth") is { } t ? Resolve(t) : null, Product),
            };
            var done = new StepOutcome(step, false, outputs, summary, clock.Elapsed);
            outcomes.Add(done);
            WriteCheckpoint(checkpoint, fingerprint, outputs, summary);
            log?.Invoke($"{step}: done in {clock.Elapsed.TotalSeconds:0.0} s");
        }
        return outcomes;
    }

    /// <summary>A path of the recipe: as it is when absolute, else relative to the recipe's folder.</summary>
    static string InFolder(Recipe recipe, string path) => Path.IsPathRooted(path) ? path : Path.Combine(recipe.Folder, path);

    public static IReadOnlyList<string> Inputs(Recipe recipe) =>
        InputPaths.Expand(recipe.List("input", "files").Select(p => InFolder(recipe, p)).ToArray());

    public static string OutFolder(Recipe recipe) => Path.GetFullPath(InFolder(recipe, recipe.Text("input", "out", "products")));

    /// <summary>The products of a one-machine run of <paramref name="step"/> in <paramref name="outDir"/>.</summary>
    public static string[] Products(Recipe recipe, string step, string outDir)
    {
        string Product(string name) => Path.IsPathRooted(name) ? name : Path.Combine(outDir, name);
        return Plan(recipe, step, [], Product, p => InFolder(recipe, p), null).Outputs;
    }

    static bool GatheredClimatologyHolds(Recipe recipe, string mainDir, Func<string, string> product)
    {
        var (inputs, outputs) = Plan(recipe, "climatology", Inputs(recipe), product, p => p, null);
        return UpToDate(Path.Combine(mainDir, ".griddrift-run", "climatology.json"), recipe.Fingerprint("climatology"), inputs.ToArray(), outputs, out _);
    }

    /// <summary>The files a step reads and the products it writes.</summary>
    /// <param name="mainProduct">in a shard: where the gathered products of earlier stages are (the climatology anomalies need)</param>
    static (string[] Inputs, string[] Outputs) Plan(Recipe r, string step, IReadOnlyList<string> inputs, Func<string, string> product, Func<string, string> resolve,
        Func<string, string>? mainProduct)
    {
        string Out(string section, string fallback) => product(r.OptionalText(section, "out") ?? fallback);
        string Stem(string path, string suffix) => Path.Combine(Path.GetDirectoryName(path)!, Path.GetFileNameWithoutExtension(path) + suffix);
        switch (step)
        {
            case "stats":
            case "similarity":
            {
                string o = Out(step, step + ".nc");
                var outs = new List<string> { o };
                if (r.OptionalText(step, "table") is { } t) outs.Add(product(t));
                return (inputs.ToArray(), outs.ToArray());
            }
            case "climatology":
                return (inputs.ToArray(), [Out(step, "climatology.nc")]);
            case "anomalies":
            {
                string clim = r.Has("climatology") ? (mainProduct ?? product)(r.OptionalText("climatology", "out") ?? "climatology.nc")
                    : throw new BadInputException(r.Path, "anomalies", $"line {r.Sections["anomalies"].Line}: [anomalies] needs a [climatology] step");
                string o = Out(step, "anomalies.nc");
                var outs = new List<string> { o };
                if (r.OptionalText(step, "table") is { } t) outs.Add(product(t));
                if (r.Flag(step, "fields", false)) outs.Add(Stem(o, "_fields.nc"));
                return (inputs.Append(clim).ToArray(), outs.ToArray());
            }
            case "events":
            case "attribute":
            {
                string series = product(r.Text(step, "series"));
                string o = Out(step, step + ".parquet");
                var outs = step == "events"
                    ? new[] { o, Stem(o, "_counts.parquet"), Stem(o, "_trends.parquet"), Stem(o, "_changepoints.parquet") }
                    : new[] { o, Stem(o, "_shapley.parquet") };
                return ([series], outs);
            }
            default:
            {
                string o = Out("report", "report");
                var earlier = Order.Where(s => s != "report" && r.Has(s)).SelectMany(s => Plan(r, s, inputs, product, resolve, null).Outputs).ToArray();
                return (earlier, [o + ".md", o + ".html"]);
            }
        }
    }

    internal static bool UpToDate(string checkpoint, string fingerprint, string[] inputs, string[] outputs, out JsonObject summary)
    {
        summary = new JsonObject();
        if (!File.Exists(checkpoint)) return false;
        try
        {
            var saved = JsonNode.Parse(File.ReadAllText(checkpoint))!.AsObject();
            if ((string?)saved["fingerprint"] != fingerprint) return false;
            if (outputs.Any(o => !File.Exists(o))) return false;
            var newestInput = inputs.Where(File.Exists).Select(File.GetLastWriteTimeUtc).DefaultIfEmpty(DateTime.MinValue).Max();
            if (outputs.Select(File.GetLastWriteTimeUtc).Min() < newestInput) return false;
            summary = saved["summary"]?.DeepClone().AsObject() ?? new JsonObject();
            return true;
        }
        catch (JsonException) { return false; }
    }

    internal static void WriteCheckpoint(string path, string fingerprint, string[] outputs, JsonObject summary)
    {
        var json = new JsonObject { ["fingerprint"] = fingerprint, ["outputs"] = new JsonArray(outputs.Select(o => (JsonNode)o).ToArray()), ["summary"] = summary.DeepClone() };
        GridDrift.Outputs.AtomicFile.WriteAllText(path, json.ToJsonString(new JsonSerializerOptions { WriteIndented = true }));
    }

    static JsonObject RunStats(Recipe r, IReadOnlyList<string> inputs, string variable, string[] regions, string[] outputs, string how, FrameSlice? slice)
    {
        var statistics = r.List("stats", "statistics", ["mean", "std", "valid"]).Select(RegionStatistics.Parse).Distinct().ToArray();
        var s = StatsStep.Run(new StatsOptions(inputs, variable, regions, statistics, outputs[0], outputs.Length > 1 ? outputs[1] : null,
            r.Number("stats", "min_valid", 0.5), Command: how, Slice: slice));
        return new JsonObject { ["frames"] = s.Frames, ["regions"] = s.Regions };
    }

    static JsonObject RunSimilarity(Recipe r, IReadOnlyList<string> inputs, string variable, string[] regions, string[] outputs, string how, FrameSlice? slice)
    {
        var metrics = r.List("similarity", "metrics", ["ssim", "corr", "rmsd", "mean-abs-change"]).Select(SimilarityMetrics.Parse).Distinct().ToArray();
        var s = SimilarityStep.Run(new SimilarityOptions(inputs, variable, regions, metrics, outputs[0], outputs.Length > 1 ? outputs[1] : null,
            (int)r.Number("similarity", "lag", 1), r.OptionalText("similarity", "range"), MinValid: r.Number("similarity", "min_valid", 0.5), Command: how, Slice: slice));
        return new JsonObject { ["pairs"] = s.Pairs, ["regions"] = s.Regions };
    }

    internal static ClimatologyKind ClimatologyKindOf(Recipe r)
    {
        string byText = r.Text("climatology", "by", "month");
        return ClimatologyKinds.Parse(byText) ?? throw new BadInputException(r.Path, "climatology.by", $"'{byText}' is not month, day-of-year or hour-by-month");
    }

    internal static JsonObject ClimatologySummaryJson(ClimatologySummary s) =>
        new() { ["frames"] = s.FramesUsed, ["slots"] = s.Slots, ["base"] = s.Base.ToIsoString(), ["warnings"] = new JsonArray(s.Warnings.Select(w => (JsonNode)w).ToArray()) };

    static JsonObject RunClimatology(Recipe r, IReadOnlyList<string> inputs, string variable, string[] outputs, string how, FrameSlice? slice)
    {
        var s = ClimatologyStep.Run(new ClimatologyOptions(inputs, variable, ClimatologyKindOf(r), outputs[0], r.OptionalText("climatology", "base"), r.OptionalText("climatology", "smooth"),
            Command: how, Slice: slice, PartialOut: slice is null ? null : outputs[0]));
        return ClimatologySummaryJson(s);
    }

    static JsonObject RunAnomalies(Recipe r, IReadOnlyList<string> inputs, string variable, string[] regions, string climatology, string[] outputs, string how, FrameSlice? slice)
    {
        string kindText = r.Text("anomalies", "kind", "absolute");
        var kind = Anomaly.Parse(kindText) ?? throw new BadInputException(r.Path, "anomalies.kind", $"'{kindText}' is not absolute, relative or standardized");
        string? table = outputs.Skip(1).FirstOrDefault(o => o.EndsWith(".parquet", StringComparison.Ordinal));
        string? fields = outputs.Skip(1).FirstOrDefault(o => o.EndsWith("_fields.nc", StringComparison.Ordinal));
        var s = AnomaliesStep.Run(new AnomaliesOptions(inputs, variable, climatology, kind, fields, regions, table, outputs[0], Command: how, Slice: slice));
        return new JsonObject { ["frames"] = s.Frames };
    }

    static GridDrift.Analysis.SeriesAnalysisOptions EventsAnalysis(Recipe r)
    {
        var d = EventsStep.Defaults;
        T[] Parsed<T>(string key, Func<string, IEnumerable<T>> parse)
        {
            try { return r.List("events", key, []).SelectMany(parse).Distinct().ToArray(); }
            catch (FormatException e) { throw new BadInputException(r.Path, $"events.{key}", $"line {r.Sections["events"].Keys[key].Line}: {e.Message}"); }
        }
        var detectors = Parsed<GridDrift.Analysis.Detector>("detect", x => [EventsStep.ParseDetector(x)]);
        var methods = Parsed<GridDrift.Analysis.ChangeMethod>("changepoints", EventsStep.ParseChangeMethods);
        string on = r.Text("events", "on", "raw");
        return d with
        {
            Detectors = detectors.Length > 0 ? detectors : d.Detectors,
            ChangeMethods = methods.Length > 0 ? methods : d.ChangeMethods,
            OnResiduals = on == "residuals" ? true : on == "raw" ? false : throw new BadInputException(r.Path, "events.on", $"line {r.Sections["events"].Keys["on"].Line}: choose raw or residuals"),
            WindowDays = r.Number("events", "window_days", d.WindowDays),
            Consensus = (int)r.Number("events", "consensus", d.Consensus),
            MinSegment = (int)r.Number("events", "min_segment", d.MinSegment),
        };
    }

}
