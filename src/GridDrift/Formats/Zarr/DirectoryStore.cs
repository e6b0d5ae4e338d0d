namespace GridDrift.Formats.Zarr;

/// <summary>A Zarr store on a local file system: keys are relative paths with '/' separators.</summary>
internal sealed class DirectoryStore(string root) : IByteStore
{
    public string Location { get; } = Path.GetFullPath(root);

    string PathOf(string key) => Path.Combine(Location, key.Replace('/', Path.DirectorySeparatorChar));

    public byte[]? Read(string key)
    {
        string path = PathOf(key);
        try { return File.ReadAllBytes(path); }
        catch (FileNotFoundException) { return null; }
        catch (DirectoryNotFoundException) { return null; }
    }

    public byte[]? Rent(string key, out int length)
    {
        length = 0;
        Microsoft.Win32.SafeHandles.SafeFileHandle handle;
        try { handle = File.OpenHandle(PathOf(key), FileMode.Open, FileAccess.Read, FileShare.Read); }
        catch (FileNotFoundException) { return null; }
        catch (DirectoryNotFoundException) { return null; }
        using (handle)
        {
            long size = RandomAccess.GetLength(handle);
            if (size > int.MaxValue) throw new InvalidDataException($"'{key}' has {size} bytes, more than a chunk can");
            var buffer = System.Buffers.ArrayPool<byte>.Shared.Rent((int)size);
            if (!FileRanges.TryReadFully(handle, buffer.AsSpan(0, (int)size), 0))
            {
                System.Buffers.ArrayPool<byte>.Shared.Return(buffer);
                throw new InvalidDataException($"'{key}' ended early");
            }
            length = (int)size;
            return buffer;
        }
    }

    public byte[]? ReadRange(string key, long offset, int length)
    {
        string path = PathOf(key);
        if (!File.Exists(path)) return null;
        using var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
        long size = RandomAccess.GetLength(handle);
        long at = offset < 0 ? size + offset : offset;
        if (at < 0 || at + length > size)
            throw new InvalidDataException($"'{key}' has {size} bytes; bytes [{at}, {at + length}) were asked for");
        var buffer = new byte[length];
        if (!FileRanges.TryReadFully(handle, buffer, at)) throw new InvalidDataException($"'{key}' ended early");
        return buffer;
    }

    public string? Version(string key)
    {
        var info = new FileInfo(PathOf(key));
        return info.Exists ? $"{info.Length}:{info.LastWriteTimeUtc.Ticks}" : null;
    }

    public IEnumerable<string> Folders(string prefix)
    {
        string dir = prefix.Length == 0 ? Location : PathOf(prefix);
        if (!Directory.Exists(dir)) return [];
        return Directory.EnumerateDirectories(dir).Select(Path.GetFileName).OfType<string>().Order(StringComparer.Ordinal).ToList();
    }
}
