using System.Text.Json.Nodes;
using GridDrift.Outputs.Description;
using System.CommandLine;
using GridDrift.Operators.Climatology;
using GridDrift.Frames;
using GridDrift.Pipeline;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift anomalies`: departures of every frame from a climatology, as fields and as region series.</summary>
public static class AnomaliesCommand
{
    public static Command Build(string[] commandLine)
    {
        var files = CommonOptions.Files();
        var variable = CommonOptions.Variable();
        var climatology = new Option<string>("--climatology") { Description = "a climatology made by griddrift climatology", Required = true };
        var kind = KeyOptions.For(AnomaliesKeys.Kind);
        var output = new Option<string>("--out") { Description = "anomaly field NetCDF to write", Required = true };
        var regions = CommonOptions.Regions();
        regions.Required = false;
        var table = new Option<string?>("--table") { Description = "with --regions: tidy Parquet table of the region-mean anomalies" };
        var series = new Option<string?>("--series") { Description = "with --regions: series NetCDF of the region-mean anomalies (default: OUT_series.nc)" };
        var minValid = KeyOptions.For(CommonKeys.MinValid);
        var format = CommonOptions.Format();
        var deflate = CommonOptions.Deflate();
        var shuffle = CommonOptions.Shuffle();
        var units = CommonOptions.Units();
        var quiet = CommonOptions.Quiet();
        var period = CommonOptions.Period();
        var level = CommonOptions.Level();
        var at = CommonOptions.At();
        var json = CommandJson.Option();
        var command = new Command("anomalies", "Anomalies of every frame from its climatology slot: absolute, relative or standardized, as fields and region series.\n\n" +
            "Example:\n  griddrift anomalies cf-samples/tcwv_synthetic_2031.nc --var tcwv --climatology clim.nc --out anom.nc --regions global bands:30 --table anom.parquet")
        {
            files, variable, climatology, kind, output, regions, table, series, minValid, format, deflate, shuffle, units, quiet, json, period, level, at,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var anomalyKind = Anomaly.Parse(parse.GetValue(kind)!)
                ?? throw new BadInputException(null, null, $"--kind {parse.GetValue(kind)}: choose absolute, relative or standardized");
            var regionSpecs = parse.GetValue(regions) ?? [];
            if (regionSpecs.Length == 0 && (parse.GetValue(table) is not null || parse.GetValue(series) is not null))
                throw new BadInputException(null, null, "--table and --series need --regions");
            var options = new AnomaliesOptions(InputPaths.Expand(parse.GetValue(files)!), parse.GetValue(variable)!, parse.GetValue(climatology)!, anomalyKind,
                parse.GetValue(output)!, regionSpecs, parse.GetValue(table), parse.GetValue(series), parse.GetValue(minValid),
                null, CommonOptions.CommandLine("anomalies", commandLine)) with { Units = parse.GetValue(units) };
            options = options with { Selection = CommonOptions.SelectionOf(parse, period, level, at) };
            var summary = ProgressDisplay.Run(parse.InvocationConfiguration.Error, parse.GetValue(quiet), "frames", progress => options.Output is null ? AnomaliesStep.Run(options, progress)
                : CommonOptions.FormatOf(parse, format, deflate, shuffle).Write(options.Output, (path, variant) => AnomaliesStep.Run(options with { Output = path, Format = variant, Series = options.Series ?? (options.Regions is { Count: > 0 } ? AnomaliesStep.DefaultSeriesPath(options.Output) : null) }, progress)));
            var err = parse.InvocationConfiguration.Error;
            foreach (var w in summary.Warnings) err.WriteLine($"griddrift anomalies: warning: {w}");
            if (!parse.GetValue(quiet))
                err.WriteLine($"griddrift anomalies: {Counted.Of(summary.Frames, "frame")} written to {options.Output}" +
                    (summary.Series is null ? "" : $"; region means to {summary.Series}") + (options.Table is null ? "" : $" and {options.Table}"));
            CommandJson.Print(parse, json, CommandJson.Summary("anomalies", clock, [options.Output, summary.Series, options.Table], new JsonObject
            {
                ["frames"] = summary.Frames, ["frames_without_slot"] = summary.FramesWithoutSlot,
            }, summary.Warnings));
            return ExitCodes.Success;
        });
        return command;
    }
}
