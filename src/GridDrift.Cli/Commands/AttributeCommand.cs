using System.Text.Json.Nodes;
using System.CommandLine;
using GridDrift.Pipeline;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift attribute`: which regions drive a target series.</summary>
public static class AttributeCommand
{
    public static Command Build(string[] commandLine)
    {
        var input = new Argument<string>("SERIES") { Description = "a series product (series NetCDF or tidy Parquet), e.g. of similarity" };
        var target = KeyOptions.For(AttributeKeys.Target);
        var quantity = KeyOptions.For(CommonKeys.Quantity);
        var periods = KeyOptions.For(AttributeKeys.Periods);
        var profiles = KeyOptions.For(AttributeKeys.Profiles);
        var output = new Option<string>("--out") { Description = "importance table (Parquet); OUT_shapley, OUT_ranks and OUT_profiles are written beside it", Required = true };
        var json = CommandJson.Option();
        var plot = KeyOptions.For(CommonKeys.Plot);
        var quiet = CommonOptions.Quiet();
        var command = new Command("attribute", "Which regions drive a target series: ridge model, permutation importance, Shapley values, rank changes between periods.\n\n" +
            "Example:\n  griddrift attribute sim.nc --target global --quantity ssim --out attribution.parquet --json")
        {
            input, target, quantity, periods, profiles, output, json, plot, quiet,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var summary = AttributeStep.Run(new AttributeOptions(parse.GetValue(input)!, parse.GetValue(target)!, parse.GetValue(output)!,
                parse.GetValue(quantity), parse.GetValue(periods), parse.GetValue(profiles), CommonOptions.CommandLine("attribute", commandLine), parse.GetValue(plot)));
            // the summary's keys join the attribution's own JSON (ranking, fit), which stays as it was
            CommandJson.Print(parse, json, CommandJson.Summary("attribute", clock, summary.Tables,
                new JsonObject { ["regions"] = summary.Ranking.Count, ["r2"] = summary.R2 }, into: summary.Json));
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine($"griddrift attribute: R² {summary.R2:0.000}; leading regions " +
                    string.Join(", ", summary.Ranking.Take(3).Select(r => r.Region)) + "; tables " + string.Join(", ", summary.Tables));
            return ExitCodes.Success;
        });
        return command;
    }
}
