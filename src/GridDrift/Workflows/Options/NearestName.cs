namespace GridDrift.Workflows.Options;

/// <summary>The known name nearest to a misspelt one, for "did you mean" hints.</summary>
internal static class NearestName
{
    /// <summary>The nearest of <paramref name="known"/> when it is within a third of the name's length (at least 2 edits), else null.</summary>
    public static string? Of(string name, IEnumerable<string> known)
    {
        var best = known.Select(k => (Name: k, Distance: Distance(name, k))).OrderBy(x => x.Distance).FirstOrDefault();
        return best.Name is not null && best.Distance <= Math.Max(2, name.Length / 3) ? best.Name : null;
    }

    /// <summary>Optimal string alignment distance: insertions, deletions, substitutions and swaps of neighbours each cost one.</summary>
    public static int Distance(string a, string b)
    {
        var d = new int[a.Length + 1, b.Length + 1];
        for (int i = 0; i <= a.Length; i++) d[i, 0] = i;
        for (int j = 0; j <= b.Length; j++) d[0, j] = j;
        for (int i = 1; i <= a.Length; i++)
            for (int j = 1; j <= b.Length; j++)
            {
                int cost = a[i - 1] == b[j - 1] ? 0 : 1;
                d[i, j] = Math.Min(Math.Min(d[i - 1, j] + 1, d[i, j - 1] + 1), d[i - 1, j - 1] + cost);
                if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) d[i, j] = Math.Min(d[i, j], d[i - 2, j - 2] + 1);
            }
        return d[a.Length, b.Length];
    }
}
