using GridDrift.Formats.Classic;
using GridDrift.Formats.Hdf5;

namespace GridDrift.Formats;

/// <summary>Opens any supported file or store: the format is sniffed from its magic bytes (a Zarr store from its metadata documents), never from its name.</summary>
internal static class DatasetFiles
{
    static ReadOnlySpan<byte> Hdf5Signature => [0x89, (byte)'H', (byte)'D', (byte)'F', (byte)'\r', (byte)'\n', 0x1A, (byte)'\n'];

    /// <summary>
    /// Opens a file; whatever a malformed file makes a reader throw while its metadata is read —
    /// an overflow or an allocation sized by a corrupt count included — is bad input naming the file.
    /// </summary>
    public static IDatasetReader Open(string path)
    {
        try { return Sniff(path); }
        catch (Exception e) when (e is not (BadInputException or OperationCanceledException))
        {
            throw new BadInputException(path, null, $"cannot be read as NetCDF ({e.GetType().Name}: {e.Message})", e);
        }
    }

    static IDatasetReader Sniff(string path)
    {
        if (Directory.Exists(path))
            return Zarr.ZarrMetadata.IsStore(path) ? Zarr.ZarrReader.Open(path)
                : throw new BadInputException(path, null, "is a directory, neither a NetCDF file nor a Zarr store (no zarr.json, .zgroup, .zarray or .zmetadata)");
        if (!File.Exists(path)) throw new BadInputException(path, null, "no such file");
        Span<byte> head = stackalloc byte[8];
        int n;
        try
        {
            using var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
            n = RandomAccess.Read(handle, head, 0);
            if (n < 8 || !head.SequenceEqual(Hdf5Signature))
            {
                // HDF5 allows a user block of 512, 1024, 2048 … bytes before the superblock.
                long length = RandomAccess.GetLength(handle);
                for (long offset = 512; offset + 8 <= length && offset <= 1 << 20; offset *= 2)
                {
                    if (RandomAccess.Read(handle, head, offset) == 8 && head.SequenceEqual(Hdf5Signature))
                        return Hdf5Reader.Open(path);
                }
                if (n == 8) RandomAccess.Read(handle, head, 0);
            }
        }
        catch (UnauthorizedAccessException)
        {
            throw new BadInputException(path, null, "permission denied");
        }
        catch (IOException e)
        {
            throw new BadInputException(path, null, $"cannot be read ({e.Message})");
        }
        if (n == 0) throw new BadInputException(path, null, "file is empty");
        if (n >= 4 && head[0] == 'C' && head[1] == 'D' && head[2] == 'F')
        {
            if (head[3] is 1 or 2 or 5) return ClassicReader.Open(path);
            throw new BadInputException(path, null, $"unknown NetCDF classic version byte {head[3]}");
        }
        if (n == 8 && head.SequenceEqual(Hdf5Signature)) return Hdf5Reader.Open(path);
        if (StartsWithGrib(path)) return Grib.GribReader.Open(path);
        throw new BadInputException(path, null, "not a NetCDF, GRIB or Zarr dataset (neither the classic nor the HDF5 signature, nor a GRIB message)");
    }

    /// <summary>A GRIB message within the file's first 4 KiB (a bulletin header may come first).</summary>
    static bool StartsWithGrib(string path)
    {
        var head = new byte[4096];
        using var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
        int n = RandomAccess.Read(handle, head, 0);
        return Grib.GribIndex.LooksLikeGrib(head.AsSpan(0, n));
    }
}
