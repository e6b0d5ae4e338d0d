using MathNet.Numerics.LinearAlgebra;

namespace GridDrift.Climatology;

/// <summary>
/// The finished climatology per slot and cell: mean, population standard deviation and the
/// number of samples, float32 for storage (slot-major, like <see cref="MomentState"/>), with the
/// optional smoothing of day-of-year climatologies.
/// </summary>
public sealed class ClimatologyFields
{
    public int Slots { get; }
    public int Cells { get; }
    public float[] Mean { get; }
    public float[] Std { get; }
    public float[] Count { get; }

    ClimatologyFields(int slots, int cells)
    {
        Slots = slots;
        Cells = cells;
        Mean = new float[(long)slots * cells];
        Std = new float[(long)slots * cells];
        Count = new float[(long)slots * cells];
    }

    public static ClimatologyFields From(MomentState state, Smoothing? smoothing = null)
    {
        var f = new ClimatologyFields(state.Slots, state.Cells);
        switch (smoothing)
        {
            case Smoothing.Window w:
                f.PoolWindow(state, w.Days);
                break;
            default:
                for (long i = 0; i < f.Mean.LongLength; i++)
                {
                    f.Mean[i] = (float)state.MeanOrNaN(i);
                    f.Std[i] = (float)state.StandardDeviation(i);
                    f.Count[i] = (float)state.Count[i];
                }
                if (smoothing is Smoothing.Harmonics h) f.FitHarmonics(state, h.Count);
                break;
        }
        return f;
    }

    /// <summary>
    /// Per cell, fits c₀ + Σₖ aₖ cos(2πk s/S) + bₖ sin(2πk s/S) (s = slot, S = slot count) to the slot means
    /// and separately to the slot standard deviations by weighted least squares, weights = sample counts.
    /// Cells whose counts repeat those of the previous cell reuse its factorised normal matrix.
    /// </summary>
    void FitHarmonics(MomentState state, int harmonics)
    {
        int p = 1 + 2 * harmonics, slots = Slots;
        if (2 * harmonics + 1 > slots) throw new ArgumentOutOfRangeException(nameof(harmonics), $"{harmonics} harmonics need more than {slots} slots");
        var basis = new double[slots, p];
        for (int s = 0; s < slots; s++)
        {
            basis[s, 0] = 1;
            for (int k = 1; k <= harmonics; k++)
            {
                double angle = 2 * Math.PI * k * s / slots;
                basis[s, 2 * k - 1] = Math.Cos(angle);
                basis[s, 2 * k] = Math.Sin(angle);
            }
        }
        var weights = new double[slots];
        var previous = new double[slots];
        MathNet.Numerics.LinearAlgebra.Factorization.Cholesky<double>? factor = null;
        var rhsMean = Vector<double>.Build.Dense(p);
        var rhsStd = Vector<double>.Build.Dense(p);
        for (int c = 0; c < Cells; c++)
        {
            int filled = 0;
            for (int s = 0; s < slots; s++)
            {
                weights[s] = state.Count[(long)s * Cells + c];
                if (weights[s] > 0) filled++;
            }
            if (filled < p)
            {
                for (int s = 0; s < slots; s++) Mean[(long)s * Cells + c] = Std[(long)s * Cells + c] = float.NaN;
                continue;
            }
            if (factor is null || !weights.AsSpan().SequenceEqual(previous))
            {
                var normal = Matrix<double>.Build.Dense(p, p);
                for (int s = 0; s < slots; s++)
                    if (weights[s] > 0)
                        for (int i = 0; i < p; i++)
                            for (int j = 0; j < p; j++) normal[i, j] += weights[s] * basis[s, i] * basis[s, j];
                factor = normal.Cholesky();
                weights.CopyTo(previous, 0);
            }
            rhsMean.Clear();
            rhsStd.Clear();
            for (int s = 0; s < slots; s++)
            {
                if (weights[s] <= 0) continue;
                long at = (long)s * Cells + c;
                double m = state.Mean[at], sd = state.StandardDeviation(at);
                for (int i = 0; i < p; i++)
                {
                    rhsMean[i] += weights[s] * basis[s, i] * m;
                    rhsStd[i] += weights[s] * basis[s, i] * sd;
                }
            }
            var betaMean = factor.Solve(rhsMean);
            var betaStd = factor.Solve(rhsStd);
            for (int s = 0; s < slots; s++)
            {
                double m = 0, sd = 0;
                for (int i = 0; i < p; i++)
                {
                    m += basis[s, i] * betaMean[i];
                    sd += basis[s, i] * betaStd[i];
                }
                Mean[(long)s * Cells + c] = (float)m;
                Std[(long)s * Cells + c] = (float)Math.Max(0, sd);
            }
        }
    }

    /// <summary>Each slot's values from the samples of the <paramref name="days"/> slots centred on it (wrapping), merged exactly.</summary>
    void PoolWindow(MomentState state, int days)
    {
        int half = days / 2, slots = Slots;
        if (days > slots) throw new ArgumentOutOfRangeException(nameof(days), $"a window of {days} is longer than the {slots} slots of the year");
        for (int s = 0; s < slots; s++)
            for (int c = 0; c < Cells; c++)
            {
                double n = 0, mean = 0, m2 = 0;
                for (int k = -half; k <= half; k++)
                {
                    long at = (long)(((s + k) % slots + slots) % slots) * Cells + c;
                    double nb = state.Count[at];
                    if (nb == 0) continue;
                    double total = n + nb, delta = state.Mean[at] - mean;
                    mean += delta * (nb / total);
                    m2 += state.M2[at] + delta * delta * (n * nb / total);
                    n = total;
                }
                long i = (long)s * Cells + c;
                Mean[i] = n > 0 ? (float)mean : float.NaN;
                Std[i] = n > 0 ? (float)Math.Sqrt(Math.Max(0, m2) / n) : float.NaN;
                Count[i] = (float)n;
            }
    }
}
