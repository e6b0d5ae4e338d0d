namespace GridDrift.Analysis;

/// <summary>
/// A bootstrap interval for the date of a change: series are rebuilt as the fitted step (the means
/// on either side) plus noise from the sieve AR with resampled innovations (Bühlmann 1997,
/// Bernoulli 3: 123), the change is placed in each as in the data (the series' Pettitt split), and
/// the 2.5 and 97.5 percentiles of the placements bound the date. Deterministic for a seed.
/// </summary>
internal static class ChangeDating
{
    public const int Replicates = 199;

    /// <returns>indices (into <paramref name="x"/>) of the earliest and latest plausible first value after the change</returns>
    public static (int Low, int High) Interval(ReadOnlySpan<double> x, int firstAfter, Autoregression ar, int seed, int replicates = Replicates)
    {
        int n = x.Length;
        if (firstAfter <= 0 || firstAfter >= n) return (-1, -1);
        double before = Mean(x[..firstAfter]), after = Mean(x[firstAfter..]);
        var step = new double[n];
        for (int i = 0; i < n; i++) step[i] = i < firstAfter ? before : after;
        var residual = new double[n];
        for (int i = 0; i < n; i++) residual[i] = x[i] - step[i];
        var pool = ar.Whiten(residual);
        if (pool.Length < 2) return (firstAfter, firstAfter);
        double centre = Mean(pool);
        for (int i = 0; i < pool.Length; i++) pool[i] -= centre;
        var rng = new Random(seed);
        var y = new double[n];
        var placed = new int[replicates];
        for (int b = 0; b < replicates; b++)
        {
            ar.Simulate(rng, pool, y);
            for (int i = 0; i < n; i++) y[i] += step[i];
            placed[b] = Pettitt.Test(y).LastBefore + 1;
        }
        Array.Sort(placed);
        return (placed[(int)Math.Floor(0.025 * (replicates - 1))], placed[(int)Math.Ceiling(0.975 * (replicates - 1))]);
    }

    static double Mean(ReadOnlySpan<double> x)
    {
        double s = 0;
        foreach (var v in x) s += v;
        return x.IsEmpty ? double.NaN : s / x.Length;
    }
}
