namespace GridDrift.Analysis;

/// <summary>Which outlier detector.</summary>
internal enum Detector { RobustZ, Hampel, Iqr, SeasonalResidual, Gesd }

/// <summary>Which change-point method.</summary>
internal enum ChangeMethod { Pettitt, PeltMean, PeltMeanVariance }

internal sealed record SeriesAnalysisOptions(
    IReadOnlyList<Detector> Detectors,
    IReadOnlyList<ChangeMethod> ChangeMethods,
    bool OnResiduals = false,
    double WindowDays = 365,
    int Consensus = 2,
    int MinSegment = 10,
    double YearDays = 365.2425,
    double Alpha = 0.05);

internal sealed record ChangePoint(ChangeMethod Method, int FirstAfter, double? P, double MeanBefore, double MeanAfter, SenSlope.Estimate Before, SenSlope.Estimate After)
{
    /// <summary>Whether Sen's slope changes sign across the change.</summary>
    public bool TrendReverses => Math.Sign(Before.Slope) * Math.Sign(After.Slope) < 0;
}

internal sealed record SeriesFindings(
    IReadOnlyDictionary<Detector, Flag[]> Flags,
    int[] Consensus,
    bool[] Events,
    int[] WindowCounts,
    MannKendall.Result Trend,
    SenSlope.Estimate Slope,
    IReadOnlyList<ChangePoint> ChangePoints,
    IReadOnlyList<(int First, int End, MannKendall.Result Trend, SenSlope.Estimate Slope)> Segments);

/// <summary>
/// All findings of one series at once: the outlier flags of each detector (on the raw values or
/// on the residuals of the seasonal model), their consensus, events (at least
/// <see cref="SeriesAnalysisOptions.Consensus"/> detectors agreeing) and their count in a moving
/// window, the Mann–Kendall trend with Sen's slope (per day), and the change points (Pettitt's
/// only where significant at <see cref="SeriesAnalysisOptions.Alpha"/>) with the means and trends
/// of the values on either side, and the trend of each segment between PELT's mean changes.
/// Times are days from any origin; NaN values take no part.
/// </summary>
internal static class SeriesAnalysis
{
    public static SeriesFindings Analyse(double[] days, double[] values, SeriesAnalysisOptions o)
    {
        int n = values.Length;
        var target = o.OnResiduals ? SeasonalModel.Residuals(days, values, 3, o.YearDays, trend: false) : values;
        var flags = new Dictionary<Detector, Flag[]>();
        foreach (var d in o.Detectors)
            flags[d] = d switch
            {
                Detector.RobustZ => Outliers.RobustZ(target),
                Detector.Hampel => Outliers.Hampel(target),
                Detector.Iqr => Outliers.TukeyFences(target),
                Detector.SeasonalResidual => Outliers.SeasonalResidual(days, values, 3, o.YearDays),
                _ => Outliers.GeneralizedEsd(target, Math.Max(10, n / 100)),
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

        var valid = Enumerable.Range(0, n).Where(i => !double.IsNaN(values[i])).ToArray();
        var t = valid.Select(i => days[i]).ToArray();
        var x = valid.Select(i => values[i]).ToArray();
        // Sen slopes of segments recur (a change's sides are the segments between changes): compute each once
        var sen = new Dictionary<(int, int), SenSlope.Estimate>();
        SenSlope.Estimate Sen(int from, int to) => sen.TryGetValue((from, to), out var e) ? e : sen[(from, to)] = SenSlope.Compute(t[from..to], x[from..to]);
        var slope = Sen(0, x.Length);
        var trend = MannKendall.Test(t, x, slope.Slope);
        // change points are sought where the detectors look: on the seasonal model's residuals with --on residuals
        var cx = o.OnResiduals ? valid.Select(i => target[i]).ToArray() : x;
        var changes = new List<ChangePoint>();
        int[] peltMean = [];
        foreach (var m in o.ChangeMethods)
        {
            if (x.Length < 2 * Math.Max(2, o.MinSegment)) break;
            switch (m)
            {
                case ChangeMethod.Pettitt:
                    var p = Pettitt.Test(cx);
                    if (p.LastBefore >= 0 && p.P < o.Alpha) changes.Add(Describe(m, valid, x, p.LastBefore + 1, p.P, Sen));
                    break;
                default:
                    var cps = Pelt.Detect(cx, m == ChangeMethod.PeltMean ? SegmentCost.Mean : SegmentCost.MeanAndVariance, minSegment: o.MinSegment);
                    if (m == ChangeMethod.PeltMean) peltMean = cps;
                    var bounds = cps.Prepend(0).Append(x.Length).ToArray();
                    for (int k = 0; k < cps.Length; k++) changes.Add(Describe(m, valid, x, cps[k], null, Sen, bounds[k], bounds[k + 2]));
                    break;
            }
        }
        var segments = new List<(int, int, MannKendall.Result, SenSlope.Estimate)>();
        var edges = peltMean.Prepend(0).Append(x.Length).ToArray();
        if (peltMean.Length > 0)
            for (int k = 0; k + 1 < edges.Length; k++)
            {
                var st = t[edges[k]..edges[k + 1]];
                var sx = x[edges[k]..edges[k + 1]];
                var segmentSlope = Sen(edges[k], edges[k + 1]);
                segments.Add((valid[edges[k]], valid[edges[k + 1] - 1] + 1, MannKendall.Test(st, sx, segmentSlope.Slope), segmentSlope));
            }
        return new SeriesFindings(flags, consensus, events, window, trend, slope, changes, segments);
    }

    /// <summary>A change at position <paramref name="at"/> of the valid values, described by the segments [from, at) and [at, to).</summary>
    static ChangePoint Describe(ChangeMethod m, int[] valid, double[] x, int at, double? p, Func<int, int, SenSlope.Estimate> sen, int from = 0, int to = -1)
    {
        if (to < 0) to = x.Length;
        return new ChangePoint(m, valid[at], p, x[from..at].Average(), x[at..to].Average(), sen(from, at), sen(at, to));
    }
}
