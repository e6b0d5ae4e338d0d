using System.Text.Json.Nodes;
using GridDrift.Outputs.Fields;
using GridDrift.Outputs.Series;
using GridDrift.Results;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Pipeline;

internal sealed record GatherOutcome(string Step, bool Skipped, IReadOnlyList<string> Outputs, JsonObject Summary);

/// <summary>
/// `griddrift gather SHARD-DIR...`: turns the partial products of the N shards of one sharded run
/// into the products of a one-machine run. Series pieces are written again in time order through
/// the one-machine writers (identical values); climatology partial states are merged (Chan et al.)
/// and finished as one climatology. Each gathered step gets the one-machine checkpoint, so a
/// following `griddrift run RECIPE` skips it and runs the steps that need the whole record.
/// A step that no shard has finished yet is left for a later stage; one that only some have
/// finished is refused, naming the shards that have not.
/// </summary>
internal static class ShardGather
{
    public static IReadOnlyList<GatherOutcome> Run(IReadOnlyList<string> shardFolders, string? outDir, Action<string>? log = null, string command = "griddrift gather")
    {
        if (shardFolders.Count == 0) throw new BadInputException(null, null, "no shard folders given");
        var manifests = shardFolders.Select(ShardManifest.Load).OrderBy(m => m.Shard.Index).ToList();
        var first = manifests[0];
        foreach (var m in manifests)
        {
            if (m.Recipe != first.Recipe) throw new BadInputException(m.Folder, null, $"belongs to the recipe {m.Recipe}, not {first.Recipe}");
            if (m.Shard.Count != first.Shard.Count) throw new BadInputException(m.Folder, null, $"is shard {m.Shard}, of another split than {first.Folder} (shard {first.Shard})");
            if (m.RecordFrames != first.RecordFrames) throw new BadInputException(m.Folder, null, $"saw a record of {m.RecordFrames} frames, {first.Folder} one of {first.RecordFrames}: the input files changed between the shards");
        }
        var repeated = manifests.GroupBy(m => m.Shard.Index).FirstOrDefault(g => g.Count() > 1);
        if (repeated is not null) throw new BadInputException(repeated.Last().Folder, null, $"shard {repeated.Key} is given twice ({string.Join(", ", repeated.Select(m => m.Folder))})");
        var missing = Enumerable.Range(1, first.Shard.Count).Except(manifests.Select(m => m.Shard.Index)).ToList();
        if (missing.Count > 0) throw new BadInputException(first.Folder, null, $"shards {string.Join(", ", missing)} of {first.Shard.Count} are missing: give every shard folder of the run");

        var recipe = Recipe.Load(first.Recipe);
        string mainDir = outDir is null ? RecipeRunner.OutFolder(recipe) : Path.GetFullPath(outDir);
        string stateDir = Path.Combine(mainDir, ".griddrift-run");
        Directory.CreateDirectory(stateDir);
        using var runLock = RunLock.Take(stateDir, mainDir);
        string variable = recipe.Text("input", "variable");
        IReadOnlyList<string> inputs;
        using (var record = GridDrift.Frames.FrameSource.Open(RecipeRunner.Inputs(recipe), variable, RecipeRunner.SelectionOf(recipe))) inputs = record.Files; // in time order, as a one-machine run lists them
        var shardsAttribute = new Dictionary<string, string>
        {
            ["griddrift_shards"] = string.Join("\n", manifests.Select(m => m.Describe())),
            ["griddrift_gather"] = $"{manifests.Count} shards gathered by {command}",
        };
        var outcomes = new List<GatherOutcome>();
        foreach (var step in RecipeRunner.Sharded.Where(recipe.Has))
        {
            var pieces = manifests.Select(m => (Manifest: m, Outputs: Finished(recipe, step, m))).ToList();
            var unfinished = pieces.Where(p => p.Outputs is null).Select(p => p.Manifest.Shard.Index).ToList();
            if (unfinished.Count == pieces.Count)
            {
                log?.Invoke($"{step}: no shard has run it yet; left for a later stage");
                continue;
            }
            if (unfinished.Count > 0)
                throw new BadInputException(first.Folder, step, $"shards {string.Join(", ", unfinished)} of {first.Shard.Count} have not finished {step}: run them again (griddrift run RECIPE --shard I/N), then gather");
            var outputs = RecipeRunner.Products(recipe, step, mainDir);
            var pieceFiles = pieces.SelectMany(p => p.Outputs!).ToArray();
            var checkpoint = Path.Combine(stateDir, step + ".json");
            string fingerprint = recipe.Fingerprint(step);
            if (RecipeRunner.UpToDate(checkpoint, fingerprint, pieceFiles, outputs, out var kept))
            {
                outcomes.Add(new GatherOutcome(step, true, outputs, kept));
                log?.Invoke($"{step}: already gathered, skipped");
                continue;
            }
            var clock = System.Diagnostics.Stopwatch.StartNew();
            string how = $"{command}  # step {step}";
            string? table = outputs.Skip(1).FirstOrDefault(o => o.EndsWith(".parquet", StringComparison.Ordinal));
            JsonObject summary;
            if (step == "climatology")
            {
                var s = ClimatologyStep.Run(new ClimatologyOptions(inputs, variable, RecipeRunner.ClimatologyKindOf(recipe), outputs[0],
                    recipe.OptionalText("climatology", "base"), recipe.OptionalText("climatology", "smooth"), Command: how,
                    PartialIn: pieces.Select(p => p.Outputs![0]).ToList(), Attributes: shardsAttribute));
                summary = RecipeRunner.ClimatologySummaryJson(s);
            }
            else
            {
                // the one-machine product's inputs: the record, and for anomalies the climatology after it
                var productInputs = step == "anomalies" ? inputs.Append(RecipeRunner.Products(recipe, "climatology", mainDir)[0]).ToList() : inputs;
                var joined = SeriesPieces.Join(pieces.Select(p => p.Outputs![0]).ToList(), outputs[0], table, variable, how, productInputs, shardsAttribute);
                if (outputs.FirstOrDefault(o => o.EndsWith(ProductNames.Fields, StringComparison.Ordinal)) is { } fields)
                {
                    var provenance = new Provenance(how, joined.InputFiles, joined.InputSha256, DateTime.UtcNow);
                    FieldPieces.Join(pieces.Select(p => p.Outputs!.First(o => o.EndsWith(ProductNames.Fields, StringComparison.Ordinal))).ToList(), fields, provenance.AsKeyValues(shardsAttribute));
                }
                summary = step switch
                {
                    "similarity" => new JsonObject { ["pairs"] = joined.Steps },
                    _ => new JsonObject { ["frames"] = joined.Steps },
                };
                var shardSummary = Checkpoint(pieces[0].Manifest, step)?["summary"];
                if (shardSummary?["regions"] is { } regions) summary["regions"] = regions.DeepClone();
            }
            summary["shards"] = first.Shard.Count;
            RecipeRunner.WriteCheckpoint(checkpoint, fingerprint, pieceFiles, outputs, summary);
            outcomes.Add(new GatherOutcome(step, false, outputs, summary));
            log?.Invoke($"{step}: gathered {first.Shard.Count} shards in {clock.Elapsed.TotalSeconds:0.0} s");
        }
        return outcomes;
    }

    static JsonObject? Checkpoint(ShardManifest m, string step)
    {
        string path = Path.Combine(m.Folder, ".griddrift-run", step + ".json");
        if (!File.Exists(path)) return null;
        try { return JsonNode.Parse(File.ReadAllText(path))?.AsObject(); }
        catch (System.Text.Json.JsonException) { return null; }
    }

    /// <summary>The products a shard left for a step, when its checkpoint says the step finished for this recipe and shard.</summary>
    static string[]? Finished(Recipe recipe, string step, ShardManifest m)
    {
        var saved = Checkpoint(m, step);
        if (saved is null || (string?)saved["fingerprint"] != m.Shard.Fingerprint(recipe.Fingerprint(step))) return null;
        var outputs = saved["outputs"]?.AsArray().Select(o => (string)o!).ToArray();
        return outputs is { Length: > 0 } && outputs.All(File.Exists) ? outputs : null;
    }
}
