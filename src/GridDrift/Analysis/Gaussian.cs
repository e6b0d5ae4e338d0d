namespace GridDrift.Analysis;

/// <summary>Standard normal draws by the Box–Muller transform (both values of each pair used).</summary>
internal static class Gaussian
{
    public static void Fill(Random rng, Span<double> x)
    {
        for (int i = 0; i < x.Length; i += 2)
        {
            double r = Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())), a = 2 * Math.PI * rng.NextDouble();
            x[i] = r * Math.Cos(a);
            if (i + 1 < x.Length) x[i + 1] = r * Math.Sin(a);
        }
    }

    public static double Next(Random rng) => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
}
