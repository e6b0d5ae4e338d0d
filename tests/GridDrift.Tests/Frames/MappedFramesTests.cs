using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Frames;

/// <summary>
/// Frames reached through mapped files decode to exactly what <see cref="FrameSource.ReadFrame"/>
/// returns, in every layout the classic formats allow: record variables interleaved with
/// others (the stride is longer than a frame), a fixed-size time dimension, CDF-1/2/5, a fill
/// value, NaN, and a record split over files. The values written are invented; the climatology
/// built on this path is checked against numpy in ClimatologyInteropTests (its NETCDF3 cases).
/// </summary>
public class MappedFramesTests
{
    const int Rows = 3, Columns = 7; // 21 cells: five groups of four and one left over

    static float Value(int t, int cell) => cell == 5 ? -999f : cell == 9 && t % 2 == 0 ? float.NaN : 250f + t + 0.125f * cell;

    static string Write(string path, ClassicVariant variant, int firstHour, int frames, bool record, bool second, IEnumerable<NcAttribute>? extra = null)
    {
        using var w = ClassicWriter.Create(path, variant);
        var time = w.AddDimension("time", record ? 0 : frames, unlimited: record);
        var lat = w.AddDimension("lat", Rows);
        var lon = w.AddDimension("lon", Columns);
        var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "hours since 2031-01-01"), NcAttribute.Text("calendar", "standard")]);
        var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
        var attributes = new List<NcAttribute> { NcAttribute.Text("units", "kg m-2"), NcAttribute.Of("_FillValue", -999f) };
        attributes.AddRange(extra ?? []);
        var v = w.AddVariable("tcwv", NcType.Float, [time, lat, lon], attributes);
        var q = second ? w.AddVariable("q", NcType.Float, [time, lat, lon]) : null;
        w.EndDefinitions();
        w.Write<float>(vlat, Enumerable.Range(0, Rows).Select(j => 10f * j).ToArray());
        w.Write<float>(vlon, Enumerable.Range(0, Columns).Select(i => 10f * i).ToArray());
        var frame = new float[Rows * Columns];
        if (record)
            for (int t = 0; t < frames; t++)
            {
                int hour = firstHour + t;
                for (int c = 0; c < frame.Length; c++) frame[c] = Value(hour, c);
                w.WriteRecord<double>(vt, t, [hour]);
                w.WriteRecord<float>(v, t, frame);
                if (q is not null) w.WriteRecord<float>(q, t, frame.Select(x => -x).ToArray());
            }
        else
        {
            w.Write<double>(vt, Enumerable.Range(firstHour, frames).Select(h => (double)h).ToArray());
            w.Write<float>(v, Enumerable.Range(firstHour, frames).SelectMany(h => Enumerable.Range(0, frame.Length).Select(c => Value(h, c))).ToArray());
        }
        w.Commit();
        return path;
    }

    static unsafe void AssertMappedEqualsRead(FrameSource source)
    {
        using var mapped = source.TryMap();
        Assert.NotNull(mapped);
        var read = new float[source.FrameLength];
        mapped!.Map(0, source.FrameCount - 1);
        for (int t = 0; t < source.FrameCount; t++)
        {
            source.ReadFrame(t, read);
            byte* at = mapped.Address(t);
            int c = 0;
            for (; c + 4 <= read.Length; c += 4)
            {
                var four = mapped.Decoder.Load4(at + 4 * c);
                for (int k = 0; k < 4; k++) Assert.Equal((double)read[c + k], four[k]);
            }
            for (; c < read.Length; c++) Assert.Equal((double)read[c], mapped.Decoder.Load(at + 4 * c));
        }
        Assert.True(double.IsNaN(mapped.Decoder.Load(mapped.Address(0) + 4 * 5)), "the fill value decodes to NaN");
    }

    [Theory]
    [InlineData(ClassicVariant.Cdf1, true, false)]
    [InlineData(ClassicVariant.Cdf2, true, true)]
    [InlineData(ClassicVariant.Cdf5, true, true)]
    [InlineData(ClassicVariant.Cdf2, false, false)]
    public void Mapped_frames_decode_to_the_values_read(ClassicVariant variant, bool record, bool second)
    {
        using var dir = new TempFolder();
        using var source = FrameSource.Open([Write(dir.File("a.nc"), variant, 0, 6, record, second)], "tcwv");
        AssertMappedEqualsRead(source);
    }

    [Fact]
    public void A_record_split_over_files_maps_each_file_in_its_window()
    {
        using var dir = new TempFolder();
        var later = Write(dir.File("b.nc"), ClassicVariant.Cdf5, 5, 4, record: true, second: false);
        var earlier = Write(dir.File("a.nc"), ClassicVariant.Cdf2, 0, 5, record: true, second: true);
        using var source = FrameSource.Open([later, earlier], "tcwv");
        AssertMappedEqualsRead(source);
        using var mapped = source.TryMap()!;
        mapped.Map(3, 6); // spans both files
        Assert.Throws<ArgumentOutOfRangeException>(() => { unsafe { _ = mapped.Address(7); } });
    }

    [Fact]
    public void Frames_needing_more_than_a_fill_value_are_read_not_mapped()
    {
        using var dir = new TempFolder();
        using (var ranged = FrameSource.Open([Write(dir.File("r.nc"), ClassicVariant.Cdf2, 0, 3, true, false, [NcAttribute.Of("valid_range", 0f, 300f)])], "tcwv"))
            Assert.Null(ranged.TryMap());
        using var converted = FrameSource.Open([Write(dir.File("u.nc"), ClassicVariant.Cdf2, 0, 3, true, false)], "tcwv");
        converted.ConvertUnits("g m-2");
        Assert.Null(converted.TryMap());
    }
}
