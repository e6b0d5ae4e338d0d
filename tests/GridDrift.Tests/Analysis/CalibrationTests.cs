using GridDrift.Analysis;
using Xunit.Abstractions;

namespace GridDrift.Tests.Analysis;

/// <summary>
/// The small version of the calibration benchmark (tests/GridDrift.Benchmarks calibration): eight
/// years of daily values, AR(1) noise with φ = 0.6, an annual cycle, fixed seed. The truth is the
/// simulation's own (<see cref="CalibrationStudy"/>). With 120 series a rate of 5 % lies below 12 %
/// with near certainty and a rate of 50 % above it, so the test separates a calibrated verdict
/// from an uncalibrated one — the same series through Pettitt's test without whitening show it.
/// </summary>
public class CalibrationTests
{
    readonly ITestOutputHelper _output;
    public CalibrationTests(ITestOutputHelper output) => _output = output;

    const double Ceiling = 0.12;

    [Fact]
    public void Every_verdict_holds_its_level_and_finds_a_shift_at_phi_0_6()
    {
        var none = CalibrationStudy.Run(new CalibrationCell(0.6, 8, 1, Truth.None, 120), seed: 11, dateIntervals: false);
        var shift = CalibrationStudy.Run(new CalibrationCell(0.6, 8, 1, Truth.Shift, 60), seed: 12, dateIntervals: true);
        foreach (var v in CalibrationStudy.Verdicts)
            _output.WriteLine($"{v}: false alarms {100 * none.Rates[v]:0.0} %, power for a {CalibrationStudy.ShiftSize} sd shift {100 * shift.Rates[v]:0.0} %");
        _output.WriteLine($"date intervals hold the true date in {100 * shift.DateCoverage:0} % of the shifts found");
        foreach (var v in CalibrationStudy.Verdicts) Assert.True(none.Rates[v] <= Ceiling, $"{v}: {100 * none.Rates[v]:0.0} % of unchanged series flagged");
        Assert.True(shift.Rates["pettitt"] >= 0.7, $"Pettitt found {100 * shift.Rates["pettitt"]:0} % of the shifts");
        Assert.True(shift.Rates["pelt-mean"] >= 0.6, $"PELT found {100 * shift.Rates["pelt-mean"]:0} % of the shifts");
        Assert.True(shift.DateCoverage >= 0.8, $"date intervals held the truth in {100 * shift.DateCoverage:0} %");

        // the witness that the check can fail: Pettitt's own p on the same deseasonalised series, not whitened
        int raw = 0;
        var cell = new CalibrationCell(0.6, 8, 1, Truth.None, 120);
        var days = Enumerable.Range(0, cell.Length).Select(i => (double)i).ToArray();
        for (int s = 0; s < cell.Series; s++)
        {
            var x = CalibrationStudy.Simulate(cell, days, new Random(11 * 100_003 + s));
            if (Pettitt.Test(SeasonalModel.Residuals(days, x, trend: false)).P < CalibrationStudy.Alpha) raw++;
        }
        _output.WriteLine($"unwhitened Pettitt: {100.0 * raw / cell.Series:0.0} % false alarms");
        Assert.True(raw > Ceiling * cell.Series, "without whitening the level is not held (else this test could not tell)");
    }
}
