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

    public static Option<string?> Format() => new("--format") { Description = "NetCDF output format: cdf2 (default), cdf5, or nc4 (compressed NetCDF-4 through netCDF-C's libnetcdf)" };

    public static Option<int> Deflate()
    {
        var option = new Option<int>("--deflate") { Description = "with --format nc4: zlib level 1 (fast) to 9 (small), 0 for none", DefaultValueFactory = _ => 1 };
        option.Validators.Add(r => { if (r.GetValueOrDefault<int>() is < 0 or > 9) r.AddError($"--deflate {r.GetValueOrDefault<int>()}: choose 1 (fast) to 9 (small), or 0 for none"); });
        return option;
    }

    public static Option<bool> Shuffle() => new("--shuffle") { Description = "with --format nc4: the byte shuffle filter before deflate (often smaller for float fields)" };

    /// <summary>--format nc4 with its --deflate and --shuffle, or null for the classic formats.</summary>
    public static GridDrift.Formats.Nc4.Nc4Options? Nc4(string? format, int deflate, bool shuffle)
    {
        if (!string.Equals(format, "nc4", StringComparison.OrdinalIgnoreCase)) return null;
        if (deflate is < 0 or > 9) throw new BadInputException(null, null, $"--deflate {deflate}: choose 1 (fast) to 9 (small), or 0 for none");
        if (!GridDrift.Formats.Nc4.Nc4Options.Available(out var why)) throw new BadInputException(null, null, "--format nc4: " + why);
        return new GridDrift.Formats.Nc4.Nc4Options(deflate, shuffle);
    }

    /// <summary>
    /// Runs a step that writes <paramref name="output"/>; for nc4 the step writes a hidden classic
    /// file beside it, which becomes the compressed NetCDF-4 product and is then removed.
    /// </summary>
    public static T WriteAs<T>(string output, GridDrift.Formats.Nc4.Nc4Options? nc4, Func<string, T> write)
    {
        if (nc4 is null) return write(output);
        string full = Path.GetFullPath(output);
        string classic = Path.Combine(Path.GetDirectoryName(full)!, "." + Path.GetFileName(full) + ".classic.part");
        try
        {
            var result = write(classic);
            GridDrift.Formats.Nc4.Nc4Converter.Convert(classic, full, nc4);
            return result;
        }
        finally
        {
            if (File.Exists(classic)) File.Delete(classic);
        }
    }

    public static Option<string?> Units() => new("--units") { Description = "deliver the variable in these units (UDUNITS-style, e.g. degC, g/kg, hPa)" };

    public static Option<bool> Quiet() => new("--quiet") { Description = "no progress or summary on stderr" };

    public static ClassicVariant? ParseFormat(string? text) => text?.ToLowerInvariant() switch
    {
        null => null,
        "cdf1" or "classic" => ClassicVariant.Cdf1,
        "cdf2" => ClassicVariant.Cdf2,
        "cdf5" => ClassicVariant.Cdf5,
        "nc4" => null, // written classic, then converted: see WriteAs
        _ => throw new BadInputException(null, null, $"--format {text}: choose cdf2, cdf5 or nc4"),
    };

    /// <summary>The command line as typed, for provenance.</summary>
    public static string CommandLine(string name, string[] args) => "griddrift " + string.Join(' ', args.Select(a => a.Contains(' ') ? $"'{a}'" : a));
}
