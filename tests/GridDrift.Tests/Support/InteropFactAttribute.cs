namespace GridDrift.Tests.Support;

/// <summary>Which outside reference a test needs.</summary>
[Flags]
public enum Needs
{
    None = 0,
    Ncdump = 1,
    Ncgen = 2,
    PythonNetcdf = 4,
    PythonScipy = 8,
    SharedData = 16,
    Fonts = 32,
    PythonStatsmodels = 64,
    Slurm = 128,
    PythonZarr = 256,
    NodeZarrita = 512,
    PythonEccodes = 1024,
}

/// <summary>
/// A fact that needs outside tools or ../shared: skipped, with the reason and the package to
/// install, when they are absent, except under GRIDDRIFT_REQUIRE_INTEROP=1 (CI), where it runs.
/// </summary>
public sealed class InteropFactAttribute : FactAttribute
{
    public InteropFactAttribute(Needs needs)
    {
        if (Missing(needs) is { } reason && !ExternalTools.InteropRequired) Skip = reason;
    }

    /// <summary>What each need is, and the one command that provides it.</summary>
    internal static readonly IReadOnlyDictionary<Needs, string> Remedies = new Dictionary<Needs, string>
    {
        [Needs.Ncdump] = "ncdump (apt-get install netcdf-bin)",
        [Needs.Ncgen] = "ncgen (apt-get install netcdf-bin)",
        [Needs.PythonNetcdf] = "python netCDF4 (apt-get install python3-netcdf4 python3-numpy)",
        [Needs.PythonScipy] = "scipy (apt-get install python3-scipy)",
        [Needs.PythonStatsmodels] = "statsmodels (apt-get install python3-statsmodels)",
        [Needs.Slurm] = "a running Slurm cluster (as root: bash .ci/slurm/up, after apt-get install slurmctld slurmd slurm-client munge)",
        [Needs.SharedData] = "the shared test files of the project (its shared/ folder, placed beside the checkout as ../shared, or: export GRIDDRIFT_SHARED=/path/to/shared)",
        [Needs.Fonts] = "a TrueType font for plot labels (apt-get install fonts-dejavu-core)",
        [Needs.PythonEccodes] = "ecCodes with its python bindings (apt-get install libeccodes0 libeccodes-data python3-eccodes)",
        [Needs.NodeZarrita] = "node with zarrita (npm ci --prefix tests/GridDrift.Tests/Interop/zarrita)",
        [Needs.PythonZarr] = "python3-zarr with blosc (apt-get install python3-zarr python3-numcodecs libblosc1)",
    };

    internal static string? Missing(Needs needs)
    {
        var absent = new List<Needs>();
        if (needs.HasFlag(Needs.Ncdump) && !ExternalTools.HasNcdump) absent.Add(Needs.Ncdump);
        if (needs.HasFlag(Needs.Ncgen) && !ExternalTools.HasNcgen) absent.Add(Needs.Ncgen);
        if (needs.HasFlag(Needs.PythonNetcdf) && !ExternalTools.HasPythonNetcdf) absent.Add(Needs.PythonNetcdf);
        if (needs.HasFlag(Needs.PythonScipy) && !ExternalTools.HasPythonScipy) absent.Add(Needs.PythonScipy);
        if (needs.HasFlag(Needs.PythonStatsmodels) && !ExternalTools.HasPythonStatsmodels) absent.Add(Needs.PythonStatsmodels);
        if (needs.HasFlag(Needs.Slurm) && !ExternalTools.HasSlurm) absent.Add(Needs.Slurm);
        if (needs.HasFlag(Needs.PythonZarr) && !ExternalTools.HasPythonZarr) absent.Add(Needs.PythonZarr);
        if (needs.HasFlag(Needs.NodeZarrita) && ExternalTools.ZarritaFolder is null) absent.Add(Needs.NodeZarrita);
        if (needs.HasFlag(Needs.PythonEccodes) && !ExternalTools.HasPythonEccodes) absent.Add(Needs.PythonEccodes);
        if (needs.HasFlag(Needs.SharedData) && SharedData.Root is null) absent.Add(Needs.SharedData);
        if (needs.HasFlag(Needs.Fonts) && !HasFont()) absent.Add(Needs.Fonts);
        return absent.Count == 0 ? null : "skipped: needs " + string.Join(", ", absent.Select(n => Remedies[n]));
    }

    static bool HasFont()
    {
        try
        {
            GridDrift.Outputs.Plots.PlotFonts.Ensure();
            return true;
        }
        catch (GridDrift.BadInputException)
        {
            return false;
        }
    }
}

/// <summary>The theory form of <see cref="InteropFactAttribute"/>.</summary>
public sealed class InteropTheoryAttribute : TheoryAttribute
{
    public InteropTheoryAttribute(Needs needs)
    {
        if (InteropFactAttribute.Missing(needs) is { } reason && !ExternalTools.InteropRequired) Skip = reason;
    }
}
