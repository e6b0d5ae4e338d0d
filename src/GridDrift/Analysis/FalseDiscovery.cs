namespace GridDrift.Analysis;

/// <summary>
/// Benjamini &amp; Hochberg (1995, JRSS B 57: 289) adjusted p-values ("q-values"): with the m
/// p-values sorted ascending, q_(i) = min_{j ≥ i} m p_(j) / j, capped at 1. Rejecting every
/// hypothesis with q ≤ α controls the false discovery rate at α for independent or positively
/// dependent tests. NaN p-values take no part and get NaN.
/// </summary>
internal static class FalseDiscovery
{
    public static double[] QValues(IReadOnlyList<double> p)
    {
        var order = Enumerable.Range(0, p.Count).Where(i => !double.IsNaN(p[i])).OrderBy(i => p[i]).ToArray();
        var q = new double[p.Count];
        Array.Fill(q, double.NaN);
        int m = order.Length;
        double running = 1;
        for (int k = m - 1; k >= 0; k--)
        {
            running = Math.Min(running, p[order[k]] * m / (k + 1));
            q[order[k]] = running;
        }
        return q;
    }
}
