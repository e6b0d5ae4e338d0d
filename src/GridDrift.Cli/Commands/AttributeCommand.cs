using System.CommandLine;
using GridDrift.Pipeline;
using GridDrift.Workflows;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift attribute`: which regions drive a target series.</summary>
public static class AttributeCommand
{
    public static Command Build(string[] commandLine)
    {
        var input = new Argument<string>("SERIES") { Description = "a series product (series NetCDF or tidy Parquet), e.g. of similarity" };
        var target = new Option<string>("--target") { Description = "the region whose series is explained", Required = true };
        var quantity = new Option<string?>("--quantity") { Description = "the quantity (default: the only one, else ssim or mean)" };
        var periods = new Option<string?>("--periods") { Description = "two periods A/B,C/D whose region ranks are compared (default: before/after the target's change point)" };
        var profiles = new Option<string[]>("--profiles") { Description = "regions whose partial dependence and ICE profiles are written", AllowMultipleArgumentsPerToken = true };
        var output = new Option<string>("--out") { Description = "importance table (Parquet); OUT_shapley, OUT_ranks and OUT_profiles are written beside it", Required = true };
        var json = new Option<bool>("--json") { Description = "print a JSON summary on stdout" };
        var plot = new Option<string?>("--plot") { Description = "folder for the PNG figures" };
        var quiet = CommonOptions.Quiet();
        var command = new Command("attribute", "Which regions drive a target series: ridge model, permutation importance, Shapley values, rank changes between periods.\n\n" +
            "Example:\n  griddrift attribute sim.nc --target global --quantity ssim --out attribution.parquet --json")
        {
            input, target, quantity, periods, profiles, output, json, plot, quiet,
        };
        command.SetAction(parse =>
        {
            var summary = AttributeStep.Run(new AttributeOptions(parse.GetValue(input)!, parse.GetValue(target)!, parse.GetValue(output)!,
                parse.GetValue(quantity), parse.GetValue(periods), parse.GetValue(profiles), CommonOptions.CommandLine("attribute", commandLine), parse.GetValue(plot)));
            if (parse.GetValue(json)) parse.InvocationConfiguration.Output.WriteLine(EventsStep.Serialize(summary.Json));
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine($"griddrift attribute: R² {summary.R2:0.000}; leading regions " +
                    string.Join(", ", summary.Ranking.Take(3).Select(r => r.Region)) + "; tables " + string.Join(", ", summary.Tables));
            return ExitCodes.Success;
        });
        return command;
    }
}
