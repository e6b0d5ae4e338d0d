using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// Bad input never crashes: one line on stderr naming the file and the fault, exit code 2
/// (DESIGN.md), never a stack trace, never a hang.
/// </summary>
public class BadInputTests
{
    static void AssertRefused(CliRun.Outcome outcome, string path, string fault)
    {
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.StartsWith($"griddrift: {path}: ", line);
        Assert.Contains(fault, line);
        Assert.DoesNotContain("   at ", outcome.Stderr);
        Assert.Equal("", outcome.Stdout);
    }

    [InteropFact(Needs.SharedData)]
    public void The_corrupt_CDF5_header_of_the_reference_suite_is_refused()
    {
        // netCDF-C 4.9 refuses it too ("NetCDF: Unknown file format"): its variable's data would start inside the header / past the end.
        string path = SharedData.Interop("bad_cdf5_begin.nc");
        var outcome = CliRun.Run("describe", path);
        AssertRefused(outcome, path, "var_big");
    }

    [Fact]
    public void A_truncated_file_is_refused()
    {
        using var dir = new TempFolder();
        string path = SampleFiles.Record(dir.File("cut.nc"), frames: 6);
        var bytes = File.ReadAllBytes(path);
        File.WriteAllBytes(path, bytes[..^30]);
        AssertRefused(CliRun.Run("describe", path), path, "truncated");
    }

    [Fact]
    public void A_file_cut_inside_its_header_is_refused()
    {
        using var dir = new TempFolder();
        string path = SampleFiles.Record(dir.File("cut.nc"));
        File.WriteAllBytes(path, File.ReadAllBytes(path)[..60]);
        AssertRefused(CliRun.Run("describe", path), path, "header");
    }

    [Fact]
    public void An_empty_file_is_refused()
    {
        using var dir = new TempFolder();
        string path = dir.File("empty.nc");
        File.WriteAllBytes(path, []);
        AssertRefused(CliRun.Run("describe", path), path, "empty");
    }

    [Theory]
    [InlineData(7)]
    [InlineData(4096)]
    public void Random_bytes_are_refused(int length)
    {
        using var dir = new TempFolder();
        string path = dir.File("noise.nc");
        var bytes = new byte[length];
        new Random(length).NextBytes(bytes);
        File.WriteAllBytes(path, bytes);
        AssertRefused(CliRun.Run("describe", path), path, "not a NetCDF, GRIB or Zarr dataset");
    }

    [Theory]
    [InlineData(new byte[] { (byte)'C', (byte)'D', (byte)'F', 1 })]
    [InlineData(new byte[] { (byte)'C', (byte)'D', (byte)'F', 5 })]
    [InlineData(new byte[] { 0x89, (byte)'H', (byte)'D', (byte)'F', (byte)'\r', (byte)'\n', 0x1A, (byte)'\n' })]
    public void A_valid_signature_followed_by_noise_is_refused(byte[] magic)
    {
        using var dir = new TempFolder();
        string path = dir.File("noise.nc");
        var bytes = new byte[2048];
        new Random(magic.Length).NextBytes(bytes);
        magic.CopyTo(bytes, 0);
        File.WriteAllBytes(path, bytes);
        var outcome = CliRun.Run("describe", path);
        Assert.Equal(2, outcome.ExitCode);
        Assert.StartsWith($"griddrift: {path}: ", Assert.Single(outcome.StderrLines));
    }

    [Fact]
    public void A_directory_is_refused()
    {
        using var dir = new TempFolder();
        AssertRefused(CliRun.Run("describe", dir.Path), dir.Path, "is a directory");
    }

    [Fact]
    public void A_missing_path_is_refused()
    {
        using var dir = new TempFolder();
        string path = dir.File("absent.nc");
        AssertRefused(CliRun.Run("describe", path), path, "no such file");
    }

    [Fact]
    public void A_missing_option_value_is_a_usage_error()
    {
        var outcome = CliRun.Run("describe");
        Assert.Equal(1, outcome.ExitCode);
    }
}
