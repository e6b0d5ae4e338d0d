using GridDrift.Grids;
using GridDrift.Regions;
using ScottPlot;

namespace GridDrift.Outputs.Plots;

/// <summary>A map of regions over the grid's domain: coastlines, outlines and names on longitude/latitude axes; the coastlines' source is credited under the axis.</summary>
internal static class RegionMapPlot
{
    public static void Save(string path, Grid grid, IReadOnlyList<RegionShape> regions, RegionMask mask, string title)
    {
        PlotFonts.Ensure();
        var plot = new Plot();
        double lonMin = grid.CenterLon.Where(double.IsFinite).Min(), lonMax = grid.CenterLon.Where(double.IsFinite).Max();
        double latMin = grid.CenterLat.Where(double.IsFinite).Min(), latMax = grid.CenterLat.Where(double.IsFinite).Max();
        bool wide = lonMax > 180;
        double left = wide ? 0 : -180, right = wide ? 360 : 180;

        // the cells of the grid, as a light dot cloud (thinned for large grids)
        int stride = Math.Max(1, grid.CellCount / 20000);
        var xs = new List<double>();
        var ys = new List<double>();
        for (int c = 0; c < grid.CellCount; c += stride)
            if (grid.CellArea[c] > 0) { xs.Add(Wrap(grid.CenterLon[c], left)); ys.Add(grid.CenterLat[c]); }
        var cells = plot.Add.ScatterPoints(xs.ToArray(), ys.ToArray());
        cells.MarkerSize = 1;
        cells.Color = Colors.LightGray;
        foreach (var (x, y) in Coastlines.Wrapped(left))
        {
            var coast = plot.Add.ScatterLine(x, y);
            coast.Color = Colors.DimGray;
            coast.LineWidth = 0.8f;
            coast.MarkerSize = 0;
        }

        bool label = regions.Count <= 60;
        float fontSize = regions.Count <= 12 ? 12 : regions.Count <= 30 ? 9 : 7;
        var palette = new ScottPlot.Palettes.Category10();
        for (int r = 0; r < regions.Count; r++)
        {
            var color = palette.GetColor(r);
            var (lx, ly) = Outline(plot, grid, regions[r], left, right, latMin, latMax, lonMin, lonMax, color);
            if (label)
            {
                var text = plot.Add.Text(regions[r].Name, lx, ly);
                text.LabelFontSize = fontSize;
                text.LabelFontColor = color;
                text.LabelAlignment = Alignment.MiddleCenter;
            }
        }
        plot.Title(title);
        // the regions are named on the map; the only other thing drawn, the coastline, is credited under the axis
        plot.XLabel($"longitude (degrees east); {Coastlines.Attribution}");
        plot.YLabel("latitude (degrees north)");
        plot.Axes.SetLimits(left, right, -90, 90);
        if (!label)
        {
            var note = plot.Add.Text($"{regions.Count} regions: names in the mask file", left + 5, -85);
            note.LabelFontSize = 11;
        }
        string temp = Path.Combine(Path.GetDirectoryName(Path.GetFullPath(path))!, "." + Path.GetFileName(path) + ".part.png");
        plot.SavePng(temp, 1200, 700);
        File.Move(temp, path, overwrite: true);
    }

    static double Wrap(double lon, double left)
    {
        double x = lon;
        while (x < left) x += 360;
        while (x >= left + 360) x -= 360;
        return x;
    }

    static (double X, double Y) Outline(Plot plot, Grid grid, RegionShape region, double left, double right, double latMin, double latMax,
        double lonMin, double lonMax, Color color)
    {
        switch (region)
        {
            case LatLonBox b:
            {
                double w = Wrap(b.West, left), e = w + (b.EastUnwrapped - b.West);
                foreach (double shift in new[] { 0.0, -360.0 })
                {
                    if (e + shift <= left || w + shift >= right) continue;
                    var rect = plot.Add.Rectangle(Math.Max(left, w + shift), Math.Min(right, e + shift), b.South, b.North);
                    rect.FillStyle.Color = color.WithAlpha(0.08);
                    rect.LineStyle.Color = color;
                    rect.LineStyle.Width = 1.5f;
                }
                // full-width bands are labelled near the left edge, out of the way of boxes in the middle
                double cx = e - w >= 359.99 ? left + 30 : Wrap(0.5 * (w + e), left);
                return (cx, 0.5 * (b.South + b.North));
            }
            case PolygonRegion p:
            {
                double sx = 0, sy = 0;
                int n = 0;
                foreach (var polygon in p.Polygons)
                {
                    foreach (var ring in polygon)
                    {
                        var line = plot.Add.ScatterLine(ring.Select(q => Wrap(q.Lon, left)).ToArray(), ring.Select(q => q.Lat).ToArray());
                        line.Color = color;
                        line.LineWidth = 1.5f;
                    }
                    foreach (var q in polygon[0]) { sx += q.Lon; sy += q.Lat; n++; }
                }
                return n == 0 ? (0, 0) : (Wrap(sx / n, left), sy / n);
            }
            default:
            {
                if (grid.IsRectilinear)
                {
                    lonMin = grid.LonEdges!.Min(); lonMax = grid.LonEdges!.Max();
                    latMin = grid.LatEdges!.Min(); latMax = grid.LatEdges!.Max();
                }
                var rect = plot.Add.Rectangle(Math.Max(left, lonMin), Math.Min(right, lonMax), latMin, latMax);
                rect.FillStyle.Color = color.WithAlpha(0.05);
                rect.LineStyle.Color = color;
                rect.LineStyle.Width = 1.5f;
                return (Math.Max(left, lonMin) + 30, latMax - 5);
            }
        }
    }
}
