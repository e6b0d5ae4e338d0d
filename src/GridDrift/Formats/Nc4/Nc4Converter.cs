using System.Runtime.InteropServices;
using GridDrift.Formats.Classic;

namespace GridDrift.Formats.Nc4;

/// <summary>How a compressed NetCDF-4 product is stored: zlib deflate level (0 = none) and the byte shuffle filter.</summary>
public sealed record Nc4Options(int Deflate = 1, bool Shuffle = false)
{
    public static bool Available(out string why) => NetCdfLibrary.TryLoad(out why);
}

/// <summary>
/// Writes a NetCDF-4 copy of a finished classic file through netCDF-C: the same dimensions
/// (the record dimension stays unlimited), variables, attributes and values, with every variable
/// of rank 2 or more chunked one record (one frame) per chunk and compressed. Data move one
/// record at a time, so memory is one frame whatever the file's length; the copy is written
/// under a temporary name and renamed when complete.
/// </summary>
internal static unsafe class Nc4Converter
{
    /// <summary>netCDF-C (and the HDF5 library under it) is not thread-safe: one conversion at a time in a process.</summary>
    static readonly object Library = new();

    public static void Convert(string classicPath, string nc4Path, Nc4Options options)
    {
        lock (Library) ConvertAlone(classicPath, nc4Path, options);
    }

    static void ConvertAlone(string classicPath, string nc4Path, Nc4Options options)
    {
        if (!NetCdfLibrary.TryLoad(out var why)) throw new BadInputException(nc4Path, null, "--format netcdf-4: " + why);
        if (options.Deflate is < 0 or > 9) throw new BadInputException(null, null, $"--deflate {options.Deflate}: choose 1 (fast) to 9 (small), or 0 for none");
        string final = Path.GetFullPath(nc4Path);
        string temp = Path.Combine(Path.GetDirectoryName(final)!, "." + Path.GetFileName(final) + "." + Guid.NewGuid().ToString("N")[..8] + ".part");
        int input = -1, output = -1;
        try
        {
            NetCdfLibrary.Check(NetCdfLibrary.nc_open(classicPath, NetCdfLibrary.NoWrite, out input), classicPath, "open");
            NetCdfLibrary.Check(NetCdfLibrary.nc_create(temp, NetCdfLibrary.NetCdf4 | NetCdfLibrary.Clobber, out output), final, "create");
            Copy(input, output, final, options);
            NetCdfLibrary.Check(NetCdfLibrary.nc_close(output), final, "close");
            output = -1;
            File.Move(temp, final, overwrite: true);
        }
        finally
        {
            if (output >= 0) NetCdfLibrary.nc_close(output);
            if (input >= 0) NetCdfLibrary.nc_close(input);
            if (File.Exists(temp)) File.Delete(temp);
        }
    }

    static void Copy(int input, int output, string path, Nc4Options options)
    {
        NetCdfLibrary.Check(NetCdfLibrary.nc_inq(input, out int ndims, out int nvars, out int ngatts, out int unlimited), path, "inquire");
        var name = stackalloc byte[NetCdfLibrary.MaxName + 1];
        var lengths = new nuint[ndims];
        for (int d = 0; d < ndims; d++)
        {
            NetCdfLibrary.Check(NetCdfLibrary.nc_inq_dim(input, d, name, out lengths[d]), path, "dimension");
            NetCdfLibrary.Check(NetCdfLibrary.nc_def_dim(output, Text(name), d == unlimited ? NetCdfLibrary.Unlimited : lengths[d], out int id), path, "define dimension " + Text(name));
            if (id != d) throw new InvalidOperationException("dimension ids differ between the copies");
        }
        CopyAttributes(input, output, NetCdfLibrary.Global, ngatts, path);
        var vars = new (int Type, int[] Dims, long Slab)[nvars];
        var dimids = stackalloc int[NetCdfLibrary.MaxName];
        var chunks = stackalloc nuint[NetCdfLibrary.MaxName]; // NC_MAX_VAR_DIMS is 1024; classic files stay far below this
        for (int v = 0; v < nvars; v++)
        {
            NetCdfLibrary.Check(NetCdfLibrary.nc_inq_var(input, v, name, out int type, out int rank, dimids, out int natts), path, "variable");
            string varName = Text(name);
            NetCdfLibrary.Check(NetCdfLibrary.nc_def_var(output, varName, type, rank, dimids, out int id), path, "define variable " + varName);
            var dims = new Span<int>(dimids, rank).ToArray();
            NetCdfLibrary.Check(NetCdfLibrary.nc_inq_type(input, type, name, out nuint size), path, "type of " + varName);
            bool record = rank > 0 && dims[0] == unlimited;
            long slab = (long)size;
            for (int k = record ? 1 : 0; k < rank; k++) slab *= (long)lengths[dims[k]];
            if (rank >= 2)
            {
                chunks[0] = 1; // one frame (or one row of a fixed variable) per chunk
                for (int k = 1; k < rank; k++) chunks[k] = lengths[dims[k]];
                NetCdfLibrary.Check(NetCdfLibrary.nc_def_var_chunking(output, id, NetCdfLibrary.Chunked, chunks), path, "chunking of " + varName);
                if (options.Deflate > 0 || options.Shuffle)
                    NetCdfLibrary.Check(NetCdfLibrary.nc_def_var_deflate(output, id, options.Shuffle ? 1 : 0, options.Deflate > 0 ? 1 : 0, options.Deflate), path, "compression of " + varName);
            }
            CopyAttributes(input, output, v, natts, path);
            vars[v] = (type, dims, slab);
        }
        NetCdfLibrary.Check(NetCdfLibrary.nc_enddef(output), path, "end definitions");

        long records = unlimited >= 0 ? (long)lengths[unlimited] : 0;
        long largest = vars.Select(x => x.Slab).DefaultIfEmpty(0).Max(); // a record's slab, or a whole fixed variable
        void* buffer = NativeMemory.Alloc((nuint)Math.Max(1, largest));
        int maxRank = vars.Select(x => x.Dims.Length).DefaultIfEmpty(1).Max();
        var start = stackalloc nuint[Math.Max(1, maxRank)];
        var count = stackalloc nuint[Math.Max(1, maxRank)];
        try
        {
            for (int v = 0; v < nvars; v++)
            {
                var (_, dims, _) = vars[v];
                int rank = dims.Length;
                for (int k = 0; k < rank; k++) { start[k] = 0; count[k] = lengths[dims[k]]; }
                bool record = rank > 0 && dims[0] == unlimited;
                if (!record)
                {
                    NetCdfLibrary.Check(NetCdfLibrary.nc_get_vara(input, v, start, count, buffer), path, "read");
                    NetCdfLibrary.Check(NetCdfLibrary.nc_put_vara(output, v, start, count, buffer), path, "write");
                    continue;
                }
                count[0] = 1;
                for (long r = 0; r < records; r++)
                {
                    start[0] = (nuint)r;
                    NetCdfLibrary.Check(NetCdfLibrary.nc_get_vara(input, v, start, count, buffer), path, "read a record");
                    NetCdfLibrary.Check(NetCdfLibrary.nc_put_vara(output, v, start, count, buffer), path, "write a record");
                }
            }
        }
        finally
        {
            NativeMemory.Free(buffer);
        }
    }

    static void CopyAttributes(int input, int output, int varid, int count, string path)
    {
        var name = stackalloc byte[NetCdfLibrary.MaxName + 1];
        for (int a = 0; a < count; a++)
        {
            NetCdfLibrary.Check(NetCdfLibrary.nc_inq_attname(input, varid, a, name), path, "attribute name");
            NetCdfLibrary.Check(NetCdfLibrary.nc_copy_att(input, varid, name, output, varid), path, "attribute " + Text(name));
        }
    }

    static string Text(byte* name) => Marshal.PtrToStringUTF8((nint)name) ?? "";
}
