namespace GridDrift.Analysis;

/// <summary>Which outlier detector.</summary>
internal enum Detector { RobustZ, Hampel, Iqr, SeasonalResidual, Gesd }

/// <summary>Which change-point method; <see cref="EventRate"/> is Pettitt's test on the monthly rate of events.</summary>
internal enum ChangeMethod { Pettitt, PeltMean, PeltMeanVariance, EventRate }

internal sealed record SeriesAnalysisOptions(
    IReadOnlyList<Detector> Detectors,
    IReadOnlyList<ChangeMethod> ChangeMethods,
    bool? OnResiduals = null,
    double WindowDays = 365,
    int Consensus = 2,
    int MinSegment = 10,
    double YearDays = 365.2425,
    double Alpha = 0.05)
{
    /// <summary>How the noise model of the shift tests of the series is fitted (the calibration benchmark measured the choices: see <see cref="NoiseFit"/>).</summary>
    public NoiseFit NoiseFit { get; init; } = NoiseFit.Guarded;

    /// <summary>Bootstrap series per change date interval (0: no interval).</summary>
    public int DateReplicates { get; init; } = ChangeDating.Replicates;

    /// <summary>Detection and tests run on the seasonal model's residuals when asked, or by default when the record spans two years or more (enough to fit an annual cycle).</summary>
    public bool UsesResiduals(double spanDays) => OnResiduals ?? spanDays >= 2 * YearDays;
}

/// <summary>
/// A change: where (index of the first value after it, with a bootstrap interval Low..High), how
/// sure (p, its log10, and the Benjamini–Hochberg q over the whole run), and the values on either
/// side: means of the values (for <see cref="ChangeMethod.EventRate"/>, events per month) and, for
/// changes with p &lt; α, Sen slopes (per day) of the deseasonalised values (of the monthly event counts).
/// </summary>
internal sealed record ChangePoint(ChangeMethod Method, int FirstAfter, double P, double Log10P, int Low, int High, double MeanBefore, double MeanAfter, SenSlope.Estimate Before, SenSlope.Estimate After)
{
    public double Q { get; init; } = double.NaN;

    /// <summary>Whether Sen's slope changes sign across the change.</summary>
    public bool TrendReverses => Before.Slope * After.Slope < 0;
}

/// <summary>A trend over values First..End−1: Mann–Kendall on the whitened values, Sen's slope per day, and its q over the run.</summary>
internal sealed record TrendFinding(int First, int End, TrendVerdict Test, SenSlope.Estimate Slope)
{
    public double Q { get; init; } = double.NaN;
}

internal sealed record SeriesFindings(
    IReadOnlyDictionary<Detector, Flag[]> Flags,
    int[] Consensus,
    bool[] Events,
    int[] WindowCounts,
    bool OnResiduals,
    TrendFinding Trend,
    IReadOnlyList<ChangePoint> ChangePoints,
    IReadOnlyList<TrendFinding> Segments)
{
    public IEnumerable<double> PValues => ChangePoints.Select(c => c.P).Append(Trend.Test.P).Concat(Segments.Select(s => s.Test.P));

    /// <summary>The same findings with q-values taken in order from <paramref name="q"/> (as <see cref="PValues"/> lists the p-values).</summary>
    public SeriesFindings WithQ(ReadOnlySpan<double> q)
    {
        int k = 0;
        var changes = ChangePoints.ToList();
        for (int i = 0; i < changes.Count; i++) changes[i] = changes[i] with { Q = q[k++] };
        var trend = Trend with { Q = q[k++] };
        var segments = Segments.ToList();
        for (int i = 0; i < segments.Count; i++) segments[i] = segments[i] with { Q = q[k++] };
        return this with { ChangePoints = changes, Trend = trend, Segments = segments };
    }
}

/// <summary>
/// All findings of one series at once. By default (<see cref="SeriesAnalysisOptions.UsesResiduals"/>)
/// everything runs on the residuals of a seasonal model (a constant, 3 annual harmonics, and 2
/// diurnal harmonics when steps are shorter than a day, fitted to the whole record): the outlier
/// flags of each detector, their consensus, events (at least <see cref="SeriesAnalysisOptions.Consensus"/>
/// detectors agreeing) and their count in a moving window, the trend (Mann–Kendall on the series
/// whitened by its sieve AR; Sen's slope per day), the change points — Pettitt's best split on the
/// whitened series, PELT's changes with a penalty calibrated to the level α, each with a p-value
/// and a bootstrap interval for its date — the change of the monthly event rate, and the trend of
/// each segment between PELT's mean changes. The change and trend tests of sub-daily series run on
/// their daily means. Times are days from any origin; NaN values take no part.
/// </summary>
internal static class SeriesAnalysis
{
    public static SeriesFindings Analyse(double[] days, double[] values, SeriesAnalysisOptions o, int seed = 1)
    {
        int n = values.Length;
        bool onResiduals = n > 1 && o.UsesResiduals(days[^1] - days[0]);
        var target = onResiduals ? SeasonalModel.Residuals(days, values, 3, o.YearDays, trend: false, diurnalHarmonics: SubDaily(days) ? 2 : 0) : values;
        var valid = Enumerable.Range(0, n).Where(i => !double.IsNaN(values[i]) && !double.IsNaN(target[i])).ToArray();
        var x = valid.Select(i => values[i]).ToArray();
        // the tests run on daily means of sub-daily series: the date of a change is then a day, and
        // the persistence within a day (and the diurnal sampling) is no concern of the tests
        var (tt, tx, first) = TestSeries(days, target, valid);
        int nt = tx.Length;
        int End(int k) => k >= nt ? valid.Length : first[k];
        var sen = new Dictionary<(int, int), SenSlope.Estimate>();
        SenSlope.Estimate Sen(int from, int to) => sen.TryGetValue((from, to), out var e) ? e : sen[(from, to)] = SenSlope.Compute(tt[from..to], tx[from..to]);
        var slope = Sen(0, nt);
        var trend = new TrendFinding(valid.FirstOrDefault(), valid.Length > 0 ? valid[^1] + 1 : 0, Prewhitened.MannKendall(tt, tx, slope.Slope), slope);

        var changes = new List<ChangePoint>();
        var segments = new List<TrendFinding>();
        int minSegment = Math.Max(2, (int)Math.Round(o.MinSegment * (double)nt / Math.Max(1, valid.Length)));
        if (nt >= 2 * minSegment && nt >= 8)
        {
            var shift = Prewhitened.Pettitt(tx, o.NoiseFit);
            var ar = shift.Noise;
            var e = ar.Whiten(tx);
            foreach (var m in o.ChangeMethods)
            {
                switch (m)
                {
                    case ChangeMethod.Pettitt when shift.Found:
                        changes.Add(Describe(m, shift.FirstAfter, shift.P, shift.Log10P, 0, nt, ar));
                        break;
                    case ChangeMethod.PeltMean or ChangeMethod.PeltMeanVariance:
                        var cost = m == ChangeMethod.PeltMean ? SegmentCost.Mean : SegmentCost.MeanAndVariance;
                        double beta = PeltPenalty.For(e.Length, cost, minSegment, o.Alpha);
                        var cps = Pelt.Detect(e, cost, beta, minSegment, noiseVariance: Variance(e));
                        var bounds = cps.Prepend(0).Append(e.Length).ToArray();
                        for (int k = 0; k < cps.Length; k++)
                        {
                            // each change is judged by Pettitt's test on the whitened values between its neighbours
                            var local = Pettitt.Test(e.AsSpan(bounds[k], bounds[k + 2] - bounds[k]));
                            int from = k == 0 ? 0 : bounds[k] + ar.Order, to = k == cps.Length - 1 ? nt : bounds[k + 2] + ar.Order;
                            changes.Add(Describe(m, cps[k] + ar.Order, local.P, Pettitt.Log10P(local.K, bounds[k + 2] - bounds[k]), from, to, ar));
                        }
                        if (m == ChangeMethod.PeltMean && cps.Length > 0)
                        {
                            var edges = cps.Select(c => c + ar.Order).Prepend(0).Append(nt).ToArray();
                            for (int k = 0; k + 1 < edges.Length; k++)
                            {
                                var segmentSlope = Sen(edges[k], edges[k + 1]);
                                segments.Add(new TrendFinding(valid[first[edges[k]]], valid[End(edges[k + 1]) - 1] + 1,
                                    Prewhitened.MannKendall(tt[edges[k]..edges[k + 1]], tx[edges[k]..edges[k + 1]], segmentSlope.Slope), segmentSlope));
                            }
                        }
                        break;
                }
            }
        }
        // events are departures from the seasonal model with the series' shifts taken out: after a
        // shift every value departs from the old level, and a detector whose scale spans both levels sees nothing
        var eventTarget = WithoutShifts(target, changes.Where(c => c.P < o.Alpha && c.Method is ChangeMethod.Pettitt or ChangeMethod.PeltMean or ChangeMethod.PeltMeanVariance).ToList());
        var flags = new Dictionary<Detector, Flag[]>();
        foreach (var d in o.Detectors)
            flags[d] = d switch
            {
                Detector.RobustZ => Outliers.RobustZ(eventTarget),
                Detector.Hampel => Outliers.Hampel(eventTarget),
                Detector.Iqr => Outliers.TukeyFences(eventTarget),
                Detector.SeasonalResidual => Outliers.SeasonalResidual(days, values, 3, o.YearDays),
                _ => Outliers.GeneralizedEsd(eventTarget, Math.Max(10, n / 100)),
            };
        var consensus = new int[n];
        foreach (var f in flags.Values)
            for (int i = 0; i < n; i++) if (f[i].Flagged) consensus[i]++;
        var events = consensus.Select(c => c >= Math.Min(o.Consensus, Math.Max(1, flags.Count))).ToArray();
        var window = new int[n];
        for (int i = 0, lo = 0, inWindow = 0; i < n; i++)
        {
            if (events[i]) inWindow++;
            while (days[lo] <= days[i] - o.WindowDays) { if (events[lo]) inWindow--; lo++; }
            window[i] = inWindow;
        }

        if (o.ChangeMethods.Contains(ChangeMethod.EventRate) && EventRate.Test(days, valid, events, o, seed) is { } rate)
            changes.Add(rate);
        return new SeriesFindings(flags, consensus, events, window, onResiduals, trend, changes, segments);

        // a change at test position `at`, described by the test positions [from, at) and [at, to)
        ChangePoint Describe(ChangeMethod m, int at, double p, double log10P, int from, int to, Autoregression ar)
        {
            var (low, high) = o.DateReplicates > 0 && p < o.Alpha
                ? ChangeDating.Interval(tx.AsSpan(from, to - from), at - from, ar, seed, o.DateReplicates) : (-1, -1);
            // the sides' slopes describe a change; they are worth their cost (Sen's slope is O(n log n) at best) only where the change is one
            var none = new SenSlope.Estimate(double.NaN, double.NaN, double.NaN, double.NaN);
            bool describe = p < o.Alpha;
            int a = first[at], f = first[from], t = End(to);
            return new ChangePoint(m, valid[a], p, log10P, low < 0 ? -1 : valid[first[Math.Min(from + low, nt - 1)]], high < 0 ? -1 : valid[first[Math.Min(from + high, nt - 1)]],
                x[f..a].Average(), x[a..t].Average(), describe ? Sen(from, at) : none, describe ? Sen(at, to) : none);
        }
    }

    /// <summary>
    /// The series less the mean of each segment between its shifts (PELT's where it found any, else
    /// Pettitt's), NaN where it is NaN; the series itself without shifts.
    /// </summary>
    static double[] WithoutShifts(double[] series, List<ChangePoint> shifts)
    {
        var pelt = shifts.Where(c => c.Method != ChangeMethod.Pettitt).Select(c => c.FirstAfter).Distinct().Order().ToList();
        var cuts = pelt.Count > 0 ? pelt : shifts.Select(c => c.FirstAfter).Take(1).ToList();
        if (cuts.Count == 0) return series;
        var result = series.ToArray();
        var edges = cuts.Prepend(0).Append(series.Length).ToArray();
        for (int k = 0; k + 1 < edges.Length; k++)
        {
            double sum = 0;
            int count = 0;
            for (int i = edges[k]; i < edges[k + 1]; i++) if (!double.IsNaN(series[i])) { sum += series[i]; count++; }
            if (count > 0) for (int i = edges[k]; i < edges[k + 1]; i++) result[i] -= sum / count;
        }
        return result;
    }

    /// <summary>
    /// The series the change and trend tests see: the valid values themselves, or for sub-daily steps
    /// their daily means (days counted from the first time), with the index into the valid values
    /// of each test value's first value.
    /// </summary>
    static (double[] Times, double[] Values, int[] First) TestSeries(double[] days, double[] target, int[] valid)
    {
        if (!SubDaily(days))
            return (valid.Select(i => days[i]).ToArray(), valid.Select(i => target[i]).ToArray(), Enumerable.Range(0, valid.Length).ToArray());
        var times = new List<double>();
        var means = new List<double>();
        var first = new List<int>();
        double origin = days.Length > 0 ? Math.Floor(days[0]) : 0;
        for (int k = 0; k < valid.Length;)
        {
            double day = Math.Floor(days[valid[k]] - origin);
            int j = k;
            double sum = 0, time = 0;
            while (j < valid.Length && Math.Floor(days[valid[j]] - origin) == day) { sum += target[valid[j]]; time += days[valid[j]]; j++; }
            times.Add(time / (j - k));
            means.Add(sum / (j - k));
            first.Add(k);
            k = j;
        }
        return (times.ToArray(), means.ToArray(), first.ToArray());
    }

    static bool SubDaily(double[] days)
    {
        if (days.Length < 3) return false;
        var steps = new double[days.Length - 1];
        for (int i = 1; i < days.Length; i++) steps[i - 1] = days[i] - days[i - 1];
        return RobustStatistics.Median(steps) < 0.999;
    }

    static double Variance(ReadOnlySpan<double> x)
    {
        double m = 0, s = 0;
        foreach (var v in x) m += v;
        m /= x.Length;
        foreach (var v in x) s += (v - m) * (v - m);
        return s / x.Length;
    }
}
