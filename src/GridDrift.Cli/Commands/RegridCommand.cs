using System.Text.Json.Nodes;
using GridDrift.Outputs.Description;
using System.CommandLine;
using GridDrift.Frames;
using GridDrift.Pipeline;
using GridDrift.Operators.Resampling;
using GridDrift.Workflows;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift regrid`: remap fields onto another grid.</summary>
public static class RegridCommand
{
    public static Command Build(string[] commandLine)
    {
        var files = CommonOptions.Files();
        var variable = CommonOptions.Variable();
        var to = new Option<string>("--to") { Description = "target grid: regular:D, regular:DLATxDLON, or a file whose grid is taken", Required = true };
        var method = new Option<string>("--method") { Description = "bilinear or conservative", DefaultValueFactory = _ => "conservative" }.OneOf("conservative", "bilinear");
        var output = new Option<string>("--out") { Description = "NetCDF to write", Required = true };
        var calendar = new Option<string?>("--calendar") { Description = "move a noleap or all_leap record onto the standard calendar by date (dates it lacks are dropped)" };
        var resample = new Option<string?>("--resample") { Description = "means of the remapped frames over PTnH (e.g. PT3H), daily or monthly periods, with time bounds" }.Accepts(r => PeriodMeans.Parse(r, out _));
        var weights = new Option<string?>("--weights") { Description = "weights file: read when it exists (and matches the grids), else written after building" };
        var format = CommonOptions.Format();
        var deflate = CommonOptions.Deflate();
        var shuffle = CommonOptions.Shuffle();
        var units = CommonOptions.Units();
        var quiet = CommonOptions.Quiet();
        var period = CommonOptions.Period();
        var level = CommonOptions.Level();
        var at = CommonOptions.At();
        var json = CommandJson.Option();
        var command = new Command("regrid", "Remap fields onto another latitude-longitude grid, conservatively (exact overlap areas) or bilinearly.\n\n" +
            "Example:\n  griddrift regrid cf-samples/tcwv_synthetic_2031.nc --var tcwv --to regular:10 --method conservative --out tcwv_10deg.nc")
        {
            files, variable, to, method, output, calendar, resample, weights, format, deflate, shuffle, units, quiet, json, period, level, at,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var options = new RegridOptions(InputPaths.Expand(parse.GetValue(files)!), parse.GetValue(variable)!, parse.GetValue(to)!, parse.GetValue(method)!,
                parse.GetValue(output)!, null, CommonOptions.CommandLine("regrid", commandLine), parse.GetValue(calendar), parse.GetValue(resample), parse.GetValue(weights)) with { Units = parse.GetValue(units) };
            options = options with { Selection = CommonOptions.SelectionOf(parse, period, level, at) };
            var summary = ProgressDisplay.Run(parse.InvocationConfiguration.Error, parse.GetValue(quiet), "frames", progress => CommonOptions.FormatOf(parse, format, deflate, shuffle).Write(options.Output, (path, variant) => RegridStep.Run(options with { Output = path, Format = variant }, progress)));
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine($"griddrift regrid: {Counted.Of(summary.Frames, "frame")} onto {summary.Target.Rows} × {summary.Target.Columns} ({Counted.Of(summary.Weights.Column.Length, "weight")}{(summary.WeightsReused ? ", read from " + options.Weights : "")}), {summary.Written} written to {options.Output}" + (summary.Dropped > 0 ? $"; {Counted.Of(summary.Dropped, "frame")} dropped (dates the target calendar lacks)" : ""));
            CommandJson.Print(parse, json, CommandJson.Summary("regrid", clock, [options.Output, summary.WeightsReused ? null : options.Weights], new JsonObject
            {
                ["frames"] = summary.Frames, ["written"] = summary.Written, ["dropped"] = summary.Dropped, ["weights"] = summary.Weights.Column.Length,
            }));
            return ExitCodes.Success;
        });
        return command;
    }
}
