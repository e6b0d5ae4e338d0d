namespace GridDrift.Operators.Similarity;

/// <summary>How a filter sees beyond the edge of a row or column.</summary>
internal enum Edge
{
    /// <summary>Half-sample symmetric (… c b a | a b c …), scipy.ndimage's 'reflect'.</summary>
    Reflect,
    /// <summary>Periodic: a global grid's longitude circle.</summary>
    Wrap,
}

internal static class Edges
{
    /// <summary>Index of a position beyond the edge of n positions: mirrored half-sample symmetrically, or wrapped.</summary>
    public static int Index(int i, int n, Edge edge)
    {
        if (edge == Edge.Wrap) return ((i % n) + n) % n;
        if (n == 1) return 0;
        int period = 2 * n;
        i = ((i % period) + period) % period;
        return i < n ? i : period - 1 - i;
    }
}
