using GridDrift.Conventions.Time;

namespace GridDrift.Analysis;

/// <summary>A region's importance before and after a change, the change, and its bootstrap interval.</summary>
internal sealed record RegionImportanceChange(int Region, double Before, double After, double Change, double Low, double High);

/// <summary>
/// Which regions drive a change: the change of each region's permutation importance (Breiman
/// 2001) between the period before and the period after, not its importance averaged over the
/// record (a large region matters most before the change too). Importance is measured within each
/// year of each period (shuffles inside the year's rows, so a shift between years does not count
/// as importance); the change is the mean over the after-years less the mean over the
/// before-years, and its 95 % interval comes from resampling the years of each period with
/// replacement (a block bootstrap with years as blocks, Künsch 1989, Ann. Statist. 17: 1217;
/// 999 resamples, fixed seed). With two or three years a side the interval is wide: it says so.
/// </summary>
internal static class ImportanceChange
{
    public const int Resamples = 999;

    public static IReadOnlyList<RegionImportanceChange> Between(Ridge model, double[,] x, double[] y, CfTime[] times, TimePeriod before, TimePeriod after, int repeats = 10, int seed = 1)
    {
        int p = x.GetLength(1);
        var blocks = Enumerable.Range(0, times.Length)
            .Select(i => (Row: i, Side: before.Contains(times[i]) ? 0 : after.Contains(times[i]) ? 1 : -1, times[i].Year))
            .Where(b => b.Side >= 0).GroupBy(b => (b.Side, b.Year)).Where(g => g.Count() >= 2)
            .Select(g => (g.Key.Side, Importance: Attribution.Importance(model, x, y, g.Select(b => b.Row).ToArray(), repeats, seed).Select(r => r.Importance).ToArray()))
            .ToList();
        var sides = new[] { blocks.Where(b => b.Side == 0).Select(b => b.Importance).ToArray(), blocks.Where(b => b.Side == 1).Select(b => b.Importance).ToArray() };
        var result = new List<RegionImportanceChange>();
        if (sides[0].Length == 0 || sides[1].Length == 0) return result;
        var rng = new Random(seed);
        var draws = new double[p][];
        for (int j = 0; j < p; j++) draws[j] = new double[Resamples];
        for (int b = 0; b < Resamples; b++)
        {
            var pickBefore = Enumerable.Range(0, sides[0].Length).Select(_ => sides[0][rng.Next(sides[0].Length)]).ToArray();
            var pickAfter = Enumerable.Range(0, sides[1].Length).Select(_ => sides[1][rng.Next(sides[1].Length)]).ToArray();
            for (int j = 0; j < p; j++) draws[j][b] = pickAfter.Average(v => v[j]) - pickBefore.Average(v => v[j]);
        }
        for (int j = 0; j < p; j++)
        {
            double mb = sides[0].Average(v => v[j]), ma = sides[1].Average(v => v[j]);
            Array.Sort(draws[j]);
            result.Add(new RegionImportanceChange(j, mb, ma, ma - mb, draws[j][(int)(0.025 * (Resamples - 1))], draws[j][(int)Math.Ceiling(0.975 * (Resamples - 1))]));
        }
        return result;
    }
}
