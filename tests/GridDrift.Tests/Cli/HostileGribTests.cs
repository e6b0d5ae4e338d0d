using System.Buffers.Binary;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// Hostile GRIB files (edits of the invented GRIB 2 sample) are bad input like a corrupt NetCDF
/// file: exit code 2 and one line naming the file and the fault, never an internal fault or
/// ecCodes' own messages on stderr (DESIGN.md). The edits follow the GRIB 2 layout of WMO-No. 306
/// (FM 92): section 0 ends with the message's length in octets 9-16; every other section starts
/// with its length (4 octets) and number; section 5 template 5.0 has bits per value at octet 20;
/// a message ends in "7777".
/// </summary>
public class HostileGribTests
{
    public static TheoryData<string, string> Faults() => new()
    {
        { "cut file", "claims" },
        { "damaged end marker", "'7777'" },
        { "edition 3", "edition 3" },
        { "duplicated message", "two messages" },
        { "section length beyond the message", "ecCodes:" },
        { "bits per value beyond the data", "ecCodes:" },
    };

    [InteropTheory(Needs.PythonEccodes)]
    [MemberData(nameof(Faults))]
    public void A_hostile_GRIB_file_is_refused_with_one_line(string fault, string saying)
    {
        using var dir = new TempFolder();
        var bytes = File.ReadAllBytes(SharedData.Sample("tcwv_synthetic_2031.grib2"));
        int first = checked((int)BinaryPrimitives.ReadUInt64BigEndian(bytes.AsSpan(8)));
        switch (fault)
        {
            case "cut file": bytes = bytes[..^1000]; break;
            case "damaged end marker": bytes[first - 1] = (byte)'6'; break;
            case "edition 3": bytes[7] = 3; break;
            case "duplicated message": bytes = [.. bytes, .. bytes[..first]]; break;
            case "section length beyond the message": BinaryPrimitives.WriteUInt32BigEndian(bytes.AsSpan(16), int.MaxValue); break;
            case "bits per value beyond the data": bytes[Section(bytes, 5) + 19] = 60; break;
        }
        string grib = dir.File("hostile.grib2");
        File.WriteAllBytes(grib, bytes);
        var outcome = CliRun.Run("stats", grib, "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.True(outcome.ExitCode == 2, $"{fault}: exit {outcome.ExitCode}: {outcome.Stderr}");
        var line = Assert.Single(outcome.StderrLines);
        Assert.StartsWith($"griddrift: {grib}", line);
        Assert.Contains(saying, line);
        Assert.DoesNotContain("   at ", outcome.Stderr);
        Assert.False(File.Exists(dir.File("s.nc")));
    }

    /// <summary>Where section <paramref name="number"/> of the first message starts.</summary>
    static int Section(byte[] message, int number)
    {
        for (int at = 16; ; at += checked((int)BinaryPrimitives.ReadUInt32BigEndian(message.AsSpan(at))))
            if (message[at + 4] == number) return at;
    }
}
