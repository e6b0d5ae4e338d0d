using System.Runtime.InteropServices;

namespace GridDrift.Formats.Nc4;

/// <summary>
/// The netCDF-C library (Debian: libnetcdf19), called through P/Invoke for compressed NetCDF-4
/// output. It is loaded only when asked for and only if present: everything else in GridDrift
/// reads and writes without it.
/// </summary>
internal static unsafe partial class NetCdfLibrary
{
    const string Name = "netcdf";
    public const int NoWrite = 0, Clobber = 0, NetCdf4 = 0x1000, Unlimited = 0, Chunked = 0, Global = -1, MaxName = 256;

    static readonly Lazy<(bool Loaded, string Why)> State = new(Load);

    public static bool TryLoad(out string why)
    {
        var s = State.Value;
        why = s.Why;
        return s.Loaded;
    }

    /// <summary>GRIDDRIFT_LIBNETCDF names the library file where it is not on the loader's path (a cluster's module, a conda environment).</summary>
    static (bool, string) Load()
    {
        string? chosen = GridDriftSettings.Current.NetCdfLibrary;
        if (!string.IsNullOrEmpty(chosen) && !NativeLibrary.TryLoad(chosen, out _))
            return (false, $"the netCDF-C library GRIDDRIFT_LIBNETCDF names ({chosen}) cannot be loaded: on Debian or Ubuntu, apt-get install libnetcdf19, or point GRIDDRIFT_LIBNETCDF at libnetcdf.so");
        if (NativeLibraries.TryBind(Name, string.IsNullOrEmpty(chosen) ? ["libnetcdf.so.19", "libnetcdf.so", "libnetcdf.so.22", "libnetcdf.so.18", "libnetcdf.dylib", "netcdf.dll"] : [chosen], out var loaded))
            return (true, loaded);
        return (false, "the netCDF-C library (libnetcdf) is not installed: on Debian or Ubuntu, apt-get install libnetcdf19");
    }

    [LibraryImport(Name, StringMarshalling = StringMarshalling.Utf8)] public static partial int nc_open(string path, int mode, out int ncid);
    [LibraryImport(Name, StringMarshalling = StringMarshalling.Utf8)] public static partial int nc_create(string path, int mode, out int ncid);
    [LibraryImport(Name)] public static partial int nc_close(int ncid);
    [LibraryImport(Name)] public static partial int nc_enddef(int ncid);
    [LibraryImport(Name)] public static partial int nc_inq(int ncid, out int ndims, out int nvars, out int ngatts, out int unlimdimid);
    [LibraryImport(Name)] public static partial int nc_inq_dim(int ncid, int dimid, byte* name, out nuint length);
    [LibraryImport(Name, StringMarshalling = StringMarshalling.Utf8)] public static partial int nc_def_dim(int ncid, string name, nuint length, out int dimid);
    [LibraryImport(Name)] public static partial int nc_inq_var(int ncid, int varid, byte* name, out int xtype, out int ndims, int* dimids, out int natts);
    [LibraryImport(Name, StringMarshalling = StringMarshalling.Utf8)] public static partial int nc_def_var(int ncid, string name, int xtype, int ndims, int* dimids, out int varid);
    [LibraryImport(Name)] public static partial int nc_def_var_chunking(int ncid, int varid, int storage, nuint* chunks);
    [LibraryImport(Name)] public static partial int nc_def_var_deflate(int ncid, int varid, int shuffle, int deflate, int level);
    [LibraryImport(Name)] public static partial int nc_inq_attname(int ncid, int varid, int attnum, byte* name);
    [LibraryImport(Name)] public static partial int nc_copy_att(int ncidIn, int varidIn, byte* name, int ncidOut, int varidOut);
    [LibraryImport(Name)] public static partial int nc_inq_type(int ncid, int xtype, byte* name, out nuint size);
    [LibraryImport(Name)] public static partial int nc_get_vara(int ncid, int varid, nuint* start, nuint* count, void* data);
    [LibraryImport(Name)] public static partial int nc_put_vara(int ncid, int varid, nuint* start, nuint* count, void* data);
    [LibraryImport(Name)] public static partial nint nc_strerror(int status);

    /// <summary>Throws with netCDF-C's own message when a call failed.</summary>
    public static void Check(int status, string path, string what)
    {
        if (status != 0) throw new BadInputException(path, null, $"netCDF-C: {what}: {Marshal.PtrToStringUTF8(nc_strerror(status))}");
    }
}
