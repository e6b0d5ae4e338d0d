namespace GridDrift;

/// <summary>
/// What the environment may set for a whole process, read in one place: whether input checksums
/// and GRIB indexes are remembered and where, where netCDF-C's library is, and where fonts for
/// plots are. The command line takes <see cref="FromEnvironment"/>; a program using the library
/// may set <see cref="Current"/> itself.
/// </summary>
/// <param name="RememberChecksums">GRIDDRIFT_CHECKSUM_CACHE=off turns it off</param>
/// <param name="ChecksumFile">$XDG_CACHE_HOME/griddrift/sha256.tsv, else ~/.cache/griddrift/sha256.tsv</param>
/// <param name="NetCdfLibrary">GRIDDRIFT_LIBNETCDF: the netCDF-C library file where it is not on the loader's path</param>
/// <param name="FontFolder">GRIDDRIFT_FONT_DIR: a folder searched first for the plot fonts</param>
/// <param name="GribIndexFolder">$XDG_CACHE_HOME/griddrift/grib-index, else ~/.cache/griddrift/grib-index; GRIDDRIFT_GRIB_INDEX_CACHE=off makes it null</param>
public sealed record GridDriftSettings(bool RememberChecksums, string? ChecksumFile, string? NetCdfLibrary, string? FontFolder, string? GribIndexFolder)
{
    public static GridDriftSettings Current { get; set; } = FromEnvironment();

    public static GridDriftSettings FromEnvironment()
    {
        string? Variable(string name) => Environment.GetEnvironmentVariable(name) is { Length: > 0 } v ? v : null;
        string? root = Variable("XDG_CACHE_HOME");
        if (root is null && Environment.GetFolderPath(Environment.SpecialFolder.UserProfile) is { Length: > 0 } home) root = Path.Combine(home, ".cache");
        return new GridDriftSettings(
            !string.Equals(Variable("GRIDDRIFT_CHECKSUM_CACHE"), "off", StringComparison.OrdinalIgnoreCase),
            root is null ? null : Path.Combine(root, "griddrift", "sha256.tsv"),
            Variable("GRIDDRIFT_LIBNETCDF"),
            Variable("GRIDDRIFT_FONT_DIR"),
            root is null || string.Equals(Variable("GRIDDRIFT_GRIB_INDEX_CACHE"), "off", StringComparison.OrdinalIgnoreCase) ? null : Path.Combine(root, "griddrift", "grib-index"));
    }
}
