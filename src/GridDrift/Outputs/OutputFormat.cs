using GridDrift.Formats.Classic;
using GridDrift.Formats.Nc4;

namespace GridDrift.Outputs;

/// <summary>
/// The NetCDF format of a product, named as the NetCDF standard names its formats: classic,
/// 64-bit offset (the default), 64-bit data, or netCDF-4 (compressed through netCDF-C, where its
/// library is installed). Every command that writes NetCDF takes one.
/// </summary>
public sealed record OutputFormat(ClassicVariant Classic, Nc4Options? NetCdf4 = null)
{
    public static readonly OutputFormat Default = new(ClassicVariant.Cdf2);

    /// <summary>The words of the --format option, in the order the help lists them.</summary>
    public static readonly string[] Names = ["classic", "64-bit-offset", "64-bit-data", "netcdf-4"];

    /// <summary>Checks a --format word; throws FormatException naming the choices.</summary>
    public static void Check(string name)
    {
        if (!Names.Contains(name.ToLowerInvariant())) throw new FormatException($"choose {string.Join(", ", Names[..^1])} or {Names[^1]}");
    }

    /// <summary>The format a --format word names, with netCDF-4's deflate level and shuffle; refuses netCDF-4 where netCDF-C's library is missing.</summary>
    public static OutputFormat Parse(string? name, int deflate = 1, bool shuffle = false)
    {
        switch (name?.ToLowerInvariant())
        {
            case null or "64-bit-offset": return Default;
            case "classic": return new(ClassicVariant.Cdf1);
            case "64-bit-data": return new(ClassicVariant.Cdf5);
            case "netcdf-4":
                if (!Nc4Options.Available(out var why)) throw new BadInputException(null, null, "--format netcdf-4: " + why);
                return new(ClassicVariant.Cdf2, new Nc4Options(deflate, shuffle));
            default:
                Check(name);
                return Default;
        }
    }

    /// <summary>
    /// Runs a step that writes <paramref name="output"/> in this format: the classic formats
    /// directly; netCDF-4 by writing a hidden classic file beside it, copied record by record
    /// into the compressed product (under a temporary name, renamed when complete) and removed.
    /// </summary>
    public T Write<T>(string output, Func<string, ClassicVariant, T> write)
    {
        if (NetCdf4 is null) return write(output, Classic);
        string full = Path.GetFullPath(output);
        string classic = Path.Combine(Path.GetDirectoryName(full)!, "." + Path.GetFileName(full) + ".classic.part");
        try
        {
            var result = write(classic, Classic);
            Nc4Converter.Convert(classic, full, NetCdf4);
            return result;
        }
        finally
        {
            if (File.Exists(classic)) File.Delete(classic);
        }
    }
}
