using System.Text.Json.Nodes;
using GridDrift.Outputs.Description;
using System.CommandLine;
using GridDrift.Operators.Climatology;
using GridDrift.Frames;
using GridDrift.Pipeline;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift climatology`: mean, standard deviation and count per cell and slot of the year.</summary>
public static class ClimatologyCommand
{
    public static Command Build(string[] commandLine)
    {
        var files = CommonOptions.Files();
        var variable = CommonOptions.Variable();
        var by = KeyOptions.For(ClimatologyKeys.By);
        var basePeriod = KeyOptions.For(ClimatologyKeys.Base);
        var smooth = KeyOptions.For(ClimatologyKeys.Smooth);
        var output = new Option<string>("--out") { Description = "climatology NetCDF to write", Required = true };
        var format = CommonOptions.Format();
        var deflate = CommonOptions.Deflate();
        var shuffle = CommonOptions.Shuffle();
        var units = CommonOptions.Units();
        var quiet = CommonOptions.Quiet();
        var period = CommonOptions.Period();
        var level = CommonOptions.Level();
        var at = CommonOptions.At();
        var json = CommandJson.Option();
        var command = new Command("climatology", "Climatological mean, standard deviation and sample count per cell and slot (CF Conventions §7.4).\n\n" +
            "Example:\n  griddrift climatology cf-samples/tcwv_synthetic_2031.nc --var tcwv --by month --out clim.nc")
        {
            files, variable, by, basePeriod, smooth, output, format, deflate, shuffle, units, quiet, json, period, level, at,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var kind = ClimatologyKinds.Parse(parse.GetValue(by)!)
                ?? throw new BadInputException(null, null, $"--by {parse.GetValue(by)}: choose month, day-of-year or hour-by-month");
            var options = new ClimatologyOptions(InputPaths.Expand(parse.GetValue(files)!), parse.GetValue(variable)!, kind, parse.GetValue(output)!,
                parse.GetValue(basePeriod), parse.GetValue(smooth), null, CommonOptions.CommandLine("climatology", commandLine)) with { Units = parse.GetValue(units) };
            options = options with { Selection = CommonOptions.SelectionOf(parse, period, level, at) };
            var summary = ProgressDisplay.Run(parse.InvocationConfiguration.Error, parse.GetValue(quiet), "frames", progress => CommonOptions.FormatOf(parse, format, deflate, shuffle).Write(options.Output, (path, variant) => ClimatologyStep.Run(options with { Output = path, Format = variant }, progress)));
            var err = parse.InvocationConfiguration.Error;
            foreach (var w in summary.Warnings) err.WriteLine($"griddrift climatology: warning: {w}");
            if (!parse.GetValue(quiet))
                err.WriteLine($"griddrift climatology: {Counted.Of(summary.FramesUsed, "frame")} of {summary.Base.ToIsoString()} into {Counted.Of(summary.Slots, "slot")}, written to {options.Output}");
            CommandJson.Print(parse, json, CommandJson.Summary("climatology", clock, [options.Output], new JsonObject
            {
                ["frames"] = summary.FramesUsed, ["slots"] = summary.Slots, ["empty_slots"] = summary.EmptySlots, ["base"] = summary.Base.ToIsoString(),
            }, summary.Warnings));
            return ExitCodes.Success;
        });
        return command;
    }
}
