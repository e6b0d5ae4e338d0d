using System.Text.Json.Nodes;
using GridDrift.Grids;
using GridDrift.Outputs.Description;
using System.CommandLine;
using GridDrift.Pipeline;
using GridDrift.Workflows;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift regions --grid FILE --regions SPEC... --out mask.nc [--png map.png]`.</summary>
public static class RegionsCommand
{
    public static Command Build(string[] commandLine)
    {
        var grid = new Option<string>("--grid") { Description = "a NetCDF file whose grid the regions are built on", Required = true };
        var regions = CommonOptions.Regions();
        var output = new Option<string>("--out") { Description = "mask NetCDF to write", Required = true };
        var png = new Option<string?>("--png") { Description = "PNG map of the regions to draw" };
        var variable = new Option<string?>("--var") { Description = "the variable whose grid to use (default: the first gridded one)" };
        var radius = CommonOptions.EarthRadius();
        var format = CommonOptions.Format();
        var deflate = CommonOptions.Deflate();
        var shuffle = CommonOptions.Shuffle();
        var quiet = CommonOptions.Quiet();
        var json = CommandJson.Option();
        var command = new Command("regions", "Build region masks once for a grid (exact fractional cover of cut cells) and write them as a CF mask file, with a PNG map.\n\n" +
            "Example:\n  griddrift regions --grid cf-samples/tcwv_synthetic_2031.nc --regions global bands:30 box:tropical_pacific=-15,15,150,-90 --out mask.nc --png mask.png")
        {
            grid, regions, output, png, variable, radius, format, deflate, shuffle, quiet, json,
        };
        command.SetAction(parse =>
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var options = new RegionsOptions(parse.GetValue(grid)!, parse.GetValue(regions)!, parse.GetValue(output)!, parse.GetValue(png),
                parse.GetValue(variable), parse.GetValue(radius), null, CommonOptions.CommandLine("regions", commandLine));
            var (g, mask) = CommonOptions.FormatOf(parse, format, deflate, shuffle).Write(options.Output, (path, variant) => RegionsStep.Run(options with { Output = path, Format = variant }));
            if (!parse.GetValue(quiet))
                parse.InvocationConfiguration.Error.WriteLine($"griddrift regions: {Counted.Of(mask.Count, "region")} on a {g.Rows} × {g.Columns} {g.Kind.Words()} grid, {Counted.Of(mask.EntryCount, "cell entry", "cell entries")}, written to {options.Output}");
            CommandJson.Print(parse, json, CommandJson.Summary("regions", clock, [options.Output, options.Png], new JsonObject
            {
                ["regions"] = mask.Count, ["cell_entries"] = mask.EntryCount, ["grid"] = $"{g.Kind.Words()}, {g.Rows} × {g.Columns}",
            }));
            return ExitCodes.Success;
        });
        return command;
    }
}
