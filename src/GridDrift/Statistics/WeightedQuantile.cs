namespace GridDrift.Statistics;

/// <summary>
/// Area-weighted quantiles. Values sorted ascending, each value i stands at the cumulative
/// probability of the middle of its weight, cᵢ = (Σ_{k&lt;i} wₖ + wᵢ/2) / Σw, and the p-quantile
/// interpolates linearly between the two values whose cᵢ bracket p (the lowest value below
/// c₀, the highest above the last). With equal weights this is definition 5 of Hyndman & Fan
/// (1996, The American Statistician 50(4): 361), Hazen's plotting position (k − ½)/n.
/// </summary>
public static class WeightedQuantile
{
    /// <summary>Sorts <paramref name="values"/> (and their weights with them) in place, then evaluates each probability.</summary>
    public static void Evaluate(Span<float> values, Span<double> weights, ReadOnlySpan<double> probabilities, Span<double> results)
    {
        int n = values.Length;
        if (n == 0)
        {
            results.Fill(double.NaN);
            return;
        }
        values.Sort(weights);
        double total = 0;
        for (int i = 0; i < n; i++) total += weights[i];
        for (int q = 0; q < probabilities.Length; q++) results[q] = double.NaN;
        // walk the sorted values once, answering the probabilities in ascending order
        Span<int> order = stackalloc int[probabilities.Length];
        for (int q = 0; q < order.Length; q++) order[q] = q;
        for (int a = 1; a < order.Length; a++)
            for (int b = a; b > 0 && probabilities[order[b]] < probabilities[order[b - 1]]; b--) (order[b], order[b - 1]) = (order[b - 1], order[b]);

        double before = 0, previousC = double.NaN, previousValue = double.NaN;
        int next = 0;
        for (int i = 0; i < n && next < order.Length; i++)
        {
            double c = (before + 0.5 * weights[i]) / total;
            while (next < order.Length && probabilities[order[next]] <= c)
            {
                double p = probabilities[order[next]];
                results[order[next]] = double.IsNaN(previousC) ? values[i]
                    : previousValue + (values[i] - previousValue) * (p - previousC) / (c - previousC);
                next++;
            }
            before += weights[i];
            previousC = c;
            previousValue = values[i];
        }
        for (; next < order.Length; next++) results[order[next]] = values[n - 1];
    }
}
