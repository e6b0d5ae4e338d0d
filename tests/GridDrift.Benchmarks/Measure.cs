using System.Diagnostics;

namespace GridDrift.Benchmarks;

internal static class Measure
{
    /// <summary>Peak resident memory of this process in MiB (VmHWM of /proc/self/status).</summary>
    public static double PeakResidentMiB()
    {
        foreach (var line in File.ReadLines("/proc/self/status"))
            if (line.StartsWith("VmHWM:", StringComparison.Ordinal))
                return double.Parse(line.Split([' ', '\t'], StringSplitOptions.RemoveEmptyEntries)[1]) / 1024;
        return double.NaN;
    }

    public static string Run(string file, string arguments, IReadOnlyDictionary<string, string>? environment = null)
    {
        var info = new ProcessStartInfo(file, arguments) { RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var (k, v) in environment ?? new Dictionary<string, string>()) info.Environment[k] = v;
        info.Environment.Remove("PYTHONPATH");
        using var p = Process.Start(info)!;
        string output = p.StandardOutput.ReadToEnd();
        string error = p.StandardError.ReadToEnd();
        p.WaitForExit();
        if (p.ExitCode != 0) throw new InvalidOperationException($"{file} {arguments} failed: {error}");
        return output.Trim();
    }

    /// <summary>Reads a file once so both readers start from the page cache.</summary>
    public static void Warm(string path)
    {
        using var s = File.OpenRead(path);
        var buffer = new byte[1 << 20];
        while (s.Read(buffer) > 0) { }
    }
}
