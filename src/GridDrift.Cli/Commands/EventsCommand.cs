using System.CommandLine;
using System.Globalization;
using GridDrift.Analysis;
using GridDrift.Pipeline;
using GridDrift.Workflows;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift events`: outlier events, windowed counts, trends and change points of series.</summary>
public static class EventsCommand
{
    public static Command Build(string[] commandLine)
    {
        var input = new Argument<string>("SERIES") { Description = "a series product: series NetCDF (time, region) or tidy Parquet table" };
        var quantity = new Option<string?>("--quantity") { Description = "the quantity to analyse (needed when the file holds several)" };
        var region = new Option<string[]>("--region") { Description = "region names to analyse (default: all)", AllowMultipleArgumentsPerToken = true };
        var detect = new Option<string>("--detect") { Description = "detectors: robust-z,hampel,iqr,seasonal-residual,gesd (default: all)", DefaultValueFactory = _ => "robust-z,hampel,iqr,seasonal-residual,gesd" }.ListOf(EventsStep.ParseDetector);
        var on = new Option<string>("--on") { Description = "raw: detect on the values; residuals: on the residuals of a seasonal model", DefaultValueFactory = _ => "raw" }.OneOf("raw", "residuals");
        var window = new Option<string>("--window") { Description = "moving window of the event counts, in days (e.g. 365d)", DefaultValueFactory = _ => "365d" }.Accepts(w => EventsStep.ParseWindowDays(w));
        var changepoints = new Option<string>("--changepoints") { Description = "pettitt, pelt (both PELT costs), pelt-mean, pelt-mean-variance", DefaultValueFactory = _ => "pettitt,pelt" }.ListOf(EventsStep.ParseChangeMethods);
        var consensus = new Option<int>("--consensus") { Description = "detectors that must agree for an event", DefaultValueFactory = _ => 2 }.Between(1, 5);
        var minSegment = new Option<int>("--min-segment") { Description = "PELT's shortest segment, in time steps", DefaultValueFactory = _ => 10 }.Between(2, int.MaxValue);
        var output = new Option<string>("--out") { Description = "flags table (Parquet); OUT_counts, OUT_trends and OUT_changepoints are written beside it", Required = true };
        var json = new Option<bool>("--json") { Description = "print a JSON summary (change points and trends) on stdout" };
        var plot = new Option<string?>("--plot") { Description = "folder for the PNG figures" };
        var quiet = CommonOptions.Quiet();
        var command = new Command("events", "Outlier events, their counts in a moving window and per year, Mann–Kendall/Sen trends and Pettitt/PELT change points of series.\n\n" +
            "Example:\n  griddrift events s.nc --quantity mean --out events.parquet --json")
        {
            input, quantity, region, detect, on, window, changepoints, consensus, minSegment, output, json, plot, quiet,
        };
        command.SetAction(parse =>
        {
            Detector[] detectors;
            ChangeMethod[] methods;
            try
            {
                detectors = parse.GetValue(detect)!.Split(',', StringSplitOptions.RemoveEmptyEntries).Select(EventsStep.ParseDetector).Distinct().ToArray();
                methods = parse.GetValue(changepoints)!.Split(',', StringSplitOptions.RemoveEmptyEntries).SelectMany(EventsStep.ParseChangeMethods).Distinct().ToArray();
            }
            catch (FormatException e)
            {
                throw new BadInputException(null, null, e.Message);
            }
            double windowDays = EventsStep.ParseWindowDays(parse.GetValue(window)!);
            bool residuals = parse.GetValue(on) switch
            {
                "raw" => false,
                "residuals" => true,
                var v => throw new BadInputException(null, null, $"--on {v}: choose raw or residuals"),
            };
            var analysis = new SeriesAnalysisOptions(detectors, methods, residuals, windowDays, parse.GetValue(consensus), parse.GetValue(minSegment));
            var summary = EventsStep.Run(new EventsOptions(parse.GetValue(input)!, parse.GetValue(output)!, parse.GetValue(quantity),
                parse.GetValue(region), analysis, CommonOptions.CommandLine("events", commandLine), parse.GetValue(plot)));
            if (parse.GetValue(json)) parse.InvocationConfiguration.Output.WriteLine(EventsStep.Serialize(summary.Json));
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine($"griddrift events: {summary.Series} series, {summary.Events} events, {summary.ChangePoints} change points; " +
                    $"tables {summary.FlagsTable}, {summary.CountsTable}, {summary.TrendsTable}, {summary.ChangePointsTable}");
            return ExitCodes.Success;
        });
        return command;
    }
}
