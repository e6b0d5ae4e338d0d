using GridDrift.Formats;
using GridDrift.Conventions.Time;
using GridDrift.Formats.Classic;

namespace GridDrift.Outputs.Fields;

/// <summary>
/// A field product in a classic NetCDF file: the input's frame dimensions and coordinates (from
/// a <see cref="FieldTemplate"/>), a time dimension first, and whatever variables the product
/// adds. Written under a temporary name and renamed by <see cref="Commit"/>.
/// </summary>
internal sealed class FieldNetCdfWriter : IDisposable
{
    readonly FieldTemplate _template;
    readonly List<(ClassicWriter.Definition Definition, double[] Values)> _copies = [];
    readonly Dictionary<string, NcDimension> _dimensions = [];

    public ClassicWriter Writer { get; }
    public NcDimension Time { get; }

    public FieldNetCdfWriter(string path, FieldTemplate template, long timeLength, ClassicVariant? format, IEnumerable<KeyValuePair<string, string>> globals)
    {
        _template = template;
        Writer = ClassicWriter.Create(path, format);
        foreach (var (k, v) in globals) Writer.AddAttribute(NcAttribute.Global(k, v));
        Time = timeLength < 0 ? Writer.AddDimension("time", 0, unlimited: true) : Writer.AddDimension("time", timeLength);
        foreach (var (name, length) in template.Dimensions) _dimensions[name] = Writer.AddDimension(name, length);
        foreach (var c in template.Variables)
            _copies.Add((Writer.AddVariable(c.Name, NcType.Double, c.Dimensions.Select(d => _dimensions[d]), c.Attributes), c.Values));
    }

    /// <summary>A further dimension; one the copies already brought is reused when its length agrees.</summary>
    public NcDimension AddDimension(string name, long length)
    {
        if (_dimensions.TryGetValue(name, out var d))
            return d.Length == length ? d : throw new InvalidOperationException($"dimension {name} exists with length {d.Length}, not {length}");
        return _dimensions[name] = Writer.AddDimension(name, length);
    }

    /// <summary>
    /// The CF time coordinate of a field product (CF §4.4): standard_name, long_name, units,
    /// calendar and axis, with a time_bnds(time, nv) variable named by its bounds attribute when
    /// the records are means over periods (CF §7.1). The one place field products define it.
    /// </summary>
    public (ClassicWriter.Definition Time, ClassicWriter.Definition? Bounds) DefineTime(TimeUnits units, string calendar, bool withBounds = false)
    {
        var attributes = new List<NcAttribute>
        {
            NcAttribute.Text("standard_name", "time"), NcAttribute.Text("long_name", "time"), NcAttribute.Text("units", units.Text),
            NcAttribute.Text("calendar", calendar), NcAttribute.Text("axis", "T"),
        };
        if (withBounds) attributes.Add(NcAttribute.Text("bounds", "time_bnds"));
        var time = Writer.AddVariable("time", NcType.Double, [Time], attributes);
        var bounds = withBounds ? Writer.AddVariable("time_bnds", NcType.Double, [Time, AddDimension("nv", 2)]) : null;
        return (time, bounds);
    }

    /// <summary>A float32 field over (time, frame dimensions) with the given attributes and the products' _FillValue.</summary>
    public ClassicWriter.Definition DefineField(string name, IEnumerable<NcAttribute> attributes) =>
        Writer.AddVariable(NcNames.Safe(name), NcType.Float, FieldDimensions(), attributes.Where(a => a.Name != "_FillValue").Append(NcAttribute.Of("_FillValue", ClimatologyNetCdfWriter.Fill)));

    /// <summary>The frame dimensions behind a leading time dimension.</summary>
    public IEnumerable<NcDimension> FieldDimensions() => new[] { Time }.Concat(_template.FrameDimensions.Select(d => _dimensions[d]));

    public void EndDefinitions()
    {
        Writer.EndDefinitions();
        foreach (var (definition, values) in _copies) Writer.Write<double>(definition, values);
    }

    public void Commit() => Writer.Commit();

    public void Dispose() => Writer.Dispose();
}
