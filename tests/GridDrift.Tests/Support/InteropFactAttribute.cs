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

    internal static string? Missing(Needs needs)
    {
        var missing = new List<string>();
        if (needs.HasFlag(Needs.Ncdump) && !ExternalTools.HasNcdump) missing.Add("ncdump (apt-get install netcdf-bin)");
        if (needs.HasFlag(Needs.Ncgen) && !ExternalTools.HasNcgen) missing.Add("ncgen (apt-get install netcdf-bin)");
        if (needs.HasFlag(Needs.PythonNetcdf) && !ExternalTools.HasPythonNetcdf) missing.Add("python netCDF4 (apt-get install python3-netcdf4 python3-numpy)");
        if (needs.HasFlag(Needs.PythonScipy) && !ExternalTools.HasPythonScipy) missing.Add("scipy (apt-get install python3-scipy)");
        if (needs.HasFlag(Needs.PythonStatsmodels) && !ExternalTools.HasPythonStatsmodels) missing.Add("statsmodels (apt-get install python3-statsmodels)");
        if (needs.HasFlag(Needs.Slurm) && !ExternalTools.HasSlurm) missing.Add("a running Slurm cluster (as root: bash .ci/slurm/up, after apt-get install slurmctld slurmd slurm-client munge)");
        if (needs.HasFlag(Needs.SharedData) && SharedData.Root is null) missing.Add("the ../shared folder beside the checkout");
        if (needs.HasFlag(Needs.Fonts) && !HasFont()) missing.Add("a TrueType font for plot labels (apt-get install fonts-dejavu-core)");
        return missing.Count == 0 ? null : "skipped: needs " + string.Join(", ", missing);
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
