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
        var command = new Command("run", "Run the whole chain of a recipe; steps whose products are up to date are skipped, so an interrupted run resumes.\n\n" +
            "Example:\n  griddrift run griddrift-demo/recipe.toml") { recipe, quiet, verbose };
        command.SetAction(parse =>
        {
            var err = parse.InvocationConfiguration.Error;
            bool q = parse.GetValue(quiet);
            var steps = RecipeRunner.Run(parse.GetValue(recipe)!, q ? null : line => err.WriteLine("griddrift run: " + line), CommonOptions.CommandLine("run", commandLine));
            if (parse.GetValue(verbose)) Describe(err, steps);
            return ExitCodes.Success;
        });
        return command;
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
        var size = new Option<string>("--size") { Description = "small (4°, 6-hourly, 4 years) or default (2°, 3-hourly, 2031–2036)", DefaultValueFactory = _ => "default" };
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
                err.WriteLine($"griddrift demo: edit {recipe} and rerun it with: griddrift run {recipe}");
                err.WriteLine("griddrift demo: " + CliApp.Caution);
            }
            return ExitCodes.Success;
        });
        return command;
    }
}
