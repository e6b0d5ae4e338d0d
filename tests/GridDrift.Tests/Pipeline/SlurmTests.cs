using System.Diagnostics;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Pipeline;

/// <summary>
/// `griddrift submit` on a real one-node Slurm cluster (Debian's slurmctld/slurmd, brought up
/// by .ci/slurm/up): the demo recipe in four shards through array jobs chained with afterok
/// equals a one-machine run; a task killed on purpose is reported with its log and the stages
/// it blocked, and a second submission reruns only that shard and completes.
/// </summary>
public class SlurmTests
{
    static string Cli => Path.Combine(AppContext.BaseDirectory, "griddrift.dll");

    [Fact]
    public void A_dry_run_writes_chained_scripts_and_submits_nothing()
    {
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("in.nc"), frames: 20, stepHours: 24);
        File.WriteAllText(dir.File("r.toml"), "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"products\"\n\n[stats]\n\n[climatology]\n\n[anomalies]\n\n[events]\nseries = \"anomalies.nc\"\n");
        var outcome = CliRun.Run("submit", dir.File("r.toml"), "--shards", "3", "--scheduler", "slurm", "--dry-run", "--partition", "short", "--time", "00:30:00", "--mem", "4G", "--account", "clim01");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        var lines = outcome.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(4, lines.Length);
        Assert.StartsWith("JOB1=$(sbatch --parsable ", lines[0]);
        for (int k = 2; k <= 4; k++) Assert.Contains($"--dependency=afterok:$JOB{k - 1} --kill-on-invalid-dep=yes", lines[k - 1]);
        string jobs = dir.File("products/shards/slurm");
        var record = File.ReadAllText(Path.Combine(jobs, "1-record.sbatch"));
        foreach (var expected in new[] { "#SBATCH --array=1-3", "#SBATCH --partition=short", "#SBATCH --time=00:30:00", "#SBATCH --mem=4G", "#SBATCH --account=clim01", "--shard \"${SLURM_ARRAY_TASK_ID}/3\"" })
            Assert.Contains(expected, record);
        var finish = File.ReadAllText(Path.Combine(jobs, "4-finish.sbatch"));
        Assert.DoesNotContain("--array", finish);
        Assert.Contains(" gather ", finish);
        Assert.Contains("shard-03-of-03", finish);
        Assert.False(File.Exists(Path.Combine(jobs, "jobs.json")));
    }

    [Theory]
    [InlineData("out", "products\ntouch INJECTED")]
    [InlineData("--partition", "short\ntouch INJECTED")]
    [InlineData("--sbatch-option", "--qos=short\ntouch INJECTED")]
    public void A_line_break_never_reaches_a_batch_script(string where, string value)
    {
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("in.nc"), frames: 20, stepHours: 24);
        string outFolder = where == "out" ? value.Replace("\n", "\\n") : "products";
        File.WriteAllText(dir.File("r.toml"), $"[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"{outFolder}\"\n\n[stats]\n");
        string[] extra = where == "out" ? [] : [$"{where}={value}"]; // the documented form, --sbatch-option=--qos=short
        var outcome = CliRun.Run(["submit", dir.File("r.toml"), "--shards", "2", "--scheduler", "slurm", "--dry-run", .. extra]);
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("control character", Assert.Single(outcome.StderrLines));
        Assert.DoesNotContain(Directory.EnumerateFiles(dir.Path, "*.sbatch", SearchOption.AllDirectories), f => File.ReadAllText(f).Contains("INJECTED"));
    }

    [Fact]
    public void A_path_with_spaces_and_quotes_stays_one_word_in_the_scripts()
    {
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("in.nc"), frames: 20, stepHours: 24);
        File.WriteAllText(dir.File("r.toml"), "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"my products; it's\"\n\n[stats]\n");
        var outcome = CliRun.Run("submit", dir.File("r.toml"), "--shards", "2", "--scheduler", "slurm", "--dry-run");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        string script = Directory.EnumerateFiles(dir.Path, "1-record.sbatch", SearchOption.AllDirectories).Single();
        // bash's own parser (bash -n: read, do not run) accepts the script, and the #SBATCH output path is one double-quoted word
        Assert.Equal(0, ExternalTools.Run("bash", $"-n \"{script}\"").ExitCode);
        Assert.Contains("#SBATCH --output=\"", File.ReadAllText(script));
    }

    [InteropFact(Needs.Slurm | Needs.PythonNetcdf)]
    public void Four_shards_on_slurm_equal_a_one_machine_run_and_a_killed_task_is_reported()
    {
        using var dir = new TempFolder();
        Assert.Equal(0, CliRun.Run("demo", "--size", "small", "--out", dir.Path, "--quiet").ExitCode);
        string recipe = dir.File("cluster.toml");
        File.WriteAllText(recipe, File.ReadAllText(dir.File("recipe.toml")).Replace("out = \"products\"", "out = \"cluster\""));

        var run = Submit(recipe, killShard: null);
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        Assert.Equal(10, run.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Count(l => l.Contains("\tCOMPLETED\t")));
        ShardTests.AssertSameProducts(dir.File("products"), dir.File("cluster"));

        // the same chain with VIF (a slower record stage), killing shard 2 while it works
        string failing = dir.File("failing.toml");
        File.WriteAllText(failing, File.ReadAllText(recipe).Replace("out = \"cluster\"", "out = \"failing\"").Replace("metric = [\"ssim\", \"corr\", \"rmsd\"]", "metric = [\"ssim\", \"vif\", \"corr\", \"rmsd\"]"));
        var failed = Submit(failing, killShard: 2);
        Assert.Equal(4, failed.ExitCode);
        string log = dir.File("failing/shards/slurm/logs/record-2.log");
        Assert.Contains($"task 2 of record", failed.Stderr);
        Assert.Contains($"log: {log}; it blocked gather-record, departures, finish", failed.Stderr);
        Assert.True(File.Exists(log));
        Assert.Contains("finish: not run, because an earlier stage failed", failed.Stderr);
        Assert.Contains("record\t2/4\tFAILED", failed.Stdout);
        Assert.Empty(ExternalTools.Run("squeue", "-h -o %i", 30).Stdout.Trim());

        var again = Submit(failing, killShard: null);
        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        foreach (int shard in new[] { 1, 3, 4 })
            Assert.Contains("stats: up to date, skipped", File.ReadAllText(dir.File($"failing/shards/slurm/logs/record-{shard}.log")));
        Assert.Contains("stats: done", File.ReadAllText(dir.File("failing/shards/slurm/logs/record-2.log")));
        // the rerun shard replaced its partial products: the gathered products are those of a one-machine run of the same recipe
        string oneMachine = dir.File("failing-one.toml");
        File.WriteAllText(oneMachine, File.ReadAllText(failing).Replace("out = \"failing\"", "out = \"failing-one\""));
        var single = CliRun.Run("run", oneMachine, "--quiet");
        Assert.True(single.ExitCode == 0, single.Stderr);
        ShardTests.AssertSameProducts(dir.File("failing-one"), dir.File("failing"));
    }

    /// <summary>griddrift submit --wait as its own process; with <paramref name="killShard"/>, that shard's process is killed (SIGKILL) once it has worked half a second.</summary>
    static ExternalTools.Result Submit(string recipe, int? killShard)
    {
        var info = new ProcessStartInfo("dotnet") { UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { Cli, "submit", recipe, "--shards", "4", "--scheduler", "slurm", "--wait", "--mem", "2G" }) info.ArgumentList.Add(a);
        using var p = Process.Start(info)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (killShard is { } shard)
        {
            var clock = Stopwatch.StartNew();
            int? victim = null;
            while (victim is null && clock.Elapsed < TimeSpan.FromSeconds(120) && !p.HasExited)
            {
                victim = ProcessWith($"--shard\0{shard}/4");
                if (victim is null) Thread.Sleep(20);
            }
            Assert.True(victim is not null, $"shard {shard} never started");
            Thread.Sleep(500);
            Process.GetProcessById(victim.Value).Kill();
        }
        Assert.True(p.WaitForExit(TimeSpan.FromMinutes(5)), "griddrift submit --wait did not end in 5 minutes");
        return new ExternalTools.Result(p.ExitCode, stdout.Result, stderr.Result);
    }

    static int? ProcessWith(string arguments)
    {
        foreach (var d in Directory.EnumerateDirectories("/proc"))
        {
            if (!int.TryParse(Path.GetFileName(d), out int pid)) continue;
            try { if (File.ReadAllText(Path.Combine(d, "cmdline")).Contains(arguments, StringComparison.Ordinal)) return pid; }
            catch (IOException) { }
            catch (UnauthorizedAccessException) { }
        }
        return null;
    }
}
