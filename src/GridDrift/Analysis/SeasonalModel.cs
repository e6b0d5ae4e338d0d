using MathNet.Numerics.LinearAlgebra;

namespace GridDrift.Analysis;

/// <summary>
/// A constant, optionally a linear trend, and annual harmonics fitted by least squares to a
/// series in time (days). The seasonal-residual detector uses the trend; `--on residuals` does
/// not, because a trend term would absorb part of a step change and smear it into a ramp.
/// </summary>
internal static class SeasonalModel
{
    public static double[] Residuals(ReadOnlySpan<double> days, ReadOnlySpan<double> x, int harmonics = 3, double yearDays = 365.2425, bool trend = true)
    {
        int n = x.Length, p = (trend ? 2 : 1) + 2 * harmonics;
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
            Basis(days[i], t0, span, harmonics, yearDays, trend, design, r);
            y[r] = x[i];
        }
        var beta = design.QR().Solve(y);
        var fitted = design * beta;
        for (int r = 0; r < rows.Count; r++) residuals[rows[r]] = x[rows[r]] - fitted[r];
        return residuals;
    }

    static void Basis(double day, double t0, double span, int harmonics, double yearDays, bool trend, Matrix<double> design, int row)
    {
        int c = 0;
        design[row, c++] = 1;
        if (trend) design[row, c++] = (day - t0) / span;
        for (int k = 1; k <= harmonics; k++)
        {
            double a = 2 * Math.PI * k * day / yearDays;
            design[row, c++] = Math.Cos(a);
            design[row, c++] = Math.Sin(a);
        }
    }
}
