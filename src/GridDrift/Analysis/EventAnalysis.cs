using GridDrift.Conventions.Time;

namespace GridDrift.Analysis;

/// <summary>One region's series and what the analysis found in it.</summary>
internal sealed record RegionFindings(string Region, double[] Values, SeriesFindings Findings, IReadOnlyList<(long Year, int Count)> YearlyEvents, double NoiseSd);

/// <summary>
/// The events, trends and change points of one quantity of a regional series, region by region,
/// in memory: what `griddrift events` writes as its four tables and its JSON summary.
/// </summary>
internal sealed record EventAnalysis(string Quantity, string Units, CfTime[] Times, SeriesAnalysisOptions Options, IReadOnlyList<RegionFindings> Regions)
{
    public int EventCount => Regions.Sum(r => r.Findings.Events.Count(e => e));

    public int ChangePointCount => Regions.Sum(r => r.Findings.ChangePoints.Count);

    /// <summary>Changes that survive the false-discovery control at the run's α (q &lt; α).</summary>
    public int SignificantChangeCount => Regions.Sum(r => r.Findings.ChangePoints.Count(c => c.Q < Options.Alpha));

    /// <summary>Benjamini–Hochberg q-values over every p-value of the run: all regions, all methods, trends and changes.</summary>
    static RegionFindings[] WithQValues(RegionFindings[] found)
    {
        var p = found.SelectMany(r => r.Findings.PValues).ToList();
        var q = FalseDiscovery.QValues(p);
        int k = 0;
        var result = new RegionFindings[found.Length];
        for (int r = 0; r < found.Length; r++)
        {
            int count = found[r].Findings.PValues.Count();
            result[r] = found[r] with { Findings = found[r].Findings.WithQ(q.AsSpan(k, count)) };
            k += count;
        }
        return result;
    }

    /// <summary>Analyses each region's series (regions are independent: on every core), keeping the regions' order.</summary>
    public static EventAnalysis Run(CfTime[] times, IReadOnlyList<string> regions, IReadOnlyList<double[]> series, string quantity, string units, SeriesAnalysisOptions options)
    {
        var o = options with { YearDays = times[0].Calendar.MeanYearDays() };
        // days from the midnight before the first time, so that whole days are calendar days (the tests of sub-daily series run on daily means)
        var midnight = times[0].AddMicros(times[0].DayNumber * CfTime.MicrosPerDay - times[0].Micros);
        var days = times.Select(t => t.SecondsSince(midnight) / 86400.0).ToArray();
        var found = new RegionFindings[regions.Count];
        Parallel.For(0, regions.Count, k =>
        {
            var findings = SeriesAnalysis.Analyse(days, series[k], o, seed: k + 1);
            var yearly = Enumerable.Range(0, times.Length).GroupBy(t => times[t].Year).Select(g => (g.Key, g.Count(t => findings.Events[t]))).ToList();
            found[k] = new RegionFindings(regions[k], series[k], findings, yearly, RobustStatistics.DifferenceNoise(series[k].Where(v => !double.IsNaN(v)).ToArray()));
        });
        return new EventAnalysis(quantity, units, times, o, WithQValues(found));
    }
}
