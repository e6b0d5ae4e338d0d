using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Benchmarks;

/// <summary>The header of the benchmarks' invented hourly brightness-temperature records: time (unlimited), lat, lon and the field.</summary>
internal static class InventedRecords
{
    /// <summary>Defines the record, ends the definitions and writes the axes (float64); returns the time and field variables.</summary>
    public static (ClassicWriter.Definition Time, ClassicWriter.Definition Field) Begin(ClassicWriter w, string title, string variable, double[] lat, double[] lon)
    {
        var time = w.AddDimension("time", 0, unlimited: true);
        var y = w.AddDimension("lat", lat.Length);
        var x = w.AddDimension("lon", lon.Length);
        w.AddAttribute(NcAttribute.Text("title", title));
        var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "hours since 2031-01-01"), NcAttribute.Text("calendar", "standard"), NcAttribute.Text("standard_name", "time")]);
        var vlat = w.AddVariable("lat", NcType.Double, [y], [NcAttribute.Text("units", "degrees_north"), NcAttribute.Text("standard_name", "latitude")]);
        var vlon = w.AddVariable("lon", NcType.Double, [x], [NcAttribute.Text("units", "degrees_east"), NcAttribute.Text("standard_name", "longitude")]);
        var v = w.AddVariable(variable, NcType.Float, [time, y, x], [NcAttribute.Text("units", "K"), NcAttribute.Text("standard_name", "toa_brightness_temperature")]);
        w.EndDefinitions();
        w.Write<double>(vlat, lat);
        w.Write<double>(vlon, lon);
        return (vt, v);
    }
}
