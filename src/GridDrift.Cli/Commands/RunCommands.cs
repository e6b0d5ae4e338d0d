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
        var shard = new Option<string?>("--shard") { Description = "run only shard I of N (I/N, from 1): its contiguous slice of the record, into OUT/shards/shard-I-of-N; combine the shards with griddrift gather" };
        shard.Validators.Add(result =>
        {
            try { if (result.GetValueOrDefault<string?>() is { } t) ShardSpec.Parse(t); }
            catch (FormatException e) { result.AddError(e.Message); }
        });
        var command = new Command("run", "Run the whole chain of a recipe; steps whose products are up to date are skipped, so an interrupted run resumes.\n" +
            "With --shard I/N, run the steps that work on slices of the record (stats, similarity, climatology, and anomalies once the climatology is gathered) for one shard.\n\n" +
            "Examples:\n  griddrift run griddrift-demo/recipe.toml\n  griddrift run griddrift-demo/recipe.toml --shard 2/4") { recipe, quiet, verbose, shard };
        command.SetAction(parse =>
        {
            var err = parse.InvocationConfiguration.Error;
            bool q = parse.GetValue(quiet);
            var spec = parse.GetValue(shard) is { } st ? ShardSpec.Parse(st) : (ShardSpec?)null;
            string prefix = spec is { } sp ? $"griddrift run (shard {sp}): " : "griddrift run: ";
            var steps = RecipeRunner.Run(parse.GetValue(recipe)!, q ? null : line => err.WriteLine(prefix + line), CommonOptions.CommandLine("run", commandLine), spec);
            if (parse.GetValue(verbose)) Describe(err, steps);
            return ExitCodes.Success;
        });
        return command;
    }

    public static Command Gather(string[] commandLine)
    {
        var folders = new Argument<string[]>("SHARD-DIR") { Description = "the shard folders of one sharded run (OUT/shards/shard-I-of-N), all N of them", Arity = ArgumentArity.OneOrMore };
        var output = new Option<string?>("--out") { Description = "folder for the gathered products (default: the recipe's [input] out)" };
        var quiet = CommonOptions.Quiet();
        var command = new Command("gather", "Combine the partial products of the shards of a sharded run into the products of a one-machine run: series joined in time order, " +
            "climatology states merged. Run griddrift run RECIPE afterwards for the steps that need the whole record (events, attribute, report).\n\n" +
            "Example:\n  griddrift gather products/shards/shard-*") { folders, output, quiet };
        command.SetAction(parse =>
        {
            var err = parse.InvocationConfiguration.Error;
            bool q = parse.GetValue(quiet);
            var done = ShardGather.Run(parse.GetValue(folders)!, parse.GetValue(output), q ? null : line => err.WriteLine("griddrift gather: " + line), CommonOptions.CommandLine("gather", commandLine));
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
        var command = new Command("submit", "Run a recipe sharded on a batch cluster: one array job per sharded stage, chained with afterok dependencies, and a final gather job.\n\n" +
            "Examples:\n  griddrift submit recipe.toml --shards 8 --scheduler slurm --dry-run\n  griddrift submit recipe.toml --shards 8 --scheduler slurm --partition compute --time 04:00:00 --mem 16G --wait")
            { recipe, shards, scheduler, dryRun, wait, partition, time, memory, account, extra, quiet };
        command.SetAction(parse =>
        {
            var err = parse.InvocationConfiguration.Error;
            var outp = parse.InvocationConfiguration.Output;
            bool q = parse.GetValue(quiet), dry = parse.GetValue(dryRun);
            if (!dry && !GridDrift.Pipeline.Cluster.SlurmClient.Available)
                throw new BadInputException(null, null, "sbatch and scontrol are not on PATH: griddrift submit --scheduler slurm runs where Slurm's client commands are (Debian: apt-get install slurm-client); --dry-run only writes the scripts");
            var options = new GridDrift.Pipeline.Cluster.SubmitOptions(parse.GetValue(recipe)!, parse.GetValue(shards), SelfCommand(),
                new GridDrift.Pipeline.Cluster.BatchOptions(parse.GetValue(partition), parse.GetValue(time), parse.GetValue(memory), parse.GetValue(account), parse.GetValue(extra)),
                dry, parse.GetValue(wait));
            var report = GridDrift.Pipeline.Cluster.SlurmSubmission.Run(options, dry ? outp.WriteLine : q ? null : line => err.WriteLine("griddrift submit: " + line));
            foreach (var t in report.Tasks)
                outp.WriteLine($"{t.Stage}\t{(t.Task is null ? "-" : t.Task + "/" + options.Shards)}\t{t.State}\t{t.ExitCode}\t{t.Log}");
            foreach (var problem in report.Problems) err.WriteLine("griddrift submit: " + problem);
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
        var command = new Command("demo", "Write an invented record with a regime shift in two regions and run the whole chain on it, ending in a report.\n" +
            "The data are synthetic; GridDrift is an analysis tool, not a warning or forecasting service.\n\n" +
            "Example:\n  griddrift demo --size small") { output, size, quiet, verbose };
        command.SetAction(parse =>
        {
            var err = parse.InvocationConfiguration.Error;
            bool q = parse.GetValue(quiet);
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var (recipe, steps) = DemoRun.Run(parse.GetValue(output)!, parse.GetValue(size)!, q ? null : line => err.WriteLine("griddrift demo: " + line));
            var report = steps.FirstOrDefault(s => s.Step == "report");
            if (parse.GetValue(verbose)) Describe(err, steps);
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
