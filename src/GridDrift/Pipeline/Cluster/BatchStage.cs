namespace GridDrift.Pipeline.Cluster;

/// <summary>
/// One stage of a sharded run on a batch cluster: an array job with one task per shard, or a
/// single job. Each stage starts only once the stage before it has completed (afterok).
/// </summary>
internal sealed record BatchStage(string Name, string Description, bool Array, string Body)
{
    /// <summary>
    /// The stages of a recipe: the shards' slice steps; when the recipe has anomalies, a gather
    /// (the climatology they need) and the shards' anomalies; then a final gather that also runs
    /// the steps that need the whole record (events, attribute, report).
    /// </summary>
    public static IReadOnlyList<BatchStage> For(Recipe recipe, int shards, string griddrift, string mainDir)
    {
        string recipePath = Quote(recipe.Path);
        string folders = string.Join(" ", Enumerable.Range(1, shards).Select(i => Quote(new ShardSpec(i, shards).Folder(mainDir))));
        string shardRun = $"{griddrift} run {recipePath} --shard \"${{SLURM_ARRAY_TASK_ID}}/{shards}\"";
        string gather = $"{griddrift} gather {folders}";
        bool wholeRecord = RecipeRunner.Order.Except(RecipeRunner.Sharded).Any(recipe.Has);
        var stages = new List<BatchStage> { new("record", "stats, similarity and climatology states of each shard's slice", true, shardRun) };
        if (recipe.Has("anomalies"))
        {
            stages.Add(new("gather-record", "gathers the slices, finishing the climatology the anomalies need", false, gather));
            stages.Add(new("departures", "anomalies of each shard's slice from the gathered climatology", true, shardRun));
        }
        stages.Add(wholeRecord
            ? new("finish", "gathers every shard, then runs the steps that need the whole record (events, attribute, report)", false, $"{gather}\n{griddrift} run {recipePath}")
            : new("finish", "gathers every shard", false, gather));
        return stages;
    }

    /// <summary>A word for a POSIX shell: as it is when it is safe, else in single quotes.</summary>
    public static string Quote(string s) => s.Length > 0 && s.All(c => char.IsLetterOrDigit(c) || "/._-+=:@%,".Contains(c)) ? s : "'" + s.Replace("'", "'\\''") + "'";
}
