using MathNet.Numerics.LinearAlgebra;

namespace GridDrift.Analysis;

/// <summary>
/// A constant, optionally a linear trend, annual harmonics and (for sub-daily series) diurnal
/// harmonics, fitted by least squares to a series in time (days) over the whole record (harmonic
/// regression, common practice for climatological cycles; cf. the seasonal-trend decomposition of
/// Cleveland et al. 1990). The seasonal-residual detector uses the trend; the deseasonalised
/// series that the change and trend tests see does not, because a trend term would absorb part of
/// a step change and smear it into a ramp, and would take out the trend the trend test looks for.
/// Harmonics over whole years are orthogonal to a step, so a shift in the record stays in the residuals.
/// </summary>
internal static class SeasonalModel
{
    public static double[] Residuals(ReadOnlySpan<double> days, ReadOnlySpan<double> x, int harmonics = 3, double yearDays = 365.2425, bool trend = true, int diurnalHarmonics = 0)
    {
        int n = x.Length, p = (trend ? 2 : 1) + 2 * harmonics + 2 * diurnalHarmonics;
        var rows = new List<int>();
        for (int i = 0; i < n; i++) if (!double.IsNaN(x[i])) rows.Add(i);
        var residuals = new double[n];
        Array.Fill(residuals, double.NaN);
        if (rows.Count <= p) return residuals;
        double t0 = days[rows[0]], span = Math.Max(1, days[rows[^1]] - t0);
        var design = Matrix<double>.Build.Dense(rows.Count, p);
        var y = Vector<double>.Build.Dense(rows.Count);
        for (int r = 0; r < rows.Count; r++)
        {
            int i = rows[r];
            int c = 0;
            design[r, c++] = 1;
            if (trend) design[r, c++] = (days[i] - t0) / span;
            for (int k = 1; k <= harmonics; k++)
            {
                double a = 2 * Math.PI * k * days[i] / yearDays;
                design[r, c++] = Math.Cos(a);
                design[r, c++] = Math.Sin(a);
            }
            for (int k = 1; k <= diurnalHarmonics; k++)
            {
                double a = 2 * Math.PI * k * days[i];
                design[r, c++] = Math.Cos(a);
                design[r, c++] = Math.Sin(a);
            }
            y[r] = x[i];
        }
        var beta = design.QR().Solve(y);
        var fitted = design * beta;
        for (int r = 0; r < rows.Count; r++) residuals[rows[r]] = x[rows[r]] - fitted[r];
        return residuals;
    }
}
