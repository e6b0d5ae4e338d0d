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

    /// <summary>Analyses each region's series (regions are independent: on every core), keeping the regions' order.</summary>
    public static EventAnalysis Run(CfTime[] times, IReadOnlyList<string> regions, IReadOnlyList<double[]> series, string quantity, string units, SeriesAnalysisOptions options)
    {
        var o = options with { YearDays = times[0].Calendar.MeanYearDays() };
        var days = times.Select(t => t.SecondsSince(times[0]) / 86400.0).ToArray();
        var found = new RegionFindings[regions.Count];
        Parallel.For(0, regions.Count, k =>
        {
            var findings = SeriesAnalysis.Analyse(days, series[k], o);
            var yearly = Enumerable.Range(0, times.Length).GroupBy(t => times[t].Year).Select(g => (g.Key, g.Count(t => findings.Events[t]))).ToList();
            found[k] = new RegionFindings(regions[k], series[k], findings, yearly, RobustStatistics.DifferenceNoise(series[k].Where(v => !double.IsNaN(v)).ToArray()));
        });
        return new EventAnalysis(quantity, units, times, o, found);
    }
}
