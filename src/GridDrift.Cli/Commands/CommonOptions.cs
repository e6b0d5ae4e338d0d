using System.CommandLine;
using GridDrift.Formats.Classic;

namespace GridDrift.Cli.Commands;

/// <summary>Options several commands share, built fresh for each command.</summary>
internal static class CommonOptions
{
    public static Argument<string[]> Files() =>
        new("FILE") { Description = "input NetCDF files or globs, one record split along time", Arity = ArgumentArity.OneOrMore };

    public static Option<string> Variable() => new("--var") { Description = "the variable to analyse", Required = true };

    public static Option<string[]> Regions() => new("--regions")
    {
        Description = "regions: global, bands:STEP, tiles:DLATxDLON, box:NAME=SOUTH,NORTH,WEST,EAST (WEST > EAST crosses the date line), file:PATH.geojson",
        Required = true,
        Arity = ArgumentArity.OneOrMore,
        AllowMultipleArgumentsPerToken = true,
    };

    public static Option<double> EarthRadius() => new("--earth-radius")
    {
        Description = "sphere radius for cell areas, m (default: the IUGG mean Earth radius 6371008.8)",
        DefaultValueFactory = _ => GridDrift.Grids.Sphere.MeanEarthRadius,
    };

    public static Option<string?> Format() => new("--format") { Description = "NetCDF output format: cdf2 (default) or cdf5" };

    public static Option<string?> Units() => new("--units") { Description = "deliver the variable in these units (UDUNITS-style, e.g. degC, g/kg, hPa)" };

    public static Option<bool> Quiet() => new("--quiet") { Description = "no progress or summary on stderr" };

    public static ClassicVariant? ParseFormat(string? text) => text?.ToLowerInvariant() switch
    {
        null => null,
        "cdf1" or "classic" => ClassicVariant.Cdf1,
        "cdf2" => ClassicVariant.Cdf2,
        "cdf5" => ClassicVariant.Cdf5,
        "nc4" => throw new BadInputException(null, null, "--format nc4 (compressed netCDF-4 output) is not available yet; use cdf2 or cdf5"),
        _ => throw new BadInputException(null, null, $"--format {text}: choose cdf2 or cdf5"),
    };

    /// <summary>The command line as typed, for provenance.</summary>
    public static string CommandLine(string name, string[] args) => "griddrift " + string.Join(' ', args.Select(a => a.Contains(' ') ? $"'{a}'" : a));
}
