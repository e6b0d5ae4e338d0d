using GridDrift.Grids;

namespace GridDrift.Tests.Support;

/// <summary>Global latitude-longitude grids in the layouts files use, for property tests of the box paths.</summary>
internal static class GlobalGrids
{
    /// <summary>Layout 0–3: 3° or 2° cells (even/odd), latitudes ascending (0, 1) or descending (2, 3), longitudes 0..360 (even) or -180..180 (odd).</summary>
    public static Grid Of(int layout)
    {
        double d = layout % 2 == 0 ? 3 : 2;
        int rows = (int)(180 / d), columns = (int)(360 / d);
        var lat = Enumerable.Range(0, rows).Select(j => -90 + d / 2 + j * d).ToArray();
        if (layout >= 2) Array.Reverse(lat);
        var lon = Enumerable.Range(0, columns).Select(i => (layout % 2 == 0 ? 0 : -180) + d / 2 + i * d).ToArray();
        return RectilinearGrid.Build(lat, lon);
    }
}
