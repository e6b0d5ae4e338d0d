using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using GridDrift.Operators.Climatology;
using GridDrift.Formats;
using GridDrift.Frames;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Pipeline;

/// <summary>What one step of a run did: ran, or was skipped because its checkpoint still held.</summary>
internal sealed record StepOutcome(string Step, bool Skipped, IReadOnlyList<string> Outputs, JsonObject Summary, TimeSpan Took);

/// <summary>
/// `griddrift run`: the steps of a recipe in their fixed order (stats, similarity, climatology,
/// anomalies, events, attribute, report). After a step completes, a checkpoint
/// (OUT/.griddrift-run/STEP.json) records the fingerprint of its recipe section and of [input],
/// its outputs and its summary. A step is skipped when its checkpoint's fingerprint matches, all
/// its outputs exist, and none is older than its inputs — so an interrupted run resumes where it
/// stopped. Every product is itself written under a temporary name and renamed when complete.
/// </summary>
internal static class RecipeRunner
{
    /// <summary>A step of a recipe: its table's name, whether a shard runs it on its slice, what it does, and what can be checked before anything runs.</summary>
    sealed record RecipeStep(string Name, bool Sharded, Func<StepContext, JsonObject> Run, Action<Recipe> Check);

    /// <summary>What a step runs with.</summary>
    sealed record StepContext(Recipe Recipe, IReadOnlyList<string> Inputs, string Variable, string[] Regions, string[] StepInputs, string[] Outputs, string How,
        FrameSlice? Slice, Func<string, string> Product, Func<string, string> Resolve, IReadOnlyList<StepOutcome> Earlier)
    {
        /// <summary>[input] period: the frames every step reads.</summary>
        public GridDrift.Frames.FrameSelection Selection => SelectionOf(Recipe);
    }

    internal static GridDrift.Frames.FrameSelection SelectionOf(Recipe r) =>
        GridDrift.Frames.FrameSelection.Of(r.OptionalText("input", "period"), r.OptionalText("input", "level"), r.List("input", "at", []));

    /// <summary>The steps in the order they run.</summary>
    static readonly RecipeStep[] Steps =
    [
        new("stats", true, RunStats, CheckStats),
        new("similarity", true, RunSimilarity, CheckSimilarity),
        new("climatology", true, RunClimatology, CheckClimatology),
        new("anomalies", true, RunAnomalies, CheckAnomalies),
        new("events", false, RunEvents, CheckEvents),
        new("attribute", false, RunAttribute, CheckAttribute),
        new("report", false, c => RunReport.Write(c.Recipe, c.Earlier, c.Inputs, c.Outputs, c.Recipe.OptionalText("report", "truth") is { } t ? c.Resolve(t) : null, c.Product),
            r => { if (r.OptionalText("report", "truth") is { } t && !File.Exists(InFolder(r, t))) throw BadInputException.InRecipe(r.Path, r.LineOf("report", "truth"), "report.truth", $"no such file: {t}"); }),
    ];

    public static readonly string[] Order = Steps.Select(s => s.Name).ToArray();

    /// <summary>The steps a shard runs: each reads only its slice of the record (and, for pairs, the frames just before it).</summary>
    public static readonly string[] Sharded = Steps.Where(s => s.Sharded).Select(s => s.Name).ToArray();

    public static IReadOnlyList<StepOutcome> Run(string recipePath, Action<string>? log = null, string command = "griddrift run", ShardSpec? shard = null)
    {
        var recipe = Recipe.Load(recipePath);
        string Resolve(string p) => InFolder(recipe, p);
        var inputs = Check(recipe);
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
        // the record as it was when the run began: every step's products must come from these very files
        var atStart = inputs.Distinct().ToDictionary(Path.GetFullPath, Stamp);

        foreach (var registered in Steps.Where(s => recipe.Has(s.Name)))
        {
            string step = registered.Name;
            // runnable as written: the shell reads the step's name as a comment
            string how = $"{command} {Cluster.BatchStage.Quote(recipePath)}  # step {step}";
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
            var stamps = stepInputs.Select(f => atStart.TryGetValue(Path.GetFullPath(f), out var s) ? s : Stamp(f)).ToArray();
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var summary = registered.Run(new StepContext(recipe, inputs, variable, regions, stepInputs, outputs, how, slice, Product, Resolve, outcomes));
            var done = new StepOutcome(step, false, outputs, summary, clock.Elapsed);
            outcomes.Add(done);
            if (Changed(stepInputs, stamps) is { } changed)
                throw new BadInputException(changed, null, $"changed while the run read it (seen after the {step} step): its products are not marked complete; run again once the file is settled");
            WriteCheckpoint(checkpoint, fingerprint, shard is null ? stepInputs : [], outputs, summary);
            log?.Invoke($"{step}: done in {clock.Elapsed.TotalSeconds:0.0} s");
        }
        return outcomes;
    }

    /// <summary>
    /// Everything about a recipe that can be checked without computing, before the first step
    /// runs: every key's value and range (as the command line checks them), the input files, the
    /// variable in the first of them, the regions, and what each step needs of the others. A fault
    /// names the recipe, the line and the key. Gives the input files.
    /// </summary>
    public static IReadOnlyList<string> Check(Recipe recipe)
    {
        var inputs = Inputs(recipe);
        int inputLine = recipe.LineOf("input", "files");
        if (inputs.Count == 0) throw BadInputException.InRecipe(recipe.Path, inputLine, "input.files", "matches no file");
        string variable = recipe.Text("input", "variable");
        using (var first = DatasetFiles.Open(inputs[0]))
            if (first.FindVariable(variable) is null)
                throw BadInputException.InRecipe(recipe.Path, recipe.LineOf("input", "variable"), "input.variable",
                    $"{inputs[0]} has no variable '{variable}' (it has: {string.Join(", ", first.Variables.Select(v => v.Name))})");
        // each key checked on its own, so a fault names its own line
        void Selection(string key, Action check)
        {
            try { check(); }
            catch (FormatException e) { throw BadInputException.InRecipe(recipe.Path, recipe.LineOf("input", key), "input." + key, e.Message); }
        }
        Selection("period", () => GridDrift.Frames.FrameSelection.Of(recipe.OptionalText("input", "period")));
        Selection("level", () => GridDrift.Frames.FrameSelection.Of(null, recipe.OptionalText("input", "level")));
        Selection("at", () => GridDrift.Frames.FrameSelection.Of(null, null, recipe.List("input", "at", [])));
        try { GridDrift.Regions.RegionSpecs.ParseInput(recipe.List("input", "regions", ["global"])); }
        catch (BadInputException e) { throw BadInputException.InRecipe(recipe.Path, recipe.LineOf("input", "regions"), "input.regions", e.Fault); }
        foreach (var step in Steps.Where(s => recipe.Has(s.Name))) step.Check(recipe);
        CheckOutputsInside(recipe);
        return inputs;
    }

    /// <summary>The key of [input] that lets a recipe write products outside its products folder.</summary>
    public const string WriteOutside = "write-outside";

    /// <summary>
    /// Every product a recipe writes (each step's out, table and plot) stays inside its products
    /// folder, unless [input] says write-outside = true: a recipe from elsewhere must not overwrite
    /// files it was not given.
    /// </summary>
    static void CheckOutputsInside(Recipe r)
    {
        if (r.Flag("input", WriteOutside, false)) return;
        string folder = OutFolder(r);
        foreach (var step in Order.Where(r.Has))
            foreach (var key in new[] { "out", "table", "plot" })
                if (r.OptionalText(step, key) is { } name)
                {
                    string full = Path.GetFullPath(Path.Combine(folder, name));
                    if (!full.StartsWith(folder.TrimEnd(Path.DirectorySeparatorChar) + Path.DirectorySeparatorChar, StringComparison.Ordinal))
                        throw BadInputException.InRecipe(r.Path, r.LineOf(step, key), $"{step}.{key}",
                            $"'{name}' lies outside the products folder {folder}; name a path inside it, or allow this with [input] {WriteOutside} = true");
                }
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
        switch (step)
        {
            case "stats":
            case "similarity":
            {
                string o = Out(step, step == "stats" ? ProductNames.Stats : ProductNames.Similarity);
                var outs = new List<string> { o };
                if (r.OptionalText(step, "table") is { } t) outs.Add(product(t));
                return (inputs.ToArray(), outs.ToArray());
            }
            case "climatology":
                return (inputs.ToArray(), [Out(step, ProductNames.Climatology)]);
            case "anomalies":
            {
                string clim = r.Has("climatology") ? (mainProduct ?? product)(r.OptionalText("climatology", "out") ?? ProductNames.Climatology)
                    : throw BadInputException.InRecipe(r.Path, r.LineOf("anomalies"), "[anomalies]", "needs a [climatology] step");
                string o = Out(step, ProductNames.Anomalies);
                var outs = new List<string> { o };
                if (r.OptionalText(step, "table") is { } t) outs.Add(product(t));
                if (r.Get(step, AnomaliesKeys.Fields)) outs.Add(ProductNames.Beside(o, ProductNames.Fields));
                return (inputs.Append(clim).ToArray(), outs.ToArray());
            }
            case "events":
            case "attribute":
            {
                string series = product(r.Text(step, "series"));
                string o = Out(step, step == "events" ? ProductNames.Events : ProductNames.Attribution);
                var outs = step == "events"
                    ? new[] { o, ProductNames.Beside(o, ProductNames.Counts), ProductNames.Beside(o, ProductNames.Trends), ProductNames.Beside(o, ProductNames.ChangePoints) }
                    : new[] { o, ProductNames.Beside(o, ProductNames.Shapley) };
                return ([series], outs);
            }
            default:
            {
                string o = Out("report", ProductNames.Report);
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
            var newestInput = inputs.Where(Exists).Select(LastWrite).DefaultIfEmpty(DateTime.MinValue).Max();
            if (outputs.Select(File.GetLastWriteTimeUtc).Min() < newestInput) return false;
            // timestamps can lie (cp -p keeps an older one): where the step recorded its inputs' checksums, they must still hold
            if (saved["inputs_sha256"] is JsonObject sums)
                foreach (var input in inputs.Where(Exists))
                    if ((string?)sums[Path.GetFullPath(input)] is { } recorded && recorded != ChecksumCache.Sha256(input)) return false;
            summary = saved["summary"]?.DeepClone().AsObject() ?? new JsonObject();
            return true;
        }
        catch (JsonException) { return false; }
    }

    /// <summary>What tells, cheaply, that a file changed while the run read it (<see cref="FileStamp"/>); for a folder store (Zarr), its files' count, total size and newest write.</summary>
    static string Stamp(string file)
    {
        if (new FileInfo(file) is { Exists: true } info) return FileStamp.Of(info);
        if (!Directory.Exists(file)) return "absent";
        var files = new DirectoryInfo(file).EnumerateFiles("*", SearchOption.AllDirectories).ToList();
        return $"{files.Count} files, {files.Sum(f => f.Length)} bytes, newest {files.Select(f => f.LastWriteTimeUtc.Ticks).DefaultIfEmpty(0).Max()}";
    }

    /// <summary>An input is a file, or a folder store (Zarr).</summary>
    static bool Exists(string input) => File.Exists(input) || Directory.Exists(input);

    /// <summary>When an input last changed: a folder store's newest file.</summary>
    static DateTime LastWrite(string input) => File.Exists(input) ? File.GetLastWriteTimeUtc(input)
        : Directory.EnumerateFiles(input, "*", SearchOption.AllDirectories).Select(File.GetLastWriteTimeUtc).DefaultIfEmpty(Directory.GetLastWriteTimeUtc(input)).Max();

    static string? Changed(string[] inputs, string[] before)
    {
        for (int i = 0; i < inputs.Length; i++) if (Stamp(inputs[i]) != before[i]) return inputs[i];
        return null;
    }

    /// <param name="hashed">the inputs whose checksums the checkpoint records (a shard hashes only its own slice's files, so it records none)</param>
    internal static void WriteCheckpoint(string path, string fingerprint, string[] hashed, string[] outputs, JsonObject summary)
    {
        var json = new JsonObject { ["fingerprint"] = fingerprint, ["outputs"] = new JsonArray(outputs.Select(o => (JsonNode)o).ToArray()), ["summary"] = summary.DeepClone() };
        if (hashed.Length > 0)
        {
            var sums = new JsonObject();
            foreach (var input in hashed.Where(Exists)) sums[Path.GetFullPath(input)] = ChecksumCache.Sha256(input);
            json["inputs_sha256"] = sums;
        }
        GridDrift.Outputs.AtomicFile.WriteAllText(path, json.ToJsonString(new JsonSerializerOptions { WriteIndented = true }));
    }

    static void CheckKeys(Recipe r, string section, IReadOnlyList<StepKey> keys)
    {
        foreach (var key in keys) r.Checked(section, key);
    }

    static void CheckStats(Recipe r) => CheckKeys(r, "stats", StatsKeys.All);

    static void CheckSimilarity(Recipe r) => CheckKeys(r, "similarity", SimilarityKeys.All);

    static void CheckClimatology(Recipe r)
    {
        CheckKeys(r, "climatology", ClimatologyKeys.All);
        if (r.Get("climatology", ClimatologyKeys.Smooth) is not null && r.Get("climatology", ClimatologyKeys.By) != "day-of-year")
            throw BadInputException.InRecipe(r.Path, r.LineOf("climatology", "smooth"), "climatology.smooth", "smoothing applies to day-of-year climatologies");
    }

    static void CheckAnomalies(Recipe r)
    {
        CheckKeys(r, "anomalies", AnomaliesKeys.All);
        if (!r.Has("climatology")) throw BadInputException.InRecipe(r.Path, r.LineOf("anomalies"), "[anomalies]", "needs a [climatology] step");
    }

    static void CheckEvents(Recipe r)
    {
        CheckKeys(r, "events", EventsKeys.All);
        CheckSeries(r, "events");
    }

    static void CheckAttribute(Recipe r)
    {
        CheckKeys(r, "attribute", AttributeKeys.All);
        CheckSeries(r, "attribute");
    }

    /// <summary>The series an analysis step reads must be a product of an earlier step of the recipe, or an existing file.</summary>
    static void CheckSeries(Recipe r, string section)
    {
        string series = r.Text(section, "series");
        var earlier = Order.TakeWhile(s => s != section).Where(s => s != "report" && r.Has(s))
            .SelectMany(s => Plan(r, s, [], name => name, name => name, null).Outputs).Select(Path.GetFileName).ToHashSet();
        if (!earlier.Contains(Path.GetFileName(series)) && !File.Exists(Path.Combine(OutFolder(r), series)))
            throw BadInputException.InRecipe(r.Path, r.LineOf(section, "series"), $"{section}.series",
                $"'{series}' is neither a product of an earlier step ({string.Join(", ", earlier.Order())}) nor an existing file");
    }

    static JsonObject RunStats(StepContext c)
    {
        var r = c.Recipe;
        var statistics = StatsKeys.Statistics(r.Get("stats", StatsKeys.Stat));
        var s = StatsStep.Run(new StatsOptions(c.Inputs, c.Variable, c.Regions, statistics, c.Outputs[0], c.Outputs.Length > 1 ? c.Outputs[1] : null,
            r.Get("stats", CommonKeys.MinValid), Command: c.How, Slice: c.Slice) { Selection = c.Selection });
        return new JsonObject { ["frames"] = s.Frames, ["regions"] = s.Regions };
    }

    static JsonObject RunSimilarity(StepContext c)
    {
        var r = c.Recipe;
        var metrics = SimilarityKeys.Metrics(r.Get("similarity", SimilarityKeys.Metric));
        var s = SimilarityStep.Run(new SimilarityOptions(c.Inputs, c.Variable, c.Regions, metrics, c.Outputs[0], c.Outputs.Length > 1 ? c.Outputs[1] : null,
            r.Get("similarity", SimilarityKeys.Lag), r.Get("similarity", SimilarityKeys.Range), r.Get("similarity", SimilarityKeys.AcrossGaps),
            MinValid: r.Get("similarity", CommonKeys.MinValid), Command: c.How, Slice: c.Slice) { Selection = c.Selection });
        return new JsonObject { ["pairs"] = s.Pairs, ["regions"] = s.Regions };
    }

    internal static ClimatologyKind ClimatologyKindOf(Recipe r) => ClimatologyKeys.Kind(r.Get("climatology", ClimatologyKeys.By));

    internal static JsonObject ClimatologySummaryJson(ClimatologySummary s) =>
        new() { ["frames"] = s.FramesUsed, ["slots"] = s.Slots, ["base"] = s.Base.ToIsoString(), ["warnings"] = new JsonArray(s.Warnings.Select(w => (JsonNode)w).ToArray()) };

    static JsonObject RunClimatology(StepContext c)
    {
        var r = c.Recipe;
        var s = ClimatologyStep.Run(new ClimatologyOptions(c.Inputs, c.Variable, ClimatologyKindOf(r), c.Outputs[0], r.Get("climatology", ClimatologyKeys.Base),
            r.Get("climatology", ClimatologyKeys.Smooth), Command: c.How, Slice: c.Slice, PartialOut: c.Slice is null ? null : c.Outputs[0]) { Selection = c.Selection });
        return ClimatologySummaryJson(s);
    }

    static JsonObject RunAnomalies(StepContext c)
    {
        var r = c.Recipe;
        var kind = AnomaliesKeys.KindOf(r.Get("anomalies", AnomaliesKeys.Kind));
        string? table = c.Outputs.Skip(1).FirstOrDefault(o => o.EndsWith(".parquet", StringComparison.Ordinal));
        string? fields = c.Outputs.Skip(1).FirstOrDefault(o => o.EndsWith(ProductNames.Fields, StringComparison.Ordinal));
        var s = AnomaliesStep.Run(new AnomaliesOptions(c.Inputs, c.Variable, c.StepInputs[^1], kind, fields, c.Regions, table, c.Outputs[0],
            r.Get("anomalies", CommonKeys.MinValid), Command: c.How, Slice: c.Slice) { Selection = c.Selection });
        return new JsonObject { ["frames"] = s.Frames };
    }

    static JsonObject RunEvents(StepContext c)
    {
        var r = c.Recipe;
        var analysis = EventsAnalysis.From(r.Get("events", EventsKeys.Detect), r.Get("events", EventsKeys.On), r.Get("events", EventsKeys.Window),
            r.Get("events", EventsKeys.Changepoints), r.Get("events", EventsKeys.Consensus), r.Get("events", EventsKeys.MinSegment));
        return EventsStep.Run(new EventsOptions(c.StepInputs[0], c.Outputs[0], r.Get("events", CommonKeys.Quantity), null, analysis, c.How,
            r.Get("events", CommonKeys.Plot) is { } plots ? c.Product(plots) : null)).Json;
    }

    static JsonObject RunAttribute(StepContext c)
    {
        var r = c.Recipe;
        return AttributeStep.Run(new AttributeOptions(c.StepInputs[0], r.Get("attribute", AttributeKeys.Target), c.Outputs[0], r.Get("attribute", CommonKeys.Quantity),
            r.Get("attribute", AttributeKeys.Periods), r.Get("attribute", AttributeKeys.Profiles), c.How,
            r.Get("attribute", CommonKeys.Plot) is { } plots ? c.Product(plots) : null)).Json;
    }
}
