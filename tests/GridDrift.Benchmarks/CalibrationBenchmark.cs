using System.Globalization;
using GridDrift.Tests.Analysis;

namespace GridDrift.Benchmarks;

/// <summary>
/// `calibration [SERIES] [--hourly SERIES]`: the false-alarm rate at nominal 5 % and the power of
/// every verdict `griddrift events` reports, on simulated series whose truth is known
/// (<see cref="CalibrationStudy"/>): φ = 0.3, 0.6, 0.9; eight years of daily values and eight
/// years of hourly values; no change, a 0.3 sd shift, a 0.5 sd trend, a doubled noise sd.
/// Goals: false alarms ≤ 8 % everywhere; power ≥ 80 % for the shift at φ = 0.6, daily.
/// </summary>
internal static class CalibrationBenchmark
{
    public static int Run(string[] args)
    {
        int daily = args.Length > 0 && int.TryParse(args[0], out int d) ? d : 400;
        int hourly = Array.IndexOf(args, "--hourly") is int h and >= 0 && h + 1 < args.Length ? int.Parse(args[h + 1], CultureInfo.InvariantCulture) : 60;
        var fit = args.Contains("--fit-split") ? GridDrift.Analysis.NoiseFit.SplitMeans : args.Contains("--fit-whole") ? GridDrift.Analysis.NoiseFit.Whole : GridDrift.Analysis.NoiseFit.Guarded;
        var phis = Array.IndexOf(args, "--phi") is int f and >= 0 && f + 1 < args.Length ? args[f + 1].Split(',').Select(v => double.Parse(v, CultureInfo.InvariantCulture)).ToArray() : [0.3, 0.6, 0.9];
        var truths = Array.IndexOf(args, "--truth") is int k and >= 0 && k + 1 < args.Length
            ? args[k + 1].Split(',').Select(Enum.Parse<Truth>).ToArray() : [Truth.None, Truth.Shift, Truth.Trend, Truth.Variance];
        Console.WriteLine($"calibration: {daily} daily and {hourly} hourly series per cell; rates at nominal 5 %; shift {CalibrationStudy.ShiftSize} sd, trend {CalibrationStudy.TrendSize} sd over the record, variance ×4 (sd ×2), all in the middle");
        Console.WriteLine("| resolution | φ | truth | " + string.Join(" | ", CalibrationStudy.Verdicts) + " | date interval covers the truth | s/series |");
        Console.WriteLine("|---|---|---|" + string.Concat(CalibrationStudy.Verdicts.Select(_ => "---|")) + "---|---|");
        foreach (var (stepDays, years, series) in new[] { (1.0, 8, daily), (1.0 / 24, 8, hourly) })
        {
            if (series <= 0) continue;
            foreach (double phi in phis)
                foreach (var truth in truths)
                {
                    var cell = new CalibrationCell(phi, years, stepDays, truth, series);
                    var r = CalibrationStudy.Run(cell, seed: 2026, dateIntervals: stepDays >= 1, fit);
                    Console.WriteLine($"| {cell.Resolution} | {phi:0.0} | {truth} | " + string.Join(" | ", CalibrationStudy.Verdicts.Select(v => $"{100 * r.Rates[v]:0.0} %"))
                        + $" | {(double.IsNaN(r.DateCoverage) ? "–" : $"{100 * r.DateCoverage:0} %")} | {r.SecondsPerSeries:0.000} |");
                }
        }
        return 0;
    }
}
