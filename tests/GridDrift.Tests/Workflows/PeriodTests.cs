using System.Text.Json;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Workflows;

/// <summary>
/// `--period START/END` (and [input] period in recipes): only the frames from START (included)
/// to END (excluded) are read, in the record's own calendar, either end open. Witness: the times
/// cftime decodes from the same file and keeps in the same window
/// (Interop/scripts/period_times.py).
/// </summary>
public class PeriodTests
{
    static string[] ProductTimes(string path)
    {
        using var reader = DatasetFiles.Open(path);
        var time = reader.RequireVariable("time");
        var units = TimeUnits.Parse(time.Attributes.Text("units")!, CfCalendars.Parse(time.Attributes.Text("calendar"))!.Value);
        return reader.ReadAllDoubles(time).Select(v => units.Decode(v).ToIsoString()).ToArray();
    }

    [InteropTheory(Needs.PythonNetcdf)]
    [InlineData("2031-01-03", "2031-01-05")]
    [InlineData("2031-01-05T06:00", "..")]
    [InlineData("..", "2031-01-02")]
    public void Stats_reads_only_the_frames_inside_the_period(string start, string end)
    {
        using var dir = new TempFolder();
        string sample = SharedData.Sample("tcwv_synthetic_2031.nc");
        var expected = JsonSerializer.Deserialize<string[]>(ExternalTools.RunPython("period_times.py", sample, "time", start, end))!;
        Assert.NotEmpty(expected);
        var outcome = CliRun.Run("stats", sample, "--var", "tcwv", "--regions", "global", "--period", $"{start}/{end}", "--out", dir.File("s.nc"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        Assert.Equal(expected, ProductTimes(dir.File("s.nc")));
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void A_recipe_period_limits_every_step_and_a_shard_splits_only_the_period()
    {
        using var dir = new TempFolder();
        string sample = SharedData.Sample("tcwv_synthetic_2031.nc");
        var expected = JsonSerializer.Deserialize<string[]>(ExternalTools.RunPython("period_times.py", sample, "time", "2031-01-02", "2031-01-04"))!;
        File.WriteAllText(dir.File("recipe.toml"), $"[input]\nfiles = [\"{sample}\"]\nvariable = \"tcwv\"\nout = \"products\"\nperiod = \"2031-01-02/2031-01-04\"\n\n[stats]\n\n[similarity]\nrange = \"0:80\"\n");
        var run = CliRun.Run("run", dir.File("recipe.toml"), "--quiet");
        Assert.True(run.ExitCode == 0, run.Stderr);
        Assert.Equal(expected, ProductTimes(dir.File("products/stats.nc")));
        Assert.Equal(expected.Skip(1), ProductTimes(dir.File("products/similarity.nc")));
        foreach (var shard in new[] { "1/2", "2/2" }) Assert.Equal(0, CliRun.Run("run", dir.File("recipe.toml"), "--shard", shard, "--quiet").ExitCode);
        Assert.Equal(expected, new[] { "shard-01-of-02", "shard-02-of-02" }.SelectMany(s => ProductTimes(dir.File($"products/shards/{s}/stats.nc"))));
    }

    [Fact]
    public void A_period_outside_the_record_is_bad_input_and_a_malformed_one_a_usage_error()
    {
        using var dir = new TempFolder();
        string sample = SharedData.Sample("tcwv_synthetic_2031.nc");
        var outside = CliRun.Run("stats", sample, "--var", "tcwv", "--regions", "global", "--period", "2040/..", "--out", dir.File("s.nc"));
        Assert.Equal(2, outside.ExitCode);
        Assert.Contains("no frame of the record falls in --period 2040/..", Assert.Single(outside.StderrLines));
        var malformed = CliRun.Run("stats", sample, "--var", "tcwv", "--regions", "global", "--period", "2031-01-05", "--out", dir.File("s.nc"));
        Assert.Equal(1, malformed.ExitCode);
        Assert.Contains("--period", Assert.Single(malformed.StderrLines));
        File.WriteAllText(dir.File("recipe.toml"), $"[input]\nfiles = [\"{sample}\"]\nvariable = \"tcwv\"\nout = \"products\"\nperiod = \"2031-13/..\"\n\n[stats]\n");
        var recipe = CliRun.Run("run", dir.File("recipe.toml"));
        Assert.Equal(2, recipe.ExitCode);
        Assert.Contains("line 5: input.period", Assert.Single(recipe.StderrLines));
    }
}
