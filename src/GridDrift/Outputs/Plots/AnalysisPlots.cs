using GridDrift.Analysis;
using GridDrift.Conventions.Time;
using ScottPlot;

namespace GridDrift.Outputs.Plots;

/// <summary>
/// The figures of the series analysis: a series with its events and change points; yearly event
/// counts with Sen trend lines before and after a change; a region × year importance heatmap.
/// Time runs in decimal years of the record's calendar. Written under a temporary name.
/// </summary>
internal static class AnalysisPlots
{
    public const int Width = 1200, Height = 600;

    /// <summary>Year + fraction of its days elapsed, in the time's own calendar.</summary>
    public static double DecimalYear(CfTime t)
    {
        long start = t.Calendar.DayNumber(t.Year, 1, 1);
        return t.Year + (t.Micros / (double)CfTime.MicrosPerDay - start) / t.Calendar.DaysInYear(t.Year);
    }

    public static void Series(string path, string region, string quantity, string units, CfTime[] times, double[] values, SeriesFindings found)
    {
        PlotFonts.Ensure();
        var plot = new Plot();
        var xs = times.Select(DecimalYear).ToArray();
        var line = plot.Add.ScatterLine(xs, values);
        line.LegendText = quantity;
        line.Color = Colors.SteelBlue;
        var ex = Enumerable.Range(0, values.Length).Where(i => found.Events[i]).ToArray();
        if (ex.Length > 0)
        {
            var marks = plot.Add.ScatterPoints(ex.Select(i => xs[i]).ToArray(), ex.Select(i => values[i]).ToArray());
            marks.Color = Colors.Red;
            marks.MarkerSize = 7;
            marks.LegendText = "events";
        }
        var palette = new ScottPlot.Palettes.Category10();
        int k = 0;
        foreach (var group in found.ChangePoints.GroupBy(c => c.Method))
        {
            var color = palette.GetColor(2 + k++);
            bool first = true;
            foreach (var c in group)
            {
                var v = plot.Add.VerticalLine(xs[c.FirstAfter]);
                v.Color = color;
                v.LinePattern = LinePattern.Dashed;
                if (first) v.LegendText = "change point (" + group.Key switch { ChangeMethod.Pettitt => "Pettitt", ChangeMethod.PeltMean => "PELT mean", _ => "PELT mean+variance" } + ")";
                first = false;
            }
        }
        YearTicks(plot, "0.#");
        plot.Title($"{quantity} of {region}: events and change points");
        plot.XLabel("year");
        plot.YLabel(units == "" ? quantity : $"{quantity} ({units})");
        plot.ShowLegend(Alignment.UpperLeft);
        Save(plot, path);
    }

    public static void YearlyCounts(string path, string region, IReadOnlyList<(long Year, int Count)> counts, double? changeYear)
    {
        PlotFonts.Ensure();
        var plot = new Plot();
        var bars = plot.Add.Bars(counts.Select(c => (double)c.Year).ToArray(), counts.Select(c => (double)c.Count).ToArray());
        bars.LegendText = "events per year";
        void Trend(IEnumerable<(long Year, int Count)> part, string label, Color color)
        {
            var p = part.ToArray();
            if (p.Length < 2) return;
            var sen = SenSlope.Compute(p.Select(c => (double)c.Year).ToArray(), p.Select(c => (double)c.Count).ToArray());
            var ends = new[] { (double)p[0].Year, (double)p[^1].Year };
            var l = plot.Add.ScatterLine(ends, ends.Select(x => sen.Intercept + sen.Slope * x).ToArray());
            l.Color = color;
            l.LineWidth = 2;
            l.LegendText = $"{label}: Sen slope {sen.Slope:0.##} per year";
        }
        if (changeYear is { } cy)
        {
            Trend(counts.Where(c => c.Year < cy), "before the change", Colors.DarkGreen);
            Trend(counts.Where(c => c.Year >= cy), "after the change", Colors.DarkRed);
        }
        else Trend(counts, "whole record", Colors.DarkGreen);
        plot.Axes.Bottom.SetTicks(counts.Select(c => (double)c.Year).ToArray(), counts.Select(c => c.Year.ToString(System.Globalization.CultureInfo.InvariantCulture)).ToArray());
        plot.Title($"Events per year in {region}");
        plot.XLabel("year");
        plot.YLabel("events");
        plot.ShowLegend(Alignment.UpperLeft);
        Save(plot, path);
    }

    public static void ImportanceHeatmap(string path, string target, IReadOnlyList<string> regions, IReadOnlyList<long> years, double[,] importance)
    {
        PlotFonts.Ensure();
        var plot = new Plot();
        // rows of the heatmap are regions (top first), columns years
        var map = plot.Add.Heatmap(importance);
        map.Colormap = new ScottPlot.Colormaps.Viridis();
        map.Extent = new CoordinateRect(-0.5, years.Count - 0.5, -0.5, regions.Count - 0.5);
        var bar = plot.Add.ColorBar(map);
        bar.Label = "permutation importance (rise in MSE)";
        plot.Axes.Bottom.SetTicks(Enumerable.Range(0, years.Count).Select(i => (double)i).ToArray(), years.Select(y => y.ToString()).ToArray());
        plot.Axes.Left.SetTicks(Enumerable.Range(0, regions.Count).Select(i => (double)(regions.Count - 1 - i)).ToArray(), regions.ToArray());
        plot.Title($"Which regions drive {target}, year by year");
        plot.XLabel("year");
        plot.YLabel("region");
        Save(plot, path);
    }

    /// <summary>Years without thousands separators.</summary>
    static void YearTicks(Plot plot, string format) =>
        plot.Axes.Bottom.TickGenerator = new ScottPlot.TickGenerators.NumericAutomatic
        {
            LabelFormatter = v => v.ToString(format, System.Globalization.CultureInfo.InvariantCulture),
        };

    static void Save(Plot plot, string path)
    {
        string temp = Path.Combine(Path.GetDirectoryName(Path.GetFullPath(path))!, "." + Path.GetFileName(path) + ".part.png");
        plot.SavePng(temp, Width, Height);
        File.Move(temp, path, overwrite: true);
    }
}
