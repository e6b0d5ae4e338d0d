using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// The command line's own faults, as DESIGN.md numbers the exit codes: a usage error (unknown or
/// misspelled option, a value out of range or not in the list) is exit 1 with one line on stderr
/// and nothing on stdout, found while parsing — before any file is read or written.
/// </summary>
public class FrontDoorTests
{
    static CliRun.Outcome Stats(TempFolder dir, params string[] extra) =>
        CliRun.Run(["stats", SampleFiles.Record(dir.File("in.nc")), "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"), .. extra]);

    static void AssertUsage(CliRun.Outcome outcome, string expected, TempFolder? dir = null)
    {
        Assert.Equal(1, outcome.ExitCode);
        Assert.Equal("", outcome.Stdout);
        Assert.Single(outcome.StderrLines);
        Assert.Contains(expected, outcome.Stderr);
        if (dir is not null) Assert.False(File.Exists(dir.File("s.nc")));
    }

    [Fact]
    public void A_misspelled_option_is_named_with_the_nearest_known_one_not_taken_as_a_file()
    {
        using var dir = new TempFolder();
        AssertUsage(Stats(dir, "--min-vaild", "0.9"), "unknown option '--min-vaild' (did you mean --min-valid?)", dir);
    }

    [Fact]
    public void A_misspelled_required_option_prints_no_help()
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("stats", SampleFiles.Record(dir.File("in.nc")), "--varr", "tcwv", "--regions", "global", "--out", dir.File("s.nc"));
        AssertUsage(outcome, "did you mean --var?", dir);
    }

    [Theory]
    [InlineData("--min-valid", "1.5", "from 0 to 1")]
    [InlineData("--min-valid", "-0.1", "from 0 to 1")]
    [InlineData("--earth-radius", "-5", "positive")]
    [InlineData("--stat", "foo", "unknown statistic 'foo'")]
    [InlineData("--format", "nc4", "choose classic, 64-bit-offset, 64-bit-data or netcdf-4")]
    [InlineData("--deflate", "12", "choose 0 to 9")]
    public void Stats_values_out_of_range_are_usage_errors(string option, string value, string expected)
    {
        using var dir = new TempFolder();
        AssertUsage(Stats(dir, option, value), expected, dir);
    }

    [Fact]
    public void A_lag_of_zero_is_a_usage_error()
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("similarity", SampleFiles.Record(dir.File("in.nc")), "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"), "--lag", "0");
        AssertUsage(outcome, "--lag 0: must be at least 1", dir);
    }

    [Theory]
    [InlineData("--window", "abc")]
    [InlineData("--changepoints", "pelt-meanvar")]
    [InlineData("--consensus", "0")]
    public void Events_values_are_checked_while_parsing(string option, string value)
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("events", dir.File("no-such-series.nc"), "--out", dir.File("e.parquet"), option, value);
        AssertUsage(outcome, option + " " + value);
    }

    [Fact]
    public void An_option_value_that_begins_with_dashes_is_not_taken_for_an_option()
    {
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("in.nc"), frames: 10, stepHours: 24);
        File.WriteAllText(dir.File("r.toml"), "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\n\n[stats]\n");
        var outcome = CliRun.Run("submit", dir.File("r.toml"), "--shards", "2", "--scheduler", "slurm", "--dry-run", "--sbatch-option=--qos=short");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        Assert.Contains("#SBATCH --qos=short", File.ReadAllText(Directory.EnumerateFiles(dir.Path, "1-record.sbatch", SearchOption.AllDirectories).Single()));
    }

    [Fact]
    public void An_unknown_command_is_named_with_the_nearest_one()
    {
        AssertUsage(CliRun.Run("statz"), "did you mean stats?");
    }

    [Fact]
    public void The_netcdf4_format_is_honoured_by_stats()
    {
        using var dir = new TempFolder();
        if (!GridDrift.Formats.Nc4.Nc4Options.Available(out var why))
        {
            // without netCDF-C's library the format is refused with its package named, never silently replaced
            var refused = Stats(dir, "--format", "netcdf-4");
            Assert.Equal(2, refused.ExitCode);
            Assert.Contains("libnetcdf19", refused.Stderr);
            return;
        }
        var outcome = Stats(dir, "--format", "netcdf-4", "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        // HDF5's format signature (HDF5 File Format Specification, superblock): \x89HDF\r\n\x1a\n
        var head = File.ReadAllBytes(dir.File("s.nc")).AsSpan(0, 8).ToArray();
        Assert.Equal(new byte[] { 0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a }, head);
    }

    [Theory]
    [InlineData("kitten", "sitting", 3)] // the textbook example of edit distance (Levenshtein 1966)
    [InlineData("--varr", "--var", 1)]
    [InlineData("ab", "ba", 1)] // one swap of neighbours (optimal string alignment)
    public void Edit_distance_counts_single_changes(string a, string b, int expected) =>
        Assert.Equal(expected, GridDrift.Workflows.Options.NearestName.Distance(a, b));
}
