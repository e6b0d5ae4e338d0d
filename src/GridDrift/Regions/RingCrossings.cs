namespace GridDrift.Regions;

/// <summary>
/// Whether a polygon ring crosses or touches itself, which makes "inside" ambiguous (OGC Simple
/// Features: a ring must be simple; RFC 7946 §3.1.6 points there). Edges are compared in the
/// plane of longitude and latitude, after the ring was unwrapped across the antimeridian, by a
/// sweep over edges sorted by their western end: only edges whose longitude spans overlap are
/// compared, so coastlines of many thousand positions take milliseconds.
/// </summary>
internal static class RingCrossings
{
    /// <summary>Most edge pairs compared in one ring: far beyond any real outline, a bound on pathological ones.</summary>
    public const long MaxComparisons = 200_000_000;

    /// <summary>The starts of two edges that meet although they are not neighbours, or null for a simple ring.</summary>
    public static ((double Lon, double Lat) First, (double Lon, double Lat) Second)? Find((double Lon, double Lat)[] ring)
    {
        var points = WithoutRepeats(ring);
        int edges = points.Count - 1;
        if (edges < 3) return null;
        var order = Enumerable.Range(0, edges).OrderBy(e => Math.Min(points[e].Lon, points[e + 1].Lon)).ToArray();
        var active = new List<int>();
        long comparisons = 0;
        foreach (int e in order)
        {
            double west = Math.Min(points[e].Lon, points[e + 1].Lon);
            active.RemoveAll(a => Math.Max(points[a].Lon, points[a + 1].Lon) < west);
            foreach (int a in active)
            {
                if (++comparisons > MaxComparisons) throw new InvalidOperationException("too many edges overlap in longitude to check");
                if (Neighbours(a, e, edges)) continue;
                if (Meet(points[a], points[a + 1], points[e], points[e + 1])) return (points[Math.Min(a, e)], points[Math.Max(a, e)]);
            }
            active.Add(e);
        }
        return null;
    }

    static List<(double Lon, double Lat)> WithoutRepeats((double Lon, double Lat)[] ring)
    {
        var points = new List<(double, double)>(ring.Length);
        foreach (var p in ring)
            if (points.Count == 0 || points[^1] != p) points.Add(p);
        return points;
    }

    // the closing edge's end is the first edge's start
    static bool Neighbours(int a, int b, int edges) => Math.Abs(a - b) == 1 || Math.Abs(a - b) == edges - 1;

    static bool Meet((double X, double Y) p1, (double X, double Y) p2, (double X, double Y) q1, (double X, double Y) q2)
    {
        if (Math.Max(p1.Y, p2.Y) < Math.Min(q1.Y, q2.Y) || Math.Max(q1.Y, q2.Y) < Math.Min(p1.Y, p2.Y)) return false;
        int d1 = Turn(q1, q2, p1), d2 = Turn(q1, q2, p2), d3 = Turn(p1, p2, q1), d4 = Turn(p1, p2, q2);
        if (d1 * d2 < 0 && d3 * d4 < 0) return true;
        return (d1 == 0 && Within(q1, q2, p1)) || (d2 == 0 && Within(q1, q2, p2))
            || (d3 == 0 && Within(p1, p2, q1)) || (d4 == 0 && Within(p1, p2, q2));
    }

    static int Turn((double X, double Y) a, (double X, double Y) b, (double X, double Y) c) =>
        Math.Sign((b.X - a.X) * (c.Y - a.Y) - (b.Y - a.Y) * (c.X - a.X));

    // c is collinear with a–b: does it lie on the segment?
    static bool Within((double X, double Y) a, (double X, double Y) b, (double X, double Y) c) =>
        c.X >= Math.Min(a.X, b.X) && c.X <= Math.Max(a.X, b.X) && c.Y >= Math.Min(a.Y, b.Y) && c.Y <= Math.Max(a.Y, b.Y);
}
