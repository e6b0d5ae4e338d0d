using GridDrift.Outputs;
using GridDrift.Tests.Support;
using GridDrift.Formats;

namespace GridDrift.Tests.Outputs;

public class ChecksumCacheTests
{
    // FIPS 180-2, appendix B.1: SHA-256("abc")
    const string Abc = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";

    /// <summary>Runs <paramref name="body"/> with the checksum cache in DIR/cache, then puts the settings back.</summary>
    static void WithCacheIn(TempFolder dir, Action body)
    {
        var previous = GridDriftSettings.Current;
        try
        {
            GridDriftSettings.Current = previous with { RememberChecksums = true, ChecksumFile = Path.Combine(dir.File("cache"), "griddrift", "sha256.tsv") };
            body();
        }
        finally
        {
            GridDriftSettings.Current = previous;
        }
    }

    [Fact]
    public void A_remembered_checksum_is_used_only_while_the_file_is_unchanged()
    {
        using var dir = new TempFolder();
        WithCacheIn(dir, () =>
        {
            string path = dir.File("input.nc");
            File.WriteAllText(path, "abc");
            Assert.Equal(Abc, ChecksumCache.Sha256(path));
            Assert.True(File.Exists(dir.File("cache/griddrift/sha256.tsv")), "the checksum is remembered");
            Assert.Equal(Abc, ChecksumCache.Sha256(path));

            // same size, new content and a later write time: the remembered value must not be used
            File.WriteAllText(path, "abd");
            File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddMinutes(1));
            string fresh = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData("abd"u8));
            Assert.Equal(fresh, ChecksumCache.Sha256(path));
        });
    }

    /// <summary>
    /// What <c>cp -p</c> does: new contents of the same length under the old write time. On Linux
    /// the change time moves with any write and cannot be set back, so the remembered checksum is
    /// not used.
    /// </summary>
    [Fact]
    public void New_contents_under_the_old_length_and_write_time_are_hashed_anew()
    {
        if (!OperatingSystem.IsLinux()) return; // elsewhere the stamp is length and write time only, as documented
        using var dir = new TempFolder();
        WithCacheIn(dir, () =>
        {
            string path = dir.File("input.nc");
            File.WriteAllText(path, "abc");
            var written = File.GetLastWriteTimeUtc(path);
            Assert.Equal(Abc, ChecksumCache.Sha256(path));
            Thread.Sleep(50); // file times advance by the kernel's clock tick (a few ms): a write in the same tick would not show
            File.WriteAllText(path, "abd");
            File.SetLastWriteTimeUtc(path, written);
            Assert.Equal(written, File.GetLastWriteTimeUtc(path));
            Assert.Equal(Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData("abd"u8)), ChecksumCache.Sha256(path));
        });
    }

    [Fact]
    public void A_file_longer_than_one_hashing_window_and_an_empty_file_hash_as_their_whole_bytes()
    {
        using var dir = new TempFolder();
        string big = dir.File("big.bin"), empty = dir.File("empty.bin");
        var bytes = new byte[(64 << 20) + 3]; // one byte past a 64 MiB window, and two more
        new Random(7).NextBytes(bytes);
        File.WriteAllBytes(big, bytes);
        File.WriteAllBytes(empty, []);
        // the platform's one-shot SHA-256 of the bytes in memory, and FIPS 180-2's value for the empty message
        Assert.Equal(Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(bytes)), FileHash.Sha256(big));
        Assert.Equal("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855", FileHash.Sha256(empty));
    }

    [Fact]
    public void A_checksum_started_ahead_is_the_one_handed_out_later()
    {
        using var dir = new TempFolder();
        WithCacheIn(dir, () =>
        {
            string path = dir.File("input.nc");
            File.WriteAllText(path, "abc");
            ChecksumCache.Prefetch([path, dir.File("absent.nc")]).Wait();
            Assert.Equal(Abc, ChecksumCache.Sha256(path));
        });
    }
}
