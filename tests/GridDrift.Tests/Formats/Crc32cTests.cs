using GridDrift.Formats.Zarr;

namespace GridDrift.Tests.Formats;

/// <summary>CRC-32C, which Zarr v3's crc32c codec appends, against the check values of RFC 3720 §B.4 (iSCSI).</summary>
public class Crc32cTests
{
    [Fact]
    public void The_checksum_matches_the_RFC_3720_examples()
    {
        Assert.Equal(0x8A9136AAu, Crc32c.Of(new byte[32]));
        Assert.Equal(0x62A8AB43u, Crc32c.Of(Enumerable.Repeat((byte)0xFF, 32).ToArray()));
        Assert.Equal(0x46DD794Eu, Crc32c.Of(Enumerable.Range(0, 32).Select(i => (byte)i).ToArray()));
        Assert.Equal(0x113FDB5Cu, Crc32c.Of(Enumerable.Range(0, 32).Select(i => (byte)(31 - i)).ToArray()));
    }
}
