using GridDrift.Tests.Support;
using SkiaSharp;

namespace GridDrift.Tests.Regions;

/// <summary>
/// `griddrift regions`: the mask file read back by python netCDF4 (region areas against the zone
/// formula, the CSR rows against the cell areas) and the PNG map decoded by SkiaSharp.
/// </summary>
public class RegionsCommandTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void The_mask_file_reads_in_python_netCDF4_with_zone_areas_and_consistent_rows()
    {
        using var dir = new TempFolder();
        string grid = SampleFiles.Record(dir.File("grid.nc"), nlat: 7, nlon: 12, hours: [0]); // latitudes −60 … 60 by 20
        string mask = dir.File("mask.nc");
        var outcome = CliRun.Run("regions", "--grid", grid, "--regions", "global", "bands:45", "--out", mask, "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        var dump = ReferenceDump.Of(mask);
        var names = ReferenceDump.Numbers(dump.Variable("region_name").GetProperty("values"));
        var area = ReferenceDump.Numbers(dump.Variable("region_area").GetProperty("values"));
        var rowStart = ReferenceDump.Numbers(dump.Variable("row_start").GetProperty("values")).Select(v => (int)v).ToArray();
        var cell = ReferenceDump.Numbers(dump.Variable("cell_index").GetProperty("values")).Select(v => (int)v).ToArray();
        var fraction = ReferenceDump.Numbers(dump.Variable("cell_fraction").GetProperty("values"));
        var cellArea = ReferenceDump.Numbers(dump.Variable("cell_area").GetProperty("values"));
        Assert.Equal(5, area.Length); // global + 4 bands of 45°
        double R = 6371008.8;
        // the grid's cells span −70 … 70 (midpoint edges, half a step beyond the outer centres)
        Assert.Equal(1, area[0] / (2 * Math.PI * R * R * 2 * Math.Sin(70 * Math.PI / 180)), 12);
        Assert.Equal(1, area[2] / (2 * Math.PI * R * R * Math.Sin(45 * Math.PI / 180)), 12); // band_s45_n00: the grid covers all of it
        for (int r = 0; r < area.Length; r++)
        {
            double sum = 0;
            for (int k = rowStart[r]; k < rowStart[r + 1]; k++) sum += fraction[k] * cellArea[cell[k]];
            Assert.Equal(1, sum / area[r], 6); // fractions are float32
        }
        Assert.Equal(84, cellArea.Length);
        Assert.NotEmpty(names);
    }

    [InteropFact(Needs.Fonts)]
    public void The_PNG_map_has_the_requested_size_and_drawn_text()
    {
        using var dir = new TempFolder();
        string grid = SampleFiles.Record(dir.File("grid.nc"), nlat: 19, nlon: 36, hours: [0]);
        string png = dir.File("map.png");
        var outcome = CliRun.Run("regions", "--grid", grid, "--regions", "global", "bands:30", "box:pacific=-15,15,150,-90",
            "--out", dir.File("mask.nc"), "--png", png, "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        using var bitmap = SKBitmap.Decode(png);
        Assert.Equal(1200, bitmap.Width);
        Assert.Equal(700, bitmap.Height);
        // The title is drawn in the top strip and the axis labels at the bottom: if fonts were missing,
        // ScottPlot would draw nothing there and the strip would be one flat colour.
        Assert.True(DarkPixels(bitmap, 0, 30) > 200, "no title text in the map");
        Assert.True(DarkPixels(bitmap, 670, 700) > 200, "no axis label text in the map");
    }

    static int DarkPixels(SKBitmap bitmap, int fromRow, int toRow)
    {
        int count = 0;
        for (int y = fromRow; y < toRow; y++)
            for (int x = 0; x < bitmap.Width; x++)
            {
                var c = bitmap.GetPixel(x, y);
                if (c.Red + c.Green + c.Blue < 200) count++;
            }
        return count;
    }
}
