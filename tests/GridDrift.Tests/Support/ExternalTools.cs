using System.Diagnostics;

namespace GridDrift.Tests.Support;

/// <summary>
/// The outside references the interop tests call: netCDF-C's ncdump/ncgen and Debian's python3
/// with netCDF4, numpy, scipy. Found once per run; a missing tool makes its tests skip with a
/// message saying what to install — unless GRIDDRIFT_REQUIRE_INTEROP=1 (set by .ci/run), where
/// the tests run anyway and fail, so CI can never pass with interop checks silently skipped.
/// </summary>
public static class ExternalTools
{
    public const string Python = "/usr/bin/python3";

    static readonly Lazy<bool> HasNcdumpLazy = new(() => Runs("ncdump", "-h /dev/null", acceptAnyExit: true));
    static readonly Lazy<bool> HasNcgenLazy = new(() => Runs("ncgen", "-h", acceptAnyExit: true));
    static readonly Lazy<bool> HasPythonNetcdfLazy = new(() => Runs(Python, "-c \"import netCDF4, numpy\""));
    static readonly Lazy<bool> HasPythonScipyLazy = new(() => Runs(Python, "-c \"import scipy, numpy\""));
    static readonly Lazy<bool> HasPythonZarrLazy = new(() => Runs(Python, "-c \"import zarr, numcodecs.blosc, numpy\"") && GridDrift.Formats.Zarr.BloscLibrary.Available);
    static readonly Lazy<bool> HasPythonEccodesLazy = new(() => Runs(Python, "-c \"import eccodes, numpy\"") && GridDrift.Formats.Grib.Eccodes.Available);
    static readonly Lazy<bool> HasPythonStatsmodelsLazy = new(() => Runs(Python, "-c \"import statsmodels, scipy, numpy\""));
    // a cluster that answers, with a node that can take jobs
    static readonly Lazy<bool> HasSlurmLazy = new(() => Runs("sinfo", "-h -o %T") && Run("sinfo", "-h -o %T", 30).Stdout.Split('\n').Any(s => s.Trim() is "idle" or "mixed" or "allocated"));

    public static bool HasNcdump => HasNcdumpLazy.Value;
    public static bool HasNcgen => HasNcgenLazy.Value;
    public static bool HasPythonNetcdf => HasPythonNetcdfLazy.Value;
    public static bool HasPythonScipy => HasPythonScipyLazy.Value;
    public static bool HasPythonStatsmodels => HasPythonStatsmodelsLazy.Value;
    public static bool HasSlurm => HasSlurmLazy.Value;
    public static bool HasPythonZarr => HasPythonZarrLazy.Value;
    public static bool HasPythonEccodes => HasPythonEccodesLazy.Value;

    /// <summary>The checkout's folder of the Zarr v3 witness (zarrita, installed by npm ci there), or null when node or the packages are missing.</summary>
    public static string? ZarritaFolder => ZarritaFolderLazy.Value;

    static readonly Lazy<string?> ZarritaFolderLazy = new(() =>
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            string folder = Path.Combine(dir.FullName, "tests", "GridDrift.Tests", "Interop", "zarrita");
            if (Directory.Exists(Path.Combine(folder, "node_modules", "zarrita"))) return Runs("node", "--version") ? folder : null;
        }
        return null;
    });

    /// <summary>Runs a node script of the zarrita folder; fails the test on a non-zero exit.</summary>
    public static string RunNode(string script, params string[] arguments)
    {
        string folder = ZarritaFolder ?? throw new InvalidOperationException("node with zarrita is not installed (npm ci --prefix tests/GridDrift.Tests/Interop/zarrita)");
        var r = Run("node", $"\"{Path.Combine(folder, script)}\" " + string.Join(" ", arguments.Select(a => $"\"{a}\"")), workingDirectory: folder);
        if (r.ExitCode != 0) throw new InvalidOperationException($"{script} failed ({r.ExitCode}): {r.Stderr}");
        return r.Stdout;
    }

    public static bool InteropRequired => Environment.GetEnvironmentVariable("GRIDDRIFT_REQUIRE_INTEROP") == "1";

    static bool Runs(string file, string arguments, bool acceptAnyExit = false)
    {
        try
        {
            var r = Run(file, arguments, timeoutSeconds: 30);
            return acceptAnyExit || r.ExitCode == 0;
        }
        catch (System.ComponentModel.Win32Exception)
        {
            return false;
        }
    }

    public sealed record Result(int ExitCode, string Stdout, string Stderr);

    public static Result Run(string file, string arguments, int timeoutSeconds = 120, string? workingDirectory = null)
    {
        var info = new ProcessStartInfo(file, arguments)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
            WorkingDirectory = workingDirectory ?? Environment.CurrentDirectory,
        };
        // Debian's python3 must not see a virtual environment's or pyenv's settings.
        info.Environment.Remove("PYTHONPATH");
        info.Environment.Remove("PYTHONHOME");
        using var p = Process.Start(info)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeoutSeconds * 1000))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"{file} {arguments} ran over {timeoutSeconds} s");
        }
        return new Result(p.ExitCode, stdout.Result, stderr.Result);
    }

    /// <summary>Runs a script from Interop/scripts with Debian's python3; fails the test on a non-zero exit.</summary>
    public static string RunPython(string script, params string[] arguments)
    {
        string path = Path.Combine(AppContext.BaseDirectory, "scripts", script);
        var r = Run(Python, $"\"{path}\" " + string.Join(" ", arguments.Select(a => $"\"{a}\"")));
        if (r.ExitCode != 0) throw new InvalidOperationException($"{script} failed ({r.ExitCode}): {r.Stderr}");
        return r.Stdout;
    }

    /// <summary>Runs a script from Interop/scripts with the given text on its standard input.</summary>
    public static string RunPythonWithInput(string script, string input)
    {
        string path = Path.Combine(AppContext.BaseDirectory, "scripts", script);
        var info = new ProcessStartInfo(Python, $"\"{path}\"") { RedirectStandardInput = true, RedirectStandardOutput = true, RedirectStandardError = true };
        info.Environment.Remove("PYTHONPATH");
        using var p = Process.Start(info)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        p.StandardInput.Write(input);
        p.StandardInput.Close();
        p.WaitForExit();
        if (p.ExitCode != 0) throw new InvalidOperationException($"{script} failed ({p.ExitCode}): {stderr.Result}");
        return stdout.Result;
    }

    public static string RunNcgen(string cdl, string kind, string outputPath)
    {
        string cdlPath = outputPath + ".cdl";
        File.WriteAllText(cdlPath, cdl);
        var r = Run("ncgen", $"-k {kind} -o \"{outputPath}\" \"{cdlPath}\"");
        if (r.ExitCode != 0) throw new InvalidOperationException($"ncgen -k {kind} failed: {r.Stderr}");
        return outputPath;
    }
}
