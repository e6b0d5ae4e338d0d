using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Tests.Support;

/// <summary>Small invented files written by GridDrift's own writer, for tests whose witness lies elsewhere.</summary>
public static class SampleFiles
{
    /// <summary>A (time, lat, lon) float record with a regular grid; values are a function of the indices.</summary>
    public static string Record(string path, ClassicVariant variant = ClassicVariant.Cdf2, int frames = 4, int nlat = 3, int nlon = 4,
        double firstHour = 0, double stepHours = 3, string calendar = "standard", string variable = "tcwv", IEnumerable<double>? hours = null,
        float latOffset = 0, Func<int, int, bool>? missing = null, float[]? latitudes = null, float[]? longitudes = null)
    {
        using var w = ClassicWriter.Create(path, variant);
        var time = w.AddDimension("time", 0, unlimited: true);
        var lat = w.AddDimension("lat", nlat);
        var lon = w.AddDimension("lon", nlon);
        w.AddAttribute(NcAttribute.Text("Conventions", "CF-1.12"));
        var vt = w.AddVariable("time", NcType.Double, [time],
            [NcAttribute.Text("units", "hours since 2031-01-01 00:00:00"), NcAttribute.Text("calendar", calendar), NcAttribute.Text("standard_name", "time")]);
        var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
        var vd = w.AddVariable(variable, NcType.Float, [time, lat, lon], [NcAttribute.Text("units", "kg m-2"), NcAttribute.Of("_FillValue", -999f)]);
        w.EndDefinitions();
        w.Write<float>(vlat, latitudes ?? Enumerable.Range(0, nlat).Select(i => -60f + 120f * i / Math.Max(1, nlat - 1) + latOffset).ToArray());
        w.Write<float>(vlon, longitudes ?? Enumerable.Range(0, nlon).Select(i => 360f * i / nlon).ToArray());
        var times = (hours ?? Enumerable.Range(0, frames).Select(i => firstHour + i * stepHours)).ToArray();
        for (int t = 0; t < times.Length; t++)
        {
            w.WriteRecord<double>(vt, t, [times[t]]);
            w.WriteRecord<float>(vd, t, Enumerable.Range(0, nlat * nlon).Select(i => missing?.Invoke(t, i) == true ? -999f : (float)(times[t] + i * 0.25)).ToArray());
        }
        w.Commit();
        return path;
    }
}
