namespace GridDrift.Analysis;

/// <summary>
/// Did the rate of events change? Events are counted per month (a twelfth of the year, from the
/// first time), as a rate per valid value so gaps do not count as calm; with two years or more
/// each calendar month's mean rate is removed (events follow the seasons); then Pettitt's test on
/// the whitened monthly rates (<see cref="Prewhitened"/>, noise fitted as for the series: <see cref="NoiseFit.Guarded"/>) gives the date, its p-value and a
/// bootstrap interval. The sides' mean counts are events per month, their Sen slopes events per
/// month per day: when the slopes differ in sign the event-count trend reverses at the change.
/// </summary>
internal static class EventRate
{
    const int MinimumMonths = 12;

    public static ChangePoint? Test(double[] days, int[] valid, bool[] events, SeriesAnalysisOptions o, int seed)
    {
        if (valid.Length < 2) return null;
        double month = o.YearDays / 12, origin = days[valid[0]];
        int bins = (int)Math.Floor((days[valid[^1]] - origin) / month) + 1;
        var counts = new double[bins];
        var values = new double[bins];
        foreach (int i in valid)
        {
            int b = (int)Math.Floor((days[i] - origin) / month);
            values[b]++;
            if (events[i]) counts[b]++;
        }
        // a last month with less than half the usual values says little: it is left out
        double usual = RobustStatistics.Median(values.Where(v => v > 0).ToArray());
        var kept = Enumerable.Range(0, bins).Where(b => values[b] > 0 && (b < bins - 1 || values[b] >= usual / 2)).ToArray();
        if (kept.Length < MinimumMonths || usual < 1) return null;
        var rate = kept.Select(b => counts[b] / values[b] * usual).ToArray();
        var adjusted = rate.ToArray();
        if (kept[^1] - kept[0] + 1 >= 24)
            for (int m = 0; m < 12; m++)
            {
                var same = Enumerable.Range(0, kept.Length).Where(k => kept[k] % 12 == m).ToArray();
                if (same.Length == 0) continue;
                double mean = same.Average(k => rate[k]);
                foreach (int k in same) adjusted[k] -= mean;
            }
        if (adjusted.Distinct().Count() < 3) return null;
        var shift = Prewhitened.Pettitt(adjusted, NoiseFit.Guarded);
        if (!shift.Found || shift.FirstAfter >= kept.Length) return null;
        var (low, high) = o.DateReplicates > 0 && shift.P < o.Alpha ? ChangeDating.Interval(adjusted, shift.FirstAfter, shift.Noise, seed, o.DateReplicates) : (-1, -1);
        var start = kept.Select(b => origin + b * month).ToArray();
        int At(int k) => k < 0 ? -1 : FirstValueFrom(days, valid, start[Math.Clamp(k, 0, kept.Length - 1)]);
        int at = shift.FirstAfter;
        return new ChangePoint(ChangeMethod.EventRate, At(at), shift.P, shift.Log10P, At(low), At(high),
            rate[..at].Average(), rate[at..].Average(), SenSlope.Compute(start[..at], rate[..at]), SenSlope.Compute(start[at..], rate[at..]));
    }

    static int FirstValueFrom(double[] days, int[] valid, double day)
    {
        foreach (int i in valid) if (days[i] >= day - 1e-9) return i;
        return valid[^1];
    }
}
