using System.Text.Json.Nodes;
using System.CommandLine;
using System.Globalization;
using GridDrift.Analysis;
using GridDrift.Pipeline;
using GridDrift.Workflows;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift events`: outlier events, windowed counts, trends and change points of series.</summary>
public static class EventsCommand
{
    public static Command Build(string[] commandLine)
    {
        var input = new Argument<string>("SERIES") { Description = "a series product: series NetCDF (time, region) or tidy Parquet table" };
        var quantity = KeyOptions.For(CommonKeys.Quantity);
        var region = new Option<string[]>("--region") { Description = "region names to analyse (default: all)", AllowMultipleArgumentsPerToken = true };
        var detect = KeyOptions.For(EventsKeys.Detect);
        var on = KeyOptions.For(EventsKeys.On);
        var window = KeyOptions.For(EventsKeys.Window);
        var changepoints = KeyOptions.For(EventsKeys.Changepoints);
        var consensus = KeyOptions.For(EventsKeys.Consensus);
        var minSegment = KeyOptions.For(EventsKeys.MinSegment);
        var output = new Option<string>("--out") { Description = "flags table (Parquet); OUT_counts, OUT_trends and OUT_changepoints are written beside it", Required = true };
        var json = CommandJson.Option();
        var plot = KeyOptions.For(CommonKeys.Plot);
        var quiet = CommonOptions.Quiet();
        var command = new Command("events", "Outlier events, their counts in a moving window and per year, Mann–Kendall/Sen trends, Pettitt/PELT change points and event-rate changes of series, calibrated for persistence and judged by q-values.\n\n" +
            "Example:\n  griddrift events s.nc --quantity mean --out events.parquet --json")
        {
            input, quantity, region, detect, on, window, changepoints, consensus, minSegment, output, json, plot, quiet,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var analysis = EventsAnalysis.From(parse.GetValue(detect)!, parse.GetValue(on)!, parse.GetValue(window)!, parse.GetValue(changepoints)!,
                parse.GetValue(consensus), parse.GetValue(minSegment));
            var summary = EventsStep.Run(new EventsOptions(parse.GetValue(input)!, parse.GetValue(output)!, parse.GetValue(quantity),
                parse.GetValue(region), analysis, CommonOptions.CommandLine("events", commandLine), parse.GetValue(plot)));
            // the summary's keys join the analysis's own JSON (change points, trends), which stays as it was
            CommandJson.Print(parse, json, CommandJson.Summary("events", clock, [summary.FlagsTable, summary.CountsTable, summary.TrendsTable, summary.ChangePointsTable],
                new JsonObject { ["series"] = summary.Series, ["events"] = summary.Events, ["change_points"] = summary.ChangePoints, ["changes_at_q_0_05"] = summary.SignificantChanges }, into: summary.Json));
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine($"griddrift events: {summary.Series} series, {summary.Events} events, {summary.ChangePoints} candidate changes of which {summary.SignificantChanges} at q < 0.05; " +
                    $"tables {summary.FlagsTable}, {summary.CountsTable}, {summary.TrendsTable}, {summary.ChangePointsTable}");
            return ExitCodes.Success;
        });
        return command;
    }
}
