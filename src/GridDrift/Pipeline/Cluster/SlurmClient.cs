using System.Diagnostics;
using System.Text.RegularExpressions;

namespace GridDrift.Pipeline.Cluster;

/// <summary>The state of one job, or one task of an array job, as `scontrol show job` reports it.</summary>
internal sealed record JobRecord(string JobId, string ArrayJobId, string? ArrayTaskId, string State, string Reason, string ExitCode, string? StdOut)
{
    static readonly HashSet<string> Ended = ["COMPLETED", "FAILED", "CANCELLED", "TIMEOUT", "OUT_OF_MEMORY", "NODE_FAIL", "PREEMPTED", "BOOT_FAIL", "DEADLINE", "SPECIAL_EXIT"];
    public bool HasEnded => Ended.Contains(State);
    public bool Succeeded => State == "COMPLETED";
}

/// <summary>
/// Slurm through its own commands: sbatch to submit, scontrol to follow. Accounting (sacct) is
/// not assumed: many clusters and test clusters run without it. `sbatch --wait` is not used
/// either, since it returns 0 for a job cancelled because its dependency can never be met.
/// </summary>
internal sealed partial class SlurmClient
{
    public static bool Available => Which("sbatch") is not null && Which("scontrol") is not null;

    /// <summary>Submits a script; returns the job id.</summary>
    public string Submit(string script, string? afterOk)
    {
        var args = new List<string> { "--parsable" };
        if (afterOk is not null)
        {
            args.Add($"--dependency=afterok:{afterOk}");
            // without it a job whose dependency failed stays pending for ever
            args.Add("--kill-on-invalid-dep=yes");
        }
        args.Add(script);
        var (code, output, error) = Execute("sbatch", args);
        if (code != 0) throw new BadInputException(script, null, $"sbatch refused the job: {error.Trim()}");
        return output.Trim().Split(';')[0];
    }

    /// <summary>Every record of a job (one per array task once the tasks are split), or none once Slurm has forgotten it.</summary>
    public IReadOnlyList<JobRecord> Show(string jobId)
    {
        var (code, output, _) = Execute("scontrol", ["show", "job", "--oneliner", jobId]);
        if (code != 0) return [];
        var records = new List<JobRecord>();
        foreach (var line in output.Split('\n', StringSplitOptions.RemoveEmptyEntries))
        {
            var fields = Field().Matches(line).ToDictionary(m => m.Groups[1].Value, m => m.Groups[2].Value);
            if (!fields.TryGetValue("JobId", out var id)) continue;
            records.Add(new JobRecord(id, fields.GetValueOrDefault("ArrayJobId", id), fields.GetValueOrDefault("ArrayTaskId"),
                fields.GetValueOrDefault("JobState", "UNKNOWN"), fields.GetValueOrDefault("Reason", ""), fields.GetValueOrDefault("ExitCode", ""), fields.GetValueOrDefault("StdOut")));
        }
        return records;
    }

    [GeneratedRegex(@"(?:^|\s)([A-Za-z][\w:/]*)=(\S*)")]
    private static partial Regex Field();

    static (int Code, string Output, string Error) Execute(string file, IEnumerable<string> args)
    {
        var info = new ProcessStartInfo(file) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in args) info.ArgumentList.Add(a);
        try
        {
            using var p = Process.Start(info)!;
            var output = p.StandardOutput.ReadToEndAsync();
            string error = p.StandardError.ReadToEnd();
            p.WaitForExit();
            return (p.ExitCode, output.Result, error);
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            throw new BadInputException(null, null, $"{file} cannot be run ({e.Message}): griddrift submit --scheduler slurm needs Slurm's client commands (Debian: apt-get install slurm-client)");
        }
    }

    static string? Which(string name) =>
        (Environment.GetEnvironmentVariable("PATH") ?? "").Split(':', StringSplitOptions.RemoveEmptyEntries).Select(d => Path.Combine(d, name)).FirstOrDefault(File.Exists);
}
