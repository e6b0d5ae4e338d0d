using System.Text.Json.Nodes;
using System.CommandLine;
using GridDrift.Demo;
using GridDrift.Pipeline;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift run RECIPE` and `griddrift demo`.</summary>
public static class RunCommands
{
    public static Command Run(string[] commandLine)
    {
        var recipe = new Argument<string>("RECIPE") { Description = "a recipe file (TOML): [input] and one table per step" };
        var quiet = CommonOptions.Quiet();
        var verbose = Verbose();
        var shard = new Option<string?>("--shard") { Description = "run only shard I of N (I/N, from 1): its contiguous slice of the record, into OUT/shards/shard-II-of-NN (at least two digits: shard 2/4 is shard-02-of-04); combine the shards with griddrift gather" };
        shard.Validators.Add(result =>
        {
            try { if (result.GetValueOrDefault<string?>() is { } t) ShardSpec.Parse(t); }
            catch (FormatException e) { result.AddError(e.Message); }
        });
        var json = CommandJson.Option();
        var command = new Command("run", "Run the whole chain of a recipe; steps whose products are up to date are skipped, so an interrupted run resumes.\n" +
            "With --shard I/N, run the steps that work on slices of the record (stats, similarity, climatology, and anomalies once the climatology is gathered) for one shard.\n\n" +
            "Examples:\n  griddrift run griddrift-demo/recipe.toml\n  griddrift run griddrift-demo/recipe.toml --shard 2/4") { recipe, quiet, verbose, shard, json };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var err = parse.InvocationConfiguration.Error;
            bool q = parse.GetValue(quiet);
            var spec = parse.GetValue(shard) is { } st ? ShardSpec.Parse(st) : (ShardSpec?)null;
            string prefix = spec is { } sp ? $"griddrift run (shard {sp}): " : "griddrift run: ";
            var steps = RecipeRunner.Run(parse.GetValue(recipe)!, q ? null : line => err.WriteLine(prefix + line), CommonOptions.CommandLine("run", commandLine), spec);
            if (parse.GetValue(verbose)) Describe(err, steps);
            CommandJson.Print(parse, json, StepsJson("run", clock, steps));
            return ExitCodes.Success;
        });
        return command;
    }

    /// <summary>The summary of a recipe run: every step with its products, its own summary and its time.</summary>
    static JsonObject StepsJson(string command, System.Diagnostics.Stopwatch clock, IReadOnlyList<StepOutcome> steps)
    {
        var list = new JsonArray(steps.Select(s => (JsonNode)new JsonObject
        {
            ["step"] = s.Step, ["skipped"] = s.Skipped, ["products"] = new JsonArray(s.Outputs.Select(o => (JsonNode)o).ToArray()),
            ["summary"] = s.Summary.DeepClone(), ["seconds"] = Math.Round(s.Took.TotalSeconds, 3),
        }).ToArray());
        var warnings = steps.SelectMany(s => s.Summary["warnings"] is JsonArray w ? w.Select(x => $"{s.Step}: {x}") : []);
        return CommandJson.Summary(command, clock, steps.SelectMany(s => s.Outputs),
            new JsonObject { ["steps_run"] = steps.Count(s => !s.Skipped), ["steps_up_to_date"] = steps.Count(s => s.Skipped) }, warnings, new JsonObject { ["steps"] = list });
    }

    public static Command Gather(string[] commandLine)
    {
        var folders = new Argument<string[]>("SHARD-DIR") { Description = "the shard folders of one sharded run (OUT/shards/shard-II-of-NN), all N of them", Arity = ArgumentArity.OneOrMore };
        var output = new Option<string?>("--out") { Description = "folder for the gathered products (default: the recipe's [input] out)" };
        var quiet = CommonOptions.Quiet();
        var json = CommandJson.Option();
        var command = new Command("gather", "Combine the partial products of the shards of a sharded run into the products of a one-machine run: series joined in time order, " +
            "climatology states merged. Run griddrift run RECIPE afterwards for the steps that need the whole record (events, attribute, report).\n\n" +
            "Example:\n  griddrift gather products/shards/shard-*") { folders, output, quiet, json };
        command.SetAction(parse =>
        {
            var err = parse.InvocationConfiguration.Error;
            bool q = parse.GetValue(quiet);
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var done = ShardGather.Run(parse.GetValue(folders)!, parse.GetValue(output), q ? null : line => err.WriteLine("griddrift gather: " + line), CommonOptions.CommandLine("gather", commandLine));
            if (parse.GetValue(json))
                CommandJson.Print(parse, json, StepsJson("gather", clock, done.Select(d => new StepOutcome(d.Step, d.Skipped, d.Outputs, d.Summary, TimeSpan.Zero)).ToList()));
            else
                foreach (var d in done) parse.InvocationConfiguration.Output.WriteLine($"{d.Step}\t{(d.Skipped ? "up to date" : "gathered")}\t{string.Join(" ", d.Outputs)}");
            return ExitCodes.Success;
        });
        return command;
    }

    public static Command Submit(string[] commandLine)
    {
        var recipe = new Argument<string>("RECIPE") { Description = "the recipe to run sharded" };
        var shards = new Option<int>("--shards") { Description = "number of shards (contiguous time slices of the record)", Required = true };
        shards.Validators.Add(r => { if (r.GetValueOrDefault<int>() < 1) r.AddError("--shards must be at least 1"); });
        var scheduler = new Option<string>("--scheduler") { Description = "the cluster's batch scheduler", Required = true };
        scheduler.AcceptOnlyFromAmong("slurm");
        var dryRun = new Option<bool>("--dry-run") { Description = "write the batch scripts and print the sbatch commands, submit nothing" };
        var wait = new Option<bool>("--wait") { Description = "follow the jobs until every task has ended and report each task's state; exit 4 if any failed" };
        var partition = new Option<string?>("--partition") { Description = "passed to every job as sbatch --partition" };
        var time = new Option<string?>("--time") { Description = "passed to every job as sbatch --time (e.g. 02:00:00)" };
        var memory = new Option<string?>("--mem") { Description = "passed to every job as sbatch --mem (e.g. 8G)" };
        var account = new Option<string?>("--account") { Description = "passed to every job as sbatch --account" };
        var extra = new Option<string[]>("--sbatch-option") { Description = "any other sbatch option for every job, e.g. --sbatch-option=--qos=short (repeatable)", AllowMultipleArgumentsPerToken = false };
        var quiet = CommonOptions.Quiet();
        var json = CommandJson.Option();
        var command = new Command("submit", "Run a recipe sharded on a batch cluster: one array job per sharded stage, chained with afterok dependencies, and a final gather job.\n\n" +
            "Examples:\n  griddrift submit recipe.toml --shards 8 --scheduler slurm --dry-run\n  griddrift submit recipe.toml --shards 8 --scheduler slurm --partition compute --time 04:00:00 --mem 16G --wait")
            { recipe, shards, scheduler, dryRun, wait, partition, time, memory, account, extra, quiet, json };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var err = parse.InvocationConfiguration.Error;
            var outp = parse.InvocationConfiguration.Output;
            bool q = parse.GetValue(quiet), dry = parse.GetValue(dryRun), asJson = parse.GetValue(json);
            if (!dry && !GridDrift.Pipeline.Cluster.SlurmClient.Available)
                throw new BadInputException(null, null, "sbatch and scontrol are not on PATH: griddrift submit --scheduler slurm runs where Slurm's client commands are (Debian: apt-get install slurm-client); --dry-run only writes the scripts");
            var options = new GridDrift.Pipeline.Cluster.SubmitOptions(parse.GetValue(recipe)!, parse.GetValue(shards), SelfCommand(),
                new GridDrift.Pipeline.Cluster.BatchOptions(parse.GetValue(partition), parse.GetValue(time), parse.GetValue(memory), parse.GetValue(account), parse.GetValue(extra)),
                dry, parse.GetValue(wait));
            var sbatchLines = new List<string>();
            var report = GridDrift.Pipeline.Cluster.SlurmSubmission.Run(options, dry ? (asJson ? sbatchLines.Add : outp.WriteLine) : q ? null : line => err.WriteLine("griddrift submit: " + line));
            if (!asJson)
                foreach (var t in report.Tasks)
                    outp.WriteLine($"{t.Stage}\t{(t.Task is null ? "-" : t.Task + "/" + options.Shards)}\t{t.State}\t{t.ExitCode}\t{t.Log}");
            foreach (var problem in report.Problems) err.WriteLine("griddrift submit: " + problem);
            CommandJson.Print(parse, json, CommandJson.Summary("submit", clock, report.Stages.Select(st => st.Script),
                new JsonObject { ["stages"] = report.Stages.Count, ["tasks"] = report.Tasks.Count, ["failed"] = report.Tasks.Count(t => t.State != "COMPLETED") }, report.Problems,
                new JsonObject
                {
                    ["jobs"] = new JsonArray(report.Stages.Select(st => (JsonNode)new JsonObject { ["stage"] = st.Stage.Name, ["script"] = st.Script, ["job"] = st.JobId }).ToArray()),
                    ["task_states"] = new JsonArray(report.Tasks.Select(t => (JsonNode)new JsonObject { ["stage"] = t.Stage, ["task"] = t.Task, ["state"] = t.State, ["exit_code"] = t.ExitCode, ["log"] = t.Log }).ToArray()),
                    ["sbatch_commands"] = new JsonArray(sbatchLines.Select(l => (JsonNode)l).ToArray()),
                }));
            return report.Succeeded ? ExitCodes.Success : ExitCodes.JobsFailed;
        });
        return command;
    }

    /// <summary>How a batch job calls this same GridDrift: the published binary, or dotnet with this assembly.</summary>
    static string SelfCommand()
    {
        string self = Environment.ProcessPath ?? "griddrift";
        string assembly = typeof(RunCommands).Assembly.Location;
        return Path.GetFileNameWithoutExtension(self) == "dotnet"
            ? $"{GridDrift.Pipeline.Cluster.BatchStage.Quote(self)} {GridDrift.Pipeline.Cluster.BatchStage.Quote(assembly)}"
            : GridDrift.Pipeline.Cluster.BatchStage.Quote(self);
    }

    static Option<bool> Verbose() => new("--verbose") { Description = "also list each step's products and summary" };

    static void Describe(TextWriter err, IReadOnlyList<StepOutcome> steps)
    {
        foreach (var s in steps)
        {
            err.WriteLine($"  {s.Step}: {(s.Skipped ? "skipped" : $"{s.Took.TotalSeconds:0.0} s")}; {string.Join(", ", s.Outputs)}");
            err.WriteLine("    " + s.Summary.ToJsonString());
        }
    }

    public static Command Demo(string[] commandLine)
    {
        var output = new Option<string>("--out") { Description = "folder for the record, the recipe and the products", DefaultValueFactory = _ => "griddrift-demo" };
        var size = new Option<string>("--size") { Description = "small (4°, 6-hourly, 4 years) or default (2°, 3-hourly, 2031–2036)", DefaultValueFactory = _ => "default" }.OneOf("small", "default");
        var quiet = CommonOptions.Quiet();
        var verbose = Verbose();
        var json = CommandJson.Option();
        var command = new Command("demo", "Write an invented record with a regime shift in two regions and run the whole chain on it, ending in a report.\n" +
            "The data are synthetic; GridDrift is an analysis tool, not a warning or forecasting service.\n\n" +
            "Example:\n  griddrift demo --size small") { output, size, quiet, verbose, json };
        command.SetAction(parse =>
        {
            var err = parse.InvocationConfiguration.Error;
            bool q = parse.GetValue(quiet);
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var (recipe, steps) = DemoRun.Run(parse.GetValue(output)!, parse.GetValue(size)!, q ? null : line => err.WriteLine("griddrift demo: " + line));
            var report = steps.FirstOrDefault(s => s.Step == "report");
            if (parse.GetValue(verbose)) Describe(err, steps);
            CommandJson.Print(parse, json, StepsJson("demo", clock, steps));
            if (!q)
            {
                err.WriteLine($"griddrift demo: finished in {clock.Elapsed.TotalSeconds:0} s; report {string.Join(" and ", report?.Outputs ?? [])}");
                err.WriteLine($"griddrift demo: edit {recipe} and rerun it with: {CommonOptions.SelfName} run {recipe}");
                err.WriteLine("griddrift demo: " + CliApp.Caution);
            }
            return ExitCodes.Success;
        });
        return command;
    }
}
