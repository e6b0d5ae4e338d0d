namespace GridDrift.Analysis;

/// <summary>
/// An autoregressive model AR(p) of a series' noise, x_t − μ = Σ_k a_k (x_{t−k} − μ) + e_t, fitted
/// by Yule–Walker (the Levinson–Durbin recursion on the biased sample autocovariances), its order
/// chosen by Akaike's criterion n ln σ̂²_p + 2p up to <see cref="MaxOrder"/>. This is the sieve of
/// Bühlmann (1997, Bernoulli 3: 123): an AR of growing order stands for any linear persistent noise,
/// so whitening with it (<see cref="Whiten"/>) leaves nearly independent innovations on which the
/// rank tests hold their level, and simulating it (<see cref="Simulate"/>) gives bootstrap series.
/// </summary>
internal sealed class Autoregression
{
    public double[] Coefficients { get; }
    public double InnovationVariance { get; }
    public double Mean { get; }

    Autoregression(double[] a, double variance, double mean) => (Coefficients, InnovationVariance, Mean) = (a, variance, mean);

    public int Order => Coefficients.Length;

    /// <summary>Σ a_k: a step δ in the series is a step δ(1 − Σ a_k) in its innovations.</summary>
    public double Persistence => Coefficients.Sum();

    /// <summary>The variance that governs a long segment's mean: σ²_e / (1 − Σ a_k)² (the spectrum at frequency zero × 2π).</summary>
    public double LongRunVariance => InnovationVariance / Math.Pow(1 - Persistence, 2);

    /// <summary>10 log10 n, the order bound of common practice for AIC sieves (as R's ar() uses), at most 40 and n/10.</summary>
    public static int MaxOrder(int n) => Math.Clamp((int)(10 * Math.Log10(Math.Max(n, 1))), 0, Math.Min(40, n / 10));

    /// <summary>Fits the AR to <paramref name="noise"/> (the series with what is not noise removed: seasonal cycle, trend or shifts).</summary>
    public static Autoregression Fit(ReadOnlySpan<double> noise, int? maxOrder = null) => Fit(noise, maxOrder, exactOrder: false);

    /// <summary>The Yule–Walker AR of exactly <paramref name="order"/> (no order choice).</summary>
    public static Autoregression OfOrder(ReadOnlySpan<double> noise, int order) => Fit(noise, order, exactOrder: true);

    static Autoregression Fit(ReadOnlySpan<double> noise, int? maxOrder, bool exactOrder)
    {
        int n = noise.Length;
        double mean = 0;
        foreach (var v in noise) mean += v;
        mean /= Math.Max(n, 1);
        int pmax = Math.Min(maxOrder ?? MaxOrder(n), Math.Max(0, n - 2));
        var gamma = new double[pmax + 1];
        for (int k = 0; k <= pmax; k++)
        {
            double s = 0;
            for (int i = k; i < n; i++) s += (noise[i] - mean) * (noise[i - k] - mean);
            gamma[k] = s / n;
        }
        if (!(gamma[0] > 0)) return new Autoregression([], Math.Max(gamma[0], 0), mean);
        // Levinson–Durbin: a^(p) from a^(p−1), keeping the order with the least AIC
        var a = new double[pmax + 1];
        var previous = new double[pmax + 1];
        double variance = gamma[0], bestAic = n * Math.Log(variance);
        double[] best = [];
        double bestVariance = variance;
        for (int p = 1; p <= pmax; p++)
        {
            double acc = gamma[p];
            for (int k = 1; k < p; k++) acc -= previous[k] * gamma[p - k];
            double reflection = acc / variance;
            if (!(Math.Abs(reflection) < 1)) break;
            a[p] = reflection;
            for (int k = 1; k < p; k++) a[k] = previous[k] - reflection * previous[p - k];
            variance *= 1 - reflection * reflection;
            Array.Copy(a, previous, p + 1);
            double aic = n * Math.Log(variance) + 2 * p;
            if (aic < bestAic || (exactOrder && p == pmax)) { bestAic = aic; best = a[1..(p + 1)]; bestVariance = variance; }
        }
        return new Autoregression(best, bestVariance, mean);
    }

    /// <summary>
    /// The innovations e_t = (x_t − μ) − Σ a_k (x_{t−k} − μ) for t ≥ p, written to
    /// <paramref name="innovations"/> (length n − p); the first p values have no full past and are dropped.
    /// </summary>
    public void Whiten(ReadOnlySpan<double> x, Span<double> innovations)
    {
        int p = Order;
        for (int t = p; t < x.Length; t++)
        {
            double e = x[t] - Mean;
            for (int k = 1; k <= p; k++) e -= Coefficients[k - 1] * (x[t - k] - Mean);
            innovations[t - p] = e;
        }
    }

    public double[] Whiten(ReadOnlySpan<double> x)
    {
        var e = new double[Math.Max(0, x.Length - Order)];
        Whiten(x, e);
        return e;
    }

    /// <summary>
    /// A series of the model's noise (mean zero) into <paramref name="into"/>: innovations drawn with
    /// replacement from <paramref name="pool"/> (centred residuals: the sieve bootstrap), after a burn-in
    /// of 10 p + 100 steps so the start does not remember zeros.
    /// </summary>
    public void Simulate(Random rng, ReadOnlySpan<double> pool, Span<double> into)
    {
        int p = Order, burn = 10 * p + 100;
        Span<double> history = stackalloc double[Math.Max(p, 1)];
        history.Clear();
        for (int t = -burn; t < into.Length; t++)
        {
            double v = pool[rng.Next(pool.Length)];
            for (int k = 0; k < p; k++) v += Coefficients[k] * history[k];
            for (int k = p - 1; k > 0; k--) history[k] = history[k - 1];
            if (p > 0) history[0] = v;
            if (t >= 0) into[t] = v;
        }
    }
}
