using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Grids.Regridding;

/// <summary>
/// Remap weights in a NetCDF layout of our own: both grids described by their cell edges
/// (source_lat_edges, source_lon_edges, target_lat_edges, target_lon_edges, and
/// source_columns_first for the source's frame order), and the CSR matrix — row_start(target_edges),
/// column(entry) = source frame position, weight(entry), target_weight(target_cell). A saved file is
/// reused only for the same grids and method.
/// </summary>
internal static class WeightsFile
{
    public static void Save(string path, RemapWeights w, Grid source, Grid target)
    {
        using var f = ClassicWriter.Create(path);
        f.AddAttribute(NcAttribute.Text("title", "GridDrift remap weights"));
        f.AddAttribute(NcAttribute.Text("remap_method", w.Method));
        f.AddAttribute(NcAttribute.Text("layout", "CSR: entries row_start[t] .. row_start[t+1]-1 of column and weight belong to target cell t (row-major lat, lon); column = position in a source frame"));
        f.AddAttribute(NcAttribute.Of("source_columns_first", source.ColumnsFirst ? 1 : 0));
        var defs = new List<(ClassicWriter.Definition, double[])>();
        void Edges(string name, double[] values)
        {
            var d = f.AddDimension(name + "_n", values.Length);
            defs.Add((f.AddVariable(name, NcType.Double, [d], [NcAttribute.Text("units", name.Contains("lat") ? "degrees_north" : "degrees_east")]), values));
        }
        Edges("source_lat_edges", source.LatEdges!);
        Edges("source_lon_edges", source.LonEdges!);
        Edges("target_lat_edges", target.LatEdges!);
        Edges("target_lon_edges", target.LonEdges!);
        var edges = f.AddDimension("target_edges", w.TargetCells + 1);
        var cells = f.AddDimension("target_cell", w.TargetCells);
        var entry = f.AddDimension("entry", Math.Max(1, w.Column.Length));
        var rowStart = f.AddVariable("row_start", NcType.Int, [edges]);
        var column = f.AddVariable("column", NcType.Int, [entry]);
        var weight = f.AddVariable("weight", NcType.Double, [entry], [NcAttribute.Text("units", w.Method.StartsWith("conservative", StringComparison.Ordinal) ? "m2" : "1")]);
        var full = f.AddVariable("target_weight", NcType.Double, [cells]);
        f.EndDefinitions();
        foreach (var (d, v) in defs) f.Write<double>(d, v);
        f.Write<int>(rowStart, w.RowStart);
        f.Write<int>(column, w.Column.Length == 0 ? [0] : w.Column);
        f.Write<double>(weight, w.Weight.Length == 0 ? [0] : w.Weight);
        f.Write<double>(full, w.TargetWeight);
        f.Commit();
    }

    /// <summary>The saved weights, or null when the file describes other grids or another method.</summary>
    public static RemapWeights? Load(string path, Grid source, Grid target, string method)
    {
        using var r = DatasetFiles.Open(path);
        bool Same(string name, double[] edges)
        {
            var v = r.FindVariable(name);
            if (v is null || v.ElementCount != edges.Length) return false;
            var saved = r.ReadAllDoubles(v);
            for (int i = 0; i < edges.Length; i++) if (Math.Abs(saved[i] - edges[i]) > 1e-9) return false;
            return true;
        }
        string savedMethod = r.Attributes.Text("remap_method") ?? "";
        if (!savedMethod.StartsWith(method, StringComparison.Ordinal)) return null;
        if (!Same("source_lat_edges", source.LatEdges!) || !Same("source_lon_edges", source.LonEdges!) || !Same("target_lat_edges", target.LatEdges!) || !Same("target_lon_edges", target.LonEdges!))
            return null;
        if ((r.Attributes.Find("source_columns_first")?.FirstNumber() ?? 0) != (source.ColumnsFirst ? 1 : 0)) return null;
        var rowStart = r.ReadAllDoubles(r.RequireVariable("row_start")).Select(v => (int)v).ToArray();
        int n = rowStart[^1];
        var column = r.ReadAllDoubles(r.RequireVariable("column")).Take(n).Select(v => (int)v).ToArray();
        var weight = r.ReadAllDoubles(r.RequireVariable("weight")).Take(n).ToArray();
        if (rowStart.Length != target.CellCount + 1 || column.Any(c => c < 0 || c >= source.CellCount))
            throw new BadInputException(path, "row_start", "does not fit the grids it describes");
        return new RemapWeights
        {
            SourceCells = source.CellCount, TargetCells = target.CellCount, RowStart = rowStart, Column = column, Weight = weight,
            TargetWeight = r.ReadAllDoubles(r.RequireVariable("target_weight")), Method = savedMethod,
        };
    }
}
