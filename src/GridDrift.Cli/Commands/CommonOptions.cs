using System.CommandLine;

namespace GridDrift.Cli.Commands;

/// <summary>Options several commands share, built fresh for each command.</summary>
internal static class CommonOptions
{
    public static Argument<string[]> Files() =>
        new("FILE") { Description = "input NetCDF files, globs or @LIST (a text file of paths, one a line): one record split along time, in any order; a file may hold one image with a scalar time coordinate", Arity = ArgumentArity.OneOrMore };

    public static Option<string> Variable() => new("--var") { Description = "the variable to analyse", Required = true };

    public static Option<string[]> Regions()
    {
        var option = new Option<string[]>("--regions")
        {
            Description = "regions: global, bands:STEP, tiles:DLATxDLON, box:NAME=SOUTH,NORTH,WEST,EAST (WEST > EAST crosses the date line), file:PATH.geojson; " +
                $"at most {GridDrift.Regions.RegionSpecs.MaxRegions} regions, and {GridDrift.Regions.GeoJsonRegions.MaxPositions} positions in a region file",
            Required = true,
            Arity = ArgumentArity.OneOrMore,
            AllowMultipleArgumentsPerToken = true,
        };
        // the specifications themselves are checked while parsing (exit 1); a region file's content is input (exit 2)
        option.Validators.Add(r =>
        {
            var specs = (r.GetValueOrDefault<string[]>() ?? []).SelectMany(s => s.Split(' ', StringSplitOptions.RemoveEmptyEntries)).Where(s => !s.StartsWith("file:", StringComparison.Ordinal));
            try { GridDrift.Regions.RegionSpecs.Parse(specs); }
            catch (FormatException e) { r.AddError("--regions: " + e.Message); }
        });
        return option;
    }

    public static Option<double> EarthRadius() => new Option<double>("--earth-radius")
    {
        Description = "sphere radius for cell areas, m (default: the IUGG mean Earth radius 6371008.8)",
        DefaultValueFactory = _ => GridDrift.Grids.Sphere.MeanEarthRadius,
    }.Positive();

    public static Option<string?> Format() => new Option<string?>("--format")
    {
        Description = "NetCDF format of the product: classic, 64-bit-offset (default), 64-bit-data, or netcdf-4 (compressed, through netCDF-C's libnetcdf)",
    }.Accepts(f => GridDrift.Outputs.OutputFormat.Check(f!));

    public static Option<int> Deflate() => new Option<int>("--deflate")
    {
        Description = "with --format netcdf-4: zlib level 1 (fast) to 9 (small), 0 for none",
        DefaultValueFactory = _ => 1,
    }.Between(0, 9);

    public static Option<bool> Shuffle() => new("--shuffle") { Description = "with --format netcdf-4: the byte shuffle filter before deflate (often smaller for float fields)" };

    /// <summary>The format the three options choose.</summary>
    public static GridDrift.Outputs.OutputFormat FormatOf(ParseResult parse, Option<string?> format, Option<int> deflate, Option<bool> shuffle) =>
        GridDrift.Outputs.OutputFormat.Parse(parse.GetValue(format), parse.GetValue(deflate), parse.GetValue(shuffle));

    public static Option<string?> Units() => new("--units") { Description = "deliver the variable in these units (UDUNITS-style, e.g. degC, g/kg, hPa)" };

    /// <summary>`--period START/END`: only the frames inside, START included, END excluded, in the record's calendar.</summary>
    public static Option<string?> Period() => new Option<string?>("--period")
    {
        Description = "read only the frames from START (included) to END (excluded), ISO 8601 in the record's calendar; either end may be .. (e.g. 2031-03/2031-06, 2031-03-01/..)",
    }.Accepts(v => { if (v is not null) GridDrift.Conventions.Time.RecordWindow.Parse(v); });

    /// <summary>`--level VALUE[UNITS]`: the level of the CF vertical coordinate, converted into its units.</summary>
    public static Option<string?> Level() => new Option<string?>("--level")
    {
        Description = "read the frames at this level of the vertical coordinate (axis Z, pressure or height units), e.g. 300hPa, 850, 2m; units are converted",
    }.Accepts(v => { if (v is not null) GridDrift.Frames.LevelValue.Parse(v); });

    /// <summary>`--at DIM=VALUE` or `--at DIM#INDEX`: any other non-horizontal dimension fixed.</summary>
    public static Option<string[]> At() => new Option<string[]>("--at")
    {
        Description = "fix another dimension (ensemble member, band): DIMENSION=VALUE on its coordinate, or DIMENSION#INDEX from 0; repeatable",
        AllowMultipleArgumentsPerToken = false,
    }.Accepts(v => { foreach (var a in v ?? []) GridDrift.Frames.DimensionPick.Parse(a); });

    public static GridDrift.Frames.FrameSelection SelectionOf(System.CommandLine.ParseResult parse, Option<string?> period, Option<string?> level, Option<string[]> at) =>
        GridDrift.Frames.FrameSelection.Of(parse.GetValue(period), parse.GetValue(level), parse.GetValue(at));

    public static Option<bool> Quiet() => new("--quiet") { Description = "no progress or summary on stderr" };

    /// <summary>The command line as typed, for provenance.</summary>
    /// <summary>The command as typed, quoted for a POSIX shell, so a product's <c>command</c> attribute runs as written.</summary>
    public static string CommandLine(string name, string[] args) => SelfName + " " + string.Join(' ', args.Select(GridDrift.Pipeline.Cluster.BatchStage.Quote));

    /// <summary>The name the tool is installed under (docs/install.md).</summary>
    public const string SelfName = "griddrift";
}
