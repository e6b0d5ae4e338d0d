using MathNet.Numerics.LinearAlgebra;

namespace GridDrift.Operators.Climatology;

/// <summary>A finished climatology, handed out one slot at a time: mean, population standard deviation and sample count per cell.</summary>
internal interface IClimatologySlots
{
    int Slots { get; }
    int Cells { get; }
    /// <summary>Writes one slot; NaN where there is no value.</summary>
    void Fill(int slot, Span<float> mean, Span<float> std, Span<float> count);
}

/// <summary>
/// A smoothed day-of-year climatology per slot and cell, float32 for storage (slot-major, like
/// <see cref="MomentState"/>). Without smoothing the state itself hands out its slots, so no
/// second copy of the climatology is made.
/// </summary>
internal sealed class ClimatologyFields : IClimatologySlots
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

    public static IClimatologySlots From(MomentState state, Smoothing? smoothing = null)
    {
        if (smoothing is null) return state;
        var f = new ClimatologyFields(state.Slots, state.Cells);
        if (smoothing is Smoothing.Window w) f.PoolWindow(state, w.Days);
        else if (smoothing is Smoothing.Harmonics h)
        {
            for (int s = 0; s < f.Slots; s++) state.Fill(s, f.Mean.AsSpan(s * f.Cells, f.Cells), f.Std.AsSpan(s * f.Cells, f.Cells), f.Count.AsSpan(s * f.Cells, f.Cells));
            f.FitHarmonics(state, h.Count);
        }
        return f;
    }

    public void Fill(int slot, Span<float> mean, Span<float> std, Span<float> count)
    {
        Mean.AsSpan(slot * Cells, Cells).CopyTo(mean);
        Std.AsSpan(slot * Cells, Cells).CopyTo(std);
        Count.AsSpan(slot * Cells, Cells).CopyTo(count);
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
                weights[s] = state.Count[s * Cells + c];
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
                int at = s * Cells + c;
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
                    int at = ((s + k) % slots + slots) % slots * Cells + c;
                    double nb = state.Count[at];
                    if (nb == 0) continue;
                    double total = n + nb, delta = state.Mean[at] - mean;
                    mean += delta * (nb / total);
                    m2 += state.M2[at] + delta * delta * (n * nb / total);
                    n = total;
                }
                int i = s * Cells + c;
                Mean[i] = n > 0 ? (float)mean : float.NaN;
                Std[i] = n > 0 ? (float)Math.Sqrt(Math.Max(0, m2) / n) : float.NaN;
                Count[i] = (float)n;
            }
    }
}
