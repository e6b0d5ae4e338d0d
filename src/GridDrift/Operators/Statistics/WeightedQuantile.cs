namespace GridDrift.Operators.Statistics;

/// <summary>
/// Area-weighted quantiles. The distinct values sorted ascending are atoms, each weighing the sum
/// of the weights of the cells that hold it (tied values are one atom, so the result does not
/// depend on the order the cells are stored in); atom i stands at the cumulative probability of
/// the middle of its weight, cᵢ = (Σ_{k&lt;i} Wₖ + Wᵢ/2) / ΣW, and the p-quantile interpolates
/// linearly between the two atoms whose cᵢ bracket p (the lowest value below c₀, the highest
/// above the last). With equal weights and no ties this is definition 5 of Hyndman & Fan (1996,
/// The American Statistician 50(4): 361), Hazen's plotting position (k − ½)/n.
/// Large inputs are not sorted whole: a histogram of the values finds, for each p, the few
/// neighbouring bins that hold the bracketing values, and only those are sorted; the weight of
/// all lower bins is known exactly, so the result is the same as a full sort's.
/// </summary>
internal static class WeightedQuantile
{
    const int SortBelow = 4096;
    const int Bins = 4096;

    [ThreadStatic] static double[]? _binWeight;
    [ThreadStatic] static int[]? _binCount;
    [ThreadStatic] static float[]? _pickedValues;
    [ThreadStatic] static double[]? _pickedWeights;

    /// <summary>Evaluates each probability; <paramref name="values"/> and <paramref name="weights"/> may be reordered.</summary>
    public static void Evaluate(Span<float> values, Span<double> weights, ReadOnlySpan<double> probabilities, Span<double> results)
    {
        int n = values.Length;
        if (n == 0)
        {
            results.Fill(double.NaN);
            return;
        }
        if (n < SortBelow)
        {
            values.Sort(weights);
            double total = 0;
            for (int i = 0; i < n; i++) total += weights[i];
            for (int q = 0; q < probabilities.Length; q++) results[q] = FromSorted(values, weights, 0, total, probabilities[q], true, true);
            return;
        }
        ByHistogram(values, weights, probabilities, results);
    }

    /// <summary>
    /// The p-quantile from a sorted run whose lower neighbours weigh <paramref name="below"/> in all;
    /// <paramref name="isFirst"/>/<paramref name="isLast"/> say whether the run holds the smallest/largest value.
    /// </summary>
    internal static double FromSorted(ReadOnlySpan<float> v, ReadOnlySpan<double> w, double below, double total, double p, bool isFirst, bool isLast)
    {
        double target = p * total;
        double previousMid = double.NaN, previousValue = double.NaN;
        double before = below;
        for (int i = 0; i < v.Length;)
        {
            // one atom: the run of equal values (equal values always fall in the same histogram bin, so a run is never cut)
            float value = v[i];
            double weight = 0;
            for (; i < v.Length && v[i] == value; i++) weight += w[i];
            double mid = before + 0.5 * weight;
            if (mid >= target)
            {
                if (double.IsNaN(previousMid)) return isFirst ? value : double.NaN;
                return previousValue + (value - previousValue) * (target - previousMid) / (mid - previousMid);
            }
            before += weight;
            previousMid = mid;
            previousValue = value;
        }
        return isLast ? v[^1] : double.NaN;
    }

    [ThreadStatic] static ushort[]? _bin;

    static void ByHistogram(Span<float> values, Span<double> weights, ReadOnlySpan<double> probabilities, Span<double> results)
    {
        int n = values.Length, nq = probabilities.Length;
        float lo = float.PositiveInfinity, hi = float.NegativeInfinity;
        double total = 0;
        for (int i = 0; i < n; i++)
        {
            if (values[i] < lo) lo = values[i];
            if (values[i] > hi) hi = values[i];
            total += weights[i];
        }
        if (!(hi > lo))
        {
            results[..nq].Fill(lo);
            return;
        }
        _binWeight ??= new double[Bins];
        _binCount ??= new int[Bins];
        if (_bin is null || _bin.Length < n) _bin = new ushort[Math.Max(n, 4096)];
        var binWeight = _binWeight.AsSpan();
        var binCount = _binCount.AsSpan();
        var bin = _bin.AsSpan(0, n);
        binWeight.Clear();
        binCount.Clear();
        double scale = (Bins - 1) / ((double)hi - lo);
        for (int i = 0; i < n; i++)
        {
            int b = (int)((values[i] - (double)lo) * scale);
            bin[i] = (ushort)b;
            binWeight[b] += weights[i];
            binCount[b]++;
        }

        Span<int> first = stackalloc int[nq];
        Span<int> last = stackalloc int[nq];
        Span<double> below = stackalloc double[nq];
        Span<int> offset = stackalloc int[nq + 1];
        Brackets(binWeight, total, probabilities, first, last, below);
        for (int q = 0; q < nq; q++)
        {
            int count = 0;
            for (int b = first[q]; b <= last[q]; b++) count += binCount[b];
            offset[q + 1] = offset[q] + count;
        }
        int picked = offset[nq];
        if (_pickedValues is null || _pickedValues.Length < picked) { _pickedValues = new float[Math.Max(picked, 1024)]; _pickedWeights = new double[_pickedValues.Length]; }
        Span<int> fill = stackalloc int[nq];
        offset[..nq].CopyTo(fill);
        var pickedValues = _pickedValues.AsSpan();  // thread-static fields are slow to reach: hoist them out of the loop
        var pickedWeights = _pickedWeights!.AsSpan();
        for (int i = 0; i < n; i++)
        {
            int b = bin[i];
            for (int q = 0; q < nq; q++)
                if ((uint)(b - first[q]) <= (uint)(last[q] - first[q]))
                {
                    pickedValues[fill[q]] = values[i];
                    pickedWeights[fill[q]++] = weights[i];
                }
        }
        for (int q = 0; q < nq; q++)
        {
            bool lowest = !binWeight[..first[q]].ContainsAnyExcept(0.0), highest = !binWeight[(last[q] + 1)..].ContainsAnyExcept(0.0);
            results[q] = FromPicked(pickedValues[offset[q]..offset[q + 1]], pickedWeights[offset[q]..offset[q + 1]], below[q], total, probabilities[q], lowest, highest);
        }
    }

    /// <summary>
    /// Per probability: the histogram bins [first, last] that hold the two bracketing values (the
    /// first non-empty bin reaching the target weight and its non-empty neighbours) and the weight
    /// of all bins below them. Weights are positive, so a bin is empty when its weight is 0.
    /// </summary>
    internal static void Brackets(ReadOnlySpan<double> binWeight, double total, ReadOnlySpan<double> probabilities,
        Span<int> first, Span<int> last, Span<double> below)
    {
        int bins = binWeight.Length, k = 0;
        double cumulative = 0, previous = double.NegativeInfinity;
        for (int q = 0; q < probabilities.Length; q++)
        {
            double target = probabilities[q] * total;
            // probabilities in ascending order (the usual request) resume the walk where the last one stopped
            if (target < previous) { k = 0; cumulative = 0; }
            previous = target;
            for (; k < bins - 1; k++)
            {
                if (cumulative + binWeight[k] >= target && binWeight[k] > 0) break;
                cumulative += binWeight[k];
            }
            first[q] = last[q] = k;
            below[q] = cumulative;
            for (int b = k - 1; b >= 0; b--) if (binWeight[b] > 0) { first[q] = b; below[q] -= binWeight[b]; break; }
            for (int b = k + 1; b < bins; b++) if (binWeight[b] > 0) { last[q] = b; break; }
        }
    }

    /// <summary>Sorts the picked cells of one probability and reads its quantile off them, knowing the weight below.</summary>
    internal static double FromPicked(Span<float> values, Span<double> weights, double below, double total, double p, bool lowest, bool highest)
    {
        values.Sort(weights);
        return FromSorted(values, weights, below, total, p, lowest, highest);
    }
}
