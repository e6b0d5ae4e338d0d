using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// Zarr v2 stores written by python3-zarr (Debian) with each compressor it offers, read by
/// GridDrift and compared value for value with what python3-zarr itself reads back
/// (zarr_v2_store.py): partial edge chunks, a chunk never written (fill value), NaN cells,
/// big-endian integers under '/'-separated keys, consolidated metadata or none.
/// </summary>
public class ZarrV2InteropTests
{
    const int Times = 7, Rows = 25, Columns = 144, Cells = Times * Rows * Columns;

    [InteropTheory(Needs.PythonZarr)]
    [InlineData("none", true)]
    [InlineData("zlib", false)]
    [InlineData("gzip", true)]
    [InlineData("zstd", false)]
    [InlineData("lz4", true)]
    [InlineData("blosc-lz4-shuffle", false)]
    [InlineData("blosc-zstd-bitshuffle", true)]
    [InlineData("blosc-zlib-noshuffle", false)]
    [InlineData("blosc-blosclz-shuffle", true)]
    public void Every_value_equals_what_python_zarr_reads(string compressor, bool consolidated)
    {
        using var dir = new TempFolder();
        string store = dir.File("record.zarr"), witness = dir.File("witness.bin");
        ExternalTools.RunPython("zarr_v2_store.py", store, compressor, consolidated ? "1" : "0", witness);
        var expected = File.ReadAllBytes(witness).Chunk(8).Select(c => BitConverter.ToDouble(c)).ToArray();

        using var reader = DatasetFiles.Open(store);
        Assert.Equal("Zarr v2", reader.Format);
        Assert.Equal(["lat", "lon", "time"], reader.Dimensions.Select(d => d.Name).Order());
        Assert.Equal(["time", "lat", "lon"], reader.RequireVariable("tcwv").Dimensions.Select(d => d.Name));
        Assert.Equal("invented water-vapour record (synthetic)", reader.Attributes.Text("title"));
        var tcwv = reader.RequireVariable("tcwv");
        Assert.Equal(NcType.Float, tcwv.Type);
        Assert.Equal("atmosphere_mass_content_of_water_vapor", tcwv.Attributes.Text("standard_name"));
        Assert.True(float.IsNaN(((float[])tcwv.Attributes.Find("_FillValue")!.Values)[0])); // xarray reads the v2 fill value as _FillValue

        var values = new float[Cells];
        reader.ReadRaw(tcwv, [0, 0, 0], [Times, Rows, Columns], System.Runtime.InteropServices.MemoryMarshal.AsBytes(values.AsSpan()));
        Assert.Contains(values, float.IsNaN);
        for (int k = 0; k < Cells; k++) Assert.True(values[k].Equals((float)expected[k]), $"tcwv cell {k}: {values[k]} vs {expected[k]}");

        // a hyperslab across chunk edges in every dimension, the unwritten chunk included
        long[] start = [1, 9, 60], count = [4, 10, 30];
        var part = new float[4 * 10 * 30];
        reader.ReadRaw(tcwv, start, count, System.Runtime.InteropServices.MemoryMarshal.AsBytes(part.AsSpan()));
        for (int t = 0; t < 4; t++)
            for (int j = 0; j < 10; j++)
                for (int i = 0; i < 30; i++)
                {
                    double e = expected[((t + 1) * Rows + j + 9) * Columns + i + 60];
                    Assert.True(part[(t * 10 + j) * 30 + i].Equals((float)e), $"tcwv[{t + 1}, {j + 9}, {i + 60}]");
                }

        var q = reader.RequireVariable("q");
        Assert.Equal(NcType.Short, q.Type);
        Assert.Equal(0.0001, q.Attributes.Find("scale_factor")!.FirstNumber());
        var packed = new short[Cells];
        reader.ReadRaw(q, [0, 0, 0], [Times, Rows, Columns], System.Runtime.InteropServices.MemoryMarshal.AsBytes(packed.AsSpan()));
        for (int k = 0; k < Cells; k++) Assert.True(packed[k] == expected[Cells + k], $"q cell {k}: {packed[k]} vs {expected[Cells + k]}");
    }
}

/// <summary>
/// Every command reads a Zarr store as it reads a NetCDF file: the same record written by
/// python3-zarr and, from the values python3-zarr reads back, by netCDF4-python gives the same
/// products value for value (the NetCDF path is itself checked against numpy elsewhere).
/// </summary>
public class ZarrCommandTests
{
    [InteropFact(Needs.PythonZarr | Needs.PythonNetcdf)]
    public void Stats_similarity_and_climatology_of_a_Zarr_store_equal_those_of_the_same_record_as_NetCDF()
    {
        using var dir = new TempFolder();
        string store = dir.File("record.zarr"), copy = dir.File("record.nc");
        ExternalTools.RunPython("zarr_v2_store.py", store, "blosc-lz4-shuffle", "1", dir.File("witness.bin"), copy);
        foreach (var (input, tag) in new[] { (store, "zarr"), (copy, "nc") })
        {
            Ok(CliRun.Run("stats", input, "--var", "tcwv", "--regions", "global", "bands:30", "--out", dir.File($"stats_{tag}.nc")));
            Ok(CliRun.Run("stats", input, "--var", "q", "--regions", "global", "--out", dir.File($"q_{tag}.nc")));
            Ok(CliRun.Run("similarity", input, "--var", "tcwv", "--regions", "global", "bands:30", "--metric", "ssim,vif,corr", "--out", dir.File($"sim_{tag}.nc")));
            Ok(CliRun.Run("climatology", input, "--var", "tcwv", "--by", "month", "--out", dir.File($"clim_{tag}.nc")));
        }
        foreach (var product in new[] { "stats", "q", "sim", "clim" })
            ProductComparison.AssertSameValues(dir.File($"{product}_nc.nc"), dir.File($"{product}_zarr.nc"));
        var described = CliRun.Run("describe", store);
        Assert.Equal(0, described.ExitCode);
        Assert.Contains("Zarr v2", described.Stdout);
    }

    static void Ok(CliRun.Outcome outcome) => Assert.True(outcome.ExitCode == 0, outcome.Stderr);
}

/// <summary>
/// The shared cache of decoded chunks under load: four threads read every frame of a store whose
/// chunks hold three frames each, over and over, with a budget of a few chunks, so chunks are
/// decoded ahead, shared, evicted and their buffers reused while others read; every frame must
/// still equal what python3-zarr reads.
/// </summary>
[Collection("decoded chunk budget")]
public class ZarrSharedChunkTests
{
    [InteropFact(Needs.PythonZarr)]
    public void Frames_read_at_once_by_several_threads_stay_right_while_chunks_are_evicted()
    {
        const int Times = 7, Rows = 25, Columns = 144;
        using var dir = new TempFolder();
        string store = dir.File("record.zarr"), witness = dir.File("witness.bin");
        ExternalTools.RunPython("zarr_v2_store.py", store, "zstd", "0", witness);
        var expected = File.ReadAllBytes(witness).Chunk(8).Select(c => BitConverter.ToDouble(c)).ToArray();
        long saved = GridDrift.Formats.Zarr.DecodedChunks.Budget;
        GridDrift.Formats.Zarr.DecodedChunks.Budget = 3 * 3 * 13 * 72 * 4; // three chunks
        try
        {
            var failures = new System.Collections.Concurrent.ConcurrentBag<string>();
            Parallel.For(0, 4, new ParallelOptions { MaxDegreeOfParallelism = 4 }, worker =>
            {
                using var reader = DatasetFiles.Open(store);
                var tcwv = reader.RequireVariable("tcwv");
                var frame = new float[Rows * Columns];
                for (int round = 0; round < 30; round++)
                    for (int t = (worker + round) % Times, n = 0; n < Times; t = (t + 1) % Times, n++)
                    {
                        reader.ReadRaw(tcwv, [t, 0, 0], [1, Rows, Columns], System.Runtime.InteropServices.MemoryMarshal.AsBytes(frame.AsSpan()));
                        for (int k = 0; k < frame.Length; k++)
                            if (!frame[k].Equals((float)expected[t * Rows * Columns + k])) { failures.Add($"frame {t}, cell {k}"); break; }
                    }
            });
            Assert.Empty(failures);
        }
        finally { GridDrift.Formats.Zarr.DecodedChunks.Budget = saved; }
    }
}
