using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace GridDrift.Pipeline.Cluster;

internal sealed record SubmitOptions(string Recipe, int Shards, string Griddrift, BatchOptions Batch, bool DryRun = false, bool Wait = false, TimeSpan? PollEvery = null);

/// <summary>How one task (or single job) of a stage ended.</summary>
internal sealed record TaskOutcome(string Stage, string JobId, string? Task, string State, string Reason, string ExitCode, string Log);

internal sealed record SubmitReport(IReadOnlyList<(BatchStage Stage, string Script, string? JobId)> Stages, IReadOnlyList<TaskOutcome> Tasks, IReadOnlyList<string> Problems)
{
    public bool Succeeded => Problems.Count == 0;
}

/// <summary>
/// `griddrift submit RECIPE --shards N --scheduler slurm`: writes one batch script per stage
/// (OUT/shards/slurm/K-STAGE.sbatch), submits them chained with afterok dependencies, and with
/// --wait follows every task with scontrol until all have ended, then names each failed task
/// with its log and the stages it held back. The cluster's scheduler does the scheduling:
/// GridDrift only describes the jobs.
/// </summary>
internal static class SlurmSubmission
{
    public static SubmitReport Run(SubmitOptions o, Action<string>? log = null)
    {
        if (o.Shards < 1) throw new BadInputException(o.Recipe, null, "--shards must be at least 1");
        var recipe = Recipe.Load(o.Recipe);
        if (RecipeRunner.Inputs(recipe).Count == 0) throw new BadInputException(recipe.Path, "input.files", "matches no file");
        string mainDir = RecipeRunner.OutFolder(recipe);
        // everything that reaches a batch script: a control character there could end a line and start a command
        ScriptText.Check(recipe.Path, "the recipe's path");
        ScriptText.Check(mainDir, "the recipe's [input] out");
        ScriptText.Check(o.Griddrift, "the griddrift command");
        foreach (var d in o.Batch.Directives()) ScriptText.Check(d, "a scheduler option");
        string jobsDir = Path.Combine(mainDir, "shards", "slurm"), logs = Path.Combine(jobsDir, "logs");
        Directory.CreateDirectory(logs);
        var stages = BatchStage.For(recipe, o.Shards, o.Griddrift, mainDir);
        var scripts = stages.Select((s, k) => WriteScript(jobsDir, logs, k + 1, stages.Count, s, o)).ToList();

        var submitted = new List<(BatchStage, string, string?)>();
        var slurm = new SlurmClient();
        string? previous = null;
        for (int k = 0; k < stages.Count; k++)
        {
            if (o.DryRun)
            {
                string dep = k == 0 ? "" : $" --dependency=afterok:$JOB{k} --kill-on-invalid-dep=yes";
                log?.Invoke($"JOB{k + 1}=$(sbatch --parsable{dep} {BatchStage.Quote(scripts[k])})   # {stages[k].Name}: {stages[k].Description}");
                submitted.Add((stages[k], scripts[k], null));
                continue;
            }
            previous = slurm.Submit(scripts[k], previous);
            submitted.Add((stages[k], scripts[k], previous));
            log?.Invoke($"{stages[k].Name}: job {previous}{(stages[k].Array ? $" (array of {o.Shards} tasks)" : "")}");
        }
        if (!o.DryRun) SaveJobs(jobsDir, submitted);
        if (o.DryRun || !o.Wait) return new SubmitReport(submitted, [], []);
        return Follow(slurm, submitted, logs, o.PollEvery ?? TimeSpan.FromSeconds(2), log);
    }

    static string WriteScript(string jobsDir, string logs, int k, int count, BatchStage s, SubmitOptions o)
    {
        var sb = new StringBuilder();
        sb.Append("#!/bin/bash\n");
        sb.Append($"#SBATCH --job-name=griddrift-{s.Name}\n");
        if (s.Array) sb.Append($"#SBATCH --array=1-{o.Shards}\n");
        sb.Append($"#SBATCH --output={ScriptText.Directive(Path.Combine(logs, s.Array ? s.Name + "-%a.log" : s.Name + ".log"))}\n");
        sb.Append("#SBATCH --ntasks=1\n");
        foreach (var d in o.Batch.Directives()) sb.Append($"#SBATCH {ScriptText.Directive(d)}\n");
        sb.Append($"# GridDrift sharded run of {Path.GetFullPath(o.Recipe)}: stage {k} of {count}, {s.Name}: {s.Description}.\n");
        sb.Append("# Written by griddrift submit; GridDrift is an analysis tool, not a warning or forecasting service.\n");
        sb.Append("set -euo pipefail\n");
        sb.Append(s.Body).Append('\n');
        string path = Path.Combine(jobsDir, $"{k}-{s.Name}.sbatch");
        GridDrift.Outputs.AtomicFile.WriteAllText(path, sb.ToString());
        return path;
    }

    static void SaveJobs(string jobsDir, List<(BatchStage Stage, string Script, string? JobId)> jobs)
    {
        var json = new JsonArray(jobs.Select(j => (JsonNode)new JsonObject { ["stage"] = j.Stage.Name, ["job"] = j.JobId, ["script"] = j.Script }).ToArray());
        GridDrift.Outputs.AtomicFile.WriteAllText(Path.Combine(jobsDir, "jobs.json"), json.ToJsonString(new JsonSerializerOptions { WriteIndented = true }));
    }

    /// <summary>Polls every job until each task has ended (or Slurm has forgotten it), then reports.</summary>
    static SubmitReport Follow(SlurmClient slurm, List<(BatchStage Stage, string Script, string? JobId)> jobs, string logs, TimeSpan pollEvery, Action<string>? log)
    {
        var last = new Dictionary<string, string>();
        IReadOnlyList<JobRecord>[] records;
        while (true)
        {
            records = jobs.Select(j => slurm.Show(j.JobId!)).ToArray();
            for (int k = 0; k < jobs.Count; k++)
                foreach (var r in records[k])
                {
                    string key = $"{jobs[k].Stage.Name} {r.ArrayTaskId ?? ""}".Trim();
                    if (last.GetValueOrDefault(key) != r.State) log?.Invoke($"{key}: {r.State}{(r.Reason is "" or "None" ? "" : $" ({r.Reason})")}");
                    last[key] = r.State;
                }
            if (records.All(rs => rs.All(r => r.HasEnded))) break;
            Thread.Sleep(pollEvery);
        }
        var tasks = new List<TaskOutcome>();
        var problems = new List<string>();
        for (int k = 0; k < jobs.Count; k++)
        {
            var (stage, _, id) = jobs[k];
            if (records[k].Count == 0)
            {
                problems.Add($"{stage.Name}: job {id} is no longer known to Slurm; its outcome cannot be told (see {logs})");
                continue;
            }
            foreach (var r in records[k].OrderBy(r => int.TryParse(r.ArrayTaskId, NumberStyles.None, CultureInfo.InvariantCulture, out int t) ? t : 0))
            {
                bool neverRan = r.Reason == "DependencyNeverSatisfied";
                string logPath = neverRan ? "(never ran)" : r.StdOut ?? Path.Combine(logs, stage.Array ? $"{stage.Name}-{r.ArrayTaskId}.log" : $"{stage.Name}.log");
                tasks.Add(new TaskOutcome(stage.Name, r.JobId, r.ArrayTaskId, r.State, r.Reason, r.ExitCode, logPath));
                if (r.Succeeded) continue;
                string which = r.ArrayTaskId is { } t ? $"task {t} of {stage.Name}" : stage.Name;
                if (neverRan)
                    problems.Add($"{which}: not run, because an earlier stage failed");
                else
                {
                    var blocked = jobs.Skip(k + 1).Select(j => j.Stage.Name).ToList();
                    problems.Add($"{which} (job {r.JobId}) {r.State}, exit code {r.ExitCode}; log: {logPath}" +
                        (blocked.Count > 0 ? $"; it blocked {string.Join(", ", blocked)}" : ""));
                }
            }
        }
        return new SubmitReport(jobs, tasks, problems);
    }
}
