using System.Text.Json.Nodes;
using GridDrift.Outputs.Description;
using System.CommandLine;
using GridDrift.Frames;
using GridDrift.Pipeline;
using GridDrift.Workflows;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift derive QUANTITY FILE...`: quantities computed from model output.</summary>
public static class DeriveCommand
{
    public static Command Build(string[] commandLine)
    {
        var quantity = new Argument<string>("QUANTITY") { Description = "column-water-vapour, relative-humidity or specific-humidity" };
        var files = CommonOptions.Files();
        var variable = new Option<string?>("--var") { Description = "the input: specific humidity (column-water-vapour, relative-humidity) or dew point (specific-humidity); default found by standard_name" };
        var temperature = new Option<string?>("--temperature") { Description = "relative-humidity: the air temperature variable (default: standard_name air_temperature)" };
        var pressure = new Option<string?>("--pressure") { Description = "relative-humidity, specific-humidity: a pressure variable of the same shape (default: the pressure levels)" };
        var surface = new Option<string?>("--surface-pressure") { Description = "surface-pressure variable in the same files: the column ends there" };
        var output = new Option<string>("--out") { Description = "NetCDF to write", Required = true };
        var format = CommonOptions.Format();
        var deflate = CommonOptions.Deflate();
        var shuffle = CommonOptions.Shuffle();
        var units = CommonOptions.Units();
        var quiet = CommonOptions.Quiet();
        var period = CommonOptions.Period();
        var level = CommonOptions.Level();
        var at = CommonOptions.At();
        var json = CommandJson.Option();
        var command = new Command("derive", "Derive a quantity from model output: total column water vapour from specific humidity on pressure levels, relative humidity, or specific humidity from the dew point.\n\n" +
            "Example:\n  griddrift derive column-water-vapour cf-samples/q_levels_noleap_2031.nc --out tcwv.nc")
        {
            quantity, files, variable, temperature, pressure, surface, output, format, deflate, shuffle, units, quiet, json, period, level, at,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var options = new DeriveOptions(InputPaths.Expand(parse.GetValue(files)!), parse.GetValue(quantity)!, parse.GetValue(output)!, parse.GetValue(variable),
                parse.GetValue(surface), null, CommonOptions.CommandLine("derive", commandLine),
                parse.GetValue(temperature), parse.GetValue(pressure), parse.GetValue(units));
            options = options with { Selection = CommonOptions.SelectionOf(parse, period, level, at) };
            var summary = ProgressDisplay.Run(parse.InvocationConfiguration.Error, parse.GetValue(quiet), "frames", progress => CommonOptions.FormatOf(parse, format, deflate, shuffle).Write(options.Output, (path, variant) => DeriveStep.Run(options with { Output = path, Format = variant }, progress)));
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine($"griddrift derive: {Counted.Of(summary.Frames, "frame")} of {summary.Variable} from {Counted.Of(summary.Levels, "level")} written to {options.Output}");
            CommandJson.Print(parse, json, CommandJson.Summary("derive", clock, [options.Output], new JsonObject
            {
                ["frames"] = summary.Frames, ["levels"] = summary.Levels, ["variable"] = summary.Variable,
            }));
            return ExitCodes.Success;
        });
        return command;
    }
}
