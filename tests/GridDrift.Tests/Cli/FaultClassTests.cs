using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// Faults of the input or of the machine that must end as one line and exit 2 (DESIGN.md's exit
/// codes), never as an internal fault: a recipe nested deeper than the TOML reader allows, an
/// output path that cannot be created, a header whose counts overflow.
/// </summary>
public class FaultClassTests
{
    [Fact]
    public void A_recipe_nested_too_deep_is_bad_input()
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("deep.toml"), "[input]\nfiles = [\"x.nc\"]\nvariable = \"t\"\nregions = " + new string('[', 100) + new string(']', 100) + "\n");
        var outcome = CliRun.Run("run", dir.File("deep.toml"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("deep.toml", Assert.Single(outcome.StderrLines));
    }

    [Fact]
    public void An_output_that_cannot_be_created_is_one_line_and_exit_2()
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("a-file"), "not a folder");
        var outcome = CliRun.Run("stats", SampleFiles.Record(dir.File("in.nc")), "--var", "tcwv", "--regions", "global", "--out", dir.File("a-file/s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("cannot write", Assert.Single(outcome.StderrLines));
    }

    [Fact]
    public void A_header_whose_dimension_lengths_overflow_is_bad_input()
    {
        using var dir = new TempFolder();
        string path = SampleFiles.Record(dir.File("in.nc"), frames: 2, nlat: 3, nlon: 4);
        var bytes = File.ReadAllBytes(path);
        // the dimension list of a classic header (NetCDF Classic Format Specification): NC_DIMENSION, count, then name and length;
        // the length of "lat" (3) becomes 2^31 − 1, so lat × lon × 4 bytes no longer fits any file
        int at = FindLength(bytes, "lat", 3);
        System.Buffers.Binary.BinaryPrimitives.WriteInt32BigEndian(bytes.AsSpan(at), int.MaxValue);
        File.WriteAllBytes(path, bytes);
        var outcome = CliRun.Run("stats", path, "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Single(outcome.StderrLines);
    }

    /// <summary>The offset of the 4-byte length that follows the padded name <paramref name="name"/> in the dimension list.</summary>
    static int FindLength(byte[] bytes, string name, int length)
    {
        var pattern = new byte[4 + 4 + 4];
        System.Buffers.Binary.BinaryPrimitives.WriteInt32BigEndian(pattern, name.Length);
        System.Text.Encoding.ASCII.GetBytes(name).CopyTo(pattern, 4);
        System.Buffers.Binary.BinaryPrimitives.WriteInt32BigEndian(pattern.AsSpan(8), length);
        int at = bytes.AsSpan(0, 512).IndexOf(pattern);
        Assert.True(at > 0, "the dimension was not found in the header");
        return at + 8;
    }
}
