using GridDrift.Analysis;

namespace GridDrift.Tests.Analysis;

/// <summary>What is injected into a simulated series.</summary>
public enum Truth { None, Shift, Trend, Variance }

/// <summary>One cell of the calibration study: persistence, length and step, what is injected, and how many series.</summary>
public sealed record CalibrationCell(double Phi, int Years, double StepDays, Truth Truth, int Series)
{
    public int Length => (int)Math.Round(Years * 365.2425 / StepDays);
    public string Resolution => StepDays >= 1 ? "daily" : "hourly";
}

/// <summary>The share of a cell's series in which each verdict fired at the nominal 5 %, and the interval coverage of the true date.</summary>
public sealed record CalibrationResult(CalibrationCell Cell, IReadOnlyDictionary<string, double> Rates, double DateCoverage, double SecondsPerSeries);

/// <summary>
/// The calibration study: series whose truth is known by construction — AR(1) noise of unit marginal
/// variance (innovations N(0, 1 − φ²)), an annual cycle of one marginal standard deviation (and a
/// diurnal one of half that for sub-daily steps), and, in the middle of the record, nothing, a
/// mean shift of <see cref="ShiftSize"/> sd, a trend of <see cref="TrendSize"/> sd over the record,
/// or the noise's standard deviation doubled — are analysed as `griddrift events` analyses them,
/// and each verdict's firing rate is counted. Under <see cref="Truth.None"/> a rate is the false-alarm
/// rate; otherwise it is the power for that verdict's kind of change.
/// </summary>
public static class CalibrationStudy
{
    public const double ShiftSize = 0.3, TrendSize = 0.5, Alpha = 0.05;

    public static readonly string[] Verdicts = ["pettitt", "pelt-mean", "pelt-mean-variance", "mann-kendall", "event-rate"];

    internal static CalibrationResult Run(CalibrationCell cell, int seed, bool dateIntervals, NoiseFit fit = NoiseFit.Guarded)
    {
        int n = cell.Length;
        var days = Enumerable.Range(0, n).Select(i => i * cell.StepDays).ToArray();
        var options = new SeriesAnalysisOptions(
            [Detector.RobustZ, Detector.Hampel, Detector.Iqr, Detector.SeasonalResidual, Detector.Gesd],
            [ChangeMethod.Pettitt, ChangeMethod.PeltMean, ChangeMethod.PeltMeanVariance, ChangeMethod.EventRate],
            MinSegment: (int)Math.Round(30 / cell.StepDays)) { DateReplicates = dateIntervals ? ChangeDating.Replicates : 0, NoiseFit = fit };
        var fired = Verdicts.ToDictionary(v => v, _ => 0);
        int dated = 0, covered = 0;
        var clock = System.Diagnostics.Stopwatch.StartNew();
        object gate = new();
        Parallel.For(0, cell.Series, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, s =>
        {
            var x = Simulate(cell, days, new Random(seed * 100_003 + s));
            var f = SeriesAnalysis.Analyse(days, x, options, seed: s + 1);
            bool Fires(ChangeMethod m) => f.ChangePoints.Any(c => c.Method == m && c.P < Alpha);
            var pettitt = f.ChangePoints.FirstOrDefault(c => c.Method == ChangeMethod.Pettitt && c.P < Alpha);
            lock (gate)
            {
                if (Fires(ChangeMethod.Pettitt)) fired["pettitt"]++;
                // PELT fires when it places any change: its penalty is the test
                if (f.ChangePoints.Any(c => c.Method == ChangeMethod.PeltMean)) fired["pelt-mean"]++;
                if (f.ChangePoints.Any(c => c.Method == ChangeMethod.PeltMeanVariance)) fired["pelt-mean-variance"]++;
                if (f.Trend.Test.P < Alpha) fired["mann-kendall"]++;
                if (Fires(ChangeMethod.EventRate)) fired["event-rate"]++;
                if (pettitt is not null && pettitt.Low >= 0 && cell.Truth == Truth.Shift)
                {
                    dated++;
                    if (pettitt.Low <= n / 2 && n / 2 <= pettitt.High) covered++;
                }
            }
        });
        return new CalibrationResult(cell, fired.ToDictionary(kv => kv.Key, kv => (double)kv.Value / cell.Series),
            dated > 0 ? (double)covered / dated : double.NaN, clock.Elapsed.TotalSeconds / cell.Series);
    }

    public static double[] Simulate(CalibrationCell cell, double[] days, Random rng)
    {
        int n = days.Length;
        double phi = cell.Phi, innovation = Math.Sqrt(1 - phi * phi), noise = Gaussian.Next(rng);
        var x = new double[n];
        for (int i = 0; i < n; i++)
        {
            if (i > 0) noise = phi * noise + innovation * Gaussian.Next(rng);
            double scale = cell.Truth == Truth.Variance && i >= n / 2 ? 2 : 1;
            double value = Math.Sin(2 * Math.PI * days[i] / 365.2425) + scale * noise;
            if (cell.StepDays < 1) value += 0.5 * Math.Cos(2 * Math.PI * days[i]);
            if (cell.Truth == Truth.Shift && i >= n / 2) value += ShiftSize;
            if (cell.Truth == Truth.Trend) value += TrendSize * i / (n - 1.0);
            x[i] = value;
        }
        return x;
    }
}
