using GridDrift.Formats.Zarr;

namespace GridDrift.Tests.Formats;

/// <summary>The shared cache of decoded chunks is process-wide: these tests run when no other test adds to it.</summary>
[CollectionDefinition(nameof(DecodedChunksAlone), DisableParallelization = true)]
public sealed class DecodedChunksAlone;

[Collection(nameof(DecodedChunksAlone))]
public class DecodedChunksTests
{
    /// <summary>
    /// Workers that need the same chunk at the same moment (both workers reaching the next chunk)
    /// decode it once and count its bytes once: a count that grew with every race made the cache
    /// drop chunks decoded ahead just before they were read, and decode them again.
    /// </summary>
    [Fact]
    public void Readers_racing_for_a_chunk_decode_it_once_and_count_it_once()
    {
        const int Rounds = 300, Readers = 4, Size = 64;
        int decodes = 0;
        string run = Guid.NewGuid().ToString("N");
        for (int round = 0; round < Rounds; round++)
        {
            string key = $"{run}\n{round}";
            using var start = new Barrier(Readers);
            var readers = Enumerable.Range(0, Readers).Select(_ => new Thread(() =>
            {
                start.SignalAndWait();
                using var lease = DecodedChunks.Get(key, Size, bytes => { Interlocked.Increment(ref decodes); bytes.Fill(7); });
                Assert.Equal(Size, lease.Bytes.Length);
            })).ToList();
            readers.ForEach(t => t.Start());
            readers.ForEach(t => t.Join());
        }
        Assert.Equal(Rounds, decodes);
        var (counted, listed) = DecodedChunks.Accounting();
        Assert.Equal(listed, counted);
    }

    /// <summary>A chunk whose decoding fails (a damaged chunk) is not remembered, and its bytes are not counted as held.</summary>
    [Fact]
    public void A_chunk_that_fails_to_decode_is_not_counted()
    {
        string key = Guid.NewGuid().ToString("N");
        for (int attempt = 0; attempt < 3; attempt++)
            Assert.Throws<InvalidDataException>(() => DecodedChunks.Get(key, 1 << 20, _ => throw new InvalidDataException("damaged")));
        var (counted, listed) = DecodedChunks.Accounting();
        Assert.Equal(listed, counted);
    }
}
