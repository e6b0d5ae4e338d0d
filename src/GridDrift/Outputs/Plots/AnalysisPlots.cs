using GridDrift.Analysis;
using GridDrift.Conventions.Time;
using ScottPlot;

namespace GridDrift.Outputs.Plots;

/// <summary>
/// The figures of the series analysis: a series with its events and changes; monthly event
/// counts with the event-rate change; a region × year importance heatmap. Time runs in decimal
/// years of the record's calendar, ticked and labelled as dates. Written under a temporary name.
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

    /// <summary>Changes drawn distinguishably: Pettitt solid, PELT mean dashed, PELT mean+variance dotted, the event rate dash-dotted.</summary>
    static (Color Color, LinePattern Pattern, string Name) Style(ChangeMethod m) => m switch
    {
        ChangeMethod.Pettitt => (Colors.DarkRed, LinePattern.Solid, "Pettitt"),
        ChangeMethod.PeltMean => (Colors.DarkOrange, LinePattern.Dashed, "PELT mean"),
        ChangeMethod.PeltMeanVariance => (Colors.Purple, LinePattern.Dotted, "PELT mean+variance"),
        _ => (Colors.DarkGreen, LinePattern.DenselyDashed, "event rate"),
    };

    /// <summary>
    /// The series with its events and the changes that survive the false-discovery control
    /// (q &lt; <paramref name="alpha"/>), each with its date interval shaded; the legend sits outside the data.
    /// </summary>
    public static void Series(string path, string region, string quantity, string units, CfTime[] times, double[] values, SeriesFindings found, double alpha)
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
        DrawChanges(plot, xs, found.ChangePoints.Where(c => c.Method != ChangeMethod.EventRate && c.Q < alpha));
        DateTicks(plot, times);
        plot.Title($"{quantity} of {region}: events and changes (q < {alpha:0.##})");
        plot.XLabel("date");
        plot.YLabel(units == "" ? quantity : $"{quantity} ({units})");
        plot.ShowLegend(Edge.Right);
        Save(plot, path);
    }

    static void DrawChanges(Plot plot, double[] xs, IEnumerable<ChangePoint> changes)
    {
        var named = new HashSet<ChangeMethod>();
        foreach (var c in changes)
        {
            var (color, pattern, name) = Style(c.Method);
            if (c.Low >= 0 && c.High > c.Low)
            {
                var span = plot.Add.HorizontalSpan(xs[c.Low], xs[c.High]);
                span.FillStyle.Color = color.WithAlpha(0.15);
                span.LineStyle.Width = 0;
            }
            var v = plot.Add.VerticalLine(xs[c.FirstAfter]);
            v.Color = color;
            v.LinePattern = pattern;
            v.LineWidth = 2;
            if (named.Add(c.Method)) v.LegendText = $"{name} change, 95 % date interval shaded";
        }
    }

    /// <summary>
    /// Monthly event counts (twelfths of the year from the first time, as the event-rate test
    /// counts them), the event-rate change where it survives the false-discovery control with its
    /// date interval, the mean count on either side, and a Sen trend line with its 95 % interval
    /// only for a side of at least <see cref="TrendMonths"/> months (fewer cannot carry a trend).
    /// </summary>
    public static void EventCounts(string path, string region, CfTime[] times, bool[] events, SeriesFindings found, double alpha)
    {
        PlotFonts.Ensure();
        var plot = new Plot();
        var xs = times.Select(DecimalYear).ToArray();
        double origin = xs[0], month = 1.0 / 12;
        int bins = (int)Math.Floor((xs[^1] - origin) / month) + 1;
        var counts = new double[bins];
        for (int i = 0; i < xs.Length; i++) if (events[i]) counts[(int)Math.Floor((xs[i] - origin) / month)]++;
        var centres = Enumerable.Range(0, bins).Select(b => origin + (b + 0.5) * month).ToArray();
        var bars = plot.Add.Bars(centres, counts);
        foreach (var bar in bars.Bars) { bar.Size = month * 0.9; bar.LineWidth = 0; bar.FillColor = Colors.SlateGray; }
        bars.LegendText = "events per month";
        var change = found.ChangePoints.FirstOrDefault(c => c.Method == ChangeMethod.EventRate && c.Q < alpha);
        if (change is not null)
        {
            DrawChanges(plot, xs, [change]);
            int split = Math.Clamp((int)Math.Floor((xs[change.FirstAfter] - origin) / month), 1, bins - 1);
            Side(plot, centres[..split], counts[..split], "before", Colors.Navy);
            Side(plot, centres[split..], counts[split..], "after", Colors.DarkRed);
        }
        else Side(plot, centres, counts, "whole record", Colors.Navy);
        DateTicks(plot, times);
        plot.Axes.Left.TickGenerator = new ScottPlot.TickGenerators.NumericAutomatic { IntegerTicksOnly = true };
        plot.Axes.SetLimitsY(0, Math.Max(1, counts.Max()) * 1.15);
        plot.Title($"Events per month in {region}" + (change is null ? " (no change of the event rate at q < " + alpha.ToString("0.##", System.Globalization.CultureInfo.InvariantCulture) + ")" : ""));
        plot.XLabel("date");
        plot.YLabel("events (count)");
        plot.ShowLegend(Edge.Right);
        Save(plot, path);
    }

    /// <summary>Months a side needs before a trend line is drawn through it.</summary>
    public const int TrendMonths = 24;

    static void Side(Plot plot, double[] x, double[] counts, string label, Color color)
    {
        if (x.Length == 0) return;
        double mean = counts.Average();
        var level = plot.Add.ScatterLine(new[] { x[0], x[^1] }, new[] { mean, mean });
        level.Color = color;
        level.LineWidth = 2;
        level.LegendText = $"mean {label}: {mean:0.#} per month";
        if (x.Length < TrendMonths) return;
        var sen = SenSlope.Compute(x, counts);
        double xm = x[x.Length / 2], ym = RobustStatistics.Median(counts);
        foreach (var (slope, pattern, text) in new[] { (sen.Slope, LinePattern.Solid, $"Sen trend {label}: {sen.Slope:0.##} per year"), (sen.Low, LinePattern.Dotted, "95 % interval of the slope"), (sen.High, LinePattern.Dotted, "") })
        {
            var l = plot.Add.ScatterLine(new[] { x[0], x[^1] }, new[] { ym + slope * (x[0] - xm), ym + slope * (x[^1] - xm) });
            l.Color = color.WithAlpha(0.8);
            l.LinePattern = pattern;
            l.LegendText = text;
        }
    }

    /// <summary>Ticks at the first day of each year (and of each quarter for records under four years), labelled as dates.</summary>
    static void DateTicks(Plot plot, CfTime[] times)
    {
        long first = times[0].Year, last = times[^1].Year + 1;
        int perYear = last - first < 4 ? 4 : 1;
        var positions = new List<double>();
        var labels = new List<string>();
        for (long y = first; y <= last; y++)
            for (int q = 0; q < perYear; q++)
            {
                double at = y + q / (double)perYear;
                if (at < DecimalYear(times[0]) - 1e-9 || at > DecimalYear(times[^1]) + 1e-9) continue;
                positions.Add(at);
                labels.Add($"{y:0000}-{1 + 12 * q / perYear:00}-01");
            }
        plot.Axes.Bottom.SetTicks(positions.ToArray(), labels.ToArray());
    }

    public static void ImportanceHeatmap(string path, string target, IReadOnlyList<string> regions, IReadOnlyList<long> years, double[,] importance)
    {
        PlotFonts.Ensure();
        var plot = new Plot();
        // rows of the heatmap are regions (top first), columns years
        var map = plot.Add.Heatmap(importance);
        map.Colormap = new ScottPlot.Colormaps.Viridis();
        // the extent places the centres of the edge cells, so the ticks at 0 … n − 1 sit on the cells' centres
        map.Extent = new CoordinateRect(0, Math.Max(1, years.Count - 1), 0, Math.Max(1, regions.Count - 1));
        var bar = plot.Add.ColorBar(map);
        bar.Label = "permutation importance (rise in MSE)";
        plot.Axes.Bottom.SetTicks(Enumerable.Range(0, years.Count).Select(i => (double)i).ToArray(), years.Select(y => y.ToString()).ToArray());
        plot.Axes.Left.SetTicks(Enumerable.Range(0, regions.Count).Select(i => (double)(regions.Count - 1 - i)).ToArray(), regions.ToArray());
        plot.Title($"Which regions drive {target}, year by year");
        plot.XLabel("year");
        plot.YLabel("region");
        Save(plot, path);
    }

    static void Save(Plot plot, string path)
    {
        string temp = Path.Combine(Path.GetDirectoryName(Path.GetFullPath(path))!, "." + Path.GetFileName(path) + ".part.png");
        plot.SavePng(temp, Width, Height);
        File.Move(temp, path, overwrite: true);
    }
}
