namespace GridDrift.Formats.Hdf5;

/// <summary>
/// A file stream that refuses to go on once far more bytes were read than the file holds. A
/// corrupt HDF5 object header can send the HDF5 reader round a loop of header messages that reads
/// forever (seen in the mutation campaign); reading every byte of a file many times over is never
/// needed, so the loop ends in an IOException, which the reader turns into bad input.
/// </summary>
internal sealed class BoundedReadStream(FileStream inner, long budget) : Stream
{
    long _read;

    /// <summary>The budget for a file: 64 times its length (each frame read a few times over by several commands of a run) plus 64 MiB.</summary>
    public static long BudgetFor(long length) => 64 * length + (64L << 20);

    public override int Read(Span<byte> buffer)
    {
        int n = inner.Read(buffer);
        Count(n);
        return n;
    }

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    void Count(int n)
    {
        _read += n;
        if (_read > budget)
            throw new IOException($"more than {budget} bytes read from a {inner.Length}-byte file: its HDF5 structure makes the reader go round in a loop");
    }

    public override bool CanRead => true;
    public override bool CanSeek => true;
    public override bool CanWrite => false;
    public override long Length => inner.Length;
    public override long Position { get => inner.Position; set => inner.Position = value; }
    public override long Seek(long offset, SeekOrigin origin) => inner.Seek(offset, origin);
    public override void Flush() { }
    public override void SetLength(long value) => throw new NotSupportedException();
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();

    protected override void Dispose(bool disposing)
    {
        if (disposing) inner.Dispose();
        base.Dispose(disposing);
    }
}
