using GridDrift.Conventions.Values;
using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// Files made in the test run by netCDF-C's ncgen in each format variant; GridDrift must read the
/// values python netCDF4 reads from them: raw values, decoded values (CF masking and unpacking),
/// and hyperslabs. Witnesses: ncgen (netcdf-bin) writes, python netCDF4 reads.
/// </summary>
public class FormatVariantTests
{
    public static TheoryData<string, string> Variants() => new()
    {
        { "nc3", "classic" },
        { "nc6", "64-bit offset" },
        { "nc5", "64-bit data (CDF-5)" },
        { "nc7", "netCDF-4 classic model" },
        { "nc4", "netCDF-4" },
    };

    static string Make(TempFolder dir, string kind, bool deflate = false) =>
        ExternalTools.RunNcgen(Cdl.Common(cdf5Types: kind is "nc5" or "nc4", deflate), kind, dir.File($"variant_{kind}{(deflate ? "_deflate" : "")}.nc"));

    [InteropTheory(Needs.Ncgen | Needs.PythonNetcdf)]
    [MemberData(nameof(Variants))]
    public void Raw_values_equal_python_netCDF4(string kind, string format)
    {
        using var dir = new TempFolder();
        string path = Make(dir, kind);
        using var reader = DatasetFiles.Open(path);
        Assert.Equal(format, reader.Format);
        var reference = ReferenceDump.Of(path);
        foreach (var (name, expected) in reference.Variables.Select(p => (p.Name, p.Value)))
        {
            var v = reader.RequireVariable(name);
            var values = ReferenceDump.Numbers(expected.GetProperty("values"));
            if (v.Type == NcType.Char)
            {
                var bytes = new byte[v.ElementCount];
                reader.ReadRaw(v, new long[v.Rank], v.Shape, bytes);
                Assert.Equal(values, bytes.Select(b => (double)b));
            }
            else Assert.Equal(values, reader.ReadAllDoubles(v));
        }
        Assert.Equal(["south", "equat", "north"], reader.ReadText(reader.RequireVariable("label")));
        Assert.Equal(4, reader.Dimensions.Single(d => d.Name == "time").Length);
        Assert.True(reader.Dimensions.Single(d => d.Name == "time").IsUnlimited);
    }

    [InteropTheory(Needs.Ncgen | Needs.PythonNetcdf)]
    [MemberData(nameof(Variants))]
    public void Decoded_values_equal_python_netCDF4_masking_and_unpacking(string kind, string format)
    {
        _ = format;
        using var dir = new TempFolder();
        string path = Make(dir, kind);
        using var reader = DatasetFiles.Open(path);
        var reference = ReferenceDump.Of(path, decoded: true);
        foreach (var name in new[] { "tb", "tcwv", "counts" })
        {
            var v = reader.RequireVariable(name);
            var raw = reader.ReadAllDoubles(v);
            var decoded = new float[raw.Length];
            ValueCodec.For(v).Decode(raw, decoded);
            var expected = ReferenceDump.Numbers(reference.Variable(name).GetProperty("values"));
            for (int i = 0; i < expected.Length; i++)
            {
                if (double.IsNaN(expected[i])) Assert.True(float.IsNaN(decoded[i]), $"{name}[{i}]: python masks it, GridDrift gives {decoded[i]}");
                else Assert.Equal((float)expected[i], decoded[i]);
            }
        }
    }

    [InteropFact(Needs.Ncgen | Needs.PythonNetcdf)]
    public void Deflate_and_shuffle_chunks_read_like_python_netCDF4()
    {
        using var dir = new TempFolder();
        string path = Make(dir, "nc4", deflate: true);
        using var reader = DatasetFiles.Open(path);
        var reference = ReferenceDump.Of(path);
        foreach (var name in new[] { "tb", "tcwv" })
            Assert.Equal(ReferenceDump.Numbers(reference.Variable(name).GetProperty("values")), reader.ReadAllDoubles(reader.RequireVariable(name)));
    }

    [InteropTheory(Needs.Ncgen | Needs.PythonNetcdf)]
    [MemberData(nameof(Variants))]
    public void Hyperslabs_equal_the_same_slices_of_python_netCDF4(string kind, string format)
    {
        _ = format;
        using var dir = new TempFolder();
        string path = Make(dir, kind);
        using var reader = DatasetFiles.Open(path);
        var all = ReferenceDump.Numbers(ReferenceDump.Of(path).Variable("counts").GetProperty("values")); // (time=4, lat=3, lon=5)
        var v = reader.RequireVariable("counts");
        // one time step, the frame a streaming reader asks for
        var frame = new double[15];
        reader.ReadDoubles(v, [2, 0, 0], [1, 3, 5], frame);
        Assert.Equal(all.Skip(30).Take(15), frame);
        // an interior box across records: time 1..2, lat 1..2, lon 1..3
        var box = new double[2 * 2 * 3];
        reader.ReadDoubles(v, [1, 1, 1], [2, 2, 3], box);
        var expected = new List<double>();
        for (int t = 1; t <= 2; t++)
            for (int y = 1; y <= 2; y++)
                for (int x = 1; x <= 3; x++)
                    expected.Add(all[t * 15 + y * 5 + x]);
        Assert.Equal(expected, box);
    }

    [InteropFact(Needs.Ncgen | Needs.PythonNetcdf)]
    public void A_single_short_record_variable_is_read_without_record_padding()
    {
        // NetCDF classic specification: with exactly one record variable, records are not padded to 4 bytes.
        using var dir = new TempFolder();
        string path = ExternalTools.RunNcgen(Cdl.SingleRecordVariable, "nc3", dir.File("single.nc"));
        using var reader = DatasetFiles.Open(path);
        var expected = ReferenceDump.Numbers(ReferenceDump.Of(path).Variable("x").GetProperty("values"));
        Assert.Equal(expected, reader.ReadAllDoubles(reader.RequireVariable("x")));
        var frame = new double[3];
        reader.ReadDoubles(reader.RequireVariable("x"), [3, 0], [1, 3], frame);
        Assert.Equal(expected.Skip(9).Take(3), frame);
    }
}

/// <summary>Frames streamed through <see cref="GridDrift.Frames.FrameSource"/> equal python netCDF4's decoded time slices.</summary>
public class FrameDecodingInteropTests
{
    [InteropTheory(Needs.Ncgen | Needs.PythonNetcdf)]
    [InlineData("nc3")]
    [InlineData("nc4")]
    public void Decoded_frames_equal_python_netCDF4_time_slices(string kind)
    {
        using var dir = new TempFolder();
        string path = ExternalTools.RunNcgen(Cdl.Common(cdf5Types: false, deflate: kind == "nc4"), kind, dir.File($"frames_{kind}.nc"));
        var reference = ReferenceDump.Of(path, decoded: true);
        foreach (var name in new[] { "tcwv", "tb" })
        {
            var expected = ReferenceDump.Numbers(reference.Variable(name).GetProperty("values"));
            using var source = GridDrift.Frames.FrameSource.Open([path], name);
            Assert.Equal(4, source.FrameCount);
            var frame = new float[source.FrameLength];
            for (int t = 0; t < source.FrameCount; t++)
            {
                source.ReadFrame(t, frame);
                for (int i = 0; i < frame.Length; i++)
                {
                    double e = expected[t * frame.Length + i];
                    if (double.IsNaN(e)) Assert.True(float.IsNaN(frame[i]), $"{name}[{t},{i}] should be missing");
                    else Assert.Equal((float)e, frame[i]);
                }
            }
        }
    }
}
