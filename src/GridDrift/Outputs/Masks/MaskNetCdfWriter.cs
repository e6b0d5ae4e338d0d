using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Grids;
using GridDrift.Regions;
using GridDrift.Results;

namespace GridDrift.Outputs.Masks;

/// <summary>
/// The region mask file: CF metadata around a compact layout of our own. region_name(region)
/// and region_area(region) (m²) label the regions; cell_area(y, x) (standard_name cell_area)
/// holds the exact cell areas; the regions' cells are stored row by row (CSR): the entries
/// row_start[r] … row_start[r+1]−1 of cell_index (the cell's position in a frame, row-major
/// over the grid's y and x) and cell_fraction (the part of the cell inside region r) belong
/// to region r. The grid's coordinates are copied so the file stands alone.
/// </summary>
internal static class MaskNetCdfWriter
{
    public static void Write(string path, Grid grid, RegionMask mask, IReadOnlyList<string> specs, Provenance provenance, ClassicVariant? variant = null)
    {
        using var w = ClassicWriter.Create(path, variant);
        foreach (var (k, v) in provenance.AsKeyValues(new Dictionary<string, string>
        {
            ["title"] = "GridDrift region mask",
            ["regions"] = string.Join(" ", specs),
            ["earth_radius_m"] = grid.EarthRadius.ToString("R", System.Globalization.CultureInfo.InvariantCulture),
            ["mask_layout"] = "CSR: entries row_start[r] .. row_start[r+1]-1 of cell_index and cell_fraction belong to region r; cell_index = y * nx + x",
            ["cover_method"] = grid.IsRectilinear
                ? "exact lat-lon rectangle overlap for boxes; 8 x 8 area-weighted samples per cell for polygons"
                : "8 x 8 samples per cell (bilinear in the cell's corners)",
        })) w.AddAttribute(NcAttribute.Global(k, v));
        var region = w.AddDimension("region", mask.Count);
        var strlen = w.AddDimension("name_strlen", Math.Max(1, mask.Names.Max(n => System.Text.Encoding.UTF8.GetByteCount(n))));
        var starts = w.AddDimension("region_edges", mask.Count + 1);
        var entry = w.AddDimension("entry", Math.Max(1, mask.EntryCount));
        var y = w.AddDimension("y", grid.Rows);
        var x = w.AddDimension("x", grid.Columns);
        var names = w.AddVariable("region_name", NcType.Char, [region, strlen], [NcAttribute.Text("long_name", "region name")]);
        var area = w.AddVariable("region_area", NcType.Double, [region],
            [NcAttribute.Text("long_name", "area of the region on the sphere"), NcAttribute.Text("units", "m2"), NcAttribute.Text("coordinates", "region_name")]);
        var rowStart = w.AddVariable("row_start", NcType.Int, [starts], [NcAttribute.Text("long_name", "first entry of each region (CSR row pointer); last value = number of entries")]);
        var cellIndex = w.AddVariable("cell_index", NcType.Int, [entry], [NcAttribute.Text("long_name", "position of the cell in a frame (y * nx + x)")]);
        // float64: a thin sliver of a cell keeps its digits, and fraction × cell area gives the area inside as computed
        var fraction = w.AddVariable("cell_fraction", NcType.Double, [entry],
            [NcAttribute.Text("long_name", "fraction of the cell's area inside the region"), NcAttribute.Text("units", "1"), NcAttribute.Of("valid_range", 0.0, 1.0)]);
        var cellArea = w.AddVariable("cell_area", NcType.Double, [y, x],
            [NcAttribute.Text("standard_name", "cell_area"), NcAttribute.Text("units", "m2"), NcAttribute.Text("coordinates", "lat lon")]);
        ClassicWriter.Definition lat, lon;
        if (grid.IsRectilinear)
        {
            lat = w.AddVariable("lat", NcType.Double, [y], [NcAttribute.Text("standard_name", "latitude"), NcAttribute.Text("units", "degrees_north")]);
            lon = w.AddVariable("lon", NcType.Double, [x], [NcAttribute.Text("standard_name", "longitude"), NcAttribute.Text("units", "degrees_east")]);
        }
        else
        {
            lat = w.AddVariable("lat", NcType.Double, [y, x], [NcAttribute.Text("standard_name", "latitude"), NcAttribute.Text("units", "degrees_north")]);
            lon = w.AddVariable("lon", NcType.Double, [y, x], [NcAttribute.Text("standard_name", "longitude"), NcAttribute.Text("units", "degrees_east")]);
        }
        w.EndDefinitions();
        int width = (int)strlen.Length;
        var nameBytes = new byte[mask.Count * width];
        for (int r = 0; r < mask.Count; r++) System.Text.Encoding.UTF8.GetBytes(mask.Names[r]).CopyTo(nameBytes, r * width);
        w.Write<byte>(names, nameBytes);
        w.Write<double>(area, mask.RegionArea);
        w.Write<int>(rowStart, mask.RowStart);
        w.Write<int>(cellIndex, mask.EntryCount == 0 ? [0] : RowMajor(grid, mask.Cells));
        w.Write<double>(fraction, mask.EntryCount == 0 ? [0.0] : mask.Fraction);
        w.Write<double>(cellArea, grid.CellArea);
        if (grid.IsRectilinear)
        {
            w.Write<double>(lat, Enumerable.Range(0, grid.Rows).Select(j => grid.CenterLat[j * grid.Columns]).ToArray());
            w.Write<double>(lon, grid.CenterLon.AsSpan(0, grid.Columns));
        }
        else
        {
            w.Write<double>(lat, grid.CenterLat);
            w.Write<double>(lon, grid.CenterLon);
        }
        w.Commit();
    }

    /// <summary>Frame positions to y * nx + x, whatever order the frame stores its axes in.</summary>
    static int[] RowMajor(Grid grid, int[] frameIndex)
    {
        if (!grid.ColumnsFirst) return frameIndex;
        return frameIndex.Select(f => (f % grid.Rows) * grid.Columns + f / grid.Rows).ToArray();
    }
}
