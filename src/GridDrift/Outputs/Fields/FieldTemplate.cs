using GridDrift.Formats;
using GridDrift.Frames;

namespace GridDrift.Outputs.Fields;

/// <summary>
/// What a field product copies from its input so it stands alone on the same grid: the frame's
/// dimensions in the input's own order, the coordinate variables along them (1-D coordinates,
/// 2-D auxiliary latitude/longitude, their bounds) and the grid_mapping variable, with values
/// unpacked to float64, and the data variable's descriptive attributes.
/// </summary>
internal sealed class FieldTemplate
{
    public sealed record CopiedVariable(string Name, string[] Dimensions, IReadOnlyList<NcAttribute> Attributes, double[] Values);

    static readonly HashSet<string> Packing = ["_FillValue", "missing_value", "scale_factor", "add_offset", "valid_min", "valid_max", "valid_range", "_Unsigned"];
    static readonly string[] Descriptive = ["standard_name", "long_name", "units", "coordinates", "grid_mapping"];

    /// <summary>Frame dimensions (name, length) in stored order, then any bounds dimensions the copies need.</summary>
    public IReadOnlyList<(string Name, long Length)> Dimensions { get; }
    public IReadOnlyList<string> FrameDimensions { get; }
    public IReadOnlyList<CopiedVariable> Variables { get; }
    public IReadOnlyList<NcAttribute> DataAttributes { get; }

    FieldTemplate(List<(string, long)> dims, List<string> frameDims, List<CopiedVariable> vars, List<NcAttribute> data)
    {
        Dimensions = dims;
        FrameDimensions = frameDims;
        Variables = vars;
        DataAttributes = data;
    }

    /// <param name="without">a frame dimension the product drops (e.g. the vertical one of a column integral)</param>
    public static FieldTemplate From(FrameSource source, string? without = null)
    {
        var reader = source.Template;
        var data = reader.RequireVariable(source.VariableName);
        var frameDims = source.FrameDimensions.Select(d => d.Name).Where(d => d != without).ToList();
        var dims = source.FrameDimensions.Where(d => d.Name != without).Select(d => (d.Name, d.Length)).ToList();
        var chosen = new List<NcVariable>();
        foreach (var v in reader.Variables)
        {
            bool coordinate = v.Rank == 1 && frameDims.Contains(v.Name) && v.Dimensions[0].Name == v.Name;
            bool auxiliary = source.Axes.Auxiliary.Contains(v) && v.Dimensions.All(d => frameDims.Contains(d.Name));
            if ((coordinate || auxiliary) && NcTypes.IsNumeric(v.Type)) chosen.Add(v);
        }
        foreach (var v in chosen.ToArray())
            if (v.Attributes.Text("bounds") is { } b && reader.FindVariable(b) is { } bounds && NcTypes.IsNumeric(bounds.Type)
                && bounds.Dimensions.Take(v.Rank).Select(d => d.Name).SequenceEqual(v.Dimensions.Select(d => d.Name)))
            {
                chosen.Add(bounds);
                foreach (var d in bounds.Dimensions.Skip(v.Rank))
                    if (!dims.Any(x => x.Item1 == d.Name)) dims.Add((d.Name, d.Length));
            }
        var copies = chosen.Select(v => Copy(reader, v)).ToList();
        if (source.Axes.GridMapping is { } gm)
            copies.Add(new CopiedVariable(gm.Name, [], gm.Attributes.Where(a => !Packing.Contains(a.Name)).Select(Classic).ToList(), [0]));
        var dataAttributes = data.Attributes.Where(a => Descriptive.Contains(a.Name) && a.Name is not ("units" or "coordinates")).Select(Classic).ToList();
        dataAttributes.Add(NcAttribute.Text("units", source.Units));
        // the dimensions the selection fixed (a level, a member) become CF scalar coordinates (CF §5.7), named in coordinates
        var scalars = source.Fixed.Select(f => new CopiedVariable(f.Coordinate?.Name ?? f.Dimension, [],
            f.Coordinate is { } c ? c.Attributes.Where(a => a.Name is "standard_name" or "long_name" or "units" or "positive" or "axis").Select(Classic).ToList()
                : [NcAttribute.Text("long_name", $"index along {f.Dimension}")],
            [f.Value ?? f.Index])).ToList();
        copies.AddRange(scalars);
        var coordinates = string.Join(' ', (data.Attributes.Text("coordinates") ?? "").Split(' ', StringSplitOptions.RemoveEmptyEntries)
            .Where(n => reader.FindVariable(n) is { } v && v.Dimensions.All(d => frameDims.Contains(d.Name)) && v.Rank > 0).Concat(scalars.Select(x => x.Name)));
        if (coordinates.Length > 0) dataAttributes.Add(NcAttribute.Text("coordinates", coordinates));
        return new FieldTemplate(dims, frameDims, copies, dataAttributes);
    }

    /// <summary>A regular or Gaussian latitude-longitude grid of our own making (a regrid target): lat, lon and their bounds.</summary>
    public static FieldTemplate ForGrid(GridDrift.Grids.Grid grid, IEnumerable<NcAttribute> dataAttributes)
    {
        if (!grid.IsRectilinear) throw new ArgumentException("only latitude-longitude target grids have a template");
        var lat = Enumerable.Range(0, grid.Rows).Select(j => grid.CenterLat[j * grid.Columns]).ToArray();
        var lon = Enumerable.Range(0, grid.Columns).Select(i => grid.CenterLon[i]).ToArray();
        var latBounds = Enumerable.Range(0, grid.Rows).SelectMany(j => new[] { grid.LatEdges![j], grid.LatEdges[j + 1] }).ToArray();
        var lonBounds = Enumerable.Range(0, grid.Columns).SelectMany(i => new[] { grid.LonEdges![i], grid.LonEdges[i + 1] }).ToArray();
        var vars = new List<CopiedVariable>
        {
            new("lat", ["lat"], [NcAttribute.Text("standard_name", "latitude"), NcAttribute.Text("units", "degrees_north"), NcAttribute.Text("bounds", "lat_bnds")], lat),
            new("lon", ["lon"], [NcAttribute.Text("standard_name", "longitude"), NcAttribute.Text("units", "degrees_east"), NcAttribute.Text("bounds", "lon_bnds")], lon),
            new("lat_bnds", ["lat", "nv"], [], latBounds),
            new("lon_bnds", ["lon", "nv"], [], lonBounds),
        };
        return new FieldTemplate([("lat", grid.Rows), ("lon", grid.Columns), ("nv", 2)], ["lat", "lon"], vars,
            dataAttributes.Where(a => Descriptive.Contains(a.Name) && a.Name is not ("coordinates" or "grid_mapping")).Select(Classic).ToList());
    }

    static CopiedVariable Copy(IDatasetReader reader, NcVariable v)
    {
        var raw = reader.ReadAllDoubles(v);
        double scale = v.Attributes.Find("scale_factor")?.FirstNumber() ?? 1, offset = v.Attributes.Find("add_offset")?.FirstNumber() ?? 0;
        if (scale != 1 || offset != 0)
            for (int i = 0; i < raw.Length; i++) raw[i] = raw[i] * scale + offset;
        return new CopiedVariable(v.Name, v.Dimensions.Select(d => d.Name).ToArray(), v.Attributes.Where(a => !Packing.Contains(a.Name)).Select(Classic).ToList(), raw);
    }

    /// <summary>netCDF-4 string attributes become classic text attributes.</summary>
    static NcAttribute Classic(NcAttribute a) => a.Type == NcType.String ? NcAttribute.Text(a.Name, a.AsText() ?? "") : a;

    public string? DataAttribute(string name) => DataAttributes.Text(name);
}
