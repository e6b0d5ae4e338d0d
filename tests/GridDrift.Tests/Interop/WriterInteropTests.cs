using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// Files GridDrift writes must open in the reference tools: ncdump (netCDF-C) names their format
/// and lists the header, python netCDF4 reads back the names, attributes, values, the unlimited
/// dimension and the fill of never-written data. The expected values are the inputs given to
/// the writer, never values read back through GridDrift.
/// </summary>
public class WriterInteropTests
{
    static float[] Frame(int t, int n) => Enumerable.Range(0, n).Select(i => t * 100f + i * 0.5f - 7.25f).ToArray();

    /// <summary>Writes time(time), lat, lon, tcwv(time, lat, lon) with records appended one by one; record 2 of 'flag' is never written.</summary>
    static void WriteSample(string path, ClassicVariant? variant, bool unsignedTypes, int records = 4)
    {
        using var w = ClassicWriter.Create(path, variant);
        var time = w.AddDimension("time", 0, unlimited: true);
        var lat = w.AddDimension("lat", 3);
        var lon = w.AddDimension("lon", 4);
        w.AddAttribute(NcAttribute.Text("title", "GridDrift writer check (invented values) – ünïcode"));
        w.AddAttribute(NcAttribute.Of("version", 1, 2, 3));
        w.AddAttribute(NcAttribute.Of("scale", 0.5, 1.5));
        var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "hours since 2031-01-01 00:00:00"), NcAttribute.Text("calendar", "360_day")]);
        var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
        var vflag = w.AddVariable("flag", NcType.Byte, [time, lat], [new NcAttribute("_FillValue", NcType.Byte, new sbyte[] { -1 })]);
        var vdata = w.AddVariable("tcwv", NcType.Float, [time, lat, lon],
            [NcAttribute.Text("units", "kg m-2"), NcAttribute.Text("standard_name", "atmosphere_mass_content_of_water_vapor"), NcAttribute.Of("_FillValue", -999f)]);
        var vshort = w.AddVariable("code", NcType.Short, [lat, lon], [NcAttribute.Text("long_name", "never written: all fill")]);
        ClassicWriter.Definition? vus = unsignedTypes ? w.AddVariable("ucount", NcType.UShort, [lat]) : null;
        ClassicWriter.Definition? vi64 = unsignedTypes ? w.AddVariable("big", NcType.Int64, [lat]) : null;
        var strlen = w.AddDimension("strlen", 5);
        var vlabel = w.AddVariable("label", NcType.Char, [lat, strlen]);
        var vint = w.AddVariable("station", NcType.Int, [lat]);
        var vdouble = w.AddVariable("weight", NcType.Double, [lat]);
        ClassicWriter.Definition? vub = unsignedTypes ? w.AddVariable("ub", NcType.UByte, [lat]) : null;
        ClassicWriter.Definition? vui = unsignedTypes ? w.AddVariable("ui", NcType.UInt, [lat]) : null;
        ClassicWriter.Definition? vu64 = unsignedTypes ? w.AddVariable("u64", NcType.UInt64, [lat]) : null;
        w.EndDefinitions();
        w.Write<float>(vlat, [-30f, 0f, 30f]);
        w.Write<float>(vlon, [0f, 90f, 180f, 270f]);
        if (vus is not null) w.Write<ushort>(vus, [1, 40000, 65534]);
        if (vi64 is not null) w.Write<long>(vi64, [-9000000000000000000, 0, 9000000000000000000]);
        w.Write<byte>(vlabel, "southequatnorth"u8);
        w.Write<int>(vint, [-2000000000, 0, 2000000000]);
        w.Write<double>(vdouble, [0.25, 0.5, 0.25]);
        if (vub is not null) w.Write<byte>(vub, [0, 128, 255]);
        if (vui is not null) w.Write<uint>(vui, [7, 3000000000, 4294967290]);
        if (vu64 is not null) w.Write<ulong>(vu64, [1, 10000000000000000000, 18000000000000000000]);
        for (int t = 0; t < records; t++)
        {
            w.WriteRecord<double>(vt, t, [t * 6.0]);
            w.WriteRecord<float>(vdata, t, Frame(t, 12));
            if (t != 2) w.WriteRecord<sbyte>(vflag, t, [(sbyte)t, (sbyte)(t + 1), (sbyte)-t]);
        }
        w.Commit();
    }

    public static TheoryData<int, string> Variants() => new()
    {
        { 1, "classic" },
        { 2, "64-bit offset" },
        { 5, "cdf5" },
    };

    [InteropTheory(Needs.Ncdump)]
    [MemberData(nameof(Variants))]
    public void Ncdump_names_the_format_and_lists_the_header(int variant, string kind)
    {
        using var dir = new TempFolder();
        string path = dir.File("written.nc");
        WriteSample(path, (ClassicVariant)variant, unsignedTypes: variant == 5);
        Assert.Equal(kind, ExternalTools.Run("ncdump", $"-k {path}").Stdout.Trim());
        var header = ExternalTools.Run("ncdump", $"-h {path}");
        Assert.Equal(0, header.ExitCode);
        Assert.Contains("time = UNLIMITED ; // (4 currently)", header.Stdout);
        Assert.Contains("float tcwv(time, lat, lon) ;", header.Stdout);
        Assert.Contains("tcwv:standard_name = \"atmosphere_mass_content_of_water_vapor\" ;", header.Stdout);
        Assert.Contains(":title = \"GridDrift writer check (invented values) – ünïcode\" ;", header.Stdout);
        Assert.Contains(":version = 1, 2, 3 ;", header.Stdout);
    }

    [InteropTheory(Needs.PythonNetcdf)]
    [MemberData(nameof(Variants))]
    public void Python_netCDF4_reads_back_names_attributes_values_and_fill(int variant, string kind)
    {
        _ = kind;
        using var dir = new TempFolder();
        string path = dir.File("written.nc");
        WriteSample(path, (ClassicVariant)variant, unsignedTypes: variant == 5);
        var dump = ReferenceDump.Of(path);
        var dims = dump.Dimensions.ToDictionary(d => d.Name);
        Assert.Equal((4L, true), (dims["time"].Size, dims["time"].Unlimited));
        Assert.Equal(3, dims["lat"].Size);
        Assert.Equal("GridDrift writer check (invented values) – ünïcode", dump.Root.GetProperty("attributes").GetProperty("title").GetString());
        Assert.Equal(new double[] { 0.5, 1.5 }, ReferenceDump.Numbers(dump.Root.GetProperty("attributes").GetProperty("scale")));

        var tcwv = ReferenceDump.Numbers(dump.Variable("tcwv").GetProperty("values"));
        Assert.Equal(Enumerable.Range(0, 4).SelectMany(t => Frame(t, 12)).Select(f => (double)f), tcwv);
        Assert.Equal(new double[] { 0, 6, 12, 18 }, ReferenceDump.Numbers(dump.Variable("time").GetProperty("values")));
        // record 2 of 'flag' was never written: it holds the variable's _FillValue (-1)
        Assert.Equal(new double[] { 0, 1, 0, 1, 2, -1, -1, -1, -1, 3, 4, -3 }, ReferenceDump.Numbers(dump.Variable("flag").GetProperty("values")));
        Assert.Equal("southequatnorth".Select(c => (double)c), ReferenceDump.Numbers(dump.Variable("label").GetProperty("values")));
        Assert.Equal(new double[] { -2000000000, 0, 2000000000 }, ReferenceDump.Numbers(dump.Variable("station").GetProperty("values")));
        Assert.Equal(new double[] { 0.25, 0.5, 0.25 }, ReferenceDump.Numbers(dump.Variable("weight").GetProperty("values")));
        // 'code' was never written and declares no fill: NC_FILL_SHORT (-32767), as netcdf.h defines
        Assert.All(ReferenceDump.Numbers(dump.Variable("code").GetProperty("values")), v => Assert.Equal(-32767, v));
        if (variant == 5)
        {
            Assert.Equal(new double[] { 1, 40000, 65534 }, ReferenceDump.Numbers(dump.Variable("ucount").GetProperty("values")));
            Assert.Equal("int64", dump.Variable("big").GetProperty("kind").GetString());
            Assert.Equal(new double[] { 0, 128, 255 }, ReferenceDump.Numbers(dump.Variable("ub").GetProperty("values")));
            Assert.Equal(new double[] { 7, 3000000000, 4294967290 }, ReferenceDump.Numbers(dump.Variable("ui").GetProperty("values")));
            Assert.Equal(new double[] { 1, 1e19, 1.8e19 }, ReferenceDump.Numbers(dump.Variable("u64").GetProperty("values")));
        }
    }

    [InteropFact(Needs.Ncdump)]
    public void The_writer_switches_to_CDF5_by_itself_for_types_only_CDF5_holds()
    {
        using var dir = new TempFolder();
        string path = dir.File("auto.nc");
        WriteSample(path, variant: null, unsignedTypes: true);
        Assert.Equal("cdf5", ExternalTools.Run("ncdump", $"-k {path}").Stdout.Trim());
        string plain = dir.File("plain.nc");
        WriteSample(plain, variant: null, unsignedTypes: false);
        Assert.Equal("64-bit offset", ExternalTools.Run("ncdump", $"-k {plain}").Stdout.Trim());
    }

    [Fact]
    public void A_streaming_record_count_follows_from_the_file_size()
    {
        // NetCDF classic format specification: numrecs = STREAMING (all bits set) means the record
        // count is not in the header and follows from the file size. (netCDF-C 4.9's ncdump prints
        // 4294967295 records for such a file, so it is no witness here: the specification is.)
        using var dir = new TempFolder();
        string path = dir.File("streaming.nc");
        WriteSample(path, ClassicVariant.Cdf2, unsignedTypes: false, records: 5);
        var bytes = File.ReadAllBytes(path);
        bytes[4] = bytes[5] = bytes[6] = bytes[7] = 0xFF;
        File.WriteAllBytes(path, bytes);
        using var reader = DatasetFiles.Open(path);
        Assert.Equal(5, reader.Dimensions.Single(d => d.Name == "time").Length);
        var frame = new double[12];
        reader.ReadDoubles(reader.RequireVariable("tcwv"), [4, 0, 0], [1, 3, 4], frame);
        Assert.Equal(Frame(4, 12).Select(f => (double)f), frame);
    }
}
