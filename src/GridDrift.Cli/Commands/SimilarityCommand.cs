using System.Text.Json.Nodes;
using GridDrift.Outputs.Description;
using System.CommandLine;
using GridDrift.Frames;
using GridDrift.Pipeline;
using GridDrift.Operators.Similarity;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift similarity`: how much the pattern reorganises between frames, per region.</summary>
public static class SimilarityCommand
{
    public static Command Build(string[] commandLine)
    {
        var files = new Argument<string[]>("FILE") { Description = "input NetCDF files or globs, one record split along time (or use --candidate)", Arity = ArgumentArity.ZeroOrMore };
        var referenceFiles = new Option<string[]>("--reference") { Description = "compare against this dataset (e.g. observations) at the times both hold, on the same grid", AllowMultipleArgumentsPerToken = true };
        var candidateFiles = new Option<string[]>("--candidate") { Description = "the dataset compared with --reference (e.g. regridded model output); instead of FILE", AllowMultipleArgumentsPerToken = true };
        var variable = CommonOptions.Variable();
        var regions = CommonOptions.Regions();
        var metric = KeyOptions.For(SimilarityKeys.Metric);
        var lag = KeyOptions.For(SimilarityKeys.Lag);
        var range = KeyOptions.For(SimilarityKeys.Range);
        var acrossGaps = KeyOptions.For(SimilarityKeys.AcrossGaps);
        var against = new Option<string?>("--against") { Description = "compare every frame with the one field in this file (same variable and grid), e.g. a climatology" };
        var minValid = KeyOptions.For(CommonKeys.MinValid);
        var output = new Option<string>("--out") { Description = "series NetCDF to write (time, region), time stamped with the later frame, time_bnds (earlier, later)", Required = true };
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
        var command = new Command("similarity", "Frame-to-frame structural similarity (SSIM, VIF), correlation, RMS difference and mean absolute change per region.\n\n" +
            "Example:\n  griddrift similarity cf-samples/tcwv_synthetic_2031.nc --var tcwv --regions global bands:30 --metric ssim,vif,corr,rmsd,mean-abs-change --out sim.nc --table sim.parquet\n" +
            "  griddrift similarity --reference obs.nc --candidate model_on_obs_grid.nc --var tcwv --regions global --metric bias,rmsd,corr,ssim --out compare.nc")
        {
            files, referenceFiles, candidateFiles, variable, regions, metric, lag, range, acrossGaps, against, minValid, output, table, radius, format, deflate, shuffle, units, quiet, json, period, level, at,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            SimilarityMetric[] metrics;
            try
            {
                metrics = SimilarityKeys.Metrics(parse.GetValue(metric)!);
            }
            catch (FormatException e)
            {
                throw new BadInputException(null, null, e.Message);
            }
            var reference = parse.GetValue(referenceFiles) ?? [];
            var candidate = parse.GetValue(candidateFiles) ?? [];
            var positional = parse.GetValue(files) ?? [];
            if (reference.Length > 0 && candidate.Length == 0 && positional.Length == 0) throw new BadInputException(null, null, "--reference needs --candidate (or FILE)");
            if (candidate.Length > 0 && reference.Length == 0) throw new BadInputException(null, null, "--candidate needs --reference");
            var inputs = candidate.Length > 0 ? candidate : positional;
            if (inputs.Length == 0) throw new BadInputException(null, null, "no input files: give FILE... or --reference and --candidate");
            var options = new SimilarityOptions(InputPaths.Expand(inputs), parse.GetValue(variable)!, parse.GetValue(regions)!, metrics,
                parse.GetValue(output)!, parse.GetValue(table), parse.GetValue(lag), parse.GetValue(range), parse.GetValue(acrossGaps), parse.GetValue(against),
                parse.GetValue(minValid), parse.GetValue(radius), null, CommonOptions.CommandLine("similarity", commandLine),
                Reference: reference.Length > 0 ? InputPaths.Expand(reference) : null, Units: parse.GetValue(units));
            options = options with { Selection = CommonOptions.SelectionOf(parse, period, level, at) };
            var summary = ProgressDisplay.Run(parse.InvocationConfiguration.Error, parse.GetValue(quiet), "pairs", progress => CommonOptions.FormatOf(parse, format, deflate, shuffle).Write(options.Output, (path, variant) => SimilarityStep.Run(options with { Output = path, Format = variant }, progress)));
            var error = parse.InvocationConfiguration.Error;
            foreach (var w in summary.Warnings) error.WriteLine($"griddrift similarity: warning: {w}");
            if (summary.CellsOutsideRange > 0)
                error.WriteLine($"griddrift similarity: warning: {summary.CellsOutsideRange} values lie outside the data range {summary.Range.Low}:{summary.Range.High} ({summary.Range.Source}); SSIM's constants assume they do not");
            if (!parse.GetValue(quiet))
            {
                error.WriteLine($"griddrift similarity: {Counted.Of(summary.Pairs, "pair")} × {Counted.Of(summary.Regions, "region")} written to {options.Output}" +
                                (options.Table is null ? "" : $" and {options.Table}") + $"; data range {summary.Range.Low}:{summary.Range.High} ({summary.Range.Source})");
                if (summary.Skipped.Count > 0)
                    error.WriteLine($"griddrift similarity: {Counted.Of(summary.Skipped.Count, "pair")} across gaps skipped (use --across-gaps to compare them): " +
                                    string.Join(", ", summary.Skipped.Take(5).Select(s => $"{s.Earlier.ToIsoString()}/{s.Later.ToIsoString()}")) + (summary.Skipped.Count > 5 ? ", …" : ""));
            }
            CommandJson.Print(parse, json, CommandJson.Summary("similarity", clock, [options.Output, options.Table], new JsonObject
            {
                ["pairs"] = summary.Pairs, ["regions"] = summary.Regions, ["pairs_skipped_across_gaps"] = summary.Skipped.Count,
                ["values_outside_range"] = summary.CellsOutsideRange,
            }, [.. summary.Warnings, .. summary.CellsOutsideRange > 0 ? [$"{summary.CellsOutsideRange} values lie outside the data range {summary.Range.Low}:{summary.Range.High}"] : Array.Empty<string>()]));
            return ExitCodes.Success;
        });
        return command;
    }
}
