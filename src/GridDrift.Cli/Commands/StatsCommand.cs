using System.Text.Json.Nodes;
using GridDrift.Outputs.Description;
using System.CommandLine;
using GridDrift.Frames;
using GridDrift.Pipeline;
using GridDrift.Operators.Statistics;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift stats`: area-weighted statistics per frame and region.</summary>
public static class StatsCommand
{
    public static Command Build(string[] commandLine)
    {
        var files = CommonOptions.Files();
        var variable = CommonOptions.Variable();
        var regions = CommonOptions.Regions();
        var stat = KeyOptions.For(StatsKeys.Stat);
        var minValid = KeyOptions.For(CommonKeys.MinValid);
        var output = new Option<string>("--out") { Description = "series NetCDF to write (dimensions time, region)", Required = true };
        var table = new Option<string?>("--table") { Description = "tidy Parquet table to write as well" };
        var radius = CommonOptions.EarthRadius();
        var format = CommonOptions.Format();
        var deflate = CommonOptions.Deflate();
        var shuffle = CommonOptions.Shuffle();
        var units = CommonOptions.Units();
        var quiet = CommonOptions.Quiet();
        var period = CommonOptions.Period();
        var level = CommonOptions.Level();
        var at = CommonOptions.At();
        var json = CommandJson.Option();
        var command = new Command("stats", "Area-weighted mean, standard deviation, minimum, maximum, quantiles and valid fraction per frame and region.\n\n" +
            "Example:\n  griddrift stats cf-samples/tcwv_synthetic_2031.nc --var tcwv --regions global bands:30 --out s.nc --table s.parquet")
        {
            files, variable, regions, stat, minValid, output, table, radius, format, deflate, shuffle, units, quiet, json, period, level, at,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            RegionStatistic[] statistics;
            try
            {
                statistics = StatsKeys.Statistics(parse.GetValue(stat)!);
            }
            catch (FormatException e)
            {
                throw new BadInputException(null, null, e.Message);
            }
            var options = new StatsOptions(InputPaths.Expand(parse.GetValue(files)!), parse.GetValue(variable)!, parse.GetValue(regions)!,
                statistics, parse.GetValue(output)!, parse.GetValue(table), parse.GetValue(minValid), parse.GetValue(radius),
                null, CommonOptions.CommandLine("stats", commandLine)) with { Units = parse.GetValue(units) };
            options = options with { Selection = CommonOptions.SelectionOf(parse, period, level, at) };
            var summary = ProgressDisplay.Run(parse.InvocationConfiguration.Error, parse.GetValue(quiet), "frames", progress => CommonOptions.FormatOf(parse, format, deflate, shuffle).Write(options.Output, (path, variant) => StatsStep.Run(options with { Output = path, Format = variant }, progress)));
            foreach (var w in summary.Warnings) parse.InvocationConfiguration.Error.WriteLine($"griddrift stats: warning: {w}");
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine(
                    $"griddrift stats: {Counted.Of(summary.Frames, "frame")} × {Counted.Of(summary.Regions, "region")} written to {options.Output}" +
                    (options.Table is null ? "" : $" and {options.Table}") +
                    $"; {Counted.Of(summary.BelowMinValid, "region-frame")} below --min-valid {options.MinValid}, {summary.NoData} with no data (set to NaN)");
            CommandJson.Print(parse, json, CommandJson.Summary("stats", clock, [options.Output, options.Table], new JsonObject
            {
                ["frames"] = summary.Frames, ["regions"] = summary.Regions, ["values"] = summary.Values,
                ["below_min_valid"] = summary.BelowMinValid, ["no_data"] = summary.NoData,
            }, summary.Warnings));
            return ExitCodes.Success;
        });
        return command;
    }
}
