namespace GridDrift.Formats.Zarr;

/// <summary>
/// The keyed objects of a Zarr store ("zarr.json", "tb/c/0/0/0", "tb/.zarray"). The reader asks
/// only for whole objects, byte ranges of them and the names under a prefix, so an object-storage
/// backend fits behind the same four calls; a local directory is the one there is now.
/// </summary>
internal interface IByteStore
{
    /// <summary>Where the store is, for messages and as part of cache keys.</summary>
    string Location { get; }

    /// <summary>The whole object, or null when the store has no such key.</summary>
    byte[]? Read(string key);

    /// <summary>
    /// The whole object in a buffer rented from <see cref="System.Buffers.ArrayPool{T}.Shared"/>
    /// (its first <paramref name="length"/> bytes), which the caller returns; null when absent.
    /// </summary>
    byte[]? Rent(string key, out int length);

    /// <summary>
    /// <paramref name="length"/> bytes from <paramref name="offset"/> (a negative offset counts
    /// from the end), or null when the key is absent; throws when the object is shorter.
    /// </summary>
    byte[]? ReadRange(string key, long offset, int length);

    /// <summary>What identifies this version of an object (its size and change time here), or null when absent.</summary>
    string? Version(string key);

    /// <summary>The names directly under a prefix ("" for the root) that hold further keys.</summary>
    IEnumerable<string> Folders(string prefix);
}
