namespace GridDrift.Analysis;

/// <summary>Rank helpers shared by the rank-based tests.</summary>
internal static class Ranks
{
    /// <summary>Mid-ranks (1-based; ties share the mean of their ranks), as scipy.stats.rankdata's 'average'.</summary>
    public static double[] MidRanks(ReadOnlySpan<double> x)
    {
        int n = x.Length;
        var order = new int[n];
        for (int i = 0; i < n; i++) order[i] = i;
        var keys = x.ToArray();
        Array.Sort(keys, order);
        var ranks = new double[n];
        for (int i = 0; i < n;)
        {
            int j = i;
            while (j + 1 < n && keys[j + 1] == keys[i]) j++;
            double r = (i + j) / 2.0 + 1;
            for (int k = i; k <= j; k++) ranks[order[k]] = r;
            i = j + 1;
        }
        return ranks;
    }

    /// <summary>Sizes of the groups of equal values (only groups of two or more).</summary>
    public static List<int> TieGroups(ReadOnlySpan<double> x)
    {
        var sorted = x.ToArray();
        Array.Sort(sorted);
        var groups = new List<int>();
        for (int i = 0; i < sorted.Length;)
        {
            int j = i;
            while (j + 1 < sorted.Length && sorted[j + 1] == sorted[i]) j++;
            if (j > i) groups.Add(j - i + 1);
            i = j + 1;
        }
        return groups;
    }

    /// <summary>
    /// S = Σ_{i&lt;j} sign(x_j − x_i) in O(n log n): walking forward, each value counts the earlier values
    /// below and above it in a Fenwick tree over the values' dense ranks (ties count zero).
    /// </summary>
    public static long KendallS(ReadOnlySpan<double> x)
    {
        int n = x.Length;
        var sorted = x.ToArray();
        Array.Sort(sorted);
        int distinct = 0;
        for (int i = 0; i < n; i++) if (i == 0 || sorted[i] != sorted[i - 1]) sorted[distinct++] = sorted[i];
        var tree = new int[distinct + 1];
        long s = 0;
        for (int j = 0; j < n; j++)
        {
            int r = Array.BinarySearch(sorted, 0, distinct, x[j]) + 1; // 1-based dense rank
            int below = Prefix(tree, r - 1), notAbove = Prefix(tree, r);
            s += below - (j - notAbove);
            for (int k = r; k <= distinct; k += k & -k) tree[k]++;
        }
        return s;
    }

    static int Prefix(int[] tree, int k)
    {
        int sum = 0;
        for (; k > 0; k -= k & -k) sum += tree[k];
        return sum;
    }
}
