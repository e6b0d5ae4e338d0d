using GridDrift.Conventions.Time;
namespace GridDrift.Analysis;

internal sealed record RegionImportance(int Region, double Importance, double Spread);

internal sealed record AttributionResult(
    Ridge Model,
    double R2,
    IReadOnlyList<RegionImportance> Overall,
    IReadOnlyDictionary<long, IReadOnlyList<RegionImportance>> ByYear,
    double[,] Shapley);

/// <summary>
/// Which regions explain a target series: a ridge model of the target on the region series,
/// permutation importance (Breiman 2001, Machine Learning 45: 5) — the rise of the mean squared
/// error when one region's values are shuffled, averaged over repeats, for the whole record and
/// within each year — and the exact Shapley values of the linear model per time step.
/// </summary>
internal static class Attribution
{
    public static AttributionResult Explain(double[,] x, double[] y, long[] years, int repeats = 10, int seed = 1)
    {
        int n = y.Length, p = x.GetLength(1);
        var model = Ridge.Fit(x, y);
        var rows = Enumerable.Range(0, n).ToArray();
        double mse = Mse(model, x, y, rows);
        double variance = y.Select(v => (v - y.Average()) * (v - y.Average())).Average();
        var overall = Importance(model, x, y, rows, repeats, seed);
        var byYear = years.Distinct().Order().ToDictionary(year => year,
            year => (IReadOnlyList<RegionImportance>)Importance(model, x, y, rows.Where(i => years[i] == year).ToArray(), repeats, seed));
        var shapley = new double[n, p];
        var phi = new double[p];
        for (int i = 0; i < n; i++)
        {
            model.Shapley(x, i, phi);
            for (int j = 0; j < p; j++) shapley[i, j] = phi[j];
        }
        return new AttributionResult(model, variance > 0 ? 1 - mse / variance : double.NaN, overall, byYear, shapley);
    }

    static double Mse(Ridge model, double[,] x, double[] y, int[] rows)
    {
        double s = 0;
        foreach (int i in rows)
        {
            double e = model.Predict(x, i) - y[i];
            s += e * e;
        }
        return rows.Length > 0 ? s / rows.Length : double.NaN;
    }

    internal static List<RegionImportance> Importance(Ridge model, double[,] x, double[] y, int[] rows, int repeats, int seed)
    {
        int p = x.GetLength(1);
        var result = new List<RegionImportance>();
        if (rows.Length < 2) return Enumerable.Range(0, p).Select(j => new RegionImportance(j, double.NaN, double.NaN)).ToList();
        double baseline = Mse(model, x, y, rows);
        var work = (double[,])x.Clone();
        for (int j = 0; j < p; j++)
        {
            var rng = new Random(seed + j);
            var rises = new double[repeats];
            for (int k = 0; k < repeats; k++)
            {
                var shuffled = rows.OrderBy(_ => rng.Next()).ToArray();
                for (int i = 0; i < rows.Length; i++) work[rows[i], j] = x[shuffled[i], j];
                rises[k] = Mse(model, work, y, rows) - baseline;
                foreach (int i in rows) work[i, j] = x[i, j];
            }
            double mean = rises.Average();
            result.Add(new RegionImportance(j, mean, Math.Sqrt(rises.Select(r => (r - mean) * (r - mean)).Sum() / Math.Max(1, repeats - 1))));
        }
        return result;
    }

    /// <summary>Partial dependence (Friedman 2001) and ICE curves (Goldstein et al. 2015) of one region over a grid of its values.</summary>
    public static (double[] Grid, double[] PartialDependence, double[,] Ice) Profiles(Ridge model, double[,] x, int region, int points = 20, int[]? iceRows = null)
    {
        int n = x.GetLength(0);
        var values = Enumerable.Range(0, n).Select(i => x[i, region]).Order().ToArray();
        var grid = Enumerable.Range(0, points).Select(k => values[(int)Math.Round((double)k / (points - 1) * (n - 1))]).ToArray();
        iceRows ??= Enumerable.Range(0, Math.Min(n, 20)).Select(k => k * n / Math.Min(n, 20)).ToArray();
        var ice = new double[iceRows.Length, points];
        var pd = new double[points];
        var work = (double[,])x.Clone();
        for (int g = 0; g < points; g++)
        {
            for (int i = 0; i < n; i++) work[i, region] = grid[g];
            double sum = 0;
            for (int i = 0; i < n; i++) sum += model.Predict(work, i);
            pd[g] = sum / n;
            for (int k = 0; k < iceRows.Length; k++) ice[k, g] = model.Predict(work, iceRows[k]);
        }
        return (grid, pd, ice);
    }

    /// <summary>Ranks of the regions (1 = most important) by their mean absolute Shapley value over the rows in <paramref name="period"/>.</summary>
    public static int[] RankByShapley(double[,] shapley, CfTime[] times, TimePeriod period, int regions)
    {
        var rows = Enumerable.Range(0, times.Length).Where(i => period.Contains(times[i])).ToArray();
        var score = Enumerable.Range(0, regions).Select(j => rows.Length == 0 ? 0 : rows.Average(i => Math.Abs(shapley[i, j]))).ToArray();
        var order = Enumerable.Range(0, regions).OrderByDescending(j => score[j]).ToArray();
        var rank = new int[regions];
        for (int k = 0; k < regions; k++) rank[order[k]] = k + 1;
        return rank;
    }
}
