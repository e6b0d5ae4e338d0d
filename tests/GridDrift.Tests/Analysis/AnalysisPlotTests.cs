using GridDrift.Tests.Support;
using SkiaSharp;

namespace GridDrift.Tests.Analysis;

/// <summary>The analysis figures are drawn with their text: a title strip and axis labels that are not one flat colour.</summary>
public class AnalysisPlotTests
{
    [InteropFact(Needs.PythonNetcdf | Needs.Fonts)]
    public void Events_and_attribute_figures_have_titles_and_axis_labels()
    {
        using var dir = new TempFolder();
        string input = dir.File("series.nc"), plots = dir.File("plots");
        ExternalTools.RunPython("make_region_series.py", input, "2033-07-01");
        Assert.Equal(0, CliRun.Run("events", input, "--region", "east_box", "--out", dir.File("e.parquet"), "--plot", plots, "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("attribute", input, "--target", "global", "--out", dir.File("a.parquet"), "--plot", plots, "--quiet").ExitCode);
        foreach (var name in new[] { "series_east_box.png", "counts_east_box.png", "importance_heatmap.png" })
        {
            using var bitmap = SKBitmap.Decode(Path.Combine(plots, name));
            Assert.Equal(1200, bitmap.Width);
            Assert.True(Dark(bitmap, 0, 30) > 200, $"{name}: no title");
            Assert.True(Dark(bitmap, 550, 600) > 200, $"{name}: no x-axis tick labels or label");
        }
    }

    static int Dark(SKBitmap bitmap, int from, int to)
    {
        int count = 0;
        for (int y = from; y < to; y++)
            for (int x = 0; x < bitmap.Width; x++)
            {
                var c = bitmap.GetPixel(x, y);
                if (c.Red + c.Green + c.Blue < 200) count++;
            }
        return count;
    }
}
