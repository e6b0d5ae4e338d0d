using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Results;

namespace GridDrift.Outputs.Series;

/// <summary>
/// The series NetCDF of DESIGN.md: dimensions (time, region); region_name(region) as a char
/// array label (CF §6.1.1, an auxiliary coordinate named by each variable's coordinates
/// attribute), region_area(region) in m², one float64 variable per quantity with long_name,
/// units, cell_methods and coordinates; time keeps the input's units and calendar. One record
/// is appended per time step, so memory does not grow with the record.
/// </summary>
internal sealed class SeriesNetCdfWriter : ISeriesSink
{
    readonly ClassicWriter _writer;
    readonly ClassicWriter.Definition _time;
    readonly ClassicWriter.Definition[] _quantities;
    readonly ClassicWriter.Definition _valid;
    readonly ClassicWriter.Definition? _bounds;
    readonly SeriesLayout _layout;
    readonly double[] _row;
    readonly double[] _one = new double[1];
    readonly double[] _two = new double[2];
    long _record;

    public SeriesNetCdfWriter(string path, SeriesLayout layout, ClassicVariant? variant = null)
    {
        _layout = layout;
        _writer = ClassicWriter.Create(path, variant);
        var w = _writer;
        var time = w.AddDimension("time", 0, unlimited: true);
        var region = w.AddDimension("region", layout.Regions.Count);
        int strlen = Math.Max(1, layout.Regions.Max(r => System.Text.Encoding.UTF8.GetByteCount(r)));
        var nameLength = w.AddDimension("name_strlen", strlen);
        foreach (var (k, v) in layout.Provenance.AsKeyValues(layout.Attributes)) w.AddAttribute(NcAttribute.Global(k, v));

        var timeAttributes = new List<NcAttribute>
        {
            NcAttribute.Text("standard_name", "time"), NcAttribute.Text("long_name", "time"),
            NcAttribute.Text("units", layout.TimeUnits.Text), NcAttribute.Text("calendar", layout.CalendarAttribute), NcAttribute.Text("axis", "T"),
        };
        if (layout.HasTimeBounds) timeAttributes.Add(NcAttribute.Text("bounds", "time_bnds"));
        _time = w.AddVariable("time", NcType.Double, [time], timeAttributes);
        if (layout.HasTimeBounds)
        {
            var nv = w.AddDimension("nv", 2);
            // CF §7.1: bounds carry no units or calendar of their own; they are the time coordinate's.
            _bounds = w.AddVariable("time_bnds", NcType.Double, [time, nv], [NcAttribute.Text("long_name", "times of the earlier and the later frame of the pair")]);
        }
        var names = w.AddVariable("region_name", NcType.Char, [region, nameLength], [NcAttribute.Text("long_name", "region name")]);
        var scalars = (layout.Scalars ?? []).Select(c => (c.Value, Variable: w.AddVariable(c.Name, NcType.Double, [], ScalarCoordinates.Attributes(c)))).ToList();
        string coordinates = string.Join(' ', ["region_name", .. (layout.Scalars ?? []).Select(c => c.Name)]);
        var areas = w.AddVariable("region_area", NcType.Double, [region],
            [NcAttribute.Text("long_name", "area of the region on the sphere"), NcAttribute.Text("units", "m2"), NcAttribute.Text("coordinates", "region_name")]);
        _quantities = layout.Quantities.Select(q => w.AddVariable(q.Name, NcType.Double, [time, region],
            new[]
            {
                NcAttribute.Text("long_name", q.LongName), NcAttribute.Text("units", q.Units), NcAttribute.Text("cell_methods", q.CellMethods),
                NcAttribute.Text("coordinates", coordinates), NcAttribute.Of("_FillValue", double.NaN),
            }.Where(a => a.AsText() != ""))).ToArray();
        _valid = w.AddVariable("valid_fraction", NcType.Double, [time, region],
        [
            NcAttribute.Text("long_name", "area with data / region area"), NcAttribute.Text("units", "1"),
            NcAttribute.Text("coordinates", coordinates), NcAttribute.Of("_FillValue", double.NaN),
        ]);
        w.EndDefinitions();
        var nameBytes = new byte[layout.Regions.Count * strlen];
        for (int r = 0; r < layout.Regions.Count; r++)
            System.Text.Encoding.UTF8.GetBytes(layout.Regions[r]).CopyTo(nameBytes, r * strlen);
        w.Write<byte>(names, nameBytes);
        w.Write<double>(areas, layout.RegionAreas.ToArray());
        foreach (var (value, variable) in scalars) w.Write<double>(variable, [value]);
        _row = new double[layout.Regions.Count];
    }

    public void Write(CfTime time, ReadOnlySpan<double> values, ReadOnlySpan<double> validFraction, CfTime? earlier = null)
    {
        int nq = _layout.Quantities.Count, nr = _layout.Regions.Count;
        _one[0] = _layout.TimeUnits.Encode(time);
        _writer.WriteRecord<double>(_time, _record, _one);
        if (_bounds is not null)
        {
            _two[0] = _layout.TimeUnits.Encode(earlier ?? time);
            _two[1] = _one[0];
            _writer.WriteRecord<double>(_bounds, _record, _two);
        }
        for (int q = 0; q < nq; q++)
        {
            for (int r = 0; r < nr; r++) _row[r] = values[r * nq + q];
            _writer.WriteRecord<double>(_quantities[q], _record, _row);
        }
        _writer.WriteRecord<double>(_valid, _record, validFraction);
        _record++;
    }

    public void Complete() => _writer.Commit();

    public void Dispose() => _writer.Dispose();
}
